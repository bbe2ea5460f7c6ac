/**
 * The unresolved-band tab's figure: the trace in the region (absorbance), the fitted simulation over
 * it, the residual (obs − fit) in a panel below, and the Q-branch maxima as ticks. Pure: data in,
 * {data, layout} out.
 */
import type { Data, Layout } from 'plotly.js';
import type { Trace } from '../../io/trace';
import { plotTheme } from './plotColours';
import { traceDecimate } from './traceDecimate';

/** What the figure shows. */
export interface ContourFigureInput {
  trace: Trace;
  /** Region, cm^-1. */
  region: [number, number];
  /** The fitted contour over its points (axis cm^-1, simulation and residual in absorbance), or null. */
  fit: { x: Float64Array; simulation: Float64Array; residual: Float64Array } | null;
  /** Q-branch maxima, cm^-1. */
  qMaxima: readonly number[];
  /** Pixel columns for the decimation. */
  columns: number;
  isDark: boolean;
}

/**
 * Build the figure.
 * @returns plotly data and layout (trace and fit on y, residual on y2 below when there is a fit)
 */
export function contourFigure(input: ContourFigureInput): { data: Data[]; layout: Partial<Layout> } {
  const theme = plotTheme(input.isDark);
  const [lo, hi] = input.region;
  const d = traceDecimate(input.trace.wavenumberCm1, input.trace.absorbance, lo, hi, Math.max(50, Math.round(input.columns)));
  const data: Data[] = [
    { type: 'scatter', mode: 'lines', name: 'trace', x: Array.from(d.x), y: Array.from(d.y), line: { color: theme.trace, width: 1 } },
  ];
  if (input.fit) {
    data.push(
      {
        type: 'scatter',
        mode: 'lines',
        name: 'fitted contour',
        x: Array.from(input.fit.x),
        y: Array.from(input.fit.simulation),
        line: { color: theme.simulated, width: 1.2 },
      },
      {
        type: 'scatter',
        mode: 'lines',
        name: 'obs − fit',
        x: Array.from(input.fit.x),
        y: Array.from(input.fit.residual),
        yaxis: 'y2',
        line: { color: theme.flagged, width: 1 },
      },
    );
  }
  if (input.qMaxima.length) {
    data.push({
      type: 'scatter',
      mode: 'markers',
      name: 'Q maxima',
      x: [...input.qMaxima],
      y: input.qMaxima.map(() => 0),
      yaxis: 'y3',
      marker: { symbol: 'triangle-up', size: 8, color: theme.peak },
    });
  }
  const hasResidual = input.fit !== null;
  const axisCommon = { color: theme.text, gridcolor: theme.grid, zerolinecolor: theme.grid, linecolor: theme.grid };
  const layout: Partial<Layout> = {
    paper_bgcolor: theme.paper,
    plot_bgcolor: theme.plot,
    font: { color: theme.text, size: 11, family: 'system-ui, sans-serif' },
    margin: { l: 70, r: 10, t: 10, b: 40 },
    showlegend: true,
    legend: { orientation: 'h', x: 0, y: 1.02, yanchor: 'bottom' },
    xaxis: { ...axisCommon, range: [lo, hi], title: { text: 'wavenumber / cm⁻¹' }, anchor: hasResidual ? 'y2' : 'y' },
    yaxis: { ...axisCommon, domain: [hasResidual ? 0.3 : 0, 0.92], title: { text: 'absorbance' } },
    yaxis3: { domain: [0.93, 1], range: [-0.5, 1], visible: false, fixedrange: true },
  };
  if (hasResidual) layout.yaxis2 = { ...axisCommon, domain: [0, 0.25], title: { text: 'obs − fit' } };
  return { data, layout };
}

/**
 * The region a zoom or pan of the figure selects: its new x range (ascending, cm^-1), null when it
 * was reset to the whole trace (double click), undefined when the event does not touch the x axis.
 */
export function contourRelayoutRegion(event: object): [number, number] | null | undefined {
  const r = event as Record<string, unknown>;
  if (r['xaxis.autorange']) return null;
  const pair =
    r['xaxis.range[0]'] !== undefined && r['xaxis.range[1]'] !== undefined
      ? [Number(r['xaxis.range[0]']), Number(r['xaxis.range[1]'])]
      : Array.isArray(r['xaxis.range'])
        ? [Number(r['xaxis.range'][0]), Number(r['xaxis.range'][1])]
        : null;
  if (!pair || !pair.every(Number.isFinite) || pair[0] === pair[1]) return undefined;
  return [Math.min(pair[0], pair[1]), Math.max(pair[0], pair[1])];
}
