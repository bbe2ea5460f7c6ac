import type { StateCreator } from 'zustand';
import type { PeakList } from '../analysis/peaksFind';
import type { Trace } from '../io/trace';
import type { BenchState } from './store';

/** Peaks found (in the analysis worker) for one trace and one set of settings. */
export interface PeaksResult {
  /** The trace (by identity) the peaks belong to. */
  trace: Trace;
  minSnr: number;
  baseline: boolean;
  peaks: PeakList | null;
  /** peaksFind's message when it refused the trace, else null. */
  error: string | null;
}

/** Results of background analysis; derived data, never saved or undone. */
export interface AnalysisSlice {
  /** The latest peak-finding result (may belong to an older trace: selectPeaks checks). */
  peaksResult: PeaksResult | null;
  /** True once peak finding runs in the worker (else selectPeaks computes on the spot). */
  isPeaksInWorker: boolean;
}

/** Initial analysis state. */
export function analysisSliceInitial(): AnalysisSlice {
  return { peaksResult: null, isPeaksInWorker: false };
}

export const createAnalysisSlice: StateCreator<BenchState, [], [], AnalysisSlice> = () => analysisSliceInitial();
