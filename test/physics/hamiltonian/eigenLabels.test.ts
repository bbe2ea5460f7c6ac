import { describe, expect, it } from 'vitest';
import { eigenLabelsAssign } from '../../../src/physics/hamiltonian/eigenLabels';

describe('eigenLabelsAssign', () => {
  it('labels the identity by itself with weight 1', () => {
    const r = eigenLabelsAssign([1, 0, 0, 0, 1, 0, 0, 0, 1], 3);
    expect([...r.basisIndex]).toEqual([0, 1, 2]);
    expect([...r.weight]).toEqual([1, 1, 1]);
  });

  it('gives two different labels to two vectors whose largest component is the same basis function', () => {
    // Hand-worked weights |c|²: column 0 (0.64, 0.36, 0), column 1 (0.49, 0.09, 0.42), column 2 (0, 0, 1).
    // Columns 0 and 1 both peak on basis 0. Greedy by weight: (2, basis 2) = 1, then (0, basis 0) = 0.64,
    // then column 1 takes the only basis left, 1, with weight 0.09 (a label to flag as uncertain).
    const c3 = Math.sqrt(0.42);
    const v = [0.8, 0.6, 0, 0.7, -0.3, c3, 0, 0, 1];
    const r = eigenLabelsAssign(v, 3);
    expect([...r.basisIndex]).toEqual([0, 1, 2]);
    expect(r.weight[1]).toBeCloseTo(0.09, 12);
  });

  it('gives the labels of the plain greedy rule (one full sort of all pairs by weight) on crowded random columns', () => {
    // Reference: the rule as stated in eigenLabels.ts, written out with one stable sort of all n²
    // pairs (ties in pair order). Columns share their largest component (basis 0) so the greedy
    // branch runs, and small weights below 1/(2n) are needed to finish.
    let seed = 12345;
    const random = () => {
      seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0;
      return seed / 2 ** 32;
    };
    for (const n of [3, 8, 30]) {
      const v = Float64Array.from({ length: n * n }, (_, idx) => (idx % n === 0 ? 0.9 + 0.05 * random() : 0.3 * random() ** 3));
      const pairs = Array.from({ length: n * n }, (_, idx) => idx).sort((x, y) => v[y] * v[y] - v[x] * v[x]);
      const refIndex = new Int32Array(n);
      const vectorDone = new Uint8Array(n);
      const basisDone = new Uint8Array(n);
      for (const idx of pairs) {
        const j = Math.floor(idx / n);
        const i = idx % n;
        if (vectorDone[j] || basisDone[i]) continue;
        vectorDone[j] = basisDone[i] = 1;
        refIndex[j] = i;
      }
      const r = eigenLabelsAssign(v, n);
      expect([...r.basisIndex], `n=${n}`).toEqual([...refIndex]);
      r.basisIndex.forEach((i, j) => expect(r.weight[j]).toBe(v[j * n + i] ** 2));
    }
  });

  it('refuses a too-short coefficient array', () => {
    expect(() => eigenLabelsAssign([1, 0], 2)).toThrow(/need 4 coefficients/);
  });
});
