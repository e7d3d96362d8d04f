import { describe, expect, it } from 'vitest';
import {
  divideRoundHalfUp,
  estimateTotals,
  formatBasisPoints,
  laborHours,
  lineTotalCents,
  taxCents,
  toHundredths,
} from '../../../../shared/jobs/estimate.js';
import { formatCents } from '../../../../shared/money.js';

/**
 * Rule under test (shared/jobs/estimate.ts): each line rounded half away from zero to the cent, tax once on the subtotal,
 * same rounding. Rounding half away from zero is Benchrelay's rule, chosen by us, not quoted from a tax authority. Every
 * tax rate below is invented for the test (round or oddly precise on purpose), not any city's or state's real rate.
 */
describe('line totals in cents', () => {
  it('labor is hours × rate, exact where binary floating point is not', () => {
    // 1.15 * 9000 is 10349.999999999998 in floating point; the exact answer is $103.50
    expect(lineTotalCents({ kind: 'labor', hours: 1.15, rateCents: 9000 })).toBe(10_350);
    expect(lineTotalCents({ kind: 'labor', hours: 6, rateCents: 9200 })).toBe(55_200);
  });

  it('rounds a half cent up (away from zero), anything less down', () => {
    // 1.33 h × $88.50 = $117.705 → $117.71
    expect(lineTotalCents({ kind: 'labor', hours: 1.33, rateCents: 8850 })).toBe(11_771);
    // 0.35 h × $92.50 = $32.375 → $32.38
    expect(lineTotalCents({ kind: 'labor', hours: 0.35, rateCents: 9250 })).toBe(3238);
    // 0.33 h × $92.50 = $30.525 → $30.53 ; 0.01 h × $0.49 = 0.49 ¢ → 0 ¢
    expect(lineTotalCents({ kind: 'labor', hours: 0.33, rateCents: 9250 })).toBe(3053);
    expect(lineTotalCents({ kind: 'labor', hours: 0.01, rateCents: 49 })).toBe(0);
    expect(lineTotalCents({ kind: 'labor', hours: 0.01, rateCents: 50 })).toBe(1);
  });

  it('parts are quantity × unit price, fractional quantities included', () => {
    expect(lineTotalCents({ kind: 'part', quantity: 23, unitPriceCents: 185 })).toBe(4255);
    // a quarter sheet of cork at $6.50 = $1.625 → $1.63
    expect(lineTotalCents({ kind: 'part', quantity: 0.25, unitPriceCents: 650 })).toBe(163);
  });

  it('refuses a third decimal, negatives and fractions of a cent rather than rounding them silently', () => {
    expect(() => lineTotalCents({ kind: 'labor', hours: 1.125, rateCents: 9000 })).toThrow(RangeError);
    expect(() => lineTotalCents({ kind: 'labor', hours: -1, rateCents: 9000 })).toThrow(RangeError);
    expect(() => lineTotalCents({ kind: 'part', quantity: 1, unitPriceCents: 12.5 })).toThrow(RangeError);
    // two-decimal values whose binary form sits just below the hundredth still count exactly
    expect([1.15, 4.35, 0.29].map(toHundredths)).toEqual([115, 435, 29]);
    expect(() => toHundredths(Number.NaN)).toThrow(RangeError);
  });

  it('divides integers with half-up rounding', () => {
    expect(divideRoundHalfUp(5, 10)).toBe(1);
    expect(divideRoundHalfUp(4, 10)).toBe(0);
    expect(divideRoundHalfUp(15, 10)).toBe(2);
    expect(divideRoundHalfUp(25, 10)).toBe(3); // not banker's rounding: 2.5 → 3
  });
});

describe('tax and totals', () => {
  it('worked example at 10.25 % (invented for the test): repad and leak test with pads and cement', () => {
    const totals = estimateTotals(
      [
        { kind: 'labor', hours: 6, rateCents: 9200 }, //        $552.00
        { kind: 'labor', hours: 1, rateCents: 9200 }, //        $92.00
        { kind: 'part', quantity: 23, unitPriceCents: 185 }, // $42.55
        { kind: 'part', quantity: 1, unitPriceCents: 550 }, //  $5.50
      ],
      1025,
    );
    expect(totals).toEqual({
      lineCents: [55_200, 9200, 4255, 550],
      laborCents: 64_400,
      partsCents: 4805,
      subtotalCents: 69_205,
      taxRateBasisPoints: 1025,
      // $692.05 × 10.25 % = $70.935125 → $70.94
      taxCents: 7094,
      totalCents: 76_299,
    });
  });

  it('worked example at 8.81 % (invented for the test): $123.45 → tax $10.875945 → $10.88', () => {
    const totals = estimateTotals([{ kind: 'part', quantity: 1, unitPriceCents: 12_345 }], 881);
    expect(totals.taxCents).toBe(1088);
    expect(totals.totalCents).toBe(13_433);
  });

  it('tax is computed once on the subtotal, not per line (8.75 %, invented for the test)', () => {
    // per line: $10.00 × 8.75 % = 87.5 ¢ → 88 ¢ each, 176 ¢; on the subtotal: $20.00 × 8.75 % = 175 ¢
    const totals = estimateTotals(
      [
        { kind: 'part', quantity: 1, unitPriceCents: 1000 },
        { kind: 'part', quantity: 1, unitPriceCents: 1000 },
      ],
      875,
    );
    expect(totals.taxCents).toBe(175);
    expect(totals.totalCents).toBe(2175);
  });

  it('a half cent of tax rounds up: $10.00 at 10.25 % is $1.025 → $1.03', () => {
    expect(taxCents(1000, 1025)).toBe(103);
    expect(taxCents(1000, 1024)).toBe(102);
  });

  it('a shop with a 0 % rate charges no tax; an empty estimate is zero', () => {
    expect(estimateTotals([{ kind: 'labor', hours: 2.5, rateCents: 8800 }], 0)).toMatchObject({ taxCents: 0, totalCents: 22_000 });
    expect(estimateTotals([], 1025)).toMatchObject({ subtotalCents: 0, taxCents: 0, totalCents: 0 });
  });

  it('refuses a tax rate outside 0–100 %', () => {
    expect(() => taxCents(1000, 10_001)).toThrow(RangeError);
    expect(() => taxCents(1000, -1)).toThrow(RangeError);
  });

  it('sums labor hours exactly', () => {
    expect(laborHours([{ kind: 'labor', hours: 0.1, rateCents: 1 }, { kind: 'labor', hours: 0.2, rateCents: 1 }, { kind: 'part', quantity: 3, unitPriceCents: 1 }])).toBe(0.3);
  });

  it('formats cents and basis points for people', () => {
    expect(formatCents(76_299)).toBe('$762.99');
    expect(formatCents(5)).toBe('$0.05');
    expect(formatBasisPoints(1025)).toBe('10.25 %');
    expect(formatBasisPoints(1050)).toBe('10.5 %');
    expect(formatBasisPoints(1000)).toBe('10 %');
    expect(formatBasisPoints(0)).toBe('0 %');
  });
});
