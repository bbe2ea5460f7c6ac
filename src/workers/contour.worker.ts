/**
 * Worker entry: unpack a contour-fit or band-shape request, run contourFit or bandShapeClassify, post
 * progress and the result back. No logic of its own; both are the same functions vitest and the CLI
 * call directly.
 */
import { bandShapeClassify } from '../analysis/bandShapeClassify';
import { contourFit } from '../fit/contourFit';
import type { ContourResponse, ContourWorkerRequest } from './contourProtocol';

/** Handle one request, posting every response through `post` (exported for plumbing tests). */
export function contourHandle(request: ContourWorkerRequest, post: (message: ContourResponse) => void): void {
  if (request?.type !== 'contour' && request?.type !== 'classify') {
    const r = request as { id?: number; type?: unknown } | undefined;
    post({ type: 'error', id: r?.id ?? -1, message: `contour.worker: unknown request type '${String(r?.type)}'` });
    return;
  }
  const { id } = request;
  try {
    if (request.type === 'contour') {
      const output = contourFit({
        ...request.input,
        onProgress: (stage, iteration, rms) => post({ type: 'progress', id, stage, iteration, rms }),
      });
      post({ type: 'result', id, output });
    } else {
      const { wavenumberCm1, absorbance, fromCm1, toCm1, options } = request.input;
      const output = bandShapeClassify(wavenumberCm1, absorbance, fromCm1, toCm1, {
        ...options,
        onProgress: (runsDone, runsPlanned) => post({ type: 'classify-progress', id, runsDone, runsPlanned }),
      });
      post({ type: 'classify-result', id, output });
    }
  } catch (err) {
    post({ type: 'error', id, message: err instanceof Error ? err.message : String(err) });
  }
}

// Only bind when actually running as a worker (importing this file elsewhere has no effect).
const scope = globalThis as unknown as {
  postMessage?: (m: ContourResponse) => void;
  addEventListener?: (t: 'message', f: (e: { data: ContourWorkerRequest }) => void) => void;
  WorkerGlobalScope?: unknown;
};
if (typeof scope.WorkerGlobalScope !== 'undefined' && scope.addEventListener && scope.postMessage) {
  const post = scope.postMessage.bind(globalThis);
  scope.addEventListener('message', (e) => contourHandle(e.data, post));
}
