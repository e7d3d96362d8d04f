import { describe, expect, it } from 'vitest';
import { chooseStem, computeKey, computePadMap, laborEstimate, type KeyMeasurement } from '../../../../shared/padmap/compute.js';
import { DEFAULT_PAD_RULES, type PadRules } from '../../../../shared/padmap/rules.js';
import { halfMillimetreCatalog } from './fixtures.js';

const catalog = halfMillimetreCatalog();
const rules: PadRules = { ...DEFAULT_PAD_RULES };
const key = (over: Partial<KeyMeasurement> = {}): KeyMeasurement => ({
  keyId: 'low_c', padKind: 'self_leveling', floor: 'flat', cupDiameterMm: 30.5, cupDepthMm: 4, rimDiameterMm: 28, ...over,
});
const codes = (m: KeyMeasurement, r: PadRules = rules) => computeKey(m, catalog, r).findings.map((f) => f.code);

/*
 * Hand-worked examples. The 0.15 mm clearance, the 0.5/1.0/1.5 mm stems and the 0.5 labor factor
 * are common practice; the 0.5 mm rim overlap and 0.5 mm protrusion minimums are from memory.
 */
describe('self-leveling pad diameter (common practice: 0.15 mm clearance per side)', () => {
  it('a 30.5 mm cup gets a 30.0 mm pad from a 0.5 mm-step catalog', () => {
    const r = computeKey(key({ cupDiameterMm: 30.5 }), catalog, rules);
    expect(r.padDiameterMm).toBe(30);
    expect(r.radialClearanceMm).toBe(0.25);
  });

  it('a 29.3 mm cup gets 29.0 mm: exactly 0.15 mm per side is enough', () => {
    const r = computeKey(key({ cupDiameterMm: 29.3 }), catalog, rules);
    expect(r.padDiameterMm).toBe(29);
    expect(r.radialClearanceMm).toBe(0.15);
  });

  it('a 29.29 mm cup drops to 28.5 mm, since 29.0 would leave 0.145 mm', () => {
    expect(computeKey(key({ cupDiameterMm: 29.29 }), catalog, rules).padDiameterMm).toBe(28.5);
  });

  it('a cup too small for the smallest pad is an error by the cup diameter', () => {
    const r = computeKey(key({ cupDiameterMm: 6.2, rimDiameterMm: null }), catalog, rules);
    expect(r.padDiameterMm).toBeNull();
    expect(r.status).toBe('error');
    expect(r.findings).toEqual([expect.objectContaining({ code: 'no_pad_fits', severity: 'error', field: 'cupDiameter' })]);
  });

  it('a larger owner minimum clearance moves to the next size down', () => {
    expect(computeKey(key({ cupDiameterMm: 30.5 }), catalog, { ...rules, selfLevelingMinClearanceMm: 0.3 }).padDiameterMm).toBe(29.5);
  });
});

describe('a pad missing from the catalog is named by its size', () => {
  it('shows quarter-millimetre sizes with two decimals, others with one', () => {
    const quarter = { self_leveling: [{ diameterMm: 30.25, thicknessMm: 3.6 }, { diameterMm: 30, thicknessMm: 3.6 }], glued: [] };
    // 30.6 mm cup: limit 30.3 mm → 30.25 mm; 30.4 mm cup: limit 30.1 mm → 30.0 mm. No names in this catalog.
    const result = computePadMap({
      entries: [key({ keyId: 'a', cupDiameterMm: 30.6, rimDiameterMm: null }), key({ keyId: 'b', cupDiameterMm: 30.4, rimDiameterMm: null })],
      catalog: quarter, rules,
    });
    expect(result.parts.map((p) => p.name)).toEqual(['Self-leveling pad 30.0 mm', 'Self-leveling pad 30.25 mm']);
  });
});

