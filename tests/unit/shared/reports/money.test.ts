import { describe, expect, it } from 'vitest';
import {
  basisPointsToPercent,
  centsToDecimal,
  divideRoundHalfAwayFromZero,
  invoiceTotals,
  lineTotalCents,
  taxCents,
} from '../../../../shared/reports/money.js';

describe('invoice arithmetic in integer cents', () => {
  it('rounds half away from zero, exactly', () => {
    expect(divideRoundHalfAwayFromZero(25, 10)).toBe(3);
    expect(divideRoundHalfAwayFromZero(24, 10)).toBe(2);
    expect(divideRoundHalfAwayFromZero(-25, 10)).toBe(-3);
    expect(divideRoundHalfAwayFromZero(-24, 10)).toBe(-2);
    expect(divideRoundHalfAwayFromZero(0, 7)).toBe(0);
    expect(() => divideRoundHalfAwayFromZero(1, 0)).toThrow(RangeError);
  });

  it('hours × rate and quantity × price become whole cents (NUMERIC strings from pg are fine)', () => {
    expect(lineTotalCents('1.25', 9250)).toBe(11563); // 11 562.5 → 11 563
    expect(lineTotalCents(0.5, 125)).toBe(63); // 62.5 → 63
    expect(lineTotalCents('3.00', 1299)).toBe(3897);
    // 0.29 × 100 is 28.999… in binary floating point; hundredths keep it exact
    expect(lineTotalCents(0.29, 100)).toBe(29);
  });

  it('tax on the subtotal at basis points, rounded once', () => {
    expect(taxCents(12345, 1000)).toBe(1235); // 1234.5 → 1235
    expect(taxCents(10000, 1025)).toBe(1025);
    expect(taxCents(999, 875)).toBe(87); // 87.4125
    expect(taxCents(12345, 0)).toBe(0);
  });

  it('an invoice adds up: lines rounded, subtotal = sum of lines, total = subtotal + tax', () => {
    const t = invoiceTotals(
      [
        { kind: 'labor', hours: '1.25', rateCents: 9250 },
        { kind: 'part', quantity: '0.50', unitPriceCents: 125 },
        { kind: 'part', quantity: 1, unitPriceCents: 719 },
      ],
      1000,
    );
    expect(t).toEqual({ lineTotalsCents: [11563, 63, 719], subtotalCents: 12345, taxCents: 1235, totalCents: 13580 });
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
