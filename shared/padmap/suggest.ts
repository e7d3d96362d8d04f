import type { PadKind } from './rules.js';
import { sortedCatalog, type PadCatalog } from './compute.js';

/**
 * Suggestions for an instrument that has never been mapped: per key, the median of what earlier pad
 * maps of the same family, maker and model measured and chose. Each instrument counts once (its
 * latest map), so one horn repadded five times does not outvote four others.
 */

export interface EarlierMap {
  instrumentId: string;
  createdAt: string | Date;
  entries: Array<{ keyId: string; padKind?: PadKind; cupDiameterMm?: number | null; cupDepthMm?: number | null; rimDiameterMm?: number | null }>;
  results: Array<{ keyId: string; padKind?: PadKind; padDiameterMm?: number | null }>;
}

export interface KeySuggestion {
  keyId: string;
  /** How many maps measured this key. */
  basedOn: number;
  cupDiameterMm: number | null;
  cupDepthMm: number | null;
  rimDiameterMm: number | null;
  /** The pad for `padKind`: a size earlier maps chose for that kind, and one the catalog has (see padByKind). */
  padDiameterMm: number | null;
  /** The pad kind most maps used for this key (self-leveling on a tie). */
  padKind: PadKind | null;
  /** Per kind: glued pads fit snug and self-leveling pads clearly undersized, so the two are never mixed. */
  padByKind: Record<PadKind, number | null>;
}

export interface Suggestions {
  /** Distinct instruments whose latest map went into the medians. */
  basedOnMaps: number;
  keys: Record<string, KeySuggestion>;
}

export function median(values: number[]): number | null {
  if (!values.length) return null;
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  const value = sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
  return Math.round(value * 10_000) / 10_000;
}

const isNumber = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);

/**
 * The pad to suggest from the sizes earlier maps chose for one kind: the lower median (with an even count, the
 * smaller of the two middle sizes, so the answer is a size somebody chose, never a size in between), then, when
 * the catalog is known, the largest size of that kind it has not above it (a pad dropped from the catalog is
 * replaced by the next size down, never by a larger one that might not fit).
 */
export function suggestedPad(sizes: number[], kind: PadKind, catalog?: PadCatalog | null): number | null {
  if (!sizes.length) return null;
  const sorted = [...sizes].sort((a, b) => a - b);
  const lower = sorted[(sorted.length - 1) >> 1];
  if (!catalog) return lower;
  const fits = sortedCatalog(catalog[kind] ?? []).filter((p) => Math.round(p.diameterMm * 1e6) <= Math.round(lower * 1e6));
  return fits.at(-1)?.diameterMm ?? null;
}

export function latestPerInstrument(maps: EarlierMap[]): EarlierMap[] {
  const latest = new Map<string, EarlierMap>();
  for (const map of maps) {
    const seen = latest.get(map.instrumentId);
    if (!seen || new Date(map.createdAt).getTime() > new Date(seen.createdAt).getTime()) latest.set(map.instrumentId, map);
  }
  return [...latest.values()];
}

export function suggestFromMaps(maps: EarlierMap[], catalog?: PadCatalog | null): Suggestions {
  const used = latestPerInstrument(maps);
  const perKey = new Map<string, { cup: number[]; depth: number[]; rim: number[]; pad: Record<PadKind, number[]>; kinds: Record<string, number> }>();
  for (const map of used) {
    const results = new Map(map.results.map((r) => [r.keyId, r]));
    for (const entry of map.entries) {
      if (!isNumber(entry.cupDiameterMm)) continue;
      const bucket = perKey.get(entry.keyId) ?? { cup: [], depth: [], rim: [], pad: { self_leveling: [], glued: [] }, kinds: {} };
      perKey.set(entry.keyId, bucket);
      bucket.cup.push(entry.cupDiameterMm);
      if (isNumber(entry.cupDepthMm)) bucket.depth.push(entry.cupDepthMm);
      if (isNumber(entry.rimDiameterMm)) bucket.rim.push(entry.rimDiameterMm);
      const result = results.get(entry.keyId);
      const kind = result?.padKind ?? entry.padKind;
      if (kind && result && isNumber(result.padDiameterMm) && bucket.pad[kind]) bucket.pad[kind].push(result.padDiameterMm);
      if (kind) bucket.kinds[kind] = (bucket.kinds[kind] ?? 0) + 1;
    }
  }
  const keys: Record<string, KeySuggestion> = {};
  for (const [keyId, b] of perKey) {
    const sl = b.kinds.self_leveling ?? 0;
    const gl = b.kinds.glued ?? 0;
    const padKind: PadKind | null = sl + gl === 0 ? null : sl >= gl ? 'self_leveling' : 'glued';
    const padByKind = {
      self_leveling: suggestedPad(b.pad.self_leveling, 'self_leveling', catalog),
      glued: suggestedPad(b.pad.glued, 'glued', catalog),
    };
    keys[keyId] = {
      keyId,
      basedOn: b.cup.length,
      cupDiameterMm: median(b.cup),
      cupDepthMm: median(b.depth),
      rimDiameterMm: median(b.rim),
      padDiameterMm: padKind ? padByKind[padKind] : null,
      padKind,
      padByKind,
    };
  }
  return { basedOnMaps: used.length, keys };
}
