/**
 * Messages between solverClient and solver.worker: plain serialisable data only
 * (structured clone), discriminated by `type`, matched by `id`.
 */
import type { FitInput, FitOutcome } from '../fit/fitTypes';
import type { SystemFitInput } from '../fit/systemFit';
import type { SystemFitOutcome } from '../fit/systemFitTypes';

/** Client → worker: run a fit. */
export interface FitRequest {
  type: 'fit';
  id: number;
  input: FitInput;
}

/** Client → worker: run a joint fit of several bands. */
export interface SystemFitRequest {
  type: 'systemFit';
  id: number;
  input: SystemFitInput;
}

/** Worker → client: one iteration done. */
export interface FitProgress {
  type: 'progress';
  id: number;
  /** 1-based iteration number. */
  iteration: number;
  /** Weighted χ² after it (dimensionless). */
  chi2: number;
}

/** Worker → client: the fit finished (a refusal is a result too, with ok: false). */
export interface FitResultMessage {
  type: 'result';
  id: number;
  output: FitOutcome | SystemFitOutcome;
}

/** Worker → client: the fit threw (a bug, not a refusal). */
export interface FitErrorMessage {
  type: 'error';
  id: number;
  message: string;
}

/** Every message the worker receives. */
export type SolverRequest = FitRequest | SystemFitRequest;

/** Every message the worker sends. */
export type SolverResponse = FitProgress | FitResultMessage | FitErrorMessage;
