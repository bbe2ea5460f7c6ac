/**
 * What every level provider of this folder returns: one rovibrational level with its energy,
 * labels, symmetry species and the derivative of its energy with respect to every constant.
 */

/** One rovibrational level of a vibrational state. */
export interface HamiltonianLevel {
  J: number;
  /** K = |k| of the dominant basis function. */
  K: number;
  /**
   * Signed ℓ label relative to k, l = sign(kℓ): 0 for a nondegenerate state, +1 for a (+l) level
   * (kℓ > 0), −1 for a (−l) level (kℓ < 0), and 0 for the K = 0 level of a degenerate state (kℓ = 0),
   * as the system engine's LevelLabel (physics/system/levelTypes.ts) and the line table's l_up/l_lo.
   */
  l: -1 | 0 | 1;
  /**
   * Separates levels that (J, K, l) do not: '' when nothing more is needed; the species ('A1',
   * "A2''", …) for the two members of an A1/A2 pair; 's' / 'a' for inversion components, with
   * ':' + species appended for an A1/A2 pair ('a:A2''').
   */
  tag: string;
  /** Energy, cm⁻¹ (on the provider's zero). */
  energyCm1: number;
  /** Symmetry species in the molecule's group (e.g. 'A1', "E''"). */
  species: string;
  /** Number of basis functions the level stands for: 1, or 2 for an E level (k = ±K). */
  degeneracy: 1 | 2;
  /**
   * |c|² of the basis function that labels the level (1 for an unmixed level). Below about 0.6 the
   * K and l labels are uncertain: the level is a near-even mixture.
   */
  labelWeight: number;
  /** ∂E/∂p in cm⁻¹ per unit of p, aligned with the provider's `parameterNames`. */
  derivatives: Float64Array;
}

/** A labelled level set with its parameter list. */
export interface HamiltonianLevelSet {
  /** Constant names, in the order of every level's `derivatives`. */
  parameterNames: readonly string[];
  levels: HamiltonianLevel[];
}

/** Constants of a state by file-key name (cm⁻¹; ζ dimensionless); absent keys are 0. */
export type HamiltonianConstants = Readonly<Record<string, number>>;

/** Where a constant that one provider refuses does belong, for the refusal message. */
const CONSTANT_HOMES: Record<string, string> = {
  zeta: 'a degenerate (E) state (degenerateStateLevels)',
  etaJ: 'a degenerate (E) state (degenerateStateLevels)',
  etaK: 'a degenerate (E) state (degenerateStateLevels)',
  q22: 'a degenerate (E) state (degenerateStateLevels)',
  q22J: 'a degenerate (E) state (degenerateStateLevels)',
  q12: 'a degenerate (E) state of a C3v top (degenerateStateLevels)',
  q: "a linear molecule's Π state (linearPiStateLevels)",
  qJ: "a linear molecule's Π state (linearPiStateLevels)",
  inv: 'an inversion-doubled state (inversionStateLevels)',
  eps3: 'an inversion-doubled state (inversionStateLevels)',
  eps3J: 'an inversion-doubled state (inversionStateLevels)',
  A: 'a prolate top (an oblate top has C)',
  C: 'an oblate top (a prolate top has A)',
};

/** Refuse keys a provider does not know (saying where they belong) and values that are not finite. */
export function hamiltonianConstantsCheck(where: string, constants: HamiltonianConstants, allowed: readonly string[]): void {
  for (const [key, value] of Object.entries(constants)) {
    if (!allowed.includes(key)) {
      const hint = CONSTANT_HOMES[key] ? `; ${key} belongs to ${CONSTANT_HOMES[key]}` : '';
      throw new Error(`${where}: unknown constant ${JSON.stringify(key)} (known: ${allowed.join(', ')})${hint}`);
    }
    if (!Number.isFinite(value)) throw new Error(`${where}: constant ${key} must be a finite number, got ${value}`);
  }
}

/** Check J (integer >= 0, at most jLimit). */
export function hamiltonianJCheck(where: string, J: number, jLimit = 1000): void {
  if (!Number.isInteger(J) || J < 0 || J > jLimit) throw new Error(`${where}: J must be an integer 0…${jLimit}, got ${J}`);
}
