/**
 * Which interaction constants each kind of interaction between two vibrational states carries,
 * and which constants a state of a coupled group carries. Names are the system file's keys.
 *
 * Conventions (see README.md in this folder): a basis function is |J, k, ℓ⟩ with signed k and ℓ = ±1
 * in a degenerate state, ℓ = 0 in a nondegenerate one; the dipole and every term below conserve
 * k − ℓ (mod 3 for the ΔK = ±2 terms), as the transition moment does in physics/system/bandRules.ts
 * (Δk = Δℓ). Authors who count ℓ with the opposite sign write the same Coriolis term "Δk = ±1,
 * Δℓ = ∓1".
 */
import { degenerateStateParameterNames } from '../hamiltonian/degenerateStateLevels';
import { rotorPolynomialNames, type RotorShape } from '../hamiltonian/rotorPolynomial';

/** Kinds of interaction between two vibrational states. */
export type InteractionType = 'coriolis' | 'fermi';

/** Every interaction kind the system file accepts. */
export const INTERACTION_TYPES: readonly InteractionType[] = ['coriolis', 'fermi'];

/**
 * Constants of the Coriolis coupling of a nondegenerate and a degenerate state, in parameter-vector
 * order (coupledLevels.ts reads the first seven, coupledHigherTerms.ts the rest):
 * C1, C1J, C1K, C1JJ — Δk = ±1, Δℓ = ±1 (the x–y Coriolis term) with its x, (k ± ½)² and x² dependence;
 * C2, C2J, C2K, C2JJ, C2JK — Δk = ∓2, Δℓ = ±1 (the ΔK = ±2 term of the same (k − ℓ) class) with x,
 * (k ∓ 1)², x² and x·(k ∓ 1)²; C4 — Δk = ±4, Δℓ = ±1; C5 — Δk = ∓5, Δℓ = ±1.
 */
export const CORIOLIS_AE_NAMES = ['C1', 'C1J', 'C1K', 'C2', 'C2J', 'C1JJ', 'C2K', 'C2JJ', 'C2JK', 'C4', 'C5'] as const;

/**
 * Constants of an interaction between a state A and a state B, by kind and degeneracy, or a
 * sentence saying why the pair cannot interact that way.
 *
 * - coriolis, nondegenerate A ↔ degenerate B (an A1 ↔ E dyad such as PH3 ν2/ν4): CORIOLIS_AE_NAMES.
 * - coriolis, degenerate ↔ degenerate: Cz, CzJ — Δk = 0, Δℓ = 0 (z Coriolis, ∝ kℓ); C1, C1J — Δk = ±1, Δℓ = ∓2.
 * - fermi, two states of the same degeneracy: W, WJ, WK — Δk = 0, Δℓ = 0.
 * @returns the constant names, or an error sentence
 */
export function interactionParameterNames(type: InteractionType, isDegenerateA: boolean, isDegenerateB: boolean): string[] | string {
  if (type === 'fermi') {
    if (isDegenerateA !== isDegenerateB)
      return 'a Fermi resonance joins two states of the same symmetry; a nondegenerate and a degenerate state interact by Coriolis coupling';
    return ['W', 'WJ', 'WK'];
  }
  if (isDegenerateA && isDegenerateB) return ['Cz', 'CzJ', 'C1', 'C1J'];
  if (isDegenerateA !== isDegenerateB) return [...CORIOLIS_AE_NAMES];
  return 'Coriolis coupling between two nondegenerate states (A1 ↔ A2, Δk = 0) is not handled; couple a nondegenerate and a degenerate state, or two degenerate states';
}

/**
 * Constants of a state inside a coupled group: the diagonalising providers' sets (origin, the rotor
 * polynomial to octic order, and for a degenerate state ζ, ηJ, ηK, q22, q22J, q12), and for a
 * nondegenerate state h3, the Δk = ±6 term that splits its K = 3 levels into A1 and A2, and eps (ε),
 * the Δk = ±3 term (coupledHigherTerms.ts).
 */
export function coupledStateParameterNames(shape: RotorShape, isDegenerate: boolean): string[] {
  return isDegenerate ? degenerateStateParameterNames(shape) : ['origin', ...rotorPolynomialNames(shape), 'h3', 'eps'];
}
