import { beforeEach, describe, expect, it } from 'vitest';
import { peaksFind } from '../../src/analysis/peaksFind';
import { traceReplace } from '../../src/state/actionsImport';
import { peaksSetResult } from '../../src/state/actionsPeaks';
import { selectPeaks } from '../../src/state/selectors';
import { benchStore } from '../../src/state/store';
import { smallModel, smallTrace } from './fixtures';

beforeEach(() => {
  benchStore.setState(benchStore.getInitialState(), true);
});

// The worker itself only calls peaksFind; these check that its result reaches selectPeaks only
// while it still belongs to the trace and settings on screen.
describe('peaks from the analysis worker', () => {
  it('reports no peaks while the worker result for the current trace is pending, then the result once stored', () => {
    const { trace } = smallTrace(smallModel());
    traceReplace(trace, null, 'file');
    benchStore.setState({ isPeaksInWorker: true });
    expect(selectPeaks(benchStore.getState())).toEqual({ peaks: null, error: null });
    const s = benchStore.getState();
    const peaks = peaksFind(trace, { minSnr: s.peakMinSnr, baseline: s.peakBaseline });
    peaksSetResult(trace, s.peakMinSnr, s.peakBaseline, peaks, null);
    expect(selectPeaks(benchStore.getState()).peaks).toBe(peaks);
  });

  it('ignores a stored result for another trace or other settings', () => {
    const { trace } = smallTrace(smallModel());
    traceReplace(trace, null, 'file');
    benchStore.setState({ isPeaksInWorker: true });
    const s = benchStore.getState();
    const peaks = peaksFind(trace, { minSnr: s.peakMinSnr, baseline: s.peakBaseline });
    peaksSetResult(trace, s.peakMinSnr + 1, s.peakBaseline, peaks, null);
    expect(selectPeaks(benchStore.getState()).peaks).toBeNull();
    peaksSetResult({ wavenumberCm1: trace.wavenumberCm1.slice(), absorbance: trace.absorbance }, s.peakMinSnr, s.peakBaseline, peaks, null);
    expect(selectPeaks(benchStore.getState()).peaks).toBeNull();
  });

  it('passes on the error of a refused trace', () => {
    const { trace } = smallTrace(smallModel());
    traceReplace(trace, null, 'file');
    benchStore.setState({ isPeaksInWorker: true });
    const s = benchStore.getState();
    peaksSetResult(trace, s.peakMinSnr, s.peakBaseline, null, 'peaksFind: bad trace');
    expect(selectPeaks(benchStore.getState())).toEqual({ peaks: null, error: 'peaksFind: bad trace' });
  });
});
