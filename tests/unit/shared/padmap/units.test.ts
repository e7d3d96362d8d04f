import { describe, expect, it } from 'vitest';
import { formatBoth, formatInches, formatMm, inchesToMm, inchTextToMm, mmToInches, parseLength, roundTo } from '../../../../shared/padmap/units.js';

describe('parseLength: caliper readings as technicians type them', () => {
  it.each([
    ['30.5', 'mm', 30.5, 'mm'],
    ['30.5mm', 'mm', 30.5, 'mm'],
    ['30.5 mm', 'in', 30.5, 'mm'],
    ['30,5', 'mm', 30.5, 'mm'],
    ['.5', 'mm', 0.5, 'mm'],
    ['3.05cm', 'mm', 30.5, 'mm'],
    ['1.200in', 'mm', 30.48, 'in'],
    ['1.2"', 'mm', 30.48, 'in'],
    ['1.2\u201D', 'mm', 30.48, 'in'], // the curly closing quote a phone keyboard types for "
    ['1.2 \u201D', 'mm', 30.48, 'in'],
    ['1.2\u2033', 'mm', 30.48, 'in'], // double prime, the typographic inch mark
    ['1.2\u2019\u2019', 'mm', 30.48, 'in'], // two curly apostrophes
    ['1.2 in', 'mm', 30.48, 'in'],
    ['1.2 inches', 'mm', 30.48, 'in'],
    ['1.2', 'in', 30.48, 'in'],
    ['  0.875IN ', 'mm', 22.225, 'in'],
  ] as const)('%s (bare numbers in %s) → %f mm', (text, unit, mm, readUnit) => {
    const parsed = parseLength(text, unit);
    expect(parsed).toMatchObject({ ok: true, mm, unit: readUnit });
  });

  it.each(['', 'abc', '30.5 furlongs', '1.2.3', '-4', '0', '0mm', '30.5 mm mm'])('refuses %j with a message', (text) => {
    const parsed = parseLength(text);
    expect(parsed.ok).toBe(false);
    if (!parsed.ok) expect(parsed.error.length).toBeGreaterThan(5);
  });

  it('takes numbers in the default unit', () => {
    expect(parseLength(1.2, 'in')).toMatchObject({ ok: true, mm: 30.48 });
    expect(parseLength(30.5, 'mm')).toMatchObject({ ok: true, mm: 30.5 });
    expect(parseLength(Number.NaN).ok).toBe(false);
  });
});

describe('conversion and display', () => {
  it('converts typed inches through their decimal digits, not binary multiplication', () => {
    // 1.2 * 25.4 in binary doubles is 30.479999999999997; the decimal route gives the double nearest 30.48
    expect(1.2 * 25.4).not.toBe(30.48);
    expect(inchTextToMm('1.200')).toBe(30.48);
    expect(inchesToMm(1.2)).toBe(30.48);
    expect(inchesToMm(-0.5)).toBe(-12.7);
    expect(mmToInches(25.4)).toBe(1);
  });

  it('rounds half away from zero at the shown precision', () => {
    expect(roundTo(1.005, 2)).toBe(1.01);
    expect(roundTo(-1.005, 2)).toBe(-1.01);
    expect(formatMm(0.15000000000000036)).toBe('0.15 mm');
    expect(formatInches(30.48)).toBe('1.200 in');
    expect(formatBoth(30.48)).toBe('30.48 mm (1.200 in)');
  });
});
