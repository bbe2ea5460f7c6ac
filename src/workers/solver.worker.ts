/**
 * Worker entry: unpack a fit request, run fitBand (one band) or systemFit (several bands), post
 * progress and the outcome back. No logic of its own; both are the functions vitest and the CLI call directly.
 */
import { fitBand } from '../fit/fitBand';
import { systemFit } from '../fit/systemFit';
import type { SolverRequest, SolverResponse } from './protocol';

/** Handle one request, posting every response through `post` (exported for plumbing tests). */
export function solverHandle(request: SolverRequest, post: (message: SolverResponse) => void): void {
  if (request?.type !== 'fit' && request?.type !== 'systemFit') {
    const bad = request as { id?: number; type?: unknown } | undefined;
    post({ type: 'error', id: bad?.id ?? -1, message: `solver.worker: unknown request type '${String(bad?.type)}'` });
    return;
  }
  const { id } = request;
  try {
    const hooks = { onProgress: (iteration: number, chi2: number) => post({ type: 'progress', id, iteration, chi2 }) };
    const output = request.type === 'fit' ? fitBand(request.input, hooks) : systemFit(request.input, hooks);
    post({ type: 'result', id, output });
  } catch (err) {
    post({ type: 'error', id, message: err instanceof Error ? err.message : String(err) });
  }
}

// Only bind when actually running as a worker (importing this file elsewhere has no effect).
const scope = globalThis as unknown as {
  postMessage?: (m: SolverResponse) => void;
  addEventListener?: (t: 'message', f: (e: { data: SolverRequest }) => void) => void;
  document?: unknown;
  WorkerGlobalScope?: unknown;
};
if (typeof scope.WorkerGlobalScope !== 'undefined' && scope.addEventListener && scope.postMessage) {
  const post = scope.postMessage.bind(globalThis);
  scope.addEventListener('message', (e) => solverHandle(e.data, post));
}
