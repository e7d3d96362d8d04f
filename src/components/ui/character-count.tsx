/** Fields this long or longer show a counter: short codes need none, notes and complaints do. */
export const COUNTED_FROM = 100;

/** "120 / 500": the limit is in view before anyone hits it, not after a refused submit. */
export function CharacterCount({ id, length, max }: { id: string; length: number; max: number }) {
  const near = length >= max * 0.9;
  return (
    <p id={id} className={near ? 'text-right text-xs font-semibold text-danger-700' : 'text-right text-xs text-ink-600'}>
      <span className="tabular-nums">
        {length} / {max}
      </span>
      <span className="sr-only"> characters</span>
    </p>
  );
}

/** The counter's numbers for a control's props, when the control has a long limit and a text value. */
export function countOf(props: { maxLength?: unknown; value?: unknown }): { length: number; max: number } | null {
  const max = typeof props.maxLength === 'number' ? props.maxLength : null;
  if (max === null || max < COUNTED_FROM) return null;
  const value = typeof props.value === 'string' ? props.value : typeof props.value === 'number' ? String(props.value) : '';
  return { length: value.length, max };
}
