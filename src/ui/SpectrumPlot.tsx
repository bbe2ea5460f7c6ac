/**
 * The main plot: trace, peaks, simulated spectrum and the ladders; clicks become assignment
 * actions, zoom/pan becomes the view range (which re-decimates the trace).
 */
import type { PlotMouseEvent, PlotRelayoutEvent } from 'plotly.js';
import { useMemo, useState } from 'react';
import { useShallow } from 'zustand/react/shallow';
import { peakClick, rungClick, traceClickAt } from '../state/actionsAssign';
import { viewSetXRange } from '../state/actionsView';
import { peakIdAt } from '../state/assignLogic';
import { selectAssignmentRows, selectBand, selectPeaks, selectSimulated } from '../state/selectors';
import { benchStore, useBench } from '../state/store';
import { CandidateList } from './CandidateList';
import { ladderRowsBuild, rungPointQuanta } from './plot/ladderGeometry';
import { spectrumFigure } from './plot/toTraces';
import { PlotlyChart } from './PlotlyChart';
import { PlotToolbar } from './PlotToolbar';

function onClick(e: PlotMouseEvent): void {
  const p = e.points?.[0];
  if (!p) return;
  const kind = (p.data as { meta?: { kind?: string } }).meta?.kind;
  if (kind === 'peaks') peakClick(p.customdata as unknown as number);
  else if (kind === 'rungs') {
    const q = rungPointQuanta((p.data as { meta?: object }).meta, p.pointNumber, p.customdata, selectBand(benchStore.getState()).lines);
    if (q) rungClick(q);
  } else if (kind === 'trace') {
    // Look for a peak within 1 % of the visible width (at least 0.01 cm^-1) of the click.
    const r = benchStore.getState().xRange;
    traceClickAt(Number(p.x), Math.max(0.01, r ? 0.01 * (r[1] - r[0]) : 0.05));
  }
}

let relayoutFrame = 0;
let relayoutRange: [number, number] | null | undefined;

// Zoom and pan fire several relayout events per frame; only the last range of a frame is applied,
// so the figure is rebuilt at most once per animation frame.
function onRelayout(e: PlotRelayoutEvent): void {
  const r = e as Record<string, unknown>;
  if (r['xaxis.autorange']) relayoutRange = null;
  else if (r['xaxis.range[0]'] !== undefined && r['xaxis.range[1]'] !== undefined) relayoutRange = [Number(r['xaxis.range[0]']), Number(r['xaxis.range[1]'])];
  else if (Array.isArray(r['xaxis.range'])) relayoutRange = [Number(r['xaxis.range'][0]), Number(r['xaxis.range'][1])];
  else return;
  if (relayoutFrame) return;
  relayoutFrame = requestAnimationFrame(() => {
    relayoutFrame = 0;
    const range = relayoutRange;
    relayoutRange = undefined;
    if (range !== undefined) viewSetXRange(range);
  });
}

export function SpectrumPlot() {
  const [size, setSize] = useState({ width: 1000, height: 500 });
  const trace = useBench((s) => s.trace);
  const xRange = useBench((s) => s.xRange);
  const ordinate = useBench((s) => s.ordinate);
  const band = useBench(selectBand);
  const peaks = useBench((s) => selectPeaks(s).peaks);
  const hiddenRows = useBench((s) => s.hiddenRows);
  const shape = useBench((s) => s.model.shape);
  const rowsA = useBench(selectAssignmentRows);
  const selectedAssignmentId = useBench((s) => s.selectedAssignmentId);
  const cursor = useBench((s) => s.cursor);
  const candidatePeakCm1 = useBench((s) => s.candidateTarget?.peakCm1 ?? null);
  const { showSimulated, showObsMinusSim, showPeaks } = useBench(
    useShallow((s) => ({ showSimulated: s.showSimulated, showObsMinusSim: s.showObsMinusSim, showPeaks: s.showPeaks })),
  );
  const isDark = useBench((s) => s.theme === 'dark');
  const sim = useBench((s) => (s.showSimulated || s.showObsMinusSim ? selectSimulated(s).sim : null));

  const rows = useMemo(() => ladderRowsBuild(band.ladders, shape, new Set(hiddenRows)), [band.ladders, shape, hiddenRows]);
  const assignedPeaks = useMemo(() => {
    const m = new Map<string, string>();
    for (const r of rowsA) if (r.a.peakId && !m.has(r.a.peakId)) m.set(r.a.peakId, r.labelHtml);
    return m;
  }, [rowsA]);
  const figure = useMemo(
    () =>
      spectrumFigure({
        trace,
        xRange,
        columns: size.width - 90,
        heightPx: size.height,
        ordinate,
        peaks,
        showPeaks,
        assignedPeaks,
        peakId: peakIdAt,
        rows,
        lines: band.lines,
        indexOf: band.indexOf,
        shape,
        assignments: rowsA,
        selectedAssignmentId,
        cursor,
        candidatePeakCm1,
        sim,
        showSimulated,
        showObsMinusSim,
        isDark,
      }),
    [trace, xRange, size, ordinate, peaks, showPeaks, assignedPeaks, rows, band, shape, rowsA, selectedAssignmentId, cursor, candidatePeakCm1, sim, showSimulated, showObsMinusSim, isDark],
  );

  return (
    <section className="spectrum-panel" aria-label="Spectrum and ladders">
      <PlotToolbar rows={band.ladders} />
      <div className="spectrum-plot-wrap">
        <PlotlyChart
          data={figure.data}
          layout={figure.layout}
          onClick={onClick}
          onRelayout={onRelayout}
          onSize={(width, height) => setSize((o) => (o.width === width && o.height === height ? o : { width, height }))}
          label="Trace with predicted sub-branch ladders. Click a peak to see candidate assignments, or a rung and then a peak to assign it."
          testId="spectrum-plot"
          className="spectrum-plot"
        />
        <CandidateList />
        {band.error && (
          <div className="plot-note error" role="status">
            No lines from this model: {band.error}
          </div>
        )}
      </div>
    </section>
  );
}
