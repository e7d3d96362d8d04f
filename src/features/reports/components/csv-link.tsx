import { buttonClasses } from '@/components/ui/button';

/**
 * A download of a CSV file the server writes (a plain link: the browser saves what the server names,
 * with the session cookie, no script involved).
 */
export function CsvLink({ href, label = 'Download CSV', description }: { href: string; label?: string; description?: string }) {
  return (
    <a href={href} download className={buttonClasses('secondary')} aria-label={description ? `${label}: ${description}` : undefined}>
      <svg className="size-4" viewBox="0 0 16 16" fill="none" aria-hidden="true">
        <path d="M8 2v8m0 0 3-3m-3 3L5 7M3 13h10" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" strokeLinejoin="round" />
      </svg>
      {label}
    </a>
  );
}
