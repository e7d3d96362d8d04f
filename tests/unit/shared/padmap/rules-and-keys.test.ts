import { describe, expect, it } from 'vitest';
import { DEFAULT_PAD_RULES, padRulesSchema, resolvePadRules } from '../../../../shared/padmap/rules.js';
import { hasPadKeys, keyName, PAD_KEYS_BY_FAMILY, padKeysFor } from '../../../../shared/padmap/keys.js';

describe('pad rules', () => {
  // Each default with where it comes from, written out here rather than copied from the code.
  const expectedDefaults = {
    selfLevelingMinClearanceMm: 0.15, // common practice: a self-leveling pad must be able to tilt in its cup
    gluedOffsetMm: 0, // common practice: a glued pad fits snug, the largest not over the cup
    minRimOverlapMm: 0.5, // from memory
    stemHeightsMm: [0.5, 1, 1.5], // common practice: the stems a bench stocks
    minProtrusionMm: 0.5, // from memory
    selfLevelingLaborFactor: 0.5, // a Benchrelay pricing default the owner sets, not a trade figure
    repadBaseHours: 1.5, // a Benchrelay pricing default the owner sets
    repadHoursPerKey: 0.25, // a Benchrelay pricing default the owner sets
    maxRadialClearanceMm: 1, // common practice: more play than 1 mm a side is the wrong pad size
  };

  it('a network that set nothing gets the defaults, each with its source', () => {
    expect(resolvePadRules(undefined)).toEqual(expectedDefaults);
    expect(resolvePadRules({ gluedOffsetMm: -0.5, minRimOverlapMm: 'lots' })).toEqual({ ...expectedDefaults, gluedOffsetMm: -0.5 });
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
    expect(resolvePadRules({ stemHeightsMm: [2, 1], selfLevelingLaborFactor: 9 })).toEqual({ ...expectedDefaults, stemHeightsMm: [1, 2] });
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
    for (const keys of Object.values(PAD_KEYS_BY_FAMILY)) expect(new Set(keys.map((k) => k.id)).size).toBe(keys.length);
    expect(hasPadKeys('trumpet')).toBe(false);
    expect(hasPadKeys('flute')).toBe(true);
    expect(keyName('alto_saxophone', 'gs')).toBe('G♯');
    expect(keyName('alto_saxophone', 'extra-1', 'Auxiliary F')).toBe('Auxiliary F');
  });
});
