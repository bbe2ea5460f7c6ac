import { describe, expect, it } from 'vitest';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { symmetricEigen, tridiagonalEigen, tridiagonalEigenFast } from '../../../src/physics/hamiltonian/symmetricEigen';
import { seededGaussian } from '../../fit/fitTestData';

function randomSymmetric(n: number, seed: number): Float64Array {
  const g = seededGaussian(seed);
  const a = new Float64Array(n * n);
  for (let j = 0; j < n; j++) for (let i = j; i < n; i++) a[j * n + i] = a[i * n + j] = g();
  return a;
}

/** max |A v − λ v| over all pairs and max |VᵀV − I|. */
function residuals(a: ArrayLike<number>, n: number, values: Float64Array, vectors: Float64Array): { eig: number; orth: number } {
  let eig = 0;
  let orth = 0;
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let k = 0; k < n; k++) s += a[k * n + i] * vectors[j * n + k];
      eig = Math.max(eig, Math.abs(s - values[j] * vectors[j * n + i]));
    }
    for (let q = 0; q < n; q++) {
      let s = 0;
      for (let k = 0; k < n; k++) s += vectors[j * n + k] * vectors[q * n + k];
      orth = Math.max(orth, Math.abs(s - (j === q ? 1 : 0)));
    }
  }
  return { eig, orth };
}

function mlEigenvalues(a: Float64Array, n: number): number[] {
  const m = new Matrix(n, n);
  for (let j = 0; j < n; j++) for (let i = 0; i < n; i++) m.set(i, j, a[j * n + i]);
  return [...new EigenvalueDecomposition(m, { assumeSymmetric: true }).realEigenvalues].sort((x, y) => x - y);
}

describe('symmetricEigen', () => {
  it('handles the empty and 1×1 matrices', () => {
    expect(symmetricEigen([], 0).values.length).toBe(0);
    const r = symmetricEigen([-3.5], 1);
    expect([...r.values]).toEqual([-3.5]);
    expect([...r.vectors]).toEqual([1]);
  });

  it('refuses a non-finite entry, naming it', () => {
    expect(() => symmetricEigen([1, NaN, NaN, 1], 2)).toThrow(/entry 1 \(row 1, column 0\) is NaN/);
  });

  it('gives the hand-worked eigenpairs of [[2, 1], [1, 2]]', () => {
    // Hand-worked: eigenvalues 1 and 3 with vectors (1, −1)/√2 and (1, 1)/√2; round-off tolerance.
    const r = symmetricEigen([2, 1, 1, 2], 2);
    expect(r.values[0]).toBeCloseTo(1, 14);
    expect(r.values[1]).toBeCloseTo(3, 14);
    expect(Math.abs(r.vectors[2])).toBeCloseTo(Math.SQRT1_2, 14);
    expect(r.vectors[2] * r.vectors[3]).toBeGreaterThan(0);
  });

  for (const [n, seed] of [
    [5, 11],
    [17, 12],
    [40, 13],
  ] as const) {
    it(`agrees with ml-matrix on a seeded random symmetric ${n}×${n} matrix`, () => {
      // Reference: ml-matrix 6.15 EigenvalueDecomposition (Householder + QL). Entries are O(1), so the
      // eigenvalues agree to a few hundred ulps (1e-12) and A v = λ v holds to 1e-12.
      const a = randomSymmetric(n, seed);
      const r = symmetricEigen(a, n);
      const ref = mlEigenvalues(a, n);
      for (let j = 0; j < n; j++) expect(Math.abs(r.values[j] - ref[j])).toBeLessThan(1e-12);
      const res = residuals(a, n, r.values, r.vectors);
      expect(res.eig).toBeLessThan(1e-12);
      expect(res.orth).toBeLessThan(1e-12);
    });
  }

  it('keeps an exactly degenerate pair orthonormal', () => {
    // diag(1, 1, 2) rotated by a fixed orthogonal matrix has the eigenvalue 1 twice.
    const c = Math.cos(0.3);
    const s = Math.sin(0.3);
    const q = [c, s, 0, -s, c, 0, 0, 0, 1];
    const d = [1, 1, 2];
    const a = new Float64Array(9);
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) for (let k = 0; k < 3; k++) a[j * 3 + i] += q[k * 3 + i] * d[k] * q[k * 3 + j];
    const r = symmetricEigen(a, 3);
    expect(r.values[0]).toBeCloseTo(1, 14);
    expect(r.values[1]).toBeCloseTo(1, 14);
    expect(residuals(a, 3, r.values, r.vectors).orth).toBeLessThan(1e-14);
  });
});

