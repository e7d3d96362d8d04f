import { describe, expect, it } from 'vitest';
import { centsToInput, formatMinutes, parseMoneyToCents } from '@/features/jobs/format';
import { precheckFile, PHOTO_MAX_BYTES } from '../../../../shared/files/limits.js';

describe('money typed at the bench', () => {
  it('reads dollars and cents from the digits, never through a binary fraction', () => {
    expect(parseMoneyToCents('12.50')).toBe(1250);
    expect(parseMoneyToCents('$ 0.29')).toBe(29); // 0.29 * 100 is 28.999999999999996
    expect(parseMoneyToCents('7')).toBe(700);
    expect(parseMoneyToCents('7,5')).toBe(750);
  });
  it('refuses what is not an amount with at most two decimals', () => {
    for (const text of ['', 'abc', '1.234', '-3', '1e3']) expect(parseMoneyToCents(text)).toBeNull();
  });
  it('shows cents back as an input value', () => {
    expect(centsToInput(1250)).toBe('12.50');
    expect(centsToInput(null)).toBe('');
  });
  it('shows minutes as hours and minutes', () => {
    expect(formatMinutes(45)).toBe('45 min');
    expect(formatMinutes(90)).toBe('1 h 30 min');
    expect(formatMinutes(120)).toBe('2 h');
  });
});

describe('checks before an upload leaves the phone', () => {
  it('stops a wrong type or an oversize photo before any data is sent', () => {
    expect(precheckFile('photo', { type: 'image/heic', size: 1000 })).toMatch(/JPEG, PNG or WebP/);
    expect(precheckFile('photo', { type: 'image/jpeg', size: PHOTO_MAX_BYTES + 1 })).toMatch(/limit is 15 MB/);
    expect(precheckFile('document', { type: 'image/jpeg', size: 10 })).toMatch(/PDF/);
    expect(precheckFile('photo', { type: 'image/webp', size: 10 })).toBeNull();
  });
});
