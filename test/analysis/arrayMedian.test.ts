import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { arrayMedianInPlace, arraySelectInPlace } from '../../src/analysis/arrayMedian';

// Reference: the textbook median of a sorted copy (mean of the two middle values for even n).
function medianBySort(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const h = s.length >> 1;
  return s.length % 2 ? s[h] : 0.5 * (s[h - 1] + s[h]);
}

describe('arrayMedianInPlace', () => {
  it('returns NaN for no values', () => {
    expect(arrayMedianInPlace(new Float64Array(0))).toBeNaN();
  });

  it('returns the single value, and the mean of two', () => {
    expect(arrayMedianInPlace(Float64Array.of(3))).toBe(3);
    expect(arrayMedianInPlace(Float64Array.of(4, 1))).toBe(2.5);
  });

  it('agrees exactly with sorting on random arrays with ties, odd and even length', () => {
    // Exact equality: both select the same stored doubles (one rounding for the even-n mean).
    fc.assert(
      fc.property(fc.array(fc.integer({ min: -5, max: 5 }), { minLength: 1, maxLength: 60 }), (ints) => {
        const values = ints.map((v) => v * 0.5);
        expect(arrayMedianInPlace(Float64Array.from(values))).toBe(medianBySort(values));
      }),
      { seed: 20240611, numRuns: 400 },
    );
  });

  it('uses only the first n entries when n is given', () => {
    expect(arrayMedianInPlace(Float64Array.of(5, 1, 3, 100, 100), 3)).toBe(3);
  });
});

describe('arraySelectInPlace', () => {
  it('finds every rank of a reversed array (the worst case of a naive pivot)', () => {
    const n = 101;
    for (let k = 0; k < n; k++) {
      const a = new Float64Array(n);
      for (let i = 0; i < n; i++) a[i] = n - i;
      expect(arraySelectInPlace(a, n, k)).toBe(k + 1);
    }
  });
});
