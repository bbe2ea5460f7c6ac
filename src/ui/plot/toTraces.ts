/**
 * The main figure as plotly data: decimated trace, simulated spectrum, obs − sim, the assistant's
 * proposals and the (empty) ladder axis. Pure: store data in, {data, layout} out; the chart component
 * only hands the result to plotly. What a click changes (rungs, markers, the selected rung's, candidate
 * peak's and selected row's vertical marks) is painted on the overlay's canvases instead (ladderScene,
 * peakLayer, plotMarks), so a click never makes plotly re-render the figure.
 */
import type { Data, Layout, Shape } from 'plotly.js';
import type { Trace } from '../../io/trace';
import type { LineList } from '../../physics/model';
import type { SimulatedSpectrum } from '../../state/simulation';
import type { LadderRow } from './ladderGeometry';
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
  rows: readonly LadderRow[];
  /** Predicted lines (the range shown without a trace). */
  lines: LineList;
  sim: SimulatedSpectrum | null;
  /** The assistant's proposals waiting for review: positions (cm^-1) and whether each is doubted. */
  proposals?: { xCm1: readonly number[]; isDoubtful: readonly boolean[] } | null;
  /** Position of the proposal selected in the review list (cm^-1), or null. */
  selectedProposalCm1?: number | null;
  showSimulated: boolean;
  showObsMinusSim: boolean;
  isDark: boolean;
}

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
      // Clicks and hovers are the overlay's (PlotOverlay): plotly's hit testing of the trace is skipped.
      hoverinfo: 'skip',
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
  const marks = input.proposals && input.trace ? proposalMarks(input.proposals, input.trace, range, transform) : null;
  if (marks && marks.x.length > 0) {
    data.push({
      type: 'scatter',
      mode: 'markers',
      name: 'proposals',
      x: marks.x,
      y: marks.y,
      marker: {
        symbol: 'line-ns-open',
        size: 11,
        line: { width: 1.5, color: marks.isDoubtful.map((d) => (d ? theme.flagged : theme.cursor)) },
      },
      hoverinfo: 'skip',
      meta: { kind: 'proposals' },
      showlegend: false,
    } as Data);
  }
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
  // The ladder axis holds no plotly data: rungs, assigned markers and the cursor ring are painted
  // on a canvas over it (ladderScene), so a zoom never makes plotly recompute them. This empty
  // trace keeps the subplot (its grid lines are the row base lines, its ticks the row names).
  data.push({
    type: 'scatter',
    mode: 'lines',
    name: 'ladder axis',
    x: [],
    y: [],
    yaxis: 'y2',
    hoverinfo: 'skip',
    meta: { kind: 'ladder-axis' },
    showlegend: false,
  } as Data);
  const nRows = input.rows.length;
  // Ladder panel: about 15 px per row, between 25 % and 58 % of the chart height.
  const usable = Math.max(input.heightPx - 50, 100);
  const ladderFrac = Math.min(0.58, Math.max(0.25, (Math.max(nRows, 1) * 15) / usable));
  const traceTop = 1 - ladderFrac - 0.03;
  // The selected rung's, candidate peak's and selected row's marks are the overlay's (plotMarks); the
  // proposal under review stays a shape (it changes with the review list, not with clicks on the plot).
  const shapes: Partial<Shape>[] = [];
  if (input.selectedProposalCm1 != null) {
    shapes.push({
      type: 'line',
      xref: 'x',
      yref: 'paper',
      x0: input.selectedProposalCm1,
      x1: input.selectedProposalCm1,
      y0: 0,
      y1: 1,
      line: { color: theme.cursor, width: 2, dash: 'dashdot' },
    });
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
      // The row names are painted with the rungs (ladderScene): 30-odd rich-text tick labels were
      // a third of every plotly redraw.
      showticklabels: false,
      // The rows' base lines are painted with the row names too (ladderLabelsPaint), not as grid lines.
      showgrid: false,
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

/**
 * The proposals inside the visible range, each placed on the trace at its position (nearest
 * sample, in the ordinate shown).
 */
function proposalMarks(
  p: { xCm1: readonly number[]; isDoubtful: readonly boolean[] },
  trace: Trace,
  range: [number, number],
  transform: ((a: number) => number) | undefined,
): { x: number[]; y: number[]; isDoubtful: boolean[] } {
  const xs = trace.wavenumberCm1;
  const lo = Math.min(range[0], range[1]);
  const hi = Math.max(range[0], range[1]);
  const out = { x: [] as number[], y: [] as number[], isDoubtful: [] as boolean[] };
  for (let k = 0; k < p.xCm1.length; k++) {
    const x = p.xCm1[k];
    if (!(x >= lo && x <= hi)) continue;
    let a = 0;
    let b = xs.length - 1;
    while (b - a > 1) {
      const m = (a + b) >> 1;
      if (xs[m] < x) a = m;
      else b = m;
    }
    const i = Math.abs(xs[a] - x) <= Math.abs(xs[b] - x) ? a : b;
    const y = trace.absorbance[i];
    out.x.push(x);
    out.y.push(transform ? transform(y) : y);
    out.isDoubtful.push(p.isDoubtful[k]);
  }
  return out;
}
