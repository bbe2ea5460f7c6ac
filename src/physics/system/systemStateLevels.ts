import { degenerateStateEnergies, degenerateStateLevels, degenerateStateParameterNames } from '../hamiltonian/degenerateStateLevels';
import type { HamiltonianLevelSet } from '../hamiltonian/hamiltonianLevel';
import { inversionStateLevels, inversionStateParameterNames } from '../hamiltonian/inversionStateLevels';
import { nondegenerateStateLevels, nondegenerateStateParameterNames } from '../hamiltonian/nondegenerateStateLevels';
import type { TopShape } from '../model';
import { levelSpinIndex, type LevelEnergies, type LevelProvider, type LevelSet } from './levelTypes';
import type { SystemSpecies, SystemState, SystemStateSymmetry } from './systemModel';
import { termLevelProvider } from './termLevels';

/**
 * The level provider of a state. A state without `symmetry` (its species declares no point group)
 * uses the closed-form term values (termLevels.ts), exactly as before; a state with `symmetry`
 * uses the effective Hamiltonians of physics/hamiltonian, diagonalised per J, whose levels carry
 * their symmetry species (LevelSet.species):
 *   - degenerate (E) state: degenerateStateLevels (ζ, etaJ, etaK, q22, q22J, q12);
 *   - inversion-doubled state: inversionStateLevels (s/a components, inv…, eps3, eps3J);
 *   - other nondegenerate states: nondegenerateStateLevels (closed form with species; K = 3n pairs
 *     listed as A1 and A2 levels).
 * Linear molecules always use termLevels (a Π state's q and qJ are closed form).
 * WARNING: the closed-form provider reuses its output buffers; ask for a new one per concurrent use.
 * @param shape the species' rotor shape
 * @param state the state (its degeneracy and symmetry choose the provider)
 */
export function systemStateProvider(shape: TopShape, state: Pick<SystemState, 'isDegenerate' | 'symmetry'>): LevelProvider {
  if (state.symmetry && shape !== 'linear') return hamiltonianLevelProvider(shape, state.isDegenerate, state.symmetry);
  return termLevelProvider(shape, state.isDegenerate);
}

/** The state's constants in the provider's parameterNames order (absent constants 0). */
export function systemStateValues(provider: LevelProvider, state: Pick<SystemState, 'constants'>): Float64Array {
  return Float64Array.from(provider.parameterNames, (n) => state.constants[n] ?? 0);
}

/**
 * Constant names of a state whose levels come from a Hamiltonian provider, in its gradient order:
 * origin, the rotor polynomial to octic order (B, A or C, DJ … HK, LJ … LK), then for a degenerate
 * state zeta, etaJ, etaK, q22, q22J, q12, for an inversion-doubled state inv, inv<constant> … and
 * eps3, eps3J.
 */
export function hamiltonianStateParameterNames(
  shape: 'prolate' | 'oblate',
  isDegenerate: boolean,
  symmetry: Pick<SystemStateSymmetry, 'isInversionDoubled'>,
): string[] {
  if (isDegenerate) return degenerateStateParameterNames(shape);
  if (symmetry.isInversionDoubled) return inversionStateParameterNames(shape);
  return nondegenerateStateParameterNames(shape);
}

/**
 * A LevelProvider over the diagonalising providers of physics/hamiltonian: the same levels as
 * those functions, as columns, with ∂E/∂p (Hellmann–Feynman) in the gradient and the symmetry
 * species in LevelSet.species; componentCount is the level's degeneracy (1 for A, 2 for E).
 * Labels: (K, l = sign(kℓ), tag) as in levelTypes.ts (tags 'A1'/'A2', 's'/'a', "a:A2''").
 */
function hamiltonianLevelProvider(shape: 'prolate' | 'oblate', isDegenerate: boolean, symmetry: SystemStateSymmetry): LevelProvider {
  const parameterNames = hamiltonianStateParameterNames(shape, isDegenerate, symmetry);
  const nP = parameterNames.length;
  const solve = (constants: Record<string, number>, J: number, kTop: number, withDerivatives: boolean): HamiltonianLevelSet => {
    if (isDegenerate)
      return degenerateStateLevels(constants, J, {
        shape,
        pointGroup: symmetry.pointGroup,
        vibSpecies: symmetry.vibSpecies,
        kMax: kTop,
        withDerivatives,
      });
    if (symmetry.isInversionDoubled)
      return inversionStateLevels(constants, J, { shape, vibSpecies: symmetry.vibSpecies as 'A1' | 'A2', kMax: kTop });
    return nondegenerateStateLevels(constants, J, { shape, pointGroup: symmetry.pointGroup, vibSpecies: symmetry.vibSpecies, kMax: kTop });
  };
  const constantsOf = (values: Float64Array): Record<string, number> => {
    const constants: Record<string, number> = {};
    for (let i = 0; i < nP; i++) if (values[i] !== 0) constants[parameterNames[i]] = values[i];
    return constants;
  };
  const levelEnergies = (J: number, values: Float64Array): LevelEnergies => {
    if (isDegenerate) {
      const e = degenerateStateEnergies(constantsOf(values), J, {
        shape,
        pointGroup: symmetry.pointGroup,
        vibSpecies: symmetry.vibSpecies,
      });
      return { count: e.energyCm1.length, energyCm1: e.energyCm1, componentCount: e.degeneracy, species: e.species };
    }
    const set = levels(J, values, J, false);
    return { count: set.count, energyCm1: set.energyCm1, componentCount: set.componentCount, species: set.species! };
  };
  const levels = (J: number, values: Float64Array, kTop: number, withGradient = true): LevelSet => {
    const constants = constantsOf(values);
    const result = solve(constants, J, Math.max(0, Math.min(J, kTop)), withGradient).levels;
    const n = result.length;
    const set: LevelSet = {
      J,
      count: n,
      K: new Int32Array(n),
      l: new Int8Array(n),
      tag: new Array<string>(n),
      energyCm1: new Float64Array(n),
      gradient: new Float64Array(withGradient ? n * nP : 0),
      componentCount: new Uint8Array(n),
      species: new Array<string>(n),
    };
    for (let i = 0; i < n; i++) {
      const lev = result[i];
      set.K[i] = lev.K;
      set.l[i] = lev.l;
      set.tag[i] = lev.tag;
      set.energyCm1[i] = lev.energyCm1;
      set.componentCount[i] = lev.degeneracy;
      set.species![i] = lev.species;
      if (withGradient) set.gradient.set(lev.derivatives, i * nP);
    }
    return set;
  };
  return { parameterNames, isDegenerate, levels, levelEnergies };
}

/**
 * Nuclear-spin weight of level i of a set, per component function (dimensionless): by species
 * (spinWeightsBySymmetry) when the species gives that table and the level carries its symmetry
 * species, else spinWeights[|k − ℓ| mod n] (levelSpinIndex), as before.
 * Source: Herzberg II (1945) ch. I sec. 3 (weights by K); Bunker and Jensen (1998) ch. 8 (by species).
 */
export function systemLevelSpinWeight(
  species: Pick<SystemSpecies, 'spinWeights' | 'spinWeightsBySymmetry'>,
  set: LevelSet,
  i: number,
  isDegenerate: boolean,
): number {
  if (species.spinWeightsBySymmetry && set.species) return species.spinWeightsBySymmetry[set.species[i]] ?? 0;
  return species.spinWeights[levelSpinIndex(set.K[i], set.l[i], isDegenerate) % species.spinWeights.length];
}
