/** ISO weekdays, Monday = 1, as the database stores them. */
export const WEEKDAYS = [
  { value: 1, label: 'Mon' },
  { value: 2, label: 'Tue' },
  { value: 3, label: 'Wed' },
  { value: 4, label: 'Thu' },
  { value: 5, label: 'Fri' },
  { value: 6, label: 'Sat' },
  { value: 7, label: 'Sun' },
];

export const weekdayNames = (days: number[]) =>
  [...days].sort((a, b) => a - b).map((d) => WEEKDAYS.find((w) => w.value === d)?.label ?? String(d)).join(', ');

/** Every IANA zone the browser knows, for the time zone field's suggestions. */
export function timeZoneNames(): string[] {
  const intl = Intl as typeof Intl & { supportedValuesOf?: (key: string) => string[] };
  return intl.supportedValuesOf ? intl.supportedValuesOf('timeZone') : [];
}

// money and rates: shared/money.ts