describe('a cup larger than every pad (common practice: at most 1.0 mm play per side)', () => {
  // The fixture catalog runs 6.0 … 58.0 mm in 0.5 mm steps, in both kinds.
  it('a 70 mm cup is "no pad large enough", not the 58 mm pad and "ok"', () => {
    // self-leveling limit 70 − 2 × 0.15 = 69.7 mm → 58.0 mm would leave (70 − 58) / 2 = 6 mm per side > 1.0 mm
    const r = computeKey(key({ cupDiameterMm: 70, rimDiameterMm: 64 }), catalog, rules);
    expect(r.status).toBe('error');
    expect(r.padDiameterMm).toBeNull();
    expect(r.findings).toEqual([expect.objectContaining({ code: 'no_pad_large_enough', severity: 'error', field: 'cupDiameter' })]);
    expect(r.findings[0].message).toMatch(/^No pad large enough: .*58\.00 mm.*6\.00 mm per side.*1\.00 mm/);
    expect(computeKey(key({ padKind: 'glued', cupDiameterMm: 70, rimDiameterMm: null }), catalog, rules).findings.map((f) => f.code))
      .toEqual(['no_pad_large_enough']);
  });

  it('at the limit: a 60.0 mm cup takes 58.0 mm (exactly 1.0 mm per side); 60.1 mm does not', () => {
    const atLimit = computeKey(key({ cupDiameterMm: 60, rimDiameterMm: null }), catalog, rules);
    expect(atLimit.padDiameterMm).toBe(58);
    expect(atLimit.radialClearanceMm).toBe(1);
    expect(atLimit.findings.map((f) => f.code)).toEqual(['rim_not_measured']);
    expect(codes(key({ cupDiameterMm: 60.1, rimDiameterMm: null }))).toEqual(['no_pad_large_enough']);
    // the owner allows 1.5 mm: (61 − 58) / 2 = 1.5 mm is within it again
    expect(computeKey(key({ cupDiameterMm: 61, rimDiameterMm: null }), catalog, { ...rules, maxRadialClearanceMm: 1.5 }).padDiameterMm).toBe(58);
  });

  it('a gap in the catalog keeps the pad but warns that it is loose', () => {
    const gappy = { self_leveling: [{ diameterMm: 28, thicknessMm: 3.6 }, { diameterMm: 31, thicknessMm: 3.6 }], glued: [] };
    // 30.5 mm cup: limit 30.2 mm → 28 mm, (30.5 − 28) / 2 = 1.25 mm per side > 1.0 mm; 31 mm would not fit
    const r = computeKey(key({ cupDiameterMm: 30.5, cupDepthMm: 4, rimDiameterMm: 26 }), gappy, rules);
    expect(r.padDiameterMm).toBe(28);
    expect(r.radialClearanceMm).toBe(1.25);
    expect(r.status).toBe('warning');
    expect(r.findings.map((f) => [f.code, f.severity])).toEqual([['clearance_large', 'warning']]);
    expect(r.findings[0].message).toMatch(/1\.25 mm per side.*nothing between 28\.00 mm and 31\.00 mm/);
  });
});

describe('glued pad diameter (snug; owner offset −0.5 … +0.5 mm, common practice differs)', () => {
  const glued = (cup: number, offset: number) =>
    computeKey(key({ padKind: 'glued', cupDiameterMm: cup, rimDiameterMm: null }), catalog, { ...rules, gluedOffsetMm: offset });
  it('by default takes the largest catalog pad not over the cup', () => {
    expect(glued(30.5, 0).padDiameterMm).toBe(30.5);
    expect(glued(30.3, 0).padDiameterMm).toBe(30);
  });
  it('follows the offset: next size down, or half a millimetre over to press in', () => {
    expect(glued(30.5, -0.5).padDiameterMm).toBe(30);
    expect(glued(30.5, 0.5).padDiameterMm).toBe(31);
    expect(glued(30.3, 0.25).padDiameterMm).toBe(30.5);
    expect(glued(30.5, 0.5).radialClearanceMm).toBe(-0.25);
  });
  it('glued pads get no stem height', () => {
    const r = glued(30.5, 0);
    expect(r.stemHeightMm).toBeNull();
    expect(r.protrusionMm).toBeNull();
  });
});

