/**
 * Messages between contourClient and contour.worker: plain serialisable data only (structured
 * clone), discriminated by `type`, matched by `id`.
 */
import type { BandShapeClassification, BandShapeClassifyOptions } from '../analysis/bandShapeClassify';
import type { ContourFitInput, ContourFitResult } from '../fit/contourFit';

/** What the page sends: contourFit's input without its callbacks. */
export type ContourWorkerInput = Omit<ContourFitInput, 'onProgress' | 'shouldCancel'>;

/** Client → worker: run a contour fit. */
export interface ContourRequest {
  type: 'contour';
  id: number;
  input: ContourWorkerInput;
}

/** Worker → client: one iteration of one stage done; rms in absorbance. */
export interface ContourProgress {
  type: 'progress';
  id: number;
  stage: number;
  iteration: number;
  rms: number;
}

/** Worker → client: the fit finished. */
export interface ContourResultMessage {
  type: 'result';
  id: number;
  output: ContourFitResult;
}

/** Worker → client: the fit refused or failed (message says what and where). */
export interface ContourErrorMessage {
  type: 'error';
  id: number;
  message: string;
}

/** What the page sends for a band-shape diagnosis: bandShapeClassify's arguments without the callback. */
export interface ClassifyWorkerInput {
  /** Trace axis, ascending, cm^-1. */
  wavenumberCm1: Float64Array;
  absorbance: Float64Array;
  /** Region, cm^-1. */
  fromCm1: number;
  toCm1: number;
  options: Omit<BandShapeClassifyOptions, 'onProgress'>;
}

/** Client → worker: diagnose a band's shape (with opdCm, also the Q-series contour fit for B). */
export interface ClassifyRequest {
  type: 'classify';
  id: number;
  input: ClassifyWorkerInput;
}

/** Worker → client: one run of the Q-series contour fit done, of about runsPlanned. */
export interface ClassifyProgress {
  type: 'classify-progress';
  id: number;
  runsDone: number;
  runsPlanned: number;
}

/** Worker → client: the diagnosis. */
export interface ClassifyResultMessage {
  type: 'classify-result';
  id: number;
  output: BandShapeClassification;
}

/** Every request the worker understands. */
export type ContourWorkerRequest = ContourRequest | ClassifyRequest;

/** Every message the worker sends. */
export type ContourResponse = ContourProgress | ContourResultMessage | ClassifyProgress | ClassifyResultMessage | ContourErrorMessage;
