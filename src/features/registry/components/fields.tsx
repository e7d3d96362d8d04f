import { useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from 'react';
import { CharacterCount, countOf } from '@/components/ui/character-count';
import { cn } from '@/lib/cn';

const control =
  'min-h-11 w-full rounded-lg border bg-white px-3 py-2 text-base text-ink-950 placeholder:text-ink-400 hover:border-ink-400';

interface FieldShellProps {
  label: string;
  error?: string;
  hint?: ReactNode;
  required?: boolean;
  children: (ids: { id: string; describedBy: string | undefined; invalid: boolean }) => ReactNode;
  className?: string;
  /** Length and limit of a long text, shown as a counter. */
  count?: { length: number; max: number } | null;
}

/** Label, control, hint and error wired together, so a screen reader reads the error with the field. */
function FieldShell({ label, error, hint, required, children, className, count }: FieldShellProps) {
  const id = useId();
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = error ? `${id}-error` : undefined;
  const countId = count ? `${id}-count` : undefined;
  const describedBy = [hintId, countId, errorId].filter(Boolean).join(' ') || undefined;
  return (
    <div className={cn('flex flex-col gap-1', className)}>
      <label htmlFor={id} className="text-sm font-semibold text-ink-950">
        {label}
        {required ? <span className="text-danger-700"> *</span> : <span className="font-normal text-ink-600"> (optional)</span>}
      </label>
      {children({ id, describedBy, invalid: !!error })}
      {count ? <CharacterCount id={countId!} length={count.length} max={count.max} /> : null}
      {hint ? (
        <p id={hintId} className="text-sm text-ink-600">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={errorId} className="text-sm font-semibold text-danger-700">
          {error}
        </p>
      ) : null}
    </div>
  );
}

type Common = { label: string; error?: string; hint?: ReactNode; className?: string };

export function TextField({ label, error, hint, className, required, ...props }: Common & InputHTMLAttributes<HTMLInputElement>) {
  return (
    <FieldShell label={label} error={error} hint={hint} required={required} className={className} count={countOf(props)}>
      {({ id, describedBy, invalid }) => (
        <input
          id={id}
          aria-describedby={describedBy}
          aria-invalid={invalid || undefined}
          aria-required={required || undefined}
          className={cn(control, invalid ? 'border-danger-700' : 'border-paper-300')}
          {...props}
        />
      )}
    </FieldShell>
  );
}

export function TextAreaField({ label, error, hint, className, required, ...props }: Common & TextareaHTMLAttributes<HTMLTextAreaElement>) {
  return (
    <FieldShell label={label} error={error} hint={hint} required={required} className={className} count={countOf(props)}>
      {({ id, describedBy, invalid }) => (
        <textarea
          id={id}
          rows={3}
          aria-describedby={describedBy}
          aria-invalid={invalid || undefined}
          aria-required={required || undefined}
          className={cn(control, invalid ? 'border-danger-700' : 'border-paper-300')}
          {...props}
        />
      )}
    </FieldShell>
  );
}

export function SelectField({
  label, error, hint, className, required, children, ...props
}: Common & SelectHTMLAttributes<HTMLSelectElement>) {
  return (
    <FieldShell label={label} error={error} hint={hint} required={required} className={className}>
      {({ id, describedBy, invalid }) => (
        <select
          id={id}
          aria-describedby={describedBy}
          aria-invalid={invalid || undefined}
          aria-required={required || undefined}
          className={cn(control, invalid ? 'border-danger-700' : 'border-paper-300')}
          {...props}
        >
          {children}
        </select>
      )}
    </FieldShell>
  );
}

/** zod issues as `{ field: message }` (first message per field), like the server's `fields`. */
export function issuesToFields(issues: Array<{ path: PropertyKey[]; message: string }>): Record<string, string> {
  const out: Record<string, string> = {};
  for (const issue of issues) out[issue.path.map(String).join('.') || '_'] ??= issue.message;
  return out;
}

/** The server's field errors under a prefix ("instrument.new.serial" → "serial"). */
export function fieldsUnder(fields: Record<string, string>, prefix: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [key, message] of Object.entries(fields)) if (key.startsWith(`${prefix}.`)) out[key.slice(prefix.length + 1)] = message;
  return out;
}
