/**
 * Worker entry: unpack a contour-fit request, run contourFit, post progress and the result back.
 * No logic of its own; contourFit is the same function vitest and the CLI call directly.
 */
import { contourFit } from '../fit/contourFit';
import type { ContourRequest, ContourResponse } from './contourProtocol';

/** Handle one request, posting every response through `post` (exported for plumbing tests). */
export function contourHandle(request: ContourRequest, post: (message: ContourResponse) => void): void {
  if (request?.type !== 'contour') {
    post({ type: 'error', id: request?.id ?? -1, message: `contour.worker: unknown request type '${String(request?.type)}'` });
    return;
  }
  const { id, input } = request;
  try {
    const output = contourFit({ ...input, onProgress: (stage, iteration, rms) => post({ type: 'progress', id, stage, iteration, rms }) });
    post({ type: 'result', id, output });
  } catch (err) {
    post({ type: 'error', id, message: err instanceof Error ? err.message : String(err) });
  }
}

// Only bind when actually running as a worker (importing this file elsewhere has no effect).
const scope = globalThis as unknown as {
  postMessage?: (m: ContourResponse) => void;
  addEventListener?: (t: 'message', f: (e: { data: ContourRequest }) => void) => void;
  WorkerGlobalScope?: unknown;
};
if (typeof scope.WorkerGlobalScope !== 'undefined' && scope.addEventListener && scope.postMessage) {
  const post = scope.postMessage.bind(globalThis);
  scope.addEventListener('message', (e) => contourHandle(e.data, post));
}
