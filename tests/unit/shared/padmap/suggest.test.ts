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
      padByKind: { self_leveling: 30, glued: 30 },
    });
    expect(s.keys.palm_d).toMatchObject({ basedOn: 4, cupDiameterMm: 10.2, rimDiameterMm: 8, padDiameterMm: 10, padKind: 'glued' });
  });

  it('takes the pad per kind, never a median across glued and self-leveling pads together', () => {
    // Low C: two self-leveling maps chose 29.5 mm, two glued maps chose 30.5 mm (snug in the same 30.6 mm cup).
    // Mixed together the median would be 30.0 mm, a size neither kind had; per kind it is 29.5 and 30.5.
    const maps = [
      map('a', '2024-01-01T00:00:00Z', 30.6, 29.5),
      map('b', '2024-01-02T00:00:00Z', 30.6, 29.5),
      map('c', '2024-01-03T00:00:00Z', 30.6, 30.5, 'glued'),
      map('d', '2024-01-04T00:00:00Z', 30.6, 30.5, 'glued'),
    ];
    const s = suggestFromMaps(maps).keys.low_c;
    expect(s.padByKind).toEqual({ self_leveling: 29.5, glued: 30.5 });
    expect(s).toMatchObject({ padKind: 'self_leveling', padDiameterMm: 29.5 }); // a tie goes to self-leveling
  });

  it('suggests only a size somebody chose and the catalog has', () => {
    // 30.0 and 30.5 mm chosen once each: the lower of the two middle sizes, 30.0 mm, not 30.25 mm
    const two = [map('a', '2024-01-01T00:00:00Z', 30.6, 30), map('b', '2024-01-02T00:00:00Z', 30.9, 30.5)];
    expect(suggestFromMaps(two).keys.low_c.padDiameterMm).toBe(30);
    // the catalog has dropped 30.0 mm and carries 29.0, 29.75 and 31.0: the next size down, 29.75 mm
    const catalog = { self_leveling: [{ diameterMm: 31, thicknessMm: 3.6 }, { diameterMm: 29, thicknessMm: 3.6 }, { diameterMm: 29.75, thicknessMm: 3.6 }], glued: [] };
    expect(suggestFromMaps(two, catalog).keys.low_c).toMatchObject({ padDiameterMm: 29.75, padByKind: { self_leveling: 29.75, glued: null } });
  });

  it('has nothing to say without earlier maps', () => {
    expect(suggestFromMaps([])).toEqual({ basedOnMaps: 0, keys: {} });
  });
});
