import { formatMm, roundTo } from './units.js';
import { PAD_KIND_LABELS, type FloorShape, type PadKind, type PadRules } from './rules.js';

/**
 * The repad arithmetic, key by key and for the whole instrument. Pure: the client runs it for the
 * live preview and the server runs the same function to store what it saves.
 *
 * All lengths are millimetres. Comparisons are made in whole nanometres so that a cup of 29.3 mm and
 * a clearance of 0.15 mm admit a 29.0 mm pad exactly at the limit, whatever binary doubles make of
 * 29.3 − 29.0.
 */

export interface CatalogPad {
  diameterMm: number;
  /** null when the catalog does not say; then no stem height can be worked out. */
  thicknessMm: number | null;
  partId?: string | null;
  sku?: string | null;
  name?: string | null;
  unitPriceCents?: number | null;
}
export type PadCatalog = Record<PadKind, CatalogPad[]>;

export interface KeyMeasurement {
  keyId: string;
  /** Only for keys the technician added that are not in the family's list. */
  keyName?: string | null;
  padKind: PadKind;
  floor: FloorShape;
  /** Pad cup inside diameter. null: the key is not measured (not being repadded). */
  cupDiameterMm: number | null;
  /** Rim of the cup down to its floor. */
  cupDepthMm: number | null;
  /** Tone-hole rim outside diameter; optional, needed for the seal check. */
  rimDiameterMm: number | null;
}

export type FindingSeverity = 'error' | 'warning' | 'info';
/** The input cell a finding belongs next to. */
export type FindingField = 'cupDiameter' | 'cupDepth' | 'rimDiameter';
export type FindingCode =
  | 'no_pad_fits'
  | 'no_pad_large_enough'
  | 'clearance_large'
  | 'rim_wider_than_cup'
  | 'rim_not_covered'
  | 'rim_overlap_small'
  | 'rim_not_measured'
  | 'depth_missing'
  | 'thickness_unknown'
  | 'stem_too_short';

export interface Finding {
  code: FindingCode;
  severity: FindingSeverity;
  field: FindingField;
  message: string;
}

export interface KeyResult {
  keyId: string;
  keyName: string | null;
  padKind: PadKind;
  /** empty: no cup measured, so the key is not part of this repad. */
  status: 'empty' | 'ok' | 'warning' | 'error';
  padDiameterMm: number | null;
  padThicknessMm: number | null;
  partId: string | null;
  /** (cup − pad) / 2; negative for a glued pad pressed in. */
  radialClearanceMm: number | null;
  /** (pad − rim) / 2; null when the rim was not measured. */
  rimOverlapMm: number | null;
  /** Self-leveling only. */
  stemHeightMm: number | null;
  /** Pad face above the cup rim: stem + pad thickness − cup depth (self-leveling only). */
  protrusionMm: number | null;
  findings: Finding[];
}

export interface PartsLine {
  padKind: PadKind;
  diameterMm: number;
  thicknessMm: number | null;
  partId: string | null;
  sku: string | null;
  name: string;
  unitPriceCents: number | null;
  quantity: number;
  /** Which keys take this pad, by id, in map order. */
  keyIds: string[];
}

export interface StemLine {
  heightMm: number;
  quantity: number;
}

export interface LaborEstimate {
  /** The service catalog's hours for a full repad of this family, shown beside the estimate for comparison. */
  standardHours: number;
  /** base + per key × (glued keys + self-leveling keys × factor), to the hundredth of an hour. */
  hours: number;
  baseHours: number;
  perKeyHours: number;
  factor: number;
  /** Keys that get a new pad in this map. */
  keysRepadded: number;
  selfLevelingPads: number;
  gluedPads: number;
}

export interface PadMapResult {
  keys: KeyResult[];
  parts: PartsLine[];
  stems: StemLine[];
  labor: LaborEstimate | null;
  counts: { measured: number; padsChosen: number; errors: number; warnings: number };
}

const NM_PER_MM = 1_000_000;
const nm = (mm: number) => Math.round(mm * NM_PER_MM);
/** Results are shown to a tenth of a micrometre; rounding removes binary noise such as 0.15000000000000036. */
const clean = (mm: number) => roundTo(mm, 4);

