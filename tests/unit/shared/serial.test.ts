import { describe, expect, it } from 'vitest';
import { normalizeMaker, normalizeSerial } from '../../../shared/serial.js';

describe('normalizeSerial', () => {
  it('upper-cases and drops spaces, dashes, dots, slashes and underscores', () => {
    expect(normalizeSerial('ab-104 233')).toBe('AB104233');
    expect(normalizeSerial('AB.104/233')).toBe('AB104233');
    expect(normalizeSerial('ab_104\\233')).toBe('AB104233');
  });

  it('treats the serial forms of one engraving as the same key', () => {
    const forms = ['  AB-104 233 ', 'ab104233', 'Ab 104-233', 'AB\t104\n233'];
    expect(new Set(forms.map(normalizeSerial))).toEqual(new Set(['AB104233']));
  });

  it('folds dash look-alikes from phones and spreadsheets', () => {
    expect(normalizeSerial('KX\u2013 0042')).toBe('KX0042'); // en dash
    expect(normalizeSerial('KX\u22120042')).toBe('KX0042'); // minus sign
    expect(normalizeSerial('KX\u20110042')).toBe('KX0042'); // non-breaking hyphen
  });

  it('folds full-width characters typed on some keyboards', () => {
    expect(normalizeSerial('\uFF21\uFF22\uFF11\uFF12')).toBe('AB12');
  });

  it('keeps letters and digits that do carry meaning, including leading zeros', () => {
    expect(normalizeSerial('007719204')).toBe('007719204');
    expect(normalizeSerial('0O1l')).toBe('0O1L');
    expect(normalizeSerial('7719204')).not.toBe(normalizeSerial('7719205'));
  });

  it('returns an empty string for a serial of separators only', () => {
    expect(normalizeSerial(' - / . ')).toBe('');
  });
});

describe('normalizeMaker', () => {
  it('lower-cases, trims and collapses whitespace', () => {
    expect(normalizeMaker('  Skelmire   Winds ')).toBe('skelmire winds');
    expect(normalizeMaker('SKELMIRE\tWINDS')).toBe('skelmire winds');
  });

  it('keeps punctuation that distinguishes makers', () => {
    expect(normalizeMaker('Aldmoor & Sons')).toBe('aldmoor & sons');
    expect(normalizeMaker('Aldmoor-Sons')).not.toBe(normalizeMaker('Aldmoor Sons'));
  });
});
