import { describe, expect, it } from 'vitest';
import { basisPointsToPercent, centsToDecimal, centsToInput, formatCents, parseMoney, percentToBasisPoints } from '../../../shared/money.js';

/* Expected values worked by hand: dollars × 100 = cents, written out digit by digit. */

describe('reading a typed amount (parseMoney)', () => {
  it('reads dollars and cents from the digits, never through a binary fraction', () => {
    expect(parseMoney('12.50')).toBe(1250);
    expect(parseMoney('$ 0.29')).toBe(29); // 0.29 * 100 is 28.999999999999996 in binary floating point
    expect(parseMoney('7')).toBe(700);
    expect(parseMoney(' 92.5 ')).toBe(9250);
    expect(parseMoney('9999999.99')).toBe(999_999_999);
  });

  it('accepts a comma as the decimal separator, everywhere the same', () => {
    expect(parseMoney('12,50')).toBe(1250);
    expect(parseMoney('7,5')).toBe(750);
    expect(parseMoney('$0,05')).toBe(5);
  });

  it('refuses thousands separators, a third decimal, signs, exponents and empty text', () => {
    for (const text of ['', '   ', 'abc', '1,250', '1.234', '1,234.50', '1.234,50', '-3', '+3', '1e3', '12.', '.50', '10000000']) {
      expect(parseMoney(text), text).toBeNull();
    }
  });
});

describe('showing amounts', () => {
  it('gives a field two decimals and no sign', () => {
    expect(centsToInput(1250)).toBe('12.50');
    expect(centsToInput(5)).toBe('0.05');
    expect(centsToInput(0)).toBe('0.00');
    expect(centsToInput(null)).toBe('');
  });

  it('gives accounting a plain decimal, negatives included', () => {
    expect(centsToDecimal(123_456)).toBe('1234.56');
    expect(centsToDecimal(-5)).toBe('-0.05');
    expect(centsToDecimal(100)).toBe('1.00');
  });

  it('gives people dollars with grouping', () => {
    expect(formatCents(76_299)).toBe('$762.99');
    expect(formatCents(123_450)).toBe('$1,234.50');
    expect(formatCents(5)).toBe('$0.05');
  });

  it('round-trips every field value through the parser', () => {
    for (const cents of [0, 1, 29, 1250, 9250, 999_999_999]) expect(parseMoney(centsToInput(cents))).toBe(cents);
  });
});

describe('rates in basis points', () => {
  it('reads a typed percentage', () => {
    expect(percentToBasisPoints('10.25')).toBe(1025);
    expect(percentToBasisPoints('8.25%')).toBe(825);
    expect(percentToBasisPoints('')).toBe(0);
    expect(percentToBasisPoints('8.255')).toBeUndefined();
  });

  it('shows one without trailing zeros', () => {
    expect(basisPointsToPercent(1025)).toBe('10.25');
    expect(basisPointsToPercent(1000)).toBe('10');
    expect(basisPointsToPercent(1050)).toBe('10.5');
    expect(basisPointsToPercent(0)).toBe('0');
  });
});
