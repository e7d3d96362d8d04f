import type { PadKind } from './rules.js';

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
  padDiameterMm: number | null;
  /** The pad kind most maps used for this key (self-leveling on a tie). */
  padKind: PadKind | null;
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

export function latestPerInstrument(maps: EarlierMap[]): EarlierMap[] {
  const latest = new Map<string, EarlierMap>();
  for (const map of maps) {
    const seen = latest.get(map.instrumentId);
    if (!seen || new Date(map.createdAt).getTime() > new Date(seen.createdAt).getTime()) latest.set(map.instrumentId, map);
  }
  return [...latest.values()];
}

export function suggestFromMaps(maps: EarlierMap[]): Suggestions {
  const used = latestPerInstrument(maps);
  const perKey = new Map<string, { cup: number[]; depth: number[]; rim: number[]; pad: number[]; kinds: Record<string, number> }>();
  for (const map of used) {
    const results = new Map(map.results.map((r) => [r.keyId, r]));
    for (const entry of map.entries) {
      if (!isNumber(entry.cupDiameterMm)) continue;
      const bucket = perKey.get(entry.keyId) ?? { cup: [], depth: [], rim: [], pad: [], kinds: {} };
      perKey.set(entry.keyId, bucket);
      bucket.cup.push(entry.cupDiameterMm);
      if (isNumber(entry.cupDepthMm)) bucket.depth.push(entry.cupDepthMm);
      if (isNumber(entry.rimDiameterMm)) bucket.rim.push(entry.rimDiameterMm);
      const result = results.get(entry.keyId);
      if (result && isNumber(result.padDiameterMm)) bucket.pad.push(result.padDiameterMm);
      const kind = result?.padKind ?? entry.padKind;
      if (kind) bucket.kinds[kind] = (bucket.kinds[kind] ?? 0) + 1;
    }
  }
  const keys: Record<string, KeySuggestion> = {};
  for (const [keyId, b] of perKey) {
    const sl = b.kinds.self_leveling ?? 0;
    const gl = b.kinds.glued ?? 0;
    keys[keyId] = {
      keyId,
      basedOn: b.cup.length,
      cupDiameterMm: median(b.cup),
      cupDepthMm: median(b.depth),
      rimDiameterMm: median(b.rim),
      padDiameterMm: median(b.pad),
      padKind: sl + gl === 0 ? null : sl >= gl ? 'self_leveling' : 'glued',
    };
  }
  return { basedOnMaps: used.length, keys };
}
