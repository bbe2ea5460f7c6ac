import {
  hamiltonianConstantsCheck,
  hamiltonianJCheck,
  type HamiltonianConstants,
  type HamiltonianLevel,
  type HamiltonianLevelSet,
} from './hamiltonianLevel';

/** Constant names of a linear molecule's Π state (v_t = 1, |l| = 1). */
export const LINEAR_PI_STATE_NAMES = ['origin', 'B', 'DJ', 'HJ', 'q', 'qJ'] as const;

/**
 * The two levels (e and f) of one J >= 1 of a linear molecule's Π vibrational state (|l| = 1):
 *
 *   E_e,f(J) = origin + B [x − 1] − DJ x² + HJ x³ ± ½ (q + qJ·x) x,   x = J(J+1),
 *
 * e levels with +, f with −. Up to qJ this is the project's contract for a Π state (DEVELOPERS.md:
 * F with K = 1 and A = 0, levels reached by P and R lines from a Σ⁺ state at +q/2·J(J+1), by Q lines at
 * −q/2·J(J+1)); qJ is the J dependence of the l-type doubling constant, needed over wide J ranges.
 * Parity: e levels have parity (−1)^J, f levels −(−1)^J, so from a Σ⁺ state (parity (−1)^J) P and R
 * lines reach e and Q lines f; species '+' / '−' (parity) for transitionsAllowed-style checks.
 * Source: J. M. Brown et al., J. Mol. Spectrosc. 55, 500 (1975) (the e/f parity labels; from memory); l-type doubling
 * with its J dependence, ±½[q + q_J J(J+1)] J(J+1), as in Herzberg II (1945) ch. IV and common practice
 * in linear-molecule analyses (sign conventions of q_J differ; from memory).
 * @param constants origin, B, DJ, HJ, q, qJ in cm⁻¹ (absent = 0)
 * @param J rotational quantum number, >= 1 (a Π state has no J = 0)
 * @returns the e level then the f level, energies in cm⁻¹
 */
export function linearPiStateLevels(constants: HamiltonianConstants, J: number): HamiltonianLevelSet {
  const where = 'linearPiStateLevels';
  hamiltonianConstantsCheck(where, constants, LINEAR_PI_STATE_NAMES);
  hamiltonianJCheck(where, J);
  if (J < 1) throw new Error(`${where}: a Π state has J >= 1, got J = ${J}`);
  const g = (name: string) => constants[name] ?? 0;
  const x = J * (J + 1);
  const base = g('origin') + g('B') * (x - 1) - g('DJ') * x * x + g('HJ') * x * x * x;
  const half = 0.5 * (g('q') + g('qJ') * x) * x;
  const parityE = J % 2 === 0 ? 1 : -1;
  const levels: HamiltonianLevel[] = (['e', 'f'] as const).map((tag) => {
    const sign = tag === 'e' ? 1 : -1;
    const parity = sign * parityE;
    return {
      J,
      K: 1,
      l: 1,
      tag,
      energyCm1: base + sign * half,
      species: parity > 0 ? '+' : '-',
      degeneracy: 1,
      labelWeight: 1,
      derivatives: Float64Array.of(1, x - 1, -x * x, x * x * x, 0.5 * sign * x, 0.5 * sign * x * x),
    };
  });
  return { parameterNames: LINEAR_PI_STATE_NAMES, levels };
}
