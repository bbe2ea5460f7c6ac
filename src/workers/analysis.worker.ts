/**
 * Worker entry for trace analysis: unpacks a request, calls `peaksFind` (src/analysis) and posts the
 * peak list back with its buffers transferred. No logic of its own.
 */
import { peaksFind } from '../analysis/peaksFind';
import { peakListTransferables, type AnalysisWorkerRequest, type AnalysisWorkerResponse } from './analysisProtocol';

/** The part of the dedicated-worker global scope used here (the main tsconfig has no WebWorker lib). */
interface AnalysisWorkerScope {
  postMessage(message: AnalysisWorkerResponse, transfer: Transferable[]): void;
  onmessage: ((event: MessageEvent<AnalysisWorkerRequest>) => void) | null;
}

const scope = self as unknown as AnalysisWorkerScope;

scope.onmessage = (event) => {
  const request = event.data;
  if (!request || request.type !== 'peaks') return;
  try {
    const peaks = peaksFind({ wavenumberCm1: request.wavenumberCm1, absorbance: request.absorbance }, request.options);
    scope.postMessage({ type: 'peaks-result', id: request.id, peaks }, peakListTransferables(peaks));
  } catch (err) {
    scope.postMessage({ type: 'error', id: request.id, message: err instanceof Error ? err.message : String(err) }, []);
  }
};
