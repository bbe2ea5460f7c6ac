import { describe, expect, it } from 'vitest';
import { assistantPeakContext } from '../../src/analysis/assistantPeakContext';
import { assistantQHeadStart } from '../../src/analysis/assistantQHeadStart';
import type { PeakList } from '../../src/analysis/peaksFind';
import type { BandModel } from '../../src/physics/model';
import { transitionWavenumber } from '../../src/physics/termValues';
import { syntheticBand, syntheticTruthModel } from './assistantSyntheticBand';

const FLOATED = ['upper.origin', 'upper.B', 'lower.B', 'upper.A', 'upper.zeta'];

/**
 * Sub-band origin ν_sub(m) = c0 + c1 m + c2 m² of a prolate top's perpendicular band, m = ΔK·K″,
 * c0 = ν0 + A′(1 − 2ζ) − B′, c1 = 2[A′(1 − ζ) − B′], c2 = (A′ − B′) − (A″ − B″): the K part of
 * E′ − E″ with K′ = K″ + ΔK and the Coriolis term ∓2A′ζK′ (Herzberg II (1945) ch. IV, from memory;
 * the algebra is redone here, independently of the code under test).
 */
function subBandOrigin(model: BandModel, m: number): number {
  const { A: au, B: bu, zeta: z, origin } = model.upper;
  const c0 = origin + au * (1 - 2 * z) - bu;
  const c1 = 2 * (au * (1 - z) - bu);
  const c2 = au - bu - (model.lower.A - model.lower.B);
  return c0 + c1 * m + c2 * m * m;
}

/**
 * The truth with its comb moved by spacing and curvature errors of a first guess (ζ off by dZeta,
 * A′ − A″ off by the fraction dA of A) and the origin moved back so that the reference sub-band ^rQ_0 (m = 0)
 * stays where it is: what a run that fitted that sub-band alone knows.
 */
function misplacedComb(truth: BandModel, dZeta: number, dA: number): BandModel {
  const upper = { ...truth.upper, A: truth.upper.A * (1 + dA), zeta: truth.upper.zeta + dZeta };
  const guess: BandModel = { ...truth, upper };
  upper.origin += subBandOrigin(truth, 0) - subBandOrigin(guess, 0);
  return guess;
}

describe('assistantQHeadStart', () => {
  const truth = syntheticTruthModel();
  const band = syntheticBand(truth, 0.002, 21);
  const tau = assistantPeakContext(band.peaks).medianFwhmCm1;

  it.each([
    [0.02, 0.003],
    [-0.025, -0.003],
    [0.012, -0.002],
  ])('puts the sub-bands back on their lines (ζ off by %f, A′ by the fraction %f) and seeds them with true labels', (dZeta, dA) => {
    const guess = misplacedComb(truth, dZeta, dA);
    // The guess is many line widths off at |m| = 3 (else the test proves nothing).
    expect(Math.abs(subBandOrigin(guess, 3) - subBandOrigin(truth, 3))).toBeGreaterThan(10 * tau);
    const r = assistantQHeadStart(guess, band.peaks, FLOATED, tau, { deltaK: 1, kLower: 0 });
    expect(r.model, r.text).not.toBeNull();
    for (let m = -3; m <= 3; m++) expect(Math.abs(subBandOrigin(r.model!, m) - subBandOrigin(truth, m))).toBeLessThan(tau / 2);
    // Seeds on several sub-bands, each within half a width of the true line with its labels.
    const subBands = new Set(r.lines.map((l) => (l.kUpper - l.kLower) * l.kLower));
    expect(subBands.size).toBeGreaterThanOrEqual(4);
    for (const l of r.lines) {
      expect(l.kLower).toBeLessThanOrEqual(3);
      const nuTrue = transitionWavenumber(truth, l.jUpper, l.kUpper, l.jLower, l.kLower);
      expect(Math.abs(l.observedCm1 - nuTrue), `${l.reason}`).toBeLessThan(band.fwhmCm1 / 2);
    }
  });

  it('refuses a trace of randomly placed peaks (no comb to find)', () => {
    const n = band.peaks.count;
    const lo = band.trace.wavenumberCm1[0];
    const hi = band.trace.wavenumberCm1[band.trace.wavenumberCm1.length - 1];
    // Same count and widths, positions spread evenly with an irrational step (deterministic).
    const x = Float64Array.from({ length: n }, (_, i) => lo + (hi - lo) * ((i * 0.6180339887) % 1)).sort();
    const peaks: PeakList = { ...band.peaks, wavenumberCm1: x };
    const r = assistantQHeadStart(misplacedComb(truth, 0.02, 0.003), peaks, FLOATED, tau, { deltaK: 1, kLower: 0 });
    expect(r.model, r.text).toBeNull();
    expect(r.lines).toHaveLength(0);
    expect(r.text).toMatch(/not clear enough/);
  });

  it('refuses when ζ is held fixed, and for a parallel band', () => {
    const guess = misplacedComb(truth, 0.02, 0.003);
    const fixed = assistantQHeadStart(guess, band.peaks, ['upper.origin', 'upper.A'], tau, { deltaK: 1, kLower: 0 });
    expect(fixed.model).toBeNull();
    expect(fixed.text).toMatch(/upper\.zeta is held fixed/);
    const parallel = assistantQHeadStart({ ...guess, band: 'parallel' }, band.peaks, FLOATED, tau, { deltaK: 0, kLower: 0 });
    expect(parallel.model).toBeNull();
    expect(parallel.text).toMatch(/perpendicular/);
  });
});
