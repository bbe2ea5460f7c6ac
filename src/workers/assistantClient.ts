/**
 * The only place that starts the assistant worker. One job at a time: starting another, or
 * aborting, terminates the running worker (the loop runs without yielding, so a message could not
 * stop it) and rejects its promise with an AbortError; nothing it computed reaches the page.
 */
import { assistantJobRun, type AssistantJobProgress } from './assistantJob';
import type { AssistantJob, AssistantJobOutput, AssistantWorkerRequest, AssistantWorkerResponse } from './assistantProtocol';

let running: { id: number; worker: Worker; reject: (reason: unknown) => void; cleanup: () => void } | null = null;
/** A worker that finished its last job normally is kept for the next one (saves start-up). */
let idle: Worker | null = null;
let nextId = 1;

function abortError(): Error {
  return typeof DOMException === 'function'
    ? new DOMException('The assistant was cancelled.', 'AbortError')
    : Object.assign(new Error('The assistant was cancelled.'), { name: 'AbortError' });
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
 * Run an assistant job in the worker (on the calling thread where there is no Worker: Node, tests).
 * @param job the job (plain data; copied to the worker)
 * @param signal aborting it terminates the worker and rejects with an AbortError
 * @param onProgress called once per round of the loop
 * @returns the job's output; rejects with the assistant's message on bad input
 */
export function assistantJobStart(job: AssistantJob, signal?: AbortSignal, onProgress?: AssistantJobProgress): Promise<AssistantJobOutput> {
  stopRunning();
  if (signal?.aborted) return Promise.reject(abortError());
  if (typeof Worker === 'undefined') {
    try {
      return Promise.resolve(assistantJobRun(job, onProgress));
    } catch (err) {
      return Promise.reject(err);
    }
  }
  const worker = idle ?? new Worker(new URL('./assistant.worker.ts', import.meta.url), { type: 'module' });
  idle = null;
  const id = nextId++;
  return new Promise<AssistantJobOutput>((resolve, reject) => {
    const finish = (isHealthy: boolean) => {
      if (running?.id === id) running = null;
      cleanup();
      if (isHealthy && !idle) idle = worker;
      else worker.terminate();
    };
    const onMessage = (event: MessageEvent<AssistantWorkerResponse>) => {
      const msg = event.data;
      if (!msg || msg.id !== id) return;
      if (msg.type === 'progress') onProgress?.(msg.round, msg.stage, msg.rowsSoFar);
      else if (msg.type === 'result') {
        finish(true);
        resolve(msg.output);
      } else {
        finish(true);
        reject(new Error(msg.message));
      }
    };
    const onError = (event: ErrorEvent) => {
      finish(false);
      reject(new Error(`the assistant's worker failed: ${event.message || 'unknown error'}`));
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
    const request: AssistantWorkerRequest = { type: 'job', id, job };
    worker.postMessage(request);
  });
}
