/**
 * Figures of the solve panels: residuals obs − calc vs J'' coloured by K'', the correlation
 * matrix heatmap, the combination-difference diagnostic Δ2F/(J+½) vs (J+½)², and the Loomis–Wood
 * heatmap. Pure: results in, {data, layout} out.
 */
import type { Data, Layout } from 'plotly.js';
import type { CombDiffResult } from '../../fit/combinationDifferences';
import type { FitResult } from '../../fit/fitTypes';
import { constantNameHtml } from '../../io/constantName';
import { lineLabelHtml, seriesLabelAscii } from '../../physics/lineLabel';
import type { TopShape } from '../../physics/model';
import type { LoomisGrid } from './loomisWood';
import { bandLadderColour, kColour, ladderColour, plotTheme } from './plotColours';

function baseLayout(isDark: boolean): Partial<Layout> {
  const t = plotTheme(isDark);
  return {
    paper_bgcolor: t.paper,
    plot_bgcolor: t.plot,
    font: { color: t.text, size: 11, family: 'system-ui, sans-serif' },
    margin: { l: 70, r: 14, t: 8, b: 44 },
    hovermode: 'closest',
    showlegend: true,
    legend: { orientation: 'v', font: { size: 10 } },
  };
}

function axis(isDark: boolean, title: string): Partial<Layout['xaxis']> {
  const t = plotTheme(isDark);
  return { title: { text: title }, color: t.text, gridcolor: t.grid, zerolinecolor: t.grid, linecolor: t.grid };
}

/** Marker symbol of each branch ΔJ = −1, 0, +1 (P ◀, Q ●, R ▶): the sub-branches stay apart where their colours are close. */
const BRANCH_SYMBOLS: Record<number, string> = { [-1]: 'triangle-left', 0: 'circle', 1: 'triangle-right' };

/** Drawing classes of the residual plot, in drawing order (flagged lines on top): fitted, excluded, outliers. */
const RESIDUAL_CLASSES = [
  { symbol: (base: string) => base, suffix: '' },
  { symbol: (base: string) => `${base}-open`, suffix: ', excluded' },
  { symbol: () => 'x', suffix: ', outliers' },
] as const;

/**
 * Residual plot: obs − calc (cm^-1) against J'', one legend entry per sub-branch series
 * (^ΔK ΔJ_K''): colour by K'' in the family of ΔK (the ladders' colours on the main plot), marker
 * by branch (P ◀, Q ●, R ▶); excluded lines as open markers, outliers as crosses. One trace per
 * series and class, each with a single marker style (no per-point style arrays, which make plotly
 * style every point on its own) and its hover strings built here; the traces of one series share
 * a legend entry. customdata carries the assignment id for clicks.
 * @param result the fit
 * @param lineIds assignment id of each result line (same order)
 * @param shape rotor shape (labels)
 */
