/**
 * The main figure as plotly data: decimated trace, peak markers, simulated spectrum, obs − sim,
 * and the ladders with assignment and cursor markers. Pure: store data in, {data, layout} out; the
 * chart component only hands the result to plotly.
 */
import type { Data, Layout, Shape } from 'plotly.js';
import type { PeakList } from '../../analysis/peaksFind';
import type { Trace } from '../../io/trace';
import { lineLabelHtml } from '../../physics/lineLabel';
import type { LineList, TopShape, TransitionQuanta } from '../../physics/model';
import type { AssignmentRow } from '../../state/selectors';
import type { SimulatedSpectrum } from '../../state/simulation';
import { sortedLowerBound } from '../../state/sortedSearch';
import { ladderTracesBuild, rungTip, type LadderRow } from './ladderGeometry';
import { plotTheme } from './plotColours';
import { traceDecimate } from './traceDecimate';

/** Everything the main figure shows. */
export interface SpectrumFigureInput {
  trace: Trace | null;
  /** Visible range, cm^-1 (null = everything). */
  xRange: [number, number] | null;
  /** Pixel columns of the plot area (decimation resolution). */
  columns: number;
  /** Height of the whole chart, px (sizes the ladder panel). */
  heightPx: number;
  ordinate: 'absorbance' | 'transmittance';
  peaks: PeakList | null;
  showPeaks: boolean;
  /** Peak ids (peakIdAt) that carry an assignment → label of the (first) assignment. */
  assignedPeaks: ReadonlyMap<string, string>;
  /** Peak id function (the same as the store's). */
  peakId: (positionCm1: number) => string;
  rows: readonly LadderRow[];
  lines: LineList;
  /** quantaKey → line index. */
  indexOf: ReadonlyMap<string, number>;
  shape: TopShape;
  assignments: readonly AssignmentRow[];
  selectedAssignmentId: string | null;
  cursor: TransitionQuanta | null;
  /** Peak whose candidate list is open (cm^-1), or null. */
  candidatePeakCm1: number | null;
  sim: SimulatedSpectrum | null;
  showSimulated: boolean;
  showObsMinusSim: boolean;
  isDark: boolean;
}

/** Largest number of peak markers drawn at once (the strongest by SNR are kept; each marker is an SVG path, so they cost every redraw). */
export const PEAK_MARKERS_MAX = 250;

/** Most assigned-rung markers drawn as symbols; more are drawn as bars in one path. */
export const ASSIGNED_MARKERS_MAX = 400;

/** Half length of an assigned-rung bar, ladder-axis units (rows are 1 apart). */
const ASSIGNED_BAR_HALF = 0.09;

const toTransmittance = (a: number) => 10 ** -a;

/** The range shown when nothing is zoomed: the trace, else the predicted lines, else 0…1. */
export function figureFullRange(trace: Trace | null, lines: LineList): [number, number] {
  if (trace && trace.wavenumberCm1.length > 1) return [trace.wavenumberCm1[0], trace.wavenumberCm1[trace.wavenumberCm1.length - 1]];
  if (lines.count > 0) {
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = 0; i < lines.count; i++) {
      lo = Math.min(lo, lines.wavenumberCm1[i]);
      hi = Math.max(hi, lines.wavenumberCm1[i]);
    }
    const pad = Math.max(0.5, 0.02 * (hi - lo));
    return [lo - pad, hi + pad];
  }
  return [0, 1];
}

function traceValueAt(trace: Trace, positionCm1: number): number {
  const x = trace.wavenumberCm1;
  const k = Math.min(Math.max(sortedLowerBound(x, positionCm1), 0), x.length - 1);
  const j = k > 0 && Math.abs(x[k - 1] - positionCm1) < Math.abs(x[k] - positionCm1) ? k - 1 : k;
  return trace.absorbance[j];
}

