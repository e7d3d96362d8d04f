import { describe, expect, it } from 'vitest';
import { readEntries, savePadMapSchema } from '../../../../shared/padmap/entries.js';

describe('readEntries: typed rows into millimetres, with a message per cell', () => {
  it('reads mixed units and keeps the text as typed', () => {
    const { entries, errors } = readEntries(
      [
        { keyId: 'low_c', padKind: 'self_leveling', floor: 'flat', cupDiameter: '1.200in', cupDepth: '4', rimDiameter: '28.5mm' },
        { keyId: 'palm_d', padKind: 'glued', floor: 'sunken', cupDiameter: 10.2 },
        { keyId: 'octave_neck', padKind: 'glued', floor: 'flat', cupDiameter: '  ' },
      ],
      'mm',
    );
    expect(errors).toEqual({});
    expect(entries[0]).toMatchObject({ cupDiameterMm: 30.48, cupDepthMm: 4, rimDiameterMm: 28.5, typed: { cupDiameter: '1.200in', cupDepth: '4', rimDiameter: '28.5mm' } });
    expect(entries[1]).toMatchObject({ cupDiameterMm: 10.2, cupDepthMm: null, floor: 'sunken' });
    expect(entries[2]).toMatchObject({ cupDiameterMm: null, typed: {} });
  });

  it('bare numbers follow the map’s unit, and an implausible size points at the unit', () => {
    const inches = readEntries([{ keyId: 'a', padKind: 'glued', floor: 'flat', cupDiameter: '1.2' }], 'in');
    expect(inches.entries[0].cupDiameterMm).toBe(30.48);
    const wrongUnit = readEntries([{ keyId: 'a', padKind: 'glued', floor: 'flat', cupDiameter: '30.5' }], 'in');
    expect(wrongUnit.errors['entries.0.cupDiameter']).toMatch(/774\.7 mm is outside 2–120 mm.*unit/);
  });

  it('names the exact cell that cannot be read', () => {
    const { errors } = readEntries(
      [
        { keyId: 'a', padKind: 'glued', floor: 'flat', cupDiameter: '30' },
        { keyId: 'b', padKind: 'self_leveling', floor: 'flat', cupDiameter: '30', cupDepth: 'deep' },
        { keyId: 'c', padKind: 'self_leveling', floor: 'flat', rimDiameter: '20' },
      ],
      'mm',
    );
    expect(Object.keys(errors).sort()).toEqual(['entries.1.cupDepth', 'entries.2.cupDiameter']);
    expect(errors['entries.2.cupDiameter']).toMatch(/cup diameter too/);
  });
});

describe('savePadMapSchema', () => {
  it('refuses the same key twice and unknown pad kinds', () => {
    const twice = savePadMapSchema.safeParse({ unitSystem: 'mm', entries: [{ keyId: 'a', padKind: 'glued' }, { keyId: 'a', padKind: 'glued' }] });
    expect(twice.success).toBe(false);
    const kind = savePadMapSchema.safeParse({ entries: [{ keyId: 'a', padKind: 'felt' }] });
    expect(kind.success).toBe(false);
    const ok = savePadMapSchema.parse({ entries: [{ keyId: 'low_c', padKind: 'glued', cupDiameter: '30' }] });
    expect(ok).toMatchObject({ unitSystem: 'mm', entries: [{ floor: 'flat' }] });
  });
});
