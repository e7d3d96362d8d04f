/**
 * Near misses of a serial number. Reading a worn engraving, people swap two neighbouring characters more
 * than anything else, then mistake, drop or double one. Each of these is one edit in the optimal string
 * alignment distance (Damerau–Levenshtein where a swapped pair is not edited again), which ranks near misses.
 */

/** Edits between two strings: substitution, insertion, deletion, or a swap of two neighbours, each 1. */
export function osaDistance(a: string, b: string): number {
  const m = a.length;
  const n = b.length;
  if (!m) return n;
  if (!n) return m;
  // three rows: two back (for the swap), one back, and the current
  let before = new Array<number>(n + 1).fill(0);
  let previous = Array.from({ length: n + 1 }, (_, j) => j);
  for (let i = 1; i <= m; i++) {
    const current = new Array<number>(n + 1);
    current[0] = i;
    for (let j = 1; j <= n; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let d = Math.min(previous[j] + 1, current[j - 1] + 1, previous[j - 1] + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) d = Math.min(d, before[j - 2] + 1);
      current[j] = d;
    }
    before = previous;
    previous = current;
  }
  return previous[n];
}

/** Characters a normalised serial is made of (shared/serial.ts upper-cases and drops separators). */
const SERIAL_ALPHABET = 'ABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789';

/**
 * Every string one edit away from a normalised serial: each neighbour pair swapped, each character dropped,
 * changed to another, or one more inserted anywhere. About 75 × length strings (≈ 600 for 8 characters), which
 * the database looks up exactly in its serial index: every single-edit near miss is found, however few
 * trigrams it shares with what was typed (a swap in a short serial breaks most of them).
 */
export function singleEditVariants(serial: string): string[] {
  const out = new Set<string>();
  const alphabet = [...new Set(SERIAL_ALPHABET + serial)];
  for (let i = 0; i < serial.length; i++) {
    if (i + 1 < serial.length && serial[i] !== serial[i + 1]) {
      out.add(serial.slice(0, i) + serial[i + 1] + serial[i] + serial.slice(i + 2));
    }
    out.add(serial.slice(0, i) + serial.slice(i + 1));
    for (const c of alphabet) if (c !== serial[i]) out.add(serial.slice(0, i) + c + serial.slice(i + 1));
  }
  for (let i = 0; i <= serial.length; i++) for (const c of alphabet) out.add(serial.slice(0, i) + c + serial.slice(i));
  out.delete(serial);
  return [...out];
}