export function residualFigure(
  result: FitResult,
  lineIds: readonly string[],
  shape: TopShape,
  isDark: boolean,
): { data: Data[]; layout: Partial<Layout> } {
  // Lines by series (ΔK, K'', ΔJ) and class: 0 fitted, 1 excluded, 2 outlier.
  const groups = new Map<string, { deltaK: number; kLower: number; deltaJ: number; idx: number[][] }>();
  const lines = result.lines;
  for (let i = 0; i < lines.length; i++) {
    const l = lines[i];
    const deltaK = l.kUpper - l.kLower;
    const deltaJ = l.jUpper - l.jLower;
    const key = `${deltaK}:${l.kLower}:${deltaJ}`;
    let g = groups.get(key);
    if (!g) groups.set(key, (g = { deltaK, kLower: l.kLower, deltaJ, idx: [[], [], []] }));
    g.idx[l.isOutlier ? 2 : l.isExcluded ? 1 : 0].push(i);
  }
  // Legend order as the ladders: ΔK descending, K'', branch.
  const series = [...groups.values()].sort((a, b) => b.deltaK - a.deltaK || a.kLower - b.kLower || a.deltaJ - b.deltaJ);
  const data: Data[] = [];
  for (const g of series) {
    const colour = ladderColour(g.deltaK, g.kLower, isDark);
    const name = seriesLabelAscii(g.deltaK, g.deltaJ, g.kLower, shape);
    const base = BRANCH_SYMBOLS[g.deltaJ] ?? 'circle';
    let isFirst = true;
    g.idx.forEach((idx, c) => {
      if (idx.length === 0) return;
      const n = idx.length;
      const x = new Array<number>(n);
      const y = new Array<number>(n);
      const ids = new Array<string>(n);
      const text = new Array<string>(n);
      for (let m = 0; m < n; m++) {
        const i = idx[m];
        const l = lines[i];
        x[m] = l.jLower;
        y[m] = l.obsMinusCalc;
        ids[m] = lineIds[i];
        text[m] =
          `${lineLabelHtml(l.kUpper - l.kLower, l.jUpper - l.jLower, l.kLower, l.jLower, shape)}<br>obs − calc ${l.obsMinusCalc.toExponential(2)} cm⁻¹<br>${l.normalisedResidual.toFixed(2)} σ${l.isExcluded ? '<br>excluded' : ''}${l.isOutlier ? '<br>outlier' : ''}`;
      }
      data.push({
        type: 'scatter',
        mode: 'markers',
        name: isFirst ? name : `${name}${RESIDUAL_CLASSES[c].suffix}`,
        legendgroup: `s${g.deltaK}:${g.kLower}:${g.deltaJ}`,
        showlegend: isFirst,
        x,
        y,
        customdata: ids,
        hovertext: text,
        hovertemplate: '%{hovertext}<extra></extra>',
        marker: { color: colour, size: 7, symbol: RESIDUAL_CLASSES[c].symbol(base) },
      } as Data);
      isFirst = false;
    });
  }
  return {
    data,
    layout: {
      ...baseLayout(isDark),
      legend: { orientation: 'v', font: { size: 10 }, title: { text: 'sub-branch<br>◀ P ● Q ▶ R' } },
      xaxis: axis(isDark, 'J″'),
      yaxis: { ...axis(isDark, 'obs − calc / cm⁻¹'), exponentformat: 'e' },
    },
  };
}

/**
 * Residual plot of a joint fit: obs − calc (cm^-1) against J'', one legend entry per band, each
 * band in its colour family (the ladders' and band switches' colours: index in `bandKeys`), marker
 * by branch (P ◀, Q ●, R ▶); excluded lines as open markers, outliers as crosses. Lines whose band
 * is not in `bandKeys` are drawn under "other". customdata carries the assignment id for clicks.
 * @param result the fit (its lines carry `band` and `species`)
 * @param lineIds assignment id of each result line (same order)
 * @param bandKeys "species/band" of every band, in the system's order
 */
