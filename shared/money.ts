/**
 * Money, the one home for it. Amounts are integer cents everywhere behind the screen (STYLE.md §6);
 * this module turns them into text and back.
 *
 * Reading a typed amount (`parseMoney`), the decision for every field of the product: a comma is
 * accepted as the decimal separator, like a point ("12,50" = "12.50" = 1250 cents), because people
 * at the bench type whichever their keyboard or habit gives. Thousands separators are never accepted:
 * "1,250" is refused rather than guessed (it could be 1250.00 or 1.25). At most two decimals, at most
 * seven digits before them, an optional leading "$" and surrounding spaces; the digits are read as
 * text, so no binary fraction creeps in.
 */

const AMOUNT = /^\s*\$?\s*(\d{1,7})(?:[.,](\d{1,2}))?\s*$/;

/** "12.50", "12,5", "$ 7" → cents; null when the text is empty or not such an amount. */
export function parseMoney(text: string): number | null {
  const m = AMOUNT.exec(text);
  if (!m) return null;
  return Number(m[1]) * 100 + Number((m[2] ?? '0').padEnd(2, '0'));
}

/** Cents as an input field shows them: 1250 → "12.50" (always two decimals, no currency sign). */
export function centsToInput(cents: number | null | undefined): string {
  return cents == null ? '' : centsToDecimal(cents);
}

/** Cents as a plain decimal amount (accounting imports, fields): 123456 → "1234.56", -5 → "-0.05". */
export function centsToDecimal(cents: number): string {
  const sign = cents < 0 ? '-' : '';
  const abs = Math.abs(cents);
  return `${sign}${Math.floor(abs / 100)}.${String(abs % 100).padStart(2, '0')}`;
}

/** $1,234.50 — for people; US dollars, the demo network's currency, unless told otherwise. */
export function formatCents(cents: number, currency = 'USD', locale = 'en-US'): string {
  return new Intl.NumberFormat(locale, { style: 'currency', currency }).format(cents / 100);
}

/** A typed percentage → basis points: "10.25" or "10.25%" → 1025, "" → 0; undefined when not such a number. */
export function percentToBasisPoints(text: string): number | undefined {
  const trimmed = text.trim().replace(/%$/, '');
  if (trimmed === '') return 0;
  if (!/^\d+(\.\d{1,2})?$/.test(trimmed)) return undefined;
  return Math.round(Number(trimmed) * 100);
}

/** Basis points as a plain percentage: 1025 → "10.25", 1000 → "10", 1050 → "10.5", 0 → "0". */
export function basisPointsToPercent(bp: number): string {
  return centsToDecimal(bp).replace(/\.00$/, '').replace(/(\.\d)0$/, '$1');
}