function peakTraces(input: SpectrumFigureInput, range: [number, number], theme: ReturnType<typeof plotTheme>): Data[] {
  const { peaks, trace } = input;
  if (!peaks || !trace || !input.showPeaks) return [];
  const lo = sortedLowerBound(peaks.wavenumberCm1, range[0]);
  const hi = sortedLowerBound(peaks.wavenumberCm1, range[1]);
  let idx = Array.from({ length: Math.max(hi - lo, 0) }, (_, k) => lo + k);
  if (idx.length > PEAK_MARKERS_MAX) {
    idx = idx.sort((a, b) => peaks.snr[b] - peaks.snr[a]).slice(0, PEAK_MARKERS_MAX).sort((a, b) => a - b);
  }
  const transform = input.ordinate === 'transmittance' ? toTransmittance : (v: number) => v;
  // Fewer, larger markers when zoomed in; small ones when thousands are on screen.
  const size = idx.length > 800 ? 3.5 : idx.length > 250 ? 5 : 7;
  const free = { x: [] as number[], y: [] as number[], text: [] as string[], custom: [] as number[], symbol: [] as string[] };
  const taken = { x: [] as number[], y: [] as number[], text: [] as string[], custom: [] as number[] };
  for (const i of idx) {
    const nu = peaks.wavenumberCm1[i];
    const y = transform(traceValueAt(trace, nu));
    const label = input.assignedPeaks.get(input.peakId(nu));
    const text =
      `peak ${nu.toFixed(4)} cm⁻¹<br>height ${peaks.height[i].toPrecision(3)} (SNR ${Number.isFinite(peaks.snr[i]) ? peaks.snr[i].toFixed(0) : '∞'})` +
      `<br>FWHM ${peaks.fwhmCm1[i].toPrecision(2)} cm⁻¹${peaks.isBlend[i] ? '<br>blend' : ''}${label ? `<br>assigned ${label}` : ''}`;
    const target = label ? taken : free;
    target.x.push(nu);
    target.y.push(y);
    target.text.push(text);
    target.custom.push(i);
    if (!label) free.symbol.push(peaks.isBlend[i] ? 'diamond-open' : 'circle-open');
  }
  return [
    {
      type: 'scatter',
      mode: 'markers',
      name: 'peaks',
      x: free.x,
      y: free.y,
      hovertext: free.text,
      hovertemplate: '%{hovertext}<extra></extra>',
      customdata: free.custom,
      marker: { color: theme.peak, size, symbol: free.symbol, line: { width: size > 4 ? 1.3 : 1, color: theme.peak } },
      meta: { kind: 'peaks' },
      showlegend: false,
    } as Data,
    {
      type: 'scatter',
      mode: 'markers',
      name: 'assigned peaks',
      x: taken.x,
      y: taken.y,
      hovertext: taken.text,
      hovertemplate: '%{hovertext}<extra></extra>',
      customdata: taken.custom,
      marker: { color: theme.assigned, size: size + 1.5, symbol: 'circle', line: { width: 1, color: theme.paper } },
      meta: { kind: 'peaks' },
      showlegend: false,
    } as Data,
  ];
}

function assignmentMarkers(input: SpectrumFigureInput, range: [number, number], theme: ReturnType<typeof plotTheme>): Data[] {
  const rowY = new Map(input.rows.map((r) => [r.key, r.y]));
  const ok = { x: [] as number[], y: [] as number[], text: [] as string[], custom: [] as number[][], line: [] as number[] };
  const far = { x: [] as number[], y: [] as number[], text: [] as string[], custom: [] as number[][], line: [] as number[] };
  const margin = 0.02 * (range[1] - range[0]);
  for (const r of input.assignments) {
    const a = r.a;
    const i = input.indexOf.get(`${a.jUpper},${a.kUpper},${a.jLower},${a.kLower}`);
    if (i === undefined) continue;
    const nu = input.lines.wavenumberCm1[i];
    if (nu < range[0] - margin || nu > range[1] + margin) continue;
    const rowKey = `${'pqr'[r.deltaK + 1]}:${a.kLower}`;
    const y0 = rowY.get(rowKey);
    if (y0 === undefined) continue;
    const target = r.isFar || r.isOutlier ? far : ok;
    target.x.push(nu);
    target.y.push(y0 + rungTip(r.deltaJ, input.lines.intensity[i]));
    const sig = r.omcSigma !== null ? ` (${r.omcSigma.toFixed(1)} σ)` : '';
    target.text.push(`${r.labelHtml} assigned<br>obs ${a.observedCm1.toFixed(4)} cm⁻¹<br>obs − calc ${r.omcCm1.toExponential(2)} cm⁻¹${sig}${r.isFar ? '<br>far from prediction' : ''}`);
    target.custom.push([a.jUpper, a.kUpper, a.jLower, a.kLower]);
    target.line.push(i);
  }
  const mk = (d: typeof ok, colour: string, name: string, symbol: string): Data =>
    ({
      type: 'scatter',
      mode: 'markers',
      name,
      x: d.x,
      y: d.y,
      yaxis: 'y2',
      hovertext: d.text,
      hovertemplate: '%{hovertext}<extra></extra>',
      customdata: d.custom,
      marker: { color: colour, size: 7, symbol, line: { width: 1, color: theme.paper } },
      meta: { kind: 'rungs' },
      showlegend: false,
    }) as Data;
  // Thousands of marker paths are most of a redraw's cost at full range; past this many the
  // assigned rungs are drawn as short bars in one path (same hover; clicks resolved through meta.lineIndex).
  const dense = (d: typeof ok, colour: string, name: string): Data => {
    const x: (number | null)[] = [];
    const y: (number | null)[] = [];
    const text: (string | null)[] = [];
    const lineIndex: (number | null)[] = [];
    for (let k = 0; k < d.x.length; k++) {
      x.push(d.x[k], d.x[k], null);
      y.push(d.y[k] - ASSIGNED_BAR_HALF, d.y[k] + ASSIGNED_BAR_HALF, null);
      text.push(d.text[k], d.text[k], null);
      lineIndex.push(d.line[k], d.line[k], null);
    }
    return {
      type: 'scatter',
      mode: 'lines',
      name,
      x,
      y,
      yaxis: 'y2',
      connectgaps: false,
      hovertext: text,
      hovertemplate: '%{hovertext}<extra></extra>',
      line: { color: colour, width: 4 },
      // Clicks map a vertex back to its line as on the ladder traces (rungPointQuanta).
      meta: { kind: 'rungs', lineIndex },
      showlegend: false,
    } as Data;
  };
  return [
    ok.x.length > ASSIGNED_MARKERS_MAX ? dense(ok, theme.assigned, 'assigned rungs') : mk(ok, theme.assigned, 'assigned rungs', 'circle'),
    mk(far, theme.flagged, 'assigned far from prediction', 'x'),
  ];
}

