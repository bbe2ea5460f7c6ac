/**
 * Messages between the main thread and the analysis worker (peak finding). Plain serialisable data;
 * the trace columns travel as transferred Float64Array buffers (copies, so the store keeps its own).
 */
import type { PeakList, PeaksFindOptions } from '../analysis/peaksFind';

/** Find the peaks of a trace (wavenumbers cm^-1 ascending, absorbance). */
export interface AnalysisPeaksRequest {
  type: 'peaks';
  id: number;
  wavenumberCm1: Float64Array;
  absorbance: Float64Array;
  options: PeaksFindOptions;
}

/** Every request the analysis worker understands. */
export type AnalysisWorkerRequest = AnalysisPeaksRequest;

/** Every message the analysis worker posts. `error` carries peaksFind's own message (bad input). */
export type AnalysisWorkerResponse = { type: 'peaks-result'; id: number; peaks: PeakList } | { type: 'error'; id: number; message: string };

/** The buffers of a peak list, to transfer instead of copy. */
export function peakListTransferables(p: PeakList): ArrayBuffer[] {
  return [p.wavenumberCm1, p.height, p.fwhmCm1, p.snr, p.prominence, p.isBlend, p.centreSigmaCm1].map((a) => a.buffer as ArrayBuffer);
}
