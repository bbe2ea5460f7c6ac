import { describe, expect, it } from 'vitest';
import { GAUSSIAN_FWHM_PER_SIGMA, gaussianFit } from '../../src/analysis/gaussianFit';
import { axisUniform, randomNormal, randomSeeded } from './syntheticTrace';

function gaussian(x: Float64Array, amp: number, mu: number, s: number): Float64Array {
  return x.map((v) => amp * Math.exp(-((v - mu) ** 2) / (2 * s * s)));
}

describe('gaussianFit', () => {
  it('uses 2√(2 ln 2) as FWHM per standard width', () => {
    // Ref: exp(−t²/2) = 1/2 at t = √(2 ln 2), so FWHM/s = 2√(2 ln 2) = 2.354820045 (from memory); 9 digits.
    expect(GAUSSIAN_FWHM_PER_SIGMA).toBeCloseTo(2.354820045, 9);
  });

  it('recovers a noiseless Gaussian from three samples exactly (the log-parabola case)', () => {
    // Three samples determine amplitude, centre and width: tolerance is round-off (1e-9 relative).
    const x = Float64Array.of(1500.0, 1500.004, 1500.008);
    const d = gaussian(x, 0.7, 1500.0051, 0.0031);
    const fit = gaussianFit(x, d, 0, 2, { amplitude: 0.6, centreCm1: 1500.004, sigmaWidthCm1: 0.004 }, 0);
    expect(fit.isConverged).toBe(true);
    expect(Math.abs(fit.centreCm1 - 1500.0051)).toBeLessThan(1e-9);
    expect(fit.amplitude / 0.7 - 1).toBeLessThan(1e-9);
    expect(Math.abs(fit.sigmaWidthCm1 / 0.0031 - 1)).toBeLessThan(1e-8);
    expect(fit.centreSigmaCm1).toBeNaN(); // no noise σ given
  });

  it('reports a centre σ that matches the Monte Carlo scatter', () => {
    // 400 seeded noise draws on 9 samples of a Gaussian at SNR 30. The sample sd of 400 draws has a
    // relative standard error ≈ 1/√(2·399) = 3.5 %; tolerance 12 % (≈ 3.4 standard errors).
    const x = axisUniform(2000, 2000.016, 9);
    const truth = gaussian(x, 30, 2000.0083, 0.004);
    const rand = randomSeeded(123);
    const errs: number[] = [];
    let reported = 0;
    for (let t = 0; t < 400; t++) {
      const d = truth.map((v) => v + randomNormal(rand));
      const fit = gaussianFit(x, d, 0, 8, { amplitude: 28, centreCm1: 2000.008, sigmaWidthCm1: 0.005 }, 1);
      errs.push(fit.centreCm1 - 2000.0083);
      reported += fit.centreSigmaCm1 / 400;
    }
    const mean = errs.reduce((s, v) => s + v, 0) / errs.length;
    const sd = Math.sqrt(errs.reduce((s, v) => s + (v - mean) ** 2, 0) / (errs.length - 1));
    expect(sd / reported).toBeGreaterThan(0.88);
    expect(sd / reported).toBeLessThan(1.12);
    // Unbiased: |mean| within 3 standard errors of the mean.
    expect(Math.abs(mean)).toBeLessThan((3 * sd) / Math.sqrt(errs.length));
  });
});