describe('tridiagonalEigen', () => {
  it('returns the diagonal when the off-diagonal is zero', () => {
    const r = tridiagonalEigen([3, -1, 2], [0, 0]);
    expect([...r.values]).toEqual([-1, 2, 3]);
  });

  it('gives the closed-form eigenvalues of the second-difference matrix', () => {
    // Ref: the n×n tridiagonal matrix with 2 on the diagonal and −1 beside it has eigenvalues
    // 2 − 2 cos(jπ/(n+1)), j = 1…n (G. D. Smith, Numerical Solution of Partial Differential
    // Equations (1985), ch. 2; from memory). Tolerance 1e-13: round-off of O(1) numbers.
    const n = 30;
    const r = tridiagonalEigen(new Array(n).fill(2), new Array(n - 1).fill(-1));
    for (let j = 1; j <= n; j++) expect(Math.abs(r.values[j - 1] - (2 - 2 * Math.cos((j * Math.PI) / (n + 1))))).toBeLessThan(1e-13);
  });

  it('agrees with the dense solver and ml-matrix on a seeded random tridiagonal matrix with a split', () => {
    const n = 25;
    const g = seededGaussian(21);
    const d = Array.from({ length: n }, () => 10 * g());
    const e = Array.from({ length: n - 1 }, (_, i) => (i === 9 ? 0 : g()));
    const a = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      a[i * n + i] = d[i];
      if (i < n - 1) a[i * n + i + 1] = a[(i + 1) * n + i] = e[i];
    }
    const r = tridiagonalEigen(d, e);
    const ref = mlEigenvalues(a, n);
    // Entries O(10): agreement to 1e-11 (round-off).
    for (let j = 0; j < n; j++) expect(Math.abs(r.values[j] - ref[j])).toBeLessThan(1e-11);
    const res = residuals(a, n, r.values, r.vectors);
    expect(res.eig).toBeLessThan(1e-11);
    expect(res.orth).toBeLessThan(1e-12);
    expect([...tridiagonalEigen(d, e, false).values]).toEqual([...r.values].map((v) => expect.closeTo(v, 11)));
  });
});

describe('tridiagonalEigenFast', () => {
  function compare(d: number[], e: number[], tolValue: number, tolVector: number): void {
    const fast = tridiagonalEigenFast(d, e);
    const ql = tridiagonalEigen(d, e);
    const n = d.length;
    for (let j = 0; j < n; j++) {
      expect(Math.abs(fast.values[j] - ql.values[j])).toBeLessThan(tolValue);
      // Same unit vector up to sign (both are sign-fixed by their largest component).
      let dot = 0;
      for (let i = 0; i < n; i++) dot += fast.vectors[j * n + i] * ql.vectors[j * n + i];
      expect(1 - Math.abs(dot)).toBeLessThan(tolVector);
    }
    const a = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      a[i * n + i] = d[i];
      if (i < n - 1) a[i * n + i + 1] = a[(i + 1) * n + i] = e[i];
    }
    const res = residuals(a, n, fast.values, fast.vectors);
    expect(res.orth).toBeLessThan(1e-9);
  }

  it('agrees with the QL vectors on a seeded random 60×60 tridiagonal matrix', () => {
    // Reference: tridiagonalEigen (QL). Entries O(10): eigenvalues to 1e-11, vectors to 1e-12 in 1 − |v·w|.
    const g = seededGaussian(31);
    compare(
      Array.from({ length: 60 }, () => 10 * g()),
      Array.from({ length: 59 }, () => g()),
      1e-11,
      1e-12,
    );
  });

  it('agrees with the QL vectors on a stiff chain like a degenerate state at J = 80 (diagonal up to 3e4, tiny links)', () => {
    // A quadratic diagonal (A k² − 2Aζ k with A = 5 cm⁻¹) and couplings from 1e-9 to 1 cm⁻¹; the smallest
    // diagonal gap is 2 cm⁻¹. Tolerances: eigenvalues 1e-9 (round-off of 3e4), vectors 1e-9 (ε‖T‖/gap ≈ 1e-12).
    const n = 107;
    const d = Array.from({ length: n }, (_, i) => 1200 + 5 * (i - 53) ** 2 - 2.7 * (i - 53));
    const e = Array.from({ length: n - 1 }, (_, i) => 10 ** (-9 + (9 * i) / (n - 2)));
    compare(d, e, 1e-9, 1e-9);
  });
});
