/**
 * The only place that creates the contour worker. `contourFitRun` runs contourFit and
 * `bandShapeClassifyRun` the band-shape diagnosis off the main thread, one worker per job; aborting
 * (or starting another job) terminates the running worker, which stops the job at once however long
 * its current evaluation takes.
 */
import type { BandShapeClassification } from '../analysis/bandShapeClassify';
import type { ContourFitResult } from '../fit/contourFit';
import type { ClassifyWorkerInput, ContourResponse, ContourWorkerInput, ContourWorkerRequest } from './contourProtocol';

let running: { worker: Worker; stop: () => void } | null = null;
let nextId = 1;

function abortError(what: string): Error {
  return typeof DOMException === 'function'
    ? new DOMException(`The ${what} was cancelled.`, 'AbortError')
    : Object.assign(new Error(`The ${what} was cancelled.`), { name: 'AbortError' });
}

// Post one request to a fresh worker; `onMessage` returns the result (settling the promise) or
// undefined for progress.
function workerRun<T>(
  what: string,
  request: (id: number) => ContourWorkerRequest,
  onMessage: (msg: ContourResponse) => { result: T } | undefined,
  signal?: AbortSignal,
): Promise<T> {
  running?.stop();
  if (signal?.aborted) return Promise.reject(abortError(what));
  const worker = new Worker(new URL('./contour.worker.ts', import.meta.url), { type: 'module' });
  const id = nextId++;
  return new Promise<T>((resolve, reject) => {
    const finish = () => {
      if (running?.worker === worker) running = null;
      worker.terminate();
      signal?.removeEventListener('abort', onAbort);
    };
    const onAbort = () => {
      finish();
      reject(abortError(what));
    };
    worker.onmessage = (event: MessageEvent<ContourResponse>) => {
      const msg = event.data;
      if (msg.id !== id) return;
      if (msg.type === 'error') {
        finish();
        reject(new Error(msg.message));
        return;
      }
      const done = onMessage(msg);
      if (done) {
        finish();
        resolve(done.result);
      }
    };
    worker.onerror = (event: ErrorEvent) => {
      finish();
      reject(new Error(`the contour worker failed: ${event.message}`));
    };
    signal?.addEventListener('abort', onAbort);
    running = { worker, stop: onAbort };
    worker.postMessage(request(id));
  });
}

/**
 * Fit a band contour in a worker.
 * @param input contourFit's input (plain data; copied to the worker)
 * @param signal aborting it terminates the worker and rejects with an AbortError
 * @param onProgress called with (stage, iteration, rms absorbance) after every iteration
 * @returns the fit result; rejects with the fit's own message when it refuses
 */
export function contourFitRun(
  input: ContourWorkerInput,
  signal?: AbortSignal,
  onProgress?: (stage: number, iteration: number, rms: number) => void,
): Promise<ContourFitResult> {
  return workerRun<ContourFitResult>(
    'contour fit',
    (id) => ({ type: 'contour', id, input }),
    (msg) => {
      if (msg.type === 'progress') onProgress?.(msg.stage, msg.iteration, msg.rms);
      return msg.type === 'result' ? { result: msg.output } : undefined;
    },
    signal,
  );
}

/**
 * Diagnose a band's shape in a worker (with options.opdCm, a Q-branch series also gets its contour fit
 * for B, several seconds).
 * @param signal aborting it terminates the worker and rejects with an AbortError
 * @param onProgress called with (runs done, runs planned) after each run of the contour fit
 * @returns the diagnosis; rejects with bandShapeClassify's own message when it refuses
 */
export function bandShapeClassifyRun(
  input: ClassifyWorkerInput,
  signal?: AbortSignal,
  onProgress?: (runsDone: number, runsPlanned: number) => void,
): Promise<BandShapeClassification> {
  return workerRun<BandShapeClassification>(
    'band-shape diagnosis',
    (id) => ({ type: 'classify', id, input }),
    (msg) => {
      if (msg.type === 'classify-progress') onProgress?.(msg.runsDone, msg.runsPlanned);
      return msg.type === 'classify-result' ? { result: msg.output } : undefined;
    },
    signal,
  );
}
