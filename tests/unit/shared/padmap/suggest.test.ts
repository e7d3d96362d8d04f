import { describe, expect, it } from 'vitest';
import { median, suggestFromMaps, type EarlierMap } from '../../../../shared/padmap/suggest.js';

const map = (instrumentId: string, createdAt: string, lowC: number | null, pad: number | null, kind: 'self_leveling' | 'glued' = 'self_leveling'): EarlierMap => ({
  instrumentId,
  createdAt,
  entries: [
    { keyId: 'low_c', padKind: kind, cupDiameterMm: lowC, cupDepthMm: lowC == null ? null : 4, rimDiameterMm: null },
    { keyId: 'palm_d', padKind: 'glued', cupDiameterMm: 10.2, cupDepthMm: null, rimDiameterMm: 8 },
  ],
  results: [
    { keyId: 'low_c', padKind: kind, padDiameterMm: pad },
    { keyId: 'palm_d', padKind: 'glued', padDiameterMm: 10 },
  ],
});

describe('median', () => {
  it('takes the middle value, or the mean of the middle two', () => {
    expect(median([])).toBeNull();
    expect(median([3, 1, 2])).toBe(2);
    expect(median([30.5, 30.4, 30.6, 31])).toBe(30.55);
  });
});

describe('suggestFromMaps: the median of earlier maps of the same model', () => {
  const fixture: EarlierMap[] = [
    map('i1', '2024-01-01T00:00:00Z', 30.9, 30.5), // superseded by i1's later map
    map('i1', '2024-06-01T00:00:00Z', 30.4, 30.0),
    map('i2', '2024-02-01T00:00:00Z', 30.5, 30.0),
    map('i3', '2024-03-01T00:00:00Z', 30.6, 30.0, 'glued'),
    map('i4', '2024-04-01T00:00:00Z', null, null),
  ];

  it('counts each instrument once, by its latest map', () => {
    const s = suggestFromMaps(fixture);
    expect(s.basedOnMaps).toBe(4);
    expect(s.keys.low_c).toEqual({
      keyId: 'low_c', basedOn: 3, cupDiameterMm: 30.5, cupDepthMm: 4, rimDiameterMm: null, padDiameterMm: 30, padKind: 'self_leveling',
    });
    expect(s.keys.palm_d).toMatchObject({ basedOn: 4, cupDiameterMm: 10.2, rimDiameterMm: 8, padDiameterMm: 10, padKind: 'glued' });
  });

  it('has nothing to say without earlier maps', () => {
    expect(suggestFromMaps([])).toEqual({ basedOnMaps: 0, keys: {} });
  });
});