export function residualFigureBands(
  result: FitResult,
  lineIds: readonly string[],
  bandKeys: readonly string[],
  shape: TopShape,
  isDark: boolean,
): { data: Data[]; layout: Partial<Layout> } {
  const lines = result.lines as (FitResult['lines'][number] & { band?: string; species?: string })[];
  const bandIndexOf = new Map(bandKeys.map((k, i) => [k, i]));
  // Lines by band, branch and class.
  const groups = new Map<string, { bandIndex: number; name: string; deltaJ: number; idx: number[][] }>();
  for (let i = 0; i < lines.length; i++) {
    const l = lines[i];
    const key = l.band !== undefined && l.species !== undefined ? `${l.species}/${l.band}` : '';
    const b = bandIndexOf.get(key) ?? -1;
    const deltaJ = l.jUpper - l.jLower;
    const g0 = `${b}:${deltaJ}`;
    let g = groups.get(g0);
    if (!g) groups.set(g0, (g = { bandIndex: b, name: b >= 0 ? `${l.band} (${l.species})` : 'other', deltaJ, idx: [[], [], []] }));
    g.idx[l.isOutlier ? 2 : l.isExcluded ? 1 : 0].push(i);
  }
  const series = [...groups.values()].sort((a, b) => a.bandIndex - b.bandIndex || a.deltaJ - b.deltaJ);
  const data: Data[] = [];
  const shown = new Set<number>();
  for (const g of series) {
    const colour = g.bandIndex >= 0 ? bandLadderColour(g.bandIndex, 0, 1, isDark) : plotTheme(isDark).text;
    const base = BRANCH_SYMBOLS[g.deltaJ] ?? 'circle';
    g.idx.forEach((idx, c) => {
      if (idx.length === 0) return;
      const n = idx.length;
      const x = new Array<number>(n);
      const y = new Array<number>(n);
      const ids = new Array<string>(n);
      const text = new Array<string>(n);
      for (let m = 0; m < n; m++) {
        const i = idx[m];
        const l = lines[i];
        x[m] = l.jLower;
        y[m] = l.obsMinusCalc;
        ids[m] = lineIds[i];
        text[m] =
          `${g.name}: ${lineLabelHtml(l.kUpper - l.kLower, l.jUpper - l.jLower, l.kLower, l.jLower, shape)}<br>obs − calc ${l.obsMinusCalc.toExponential(2)} cm⁻¹<br>${l.normalisedResidual.toFixed(2)} σ${l.isExcluded ? '<br>excluded' : ''}${l.isOutlier ? '<br>outlier' : ''}`;
      }
      const isFirst = !shown.has(g.bandIndex);
      shown.add(g.bandIndex);
      data.push({
        type: 'scatter',
        mode: 'markers',
        name: g.name,
        legendgroup: `b${g.bandIndex}`,
        showlegend: isFirst,
        x,
        y,
        customdata: ids,
        hovertext: text,
        hovertemplate: '%{hovertext}<extra></extra>',
        marker: { color: colour, size: 7, symbol: RESIDUAL_CLASSES[c].symbol(base) },
      } as Data);
    });
  }
  return {
    data,
    layout: {
      ...baseLayout(isDark),
      legend: { orientation: 'v', font: { size: 10 }, title: { text: 'band<br>◀ P ● Q ▶ R' } },
      xaxis: axis(isDark, 'J″'),
      yaxis: { ...axis(isDark, 'obs − calc / cm⁻¹'), exponentformat: 'e' },
    },
  };
}

/** Diverging colour scale for correlations −1 … +1 (blue – neutral – red). */
const CORRELATION_SCALE: [number, string][] = [
  [0, '#2a5fa8'],
  [0.25, '#7ea6d9'],
  [0.5, '#f2f2f2'],
  [0.75, '#e08a7a'],
  [1, '#b3261e'],
];

/**
 * Correlation matrix heatmap of the floated constants (zmin −1, zmax +1), values printed in cells;
 * the constants named as the trade writes them (D<sub>J</sub>″), not by their file keys.
 * @param result the fit
 */
export function correlationFigure(result: FitResult, isDark: boolean): { data: Data[]; layout: Partial<Layout> } {
  const keys = result.floated.map((k) => constantNameHtml(k));
  const n = keys.length;
  const z = result.correlation.map((row) => [...row]);
  const text = z.map((row) => row.map((v) => v.toFixed(2)));
  return {
    data: [
      {
        type: 'heatmap',
        x: keys,
        y: keys,
        z,
        zmin: -1,
        zmax: 1,
        colorscale: CORRELATION_SCALE,
        text: text as unknown as string[],
        texttemplate: n <= 12 ? '%{text}' : '',
        hovertemplate: '%{y} / %{x}: %{z:.4f}<extra></extra>',
        colorbar: { thickness: 10, len: 0.9 },
      } as Data,
    ],
    layout: {
      ...baseLayout(isDark),
      showlegend: false,
      margin: { l: 90, r: 10, t: 8, b: 80 },
      xaxis: { ...axis(isDark, ''), tickangle: -40, automargin: true },
      yaxis: { ...axis(isDark, ''), autorange: 'reversed', automargin: true },
    },
  };
}

/**
 * Combination-difference diagnostic: Δ2F/(J+½) (cm^-1) vs (J+½)², one trace per K with its
 * fitted line 4B − 8DJ((J+½)²+¾) − 4DJK K²; suspect pairs as crosses.
 * Source: Herzberg I (1950) ch. III (the line's intercept is ≈ 4B, its slope −8DJ).
 * @param result the analysis
 */
