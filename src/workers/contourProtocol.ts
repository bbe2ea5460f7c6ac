/**
 * Messages between contourClient and contour.worker: plain serialisable data only (structured
 * clone), discriminated by `type`, matched by `id`.
 */
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

/** Every message the worker sends. */
export type ContourResponse = ContourProgress | ContourResultMessage | ContourErrorMessage;
