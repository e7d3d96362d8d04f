import { isApiError } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { Button } from './button';

interface ErrorStateProps {
  title?: string;
  error?: unknown;
  onRetry?: () => void;
  retrying?: boolean;
  className?: string;
}

/** Shows what went wrong in words a person can act on; never a stack trace. */
export function ErrorState({ title = 'Something went wrong', error, onRetry, retrying, className }: ErrorStateProps) {
  const message = isApiError(error)
    ? error.message
    : 'Benchrelay could not load this. Check the connection and try again.';
  return (
    <div role="alert" className={cn('rounded-2xl border border-danger-200 bg-danger-50 px-5 py-6 sm:px-6', className)}>
      <h2 className="text-lg font-semibold text-danger-700">{title}</h2>
      <p className="mt-1 text-ink-800">{message}</p>
      {isApiError(error) && error.requestId ? (
        <p className="mt-2 text-sm text-ink-700">
          Reference for support: <span className="font-mono select-all">{error.requestId}</span>
        </p>
      ) : null}
      {onRetry ? (
        <Button variant="secondary" className="mt-4" onClick={onRetry} disabled={retrying}>
          {retrying ? 'Trying again…' : 'Try again'}
        </Button>
      ) : null}
    </div>
  );
}
