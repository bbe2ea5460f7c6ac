/**
 * One job at a time on a reusable module worker: starting another job, or aborting, terminates the
 * running worker (a job that runs without yielding cannot be stopped by a message) and rejects its
 * promise with an AbortError; a worker that finished its last job normally is kept for the next one
 * (saves start-up). Shared by the solver and assistant clients; each keeps its own `new Worker(new
 * URL(…))` so the bundler finds the worker entry.
 */

/** What a client makes of one message of its job (progress it handles itself and answers null). */
export type WorkerJobReply = { output: unknown } | { error: Error; isWorkerHealthy: boolean } | null;

/** Where a client's requests go: run a job, stop the running one. */
export interface WorkerJobs {
  /**
   * @param request the message to post, given the job id its replies carry
   * @param reply a reply of this job → its output, its error, or null (progress; nothing to settle)
   * @param failed the error for a worker that died (its ErrorEvent message)
   * @param signal aborting it terminates the worker and rejects with an AbortError
   */
  run<O>(
    request: (id: number) => unknown,
    reply: (message: { id: number; type: string }) => WorkerJobReply,
    failed: (message: string) => Error,
    signal?: AbortSignal,
  ): Promise<O>;
  /** Terminate the running job's worker and reject its promise with an AbortError. */
  stop(): void;
  /** An AbortError with this client's words. */
  abortError(): Error;
}

/**
 * @param create starts a new worker (`new Worker(new URL('./x.worker.ts', import.meta.url), …)`)
 * @param abortMessage the AbortError's message, e.g. "The fit was aborted."
 */
export function workerJobsCreate(create: () => Worker, abortMessage: string): WorkerJobs {
  let running: { id: number; worker: Worker; reject: (reason: unknown) => void; cleanup: () => void } | null = null;
  let idle: Worker | null = null;
  let nextId = 1;

  // DOMException is what fetch and friends reject with; fall back where it does not exist.
  const abortError = (): Error =>
    typeof DOMException === 'function'
      ? new DOMException(abortMessage, 'AbortError')
      : Object.assign(new Error(abortMessage), { name: 'AbortError' });

  const stop = (): void => {
    if (!running) return;
    const r = running;
    running = null;
    r.cleanup();
    r.worker.terminate();
    r.reject(abortError());
  };

  const run = <O>(
    request: (id: number) => unknown,
    reply: (message: { id: number; type: string }) => WorkerJobReply,
    failed: (message: string) => Error,
    signal?: AbortSignal,
  ): Promise<O> => {
    stop();
    if (signal?.aborted) return Promise.reject(abortError());
    const worker = idle ?? create();
    idle = null;
    const id = nextId++;
    return new Promise<O>((resolve, reject) => {
      const finish = (isHealthy: boolean) => {
        if (running?.id === id) running = null;
        cleanup();
        if (isHealthy && !idle) idle = worker;
        else worker.terminate();
      };
      const onMessage = (event: MessageEvent<{ id: number; type: string } | null>) => {
        const msg = event.data;
        if (!msg || msg.id !== id) return;
        const settled = reply(msg);
        if (!settled) return;
        if ('output' in settled) {
          finish(true);
          resolve(settled.output as O);
        } else {
          finish(settled.isWorkerHealthy);
          reject(settled.error);
        }
      };
      const onError = (event: ErrorEvent) => {
        finish(false);
        reject(failed(event.message));
      };
      const onAbort = () => {
        if (running?.id === id) stop();
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
      worker.postMessage(request(id));
    });
  };

  return { run, stop, abortError };
}
