import { describe, expect, it } from 'vitest';
import { qBranchAssign, qBranchFind } from '../../src/analysis/qBranchFind';
import { qBranchFit, qBranchOrigin } from '../../src/fit/qBranchFit';
import { gaussian, seededRandom, traceGenerate } from './contourTraces';

describe('qBranchFit', () => {
  it('refuses fewer than three distinct K and bad σ', () => {
    expect(() =>
      qBranchFit([
        { m: 1, wavenumberCm1: 1000, sigmaCm1: 0.01 },
        { m: 2, wavenumberCm1: 1007, sigmaCm1: 0.01 },
      ]),
    ).toThrow(/at least three Q branches/);
    expect(() => qBranchFit([{ m: 1, wavenumberCm1: 1000, sigmaCm1: 0 }])).toThrow(/sigmaCm1 > 0/);
  });

  it('recovers the sub-band constants of Herzberg’s quadratic within the reported σ (round trip)', () => {
    // ν_sub = ν0 + [A′(1−ζ)² − B′] ± 2[A′(1−ζ) − B′]K + [(A′−B′) − (A″−B″)]K², Herzberg II (1945)
    // ch. IV, written out here with invented constants; Herzberg's constant term differs from ours
    // by A′ζ² (his vibrational term), which the origin check allows for.
    const nu0 = 1250;
    const Au = 5.08;
    const Bu = 0.2493;
    const Al = 5.1;
    const Bl = 0.25;
    const zeta = 0.25;
    const rand = seededRandom(42);
    const sigma = 0.01;
    const points = [];
    for (let K = 0; K <= 8; K++) {
      for (const sign of K === 0 ? [1] : [1, -1]) {
        const exact = nu0 + (Au * (1 - zeta) ** 2 - Bu) + sign * 2 * (Au * (1 - zeta) - Bu) * K + (Au - Bu - (Al - Bl)) * K * K;
        points.push({ m: sign * K, wavenumberCm1: exact + sigma * gaussian(rand), sigmaCm1: sigma });
      }
    }
    const fit = qBranchFit(points);
    // Tolerance: 3σ of each fitted quantity (seeded noise, 17 points).
    expect(Math.abs(fit.uniqueZetaMinusB.value - (Au * (1 - zeta) - Bu))).toBeLessThan(3 * fit.uniqueZetaMinusB.sigma);
    expect(Math.abs(fit.deltaUniqueMinusB.value - (Au - Bu - (Al - Bl)))).toBeLessThan(3 * fit.deltaUniqueMinusB.sigma);
    // Our origin convention: ν0(ours) = ν0(Herzberg) + A′ζ²; qBranchOrigin uses A′ζ from the model.
    const origin = qBranchOrigin(fit, Au * zeta);
    expect(Math.abs(origin.value - (nu0 + Au * zeta * zeta))).toBeLessThan(3 * origin.sigma);
  });

  it('finds, assigns and fits the Q branches of a generated low-resolution trace', () => {
    const c = traceGenerate({
      shape: 'prolate',
      band: 'perpendicular',
      B: 0.25,
      unique: 5.1,
      zeta: 0.25,
      temperatureK: 296,
      opdCm: 2,
      apodization: 'triangular',
      origin: 1250,
      noiseRel: 0.005,
      seed: 8,
    });
    const maxima = qBranchFind(c.x, c.noisy, c.fromCm1, c.toCm1);
    expect(maxima.length).toBeGreaterThanOrEqual(7);
    // A start model 0.3 cm^-1 off in origin: the median offset absorbs it.
    const model = structuredClone(c.model);
    model.upper.origin += 0.3;
    const assigned = qBranchAssign(maxima, model).filter((a) => !a.isUncertain);
    expect(assigned.length).toBeGreaterThanOrEqual(7);
    const fit = qBranchFit(assigned);
    const up = c.model.upper;
    // The Q maxima sit at nearly the same offset from every sub-band origin, so A′(1−ζ) − B′ comes out
    // within 0.5 % (the maxima's K-dependent displacement, ΔB·J(J+1) weighted by K, is below that).
    expect(Math.abs(fit.uniqueZetaMinusB.value / (up.A * (1 - up.zeta) - up.B) - 1)).toBeLessThan(0.005);
  });
});
