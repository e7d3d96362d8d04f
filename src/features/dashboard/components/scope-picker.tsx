import { useId } from 'react';

interface ScopePickerProps {
  /** every shop the person may see figures for */
  shops: Array<{ id: string; name: string }>;
  value: string | undefined;
  onChange: (shop: string | undefined) => void;
}

/** Which shops the figures cover: all of the person's shops, or one. */
export function ScopePicker({ shops, value, onChange }: ScopePickerProps) {
  const id = useId();
  if (shops.length < 2 && !value) return null;
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-semibold text-ink-800">
        Figures for
      </label>
      <select
        id={id}
        className="min-h-11 rounded-lg border border-paper-300 bg-white px-3 text-ink-950"
        value={value ?? ''}
        onChange={(e) => onChange(e.target.value || undefined)}
      >
        <option value="">All your shops ({shops.length})</option>
        {shops.map((s) => (
          <option key={s.id} value={s.id}>
            {s.name}
          </option>
        ))}
      </select>
    </div>
  );
}
