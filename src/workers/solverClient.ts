/**
 * The only place that creates the solver worker. `solverFit` runs a band fit off the main
 * thread; aborting (or starting another fit) terminates the running worker, so a long fit
 * never blocks the next one.
 */
import type { FitInput, FitOutcome } from '../fit/fitTypes';
import type { SystemFitInput } from '../fit/systemFit';
import type { SystemFitOutcome } from '../fit/systemFitTypes';
import type { SolverRequest, SolverResponse } from './protocol';

interface Running {
  id: number;
  worker: Worker;
  reject: (reason: unknown) => void;
  cleanup: () => void;
}

let running: Running | null = null;
/** A worker that finished its last fit normally is kept for the next one (saves start-up). */
let idle: Worker | null = null;
let nextId = 1;

function abortError(): Error {
  // DOMException is what fetch and friends reject with; fall back where it does not exist.
  return typeof DOMException === 'function'
    ? new DOMException('The fit was aborted.', 'AbortError')
    : Object.assign(new Error('The fit was aborted.'), { name: 'AbortError' });
}

function stopRunning(): void {
  if (!running) return;
  const r = running;
  running = null;
  r.cleanup();
  r.worker.terminate();
  r.reject(abortError());
}

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
  stopRunning();
  if (signal?.aborted) return Promise.reject(abortError());
  const worker = idle ?? new Worker(new URL('./solver.worker.ts', import.meta.url), { type: 'module' });
  idle = null;
  const id = nextId++;
  return new Promise<O>((resolve, reject) => {
    const finish = (isHealthy: boolean) => {
      if (running?.id === id) running = null;
      cleanup();
      if (isHealthy && !idle) idle = worker;
      else worker.terminate();
    };
    const onMessage = (event: MessageEvent<SolverResponse>) => {
      const msg = event.data;
      if (msg.id !== id) return;
      if (msg.type === 'progress') onProgress?.(msg.iteration, msg.chi2);
      else if (msg.type === 'result') {
        finish(true);
        resolve(msg.output as O);
      } else if (msg.type === 'error') {
        finish(false);
        reject(new Error(`solverFit: ${msg.message}`));
      }
    };
    const onError = (event: ErrorEvent) => {
      finish(false);
      reject(new Error(`solverFit: worker failed: ${event.message}`));
    };
    const onAbort = () => {
      if (running?.id === id) stopRunning();
    };
    const cleanup = () => {
      worker.removeEventListener('message', onMessage);
      worker.removeEventListener('error', onError);
      signal?.removeEventListener('abort', onAbort);
    };
    worker.addEventListener('message', onMessage);
    worker.addEventListener('error', onError);
    signal?.addEventListener('abort', onAbort);
    running = { id, worker, reject, cleanup };
    worker.postMessage(requestOf(id));
  });
}
