import { describe, expect, it } from 'vitest';
import { bandShapeClassify } from '../../src/analysis/bandShapeClassify';
import { traceGenerate, type TraceSpec } from '../fit/contourTraces';

// Truth: the generator's lower-state B. Its traces are summed line by line through the closed-form
// (boxcar, triangular) or quadrature (Happ–Genzel, Norton–Beer) instrument line shapes (Griffiths & de
// Haseth, Fourier Transform Infrared Spectrometry, 2nd ed. (2007) ch. 2) in the weak-absorption
// limit, written apart from src/physics/instrumentSpectrum; the upper state is not rigid (B′ = 0.997 B″,
// U′ = 0.996 U″, the generator's defaults), which shades every Q branch as in a real band.
const cases: TraceSpec[] = [
  {
    shape: 'prolate',
    band: 'perpendicular',
    B: 0.27,
    unique: 1.43,
    zeta: 0.06,
    temperatureK: 300,
    opdCm: 1.5,
    apodization: 'norton-beer-strong',
    origin: 1500,
    noiseRel: 0.005,
    seed: 11,
  },
  {
    shape: 'prolate',
    band: 'perpendicular',
    B: 0.115,
    unique: 1.1,
    zeta: 0.3,
    temperatureK: 180,
    opdCm: 2.5,
    apodization: 'boxcar',
    origin: 1100,
    noiseRel: 0.01,
    seed: 12,
  },
  {
    shape: 'prolate',
    band: 'perpendicular',
    B: 0.045,
    unique: 0.77,
    zeta: -0.2,
    temperatureK: 250,
    opdCm: 3.5,
    apodization: 'happ-genzel',
    origin: 900,
    noiseRel: 0.005,
    seed: 13,
  },
];

// Prolate tops only: an oblate top's Q-branch spacing 2[C(1−ζ) − B] is under 2B, its Q branches
// interleave with J lines, and bandShapeClassify reads the generated oblate bands tried here as PQR
// (bench:contour classify: no oblate Q-series reaches the contour fit).
describe('bandShapeClassify with the instrument (Q-series contour fit, qSeriesContourB)', () => {
  it('gives B within 10 % of the truth, inside B ± 2σ, on non-rigid generated bands of known B, T, A and ζ; never a determined B off by more', () => {
    for (const spec of cases) {
      const c = traceGenerate(spec);
      const r = bandShapeClassify(c.x, c.noisy, c.fromCm1, c.toCm1, {
        temperatureK: spec.temperatureK,
        opdCm: spec.opdCm,
        apodization: spec.apodization,
      });
      const label = `${spec.shape} B ${spec.B} T ${spec.temperatureK} L ${spec.opdCm}: ${r.evidence}`;
      expect(r.profile, label).toBe('Q-series');
      expect(r.qSeriesContour, label).toBeDefined();
      const k = r.qSeriesContour!;
      // The generator's band is the contour model's (with B′ ≠ B″, U′ ≠ U″): the fit leaves the noise.
      expect(k.rmsOverNoise, label).toBeLessThan(1.2);
      expect(k.determined, label).toBe(true);
      expect(r.bDetermined, label).toBe(true);
      expect(r.B, label).not.toBeNull();
      expect(Math.abs(r.B! / spec.B - 1), label).toBeLessThan(0.1);
      expect(spec.B, label).toBeGreaterThanOrEqual(r.bLow!);
      expect(spec.B, label).toBeLessThanOrEqual(r.bHigh!);
    }
  }, 600_000);

  it('does not call B determined when the residuals are not white (noise smoothed over 5 points: correlated), saying why', () => {
    const c = traceGenerate({ ...cases[0], noiseRel: 0.02 });
    // The same noise passed through a 5-point moving average (×√5 to keep its σ): neighbours correlate.
    const noise = c.noisy.map((v, i) => v - c.truth[i]);
    const smoothed = c.truth.map((v, i) => {
      let s = 0;
      let k = 0;
      for (let j = Math.max(0, i - 2); j <= Math.min(noise.length - 1, i + 2); j++, k++) s += noise[j];
      return v + (s / k) * Math.sqrt(5);
    });
    const r = bandShapeClassify(c.x, smoothed, c.fromCm1, c.toCm1, {
      temperatureK: cases[0].temperatureK,
      opdCm: cases[0].opdCm,
      apodization: cases[0].apodization,
    });
    expect(r.qSeriesContour).toBeDefined();
    expect(r.qSeriesContour!.determined).toBe(false);
    expect(r.qSeriesContour!.whyNot).toMatch(/residuals keep structure/);
    expect(r.bDetermined === true).toBe(false);
  }, 600_000);

  it('without opd runs no contour fit and gives the same reading as before', () => {
    const c = traceGenerate(cases[0]);
    const r = bandShapeClassify(c.x, c.noisy, c.fromCm1, c.toCm1, { temperatureK: cases[0].temperatureK });
    expect(r.qSeriesContour).toBeUndefined();
    expect(r.profile).toBe('Q-series');
    expect(r.B).toBeNull();
  });

  it('refuses an opd that is not a positive number, saying so', () => {
    const c = traceGenerate(cases[0]);
    expect(() => bandShapeClassify(c.x, c.noisy, c.fromCm1, c.toCm1, { opdCm: 0 })).toThrow(/opd must be > 0 cm, got 0/);
  });
});
