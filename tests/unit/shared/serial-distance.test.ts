import { describe, expect, it } from 'vitest';
import { osaDistance, singleEditVariants } from '../../../shared/serial-distance.js';

/*
 * Distances worked by hand. Optimal string alignment counts a swap of two neighbouring characters as one
 * edit (Damerau, 1964); plain Levenshtein counts it as two. The classic pair CA → ABC is 3 in optimal string
 * alignment (a swapped pair may not be edited again) and 2 in unrestricted Damerau–Levenshtein.
 */
describe('osaDistance', () => {
  it.each([
    ['AB104233', 'AB104233', 0],
    ['AB104323', 'AB104233', 1], // the swap of 3 and 2
    ['BA104233', 'AB104233', 1], // swap at the start
    ['AB104232', 'AB104223', 1], // swap at the end
    ['AB104283', 'AB104233', 1], // one wrong
    ['AB10423', 'AB104233', 1], // one dropped
    ['AB1042333', 'AB104233', 1], // one doubled
    ['AB401233', 'AB104233', 2], // 1 and 4 are not neighbours: two substitutions
    ['AB014323', 'AB104233', 2], // two separate swaps
    ['CA', 'ABC', 3],
    ['', 'ABC', 3],
    ['KITTEN', 'SITTING', 3], // Levenshtein's textbook pair, no swap in it
  ])('%s → %s is %i', (a, b, d) => {
    expect(osaDistance(a, b)).toBe(d);
    expect(osaDistance(b, a)).toBe(d);
  });
});

describe('singleEditVariants', () => {
  it('holds every kind of single edit of AB104233 and nothing else', () => {
    const variants = new Set(singleEditVariants('AB104233'));
    for (const v of ['AB104323', 'BA104233', 'AB104283', 'AB10423', 'AB1042333', 'XAB104233', 'AB104233Z']) expect(variants.has(v), v).toBe(true);
    expect(variants.has('AB104233')).toBe(false);
    expect(variants.has('AB401233')).toBe(false);
    // 8 characters over 36 symbols: 8 × 35 = 280 distinct substitutions, plus some of the 7 swaps, 8 deletions and
    // 9 × 36 insertions (some coincide: inserting a 3 before or after 33 gives the same string)
    for (const v of variants) expect(Math.abs(v.length - 8) <= 1).toBe(true);
    expect(variants.size).toBeGreaterThan(8 * 35);
    expect(variants.size).toBeLessThan(280 + 7 + 8 + 9 * 36);
  });
});
