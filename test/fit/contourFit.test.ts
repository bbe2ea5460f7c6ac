import { describe, expect, it } from 'vitest';
import { contourFit } from '../../src/fit/contourFit';
import { traceGenerate, type TraceSpec } from './contourTraces';

/**
 * Round trips: traces made by the independent generator of contourTraces.ts (closed-form ILS summed
 * line by line, weak-absorption limit, seeded white noise), fitted from a perturbed start.
 * Targets (issue 18): the fitted simulation within 1.5× the noise rms of the noise-free truth, the
 * origin and the determinable combinations within 4σ of the truth. Peak absorbance 2e-6 keeps the
 * lines optically thin at their Doppler width, so the weak-limit generator and the fit's physics agree.
 */
function roundTrip(spec: TraceSpec, perturb: (m: ReturnType<typeof traceGenerate>['model']) => void, float: string[]) {
  const c = traceGenerate(spec);
  const start = structuredClone(c.model);
  perturb(start);
  const r = contourFit({
    model: start,
    wavenumberCm1: c.x,
    absorbance: c.noisy,
    fromCm1: c.fromCm1,
    toCm1: c.toCm1,
    opdCm: c.opdCm,
    apodization: c.apodization,
    massAmu: c.massAmu,
    float,
  });
  let s2 = 0;
  for (let i = 0; i < r.x.length; i++) s2 += (r.simulation[i] - c.truth[i]) ** 2;
  return { c, r, simVsTruth: Math.sqrt(s2 / r.x.length) };
}

describe('contourFit', () => {
  it('refuses an empty region and unknown float keys with messages naming them', () => {
    const c = traceGenerate({
      shape: 'linear',
      band: 'parallel',
      B: 1,
      temperatureK: 296,
      opdCm: 1,
      apodization: 'boxcar',
      origin: 2000,
      noiseRel: 0.01,
      seed: 1,
      peakAbsorbance: 2e-6,
    });
    const base = { model: c.model, wavenumberCm1: c.x, absorbance: c.noisy, opdCm: 1, massAmu: 40 };
    expect(() => contourFit({ ...base, fromCm1: 10, toCm1: 5 })).toThrow(/to > from/);
    expect(() => contourFit({ ...base, fromCm1: 10, toCm1: 11 })).toThrow(/holds 0 trace points/);
    expect(() => contourFit({ ...base, fromCm1: c.fromCm1, toCm1: c.toCm1, float: ['upper.A'] })).toThrow(/cannot float 'upper.A'/);
  });

  it('recovers a heavy prolate perpendicular band: A′(1 − ζ) − B′ and the origin within 4σ', () => {
    // Invented constants of a heavy prolate top (B = 0.25, A = 5.1 cm^-1, ζ = 0.25) at L = 1 cm.
    const { c, r, simVsTruth } = roundTrip(
      {
        shape: 'prolate',
        band: 'perpendicular',
        B: 0.25,
        unique: 5.1,
        zeta: 0.25,
        temperatureK: 296,
        opdCm: 1,
        apodization: 'triangular',
        origin: 1250,
        noiseRel: 0.01,
        seed: 3,
        peakAbsorbance: 2e-6,
      },
      (m) => {
        m.upper.origin += 0.05;
        m.upper.B *= 1.01;
        m.lower.B *= 1.01;
        m.upper.A *= 1.002;
        m.upper.zeta += 0.003;
      },
      ['upper.origin', 'upper.B', 'lower.B', 'upper.A', 'upper.zeta', 'scale'],
    );
    expect(simVsTruth).toBeLessThan(1.5 * c.noiseSigma);
    const up = c.model.upper;
    const q = r.combinations["A'(1-zeta)-B'"];
    expect(Math.abs(q.value - (up.A * (1 - up.zeta) - up.B))).toBeLessThan(4 * q.sigma);
    expect(Math.abs(r.parameters['upper.origin'].value - up.origin)).toBeLessThan(4 * r.parameters['upper.origin'].sigma);
    // B″ is not resolved here (2B = 1/(2L)): the warning says it rests on the envelope and T.
    expect(r.warnings.join(' ')).toMatch(/not resolved/);
    expect(r.parameters['lower.A']).toEqual({ value: 5.1, sigma: 0, fixed: true });
  });

  it('recovers a light linear Σ–Σ band with resolved lines: B″ and the origin within 4σ', () => {
    const { c, r, simVsTruth } = roundTrip(
      {
        shape: 'linear',
        band: 'parallel',
        B: 1.2,
        temperatureK: 250,
        opdCm: 2,
        apodization: 'boxcar',
        origin: 2100,
        noiseRel: 0.005,
        seed: 11,
        peakAbsorbance: 2e-6,
      },
      (m) => {
        m.upper.origin -= 0.1;
        m.upper.B *= 0.998;
        m.lower.B *= 0.998;
      },
      ['upper.origin', 'upper.B', 'lower.B', 'scale'],
    );
    expect(simVsTruth).toBeLessThan(1.5 * c.noiseSigma);
    for (const key of ['upper.origin', 'lower.B', 'upper.B'] as const) {
      const p = r.parameters[key];
      const truth = key === 'upper.origin' ? c.model.upper.origin : key === 'lower.B' ? c.model.lower.B : c.model.upper.B;
      expect(Math.abs(p.value - truth)).toBeLessThan(4 * p.sigma);
    }
  });

  it('names the combination when A″, A′ and ζ are all floated in a perpendicular band', () => {
    const { r } = roundTrip(
      {
        shape: 'prolate',
        band: 'perpendicular',
        B: 0.4,
        unique: 3,
        zeta: 0.1,
        temperatureK: 200,
        opdCm: 2,
        apodization: 'boxcar',
        origin: 900,
        noiseRel: 0.01,
        seed: 5,
        peakAbsorbance: 2e-6,
      },
      () => {},
      ['upper.origin', 'upper.A', 'lower.A', 'upper.zeta', 'scale'],
    );
    // Herzberg II (1945) ch. IV: one perpendicular band fixes A′(1 − ζ) and A′ − A″, not A″, A′ and ζ
    // apart; only the Boltzmann factor of K″ carries (weak) information on A″ itself.
    const text = r.warnings.join(' ');
    expect(text).toMatch(/correlated|under-determined/);
    expect(text).toMatch(/A′\(1 − ζ\)/);
    expect(r.combinations["A'(1-zeta)"].sigma).toBeLessThan(0.01);
  });
});
