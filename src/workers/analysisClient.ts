/**
 * The only place that starts the analysis worker. One worker is kept while requests finish normally;
 * a new request aborts the one in flight by terminating its worker (peaksFind runs without yielding,
 * so a message could not stop it) and starting a fresh one.
 */
import type { PeakList, PeaksFindOptions } from '../analysis/peaksFind';
import type { Trace } from '../io/trace';
import type { AnalysisPeaksRequest, AnalysisWorkerResponse } from './analysisProtocol';

let nextId = 1;
let worker: Worker | null = null;
let pending: { id: number; reject: (reason: unknown) => void } | null = null;

function abortError(signal?: AbortSignal): unknown {
  return signal?.reason ?? new DOMException('peak finding aborted', 'AbortError');
}

function workerDrop(): void {
  worker?.terminate();
  worker = null;
}

/** True where a worker can run the analysis (browsers); false in Node tests and the CLI. */
export function analysisWorkerAvailable(): boolean {
  return typeof Worker !== 'undefined';
}

/**
 * Find the peaks of a trace in the worker (same result as `peaksFind` from src/analysis).
 * The trace columns are copied and the copies transferred, so the caller's arrays stay usable.
 * A second call aborts the first (its promise rejects with an AbortError).
 * @param trace wavenumbers (cm^-1, ascending) and absorbance
 * @param options see `PeaksFindOptions`
 * @param signal aborting terminates the worker and rejects with the signal's reason
 * @returns the peak list; rejects with peaksFind's message on bad input
 */
export function analysisPeaksFind(trace: Trace, options: PeaksFindOptions, signal?: AbortSignal): Promise<PeakList> {
  if (signal?.aborted) return Promise.reject(abortError(signal));
  if (pending) {
    const old = pending;
    pending = null;
    workerDrop();
    old.reject(abortError());
  }
  return new Promise<PeakList>((resolve, reject) => {
    const id = nextId++;
    const w = (worker ??= new Worker(new URL('./analysis.worker.ts', import.meta.url), { type: 'module' }));
    const done = () => {
      signal?.removeEventListener('abort', onAbort);
      if (pending?.id === id) pending = null;
    };
    const onAbort = () => {
      if (pending?.id !== id) return;
      done();
      workerDrop();
      reject(abortError(signal));
    };
    signal?.addEventListener('abort', onAbort, { once: true });
    pending = { id, reject: (reason) => (done(), reject(reason)) };
    w.onmessage = (event: MessageEvent<AnalysisWorkerResponse>) => {
      const msg = event.data;
      if (!msg || msg.id !== id) return;
      done();
      if (msg.type === 'peaks-result') resolve(msg.peaks);
      else reject(new Error(msg.message));
    };
    w.onerror = (event: ErrorEvent) => {
      done();
      workerDrop();
      reject(new Error(`analysis worker failed: ${event.message || 'unknown error'}`));
    };
    const x = trace.wavenumberCm1.slice();
    const y = trace.absorbance.slice();
    const request: AnalysisPeaksRequest = { type: 'peaks', id, wavenumberCm1: x, absorbance: y, options };
    w.postMessage(request, [x.buffer, y.buffer]);
  });
}
