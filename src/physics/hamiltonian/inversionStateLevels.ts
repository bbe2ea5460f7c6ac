import {
  hamiltonianConstantsCheck,
  hamiltonianJCheck,
  type HamiltonianConstants,
  type HamiltonianLevel,
  type HamiltonianLevelSet,
} from './hamiltonianLevel';
import { rotorPolynomialBasis, rotorPolynomialNames, type RotorShape } from './rotorPolynomial';
import { inversionVibSpecies, rovibLevelSpecies, rovibSpeciesDimension } from './rovibSymmetry';

/** Options of inversionStateLevels. */
export interface InversionStateOptions {
  /** Pyramidal XY3 tops are oblate (NH3) but either shape is accepted. */
  shape: RotorShape;
  /** C3v species of the vibrational state, one-dimensional. @default 'A1' */
  vibSpecies?: 'A1' | 'A2';
  /** Largest K listed. @default J */
  kMax?: number;
}

/**
 * Constant names of an inversion-doubled state: the mean term-value constants (origin and the
 * rotor polynomial) and, with the prefix 'inv', their differences a − s: 'inv' is the splitting
 * Δ0 of the J = K = 0 pair, 'invB', 'invC' (or 'invA'), 'invDJ', … its J and K dependence.
 */
export function inversionStateParameterNames(shape: RotorShape): string[] {
  const mean = ['origin', ...rotorPolynomialNames(shape)];
  return [...mean, 'inv', ...rotorPolynomialNames(shape).map((n) => `inv${n}`)];
}

/**
 * The levels of one J of an inversion-doubled nondegenerate state of a pyramidal XY3 top, in
 * D3h(M). Every (J, K) gives a lower component s and an upper component a:
 *
 *   E_s,a(J,K) = origin + F(J,K) ∓ ½ Δ(J,K),   Δ(J,K) = inv + F_inv(J,K),
 *
 * with F the rotor polynomial of the mean constants and F_inv the same polynomial of the 'inv…'
 * constants, so Δ(J,K) = Δ0 + invB·J(J+1) + (invC − invB)·K² − invDJ·J²(J+1)² − …; this is the
 * same as giving each component its own constants (p_s = p − ½ inv_p, p_a = p + ½ inv_p).
 * Species: s has the vibrational species Γ', a has Γ' ⊗ A2'' (inversionVibSpecies), times the
 * rotational species; levels of zero spin weight (e.g. one of each K = 0 pair of ¹⁴NH3) are still
 * listed, with their species, so a caller's statistics decide.
 * Source: the power-series expansion of the inversion splitting in J(J+1) and K² is common
 * practice in analyses of the NH3 ground and v2 states (Papoušek and Aliev (1982), chapter on
 * nonrigid molecules; from memory, no equation number); D3h(M) species: Bunker and Jensen (1998)
 * ch. 15 (from memory, checked in the tests against the labels of empirical ¹⁴NH3 levels).
 * @param constants mean and 'inv…' constants, cm⁻¹ (absent = 0)
 * @param J rotational quantum number
 * @returns levels by K ascending then s before a, energies in cm⁻¹
 */
export function inversionStateLevels(constants: HamiltonianConstants, J: number, options: InversionStateOptions): HamiltonianLevelSet {
  const where = 'inversionStateLevels';
  const names = inversionStateParameterNames(options.shape);
  hamiltonianConstantsCheck(where, constants, names);
  hamiltonianJCheck(where, J);
  const vib = options.vibSpecies ?? 'A1';
  if (vib !== 'A1' && vib !== 'A2') throw new Error(`${where}: vibSpecies must be A1 or A2, got ${JSON.stringify(vib)}`);
  const nPoly = 14;
  const values = names.map((n) => constants[n] ?? 0);
  const kTop = Math.min(J, options.kMax ?? J);
  const basis = new Float64Array(nPoly);
  const levels: HamiltonianLevel[] = [];
  for (let K = 0; K <= kTop; K++) {
    rotorPolynomialBasis(J, K, basis);
    let mean = values[0];
    let split = values[1 + nPoly];
    for (let i = 0; i < nPoly; i++) {
      mean += values[1 + i] * basis[i];
      split += values[2 + nPoly + i] * basis[i];
    }
    for (const inversion of ['s', 'a'] as const) {
      const sign = inversion === 's' ? -0.5 : 0.5;
      const species = rovibLevelSpecies('D3h', inversionVibSpecies(vib, inversion), J, K);
      for (const s of species) {
        const derivatives = new Float64Array(names.length);
        derivatives[0] = 1;
        derivatives[1 + nPoly] = sign;
        for (let i = 0; i < nPoly; i++) {
          derivatives[1 + i] = basis[i];
          derivatives[2 + nPoly + i] = sign * basis[i];
        }
        levels.push({
          J,
          K,
          l: 0,
          tag: species.length > 1 ? `${inversion}:${s}` : inversion,
          energyCm1: mean + sign * split,
          species: s,
          degeneracy: rovibSpeciesDimension('D3h', s) as 1 | 2,
          labelWeight: 1,
          derivatives,
        });
      }
    }
  }
  return { parameterNames: names, levels };
}
