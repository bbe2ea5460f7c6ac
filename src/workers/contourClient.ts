/**
 * The only place that creates the contour worker. `contourFitRun` runs contourFit and
 * `bandShapeClassifyRun` the band-shape diagnosis off the main thread, one job per worker at a time
 * (a worker whose job ended is kept for the next job of its kind); aborting (or starting another job
 * of the same kind) terminates the running worker, which stops the job at once however long its
 * current evaluation takes. A fit and a diagnosis run side by side: diagnosing
 * another region while a fit runs does not stop the fit.
 */
import type { BandShapeClassification } from '../analysis/bandShapeClassify';
import { axisRegionIndices } from '../physics/axisRegion';
import type { ContourFitResult } from '../fit/contourFit';
import type { ClassifyWorkerInput, ContourResponse, ContourWorkerInput, ContourWorkerRequest } from './contourProtocol';

/** The two kinds of job; one of each may run at a time. */
type JobKind = 'fit' | 'diagnosis';
const running: Record<JobKind, { worker: Worker; stop: () => void } | null> = { fit: null, diagnosis: null };
// A worker whose job ended (answered, or refused with a message) waits here for the next job of its
// kind: a fresh worker loads its module and compiles the code again, which made a diagnosis that
// takes 0.3 s in a warm worker take 0.85–0.9 s from the click. One stopped mid-job is terminated.
const idle: Record<JobKind, Worker | null> = { fit: null, diagnosis: null };
let nextId = 1;

function abortError(what: string): Error {
  return typeof DOMException === 'function'
    ? new DOMException(`The ${what} was cancelled.`, 'AbortError')
    : Object.assign(new Error(`The ${what} was cancelled.`), { name: 'AbortError' });
}

// Post one request to the kind's idle worker or a fresh one; `onMessage` returns the result (settling
// the promise) or undefined for progress.
function workerRun<T>(
  kind: JobKind,
  what: string,
  request: (id: number) => ContourWorkerRequest,
  onMessage: (msg: ContourResponse) => { result: T } | undefined,
  signal?: AbortSignal,
): Promise<T> {
  running[kind]?.stop();
  if (signal?.aborted) return Promise.reject(abortError(what));
  const worker = idle[kind] ?? new Worker(new URL('./contour.worker.ts', import.meta.url), { type: 'module' });
  idle[kind] = null;
  const id = nextId++;
  return new Promise<T>((resolve, reject) => {
    // The job is over: the worker is kept for the next job of its kind when it answered, else terminated.
    const finish = (isAnswered: boolean) => {
      if (running[kind]?.worker === worker) running[kind] = null;
      worker.onmessage = null;
      worker.onerror = null;
      if (isAnswered && !idle[kind]) idle[kind] = worker;
      else worker.terminate();
      signal?.removeEventListener('abort', onAbort);
    };
    const onAbort = () => {
      finish(false);
      reject(abortError(what));
    };
    worker.onmessage = (event: MessageEvent<ContourResponse>) => {
      const msg = event.data;
      if (msg.id !== id) return;
      if (msg.type === 'error') {
        finish(true);
        reject(new Error(msg.message));
        return;
      }
      const done = onMessage(msg);
      if (done) {
        finish(true);
        resolve(done.result);
      }
    };
    worker.onerror = (event: ErrorEvent) => {
      finish(false);
      reject(new Error(`the contour worker failed: ${event.message}`));
    };
    signal?.addEventListener('abort', onAbort);
    running[kind] = { worker, stop: onAbort };
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
    'fit',
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
 * for B, several seconds). A diagnosis already running is stopped; a contour fit is not.
 * @param input the trace may be the region alone (classifyInputOf): bandShapeClassify reads no point outside it
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
    'diagnosis',
    'band-shape diagnosis',
    (id) => ({ type: 'classify', id, input }),
    (msg) => {
      if (msg.type === 'classify-progress') onProgress?.(msg.runsDone, msg.runsPlanned);
      return msg.type === 'classify-result' ? { result: msg.output } : undefined;
    },
    signal,
  );
}

/**
 * The trace's points inside a region, ends included (axisRegionIndices): contourFit and
 * bandShapeClassify read no others, so a 1e6-point trace is not copied to the worker for a band of 2,000.
 * @param fromCm1 region start, cm^-1
 * @param toCm1 region end, cm^-1
 */
export function traceRegion(
  trace: { wavenumberCm1: Float64Array; absorbance: Float64Array },
  fromCm1: number,
  toCm1: number,
): { wavenumberCm1: Float64Array; absorbance: Float64Array } {
  const [i0, i1] = axisRegionIndices(trace.wavenumberCm1, fromCm1, toCm1);
  return { wavenumberCm1: trace.wavenumberCm1.slice(i0, i1), absorbance: trace.absorbance.slice(i0, i1) };
}

/** The diagnosis request for a region of a trace, carrying only the points inside it (traceRegion). */
export function classifyInputOf(
  trace: { wavenumberCm1: Float64Array; absorbance: Float64Array },
  fromCm1: number,
  toCm1: number,
  options: ClassifyWorkerInput['options'],
): ClassifyWorkerInput {
  return { ...traceRegion(trace, fromCm1, toCm1), fromCm1, toCm1, options };
}
