import { inverse, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { fitBand } from '../../src/fit/fitBand';
import type { FitLineInput, FitOutcome, FitResult } from '../../src/fit/fitTypes';
import { FIT_FEW_DOF } from '../../src/fit/fitResultBuild';
import { inventedModel, simulatedLines } from './fitTestData';

function ok(o: FitOutcome): FitResult {
  if (!o.ok) throw new Error(o.error.message);
  return o.result;
}

/**
 * (AᵀWA)⁻¹ of the linear model ν = origin + B′J′(J′+1) − B″J″(J″+1) (a linear molecule's
 * parallel band with D fixed at 0), computed independently with ml-matrix.
 * Ref: Bevington & Robinson, Data Reduction and Error Analysis, 3rd ed. (2003), ch. 7 (the
 * covariance of a linear least-squares fit is the inverse of the curvature matrix AᵀWA when the
 * σ_i are the true uncertainties), from memory.
 */
function unscaledCovariance(lines: readonly FitLineInput[]): Matrix {
  const a = new Matrix(lines.map((l) => [1, l.jUpper * (l.jUpper + 1), -l.jLower * (l.jLower + 1)].map((v) => v / l.uncertaintyCm1)));
  return inverse(a.transpose().mmul(a));
}

describe('fitResultBuild: σ is never scaled down by σ_w below 1', () => {
  const truth = inventedModel('linear', 'parallel', { lower: { DJ: 0 }, upper: { DJ: 0 } });
  const floated = ['upper.origin', 'upper.B', 'lower.B'];

  it('gives the unscaled (AᵀWA)⁻¹ σ when the lines scatter far less than stated (σ_w ≈ 0.1)', () => {
    // Noise 1e-4 cm^-1, stated 1e-3 cm^-1: σ_w ≈ 0.1. The old rule shrank every σ tenfold.
    const lines = simulatedLines(truth, 40, 1e-4, 7).map((l) => ({ ...l, uncertaintyCm1: 1e-3 }));
    const r = ok(fitBand({ model: truth, floated, lines }));
    expect(r.sigmaW!).toBeLessThan(0.2);
    expect(r.covarianceScale).toBe(1);
    const c = unscaledCovariance(lines);
    // Tolerance 1e-6 relative: the same linear algebra by two routes (QR+SVD against a dense inverse).
    floated.forEach((k, j) => expect(r.parameters[k].sigma! / Math.sqrt(c.get(j, j))).toBeCloseTo(1, 6));
    // Many degrees of freedom and a tiny σ_w: the stated uncertainties may be too large, said in words.
    expect(r.warnings.join(' ')).toMatch(/may be set too large/);
    expect(r.warnings.join(' ')).toMatch(/not scaled down/);
  });

  it('scales σ up by σ_w when the lines scatter more than stated (σ_w ≈ 3)', () => {
    const lines = simulatedLines(truth, 40, 3e-3, 8).map((l) => ({ ...l, uncertaintyCm1: 1e-3 }));
    const r = ok(fitBand({ model: truth, floated, lines }));
    expect(r.sigmaW!).toBeGreaterThan(1.5);
    expect(r.covarianceScale).toBeCloseTo(r.sigmaW! ** 2, 12);
    const c = unscaledCovariance(lines);
    floated.forEach((k, j) => expect(r.parameters[k].sigma! / (r.sigmaW! * Math.sqrt(c.get(j, j)))).toBeCloseTo(1, 6));
  });

  it('reports the degrees of freedom and, with one, warns that σ means little without blaming the uncertainties', () => {
    // 4 lines, 3 constants: ν = 1. σ_w from one degree of freedom has a relative standard error
    // of 1/√(2ν) ≈ 71 % (Bevington & Robinson 2003 sec. 11.1, variance of χ² is 2ν; from memory).
    const lines = simulatedLines(truth, 4, 1e-4, 9).map((l) => ({ ...l, uncertaintyCm1: 1e-3 }));
    const r = ok(fitBand({ model: truth, floated, lines }));
    expect(r.degreesOfFreedom).toBe(1);
    const text = r.warnings.join(' ');
    expect(text).toMatch(/Only 1 degree of freedom/);
    expect(text).toMatch(/71 %/);
    expect(text).not.toMatch(/set too large/);
    expect(FIT_FEW_DOF).toBeGreaterThan(1);
  });

  it('gives no degrees-of-freedom warning with plenty of lines and σ_w near 1', () => {
    const lines = simulatedLines(truth, 40, 1e-3, 10);
    const r = ok(fitBand({ model: truth, floated, lines }));
    expect(r.degreesOfFreedom).toBe(37);
    expect(r.warnings).toEqual([]);
  });
});
