import { describe, expect, it } from 'vitest';
import { leastSquaresSolve } from '../../../src/fit/leastSquares';
import { lineariseCovariance } from '../../../src/fit/leastSquaresLinearise';
import { degenerateStateLevels, degenerateStateParameterNames } from '../../../src/physics/hamiltonian/degenerateStateLevels';
import type { HamiltonianLevel } from '../../../src/physics/hamiltonian/hamiltonianLevel';
import { nondegenerateStateLevels } from '../../../src/physics/hamiltonian/nondegenerateStateLevels';
import { transitionsAllowed } from '../../../src/physics/hamiltonian/transitionsAllowed';
import { seededGaussian } from '../../fit/fitTestData';

/** Invented C3v prolate top (fictitious): ground state and an E state with every ℓ-type term. */
const GROUND = { B: 0.31, A: 5.2, DJ: 3e-7, DJK: 4e-6, DK: 8e-5 };
const UPPER = { origin: 1057.3, B: 0.308, A: 5.15, DJ: 3.1e-7, DJK: 4.2e-6, DK: 7.5e-5, zeta: 0.21, etaJ: 3e-6, q22: 4e-4, q12: 3e-4 };
const FREE = ['origin', 'B', 'A', 'DJ', 'DJK', 'DK', 'zeta', 'etaJ', 'q22', 'q12'] as const;
const J_MAX = 25;
const K_MAX = 10;
const SIGMA = 2e-4;

function upperLevels(c: Record<string, number>): HamiltonianLevel[] {
  const out: HamiltonianLevel[] = [];
  for (let J = 0; J <= J_MAX + 1; J++)
    out.push(...degenerateStateLevels(c, J, { shape: 'prolate', pointGroup: 'C3v', kMax: K_MAX + 1 }).levels);
  return out;
}

describe('round trip of a perpendicular band to a degenerate state', () => {
  it('recovers the upper-state constants within 3σ from seeded noisy lines', () => {
    // Simulate: every allowed line J'' ≤ 25, K'' ≤ 10 (transitionsAllowed), plus seeded Gaussian noise of
    // σ = 2e-4 cm⁻¹ (seed 7). Fit the ten upper constants with the ground state fixed, starting 1 % off.
    const lower: HamiltonianLevel[] = [];
    for (let J = 0; J <= J_MAX; J++)
      lower.push(...nondegenerateStateLevels(GROUND, J, { shape: 'prolate', pointGroup: 'C3v', kMax: K_MAX }).levels);
    const truthUpper = upperLevels(UPPER);
    const pairs = transitionsAllowed(truthUpper, lower, { pointGroup: 'C3v', band: 'perpendicular' });
    const noise = seededGaussian(7);
    const lines = pairs.map((t) => ({
      up: truthUpper[t.upper],
      lo: lower[t.lower],
      nu: truthUpper[t.upper].energyCm1 - lower[t.lower].energyCm1 + SIGMA * noise(),
    }));
    expect(lines.length).toBeGreaterThan(1000);
    const names = degenerateStateParameterNames('prolate');
    const key = (l: HamiltonianLevel) => `${l.J},${l.K},${l.l},${l.tag}`;
    const evaluate = (p: ArrayLike<number>, res: Float64Array | null, jac: Float64Array | null) => {
      const c: Record<string, number> = Object.fromEntries(FREE.map((n, i) => [n, p[i]]));
      const byKey = new Map(upperLevels(c).map((l) => [key(l), l]));
      lines.forEach((line, i) => {
        const up = byKey.get(key(line.up))!;
        if (res) res[i] = (line.nu - (up.energyCm1 - line.lo.energyCm1)) / SIGMA;
        if (jac) FREE.forEach((n, j) => (jac[j * lines.length + i] = up.derivatives[names.indexOf(n)] / SIGMA));
      });
    };
    const truth = FREE.map((n) => UPPER[n]);
    const start = truth.map((v) => v * 1.01);
    const s = leastSquaresSolve(
      {
        nObservations: lines.length,
        nParameters: FREE.length,
        residuals: (p, o) => evaluate(p, o, null),
        jacobian: (p, o) => evaluate(p, null, o),
      },
      start,
    );
    expect(['chi2-change', 'step-size', 'no-further-decrease']).toContain(s.status);
    // σ_w ≈ 1 when the model and its derivatives are right (χ²/ν; 3σ band for ν ≈ 1e3 is ±0.14).
    const sigmaW = Math.sqrt(s.chi2 / (lines.length - FREE.length));
    expect(Math.abs(sigmaW - 1)).toBeLessThan(0.14);
    const cov = lineariseCovariance(s.linearisation!);
    FREE.forEach((n, j) => {
      const err = Math.sqrt(cov[j * FREE.length + j]) * sigmaW;
      expect(Math.abs(s.parameters[j] - truth[j]), `${n}: ${s.parameters[j]} ± ${err}`).toBeLessThan(3 * err);
    });
  });
});
