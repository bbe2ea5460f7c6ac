import { describe, expect, it } from 'vitest';
import { assistantPeaksUsable } from '../../src/analysis/assistantPeakContext';
import { assistantSeedFromModel } from '../../src/analysis/assistantSeedFromModel';
import type { PeakList } from '../../src/analysis/peaksFind';
import type { BandModel } from '../../src/physics/model';
import { syntheticBand, syntheticIsCorrect, syntheticTruthModel } from './assistantSyntheticBand';

const FLOATABLE = ['upper.origin', 'upper.B', 'lower.B', 'upper.A', 'upper.zeta'];

describe('assistantSeedFromModel', () => {
  const truth = syntheticTruthModel();
  const band = syntheticBand(truth, 1 / 400, 11);
  band.peaks = assistantPeaksUsable(band.peaks).peaks;

  it('picks correct seeds from the true model without shifting it', () => {
    const r = assistantSeedFromModel(truth, band.peaks, FLOATABLE);
    expect(r.warnings).toEqual([]);
    expect(r.lines.length).toBe(12);
    expect(Math.abs(r.originShiftCm1)).toBeLessThan(1e-12);
    for (const s of r.lines) {
      expect(syntheticIsCorrect(band, s, s.observedCm1)).toBe(true);
      expect(s.status).toBe('seed');
      expect(s.source).toBe('auto-seed');
      expect(s.reason).toMatch(/model-only seed: the only peak within/);
    }
  });

  it('recovers first-guess errors of origin and both B before picking seeds', () => {
    const guess: BandModel = {
      ...truth,
      lower: { ...truth.lower, B: truth.lower.B * 1.006 },
      upper: { ...truth.upper, B: truth.upper.B * 1.008, origin: truth.upper.origin + 0.3 },
    };
    const r = assistantSeedFromModel(guess, band.peaks, FLOATABLE);
    // The grid moves the farthest search line by at most one median FWHM per step, so each found
    // change is within ~10 % of the true one here (true: B′ −3.33e-3, B″ −2.51e-3, origin −0.3 cm^-1).
    expect(r.upperBShiftCm1).toBeCloseTo(truth.upper.B - guess.upper.B, 3);
    expect(Math.abs(r.upperBShiftCm1 - (truth.upper.B - guess.upper.B))).toBeLessThan(0.1 * 3.33e-3);
    expect(Math.abs(r.lowerBShiftCm1 - (truth.lower.B - guess.lower.B))).toBeLessThan(0.1 * 2.51e-3);
    expect(Math.abs(r.originShiftCm1 + 0.3)).toBeLessThan(0.02);
    expect(r.matchedFraction).toBeGreaterThan(2 * r.chanceFraction + 0.1);
    expect(r.lines.length).toBeGreaterThanOrEqual(8);
    for (const s of r.lines) expect(syntheticIsCorrect(band, s, s.observedCm1)).toBe(true);
    // Only the constants allowed to float are moved.
    const fixedB = assistantSeedFromModel(guess, band.peaks, ['upper.origin']);
    expect(fixedB.model.upper.B).toBe(guess.upper.B);
  });

  it('warns instead of seeding blindly when the model is far off', () => {
    const far: BandModel = { ...truth, upper: { ...truth.upper, B: truth.upper.B * 1.05, A: truth.upper.A * 1.1 } };
    const r = assistantSeedFromModel(far, band.peaks, FLOATABLE);
    // Either warning is a refusal to guess: too far off, no isolated line, or two equally good shifts.
    expect(r.warnings.join(' ')).toMatch(/too far off|exactly one peak|ambiguous from the model alone/);
  });

  it('returns no seeds for an empty peak list and refuses bad options', () => {
    const empty: PeakList = { ...band.peaks, count: 0 };
    expect(assistantSeedFromModel(truth, empty, FLOATABLE).lines).toEqual([]);
    expect(() => assistantSeedFromModel(truth, band.peaks, FLOATABLE, { count: 0 })).toThrow(/count must be a whole number >= 1, got 0/);
    expect(() => assistantSeedFromModel(truth, band.peaks, FLOATABLE, { originWindowCm1: -1 })).toThrow(
      /originWindowCm1 must be a finite number > 0/,
    );
  });
});