/** Ascending, one pad per diameter (the first listed wins), pads with a usable diameter only. */
export function sortedCatalog(pads: CatalogPad[]): CatalogPad[] {
  const seen = new Set<number>();
  return [...pads]
    .filter((p) => Number.isFinite(p.diameterMm) && p.diameterMm > 0)
    .sort((a, b) => a.diameterMm - b.diameterMm)
    .filter((p) => {
      const key = nm(p.diameterMm);
      if (seen.has(key)) return false;
      seen.add(key);
      return true;
    });
}

/**
 * The largest diameter a pad may have in this cup (the clearances and offsets are the owner's pad rules; their
 * defaults and sources are in rules.ts).
 * Self-leveling: cup − 2 × minimum clearance, so the pad can tilt; it may touch lightly but never bind.
 * Glued: cup + the owner's offset (a snug fit).
 */
export function maxPadDiameterMm(kind: PadKind, cupDiameterMm: number, rules: PadRules): number {
  return kind === 'self_leveling'
    ? cupDiameterMm - 2 * rules.selfLevelingMinClearanceMm
    : cupDiameterMm + rules.gluedOffsetMm;
}

/** The largest catalog pad of this kind that is allowed in the cup, or null when none is. */
export function choosePad(kind: PadKind, cupDiameterMm: number, catalog: PadCatalog, rules: PadRules): CatalogPad | null {
  const limit = nm(cupDiameterMm) + (kind === 'self_leveling' ? -2 * nm(rules.selfLevelingMinClearanceMm) : nm(rules.gluedOffsetMm));
  let best: CatalogPad | null = null;
  for (const pad of sortedCatalog(catalog[kind] ?? [])) {
    if (nm(pad.diameterMm) <= limit) best = pad;
    else break;
  }
  return best;
}

/**
 * The lowest stocked stem that lifts the pad face at least the minimum above the rim; one step
 * taller for a sunken floor (common practice: the stem stands in the dip of a sunken centre, so it sits lower). `index` is past the end when even the tallest is not enough.
 */
export function chooseStem(
  cupDepthMm: number,
  padThicknessMm: number,
  floor: FloorShape,
  rules: PadRules,
): { heightMm: number; enough: boolean } {
  const heights = [...rules.stemHeightsMm].sort((a, b) => a - b);
  const need = nm(rules.minProtrusionMm);
  let index = heights.findIndex((h) => nm(h) + nm(padThicknessMm) - nm(cupDepthMm) >= need);
  if (index >= 0 && floor === 'sunken') index += 1;
  const enough = index >= 0 && index < heights.length;
  return { heightMm: enough ? heights[index] : heights[heights.length - 1], enough };
}

const faceWords = (protrusionMm: number) =>
  protrusionMm < 0 ? `${formatMm(-protrusionMm)} below the rim` : `only ${formatMm(protrusionMm)} above the rim`;