function cursorMarker(input: SpectrumFigureInput, theme: ReturnType<typeof plotTheme>): { data: Data[]; shapes: Partial<Shape>[] } {
  const c = input.cursor;
  if (!c) return { data: [], shapes: [] };
  const i = input.indexOf.get(`${c.jUpper},${c.kUpper},${c.jLower},${c.kLower}`);
  if (i === undefined) return { data: [], shapes: [] };
  const nu = input.lines.wavenumberCm1[i];
  const rowKey = `${'pqr'[c.kUpper - c.kLower + 1]}:${c.kLower}`;
  const row = input.rows.find((r) => r.key === rowKey);
  const shapes: Partial<Shape>[] = [
    { type: 'line', xref: 'x', yref: 'paper', x0: nu, x1: nu, y0: 0, y1: 1, line: { color: theme.cursor, width: 1.2, dash: 'dot' } },
  ];
  if (!row) return { data: [], shapes };
  const label = lineLabelHtml(c.kUpper - c.kLower, c.jUpper - c.jLower, c.kLower, c.jLower, input.shape);
  return {
    data: [
      {
        type: 'scatter',
        mode: 'markers',
        name: 'selected rung',
        x: [nu],
        y: [row.y + rungTip(c.jUpper - c.jLower, input.lines.intensity[i])],
        yaxis: 'y2',
        hovertext: [`${label} selected<br>${nu.toFixed(4)} cm⁻¹<br>click a peak to assign`],
        hovertemplate: '%{hovertext}<extra></extra>',
        customdata: [[c.jUpper, c.kUpper, c.jLower, c.kLower]],
        marker: { color: 'rgba(0,0,0,0)', size: 15, symbol: 'circle-open', line: { width: 2.5, color: theme.cursor } },
        meta: { kind: 'rungs' },
        showlegend: false,
      } as Data,
    ],
    shapes,
  };
}

/**
 * Build the main figure.
 * @returns plotly data and layout (x axis shared by trace and ladders; ladders on y2 above the
 *   trace; obs − sim on y3 below it when shown)
 */
