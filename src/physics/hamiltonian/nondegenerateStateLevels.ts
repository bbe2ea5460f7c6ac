import {
  hamiltonianConstantsCheck,
  hamiltonianJCheck,
  type HamiltonianConstants,
  type HamiltonianLevel,
  type HamiltonianLevelSet,
} from './hamiltonianLevel';
import { rotorPolynomialBasis, rotorPolynomialNames, type RotorShape } from './rotorPolynomial';
import { rovibGroupCheck, rovibLevelSpecies, rovibSpeciesDimension, type RovibPointGroup } from './rovibSymmetry';

/** Options of nondegenerateStateLevels. */
export interface NondegenerateStateOptions {
  shape: RotorShape;
  pointGroup: RovibPointGroup;
  /** Species of the vibrational state (one-dimensional). @default 'A1' (C3v) or "A1'" (D3h) */
  vibSpecies?: string;
  /** Largest K listed. @default J */
  kMax?: number;
}

/** Constant names of a nondegenerate state: origin and the rotor polynomial. */
export function nondegenerateStateParameterNames(shape: RotorShape): string[] {
  return ['origin', ...rotorPolynomialNames(shape)];
}

/**
 * The levels of one J of a nondegenerate vibrational state of a symmetric top:
 * E(J,K) = origin + F(J,K) (rotorPolynomial.ts), one level per symmetry species: K = 0 one level,
 * K = 3n > 0 an unsplit A1/A2 pair (two levels tagged with their species, one function each),
 * other K an E level (degeneracy 2). Derivatives are the polynomial's basis functions.
 * Source: Herzberg II (1945) eq. (I,31)–(I,33) for the energies; species from rovibLevelSpecies
 * (Bunker and Jensen 1998, ch. 12).
 * @param constants origin and polynomial constants, cm⁻¹ (absent = 0)
 * @param J rotational quantum number
 * @returns the levels with K ascending, energies in cm⁻¹
 */
export function nondegenerateStateLevels(
  constants: HamiltonianConstants,
  J: number,
  options: NondegenerateStateOptions,
): HamiltonianLevelSet {
  const where = 'nondegenerateStateLevels';
  const group = rovibGroupCheck(options.pointGroup, where);
  const names = nondegenerateStateParameterNames(options.shape);
  hamiltonianConstantsCheck(where, constants, names);
  hamiltonianJCheck(where, J);
  const vib = options.vibSpecies ?? (group === 'C3v' ? 'A1' : "A1'");
  if (rovibSpeciesDimension(group, vib) !== 1) throw new Error(`${where}: vibSpecies ${vib} is degenerate; use degenerateStateLevels`);
  const values = names.map((n) => constants[n] ?? 0);
  const kTop = Math.min(J, options.kMax ?? J);
  const basis = new Float64Array(14);
  const levels: HamiltonianLevel[] = [];
  for (let K = 0; K <= kTop; K++) {
    rotorPolynomialBasis(J, K, basis);
    const derivatives = new Float64Array(names.length);
    derivatives[0] = 1;
    let energy = values[0];
    for (let i = 0; i < 14; i++) {
      derivatives[i + 1] = basis[i];
      energy += values[i + 1] * basis[i];
    }
    const species = rovibLevelSpecies(group, vib, J, K);
    for (const s of species) {
      levels.push({
        J,
        K,
        l: 0,
        tag: species.length > 1 ? s : '',
        energyCm1: energy,
        species: s,
        degeneracy: rovibSpeciesDimension(group, s) as 1 | 2,
        labelWeight: 1,
        derivatives: species.length > 1 ? Float64Array.from(derivatives) : derivatives,
      });
    }
  }
  return { parameterNames: names, levels };
}
