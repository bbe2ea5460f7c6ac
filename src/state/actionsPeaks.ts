/**
 * Peak finding in the background: whenever the trace or the peak settings change, the analysis
 * worker is asked for the peaks (the previous request is aborted) and the result lands in the store.
 * Until it does, selectPeaks reports no peaks, so the trace is drawn at once without them.
 */
import type { PeakList } from '../analysis/peaksFind';
import { analysisPeaksFind, analysisWorkerAvailable } from '../workers/analysisClient';
import { benchStore, type BenchState } from './store';

/** Store the peaks found for a trace and settings (called with the worker's answer). */
export function peaksSetResult(
  trace: NonNullable<BenchState['trace']>,
  minSnr: number,
  baseline: boolean,
  peaks: PeakList | null,
  error: string | null,
): void {
  benchStore.setState({ peaksResult: { trace, minSnr, baseline, peaks, error } });
}

let stop: (() => void) | null = null;

/**
 * Run peak finding in the worker from now on (called once at start-up, browsers only; without a
 * Worker, selectPeaks keeps computing on the main thread).
 */
export function peaksWorkerStart(): void {
  if (stop || !analysisWorkerAvailable()) return;
  let controller: AbortController | null = null;
  let last: { trace: BenchState['trace']; minSnr: number; baseline: boolean } | null = null;
  const run = (s: BenchState) => {
    if (last && last.trace === s.trace && last.minSnr === s.peakMinSnr && last.baseline === s.peakBaseline) return;
    last = { trace: s.trace, minSnr: s.peakMinSnr, baseline: s.peakBaseline };
    controller?.abort();
    controller = null;
    const { trace, peakMinSnr: minSnr, peakBaseline: baseline } = s;
    if (!trace || trace.wavenumberCm1.length < 5) return;
    const c = (controller = new AbortController());
    analysisPeaksFind(trace, { minSnr, baseline }, c.signal).then(
      (peaks) => !c.signal.aborted && peaksSetResult(trace, minSnr, baseline, peaks, null),
      (err: unknown) => {
        if (c.signal.aborted || (err instanceof DOMException && err.name === 'AbortError')) return;
        peaksSetResult(trace, minSnr, baseline, null, err instanceof Error ? err.message : String(err));
      },
    );
  };
  benchStore.setState({ isPeaksInWorker: true });
  run(benchStore.getState());
  stop = benchStore.subscribe(run);
}
