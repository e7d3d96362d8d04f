/**
 * Estimate arithmetic in integer cents, shared by the server (what is stored and e-mailed) and the
 * client (the preview while editing), so both always show the same total.
 *
 * Rounding — one rule, everywhere: **half away from zero to the whole cent**. A credit (a part line with a
 * negative unit price, as an invoice may carry) rounds the same way on the negative side: −0.5 ¢ → −1 ¢.
 * 1. Each line is rounded on its own: labor = hours × rate, a part = quantity × unit price.
 *    Hours and quantities carry at most two decimals (the database columns are NUMERIC(…, 2)).
 * 2. The subtotal is the plain sum of the rounded lines.
 * 3. Tax is computed once, on the subtotal, from the shop's rate in basis points (825 = 8.25 %),
 *    and rounded by the same rule.
 * 4. Total = subtotal + tax.
 * All arithmetic is on integers (hundredths × cents, basis points × cents), never on binary
 * fractions of a cent, so 1.15 h × $90.00 is exactly $103.50 and not $103.49.
 */

export interface LaborLine {
  kind: 'labor';
  /** Hours, at most two decimals. */
  hours: number;
  rateCents: number;
}

export interface PartLine {
  kind: 'part';
  /** At most two decimals (a length of cork sheet, half a tube of cement). */
  quantity: number;
  unitPriceCents: number;
}

export type EstimateLine = LaborLine | PartLine;

export interface EstimateTotals {
  /** Each line's amount in cents, in the order given. */
  lineCents: number[];
  laborCents: number;
  partsCents: number;
  subtotalCents: number;
  taxRateBasisPoints: number;
  taxCents: number;
  totalCents: number;
}

/** Largest value we accept for hours or quantities: NUMERIC(8,2). */
export const MAX_HUNDREDTHS_VALUE = 999_999.99;

/**
 * A decimal with at most two places, as an exact integer count of hundredths.
 * Throws for values with more places, negatives, or non-finite numbers: better refused than rounded silently.
 */
export function toHundredths(value: number): number {
  if (!Number.isFinite(value) || value < 0 || value > MAX_HUNDREDTHS_VALUE) {
    throw new RangeError(`Expected a number from 0 to ${MAX_HUNDREDTHS_VALUE}, got ${value}`);
  }
  const scaled = Math.round(value * 100);
  // 1.15 * 100 is 114.99999999999999 in binary floating point; anything that far from an integer is a real third decimal
  if (Math.abs(scaled - value * 100) > 1e-6) throw new RangeError(`At most two decimals are allowed, got ${value}`);
  return scaled;
}

/** True when `value` has at most two decimals (for form validation). */
export function hasAtMostTwoDecimals(value: number): boolean {
  try {
    toHundredths(value);
    return true;
  } catch {
    return false;
  }
}

/** numerator / denominator for non-negative integers, rounded half away from zero. */
export function divideRoundHalfUp(numerator: number, denominator: number): number {
  if (!Number.isSafeInteger(numerator) || !Number.isSafeInteger(denominator) || numerator < 0 || denominator <= 0) {
    throw new RangeError(`divideRoundHalfUp expects non-negative safe integers, got ${numerator} / ${denominator}`);
  }
  const quotient = Math.floor(numerator / denominator);
  const remainder = numerator - quotient * denominator;
  return remainder * 2 >= denominator ? quotient + 1 : quotient;
}

function assertCents(value: number, what: string) {
  if (!Number.isSafeInteger(value) || value < 0) throw new RangeError(`${what} must be a whole number of cents ≥ 0, got ${value}`);
}

/** numerator / denominator rounded half away from zero, for a numerator of either sign. */
function divideRoundHalfAway(numerator: number, denominator: number): number {
  const magnitude = divideRoundHalfUp(Math.abs(numerator), denominator);
  return numerator < 0 ? -magnitude : magnitude;
}

/** One line's amount in cents (rule 1); a part line with a negative unit price is a credit. */
export function lineTotalCents(line: EstimateLine): number {
  if (line.kind === 'labor') {
    assertCents(line.rateCents, 'Labor rate');
    return divideRoundHalfUp(toHundredths(line.hours) * line.rateCents, 100);
  }
  if (!Number.isSafeInteger(line.unitPriceCents)) throw new RangeError(`Unit price must be a whole number of cents, got ${line.unitPriceCents}`);
  return divideRoundHalfAway(toHundredths(line.quantity) * line.unitPriceCents, 100);
}

/** Tax on a subtotal (rule 3); a subtotal below zero (credits over the charges) gives tax back, rounded the same way. */
export function taxCents(subtotalCents: number, taxRateBasisPoints: number): number {
  if (!Number.isSafeInteger(subtotalCents)) throw new RangeError(`Subtotal must be a whole number of cents, got ${subtotalCents}`);
  if (!Number.isInteger(taxRateBasisPoints) || taxRateBasisPoints < 0 || taxRateBasisPoints > 10_000) {
    throw new RangeError(`Tax rate must be 0–10000 basis points, got ${taxRateBasisPoints}`);
  }
  return divideRoundHalfAway(subtotalCents * taxRateBasisPoints, 10_000);
}

export function estimateTotals(lines: readonly EstimateLine[], taxRateBasisPoints: number): EstimateTotals {
  const lineCents = lines.map(lineTotalCents);
  let laborCents = 0;
  let partsCents = 0;
  lines.forEach((line, i) => {
    if (line.kind === 'labor') laborCents += lineCents[i];
    else partsCents += lineCents[i];
  });
  const subtotalCents = laborCents + partsCents;
  const tax = taxCents(subtotalCents, taxRateBasisPoints);
  return { lineCents, laborCents, partsCents, subtotalCents, taxRateBasisPoints, taxCents: tax, totalCents: subtotalCents + tax };
}

/** Sum of labor hours, for the job's estimated hours (routing and bench load read it). */
export function laborHours(lines: readonly EstimateLine[]): number {
  const hundredths = lines.reduce((sum, line) => (line.kind === 'labor' ? sum + toHundredths(line.hours) : sum), 0);
  return hundredths / 100;
}

/** 825 → "8.25 %". */
export function formatBasisPoints(basisPoints: number): string {
  return `${(basisPoints / 100).toFixed(2).replace(/\.?0+$/, '')} %`;
}
