import { SECOND_RADIATION_CM_K } from '../constants';
import type { LevelProvider } from './levelTypes';
import type { SystemSpecies, SystemState } from './systemModel';
import { systemLevelSpinWeight, systemStateProvider, systemStateValues } from './systemStateLevels';

/**
 * Vibrational degeneracy of a state: 2 for a degenerate (ℓ = ±1) state, 1 otherwise.
 * Source: Herzberg II (1945) ch. V (statistical weight of a degenerate vibrational level).
 */
export function stateVibrationalDegeneracy(state: Pick<SystemState, 'isDegenerate'>): number {
  return state.isDegenerate ? 2 : 1;
}

/**
 * Vibrational partition function over the species' listed states, dimensionless:
 *   Q_vib = Σ_v g_v exp(−c2 G_v / T),
 * with G_v the state's `origin` (0 for the lowest state), g_v its vibrational degeneracy.
 * WARNING: states absent from the model do not enter; with low-lying levels missing Q_vib is too
 * small (the relative sizes of the species' own bands do not depend on it).
 * Source: Herzberg II (1945) ch. V, eq. (V,12)–(V,13) (from memory: Q_v = Σ g_v exp(−G_v hc/kT)).
 * @param species the species (origins in cm^-1)
 * @param temperatureK temperature, K
 */
export function vibrationalPartitionFunction(species: Pick<SystemSpecies, 'states'>, temperatureK: number): number {
  if (!(temperatureK > 0)) throw new Error(`vibrationalPartitionFunction: temperatureK must be > 0, got ${temperatureK}`);
  let q = 0;
  for (const s of species.states)
    q += stateVibrationalDegeneracy(s) * Math.exp((-SECOND_RADIATION_CM_K * (s.constants.origin ?? 0)) / temperatureK);
  return q;
}

/**
 * Population fraction of a vibrational state: g_v exp(−c2 G_v/T) / Q_vib (dimensionless).
 * Source: Boltzmann distribution, Herzberg II (1945) ch. V.
 */
export function vibrationalPopulation(species: Pick<SystemSpecies, 'states'>, stateName: string, temperatureK: number): number {
  const s = species.states.find((st) => st.name === stateName);
  if (!s) throw new Error(`vibrationalPopulation: no state '${stateName}'`);
  return (
    (stateVibrationalDegeneracy(s) * Math.exp((-SECOND_RADIATION_CM_K * (s.constants.origin ?? 0)) / temperatureK)) /
    vibrationalPartitionFunction(species, temperatureK)
  );
}

/** Options of speciesPartitionFunction. */
export interface SpeciesPartitionOptions {
  /** Stop a state's sum when a whole J shell adds less than this fraction. @default 1e-12 */
  tolerance?: number;
  /** Hard limit on J. @default 2000 */
  jLimit?: number;
}

/**
 * Rovibrational partition function of a species over its listed states, by direct summation of
 * its levels, dimensionless:
 *   Q = Σ_states Σ_J Σ_levels (2J+1) n g exp(−c2 E/T),
 * E the level energy including the state's origin (cm^-1), n its component count, g its
 * nuclear-spin weight. For one nondegenerate state this is physics/partitionFunction's sum.
 * Source: Herzberg II (1945) ch. V, eq. (V,14) (symmetric-top partition function), extended to
 * the degenerate levels' components.
 */
export function speciesPartitionFunction(species: SystemSpecies, temperatureK: number, options: SpeciesPartitionOptions = {}): number {
  const tol = options.tolerance ?? 1e-12;
  const jLimit = options.jLimit ?? 2000;
  const c2OverT = SECOND_RADIATION_CM_K / temperatureK;
  let q = 0;
  for (const state of species.states) {
    const provider: LevelProvider = systemStateProvider(species.shape, state);
    const values = systemStateValues(provider, state);
    let qState = 0;
    let previousShellEnergy = -Infinity;
    // Weights by species need no labels: the provider's unlabelled energies are enough (and faster).
    const unlabelled = species.spinWeightsBySymmetry !== undefined && provider.levelEnergies !== undefined;
    for (let J = 0; J <= jLimit; J++) {
      if (unlabelled) {
        const e = provider.levelEnergies!(J, values);
        const table = species.spinWeightsBySymmetry!;
        let shell = 0;
        let eMin = Infinity;
        for (let i = 0; i < e.count; i++) {
          shell += (table[e.species[i]] ?? 0) * e.componentCount[i] * Math.exp(-c2OverT * e.energyCm1[i]);
          eMin = Math.min(eMin, e.energyCm1[i]);
        }
        shell *= 2 * J + 1;
        if (e.count > 0 && eMin < previousShellEnergy) break;
        if (e.count > 0) previousShellEnergy = eMin;
        qState += shell;
        if (J > 10 && shell < tol * qState) break;
        continue;
      }
      const set = provider.levels(J, values, J, false);
      let shell = 0;
      let eMin = Infinity;
      for (let i = 0; i < set.count; i++) {
        const g = systemLevelSpinWeight(species, set, i, provider.isDegenerate);
        shell += g * set.componentCount[i] * Math.exp(-c2OverT * set.energyCm1[i]);
        eMin = Math.min(eMin, set.energyCm1[i]);
      }
      shell *= 2 * J + 1;
      // Distortion terms that turn the levels over at very high J end the sum (as partitionFunction does).
      if (set.count > 0 && eMin < previousShellEnergy) break;
      if (set.count > 0) previousShellEnergy = eMin;
      qState += shell;
      if (J > 10 && shell < tol * qState) break;
    }
    q += qState;
  }
  return q;
}
