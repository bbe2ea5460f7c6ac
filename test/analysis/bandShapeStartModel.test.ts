import { describe, expect, it } from 'vitest';
import type { BandShapeClassification } from '../../src/analysis/bandShapeClassify';
import { bandShapeStartModel } from '../../src/analysis/bandShapeStartModel';
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

  it('turns a PR profile into a linear Σ–Σ band with the estimated B', () => {
    const { model } = bandShapeStartModel({ ...base, profile: 'PR', type: 'linear-parallel', origin: 2300, B: 0.39 }, top);
    expect(model.shape).toBe('linear');
    expect(model.upper.A).toBe(0);
    expect(model.lower.B).toBe(0.39);
    expect(model.upper.B).toBe(0.39);
  });
});