describe('seal over the tone-hole rim (from memory: at least 0.5 mm per side)', () => {
  it('no finding when the overlap reaches the minimum exactly', () => {
    const r = computeKey(key({ rimDiameterMm: 29 }), catalog, rules); // pad 30.0 → 0.5 per side
    expect(r.rimOverlapMm).toBe(0.5);
    expect(r.findings).toEqual([]);
    expect(r.status).toBe('ok');
  });
  it('warns when the pad overlaps the rim by less than the minimum', () => {
    const r = computeKey(key({ rimDiameterMm: 29.5 }), catalog, rules);
    expect(r.rimOverlapMm).toBe(0.25);
    expect(r.status).toBe('warning');
    expect(r.findings[0]).toMatchObject({ code: 'rim_overlap_small', severity: 'warning', field: 'rimDiameter' });
    expect(r.findings[0].message).toContain('0.25 mm');
  });
  it('flags an error when the pad does not cover the tone hole', () => {
    expect(codes(key({ cupDiameterMm: 30.5, rimDiameterMm: 30.0 }))).toEqual(['rim_not_covered']);
    const r = computeKey(key({ cupDiameterMm: 31, rimDiameterMm: 30.8 }), catalog, rules); // pad 30.5
    expect(r.status).toBe('error');
    expect(r.rimOverlapMm).toBe(-0.15);
  });
  it('a rim not smaller than the cup is a reading to check', () => {
    expect(codes(key({ cupDiameterMm: 30.5, rimDiameterMm: 31 }))).toEqual(['rim_wider_than_cup', 'rim_not_covered']);
  });
  it('an unmeasured rim is noted, not warned', () => {
    const r = computeKey(key({ rimDiameterMm: null }), catalog, rules);
    expect(r.findings.map((f) => [f.code, f.severity])).toEqual([['rim_not_measured', 'info']]);
    expect(r.status).toBe('ok');
  });
});

describe('stem height (common practice: 0.5, 1.0, 1.5 mm; from memory: face 0.5 mm above the rim)', () => {
  // pad 30.0 mm × 3.6 mm; protrusion = stem + 3.6 − depth
  it.each([
    [3.0, 0.5, 1.1],
    [3.5, 0.5, 0.6],
    [4.0, 1.0, 0.6],
    [4.2, 1.5, 0.9],
  ])('a %f mm deep cup takes the %f mm stem (pad face %f mm above the rim)', (depth, stem, protrusion) => {
    const r = computeKey(key({ cupDepthMm: depth }), catalog, rules);
    expect(r.stemHeightMm).toBe(stem);
    expect(r.protrusionMm).toBe(protrusion);
    expect(r.findings).toEqual([]);
  });

  it('deeper cups get taller stems', () => {
    const stems = [3.0, 3.5, 3.8, 4.0, 4.1, 4.15, 4.6].map((d) => computeKey(key({ cupDepthMm: d }), catalog, rules).stemHeightMm);
    expect(stems).toEqual([0.5, 0.5, 1.0, 1.0, 1.0, 1.5, 1.5]);
  });

  it('warns when even the tallest stem is not enough', () => {
    const r = computeKey(key({ cupDepthMm: 4.7 }), catalog, rules);
    expect(r.stemHeightMm).toBe(1.5);
    expect(r.protrusionMm).toBe(0.4);
    expect(r.findings).toEqual([expect.objectContaining({ code: 'stem_too_short', severity: 'warning', field: 'cupDepth' })]);
  });

  it('a sunken floor takes one step taller', () => {
    expect(computeKey(key({ cupDepthMm: 3.5, floor: 'sunken' }), catalog, rules).stemHeightMm).toBe(1.0);
    expect(computeKey(key({ cupDepthMm: 4.0, floor: 'sunken' }), catalog, rules).stemHeightMm).toBe(1.5);
    const past = computeKey(key({ cupDepthMm: 4.5, floor: 'sunken' }), catalog, rules);
    expect(past.stemHeightMm).toBe(1.5);
    expect(past.findings.map((f) => f.code)).toEqual(['stem_too_short']);
    expect(past.findings[0].message).toMatch(/sunken floor/);
  });

  it('asks for the depth when it is missing', () => {
    expect(codes(key({ cupDepthMm: null }))).toEqual(['depth_missing']);
  });

  it('says so when the catalog lists no thickness', () => {
    const noThickness = { ...catalog, self_leveling: catalog.self_leveling.map((p) => ({ ...p, thicknessMm: null })) };
    expect(computeKey(key(), noThickness, rules).findings.map((f) => f.code)).toEqual(['thickness_unknown']);
  });

  it('chooseStem reads the owner’s stem list in any order', () => {
    expect(chooseStem(4, 3.6, 'flat', { ...rules, stemHeightsMm: [2, 0.8] })).toEqual({ heightMm: 2, enough: true });
  });
});

