import type { StateCreator } from 'zustand';
import type { AxisCalibration } from '../analysis/calibrationFit';
import type { Trace, TraceImportReport } from '../io/trace';
import type { TraceImportOptions } from '../io/traceImportOptions';
import type { BenchState } from './store';

/** Where the current trace came from. */
export type TraceSource = 'demo' | 'simulated-demo' | 'file' | 'project' | 'none';

/** An import in progress (the current trace stays until it succeeds). */
export interface TraceImportProgress {
  /** File name being read (untrusted text, render as text only). */
  fileName: string;
  /** Fraction done, 0..1. */
  fraction: number;
}

/** The measured trace and how it was read. */
export interface SpectrumSlice {
  /** Ascending wavenumbers (cm^-1) and absorbance; null before anything is loaded. */
  trace: Trace | null;
  /** What the importer detected and did (file name, format, units, skipped rows …). */
  traceReport: TraceImportReport | null;
  traceSource: TraceSource;
  /** Overrides used for the current trace (shown and editable; re-import applies them). */
  importOverrides: Partial<TraceImportOptions>;
  /** The import running now, or null. */
  traceImport: TraceImportProgress | null;
  /** Smallest peak height in noise σ for peak finding. */
  peakMinSnr: number;
  /** Subtract a smooth baseline before peak finding. */
  peakBaseline: boolean;
  /** Calibration applied to the trace axis since it was read (null: axis as in the file). */
  traceCalibration: AxisCalibration | null;
}

/** Initial spectrum state. */
export function spectrumSliceInitial(): SpectrumSlice {
  return {
    trace: null,
    traceReport: null,
    traceSource: 'none',
    importOverrides: {},
    traceImport: null,
    peakMinSnr: 5,
    peakBaseline: false,
    traceCalibration: null,
  };
}

/** Slice creator (state only; actions are module-level functions in actions*.ts). */
export const createSpectrumSlice: StateCreator<BenchState, [], [], SpectrumSlice> = () => spectrumSliceInitial();
