import { describe, expect, it } from 'vitest';
import { Matrix, solve } from 'ml-matrix';
import { baselineEstimate, whittakerSolve } from '../../src/analysis/baselineEstimate';
import { axisUniform, randomSeeded, syntheticAbsorbance, type SyntheticLine } from './syntheticTrace';

describe('whittakerSolve', () => {
  it('matches a dense solve of (W + λ DᵀD) z = W y by ml-matrix', () => {
    // Ref: Eilers, Anal. Chem. 75, 3631 (2003), eq. 6; dense LU from ml-matrix as the outside check.
    // Tolerance 1e-9 relative: condition number of the system ≲ 1e5 here, round-off ~1e-16 each.
    const n = 40;
    const rand = randomSeeded(4);
    const y = Float64Array.from({ length: n }, () => rand());
    const w = Float64Array.from({ length: n }, () => (rand() < 0.3 ? 0.01 : 0.99));
    for (const lambda of [0, 0.5, 100, 1e4]) {
      const d = new Matrix(n - 2, n);
      for (let i = 0; i < n - 2; i++) {
        d.set(i, i, 1);
        d.set(i, i + 1, -2);
        d.set(i, i + 2, 1);
      }
      const a = d.transpose().mmul(d).mul(lambda);
      for (let i = 0; i < n; i++) a.set(i, i, a.get(i, i) + w[i]);
      const b = Matrix.columnVector(Array.from(y, (v, i) => v * w[i]));
      const dense = solve(a, b).getColumn(0);
      const banded = whittakerSolve(y, w, lambda, new Float64Array(n));
      for (let i = 0; i < n; i++) expect(Math.abs(banded[i] - dense[i])).toBeLessThan(1e-9 * (1 + Math.abs(dense[i])));
    }
  });

  it('returns any straight line unchanged (the null space of the second-difference penalty)', () => {
    // Eilers (2003), §"Properties": the penalty vanishes for linear z, so a linear y is a fixed point.
    const n = 30;
    const y = Float64Array.from({ length: n }, (_, i) => 0.3 - 0.01 * i);
    const w = new Float64Array(n).fill(1);
    const z = whittakerSolve(y, w, 1e6, new Float64Array(n));
    for (let i = 0; i < n; i++) expect(Math.abs(z[i] - y[i])).toBeLessThan(1e-9);
  });
});

describe('baselineEstimate', () => {
  it('returns a copy for fewer than 3 points and zeros for an empty trace', () => {
    expect(baselineEstimate({ wavenumberCm1: new Float64Array(0), absorbance: new Float64Array(0) }).length).toBe(0);
    const two = baselineEstimate({ wavenumberCm1: Float64Array.of(1, 2), absorbance: Float64Array.of(0.1, 0.2) });
    expect(Array.from(two)).toEqual([0.1, 0.2]);
  });

  it('rejects bad options, naming them', () => {
    const t = { wavenumberCm1: axisUniform(0, 1, 10), absorbance: new Float64Array(10) };
    expect(() => baselineEstimate(t, { asymmetry: 0.7 })).toThrow(/asymmetry must be in \(0, 0.5\), got 0.7/);
    expect(() => baselineEstimate(t, { scaleCm1: -1 })).toThrow(/scaleCm1/);
    expect(() => baselineEstimate(t, { maxIterations: 0 })).toThrow(/maxIterations/);
  });

  it('follows a curved baseline under narrow lines and ignores the lines', () => {
    // Quadratic + slow sine baseline, 60 Gaussian lines of FWHM 0.05 cm^-1 up to 0.5 absorbance,
    // noise σ = 2e-3. Between the lines the ALS baseline should sit within a fraction of σ of the
    // truth; it sits a little below the noise midline, since samples above it weigh only p = 0.01
    // (the asymmetry of Eilers & Boelens 2005). Measured 0.8σ worst, 0.45σ rms; tolerance 2σ and 1σ.
    const x = axisUniform(1000, 1100, 20001);
    const truth = (v: number) => 0.1 + 2e-5 * (v - 1050) ** 2 + 0.02 * Math.sin((v - 1000) / 15);
    const rand = randomSeeded(21);
    const lines: SyntheticLine[] = [];
    for (let k = 0; k < 60; k++) {
      lines.push({ centreCm1: 1002 + 96 * rand(), heightAbs: 0.05 + 0.45 * rand(), fwhmCm1: 0.05, shape: 'gaussian' });
    }
    const y = syntheticAbsorbance(x, lines, 2e-3, 8, truth);
    const z = baselineEstimate({ wavenumberCm1: x, absorbance: y }, { scaleCm1: 5 });
    let worst = 0;
    let sumSq = 0;
    let count = 0;
    for (let i = 0; i < x.length; i++) {
      if (x[i] < 1002 || x[i] > 1098) continue; // the ends of a smoother are less constrained
      if (lines.some((l) => Math.abs(x[i] - l.centreCm1) < 0.2)) continue;
      const e = z[i] - truth(x[i]);
      worst = Math.max(worst, Math.abs(e));
      sumSq += e * e;
      count++;
    }
    console.log(`baseline curved: worst ${(worst / 2e-3).toFixed(2)} σ, rms ${(Math.sqrt(sumSq / count) / 2e-3).toFixed(2)} σ`);
    expect(worst).toBeLessThan(2 * 2e-3);
    expect(Math.sqrt(sumSq / count)).toBeLessThan(1 * 2e-3);
  });

  it('keeps a million-point trace bounded by binning, with the same accuracy', () => {
    // 1e6 points are averaged into bins (here 4000, 200 per default scale of 5 cm^-1); bin means have
    // σ/√250, so the interpolated baseline is far closer than σ. Measured 0.03σ rms; tolerance 0.3σ.
    const x = axisUniform(1000, 1100, 1_000_001);
    const truth = (v: number) => 0.05 + 1e-3 * (v - 1000);
    const lines: SyntheticLine[] = [];
    for (let c = 1003; c < 1098; c += 2.5) lines.push({ centreCm1: c, heightAbs: 0.3, fwhmCm1: 0.02, shape: 'gaussian' });
    const y = new Float64Array(x.length);
    const rand = randomSeeded(2);
    for (let i = 0; i < x.length; i++) {
      let v = truth(x[i]);
      const k = Math.round((x[i] - 1003) / 2.5);
      if (k >= 0 && k < lines.length) v += 0.3 * Math.exp(-4 * Math.LN2 * ((x[i] - lines[k].centreCm1) / 0.02) ** 2);
      y[i] = v + 2e-3 * Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());
    }
    const z = baselineEstimate({ wavenumberCm1: x, absorbance: y });
    expect(z.length).toBe(x.length);
    let sumSq = 0;
    let count = 0;
    for (let i = 0; i < x.length; i += 7) {
      if (x[i] < 1002 || x[i] > 1098) continue;
      if (Math.abs(((x[i] - 1003 + 1.25) % 2.5) - 1.25) < 0.1) continue;
      sumSq += (z[i] - truth(x[i])) ** 2;
      count++;
    }
    console.log(`baseline 1e6 points: rms ${(Math.sqrt(sumSq / count) / 2e-3).toFixed(2)} σ`);
    expect(Math.sqrt(sumSq / count)).toBeLessThan(0.3 * 2e-3);
  });
});
