import { HAZARDS, HAZARD_LABELS, type Hazard } from '@shared/safety/hazards';
import { cn } from '@/lib/cn';

interface HazardCheckboxesProps {
  /** What is tagged ("Repad — alto saxophone"), for the legend and the labels read aloud. */
  of: string;
  value: Hazard[];
  onChange: (next: Hazard[]) => void;
  /** The form the boxes belong to (the catalog's rows are forms spread over table cells). */
  form?: string;
  error?: string;
  disabled?: boolean;
  className?: string;
}

/** The owner's hazard tags as plain checkboxes; the cautions shown at the bench follow them. */
export function HazardCheckboxes({ of, value, onChange, form, error, disabled, className }: HazardCheckboxesProps) {
  const toggle = (h: Hazard, on: boolean) => onChange(HAZARDS.filter((x) => (x === h ? on : value.includes(x))));
  return (
    <fieldset className={cn('flex flex-col gap-1', className)} aria-invalid={error ? true : undefined}>
      <legend className="text-sm font-semibold text-ink-800">
        Hazards<span className="sr-only"> of {of}</span>
        <span className="font-normal text-ink-600"> — the cautions shown when this work starts</span>
      </legend>
      <div className="grid grid-cols-1 gap-x-4 sm:grid-cols-2 lg:grid-cols-4">
        {HAZARDS.map((h) => (
          <label key={h} className="flex min-h-11 items-center gap-2 text-sm text-ink-950">
            <input
              type="checkbox"
              form={form}
              className="size-5 shrink-0 accent-accent-600"
              checked={value.includes(h)}
              disabled={disabled}
              onChange={(e) => toggle(h, e.target.checked)}
            />
            {HAZARD_LABELS[h]}
          </label>
        ))}
      </div>
      {error ? <p className="text-sm text-danger-700">{error}</p> : null}
    </fieldset>
  );
}
