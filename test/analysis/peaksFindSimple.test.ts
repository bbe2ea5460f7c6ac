import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { peaksFindSimple } from '../../src/analysis/peaksFindSimple';
import { axisUniform, syntheticAbsorbance } from './syntheticTrace';

describe('peaksFindSimple', () => {
  it('returns no peaks for empty, one-point, two-point and flat traces', () => {
    for (const n of [0, 1, 2, 50]) {
      const r = peaksFindSimple(axisUniform(0, 1, Math.max(n, 2)).subarray(0, n), new Float64Array(n).fill(1), 1, 5);
      expect(r.count).toBe(0);
      expect(r.positionCm1.length).toBe(0);
    }
  });

  it('rejects a negative or NaN noise sigma and NaN data, naming them', () => {
    const x = axisUniform(0, 1, 5);
    const y = Float64Array.of(0, 1, 2, 1, 0);
    expect(() => peaksFindSimple(x, y, -1, 5)).toThrow(/noiseSigma must be .* got -1/);
    expect(() => peaksFindSimple(x, y, NaN, 5)).toThrow(/noiseSigma/);
    expect(() => peaksFindSimple(x, y, 1, -2)).toThrow(/prominenceSigma/);
    expect(() => peaksFindSimple(x, Float64Array.of(0, 1, NaN, 1, 0), 1, 5)).toThrow(/absorbance\[2\]/);
  });

  it('puts the centre exactly on the vertex of a sampled parabola, on even and uneven axes', () => {
    // Three samples of y = 2 − 3 (x − 1000.123)² determine that parabola: vertex exact up to round-off
    // (x ~ 1e3, so ~1e-12 cm^-1).
    for (const x of [Float64Array.of(1000, 1000.1, 1000.2, 1000.3), Float64Array.of(1000, 1000.07, 1000.16, 1000.4)]) {
      const y = x.map((v) => 2 - 3 * (v - 1000.123) ** 2);
      const r = peaksFindSimple(x, y, 0, 0);
      expect(r.count).toBe(1);
      expect(Math.abs(r.positionCm1[0] - 1000.123)).toBeLessThan(1e-9);
      expect(Math.abs(r.height[0] - 2)).toBeLessThan(1e-9);
    }
  });

  it('keeps exactly the maxima with prominence ≥ prominenceSigma · noiseSigma', () => {
    // y = [0, 3, 1, 4, 1, 2, 0] has prominences 2, 4, 1 (see peakProminence.test.ts).
    const x = axisUniform(0, 6, 7);
    const y = Float64Array.of(0, 3, 1, 4, 1, 2, 0);
    expect(peaksFindSimple(x, y, 0.5, 2).count).toBe(3); // threshold 1: all (≥ is inclusive)
    expect(peaksFindSimple(x, y, 0.5, 3).count).toBe(2); // threshold 1.5: 2 and 4
    const strong = peaksFindSimple(x, y, 1, 3); // threshold 3: only the 4
    expect(strong.count).toBe(1);
    // Parabola through (2,1), (3,4), (4,1): vertex at 3 exactly.
    expect(strong.positionCm1[0]).toBe(3);
    expect(strong.height[0]).toBe(4);
  });

  it('gives the flat top of a plateau at its middle sample', () => {
    const x = axisUniform(0, 6, 7);
    const r = peaksFindSimple(x, Float64Array.of(0, 1, 5, 5, 5, 1, 0), 1, 1);
    expect(Array.from(r.positionCm1)).toEqual([3]);
  });

  it('finds seeded noisy Gaussian lines to within a fraction of the sample spacing', () => {
    // 3-point parabola on a Gaussian sampled at 10 points per FWHM: bias ≤ ~0.02 spacing (parabola
    // vs Gaussian top), noise scatter at SNR 200 ≈ 0.05 spacing; tolerance 0.3 spacing.
    const x = axisUniform(1000, 1010, 10001);
    const centres = [1001.2345, 1003.5, 1006.0007, 1008.75];
    const y = syntheticAbsorbance(
      x,
      centres.map((c) => ({ centreCm1: c, heightAbs: 0.2, fwhmCm1: 0.01, shape: 'gaussian' as const })),
      1e-3,
      99,
    );
    const r = peaksFindSimple(x, y, 1e-3, 20);
    expect(r.count).toBe(4);
    for (let k = 0; k < 4; k++) expect(Math.abs(r.positionCm1[k] - centres[k])).toBeLessThan(0.3 * 1e-3);
  });

  it('returns positions in ascending order, each within half a spacing of a local-maximum sample', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 3, maxLength: 100 }), (vals) => {
        const x = axisUniform(10, 20, vals.length);
        const r = peaksFindSimple(x, Float64Array.from(vals), 0.01, 1);
        for (let k = 1; k < r.count; k++) expect(r.positionCm1[k]).toBeGreaterThan(r.positionCm1[k - 1]);
        const h = x[1] - x[0];
        const maxima: number[] = [];
        for (let i = 1; i < vals.length - 1; i++) if (vals[i] > vals[i - 1] && vals[i] >= vals[i + 1]) maxima.push(x[i]);
        for (let k = 0; k < r.count; k++) {
          // The vertex of a parabola through a maximum and its lower neighbours lies within h/2 of it.
          const nearest = Math.min(...maxima.map((m) => Math.abs(m - r.positionCm1[k])));
          expect(nearest).toBeLessThanOrEqual(0.5 * h + 1e-12);
        }
      }),
      { seed: 31337, numRuns: 300 },
    );
  });
});
