import type { StateCreator } from 'zustand';
import type { FitOutcome } from '../fit/fitTypes';
import type { BandModel } from '../physics/model';
import type { BenchState } from './store';

/** The last fit and the one running. */
export interface FitSlice {
  isFitRunning: boolean;
  /** Iteration and weighted χ² of the running fit. */
  fitProgress: { iteration: number; chi2: number } | null;
  /** Outcome of the last finished fit, or null. */
  fitOutcome: FitOutcome | null;
  /** Assignment ids in the order they were sent (FitResult.lines is in this order). */
  fitLineIds: string[];
  /** When the fit finished (ISO 8601). */
  fitFinishedAt: string | null;
  /** Model in force before the fitted constants were accepted (for "restore previous"). */
  modelBeforeAccept: BandModel | null;
  /** True once the fitted constants were accepted into the model. */
  isFitAccepted: boolean;
}

/** Initial fit state. */
export function fitSliceInitial(): FitSlice {
  return {
    isFitRunning: false,
    fitProgress: null,
    fitOutcome: null,
    fitLineIds: [],
    fitFinishedAt: null,
    modelBeforeAccept: null,
    isFitAccepted: false,
  };
}

/** Slice creator (state only). */
export const createFitSlice: StateCreator<BenchState, [], [], FitSlice> = () => fitSliceInitial();
