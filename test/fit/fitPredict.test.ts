import { describe, expect, it } from 'vitest';
import { Matrix } from 'ml-matrix';
import { bandLineGradient } from '../../src/fit/bandDesign';
import { fitBand } from '../../src/fit/fitBand';
import { fitPredict, fitPredictLines } from '../../src/fit/fitPredict';
import type { FitResult } from '../../src/fit/fitTypes';
import { bandLines } from '../../src/physics/bandLines';
import { inventedModel, simulatedLines } from './fitTestData';

function fit(seed: number, count = 40): FitResult {
  const truth = inventedModel('linear', 'parallel');
  const o = fitBand({
    model: truth,
    floated: ['upper.origin', 'upper.B', 'upper.DJ', 'lower.B', 'lower.DJ'],
    lines: simulatedLines(truth, count, 0.001, seed),
  });
  if (!o.ok) throw new Error(o.error.message);
  return o.result;
}

describe('fitPredict', () => {
  it('predicts a fitted line at its calc value', () => {
    const r = fit(1);
    const l = r.lines[5];
    expect(fitPredict(r, l).wavenumberCm1).toBe(l.calc);
  });

  it('propagates σ² = g C gᵀ (checked with ml-matrix products)', () => {
    const r = fit(2);
    const q = { jUpper: 41, kUpper: 0, jLower: 40, kLower: 0 };
    const g = new Matrix([[...bandLineGradient(r.model, r.floated, q)]]);
    const expected = Math.sqrt(g.mmul(new Matrix(r.covariance)).mmul(g.transpose()).get(0, 0));
    expect(fitPredict(r, q).sigmaCm1 / expected).toBeCloseTo(1, 12);
  });

  it('gives a σ that matches the scatter of an extrapolated line over 200 noise draws', () => {
    // Monte Carlo check of the covariance propagation: the 40 strongest lines reach J ≈ 25; R(40)
    // is an extrapolation. Sample sd of 200 draws has relative standard error ≈ 5%; tolerance 15%.
    const q = { jUpper: 41, kUpper: 0, jLower: 40, kLower: 0 };
    const preds: number[] = [];
    let sigma = 0;
    for (let seed = 1; seed <= 200; seed++) {
      const r = fit(500 + seed);
      const p = fitPredict(r, q);
      preds.push(p.wavenumberCm1);
      // Unscaled σ (the covariance is scaled by σ_w² only when σ_w > 1; see fitResultBuild).
      sigma += p.sigmaCm1 / Math.max(1, r.sigmaW!) / 200;
    }
    const mean = preds.reduce((s, v) => s + v, 0) / preds.length;
    const sd = Math.sqrt(preds.reduce((s, v) => s + (v - mean) ** 2, 0) / (preds.length - 1));
    expect(sd / sigma).toBeGreaterThan(0.85);
    expect(sd / sigma).toBeLessThan(1.15);
  });

  it('gives NaN σ when the fit was exactly determined', () => {
    const truth = inventedModel('linear', 'parallel');
    const o = fitBand({ model: truth, floated: ['upper.origin', 'upper.B', 'lower.B'], lines: simulatedLines(truth, 3, 0.001, 1) });
    if (!o.ok) throw new Error(o.error.message);
    expect(fitPredict(o.result, { jUpper: 5, kUpper: 0, jLower: 4, kLower: 0 }).sigmaCm1).toBeNaN();
  });
});

describe('fitPredictLines', () => {
  it('equals fitPredict line by line over a whole line list', () => {
    const r = fit(3);
    const list = bandLines(r.model);
    const batch = fitPredictLines(r, list);
    for (let i = 0; i < list.count; i += 7) {
      const one = fitPredict(r, { jUpper: list.jUpper[i], kUpper: list.kUpper[i], jLower: list.jLower[i], kLower: list.kLower[i] });
      expect(batch.wavenumberCm1[i]).toBe(one.wavenumberCm1);
      expect(batch.sigmaCm1[i]).toBe(one.sigmaCm1);
    }
  });
});
