import { describe, expect, it } from 'vitest';
import { formatMinutes } from '@/features/jobs/format';
import { precheckFile, PHOTO_MAX_BYTES } from '../../../../shared/files/limits.js';

describe('times typed at the bench', () => {
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
