import { describe, expect, it } from 'vitest';
import {
  cautionsFor,
  HAZARD_CAUTIONS,
  HAZARDS,
  hazardsSchema,
  isHeavyCase,
  LIFTING_CAUTION,
} from '../../../../shared/safety/hazards.js';

describe('hazard cautions: one text per hazard, each deferring to the right authority', () => {
  it('every work hazard defers to the safety data sheet, local codes and licensed practice', () => {
    for (const h of HAZARDS.filter((x) => x !== 'heavy_lift')) {
      expect(HAZARD_CAUTIONS[h], h).toMatch(/safety data sheet, local codes and licensed practice/);
    }
  });

  it('lifting defers to manual-handling rules and local codes, not to a safety data sheet', () => {
    expect(HAZARD_CAUTIONS.heavy_lift).toBe(LIFTING_CAUTION);
    expect(LIFTING_CAUTION).toMatch(/manual-handling rules and local codes/);
    expect(LIFTING_CAUTION).not.toMatch(/safety data sheet/);
  });

  it('names the hazards the bench never mentioned before', () => {
    expect(HAZARD_CAUTIONS.solder_lead).toMatch(/torch/);
    expect(HAZARD_CAUTIONS.solder_lead).toMatch(/flux fumes/);
    expect(HAZARD_CAUTIONS.solder_lead).toMatch(/lead/);
    expect(HAZARD_CAUTIONS.springs_sharp).toMatch(/needle springs/i);
    expect(HAZARD_CAUTIONS.springs_sharp).toMatch(/flat springs/);
    expect(HAZARD_CAUTIONS.heat_flame).toMatch(/hot-melt/i);
    expect(HAZARD_CAUTIONS.heat_flame).toMatch(/shellac/);
    expect(HAZARD_CAUTIONS.heat_flame).toMatch(/alcohol-lamp flame/);
    expect(HAZARD_CAUTIONS.heat_flame).toMatch(/spreads burning spirit/);
    expect(HAZARD_CAUTIONS.adhesive).toMatch(/Contact cement gives off solvent fumes/);
    expect(HAZARD_CAUTIONS.adhesive).toMatch(/Cyanoacrylate[\s\S]*mars lacquer/);
    expect(HAZARD_CAUTIONS.pad_removal).toMatch(/Removing old pads and cleaning pad cups/);
    expect(HAZARD_CAUTIONS.pad_removal).toMatch(/heat[\s\S]*debonder[\s\S]*solvent/);
    expect(HAZARD_CAUTIONS.pad_removal).toMatch(/gloves and eye protection/);
  });

  it('gives each hazard once, in a fixed order, whatever the order and repeats of the tags', () => {
    expect(cautionsFor(['solvent', 'adhesive', 'solvent']).map((c) => c.hazard)).toEqual(['adhesive', 'solvent']);
    expect(cautionsFor([])).toEqual([]);
  });
});

describe('heavy cases', () => {
  it('decides lifting by family (bass saxophone and the tubas included) or by the instrument flag', () => {
    for (const family of ['baritone_saxophone', 'bass_saxophone', 'tuba', 'euphonium'] as const) expect(isHeavyCase(family), family).toBe(true);
    expect(isHeavyCase('alto_saxophone')).toBe(false);
    expect(isHeavyCase('alto_saxophone', true)).toBe(true);
  });
});

describe('the owner’s tags in a request', () => {
  it('refuses an unknown hazard on the field itself and drops repeats', () => {
    const bad = hazardsSchema.safeParse(['adhesive', 'glitter']);
    expect(bad.success).toBe(false);
    expect(bad.error!.issues[0]).toMatchObject({ path: [], message: expect.stringMatching(/glitter/) });
    expect(hazardsSchema.parse(['solvent', 'adhesive', 'solvent'])).toEqual(['adhesive', 'solvent']);
  });
});
