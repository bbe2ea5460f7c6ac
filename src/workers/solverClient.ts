/**
 * The only place that creates the solver worker. `solverFit` runs a band fit off the main
 * thread; aborting (or starting another fit) terminates the running worker, so a long fit
 * never blocks the next one.
 */
import type { FitInput, FitOutcome } from '../fit/fitTypes';
import type { SystemFitInput } from '../fit/systemFit';
import type { SystemFitOutcome } from '../fit/systemFitTypes';
import type { SolverRequest, SolverResponse } from './protocol';
import { workerJobsCreate } from './workerJobs';

const jobs = workerJobsCreate(() => new Worker(new URL('./solver.worker.ts', import.meta.url), { type: 'module' }), 'The fit was aborted.');

/**
 * Fit a band in the worker.
 * @param input fit input (plain data; copied to the worker)
 * @param signal aborting it terminates the worker and rejects with an AbortError
 * @param onProgress called with (iteration, χ²) after every iteration
 * @returns the FitOutcome (a refused fit resolves with ok: false; only bugs and aborts reject)
 */
export function solverFit(
  input: FitInput,
  signal?: AbortSignal,
  onProgress?: (iteration: number, chi2: number) => void,
): Promise<FitOutcome> {
  return solverRun<FitOutcome>((id) => ({ type: 'fit', id, input }), signal, onProgress);
}

/**
 * The joint fit of several bands (fit/systemFit) in the worker; same contract as solverFit.
 * @param input system, parameters and labelled lines (plain data; copied to the worker)
 */
export function solverSystemFit(
  input: SystemFitInput,
  signal?: AbortSignal,
  onProgress?: (iteration: number, chi2: number) => void,
): Promise<SystemFitOutcome> {
  return solverRun<SystemFitOutcome>((id) => ({ type: 'systemFit', id, input }), signal, onProgress);
}

function solverRun<O>(
  requestOf: (id: number) => SolverRequest,
  signal: AbortSignal | undefined,
  onProgress: ((iteration: number, chi2: number) => void) | undefined,
): Promise<O> {
  return jobs.run<O>(
    requestOf,
    (message) => {
      const msg = message as SolverResponse;
      if (msg.type === 'progress') onProgress?.(msg.iteration, msg.chi2);
      else if (msg.type === 'result') return { output: msg.output };
      else if (msg.type === 'error') return { error: new Error(`solverFit: ${msg.message}`), isWorkerHealthy: false };
      return null;
    },
    (message) => new Error(`solverFit: worker failed: ${message}`),
    signal,
  );
}
