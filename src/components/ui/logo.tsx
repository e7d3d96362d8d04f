import { cn } from '@/lib/cn';

/** Benchrelay's mark: a pad on the bench, with the relay arc handing work on. Same drawing as /favicon.svg. */
export function LogoMark({ className }: { className?: string }) {
  return (
    <svg className={cn('size-8 shrink-0', className)} viewBox="0 0 32 32" aria-hidden="true">
      <rect width="32" height="32" rx="7" fill="#1d6f63" />
      <circle cx="11" cy="19" r="6" fill="none" stroke="#fbfaf8" strokeWidth="2.5" />
      <circle cx="11" cy="19" r="1.7" fill="#fbfaf8" />
      <path d="M14.5 9.5C18.5 6.2 23.6 7 25.6 11.6" fill="none" stroke="#a6d3c9" strokeWidth="2.3" strokeLinecap="round" />
      <path
        d="M22.4 11.4 25.8 12.3 26.8 8.9"
        fill="none"
        stroke="#a6d3c9"
        strokeWidth="2.3"
        strokeLinecap="round"
        strokeLinejoin="round"
      />
      <rect x="19" y="22.5" width="8.5" height="3" rx="1.5" fill="#fbfaf8" />
    </svg>
  );
}
