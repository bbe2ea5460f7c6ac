import { describe, expect, it } from 'vitest';
import { assistantPeakContext } from '../../src/analysis/assistantPeakContext';
import {
  assistantCatalogue,
  assistantOverlapShift,
  assistantPairSigma,
  assistantStudentFactor,
  type AssistantCatalogue,
} from '../../src/analysis/assistantPredict';
import type { PeakList } from '../../src/analysis/peaksFind';
import { fitBand } from '../../src/fit/fitBand';
import { fitPredictLines } from '../../src/fit/fitPredict';
import { bandLines } from '../../src/physics/bandLines';
import type { LineList } from '../../src/physics/model';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';
import { transitionWavenumber } from '../../src/physics/termValues';
import { randomNormal, randomSeeded } from './syntheticTrace';

describe('assistantStudentFactor', () => {
  it('is t_0.975(ν)/1.96 from the Student table', () => {
    // Ref: Abramowitz & Stegun (1964) Table 26.10, t_0.975 for ν = 1, 5, 10, 30 (3 decimals; tol 1e-3).
    expect(assistantStudentFactor(1) * 1.96).toBeCloseTo(12.706, 3);
    expect(assistantStudentFactor(5) * 1.96).toBeCloseTo(2.571, 3);
    expect(assistantStudentFactor(10) * 1.96).toBeCloseTo(2.228, 3);
    expect(assistantStudentFactor(30) * 1.96).toBeCloseTo(2.042, 3);
  });

  it('goes to 1 for many degrees of freedom and continues smoothly past the table', () => {
    // A&S 26.7.5 first term: t ≈ z(1 + (z² + 1)/(4ν)); at ν = 31 within 0.5 % of the table trend (t_0.975(40) = 2.021).
    expect(Math.abs(assistantStudentFactor(31) - assistantStudentFactor(30))).toBeLessThan(0.01);
    expect(assistantStudentFactor(40) * 1.96).toBeCloseTo(2.021, 1);
    expect(assistantStudentFactor(1e6)).toBeCloseTo(1, 5);
  });
});

/** A catalogue of hand-placed lines (positions, intensities), for the overlap estimate. */
function handCatalogue(positions: number[], intensities: number[]): AssistantCatalogue {
  const n = positions.length;
  const lines: LineList = {
    count: n,
    jUpper: Int32Array.from({ length: n }, (_, i) => i + 1),
    kUpper: new Int32Array(n),
    jLower: Int32Array.from({ length: n }, (_, i) => i),
    kLower: new Int32Array(n),
    deltaK: new Int8Array(n),
    deltaJ: new Int8Array(n).fill(1),
    wavenumberCm1: Float64Array.from(positions),
    intensity: Float64Array.from(intensities),
    eLowerCm1: new Float64Array(n),
    honlLondon: new Float64Array(n).fill(1),
  };
  const order = Int32Array.from({ length: n }, (_, i) => i).sort((a, b) => positions[a] - positions[b]);
  return {
    lines,
    predictedCm1: Float64Array.from(positions),
    predictionSigmaCm1: new Float64Array(n),
    toleranceSigmaCm1: new Float64Array(n).fill(1e-3),
    order,
    indexOf: new Map(),
  };
}

/** Position of the maximum of Σ I_j / (1 + 4(x − ν_j)²/w²) nearest to x0, on a grid of w/20000 (brute force). */
function bruteMaximum(positions: number[], intensities: number[], x0: number, w: number): number {
  const f = (x: number) => positions.reduce((s, p, j) => s + intensities[j] / (1 + (4 * (x - p) ** 2) / (w * w)), 0);
  let x = x0;
  const h = w / 20000;
  for (;;) {
    if (f(x + h) > f(x)) x += h;
    else if (f(x - h) > f(x)) x -= h;
    else return x;
  }
}

