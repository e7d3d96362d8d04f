import { describe, expect, it } from 'vitest';
import { DEFAULT_PAD_RULES, padRulesSchema, resolvePadRules } from '../../../../shared/padmap/rules.js';
import { hasPadKeys, keyName, PAD_KEYS_BY_FAMILY, padKeysFor } from '../../../../shared/padmap/keys.js';

describe('pad rules', () => {
  it('defaults: 0.15 mm clearance, 0.5 mm overlap and protrusion, stems 0.5/1.0/1.5 mm, factor 0.5', () => {
    expect(DEFAULT_PAD_RULES).toEqual({
      selfLevelingMinClearanceMm: 0.15, gluedOffsetMm: 0, minRimOverlapMm: 0.5, stemHeightsMm: [0.5, 1, 1.5], minProtrusionMm: 0.5, selfLevelingLaborFactor: 0.5, maxRadialClearanceMm: 1,
    });
  });

  it('keeps the glued offset within −0.5 … +0.5 mm and sorts the stems', () => {
    const base = { ...DEFAULT_PAD_RULES };
    expect(padRulesSchema.safeParse({ ...base, gluedOffsetMm: 0.6 }).success).toBe(false);
    expect(padRulesSchema.safeParse({ ...base, gluedOffsetMm: -0.5 }).success).toBe(true);
    expect(padRulesSchema.parse({ ...base, stemHeightsMm: [1.5, 0.5, 2] }).stemHeightsMm).toEqual([0.5, 1.5, 2]);
    expect(padRulesSchema.safeParse({ ...base, stemHeightsMm: [] }).success).toBe(false);
    expect(padRulesSchema.safeParse({ ...base, stemHeightsMm: [1, 1] }).success).toBe(false);
  });

  it('the maximum clearance is optional (1.0 mm) and must exceed the self-leveling minimum', () => {
    const { maxRadialClearanceMm: _omitted, ...older } = DEFAULT_PAD_RULES;
    expect(padRulesSchema.parse(older).maxRadialClearanceMm).toBe(1);
    const tight = padRulesSchema.safeParse({ ...DEFAULT_PAD_RULES, selfLevelingMinClearanceMm: 0.5, maxRadialClearanceMm: 0.4 });
    expect(tight.success).toBe(false);
    expect(tight.error?.issues[0].path).toEqual(['maxRadialClearanceMm']);
  });

  it('stored rules are merged over the defaults, field by field', () => {
    expect(resolvePadRules(undefined)).toEqual(DEFAULT_PAD_RULES);
    expect(resolvePadRules({ gluedOffsetMm: -0.5, minRimOverlapMm: 'lots' })).toEqual({ ...DEFAULT_PAD_RULES, gluedOffsetMm: -0.5 });
  });
});

describe('pad keys per family', () => {
  it('an alto saxophone lists the trade’s key names, bell keys first, with palm, side and octave keys', () => {
    const names = padKeysFor('alto_saxophone').map((k) => k.name);
    expect(names.slice(0, 14)).toEqual(['Low B♭', 'Low B', 'Low C♯', 'Low C', 'E♭', 'D', 'C', 'B', 'A', 'G', 'G♯', 'F', 'E', 'F♯']);
    expect(names).toEqual(expect.arrayContaining(['Palm D', 'Palm E♭', 'Palm F', 'Side B♭', 'Side C', 'High F♯', 'Front F', 'Neck octave key']));
  });

  it('a baritone saxophone may have a low A', () => {
    expect(padKeysFor('baritone_saxophone')[0]).toEqual({ id: 'low_a', name: 'Low A', group: 'main', optional: true });
  });

  it('ids are unique within each family and brass has no pads', () => {
    for (const keys of Object.values(PAD_KEYS_BY_FAMILY)) expect(new Set(keys!.map((k) => k.id)).size).toBe(keys!.length);
    expect(hasPadKeys('trumpet')).toBe(false);
    expect(hasPadKeys('flute')).toBe(true);
    expect(keyName('alto_saxophone', 'gs')).toBe('G♯');
    expect(keyName('alto_saxophone', 'extra-1', 'Auxiliary F')).toBe('Auxiliary F');
  });
});
