import { cn } from '@/lib/cn';

interface SpinnerProps {
  /** Read out by screen readers; shown beside the wheel when `showLabel` is set. */
  label?: string;
  showLabel?: boolean;
  className?: string;
}

export function Spinner({ label = 'Loading…', showLabel = false, className }: SpinnerProps) {
  return (
    <div role="status" className={cn('inline-flex items-center gap-3 text-ink-600', className)}>
      <svg className="size-6 animate-spin" viewBox="0 0 24 24" fill="none" aria-hidden="true">
        <circle cx="12" cy="12" r="9.5" stroke="currentColor" strokeOpacity="0.2" strokeWidth="3" />
        <path d="M21.5 12A9.5 9.5 0 0 0 12 2.5" stroke="#1d6f63" strokeWidth="3" strokeLinecap="round" />
      </svg>
      <span className={showLabel ? 'text-sm font-medium' : 'sr-only'}>{label}</span>
    </div>
  );
}

/** A spinner centred in the space a page would take, for whole-screen loads. */
export function PageSpinner({ label }: { label?: string }) {
  return (
    <div className="flex min-h-[40vh] items-center justify-center p-8">
      <Spinner label={label} showLabel />
    </div>
  );
}
