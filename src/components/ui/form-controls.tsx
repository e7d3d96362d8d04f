import { cloneElement, isValidElement, useId, type ReactElement, type ReactNode } from 'react';
import { cn } from '@/lib/cn';
import { CharacterCount, countOf } from './character-count';

/** Text inputs, selects and textareas share one look; 44px tall for thumbs at the bench. */
export const controlClasses =
  'min-h-11 w-full rounded-lg border border-paper-300 bg-white px-3 py-2 text-base text-ink-950 ' +
  'hover:border-ink-400 disabled:cursor-not-allowed disabled:bg-paper-100 aria-[invalid=true]:border-danger-700';

interface FieldProps {
  label: ReactNode;
  /** The server's or the form's message for this field. */
  error?: string;
  hint?: ReactNode;
  className?: string;
  /** One input, select or textarea: it receives id, aria-invalid and aria-describedby. */
  children: ReactElement<Record<string, unknown>>;
}

/** A labelled control with its hint and error wired up for screen readers. */
export function Field({ label, error, hint, className, children }: FieldProps) {
  const id = useId();
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = error ? `${id}-error` : undefined;
  const count = isValidElement(children) ? countOf(children.props) : null;
  const countId = count ? `${id}-count` : undefined;
  const control = isValidElement(children)
    ? cloneElement(children, {
        id,
        'aria-invalid': error ? true : undefined,
        'aria-describedby': [hintId, countId, errorId].filter(Boolean).join(' ') || undefined,
      })
    : children;
  return (
    <div className={cn('flex flex-col gap-1.5', className)}>
      <label htmlFor={id} className="text-sm font-semibold text-ink-800">
        {label}
      </label>
      {control}
      {count ? <CharacterCount id={countId!} length={count.length} max={count.max} /> : null}
      {hint ? (
        <p id={hintId} className="text-sm text-ink-600">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={errorId} className="text-sm font-medium text-danger-700">
          {error}
        </p>
      ) : null}
    </div>
  );
}

/** A message for the whole form (what the server said when no single field is to blame). */
export function FormError({ message }: { message?: string | null }) {
  if (!message) return null;
  return (
    <p role="alert" className="rounded-lg border border-danger-200 bg-danger-50 px-3 py-2 text-sm font-medium text-danger-700">
      {message}
    </p>
  );
}

