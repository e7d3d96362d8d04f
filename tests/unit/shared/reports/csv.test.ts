import { describe, expect, it } from 'vitest';
import { csvField, toCsv } from '../../../../shared/reports/csv.js';

describe('CSV (RFC 4180)', () => {
  it('quotes fields with commas, quotes and line breaks, doubling inner quotes', () => {
    expect(csvField('plain')).toBe('plain');
    expect(csvField('Quillon Park, Band')).toBe('"Quillon Park, Band"');
    expect(csvField('the "good" flute')).toBe('"the ""good"" flute"');
    expect(csvField('two\nlines')).toBe('"two\nlines"');
  });

  it('writes numbers, booleans, dates and blanks plainly', () => {
    expect(csvField(-1250)).toBe('-1250');
    expect(csvField(2.5)).toBe('2.5');
    expect(csvField(true)).toBe('true');
    expect(csvField(null)).toBe('');
    expect(csvField(undefined)).toBe('');
    expect(csvField(new Date('2026-08-03T15:00:00Z'))).toBe('2026-08-03T15:00:00.000Z');
  });

  it('defuses text a spreadsheet would run as a formula (OWASP CSV Injection), but not numbers', () => {
    expect(csvField('=HYPERLINK("http://x","y")')).toBe(`"'=HYPERLINK(""http://x"",""y"")"`);
    expect(csvField('+1 206 555 0141')).toBe("'+1 206 555 0141");
    expect(csvField('@sum')).toBe("'@sum");
    expect(csvField('-5+A1')).toBe("'-5+A1");
    expect(csvField('-2-3')).toBe("'-2-3");
    expect(csvField(-5)).toBe('-5');
    // a credit written as a decimal amount is a number, not a formula: kept as it is
    expect(csvField('-12.50')).toBe('-12.50');
  });

  it('joins rows with CRLF and ends with one', () => {
    expect(toCsv(['a', 'b'], [[1, 'x,y'], [null, 'z']])).toBe('a,b\r\n1,"x,y"\r\n,z\r\n');
  });
});
