/**
 * The only place that creates the contour-fit worker. `contourFitRun` runs contourFit off the main
 * thread, one worker per fit; aborting (or starting another fit) terminates the running worker, which
 * stops the fit at once however long its current evaluation takes.
 */
import type { ContourFitResult } from '../fit/contourFit';
import type { ContourRequest, ContourResponse, ContourWorkerInput } from './contourProtocol';

let running: { worker: Worker; stop: () => void } | null = null;
let nextId = 1;

function abortError(): Error {
  return typeof DOMException === 'function'
    ? new DOMException('The contour fit was cancelled.', 'AbortError')
    : Object.assign(new Error('The contour fit was cancelled.'), { name: 'AbortError' });
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
  running?.stop();
  if (signal?.aborted) return Promise.reject(abortError());
  const worker = new Worker(new URL('./contour.worker.ts', import.meta.url), { type: 'module' });
  const id = nextId++;
  return new Promise<ContourFitResult>((resolve, reject) => {
    const finish = () => {
      if (running?.worker === worker) running = null;
      worker.terminate();
      signal?.removeEventListener('abort', onAbort);
    };
    const onAbort = () => {
      finish();
      reject(abortError());
    };
    worker.onmessage = (event: MessageEvent<ContourResponse>) => {
      const msg = event.data;
      if (msg.id !== id) return;
      if (msg.type === 'progress') onProgress?.(msg.stage, msg.iteration, msg.rms);
      else if (msg.type === 'result') {
        finish();
        resolve(msg.output);
      } else {
        finish();
        reject(new Error(msg.message));
      }
    };
    worker.onerror = (event: ErrorEvent) => {
      finish();
      reject(new Error(`the contour worker failed: ${event.message}`));
    };
    signal?.addEventListener('abort', onAbort);
    running = { worker, stop: onAbort };
    const request: ContourRequest = { type: 'contour', id, input };
    worker.postMessage(request);
  });
}
