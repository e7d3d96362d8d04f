import { z } from 'zod';

export const PAD_KINDS = ['self_leveling', 'glued'] as const;
export type PadKind = (typeof PAD_KINDS)[number];
export const PAD_KIND_LABELS: Record<PadKind, string> = { self_leveling: 'Self-leveling', glued: 'Glued' };

export const FLOOR_SHAPES = ['flat', 'sunken'] as const;
export type FloorShape = (typeof FLOOR_SHAPES)[number];
export const FLOOR_LABELS: Record<FloorShape, string> = { flat: 'Flat', sunken: 'Sunken centre' };

/**
 * The network's pad rules, stored under `networks.settings.padRules` and edited by the owner.
 * Each default says where it comes from, as the house style asks.
 */
export interface PadRules {
  /** Self-leveling pads must tilt in the cup: at least this gap per side. Default 0.15 mm (common practice). */
  selfLevelingMinClearanceMm: number;
  /**
   * Glued pads: largest catalog diameter not over cup + offset. 0 by default; shops that fit the next
   * size down set a negative offset, shops that press a pad in set up to +0.5 mm (common practice differs).
   */
  gluedOffsetMm: number;
  /** Seal: the pad should overlap the tone-hole rim by this much per side. Default 0.5 mm (from memory). */
  minRimOverlapMm: number;
  /** Mounting-stem heights the shop stocks, lowest first. Default 0.5, 1.0, 1.5 mm (common practice). */
  stemHeightsMm: number[];
  /** The pad face should stand this far above the cup rim. Default 0.5 mm (from memory). */
  minProtrusionMm: number;
  /**
   * A self-leveling key takes this share of a glued key's time. Default 0.5: a Benchrelay pricing default the owner
   * sets, not a trade figure.
   */
  selfLevelingLaborFactor: number;
  /**
   * Pad-map labor = base + per key × keys repadded (self-leveling keys at the factor above).
   * Base: taking the instrument apart, cleaning, putting it back together, regulating and leak-testing,
   * whatever the number of keys. Default 1.5 h: a Benchrelay pricing default the owner sets, not a trade figure.
   */
  repadBaseHours: number;
  /** Hours per key repadded with a glued pad. Default 0.25 h: a Benchrelay pricing default the owner sets. */
  repadHoursPerKey: number;
  /**
   * A pad leaving more than this gap per side between it and the cup wall does not stay centred over the tone
   * hole and may not cover it. Default 1.0 mm (common practice: a repadder fills the cup; a pad that leaves a
   * millimetre or more of play each side is the wrong size).
   */
  maxRadialClearanceMm: number;
}

export const DEFAULT_PAD_RULES: PadRules = Object.freeze({
  selfLevelingMinClearanceMm: 0.15,
  gluedOffsetMm: 0,
  minRimOverlapMm: 0.5,
  stemHeightsMm: Object.freeze([0.5, 1.0, 1.5]) as number[],
  minProtrusionMm: 0.5,
  selfLevelingLaborFactor: 0.5,
  repadBaseHours: 1.5,
  repadHoursPerKey: 0.25,
  maxRadialClearanceMm: 1.0,
});

const mm = (min: number, max: number, label: string) =>
  z
    .number({ error: `${label} must be a number of millimetres.` })
    .min(min, `${label} must be at least ${min} mm.`)
    .max(max, `${label} must be at most ${max} mm.`);

export const padRulesSchema = z.object({
  selfLevelingMinClearanceMm: mm(0, 2, 'Minimum clearance'),
  gluedOffsetMm: mm(-0.5, 0.5, 'Glued pad offset'),
  minRimOverlapMm: mm(0, 3, 'Minimum rim overlap'),
  stemHeightsMm: z
    .array(mm(0.1, 10, 'A stem height'), { error: 'List the stem heights in millimetres.' })
    .min(1, 'List at least one stem height.')
    .max(8, 'List at most eight stem heights.')
    .refine((list) => new Set(list).size === list.length, 'Each stem height once, please.')
    .transform((list) => [...list].sort((a, b) => a - b)),
  minProtrusionMm: mm(0, 5, 'Minimum protrusion'),
  selfLevelingLaborFactor: z
    .number({ error: 'The labor factor must be a number.' })
    .min(0.1, 'The labor factor must be at least 0.1.')
    .max(2, 'The labor factor must be at most 2.'),
  repadBaseHours: z
    .number({ error: 'Enter a number of hours.' })
    .min(0, 'The base hours must be at least 0.')
    .max(20, 'The base hours must be at most 20.'),
  repadHoursPerKey: z
    .number({ error: 'Enter a number of hours.' })
    .min(0.05, 'The hours per key must be at least 0.05.')
    .max(2, 'The hours per key must be at most 2.'),
  // optional so that a client saved before this rule existed still saves; the default fills it
  maxRadialClearanceMm: mm(0.2, 5, 'Maximum clearance').default(1.0),
}).refine((r) => r.maxRadialClearanceMm > r.selfLevelingMinClearanceMm, {
  path: ['maxRadialClearanceMm'],
  message: 'The maximum clearance must be larger than the self-leveling minimum.',
});

/** Stored rules merged over the defaults; anything malformed falls back to the default. */
export function resolvePadRules(stored: unknown): PadRules {
  const merged = { ...DEFAULT_PAD_RULES, stemHeightsMm: [...DEFAULT_PAD_RULES.stemHeightsMm] };
  if (!stored || typeof stored !== 'object') return merged;
  for (const key of Object.keys(padRulesSchema.shape) as Array<keyof PadRules>) {
    const field = padRulesSchema.shape[key].safeParse((stored as Record<string, unknown>)[key]);
    if (field.success) (merged as Record<string, unknown>)[key] = field.data;
  }
  return merged;
}
