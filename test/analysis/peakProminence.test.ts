import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { peakProminence } from '../../src/analysis/peakProminence';

/**
 * Direct O(n²) transcription of the definition in the SciPy `signal.peak_prominences` documentation
 * (Virtanen et al., Nat. Methods 17, 261 (2020)): from the peak, extend a line left and right until
 * the signal is strictly higher (or the end); the base on each side is the minimum in that stretch;
 * prominence = peak − the higher base. Maxima as scipy `find_peaks` (flat tops at the middle sample,
 * rounded down).
 */
function bruteForce(y: number[]): { index: number[]; prominence: number[] } {
  const index: number[] = [];
  const prominence: number[] = [];
  for (let i = 1; i < y.length - 1; i++) {
    if (!(y[i] > y[i - 1])) continue;
    let j = i;
    while (j + 1 < y.length && y[j + 1] === y[i]) j++;
    if (j + 1 >= y.length || !(y[j + 1] < y[i])) continue;
    const p = (i + j) >> 1;
    let left = y[p];
    for (let k = p; k >= 0 && y[k] <= y[p]; k--) left = Math.min(left, y[k]);
    let right = y[p];
    for (let k = p; k < y.length && y[k] <= y[p]; k++) right = Math.min(right, y[k]);
    index.push(p);
    prominence.push(y[p] - Math.max(left, right));
    i = j;
  }
  return { index, prominence };
}

describe('peakProminence', () => {
  it('finds nothing in an empty, one-point, two-point, flat or monotonic trace', () => {
    for (const y of [[], [1], [1, 2], [2, 2, 2, 2], [1, 2, 3, 4], [4, 3, 2]]) {
      expect(peakProminence(Float64Array.from(y)).count).toBe(0);
    }
  });

  it('gives the hand-computed prominences of a small profile', () => {
    // y = [0, 3, 1, 4, 1, 2, 0]: maxima at 1, 3, 5. Peak 1: bases 0 (left) and 1 (right, stopped by
    // the 4) → 2. Peak 3: bases 0 and 0 → 4. Peak 5: bases 1 (stopped by the 4) and 0 → 1.
    const r = peakProminence(Float64Array.of(0, 3, 1, 4, 1, 2, 0));
    expect(Array.from(r.index)).toEqual([1, 3, 5]);
    expect(Array.from(r.prominence)).toEqual([2, 4, 1]);
  });

  it('counts a flat top once at its middle sample, and not a flat step', () => {
    const r = peakProminence(Float64Array.of(0, 2, 2, 2, 2, 1, 3, 3, 5, 0));
    // Top 1–4 → middle index 2, prominence 2 − max(0, 1) = 1; the 3,3 run rises again: not a maximum.
    expect(Array.from(r.index)).toEqual([2, 8]);
    expect(Array.from(r.prominence)).toEqual([1, 5]);
  });

  it('agrees exactly with the brute-force definition on random data with many ties', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 6 }), { maxLength: 80 }), (y) => {
        const fast = peakProminence(Float64Array.from(y));
        const slow = bruteForce(y);
        expect(Array.from(fast.index)).toEqual(slow.index);
        expect(Array.from(fast.prominence)).toEqual(slow.prominence);
      }),
      { seed: 424242, numRuns: 1000 },
    );
  });

  it('agrees with the brute force on random real values (no ties)', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 3, maxLength: 200 }), (y) => {
        const fast = peakProminence(Float64Array.from(y));
        const slow = bruteForce(y);
        expect(Array.from(fast.index)).toEqual(slow.index);
        expect(Array.from(fast.prominence)).toEqual(slow.prominence);
      }),
      { seed: 7, numRuns: 300 },
    );
  });
});
