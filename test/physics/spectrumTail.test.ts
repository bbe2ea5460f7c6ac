import { describe, expect, it } from 'vitest';
import { lineShapeVoigt, lineShapeVoigtFwhm } from '../../src/physics/lineShape';
import { spectrumTailKernel, spectrumTailPlan, spectrumTailStickWeights } from '../../src/physics/spectrumTail';

describe('spectrumTailKernel', () => {
  it('equals the Voigt profile beyond 20 FWHM to 4e-6 of the local value', () => {
    // Ref: two-term asymptotic series of w(z), A&S (1964) eq. 7.1.23; the first neglected term of
    // the real part is ~(15/4)/|z|⁴ ≤ 3.1e-6 relative at 20 FWHM (|z| ≥ 33), hence tol 4e-6.
    // Reference profile: lineShapeVoigt (Weideman).
    for (const [a, g] of [
      [1.2e-3, 2e-3],
      [1e-3, 1e-4],
      [1e-4, 1e-2],
    ]) {
      const s2 = (a * a) / (2 * Math.LN2);
      const fwhm = lineShapeVoigtFwhm(2 * g, 2 * a);
      for (const r of [20, 35, 100, 1e4]) {
        const d = r * fwhm;
        const v = lineShapeVoigt(d, a, g);
        expect(Math.abs(spectrumTailKernel(d, g, s2) / v - 1)).toBeLessThan(4e-6);
      }
    }
  });
});

describe('spectrumTailStickWeights', () => {
  it('sum to 1 and reproduce cubic moments', () => {
    // Ref: four-point Lagrange interpolation is exact for polynomials of degree ≤ 3
    // (A&S 1964 eq. 25.2.13, from memory): Σ w_j (j − f)^p = 0 for p = 1, 2, 3. tol 1e-15.
    const w = new Float64Array(4);
    for (const f of [0, 0.1, 0.5, 0.77, 0.999]) {
      spectrumTailStickWeights(f, w);
      for (let p = 0; p <= 3; p++) {
        let m = 0;
        for (let j = 0; j < 4; j++) m += w[j] * (j - 1 - f) ** p;
        expect(Math.abs(m - (p === 0 ? 1 : 0))).toBeLessThan(1e-15);
      }
    }
  });
});

describe('spectrumTailPlan', () => {
  it('gives a power of two large enough that needed offsets do not alias', () => {
    // Offsets k − m lie in (−(n + M), n + M); no aliasing needs P ≥ 2(n + M) − 1.
    for (const [n, minMargin] of [
      [1, 40],
      [1000, 1044],
      [1_000_000, 1044],
      [1_000_000, 125_000],
    ]) {
      const plan = spectrumTailPlan(n, minMargin);
      expect(plan.fftLength & (plan.fftLength - 1)).toBe(0);
      expect(plan.margin).toBeGreaterThanOrEqual(minMargin);
      expect(plan.fftLength).toBeGreaterThanOrEqual(2 * (n + plan.margin) - 1);
      expect(plan.fftLength / 2).toBeLessThan(2 * (n + minMargin) - 1);
    }
  });
});
