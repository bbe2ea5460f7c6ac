import type { StateCreator } from 'zustand';
import type { BandModel } from '../physics/model';
import { MODEL_DEFAULT_FLOATED, modelDefaultDemo } from './modelDefaults';
import type { BenchState } from './store';

/** Point group and vibrational symmetry species from which the band type was derived. */
export interface ModelSymmetry {
  pointGroup: string;
  species: string;
}

/** The band model being edited and the settings of its simulation. */
export interface ModelSlice {
  model: BandModel;
  /** Keys "upper.<name>" / "lower.<name>" of the constants floated in a fit. */
  floated: string[];
  /** Name of the model (untrusted text from a file). */
  modelName: string;
  /** Molecular mass for the Doppler width of the simulated spectrum, amu. */
  massAmu: number;
  /**
   * Where the mass came from: 'default' (never set; used for the simulation only and not written
   * into an exported model file), a model 'file', or typed by the 'user'.
   */
  massSource: MassSource;
  /** Lorentz (pressure) HWHM of the simulated spectrum, cm^-1. */
  lorentzHwhmCm1: number;
  /** Lines weaker than this (strongest = 1) are not drawn or offered. */
  minIntensity: number;
  /** Symmetry the band type was derived from, when the user chose one. */
  symmetry: ModelSymmetry | null;
}

/** Where the molecular mass came from (see ModelSlice.massSource). */
export type MassSource = 'default' | 'file' | 'user';

/** Mass used for the simulation's Doppler width when none was set, amu. */
export const MASS_DEFAULT_AMU = 50;

/** Initial model state (the fallback demo model). */
export function modelSliceInitial(): ModelSlice {
  return {
    model: modelDefaultDemo(),
    floated: [...MODEL_DEFAULT_FLOATED],
    modelName: 'demo molecule (built in)',
    massAmu: MASS_DEFAULT_AMU,
    massSource: 'default',
    lorentzHwhmCm1: 0.004,
    minIntensity: 0.002,
    symmetry: null,
  };
}

/** Slice creator (state only). */
export const createModelSlice: StateCreator<BenchState, [], [], ModelSlice> = () => modelSliceInitial();
