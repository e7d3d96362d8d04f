import { describe, expect, it } from 'vitest';
import { invoiceTotals } from '../../../../shared/reports/money.js';
import { basisPointsToPercent, centsToDecimal } from '../../../../shared/money.js';

/*
 * Rounding half away from zero is Benchrelay's rule (shared/jobs/estimate.ts), not a tax authority's. The rates (10 %,
 * 10.25 %) are invented for the test.
 */
describe('invoice arithmetic in integer cents (the estimate’s rule)', () => {
  it('rounds each line once, half away from zero; NUMERIC strings from pg are fine', () => {
    const t = invoiceTotals(
      [
        { kind: 'labor', hours: '1.25', rateCents: 9250 }, // 11 562.5 → 11 563
        { kind: 'part', quantity: '0.50', unitPriceCents: 125 }, // 62.5 → 63
        { kind: 'part', quantity: 1, unitPriceCents: 719 },
      ],
      1000,
    );
    // subtotal 12 345; 10 % tax = 1 234.5 → 1 235; total 13 580
    expect(t).toEqual({ lineTotalsCents: [11563, 63, 719], subtotalCents: 12345, taxCents: 1235, totalCents: 13580 });
  });

  it('rounds the tax once on the subtotal, not per line', () => {
    // three lines of 5 ¢ at 10 %: per line it would be 3 × round(0.5) = 3 ¢; on the subtotal round(1.5) = 2 ¢
    const t = invoiceTotals([1, 2, 3].map(() => ({ kind: 'part' as const, quantity: 1, unitPriceCents: 5 })), 1000);
    expect(t.taxCents).toBe(2);
    expect(t.totalCents).toBe(17);
  });

  it('0.29 h is exact (29 hundredths), not 28.999… in binary floating point', () => {
    expect(invoiceTotals([{ kind: 'labor', hours: 0.29, rateCents: 100 }], 0).lineTotalsCents).toEqual([29]);
  });

  it('a credit line (negative unit price) takes off its amount, rounded half away from zero', () => {
    const t = invoiceTotals(
      [
        { kind: 'labor', hours: '2.00', rateCents: 9000 }, // 18 000
        { kind: 'part', quantity: '1.00', unitPriceCents: 2500 }, // 2 500
        { kind: 'part', quantity: '0.50', unitPriceCents: -1001 }, // −500.5 → −501 (away from zero)
      ],
      1025,
    );
    // subtotal 18 000 + 2 500 − 501 = 19 999; 10.25 % tax = 2 049.8975 → 2 050; total 22 049
    expect(t).toEqual({ lineTotalsCents: [18000, 2500, -501], subtotalCents: 19999, taxCents: 2050, totalCents: 22049 });
  });

  it('credits larger than the charges give tax back: −$10.00 at 10.25 % is −$1.025 → −$1.03', () => {
    expect(invoiceTotals([{ kind: 'part', quantity: 1, unitPriceCents: -1000 }], 1025)).toEqual({
      lineTotalsCents: [-1000], subtotalCents: -1000, taxCents: -103, totalCents: -1103,
    });
  });

  it('an invoice without lines is zero', () => {
    expect(invoiceTotals([], 1025)).toEqual({ lineTotalsCents: [], subtotalCents: 0, taxCents: 0, totalCents: 0 });
  });

  it('formats cents and rates for accounting imports', () => {
    expect(centsToDecimal(13580)).toBe('135.80');
    expect(centsToDecimal(5)).toBe('0.05');
    expect(centsToDecimal(-5)).toBe('-0.05');
    expect(centsToDecimal(0)).toBe('0.00');
    expect(basisPointsToPercent(1025)).toBe('10.25');
    expect(basisPointsToPercent(1000)).toBe('10');
    expect(basisPointsToPercent(1050)).toBe('10.5');
    expect(basisPointsToPercent(0)).toBe('0');
  });
});
