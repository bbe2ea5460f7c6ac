import { describe, expect, it } from 'vitest';
import { householderEigen } from '../../../src/physics/interaction/householderEigen';
import { symmetricEigen } from '../../../src/physics/hamiltonian/symmetricEigen';

/** Seeded linear congruential generator (Numerical Recipes constants), values in [−1, 1). */
function seeded(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 31 - 1;
  };
}

function randomSymmetric(n: number, seed: number): Float64Array {
  const r = seeded(seed);
  const a = new Float64Array(n * n);
  for (let c = 0; c < n; c++)
    for (let i = c; i < n; i++) {
      const v = r() * (i === c ? 100 : 3);
      a[c * n + i] = v;
      a[i * n + c] = v;
    }
  return a;
}

describe('householderEigen', () => {
  it('returns nothing for order 0 and the entry itself for order 1', () => {
    expect(householderEigen([], 0).values.length).toBe(0);
    const one = householderEigen([2.5], 1);
    expect(one.values[0]).toBe(2.5);
    expect(Math.abs(one.vectors[0])).toBe(1);
  });

  it('gives the closed-form 2 × 2 eigenvalues (a ± √(b² + d²) form)', () => {
    // [[1, 2], [2, 4]]: λ = (5 ± √(9 + 16))/2 = 0 and 5 by hand.
    const r = householderEigen([1, 2, 2, 4], 2);
    expect(r.values[0]).toBeCloseTo(0, 13);
    expect(r.values[1]).toBeCloseTo(5, 13);
  });

  it('agrees with the Jacobi solver and satisfies A v = λ v to round-off on random blocks up to order 60', () => {
    for (const n of [3, 7, 25, 60]) {
      const a = randomSymmetric(n, 17 + n);
      const h = householderEigen(a, n);
      const j = symmetricEigen(a, n);
      for (let k = 0; k < n; k++) expect(Math.abs(h.values[k] - j.values[k])).toBeLessThan(1e-10);
      // Residual ‖A v − λ v‖ and orthonormality; tolerance 1e-10 ≈ 10⁴ × round-off of entries ~100.
      for (let k = 0; k < n; k++) {
        let res = 0;
        for (let i = 0; i < n; i++) {
          let s = 0;
          for (let c = 0; c < n; c++) s += a[c * n + i] * h.vectors[k * n + c];
          res = Math.max(res, Math.abs(s - h.values[k] * h.vectors[k * n + i]));
        }
        expect(res).toBeLessThan(1e-10);
        let dot = 0;
        for (let i = 0; i < n; i++) dot += h.vectors[k * n + i] * h.vectors[((k + 1) % n) * n + i];
        if (n > 1) expect(Math.abs(dot)).toBeLessThan(1e-10);
      }
    }
  });
});
