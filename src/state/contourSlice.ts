import type { StateCreator } from 'zustand';
import type { BandShapeClassification } from '../analysis/bandShapeClassify';
import type { ContourFitResult } from '../fit/contourFit';
import type { QBranchFitResult } from '../fit/qBranchFit';
import type { Trace } from '../io/trace';
import type { ApodizationName } from '../physics/instrumentLineShape';
import type { BenchState } from './store';

/** A Q-branch maximum on the unresolved-band tab, with the sub-band index the user gave it. */
export interface ContourQMaximum {
  wavenumberCm1: number;
  sigmaCm1: number;
  prominence: number;
  /** Signed sub-band index (K″ for ^rQ, −K″ for ^pQ), null when not used in the fit. */
  m: number | null;
  /** True while m is the ladder's proposal the user has not confirmed or changed. */
  isGuess: boolean;
}

/** State of the running or last contour fit. */
export interface ContourFitState {
  status: 'idle' | 'running' | 'done' | 'cancelled' | 'error';
  stage: number;
  iteration: number;
  /** rms of the last iteration, absorbance. */
  rms: number;
  result: ContourFitResult | null;
  error: string | null;
  /** The trace the result was fitted to (the result is drawn only while it is the current trace). */
  trace: Trace | null;
}

/** State of the running or last diagnosis through the instrument (the Q-series contour fit for B, in its worker). */
export interface ContourRefineState {
  status: 'idle' | 'running' | 'cancelled' | 'error';
  /** Contour-fit runs done and about how many there will be. */
  runsDone: number;
  runsPlanned: number;
  error: string | null;
}

/** The unresolved-band tab: region, instrument, diagnosis, contour fit and Q-branch analysis. */
export interface ContourSlice {
  /** Region analysed, cm^-1; null = the whole trace. */
  contourRegion: [number, number] | null;
  /** Maximum optical path difference of the spectrometer, cm. */
  contourOpdCm: number;
  contourApodization: ApodizationName;
  contourDiagnosis: BandShapeClassification | null;
  /** Why the last diagnosis was refused. */
  contourDiagnosisError: string | null;
  /** A diagnosis (contourDiagnose) is running in the worker. */
  contourDiagnosing: boolean;
  /** The diagnosis through the instrument (contourDiagnoseThroughInstrument). */
  contourRefine: ContourRefineState;
  contourFit: ContourFitState;
  contourQMaxima: ContourQMaximum[];
  contourQFit: QBranchFitResult | null;
  contourQFitError: string | null;
}

/** Initial state of the tab. */
export function contourSliceInitial(): ContourSlice {
  return {
    contourRegion: null,
    contourOpdCm: 1,
    contourApodization: 'boxcar',
    contourDiagnosis: null,
    contourDiagnosisError: null,
    contourDiagnosing: false,
    contourRefine: { status: 'idle', runsDone: 0, runsPlanned: 0, error: null },
    contourFit: { status: 'idle', stage: 0, iteration: 0, rms: NaN, result: null, error: null, trace: null },
    contourQMaxima: [],
    contourQFit: null,
    contourQFitError: null,
  };
}

/** Slice creator (state only; actions in actionsContour.ts). */
export const createContourSlice: StateCreator<BenchState, [], [], ContourSlice> = () => contourSliceInitial();
