import { cloneElement, isValidElement, useId, type InputHTMLAttributes, type ReactElement, type ReactNode, type SelectHTMLAttributes } from 'react';
import { cn } from '@/lib/cn';
import { CharacterCount, countOf } from './character-count';

const control =
  'min-h-11 w-full rounded-lg border bg-white px-3 py-2 text-base text-ink-950 placeholder:text-ink-400 ' +
  'hover:border-ink-400 disabled:cursor-not-allowed disabled:bg-paper-100 sm:text-sm';

export function controlClasses(invalid?: boolean, className?: string) {
  return cn(control, invalid ? 'border-danger-700' : 'border-paper-300', className);
}

interface FieldProps {
  label: ReactNode;
  /** Shown under the control; an error replaces nothing, it is added and announced. */
  hint?: ReactNode;
  error?: string;
  className?: string;
  /** One control: it receives id, aria-invalid and aria-describedby. */
  children: ReactElement<{ id?: string; 'aria-invalid'?: boolean; 'aria-describedby'?: string }>;
}

/** A label, its control, a hint and the field's error, wired together for screen readers. */
export function Field({ label, hint, error, className, children }: FieldProps) {
  const id = useId();
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = error ? `${id}-error` : undefined;
  const count = isValidElement(children) ? countOf(children.props as { maxLength?: unknown; value?: unknown }) : null;
  const countId = count ? `${id}-count` : undefined;
  const describedBy = [hintId, countId, errorId].filter(Boolean).join(' ') || undefined;
  const child = isValidElement(children)
    ? cloneElement(children, { id, 'aria-invalid': error ? true : undefined, 'aria-describedby': describedBy })
    : children;
  return (
    <div className={cn('flex flex-col gap-1.5', className)}>
      <label htmlFor={id} className="text-sm font-semibold text-ink-950">
        {label}
      </label>
      {child}
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

export function TextInput({ className, ...props }: InputHTMLAttributes<HTMLInputElement>) {
  return <input className={controlClasses(props['aria-invalid'] === true, className)} {...props} />;
}

export function SelectInput({ className, children, ...props }: SelectHTMLAttributes<HTMLSelectElement>) {
  return (
    <select className={controlClasses(props['aria-invalid'] === true, cn('appearance-auto', className))} {...props}>
      {children}
    </select>
  );
}

interface CheckboxGroupProps<T extends string | number> {
  legend: ReactNode;
  options: Array<{ value: T; label: string }>;
  value: T[];
  onChange: (value: T[]) => void;
  error?: string;
  className?: string;
}

/** Several checkboxes under one legend (opening days, relay run days). */
export function CheckboxGroup<T extends string | number>({ legend, options, value, onChange, error, className }: CheckboxGroupProps<T>) {
  const id = useId();
  return (
    <fieldset className={cn('flex flex-col gap-1.5', className)} aria-describedby={error ? `${id}-error` : undefined}>
      <legend className="mb-1.5 text-sm font-semibold text-ink-950">{legend}</legend>
      <div className="flex flex-wrap gap-2">
        {options.map((option) => {
          const checked = value.includes(option.value);
          return (
            <label
              key={String(option.value)}
              className={cn(
                'inline-flex min-h-11 cursor-pointer items-center gap-2 rounded-lg border px-3 text-sm font-medium',
                checked ? 'border-accent-600 bg-accent-50 text-accent-800' : 'border-paper-300 bg-white text-ink-800',
              )}
            >
              <input
                type="checkbox"
                className="size-4 accent-accent-600"
                checked={checked}
                onChange={(event) =>
                  onChange(event.target.checked ? [...value, option.value] : value.filter((v) => v !== option.value))
                }
              />
              {option.label}
            </label>
          );
        })}
      </div>
      {error ? (
        <p id={`${id}-error`} className="text-sm font-medium text-danger-700">
          {error}
        </p>
      ) : null}
    </fieldset>
  );
}

/** A short message after a form was sent or refused, announced to screen readers. */
export function FormMessage({ tone, children }: { tone: 'success' | 'error'; children: ReactNode }) {
  return (
    <p
      role={tone === 'error' ? 'alert' : 'status'}
      className={cn(
        'rounded-lg border px-4 py-3 text-sm font-medium',
        tone === 'error' ? 'border-danger-200 bg-danger-50 text-danger-700' : 'border-accent-200 bg-accent-50 text-accent-800',
      )}
    >
      {children}
    </p>
  );
}
