import { describe, expect, it } from 'vitest';
import { bandEigen } from '../../../src/physics/interaction/bandEigen';
import { householderEigen } from '../../../src/physics/interaction/householderEigen';

/** Seeded linear congruential generator (Numerical Recipes constants), values in [−1, 1). */
function seeded(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 31 - 1;
  };
}

/** A random symmetric band matrix, diagonal of rotor size (offset + ~100·i) and band entries of a few units. */
function randomBand(n: number, b: number, seed: number, offset = 0): Float64Array {
  const r = seeded(seed);
  const a = new Float64Array(n * n);
  for (let c = 0; c < n; c++)
    for (let i = c; i <= Math.min(n - 1, c + b); i++) {
      const v = i === c ? offset + 100 * r() : 3 * r();
      a[c * n + i] = v;
      a[i * n + c] = v;
    }
  return a;
}

/** The band rows bandEigen reads: rows[i·(2b + 1) + (j − i + b)] = A[i, j]. */
function toRows(a: Float64Array, n: number, b: number): Float64Array {
  const w = 2 * b + 1;
  const rows = new Float64Array(n * w);
  for (let i = 0; i < n; i++) for (let j = Math.max(0, i - b); j <= Math.min(n - 1, i + b); j++) rows[i * w + j - i + b] = a[j * n + i];
  return rows;
}

/** Largest ‖A v − λ v‖∞ and largest |vᵢ·vⱼ − δᵢⱼ| of a result. */
function quality(a: Float64Array, n: number, values: Float64Array, vectors: Float64Array): { residual: number; orthogonality: number } {
  let residual = 0;
  let orthogonality = 0;
  for (let k = 0; k < n; k++) {
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let c = 0; c < n; c++) s += a[c * n + i] * vectors[k * n + c];
      residual = Math.max(residual, Math.abs(s - values[k] * vectors[k * n + i]));
    }
    for (let q = 0; q <= k; q++) {
      let dot = 0;
      for (let i = 0; i < n; i++) dot += vectors[k * n + i] * vectors[q * n + i];
      orthogonality = Math.max(orthogonality, Math.abs(dot - (q === k ? 1 : 0)));
    }
  }
  return { residual, orthogonality };
}

describe('bandEigen', () => {
  it('agrees with the dense Householder solver on random band matrices (bands 0 to 6, orders up to 150)', () => {
    // Order, half bandwidth, and the path expected to answer (no fallback to the dense solver).
    const cases: [number, number, string][] = [
      [5, 0, 'diagonal'],
      [40, 1, 'tridiagonal'],
      [10, 2, 'dense'],
      [60, 2, 'band'],
      [150, 2, 'band'],
      [90, 3, 'band'],
      [120, 6, 'band'],
    ];
    for (const [n, b, path] of cases) {
      const a = randomBand(n, b, 7 * n + b, 1e4);
      const band = bandEigen(toRows(a, n, b), n, b);
      expect(band.solvedBy, `n=${n} b=${b}`).toBe(path);
      const dense = householderEigen(a, n);
      // Same eigenvalues to round-off of entries ~1e4 (1e-9 is ~10⁴ ε‖A‖).
      for (let k = 0; k < n; k++) expect(Math.abs(band.values[k] - dense.values[k]), `n=${n} b=${b} k=${k}`).toBeLessThan(1e-9);
      const q = quality(a, n, band.values, band.vectors);
      expect(q.residual, `n=${n} b=${b}`).toBeLessThan(1e-9);
      expect(q.orthogonality, `n=${n} b=${b}`).toBeLessThan(1e-10);
      // Same eigenvectors up to sign (the random spectra have no near-degeneracies): |⟨band|dense⟩| = 1.
      for (let k = 0; k < n; k++) {
        let dot = 0;
        for (let i = 0; i < n; i++) dot += band.vectors[k * n + i] * dense.vectors[k * n + i];
        expect(Math.abs(Math.abs(dot) - 1), `n=${n} b=${b} k=${k}`).toBeLessThan(1e-9);
      }
    }
  });

  it('handles exactly degenerate eigenvalues (two identical uncoupled blocks) with orthonormal vectors', () => {
    const n = 40;
    const half = randomBand(20, 2, 3);
    const a = new Float64Array(n * n);
    for (let c = 0; c < 20; c++)
      for (let r = 0; r < 20; r++) {
        a[c * n + r] = half[c * 20 + r];
        a[(c + 20) * n + r + 20] = half[c * 20 + r];
      }
    const r = bandEigen(toRows(a, n, 2), n, 2);
    expect(r.solvedBy).toBe('band');
    for (let k = 0; k < n; k += 2) expect(Math.abs(r.values[k] - r.values[k + 1])).toBeLessThan(1e-11);
    const q = quality(a, n, r.values, r.vectors);
    // Bound of the solver's own check, 10³·n·ε‖A‖ ≈ 9e-10 here (the dense solver's inverse
    // iteration reaches the same 1e-10 order on this matrix).
    expect(q.residual).toBeLessThan(1e-9);
    expect(q.orthogonality).toBeLessThan(1e-10);
  });

  it('gives the closed-form spectrum of the second-difference matrix (2 on the diagonal, −1 beside it, as a band of 2)', () => {
    // Eigenvalues 2 − 2 cos(kπ/(n + 1)), k = 1 … n (standard result, e.g. Golub and Van Loan §4.8).
    const n = 50;
    const a = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      a[i * n + i] = 2;
      if (i + 1 < n) {
        a[i * n + i + 1] = -1;
        a[(i + 1) * n + i] = -1;
      }
    }
    const r = bandEigen(toRows(a, n, 2), n, 2);
    expect(r.solvedBy).toBe('band');
    for (let k = 1; k <= n; k++) expect(r.values[k - 1]).toBeCloseTo(2 - 2 * Math.cos((k * Math.PI) / (n + 1)), 13);
  });

  it('names a non-finite entry and a bad bandwidth', () => {
    // Rows of width 3 for n = 2, b = 1: [·, A00, A01, A10, A11, ·].
    expect(() => bandEigen([0, 1, NaN, NaN, 1, 0], 2, 1)).toThrow(/bandEigen: entry \(row 1, column 0\) is NaN/);
    expect(() => bandEigen([1], 1, -1)).toThrow(/half bandwidth/);
    expect(() => bandEigen([1, 2], 2, 1)).toThrow(/need 6 band entries/);
  });
});