describe('assistantOverlapShift', () => {
  it('is 0 for an isolated line and for a symmetric pair of neighbours', () => {
    expect(assistantOverlapShift(handCatalogue([100], [1]), 0, 0.01).shiftCm1).toBe(0);
    const sym = handCatalogue([99.985, 100, 100.015], [0.5, 1, 0.5]);
    expect(Math.abs(assistantOverlapShift(sym, 1, 0.01).shiftCm1)).toBeLessThan(1e-12);
  });

  it('matches the brute-force maximum of the Lorentzian sum', () => {
    // Tolerance 2e-3 of the FWHM: grid w/40 with a three-point parabola (the method) against w/20000.
    const w = 0.01;
    for (const [d, ratio] of [
      [0.6, 0.35],
      [1.2, 2],
      [2.5, 5],
      [0.8, 0.2],
    ]) {
      const pos = [100, 100 + d * w];
      const cat = handCatalogue(pos, [1, ratio]);
      const got = assistantOverlapShift(cat, 0, w);
      const want = bruteMaximum(pos, [1, ratio], 100, w) - 100;
      expect(Math.abs(got.shiftCm1 - want), `d=${d} ratio=${ratio}`).toBeLessThan(2e-3 * w);
      expect(got.neighbour).toBe(1);
      expect(Math.sign(got.shiftCm1)).toBe(1);
    }
  });
});

describe('assistantCatalogue', () => {
  const model: BandModel = {
    shape: 'linear',
    band: 'parallel',
    lower: stateConstantsFrom({ B: 1.2 }),
    upper: stateConstantsFrom({ origin: 1500, B: 1.19 }),
    temperatureK: 296,
    jMax: 15,
    kMax: 0,
    spinWeights: [1],
  };
  const peaks: PeakList = {
    count: 3,
    wavenumberCm1: Float64Array.from([1490, 1500.5, 1510]),
    height: Float64Array.from([1, 1, 1]),
    fwhmCm1: Float64Array.from([0.02, 0.02, 0.02]),
    snr: Float64Array.from([100, 100, 100]),
    prominence: Float64Array.from([1, 1, 1]),
    isBlend: new Uint8Array(3),
    centreSigmaCm1: Float64Array.from([1e-4, 1e-4, 1e-4]),
    noiseSigma: 0.01,
  };
  const context = assistantPeakContext(peaks);

  it('without a fit: model positions, the fallback σ and the width floor in quadrature', () => {
    const cat = assistantCatalogue({ model, fit: null, peaks, context, minIntensity: 0, widthFloorFraction: 0.1, fallbackSigmaCm1: 0.05 });
    expect(cat.lines.count).toBe(bandLines(model).count);
    for (let i = 0; i < cat.lines.count; i++) {
      expect(cat.predictedCm1[i]).toBe(cat.lines.wavenumberCm1[i]);
      expect(cat.toleranceSigmaCm1[i]).toBeCloseTo(Math.hypot(0.05, 0.1 * 0.02), 12);
    }
    expect(assistantPairSigma(3e-3, 4e-3)).toBeCloseTo(5e-3, 15);
  });

  it('with a fit: fitPredictLines σ × Student factor ⊕ residual scatter ⊕ floor', () => {
    const rand = randomSeeded(9);
    const lines = [1, 2, 3, 4, 5, 6, 7].map((j) => ({
      jUpper: j + 1,
      kUpper: 0,
      jLower: j,
      kLower: 0,
      observedCm1: transitionWavenumber(model, j + 1, 0, j, 0) + 1e-3 * randomNormal(rand),
      uncertaintyCm1: 1e-3,
    }));
    const fit = fitBand({ model, floated: ['upper.origin', 'upper.B', 'lower.B'], lines });
    expect(fit.ok).toBe(true);
    if (!fit.ok) return;
    const cat = assistantCatalogue({
      model: fit.result.model,
      fit: fit.result,
      peaks,
      context,
      minIntensity: 0,
      widthFloorFraction: 0.1,
      fallbackSigmaCm1: 0.05,
    });
    const direct = fitPredictLines(fit.result, cat.lines);
    const factor = assistantStudentFactor(7 - 3);
    const r = fit.result.lines.map((l) => Math.abs(l.obsMinusCalc)).sort((a, b) => a - b);
    const scatter = 1.4826 * r[3];
    for (let i = 0; i < cat.lines.count; i++) {
      expect(cat.predictedCm1[i]).toBe(direct.wavenumberCm1[i]);
      expect(cat.predictionSigmaCm1[i]).toBeCloseTo(factor * direct.sigmaCm1[i], 15);
      expect(cat.toleranceSigmaCm1[i]).toBeCloseTo(Math.hypot(factor * direct.sigmaCm1[i], scatter, 0.1 * 0.02), 12);
    }
  });
});
