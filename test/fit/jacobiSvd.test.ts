import { describe, expect, it } from 'vitest';
import { Matrix, SVD } from 'ml-matrix';
import { jacobiSvd } from '../../src/fit/jacobiSvd';
import { seededGaussian } from './fitTestData';

function toMatrix(a: Float64Array, m: number, n: number): Matrix {
  const mat = new Matrix(m, n);
  for (let j = 0; j < n; j++) for (let i = 0; i < m; i++) mat.set(i, j, a[j * m + i]);
  return mat;
}

function randomColumnMajor(m: number, n: number, seed: number): Float64Array {
  const g = seededGaussian(seed);
  return Float64Array.from({ length: m * n }, () => g());
}

describe('jacobiSvd', () => {
  it('refuses more columns than rows', () => {
    expect(() => jacobiSvd(new Float64Array(6), 2, 3)).toThrow(/rows >= columns/);
  });

  it('returns |a| for a 1×1 matrix and the identity for V', () => {
    const r = jacobiSvd(Float64Array.of(-2.5), 1, 1);
    expect(r.s[0]).toBe(2.5);
    expect(Math.abs(r.v[0])).toBe(1);
  });

  it('gives the singular values of a diagonal matrix sorted descending', () => {
    // Hand-checkable: diag(1, 3, 2) has singular values 3, 2, 1 exactly.
    const a = Float64Array.of(1, 0, 0, 0, 3, 0, 0, 0, 2);
    expect([...jacobiSvd(a, 3, 3).s]).toEqual([3, 2, 1]);
  });

  for (const [m, n, seed] of [
    [13, 13, 1],
    [40, 6, 2],
    [20, 20, 3],
  ] as const) {
    it(`agrees with ml-matrix SVD on a seeded random ${m}×${n} matrix`, () => {
      // Reference: ml-matrix 6.15 SVD (Golub–Kahan–Reinsch). Singular values agree to 1e-12 × s_max
      // (both backward stable); singular vectors are compared through the reconstruction A = U S Vᵀ.
      const a = randomColumnMajor(m, n, seed);
      const ours = jacobiSvd(a, m, n);
      const ref = new SVD(toMatrix(a, m, n), { autoTranspose: true });
      const sMax = ours.s[0];
      ref.diagonal.forEach((s, j) => expect(Math.abs(ours.s[j] - s)).toBeLessThan(1e-12 * sMax));
      for (let i = 0; i < m; i++) {
        for (let j = 0; j < n; j++) {
          let v = 0;
          for (let k = 0; k < n; k++) v += ours.u[k * m + i] * ours.s[k] * ours.v[k * n + j];
          expect(Math.abs(v - a[j * m + i])).toBeLessThan(1e-13 * sMax * m);
        }
      }
    });
  }

  it('finds an exact linear dependence as a singular value at round-off level, as ml-matrix does', () => {
    // Column 3 = column 0 − 2·column 1: rank 3 of 4. ml-matrix reports rank 3 too.
    const m = 10;
    const a = randomColumnMajor(m, 4, 9);
    for (let i = 0; i < m; i++) a[3 * m + i] = a[i] - 2 * a[m + i];
    const ours = jacobiSvd(a, m, 4);
    expect(ours.s[3] / ours.s[0]).toBeLessThan(1e-14);
    expect(new SVD(toMatrix(a, m, 4)).rank).toBe(3);
    // The null vector is ∝ (1, −2, 0, −1)/√6.
    const v = [0, 1, 2, 3].map((i) => ours.v[3 * 4 + i]);
    const scale = v[0];
    expect(v.map((x) => x / scale)).toEqual([1, expect.closeTo(-2, 12), expect.closeTo(0, 12), expect.closeTo(-1, 12)]);
  });

  it('resolves the 8×8 Hilbert matrix condition number as ml-matrix does', () => {
    // Ill-conditioned check: cond₂(H8) ≈ 1.5258e10 (N. J. Higham, Accuracy and Stability of Numerical
    // Algorithms, 2nd ed. (2002), ch. 28 on the Hilbert matrix — value from memory, so only 3 digits);
    // compared with ml-matrix to 1e-6 relative (both lose ~6 of 16 digits to the conditioning).
    const n = 8;
    const a = new Float64Array(n * n);
    for (let j = 0; j < n; j++) for (let i = 0; i < n; i++) a[j * n + i] = 1 / (i + j + 1);
    const ours = jacobiSvd(a, n, n);
    const cond = ours.s[0] / ours.s[n - 1];
    expect(cond / new SVD(toMatrix(a, n, n)).condition).toBeCloseTo(1, 6);
    expect(cond / 1.5258e10).toBeCloseTo(1, 3);
  });
});
