import { describe, expect, it } from 'vitest';
import { calibrationApply, calibrationRevert } from '../../src/analysis/calibrationApply';
import { calibrationFit } from '../../src/analysis/calibrationFit';
import { randomNormal, randomSeeded } from './syntheticTrace';

describe('calibrationApply / calibrationRevert', () => {
  it('applies ν_true = (1 + δ) ν + offset', () => {
    const out = calibrationApply(Float64Array.of(1000, 2000), { delta: 3e-6, offsetCm1: 0.001 });
    // 1000·(1 + 3e-6) + 0.001 = 1000.004; exact to round-off (1e-12).
    expect(Math.abs(out[0] - 1000.004)).toBeLessThan(1e-12 * 1000);
    expect(Math.abs(out[1] - 2000.007)).toBeLessThan(1e-12 * 2000);
  });

  it('round-trips an axis to 1e-12 relative', () => {
    // Two roundings per direction: error a few ulp (~1e-16 relative); tolerance 1e-12 as required.
    const rand = randomSeeded(8);
    const axis = Float64Array.from({ length: 10000 }, () => 400 + 4000 * rand()).sort();
    for (const cal of [
      { delta: 3e-6, offsetCm1: 0 },
      { delta: -1.7e-5, offsetCm1: 0.0123 },
      { delta: 0.2, offsetCm1: -5 },
    ]) {
      const back = calibrationRevert(calibrationApply(axis, cal), cal);
      for (let i = 0; i < axis.length; i++) expect(Math.abs(back[i] / axis[i] - 1)).toBeLessThan(1e-12);
    }
  });

  it('round-trips the fitted calibration of noisy pairs', () => {
    const rand = randomSeeded(3);
    const ps = Array.from({ length: 12 }, () => {
      const ref = 1000 + 2000 * rand();
      return { observedCm1: ref / (1 + 3e-6) + 1e-4 * randomNormal(rand), referenceCm1: ref };
    });
    const r = calibrationFit(ps, { withOffset: false });
    const axis = Float64Array.of(1000, 1500.25, 2999.999);
    const back = calibrationRevert(calibrationApply(axis, r), r);
    for (let i = 0; i < 3; i++) expect(Math.abs(back[i] / axis[i] - 1)).toBeLessThan(1e-12);
  });

  it('refuses δ ≤ −1 and non-finite values, naming them', () => {
    expect(() => calibrationApply([1], { delta: -1, offsetCm1: 0 })).toThrow(/calibrationApply: delta .* got -1/);
    expect(() => calibrationRevert([1], { delta: 0, offsetCm1: NaN })).toThrow(/calibrationRevert: offsetCm1/);
  });
});
