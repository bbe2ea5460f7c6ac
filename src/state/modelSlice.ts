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
  /** Lorentz (pressure) HWHM of the simulated spectrum, cm^-1. */
  lorentzHwhmCm1: number;
  /** Lines weaker than this (strongest = 1) are not drawn or offered. */
  minIntensity: number;
  /** Symmetry the band type was derived from, when the user chose one. */
  symmetry: ModelSymmetry | null;
}

/** Initial model state (the fallback demo model). */
export function modelSliceInitial(): ModelSlice {
  return {
    model: modelDefaultDemo(),
    floated: [...MODEL_DEFAULT_FLOATED],
    modelName: 'demo molecule (built in)',
    massAmu: 50,
    lorentzHwhmCm1: 0.004,
    minIntensity: 0.002,
    symmetry: null,
  };
}

/** Slice creator (state only). */
export const createModelSlice: StateCreator<BenchState, [], [], ModelSlice> = () => modelSliceInitial();
