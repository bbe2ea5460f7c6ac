import { describe, expect, it } from 'vitest';
import { bandEnvelopeQSeriesFit, smoothExtendedBoxes } from '../../src/analysis/bandEnvelopeQSeriesFit';
import { noiseSigmaEstimate } from '../../src/analysis/noiseSigmaEstimate';
import { traceGenerate, type TraceSpec } from '../fit/contourTraces';

describe('smoothExtendedBoxes', () => {
  it('keeps the area of a spike and spreads it with variance exactly σ², also between whole box radii (Gwosdek et al. 2011)', () => {
    for (const sigma of [0.7, 1, 1.3, 2.2, 5.5]) {
      const y = new Float64Array(201);
      y[100] = 1;
      const s = smoothExtendedBoxes(y, sigma);
      let area = 0;
      let m2 = 0;
      for (let i = 0; i < s.length; i++) {
        area += s[i];
        m2 += s[i] * (i - 100) ** 2;
      }
      expect(area).toBeCloseTo(1, 12);
      expect(m2, `σ ${sigma}`).toBeCloseTo(sigma * sigma, 9);
    }
  });
});

/** The region with a baseline through its end medians removed (as bandShapeClassify does). */
function region(spec: TraceSpec) {
  const c = traceGenerate(spec);
  const n = c.x.length;
  const edge = Math.max(3, Math.floor(0.04 * n));
  const med = (v: Float64Array) => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)];
  const l = med(c.noisy.subarray(0, edge));
  const r = med(c.noisy.subarray(n - edge));
  const y = c.noisy.map((v, i) => v - (l + ((r - l) * i) / (n - 1)));
  return { c, x: c.x, y, sigma: noiseSigmaEstimate(c.x, y) };
}

describe('bandEnvelopeQSeriesFit', () => {
  // Truth: the generator's B, A (C) and ζ. Its traces are summed line by line through the closed-form
  // or quadrature instrument line shapes (Griffiths & de Haseth (2007) ch. 2), here rigid (B′ = B″,
  // A′ = A″) as the fit's model. The comb's spacing 2[A(1−ζ) − B] and the RQ0 branch at
  // ν0 + A(1 − 2ζ) − B (Herzberg II (1945) ch. IV) are given as the trace's comb would give them.
  const cases: (Partial<TraceSpec> & { shape: 'prolate' | 'oblate' })[] = [
    { shape: 'prolate', B: 0.49, unique: 2.3, zeta: 0.29, temperatureK: 311, opdCm: 0.98, apodization: 'norton-beer-medium' },
    { shape: 'prolate', B: 0.79, unique: 4.67, zeta: 0.62, temperatureK: 224, opdCm: 1.41, apodization: 'boxcar' },
    { shape: 'prolate', B: 0.27, unique: 1.43, zeta: 0.06, temperatureK: 315, opdCm: 1.49, apodization: 'norton-beer-strong' },
    { shape: 'oblate', B: 0.8, unique: 0.56, zeta: 0.2, temperatureK: 200, opdCm: 2, apodization: 'triangular' },
  ];
  it('recovers B within 5 % (inside its range widened to ±5 %) and A − B (C − B) within 15 % from rigid bands of known B, A, ζ, T', () => {
    for (const k of cases) {
      const spec: TraceSpec = {
        band: 'perpendicular',
        B: 0,
        temperatureK: 296,
        opdCm: 1,
        apodization: 'boxcar',
        origin: 1500,
        noiseRel: 0.005,
        seed: 11,
        deltaBRel: 0,
        deltaURel: 0,
        ...k,
      };
      const { c, x, y, sigma } = region(spec);
      const u = c.model.upper;
      const U = spec.shape === 'prolate' ? u.A : u.C;
      const q = 2 * (U * (1 - u.zeta) - u.B);
      const fit = bandEnvelopeQSeriesFit({
        x,
        y,
        temperatureK: spec.temperatureK,
        qSpacingCm1: q,
        combAnchorCm1: u.origin + U * (1 - 2 * u.zeta) - u.B,
        noiseSigma: sigma,
      })!;
      const label = `${spec.shape} B ${spec.B}`;
      expect(Math.abs(fit.B / spec.B - 1), label).toBeLessThan(0.05);
      // bandShapeClassify widens the range by at least ±5 % (the rigid model's own error): the truth
      // lies inside that (the bare range missed B = 0.79 by 0.8 % when written).
      expect(spec.B, label).toBeGreaterThanOrEqual(Math.min(fit.bLow, 0.95 * fit.B));
      expect(spec.B, label).toBeLessThanOrEqual(Math.max(fit.bHigh, 1.05 * fit.B));
      expect(Math.abs(fit.uniqueMinusB / (spec.unique! - spec.B) - 1), label).toBeLessThan(0.15);
      expect(fit.shapesFitting, label).toContain(spec.shape);
    }
  }, 60_000);

  it('returns null for a spacing of zero', () => {
    const { x, y, sigma } = region({
      ...cases[0],
      band: 'perpendicular',
      B: 0.49,
      temperatureK: 296,
      opdCm: 1,
      apodization: 'boxcar',
      origin: 1500,
      noiseRel: 0.01,
      seed: 3,
    } as TraceSpec);
    expect(bandEnvelopeQSeriesFit({ x, y, temperatureK: 296, qSpacingCm1: 0, combAnchorCm1: 1500, noiseSigma: sigma })).toBeNull();
  });
});