export function spectrumFigure(input: SpectrumFigureInput): { data: Data[]; layout: Partial<Layout> } {
  const theme = plotTheme(input.isDark);
  const range = input.xRange ?? figureFullRange(input.trace, input.lines);
  const columns = Math.max(50, Math.round(input.columns));
  const transform = input.ordinate === 'transmittance' ? toTransmittance : undefined;
  const data: Data[] = [];
  if (input.trace && input.trace.wavenumberCm1.length > 1) {
    const d = traceDecimate(input.trace.wavenumberCm1, input.trace.absorbance, range[0], range[1], columns, transform);
    data.push({
      type: 'scatter',
      mode: 'lines',
      name: 'trace',
      x: Array.from(d.x),
      y: Array.from(d.y),
      line: { color: theme.trace, width: 1 },
      hoverinfo: 'none',
      meta: { kind: 'trace' },
      showlegend: false,
    } as Data);
  }
  const hasSim = input.showSimulated && input.sim !== null;
  if (hasSim && input.sim) {
    const d = traceDecimate(input.sim.xCm1, input.sim.absorbance, range[0], range[1], columns, transform);
    data.push({
      type: 'scatter',
      mode: 'lines',
      name: 'simulated',
      x: Array.from(d.x),
      y: Array.from(d.y),
      line: { color: theme.simulated, width: 1 },
      opacity: 0.85,
      hoverinfo: 'skip',
      meta: { kind: 'sim' },
      showlegend: false,
    } as Data);
  }
  const hasResidual = input.showObsMinusSim && input.sim?.obsMinusSim && input.trace;
  if (hasResidual && input.sim?.obsMinusSim && input.trace) {
    const d = traceDecimate(input.trace.wavenumberCm1, input.sim.obsMinusSim, range[0], range[1], columns);
    data.push({
      type: 'scatter',
      mode: 'lines',
      name: 'obs − sim',
      x: Array.from(d.x),
      y: Array.from(d.y),
      yaxis: 'y3',
      line: { color: theme.simulated, width: 1 },
      hoverinfo: 'skip',
      meta: { kind: 'residual' },
      showlegend: false,
    } as Data);
  }
  data.push(...peakTraces(input, range, theme));
  data.push(...ladderTracesBuild(input.rows, input.lines, input.shape, { xRangeCm1: range, isDark: input.isDark }));
  data.push(...assignmentMarkers(input, range, theme));
  const cursor = cursorMarker(input, theme);
  data.push(...cursor.data);
  const nRows = input.rows.length;
  // Ladder panel: about 15 px per row, between 25 % and 58 % of the chart height.
  const usable = Math.max(input.heightPx - 50, 100);
  const ladderFrac = Math.min(0.58, Math.max(0.25, (Math.max(nRows, 1) * 15) / usable));
  const traceTop = 1 - ladderFrac - 0.03;
  const shapes: Partial<Shape>[] = [...cursor.shapes];
  if (input.candidatePeakCm1 !== null) {
    shapes.push({ type: 'line', xref: 'x', yref: 'paper', x0: input.candidatePeakCm1, x1: input.candidatePeakCm1, y0: 0, y1: 1, line: { color: theme.peak, width: 1.5 } });
  }
  const sel = input.assignments.find((r) => r.a.id === input.selectedAssignmentId);
  if (sel) {
    shapes.push({ type: 'line', xref: 'x', yref: 'paper', x0: sel.a.observedCm1, x1: sel.a.observedCm1, y0: 0, y1: traceTop, line: { color: theme.assigned, width: 1.5, dash: 'dash' } });
  }
  const axisCommon = { color: theme.text, gridcolor: theme.grid, zerolinecolor: theme.grid, linecolor: theme.grid };
  const layout: Partial<Layout> = {
    paper_bgcolor: theme.paper,
    plot_bgcolor: theme.plot,
    font: { color: theme.text, size: 11, family: 'system-ui, sans-serif' },
    margin: { l: 74, r: 14, t: 6, b: 40 },
    showlegend: false,
    hovermode: 'closest',
    dragmode: 'zoom',
    uirevision: 'spectrum',
    hoverlabel: { align: 'left' },
    xaxis: { ...axisCommon, range: [...range], title: { text: 'Wavenumber / cm⁻¹' }, anchor: hasResidual ? 'y3' : 'y', hoverformat: '.4f' },
    yaxis: {
      ...axisCommon,
      domain: [hasResidual ? 0.2 : 0, traceTop],
      title: { text: input.ordinate === 'transmittance' ? 'Transmittance' : 'Absorbance' },
      autorange: true,
    },
    yaxis2: {
      ...axisCommon,
      domain: [traceTop + 0.03, 1],
      range: [-0.6, Math.max(nRows, 1) - 0.4],
      tickmode: 'array',
      tickvals: input.rows.map((r) => r.y),
      ticktext: input.rows.map((r) => r.tickHtml),
      tickfont: { size: nRows > 24 ? 8 : nRows > 14 ? 9 : 10 },
      // Grid lines at the row centres serve as the rows' base lines.
      showgrid: true,
      gridcolor: theme.grid,
      zeroline: false,
      fixedrange: true,
    },
    shapes,
  };
  if (hasResidual) {
    layout.yaxis3 = { ...axisCommon, domain: [0, 0.15], title: { text: 'obs − sim' }, autorange: true };
  }
  return { data, layout };
}
