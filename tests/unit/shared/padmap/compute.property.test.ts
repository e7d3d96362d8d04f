import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { computeKey, type CatalogPad, type KeyMeasurement, type PadCatalog } from '../../../../shared/padmap/compute.js';
import type { PadRules } from '../../../../shared/padmap/rules.js';

/*
 * Property tests over random cups, catalogs and owner rules. Every length is generated as a whole
 * number of hundredths of a millimetre, so the rules below can be restated with exact integer
 * arithmetic, independently of the implementation.
 */

const h = (hundredths: number) => hundredths / 100;

const catalogArb = fc
  .record({
    start: fc.integer({ min: 300, max: 1200 }), // 3–12 mm
    step: fc.constantFrom(10, 25, 50, 100), // 0.1, 0.25, 0.5, 1 mm steps
    count: fc.integer({ min: 1, max: 120 }),
    thickness: fc.integer({ min: 150, max: 600 }),
    gaps: fc.array(fc.integer({ min: 0, max: 119 }), { maxLength: 20 }), // sizes the shop does not carry
  })
  .map(({ start, step, count, thickness, gaps }) => {
    const missing = new Set(gaps);
    const sizes: number[] = [];
    for (let i = 0; i < count; i++) if (!missing.has(i)) sizes.push(start + i * step);
    return { sizes, thickness };
  });

const rulesArb = fc.record({
  clearance: fc.integer({ min: 0, max: 100 }),
  offset: fc.integer({ min: -50, max: 50 }),
  overlap: fc.integer({ min: 0, max: 150 }),
  stems: fc.uniqueArray(fc.integer({ min: 10, max: 400 }), { minLength: 1, maxLength: 5 }),
  protrusion: fc.integer({ min: 0, max: 150 }),
  maxClearance: fc.integer({ min: 20, max: 500 }),
});

const keyArb = fc.record({
  kind: fc.constantFrom('self_leveling' as const, 'glued' as const),
  floor: fc.constantFrom('flat' as const, 'sunken' as const),
  cup: fc.integer({ min: 200, max: 8000 }),
  depth: fc.option(fc.integer({ min: 10, max: 1200 }), { nil: null }),
  rim: fc.option(fc.integer({ min: 100, max: 8000 }), { nil: null }),
});

type Ints = { sizes: number[]; thickness: number };
type RulesInts = { clearance: number; offset: number; overlap: number; stems: number[]; protrusion: number; maxClearance: number };

function toCatalog(c: Ints): PadCatalog {
  const pads: CatalogPad[] = c.sizes.map((s) => ({ diameterMm: h(s), thicknessMm: h(c.thickness) }));
  return { self_leveling: pads, glued: pads };
}
function toRules(r: RulesInts): PadRules {
  return {
    selfLevelingMinClearanceMm: h(r.clearance),
    gluedOffsetMm: h(r.offset),
    minRimOverlapMm: h(r.overlap),
    stemHeightsMm: r.stems.map(h),
    minProtrusionMm: h(r.protrusion),
    selfLevelingLaborFactor: 0.5,
    repadBaseHours: 1.5,
    repadHoursPerKey: 0.25,
    maxRadialClearanceMm: h(r.maxClearance),
  };
}
function toKey(k: { kind: KeyMeasurement['padKind']; floor: KeyMeasurement['floor']; cup: number; depth: number | null; rim: number | null }): KeyMeasurement {
  return { keyId: 'k', padKind: k.kind, floor: k.floor, cupDiameterMm: h(k.cup), cupDepthMm: k.depth == null ? null : h(k.depth), rimDiameterMm: k.rim == null ? null : h(k.rim) };
}