describe('the whole instrument', () => {
  const entries: KeyMeasurement[] = [
    key({ keyId: 'low_bb', cupDiameterMm: 45.8, cupDepthMm: 4.5, rimDiameterMm: 43 }),
    key({ keyId: 'low_b', cupDiameterMm: 45.9, cupDepthMm: 4.5, rimDiameterMm: 43 }),
    key({ keyId: 'low_c', cupDiameterMm: 30.5, cupDepthMm: 3.5 }),
    key({ keyId: 'palm_d', padKind: 'glued', cupDiameterMm: 10.2, cupDepthMm: 2, rimDiameterMm: 8 }),
    key({ keyId: 'octave_neck', cupDiameterMm: null, cupDepthMm: null, rimDiameterMm: null }),
  ];

  it('lists the pads by kind, size and thickness, and the stems by height', () => {
    const result = computePadMap({ entries, catalog, rules, repadHours: 6 });
    expect(result.parts.map((p) => [p.padKind, p.diameterMm, p.thicknessMm, p.quantity, p.keyIds])).toEqual([
      ['self_leveling', 30, 3.6, 1, ['low_c']],
      ['self_leveling', 45.5, 3.6, 2, ['low_bb', 'low_b']],
      ['glued', 10, 4, 1, ['palm_d']],
    ]);
    expect(result.parts[0]).toMatchObject({ sku: 'PAD-30.0', partId: 'part-3.6-30', unitPriceCents: 300 });
    expect(result.stems).toEqual([{ heightMm: 0.5, quantity: 1 }, { heightMm: 1.5, quantity: 2 }]);
    expect(result.keys[4].status).toBe('empty');
    expect(result.counts).toEqual({ measured: 4, padsChosen: 4, errors: 0, warnings: 0 });
  });

  // Base 1.5 h and 0.25 h per glued key are Benchrelay pricing defaults the owner sets; the 0.5 factor
  // for a self-leveling key is one too. Worked by hand below.
  it('grows with the keys repadded: base + per key × keys, self-leveling keys at the factor', () => {
    const result = computePadMap({ entries, catalog, rules, repadHours: 6 });
    // 3 self-leveling + 1 glued: 1.5 + 0.25 × (1 + 3 × 0.5) = 1.5 + 0.625 = 2.125 → 2.13 h (half up)
    expect(result.labor).toEqual({
      standardHours: 6, hours: 2.13, baseHours: 1.5, perKeyHours: 0.25, factor: 0.5, keysRepadded: 4, selfLevelingPads: 3, gluedPads: 1,
    });
    const allSelfLeveling = entries.filter((e) => e.padKind === 'self_leveling').map((e) => computeKey(e, catalog, rules));
    // 3 self-leveling: 1.5 + 0.25 × 1.5 = 1.875 → 1.88 h; at factor 0.8: 1.5 + 0.25 × 2.4 = 2.1 h
    expect(laborEstimate(allSelfLeveling, 6, rules)?.hours).toBe(1.88);
    expect(laborEstimate(allSelfLeveling, 6, { ...rules, selfLevelingLaborFactor: 0.8 })?.hours).toBe(2.1);
    // nothing repadded: no labor
    expect(laborEstimate([], 6, rules)?.hours).toBe(0);
    const noPad = computePadMap({ entries: [key({ cupDiameterMm: 5, rimDiameterMm: null })], catalog, rules, repadHours: 6 });
    expect(noPad.keys[0].status).toBe('error'); // a 5 mm cup is smaller than the smallest (6 mm) pad
    expect(noPad.labor?.hours).toBe(0);
    expect(computePadMap({ entries, catalog, rules }).labor).toBeNull();
  });

  it('doubles the per-key part, not the whole, when twice the keys are repadded', () => {
    const glued = (n: number) =>
      Array.from({ length: n }, (_, i) => computeKey({ ...entries.find((e) => e.padKind === 'glued')!, keyId: `g${i}` }, catalog, rules));
    // 10 glued keys: 1.5 + 0.25 × 10 = 4 h; 20 glued keys: 1.5 + 0.25 × 20 = 6.5 h
    expect(laborEstimate(glued(10), 6, rules)?.hours).toBe(4);
    expect(laborEstimate(glued(20), 6, rules)?.hours).toBe(6.5);
    // an owner's own prices: base 2 h, 0.3 h per key, 20 keys → 2 + 6 = 8 h
    expect(laborEstimate(glued(20), 6, { ...rules, repadBaseHours: 2, repadHoursPerKey: 0.3 })?.hours).toBe(8);
  });
});
