import { describe, expect, it } from 'vitest';
import { inverse, Matrix, SVD } from 'ml-matrix';
import { linearisePredictedDecrease, lineariserCreate, lineariseCovariance, lineariseStep } from '../../src/fit/leastSquaresLinearise';
import { seededGaussian } from './fitTestData';

/** A seeded m×n Jacobian with columns of very different scales (as B against HJ), plus residuals. */
function setup(m: number, n: number, seed: number) {
  const g = seededGaussian(seed);
  const jac = new Float64Array(m * n);
  const mat = new Matrix(m, n);
  for (let j = 0; j < n; j++) {
    const scale = 10 ** (3 * j - 6);
    for (let i = 0; i < m; i++) {
      jac[j * m + i] = g() * scale;
      mat.set(i, j, jac[j * m + i]);
    }
  }
  const r = Float64Array.from({ length: m }, () => g());
  return { jac, mat, r, rMat: Matrix.columnVector([...r]) };
}

describe('lineariserCreate', () => {
  it('gives the undamped step of ml-matrix SVD solve and the same predicted decrease', () => {
    // Reference: ml-matrix 6.15 SVD.solve (minimum-norm least squares), given the same matrix with
    // its columns divided by their known scales 10^(3j−6) (unscaled, its condition ~1e12 would cost
    // ml-matrix ~8 digits). Tolerance 1e-10 relative: round-off of two well-conditioned solves.
    const { jac, mat, r, rMat } = setup(30, 5, 3);
    const lin = lineariserCreate(30, 5, 1e-10).linearise(Float64Array.from(jac), r);
    expect(lin.rank).toBe(5);
    const step = new Float64Array(5);
    lineariseStep(lin, 0, step);
    const unscale = Matrix.diag([0, 1, 2, 3, 4].map((j) => 10 ** -(3 * j - 6)));
    const ref = unscale.mmul(new SVD(mat.mmul(unscale)).solve(rMat));
    for (let j = 0; j < 5; j++) expect(Math.abs(step[j] / ref.get(j, 0) - 1)).toBeLessThan(1e-10);
    // Predicted decrease at λ = 0 is ‖r‖² − ‖r − J δ‖².
    const after = rMat.clone().sub(mat.mmul(Matrix.columnVector([...step])));
    const expected = rMat.norm() ** 2 - after.norm() ** 2;
    expect(linearisePredictedDecrease(lin, 0) / expected).toBeCloseTo(1, 10);
  });

  it('gives the covariance (JᵀJ)⁻¹ of ml-matrix inverse', () => {
    const { jac, mat, r } = setup(25, 4, 8);
    const lin = lineariserCreate(25, 4, 1e-10).linearise(Float64Array.from(jac), r);
    const cov = lineariseCovariance(lin);
    const ref = inverse(mat.transpose().mmul(mat));
    for (let a = 0; a < 4; a++) {
      for (let b = 0; b < 4; b++) {
        const scale = Math.sqrt(ref.get(a, a) * ref.get(b, b));
        expect(Math.abs(cov[a * 4 + b] - ref.get(a, b)) / scale).toBeLessThan(1e-9);
      }
    }
  });

  it('gives the damped step (J_sᵀJ_s + λI)⁻¹ J_sᵀ r in column-scaled coordinates', () => {
    // Definition of the Levenberg–Marquardt step with Marquardt's scaling (Moré 1978, eq. 2.3 form).
    const { jac, mat, r, rMat } = setup(20, 3, 21);
    const lin = lineariserCreate(20, 3, 1e-10).linearise(Float64Array.from(jac), r);
    const d = Matrix.diag([...lin.columnScale]);
    const js = mat.mmul(d);
    const lambda = 0.37;
    const z = inverse(js.transpose().mmul(js).add(Matrix.eye(3).mul(lambda)))
      .mmul(js.transpose())
      .mmul(rMat);
    const step = new Float64Array(3);
    lineariseStep(lin, lambda, step);
    for (let j = 0; j < 3; j++) expect(step[j] / (z.get(j, 0) * lin.columnScale[j])).toBeCloseTo(1, 10);
  });

  it('reports zero columns and an infinite condition number', () => {
    const { jac, r } = setup(10, 3, 4);
    jac.fill(0, 10, 20);
    const lin = lineariserCreate(10, 3, 1e-10).linearise(jac, r);
    expect(lin.zeroColumns).toEqual([1]);
    expect(lin.rank).toBe(2);
    expect(lin.conditionNumber).toBe(Infinity);
  });
});