/** The rules restated in integer hundredths: the largest allowed size, or null when none fits. */
function largestAllowed(kind: string, cup: number, c: Ints, r: RulesInts): number | null {
  const limit = kind === 'self_leveling' ? cup - 2 * r.clearance : cup + r.offset;
  const allowed = c.sizes.filter((s) => s <= limit);
  return allowed.length ? Math.max(...allowed) : null;
}
/** True when even the catalog's largest pad leaves more than the maximum play per side. */
function noneLargeEnough(kind: string, cup: number, c: Ints, r: RulesInts): boolean {
  const best = largestAllowed(kind, cup, c, r);
  return best != null && best === Math.max(...c.sizes) && cup - best > 2 * r.maxClearance;
}
/** The pad the map should name: the largest allowed, unless the catalog has none large enough. */
function expectedPad(kind: string, cup: number, c: Ints, r: RulesInts): number | null {
  return noneLargeEnough(kind, cup, c, r) ? null : largestAllowed(kind, cup, c, r);
}

const RUNS = { numRuns: 600 };

describe('pad choice, over random cups and catalogs', () => {
  it('a self-leveling pad never leaves less than the minimum clearance per side', () => {
    fc.assert(
      fc.property(catalogArb, rulesArb, keyArb, (c, r, k) => {
        const result = computeKey(toKey({ ...k, kind: 'self_leveling' }), toCatalog(c), toRules(r));
        if (result.padDiameterMm == null) {
          // no pad: then none of the catalog fits, or the catalog's largest is too loose
          expect(expectedPad('self_leveling', k.cup, c, r)).toBeNull();
          return;
        }
        expect(k.cup - Math.round(result.padDiameterMm * 100)).toBeGreaterThanOrEqual(2 * r.clearance);
        expect(result.radialClearanceMm! * 100).toBeGreaterThanOrEqual(r.clearance - 1e-6);
      }),
      RUNS,
    );
  });

  it('a glued pad never exceeds the cup plus the owner’s offset', () => {
    fc.assert(
      fc.property(catalogArb, rulesArb, keyArb, (c, r, k) => {
        const result = computeKey(toKey({ ...k, kind: 'glued' }), toCatalog(c), toRules(r));
        if (result.padDiameterMm == null) {
          expect(expectedPad('glued', k.cup, c, r)).toBeNull();
          return;
        }
        expect(Math.round(result.padDiameterMm * 100)).toBeLessThanOrEqual(k.cup + r.offset);
      }),
      RUNS,
    );
  });

  it('the pad is the largest the catalog allows (never a smaller one than needed)', () => {
    fc.assert(
      fc.property(catalogArb, rulesArb, keyArb, (c, r, k) => {
        const result = computeKey(toKey(k), toCatalog(c), toRules(r));
        const want = expectedPad(k.kind, k.cup, c, r);
        expect(result.padDiameterMm == null ? null : Math.round(result.padDiameterMm * 100)).toBe(want);
      }),
      RUNS,
    );
  });

  it('the recommendation never decreases as the cup grows', () => {
    fc.assert(
      fc.property(catalogArb, rulesArb, keyArb, fc.integer({ min: 0, max: 1000 }), (c, r, k, grow) => {
        const small = computeKey(toKey(k), toCatalog(c), toRules(r)).padDiameterMm;
        const large = computeKey(toKey({ ...k, cup: k.cup + grow }), toCatalog(c), toRules(r)).padDiameterMm;
        // a larger cup loses its pad only when it outgrows the whole catalog
        if (small != null) expect(large != null || noneLargeEnough(k.kind, k.cup + grow, c, r)).toBe(true);
        if (small != null && large != null) expect(large).toBeGreaterThanOrEqual(small);
      }),
      RUNS,
    );
  });
});

