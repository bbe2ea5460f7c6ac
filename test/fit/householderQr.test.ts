import { describe, expect, it } from 'vitest';
import { Matrix, QrDecomposition } from 'ml-matrix';
import { householderApplyQt, householderQr, householderR } from '../../src/fit/householderQr';
import { seededGaussian } from './fitTestData';

/** Random column-major m×n matrix (seeded) and the same as an ml-matrix Matrix. */
function randomMatrix(m: number, n: number, seed: number): { a: Float64Array; mat: Matrix } {
  const g = seededGaussian(seed);
  const a = new Float64Array(m * n);
  for (let i = 0; i < a.length; i++) a[i] = g();
  const mat = new Matrix(m, n);
  for (let j = 0; j < n; j++) for (let i = 0; i < m; i++) mat.set(i, j, a[j * m + i]);
  return { a, mat };
}

function factor(a: Float64Array, m: number, n: number) {
  const work = Float64Array.from(a);
  const rDiagonal = new Float64Array(n);
  const beta = new Float64Array(n);
  householderQr(work, m, n, rDiagonal, beta);
  return { work, beta, r: householderR(work, m, n, rDiagonal) };
}

describe('householderQr', () => {
  it('refuses a matrix with more columns than rows', () => {
    expect(() => householderQr(new Float64Array(6), 2, 3, new Float64Array(3), new Float64Array(3))).toThrow(/rows >= columns/);
  });

  it('factors a 1×1 matrix as R = ±a', () => {
    const { r } = factor(Float64Array.of(-3), 1, 1);
    expect(Math.abs(r[0])).toBe(3);
  });

  it('leaves a zero column with a zero diagonal and no reflector', () => {
    // Column 1 identically zero: R must have R11 = 0, and the factorisation must stay exact.
    const a = Float64Array.of(1, 2, 3, 0, 0, 0, 4, 5, 7);
    const { r, beta } = factor(a, 3, 3);
    expect(beta[1]).toBe(0);
    expect(r[1 * 3 + 1]).toBe(0);
  });

  it('gives the same R as ml-matrix QrDecomposition up to the sign of each row', () => {
    // Reference: ml-matrix 6.15 QrDecomposition (general-purpose npm library). The QR factor R
    // is unique up to the signs of its rows; tolerance 1e-12 × ‖A‖ covers round-off.
    const m = 40;
    const n = 7;
    const { a, mat } = randomMatrix(m, n, 11);
    const { r } = factor(a, m, n);
    const ref = new QrDecomposition(mat).upperTriangularMatrix;
    for (let i = 0; i < n; i++) {
      const sign = Math.sign(r[i * n + i]) * Math.sign(ref.get(i, i));
      for (let j = i; j < n; j++) expect(r[j * n + i] * sign).toBeCloseTo(ref.get(i, j), 11);
    }
  });

  it('applies an orthogonal Qᵀ: norms are kept and Qᵀ A = R', () => {
    const m = 25;
    const n = 5;
    const { a } = randomMatrix(m, n, 5);
    const { work, beta, r } = factor(a, m, n);
    for (let j = 0; j < n; j++) {
      const col = a.slice(j * m, j * m + m);
      const before = Math.hypot(...col);
      householderApplyQt(work, m, n, beta, col);
      expect(Math.hypot(...col)).toBeCloseTo(before, 12);
      // Below the diagonal Qᵀ a_j vanishes; above, it equals column j of R (round-off 1e-12).
      for (let i = 0; i < m; i++) expect(col[i]).toBeCloseTo(i < n ? r[j * n + i] : 0, 12);
    }
  });
});
