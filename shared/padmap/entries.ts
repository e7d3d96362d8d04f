import { z } from 'zod';
import { FLOOR_SHAPES, PAD_KINDS } from './rules.js';
import type { KeyMeasurement } from './compute.js';
import { LENGTH_UNITS, parseLength, type LengthUnit } from './units.js';

/**
 * A pad map as the technician types it: one row per key, readings as text with or without a unit.
 * The same schema checks the request on the server and the form in the client, and `readEntries`
 * turns it into millimetres for the computation, with a message per cell it cannot read.
 */

export const MEASURE_FIELDS = ['cupDiameter', 'cupDepth', 'rimDiameter'] as const;
export type MeasureField = (typeof MEASURE_FIELDS)[number];

/**
 * Plausible ranges catch a reading typed in the wrong unit (30.5 taken as inches is 774.7 mm). From memory:
 * the smallest woodwind pad cups are about 6 mm and the bell keys of a baritone or bass saxophone are about
 * 60–70 mm, so 2–120 mm leaves room on both sides; cups are a few millimetres deep, 30 mm is far past any.
 */
export const MEASURE_LIMITS_MM: Record<MeasureField, { min: number; max: number; label: string }> = {
  cupDiameter: { min: 2, max: 120, label: 'Cup diameter' },
  cupDepth: { min: 0.1, max: 30, label: 'Cup depth' },
  rimDiameter: { min: 1, max: 120, label: 'Rim diameter' },
};

const reading = z.union([z.string().max(40), z.number(), z.null()]).optional();

export const padMapRowSchema = z.object({
  keyId: z.string().regex(/^[a-z0-9_-]{1,40}$/, 'Key ids are lower-case letters, digits, - and _.'),
  keyName: z.string().trim().max(60).nullish(),
  padKind: z.enum(PAD_KINDS, { error: 'Choose self-leveling or glued.' }),
  floor: z.enum(FLOOR_SHAPES, { error: 'Choose a flat or sunken floor.' }).default('flat'),
  cupDiameter: reading,
  cupDepth: reading,
  rimDiameter: reading,
});
export type PadMapRow = z.input<typeof padMapRowSchema>;

export const savePadMapSchema = z.object({
  unitSystem: z.enum(LENGTH_UNITS).default('mm'),
  entries: z
    .array(padMapRowSchema)
    .max(80, 'A pad map has at most 80 keys.')
    .refine((rows) => new Set(rows.map((r) => r.keyId)).size === rows.length, 'Each key may appear once.'),
  /** The service catalog entry whose hours the labor estimate starts from; null: none. */
  catalogItemId: z.uuid().nullish(),
});
export type SavePadMapInput = z.input<typeof savePadMapSchema>;

/** What a pad map row keeps: millimetres for the computation, and the text as typed for the screen. */
export interface StoredEntry extends KeyMeasurement {
  typed: Partial<Record<MeasureField, string>>;
}

const isBlank = (v: unknown) => v == null || (typeof v === 'string' && v.trim() === '');

export function readReading(value: string | number, field: MeasureField, unit: LengthUnit): { mm: number } | { error: string } {
  const parsed = parseLength(value, unit);
  if (!parsed.ok) return { error: parsed.error };
  const limit = MEASURE_LIMITS_MM[field];
  if (parsed.mm < limit.min || parsed.mm > limit.max) {
    return {
      error: `${limit.label} of ${Number(parsed.mm.toFixed(3))} mm is outside ${limit.min}–${limit.max} mm: check the reading and its unit (mm or in).`,
    };
  }
  return { mm: parsed.mm };
}

/**
 * Reads every row. `errors` is keyed like the server's field errors (`entries.3.cupDepth`), so the
 * client can show a message beside the very cell, whether it came from the preview or the server.
 */
export function readEntries(
  rows: Array<z.output<typeof padMapRowSchema> | PadMapRow>,
  unit: LengthUnit,
): { entries: StoredEntry[]; errors: Record<string, string> } {
  const errors: Record<string, string> = {};
  const entries = rows.map((row, index) => {
    const entry: StoredEntry = {
      keyId: row.keyId,
      keyName: row.keyName ?? null,
      padKind: row.padKind,
      floor: row.floor ?? 'flat',
      cupDiameterMm: null,
      cupDepthMm: null,
      rimDiameterMm: null,
      typed: {},
    };
    for (const field of MEASURE_FIELDS) {
      const value = row[field];
      if (isBlank(value)) continue;
      entry.typed[field] = String(value).trim();
      const read = readReading(value as string | number, field, unit);
      if ('error' in read) errors[`entries.${index}.${field}`] = read.error;
      else entry[`${field}Mm`] = read.mm;
    }
    // a depth or rim without the cup diameter means the cup itself was skipped
    if (entry.cupDiameterMm == null && !errors[`entries.${index}.cupDiameter`] && (entry.cupDepthMm != null || entry.rimDiameterMm != null)) {
      errors[`entries.${index}.cupDiameter`] = 'Measure the cup diameter too, or clear this row.';
    }
    return entry;
  });
  return { entries, errors };
}