describe('stem height, over random depths and stem lists', () => {
  it('on a flat floor the chosen stem is the lowest that gives the minimum protrusion', () => {
    fc.assert(
      fc.property(catalogArb, rulesArb, keyArb, (c, r, k) => {
        const key = { ...k, kind: 'self_leveling' as const, floor: 'flat' as const };
        const result = computeKey(toKey(key), toCatalog(c), toRules(r));
        if (result.stemHeightMm == null) {
          // no stem only when there is no pad or no depth to work from
          expect(expectedPad('self_leveling', key.cup, c, r) == null || key.depth == null).toBe(true);
          return;
        }
        const chosen = Math.round(result.stemHeightMm * 100);
        const satisfies = (s: number) => s + c.thickness - key.depth! >= r.protrusion;
        const lowest = [...r.stems].sort((a, b) => a - b).find(satisfies);
        expect(chosen).toBe(lowest ?? Math.max(...r.stems));
        for (const lower of r.stems.filter((s) => s < chosen)) expect(satisfies(lower)).toBe(false);
      }),
      RUNS,
    );
  });

  it('on a sunken floor the chosen stem is taller than the one a flat floor gets, when one is stocked', () => {
    fc.assert(
      fc.property(catalogArb, rulesArb, keyArb, (c, r, k) => {
        const key = { ...k, kind: 'self_leveling' as const, depth: k.depth ?? 300 };
        const flat = computeKey(toKey({ ...key, floor: 'flat' }), toCatalog(c), toRules(r)).stemHeightMm;
        const sunken = computeKey(toKey({ ...key, floor: 'sunken' }), toCatalog(c), toRules(r)).stemHeightMm;
        expect(sunken == null).toBe(flat == null);
        if (flat == null || sunken == null) return;
        const tallest = Math.max(...r.stems);
        expect(Math.round(sunken * 100)).toBe(Math.round(flat * 100) === tallest ? tallest : Math.min(...r.stems.filter((s) => s > Math.round(flat * 100))));
      }),
      RUNS,
    );
  });

  it('a deeper cup never gets a lower stem', () => {
    fc.assert(
      fc.property(catalogArb, rulesArb, keyArb, fc.integer({ min: 0, max: 500 }), (c, r, k, deeper) => {
        const key = { ...k, kind: 'self_leveling' as const, depth: k.depth ?? 300 };
        const a = computeKey(toKey(key), toCatalog(c), toRules(r)).stemHeightMm;
        const b = computeKey(toKey({ ...key, depth: key.depth + deeper }), toCatalog(c), toRules(r)).stemHeightMm;
        if (a != null && b != null) expect(b).toBeGreaterThanOrEqual(a);
      }),
      RUNS,
    );
  });
});

describe('every finding appears exactly when its rule fails', () => {
  it('no_pad_fits, no_pad_large_enough, clearance_large, rim_wider_than_cup, rim_not_covered, rim_overlap_small, depth_missing, stem_too_short, rim_not_measured', () => {
    fc.assert(
      fc.property(catalogArb, rulesArb, keyArb, (c, r, k) => {
        const result = computeKey(toKey(k), toCatalog(c), toRules(r));
        const found = new Set(result.findings.map((f) => f.code));
        const pad = expectedPad(k.kind, k.cup, c, r);
        const sl = k.kind === 'self_leveling';
        const stems = [...r.stems].sort((a, b) => a - b);
        // short when no stocked stem lifts the face enough, or, on a sunken floor, when none is taller than the
        // lowest that does (the sunken centre takes a taller stem than a flat floor: common practice)
        let stemShort = false;
        if (sl && pad != null && k.depth != null) {
          const enough = stems.filter((s) => s + c.thickness - k.depth! >= r.protrusion);
          stemShort = enough.length === 0 || (k.floor === 'sunken' && !stems.some((s) => s > enough[0]));
        }
        const expected: Record<string, boolean> = {
          no_pad_fits: largestAllowed(k.kind, k.cup, c, r) == null,
          no_pad_large_enough: noneLargeEnough(k.kind, k.cup, c, r),
          clearance_large: pad != null && k.cup - pad > 2 * r.maxClearance,
          rim_wider_than_cup: k.rim != null && k.rim >= k.cup,
          rim_not_covered: pad != null && k.rim != null && pad <= k.rim,
          rim_overlap_small: pad != null && k.rim != null && pad > k.rim && pad - k.rim < 2 * r.overlap,
          rim_not_measured: pad != null && k.rim == null,
          depth_missing: sl && pad != null && k.depth == null,
          stem_too_short: stemShort,
          thickness_unknown: false,
        };
        for (const [code, should] of Object.entries(expected)) expect([code, found.has(code as never)]).toEqual([code, should]);
        expect(found.size).toBe(result.findings.length); // no finding twice
        const severities = result.findings.map((f) => f.severity);
        expect(result.status).toBe(severities.includes('error') ? 'error' : severities.includes('warning') ? 'warning' : 'ok');
      }),
      RUNS,
    );
  });
});
