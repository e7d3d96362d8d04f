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

/** "92.50" → 9250 cents; money is integer cents everywhere behind the screen. */
export function dollarsToCents(text: string): number | undefined {
  const trimmed = text.trim().replace(/^\$/, '');
  if (trimmed === '' || !/^\d+(\.\d{1,2})?$/.test(trimmed)) return undefined;
  return Math.round(Number(trimmed) * 100);
}

export const centsToDollars = (cents: number) => (cents / 100).toFixed(2);

/** "10.25" (%) → 1025 basis points. */
export function percentToBasisPoints(text: string): number | undefined {
  const trimmed = text.trim().replace(/%$/, '');
  if (trimmed === '') return 0;
  if (!/^\d+(\.\d{1,2})?$/.test(trimmed)) return undefined;
  return Math.round(Number(trimmed) * 100);
}

export const basisPointsToPercent = (bp: number) => String(bp / 100);
