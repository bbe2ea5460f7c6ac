/**
 * The multi-band model: species (molecules or isotopologues) → vibrational states → bands.
 * Plain serialisable data; energies in cm^-1, temperature in K.
 *
 * A state's constants are kept by name (see termLevelParameterNames): `origin` is its vibrational
 * term value above the species' lowest state (0 for that state), the others as in the single-band
 * model. A band joins an upper and a lower state of the same species; its type (ΔK = 0 or ±1)
 * follows from the states' degeneracy (bandRules.systemBandType).
 */
import type { TopShape } from '../model';
import type { RovibPointGroup } from '../hamiltonian/rovibSymmetry';

/**
 * How the levels of a state of a species with a declared point group are computed: by the
 * effective Hamiltonians of physics/hamiltonian (each level then carries its symmetry species).
 */
export interface SystemStateSymmetry {
  /** The species' molecular symmetry group (C3v(M) or D3h(M)). */
  pointGroup: RovibPointGroup;
  /**
   * Species of the vibrational state: A1, A2 or E in C3v; A1', A2', A1'', A2'', E' or E'' in D3h;
   * for an inversion-doubled state the C3v species of the s/a pair (A1 or A2).
   */
  vibSpecies: string;
  /** Inversion-doubled state of a pyramidal XY3 top (s and a components; pointGroup D3h). */
  isInversionDoubled: boolean;
}

/** One vibrational state of a species. */
export interface SystemState {
  name: string;
  /** Degenerate (ℓ = ±1: E of a symmetric top, Π of a linear molecule). */
  isDegenerate: boolean;
  /** Constants by name (cm^-1; ζ dimensionless); an absent constant is 0. */
  constants: Record<string, number>;
  /**
   * Present when the species declares a point group: the levels then come from a diagonalised
   * effective Hamiltonian with symmetry species (systemStateLevels.ts); absent: closed-form term values.
   */
  symmetry?: SystemStateSymmetry;
}

/** One band: a transition between two states of a species. */
export interface SystemBand {
  name: string;
  /** Name of the upper state. */
  upper: string;
  /** Name of the lower state. */
  lower: string;
  /** Relative band strength (square of the vibrational transition moment, arbitrary units shared by the species' bands). */
  strength: number;
  /**
   * Sign of the band's vibrational transition moment relative to the other bands from the same
   * lower state (+1 when absent); matters only where coupled upper states mix (intensity borrowing,
   * physics/interaction).
   */
  momentSign?: 1 | -1;
}

/** An interaction between two states of a species (physics/interaction, DEVELOPERS.md "Interacting states"). */
export interface SystemInteraction {
  /** Name, unique among the species' states and interactions; its constants' keys are `<name>.<constant>`. */
  name: string;
  type: 'coriolis' | 'fermi';
  /** The two states it joins. */
  states: [string, string];
  /** Constants by name (cm^-1); an absent constant is 0. */
  constants: Record<string, number>;
}

/** A molecule or isotopologue. */
export interface SystemSpecies {
  name: string;
  shape: TopShape;
  /** Mass, amu (for Doppler widths); optional. */
  massAmu?: number;
  /** Relative abundance (multiplies every band of the species). */
  abundance: number;
  /** Nuclear-spin weights, g = spinWeights[|k − ℓ| mod n] (levelTypes.levelSpinIndex). */
  spinWeights: number[];
  /** The molecular symmetry group, when declared (its states then carry `symmetry`). */
  pointGroup?: RovibPointGroup;
  /**
   * Nuclear-spin weights per rovibrational species, per component function (an E level counts
   * twice; hamiltonian/spinStatistics.ts), complete over the group's species. When present it
   * replaces spinWeights; needs pointGroup.
   */
  spinWeightsBySymmetry?: Record<string, number>;
  states: SystemState[];
  bands: SystemBand[];
  /** Interactions between states; the states they join are diagonalised together per J. */
  interactions?: SystemInteraction[];
}

/** The whole model of a session or system file. */
export interface SystemModel {
  /** Temperature, K (rotational and vibrational). */
  temperatureK: number;
  /** Largest lower-state J'' enumerated. */
  jMax: number;
  /** Largest lower-state K'' enumerated (ignored for linear molecules). */
  kMax: number;
  species: SystemSpecies[];
}

/** The state of a species by name, or a thrown Error naming the species and band. */
export function systemStateFind(species: SystemSpecies, name: string): SystemState {
  const s = species.states.find((st) => st.name === name);
  if (!s) throw new Error(`systemStateFind: species '${species.name}' has no state '${name}'`);
  return s;
}
