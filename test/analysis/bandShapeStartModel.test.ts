import { describe, expect, it } from 'vitest';
import type { BandShapeClassification } from '../../src/analysis/bandShapeClassify';
import { bandShapeStartModel, populatedJMax } from '../../src/analysis/bandShapeStartModel';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';

const top: BandModel = {
  shape: 'prolate',
  band: 'parallel',
  lower: stateConstantsFrom({ B: 0.3, A: 3.4 }),
  upper: stateConstantsFrom({ origin: 1000, B: 0.3, A: 3.4, zeta: 0 }),
  temperatureK: 296,
  jMax: 60,
  kMax: 18,
  spinWeights: [1],
};

const base: Omit<BandShapeClassification, 'profile' | 'type' | 'origin' | 'B'> = {
  confidence: 'medium',
  bMethod: 'none',
  temperatureK: 296,
  temperatureAssumed: false,
  evidence: '',
  implication: '',
};

describe('bandShapeStartModel', () => {
  it('turns a Q-series into a perpendicular band whose Q spacing 2[A′(1−ζ) − B′] is the measured one', () => {
    const current = { ...top, upper: { ...top.upper, zeta: 0.25 } };
    const { model, changes } = bandShapeStartModel(
      { ...base, profile: 'Q-series', type: 'symmetric-top-perpendicular', origin: 1010, B: null, qSpacing: 4.2 },
      current,
    );
    expect(model.band).toBe('perpendicular');
    expect(model.upper.origin).toBe(1010);
    // Herzberg II (1945) ch. IV: spacing 2[A′(1−ζ) − B′]; round-off only.
    expect(2 * (model.upper.A * (1 - model.upper.zeta) - model.upper.B)).toBeCloseTo(4.2, 12);
    expect(model.lower.B).toBe(0.3);
    expect(changes.join(' ')).toMatch(/perpendicular/);
    expect(current.band).toBe('parallel'); // the current model is not touched
  });

  it("reaches an oblate top's high-K levels: J″ as far as C alone populates, K″ up to J″", () => {
    // F = BJ(J + 1) + (C − B)K² (Herzberg II (1945) ch. I): with C < B the lowest level of each J is
    // K = J, F ≈ CJ(J + 1), so J is populated as far as a rotor of constant C is, and every K ≤ J.
    const oblate: BandModel = {
      ...top,
      shape: 'oblate',
      lower: stateConstantsFrom({ B: 0.15, C: 0.09 }),
      upper: stateConstantsFrom({ origin: 1000, B: 0.15, C: 0.09, zeta: 0 }),
    };
    const { model } = bandShapeStartModel({ ...base, profile: 'PQR', type: 'symmetric-top-parallel', origin: 1000, B: 0.15 }, oblate);
    expect(model.jMax).toBe(populatedJMax(0.09, 296));
    expect(model.jMax).toBeGreaterThan(populatedJMax(0.15, 296));
    expect(model.kMax).toBe(model.jMax);
  });

  it('turns a PR profile into a linear Σ–Σ band with the estimated B', () => {
    const { model } = bandShapeStartModel({ ...base, profile: 'PR', type: 'linear-parallel', origin: 2300, B: 0.39 }, top);
    expect(model.shape).toBe('linear');
    expect(model.upper.A).toBe(0);
    expect(model.lower.B).toBe(0.39);
    expect(model.upper.B).toBe(0.39);
  });

  it('reaches J″ as far as the band is populated, and drops distortion constants fitted with another B', () => {
    // HC3N-like: B 0.1517 cm^-1 at 296 K. Rigid-rotor populations (2J + 1)·exp(−B·J(J + 1)·c2/T),
    // c2 = 1.438776877 cm K (CODATA 2018; Herzberg II (1945) ch. I), computed here on their own.
    const c2 = 1.438776877;
    const pop = (b: number, t: number, j: number) => (2 * j + 1) * Math.exp((-b * j * (j + 1) * c2) / t);
    const peak = (b: number, t: number) => Math.max(...Array.from({ length: 400 }, (_, j) => pop(b, t, j)));
    for (const [b, t] of [
      [0.1517, 296],
      [0.025, 400],
      [2.0, 150],
    ]) {
      const j = populatedJMax(b, t);
      expect(pop(b, t, j) / peak(b, t), `B ${b}, T ${t}`).toBeLessThan(1e-3);
      expect(pop(b, t, j - 1) / peak(b, t), `B ${b}, T ${t}`).toBeGreaterThanOrEqual(1e-3);
    }
    const current = { ...top, lower: { ...top.lower, DJ: 3e-7, DK: 4e-5 }, upper: { ...top.upper, DJ: 3e-7, DK: 4e-5 } };
    const { model, changes } = bandShapeStartModel({ ...base, profile: 'PR', type: 'linear-parallel', origin: 3327.4, B: 0.1504 }, current);
    // A band cut at J″ = 60 still holds a quarter of its strongest line's intensity there.
    expect(pop(0.1504, 296, 60) / peak(0.1504, 296)).toBeGreaterThan(0.2);
    expect(model.jMax).toBe(populatedJMax(0.1504, 296));
    expect(model.jMax).toBeGreaterThan(100);
    expect(model.lower.DJ).toBe(0);
    expect(model.upper.DK).toBe(0);
    expect(changes.join('; ')).toMatch(/DJ, DK → 0/);
    // Within 10 % of the current B the constants stay (the same molecule), and a symmetric top's K″max
    // reaches where exp(−(A − B)K²·c2/T) falls to 0.05 % (twice 1e-3 with the K-doubling).
    const same = bandShapeStartModel({ ...base, profile: 'PQR', type: 'symmetric-top-parallel', origin: 1000, B: 0.31 }, current).model;
    expect(same.lower.DJ).toBe(3e-7);
    expect(same.kMax).toBeGreaterThanOrEqual(18);
    const kFactor = (k: number) => 2 * Math.exp((-(3.4 - 0.31) * k * k * c2) / 296);
    expect(kFactor(same.kMax)).toBeLessThan(1e-3);
    expect(kFactor(same.kMax - 1)).toBeGreaterThanOrEqual(1e-3);
  });
});