export function combinationFigure(result: CombDiffResult, isDark: boolean): { data: Data[]; layout: Partial<Layout> } {
  const byK = new Map<number, number[]>();
  result.pairs.forEach((p, i) => {
    const list = byK.get(p.k) ?? [];
    list.push(i);
    byK.set(p.k, list);
  });
  const data: Data[] = [];
  const suspect = new Set(result.suspects);
  const B = result.B.value;
  const DJ = result.DJ.value;
  const DJK = result.DJK.value;
  for (const k of [...byK.keys()].sort((a, b) => a - b)) {
    const idx = byK.get(k)!;
    const colour = kColour(k, isDark);
    data.push({
      type: 'scatter',
      mode: 'markers',
      name: `K=${k}`,
      legendgroup: `k${k}`,
      x: idx.map((i) => result.pairs[i].x),
      y: idx.map((i) => result.pairs[i].y),
      error_y: { type: 'data', array: idx.map((i) => result.pairs[i].sigmaY), visible: true, color: colour, thickness: 1, width: 2 },
      hovertext: idx.map((i) => {
        const p = result.pairs[i];
        return `J=${p.j}, K=${p.k}<br>Δ₂F ${p.differenceCm1.toFixed(5)} cm⁻¹<br>${p.normalisedResidual.toFixed(2)} σ${p.isSuspect ? '<br>suspect pair' : ''}`;
      }),
      hovertemplate: '%{hovertext}<extra></extra>',
      marker: { color: colour, size: 7, symbol: idx.map((i) => (suspect.has(i) ? 'x' : 'circle')) },
    } as Data);
    const xs = idx.map((i) => result.pairs[i].x);
    const x0 = Math.min(...xs);
    const x1 = Math.max(...xs);
    const line = (x: number) => 4 * B - 8 * DJ * (x + 0.75) - 4 * DJK * k * k;
    data.push({
      type: 'scatter',
      mode: 'lines',
      name: `fit K=${k}`,
      legendgroup: `k${k}`,
      showlegend: false,
      x: [x0, x1],
      y: [line(x0), line(x1)],
      line: { color: colour, width: 1, dash: 'dot' },
      hoverinfo: 'skip',
    } as Data);
  }
  return {
    data,
    layout: { ...baseLayout(isDark), xaxis: axis(isDark, '(J + ½)²'), yaxis: axis(isDark, 'Δ₂F / (J + ½) / cm⁻¹') },
  };
}

/** Markers of assigned lines in the Loomis–Wood diagram: offset obs − predicted vs J''. */
export interface LoomisMarks {
  offsetCm1: number[];
  jLower: number[];
  text: string[];
}

/**
 * Loomis–Wood heatmap: strips (rows, J'') of absorbance around each predicted rung; assigned lines
 * as markers at their offset; a dotted line at offset 0.
 * @param grid from loomisWoodGrid
 * @param marks assigned lines of the series
 */
export function loomisFigure(grid: LoomisGrid, marks: LoomisMarks, isDark: boolean): { data: Data[]; layout: Partial<Layout> } {
  const t = plotTheme(isDark);
  return {
    data: [
      {
        type: 'heatmap',
        x: grid.offsetCm1,
        y: grid.jLower,
        z: grid.z,
        colorscale: isDark
          ? [
              [0, '#10141a'],
              [1, '#f4f7fb'],
            ]
          : [
              [0, '#ffffff'],
              [1, '#11161d'],
            ],
        colorbar: { thickness: 10, title: { text: 'A' } },
        customdata: grid.z.map((row, r) => row.map(() => grid.centreCm1[r])) as unknown as number[][],
        hovertemplate: 'J″=%{y}, offset %{x:.4f} cm⁻¹<br>absorbance %{z:.3f}<extra></extra>',
        meta: { kind: 'loomis' },
      } as Data,
      {
        type: 'scatter',
        mode: 'markers',
        name: 'assigned',
        x: marks.offsetCm1,
        y: marks.jLower,
        hovertext: marks.text,
        hovertemplate: '%{hovertext}<extra></extra>',
        marker: { color: t.assigned, size: 9, symbol: 'circle-open', line: { width: 2, color: t.assigned } },
        meta: { kind: 'loomis-marks' },
      } as Data,
    ],
    layout: {
      ...baseLayout(isDark),
      showlegend: false,
      xaxis: axis(isDark, 'offset from prediction / cm⁻¹'),
      yaxis: { ...axis(isDark, 'J″'), dtick: 5 },
      shapes: [{ type: 'line', xref: 'x', yref: 'paper', x0: 0, x1: 0, y0: 0, y1: 1, line: { color: t.cursor, width: 1, dash: 'dot' } }],
    },
  };
}