export function computeKey(entry: KeyMeasurement, catalog: PadCatalog, rules: PadRules): KeyResult {
  const result: KeyResult = {
    keyId: entry.keyId,
    keyName: entry.keyName ?? null,
    padKind: entry.padKind,
    status: 'empty',
    padDiameterMm: null,
    padThicknessMm: null,
    partId: null,
    radialClearanceMm: null,
    rimOverlapMm: null,
    stemHeightMm: null,
    protrusionMm: null,
    findings: [],
  };
  const cup = entry.cupDiameterMm;
  if (cup == null) return result;
  const add = (code: FindingCode, severity: FindingSeverity, field: FindingField, message: string) =>
    result.findings.push({ code, severity, field, message });

  const rim = entry.rimDiameterMm;
  if (rim != null && nm(rim) >= nm(cup)) {
    add('rim_wider_than_cup', 'error', 'rimDiameter',
      `The tone-hole rim (${formatMm(rim)}) is not smaller than the cup (${formatMm(cup)}): check both readings.`);
  }

  const chosen = choosePad(entry.padKind, cup, catalog, rules);
  const largest = sortedCatalog(catalog[entry.padKind] ?? []).at(-1) ?? null;
  const tooLoose = (p: CatalogPad) => nm(cup) - nm(p.diameterMm) > 2 * nm(rules.maxRadialClearanceMm);
  // A cup larger than every pad: the largest pad would rattle in it and may miss the tone hole, so none is chosen.
  const pad = chosen && tooLoose(chosen) && chosen === largest ? null : chosen;
  if (chosen && !pad) {
    add('no_pad_large_enough', 'error', 'cupDiameter',
      `No pad large enough: the largest ${PAD_KIND_LABELS[entry.padKind].toLowerCase()} pad in the catalog (${formatMm(chosen.diameterMm)}) would leave ${formatMm(clean((cup - chosen.diameterMm) / 2))} per side in this ${formatMm(cup)} cup; at most ${formatMm(rules.maxRadialClearanceMm)} is allowed. Check the reading, or add a larger pad to the catalog.`);
  } else if (!pad) {
    const limit = maxPadDiameterMm(entry.padKind, cup, rules);
    add('no_pad_fits', 'error', 'cupDiameter',
      entry.padKind === 'self_leveling'
        ? `No self-leveling pad in the catalog is ${formatMm(limit)} or smaller, which this ${formatMm(cup)} cup needs to leave ${formatMm(rules.selfLevelingMinClearanceMm)} per side.`
        : `No glued pad in the catalog is ${formatMm(limit)} or smaller to fit this ${formatMm(cup)} cup.`);
  } else {
    result.padDiameterMm = pad.diameterMm;
    result.padThicknessMm = pad.thicknessMm;
    result.partId = pad.partId ?? null;
    result.radialClearanceMm = clean((cup - pad.diameterMm) / 2);
    if (tooLoose(pad)) {
      const next = sortedCatalog(catalog[entry.padKind] ?? []).find((p) => nm(p.diameterMm) > nm(pad.diameterMm));
      add('clearance_large', 'warning', 'cupDiameter',
        `The ${formatMm(pad.diameterMm)} pad leaves ${formatMm(result.radialClearanceMm)} per side in this cup, more than the ${formatMm(rules.maxRadialClearanceMm)} allowed, so it may not stay centred over the tone hole; the catalog has nothing between ${formatMm(pad.diameterMm)} and ${formatMm(next!.diameterMm)}.`);
    }

    if (rim == null) {
      add('rim_not_measured', 'info', 'rimDiameter', 'Seal not checked: no rim reading.');
    } else {
      const overlap = clean((pad.diameterMm - rim) / 2);
      result.rimOverlapMm = overlap;
      if (nm(pad.diameterMm) <= nm(rim)) {
        add('rim_not_covered', 'error', 'rimDiameter',
          `The ${formatMm(pad.diameterMm)} pad does not cover the ${formatMm(rim)} tone-hole rim all round, so it cannot seal.`);
      } else if (nm(pad.diameterMm) - nm(rim) < 2 * nm(rules.minRimOverlapMm)) {
        add('rim_overlap_small', 'warning', 'rimDiameter',
          `The pad overlaps the rim by only ${formatMm(overlap)} per side; ${formatMm(rules.minRimOverlapMm)} or more seals reliably.`);
      }
    }

    if (entry.padKind === 'self_leveling') {
      if (entry.cupDepthMm == null) {
        add('depth_missing', 'warning', 'cupDepth', 'Measure the cup depth to choose the stem height.');
      } else if (pad.thicknessMm == null) {
        add('thickness_unknown', 'warning', 'cupDepth',
          `The catalog gives no thickness for the ${formatMm(pad.diameterMm)} pad, so no stem height can be worked out.`);
      } else {
        const stem = chooseStem(entry.cupDepthMm, pad.thicknessMm, entry.floor, rules);
        result.stemHeightMm = stem.heightMm;
        result.protrusionMm = clean(stem.heightMm + pad.thicknessMm - entry.cupDepthMm);
        if (!stem.enough) {
          add('stem_too_short', 'warning', 'cupDepth',
            entry.floor === 'sunken' && nm(stem.heightMm) + nm(pad.thicknessMm) - nm(entry.cupDepthMm) >= nm(rules.minProtrusionMm)
              ? `The sunken floor needs one stem taller than the tallest stocked (${formatMm(stem.heightMm)}): build the stem up or use a thicker pad.`
              : `Even the tallest stem (${formatMm(stem.heightMm)}) leaves the pad face ${faceWords(result.protrusionMm)}; ${formatMm(rules.minProtrusionMm)} above is needed: build the stem up or use a thicker pad.`);
        }
      }
    }
  }

  const worst = result.findings.reduce<FindingSeverity | null>(
    (acc, f) => (f.severity === 'error' || acc === 'error' ? 'error' : f.severity === 'warning' || acc === 'warning' ? 'warning' : 'info'),
    null,
  );
  result.status = worst === 'error' ? 'error' : worst === 'warning' ? 'warning' : 'ok';
  return result;
}

