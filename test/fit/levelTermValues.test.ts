import { describe, expect, it } from 'vitest';
import { fitBand } from '../../src/fit/fitBand';
import { levelTermValues } from '../../src/fit/levelTermValues';
import { levelEnergy, upperLevelEnergy } from '../../src/physics/termValues';
import { inventedModel, simulatedLines } from './fitTestData';

// Reference: term values E'(J',K') and F''(J'',K'') as defined in DEVELOPERS.md ("The model file and
// formulas"), evaluated independently here through physics/termValues for the fitted constants.
describe('levelTermValues', () => {
  it('gives each upper level once, with E_obs = ν_obs + F″ and the reduced value E − B̄J(J+1)', () => {
    const truth = inventedModel('prolate', 'parallel');
    const lines = simulatedLines(truth, 400, 0.0005, 3);
    const r = fitBand({ model: truth, floated: ['upper.origin', 'upper.B', 'upper.A', 'lower.B'], lines });
    if (!r.ok) throw new Error(r.error.message);
    const levels = levelTermValues(r.result, 'upper');
    const keys = new Set(levels.map((l) => `${l.k},${l.j}`));
    expect(keys.size).toBe(levels.length);
    const m = r.result.model;
    for (const lv of levels) {
      const calc = upperLevelEnergy(m, lv.j, lv.k, 0, 0);
      // Round-off only: sums of terms ~1e3 cm^-1 in doubles.
      expect(Math.abs(lv.energyCalcCm1 - calc)).toBeLessThan(1e-9);
      expect(lv.reducedObsCm1).toBeCloseTo(lv.energyObsCm1 - m.upper.B * lv.j * (lv.j + 1), 9);
      // Noise of 0.0005 cm^-1 per line: a level's o − c stays within 5σ of its own σ.
      expect(Math.abs(lv.obsMinusCalcCm1)).toBeLessThan(5 * Math.max(lv.sigmaCm1, 0.0005));
    }
    // Every line reaching a level is counted once.
    expect(levels.reduce((a, l) => a + l.nLines, 0)).toBe(400);
  });

  it('keeps the two Coriolis components of a perpendicular band apart and gives lower levels E″ = E′calc − ν_obs', () => {
    const truth = inventedModel('prolate', 'perpendicular');
    const lines = simulatedLines(truth, 300, 0.0005, 5);
    const r = fitBand({ model: truth, floated: ['upper.origin', 'upper.B', 'lower.B'], lines });
    if (!r.ok) throw new Error(r.error.message);
    const up = levelTermValues(r.result, 'upper');
    expect(new Set(up.map((l) => l.component))).toEqual(new Set([-1, 1]));
    for (const lv of up) {
      const calc = upperLevelEnergy(r.result.model, lv.j, lv.k, lv.component, 1);
      expect(Math.abs(lv.energyCalcCm1 - calc)).toBeLessThan(1e-9);
    }
    const low = levelTermValues(r.result, 'lower', { bBarCm1: 0.3 });
    for (const lv of low) {
      expect(lv.component).toBe(0);
      expect(Math.abs(lv.energyCalcCm1 - levelEnergy(r.result.model.lower, 'prolate', lv.j, lv.k))).toBeLessThan(1e-9);
      expect(lv.reducedCalcCm1).toBeCloseTo(lv.energyCalcCm1 - 0.3 * lv.j * (lv.j + 1), 9);
    }
  });

  it('refuses a non-finite B̄', () => {
    const truth = inventedModel('prolate', 'parallel');
    const r = fitBand({ model: truth, floated: ['upper.origin'], lines: simulatedLines(truth, 20, 0.001, 1) });
    if (!r.ok) throw new Error(r.error.message);
    expect(() => levelTermValues(r.result, 'upper', { bBarCm1: NaN })).toThrow(/bBarCm1 must be finite/);
  });
});
