/**
 * The only place that starts the assistant worker. One job at a time: starting another, or
 * aborting, terminates the running worker (the loop runs without yielding, so a message could not
 * stop it) and rejects its promise with an AbortError; nothing it computed reaches the page.
 */
import { assistantJobRun, type AssistantJobProgress } from './assistantJob';
import type { AssistantJob, AssistantJobOutput, AssistantWorkerRequest, AssistantWorkerResponse } from './assistantProtocol';
import { workerJobsCreate } from './workerJobs';

const jobs = workerJobsCreate(
  () => new Worker(new URL('./assistant.worker.ts', import.meta.url), { type: 'module' }),
  'The assistant was cancelled.',
);

/**
 * Run an assistant job in the worker (on the calling thread where there is no Worker: Node, tests).
 * @param job the job (plain data; copied to the worker)
 * @param signal aborting it terminates the worker and rejects with an AbortError
 * @param onProgress called once per round of each run of the loop and before each search between runs (round 0)
 * @returns the job's output; rejects with the assistant's message on bad input
 */
export function assistantJobStart(job: AssistantJob, signal?: AbortSignal, onProgress?: AssistantJobProgress): Promise<AssistantJobOutput> {
  jobs.stop();
  if (signal?.aborted) return Promise.reject(jobs.abortError());
  if (typeof Worker === 'undefined') {
    try {
      // On this thread the run stops at its next check once the signal is aborted (e.g. from onProgress).
      return Promise.resolve(assistantJobRun(job, onProgress, () => signal?.aborted === true));
    } catch (err) {
      return Promise.reject(err);
    }
  }
  return jobs.run<AssistantJobOutput>(
    (id): AssistantWorkerRequest => ({ type: 'job', id, job }),
    (message) => {
      const msg = message as AssistantWorkerResponse;
      if (msg.type === 'progress') onProgress?.(msg.round, msg.stage, msg.rowsSoFar);
      else if (msg.type === 'result') return { output: msg.output };
      // A refusal in words: the worker itself is sound and is kept for the next job.
      else return { error: new Error(msg.message), isWorkerHealthy: true };
      return null;
    },
    (message) => new Error(`the assistant's worker failed: ${message || 'unknown error'}`),
    signal,
  );
}