/** A pad size as catalogs write it: one decimal at least, two for quarter-millimetre steps (30.0, 30.25, 30.5). */
export function padSizeText(mm: number): string {
  return roundTo(mm, 2).toFixed(2).replace(/(\.\d)0$/, '$1');
}

/** Pads by kind, size and thickness, with how many of each and for which keys. */
export function partsListOf(keys: KeyResult[], catalog: PadCatalog): PartsLine[] {
  const lines = new Map<string, PartsLine>();
  for (const key of keys) {
    if (key.padDiameterMm == null) continue;
    const id = `${key.padKind}:${nm(key.padDiameterMm)}`;
    const line = lines.get(id);
    if (line) {
      line.quantity += 1;
      line.keyIds.push(key.keyId);
      continue;
    }
    const pad = sortedCatalog(catalog[key.padKind] ?? []).find((p) => nm(p.diameterMm) === nm(key.padDiameterMm!));
    lines.set(id, {
      padKind: key.padKind,
      diameterMm: key.padDiameterMm,
      thicknessMm: key.padThicknessMm,
      partId: key.partId,
      sku: pad?.sku ?? null,
      name: pad?.name ?? `${PAD_KIND_LABELS[key.padKind]} pad ${padSizeText(key.padDiameterMm)} mm`,
      unitPriceCents: pad?.unitPriceCents ?? null,
      quantity: 1,
      keyIds: [key.keyId],
    });
  }
  return [...lines.values()].sort((a, b) =>
    a.padKind === b.padKind ? a.diameterMm - b.diameterMm : a.padKind === 'self_leveling' ? -1 : 1,
  );
}

/**
 * Labor grows with the keys actually repadded: the owner's base hours (apart, clean, together, regulate,
 * leak test) plus the owner's hours per glued key, a self-leveling key at the owner's factor. A map with
 * no key repadded estimates no labor. `standardHours` (the catalog's full repad) only says which service
 * the labor is billed as; without one there is no estimate.
 */
export function laborEstimate(keys: KeyResult[], standardHours: number | null | undefined, rules: PadRules): LaborEstimate | null {
  if (standardHours == null) return null;
  const chosen = keys.filter((k) => k.padDiameterMm != null);
  const selfLevelingPads = chosen.filter((k) => k.padKind === 'self_leveling').length;
  const gluedPads = chosen.length - selfLevelingPads;
  const keyHours = rules.repadHoursPerKey * (gluedPads + selfLevelingPads * rules.selfLevelingLaborFactor);
  return {
    standardHours,
    hours: chosen.length ? roundTo(rules.repadBaseHours + keyHours, 2) : 0,
    baseHours: rules.repadBaseHours,
    perKeyHours: rules.repadHoursPerKey,
    factor: rules.selfLevelingLaborFactor,
    keysRepadded: chosen.length,
    selfLevelingPads,
    gluedPads,
  };
}

/** The instrument's totals from per-key results: parts list, stems, labor and counts. */
export function summarizeKeys(keys: KeyResult[], catalog: PadCatalog, rules: PadRules, repadHours?: number | null): PadMapResult {
  const stems = new Map<number, number>();
  for (const key of keys) if (key.stemHeightMm != null) stems.set(key.stemHeightMm, (stems.get(key.stemHeightMm) ?? 0) + 1);
  const findings = keys.flatMap((k) => k.findings);
  return {
    keys,
    parts: partsListOf(keys, catalog),
    stems: [...stems].sort(([a], [b]) => a - b).map(([heightMm, quantity]) => ({ heightMm, quantity })),
    labor: laborEstimate(keys, repadHours, rules),
    counts: {
      measured: keys.filter((k) => k.status !== 'empty').length,
      padsChosen: keys.filter((k) => k.padDiameterMm != null).length,
      errors: findings.filter((f) => f.severity === 'error').length,
      warnings: findings.filter((f) => f.severity === 'warning').length,
    },
  };
}

export function computePadMap(input: {
  entries: KeyMeasurement[];
  catalog: PadCatalog;
  rules: PadRules;
  /** Standard hours of the service catalog's repad for this family, when there is one. */
  repadHours?: number | null;
}): PadMapResult {
  const keys = input.entries.map((entry) => computeKey(entry, input.catalog, input.rules));
  return summarizeKeys(keys, input.catalog, input.rules, input.repadHours);
}
