/**
 * Invoice arithmetic in integer cents. Every amount that is not already whole cents (hours × rate,
 * quantity × unit price, the tax on a subtotal) is rounded once, half away from zero, at the line or
 * at the tax; the subtotal is the plain sum of rounded lines and the total is subtotal + tax. That way
 * every column of the invoice CSV adds up exactly, whatever the accounting system recomputes.
 */

/** a / b rounded half away from zero, for integers (b > 0). Exact: no floating-point products. */
export function divideRoundHalfAwayFromZero(a: number, b: number): number {
  if (!Number.isSafeInteger(a) || !Number.isSafeInteger(b) || b <= 0) throw new RangeError('integers and a positive divisor expected');
  const sign = a < 0 ? -1 : 1;
  const abs = Math.abs(a);
  const q = Math.floor(abs / b);
  const r = abs - q * b;
  return sign * (2 * r >= b ? q + 1 : q);
}

/** A NUMERIC with at most two decimals (hours, quantity) as an integer count of hundredths. */
export function toHundredths(value: number | string): number {
  const n = typeof value === 'string' ? Number(value) : value;
  if (!Number.isFinite(n)) throw new RangeError(`not a number: ${value}`);
  return Math.round(n * 100);
}

/** hours × rate, or quantity × unit price, in whole cents. */
export function lineTotalCents(amount: number | string, unitCents: number): number {
  return divideRoundHalfAwayFromZero(toHundredths(amount) * unitCents, 100);
}

/** Tax on a subtotal at a rate in basis points (1025 = 10.25 %), in whole cents. */
export function taxCents(subtotalCents: number, rateBasisPoints: number): number {
  return divideRoundHalfAwayFromZero(subtotalCents * rateBasisPoints, 10_000);
}

export interface InvoiceLineInput {
  kind: 'labor' | 'part';
  hours?: number | string | null;
  rateCents?: number | null;
  quantity?: number | string | null;
  unitPriceCents?: number | null;
}

export interface InvoiceTotals {
  lineTotalsCents: number[];
  subtotalCents: number;
  taxCents: number;
  totalCents: number;
}

export function invoiceTotals(lines: InvoiceLineInput[], taxRateBasisPoints: number): InvoiceTotals {
  const lineTotalsCents = lines.map((l) =>
    l.kind === 'labor' ? lineTotalCents(l.hours ?? 0, l.rateCents ?? 0) : lineTotalCents(l.quantity ?? 0, l.unitPriceCents ?? 0),
  );
  const subtotalCents = lineTotalsCents.reduce((a, b) => a + b, 0);
  const tax = taxCents(subtotalCents, taxRateBasisPoints);
  return { lineTotalsCents, subtotalCents, taxCents: tax, totalCents: subtotalCents + tax };
}

/** Cents as a plain decimal amount for accounting imports: 123456 → "1234.56", -5 → "-0.05". */
export function centsToDecimal(cents: number): string {
  const sign = cents < 0 ? '-' : '';
  const abs = Math.abs(cents);
  return `${sign}${Math.floor(abs / 100)}.${String(abs % 100).padStart(2, '0')}`;
}

/** Basis points as a percentage string: 1025 → "10.25", 0 → "0". */
export function basisPointsToPercent(bp: number): string {
  return centsToDecimal(bp).replace(/\.00$/, '').replace(/(\.\d)0$/, '$1');
}
