/**
 * Worker entry of the assignment assistant: unpack a job, run it (assistantJobRun), post the
 * loop's progress and the outcome back. No logic of its own; a cancel terminates this worker.
 */
import { assistantJobRun } from './assistantJob';
import type { AssistantWorkerRequest, AssistantWorkerResponse } from './assistantProtocol';

/** Handle one request, posting every response through `post` (exported for plumbing tests). */
export function assistantHandle(request: AssistantWorkerRequest, post: (message: AssistantWorkerResponse) => void): void {
  if (request?.type !== 'job') {
    post({ type: 'error', id: request?.id ?? -1, message: `assistant.worker: unknown request type '${String(request?.type)}'` });
    return;
  }
  const { id, job } = request;
  try {
    const output = assistantJobRun(job, (round, stage, rowsSoFar) => post({ type: 'progress', id, round, stage, rowsSoFar }));
    post({ type: 'result', id, output });
  } catch (err) {
    post({ type: 'error', id, message: err instanceof Error ? err.message : String(err) });
  }
}

// Only bind when actually running as a worker (importing this file elsewhere has no effect).
const scope = globalThis as unknown as {
  postMessage?: (m: AssistantWorkerResponse) => void;
  addEventListener?: (t: 'message', f: (e: { data: AssistantWorkerRequest }) => void) => void;
  WorkerGlobalScope?: unknown;
};
if (typeof scope.WorkerGlobalScope !== 'undefined' && scope.addEventListener && scope.postMessage) {
  const post = scope.postMessage.bind(globalThis);
  scope.addEventListener('message', (e) => assistantHandle(e.data, post));
}
