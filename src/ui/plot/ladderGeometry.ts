/**
 * Geometry of the sub-branch ladders drawn above the trace: one row per (ΔK, K'') series, P rungs
 * hanging below the row line, R rungs standing above it, Q rungs through it; rung length grows with
 * the line's intensity. Pure: ladders and lines in, plotly trace objects out.
 */
import type { Data } from 'plotly.js';
import type { Ladder } from '../../physics/bandLadders';
import { lineLabelHtml } from '../../physics/lineLabel';
import type { LineList, TopShape, TransitionQuanta } from '../../physics/model';
import { ladderColour } from './plotColours';

/** One row of the ladder panel: every branch (P, Q, R) of one ΔK and K''. */
export interface LadderRow {
  /** Stable key "<ΔK letter>:<K''>", e.g. "r:3" (the ladder key without its branch). */
  key: string;
  deltaK: number;
  kLower: number;
  /** Tick text for the row (markup without outside text), e.g. "<sup>r</sup>K″=3". */
  tickHtml: string;
  /** Plain label for screen readers and lists, e.g. "ΔK=+1, K''=3". */
  name: string;
  /** Row centre on the ladder axis (rows 0, 1, 2 … from the bottom). */
  y: number;
  ladders: Ladder[];
}

/** Row key of a ladder (ladder key without the branch letter). */
export function ladderRowKey(ladder: Pick<Ladder, 'key'>): string {
  return ladder.key.slice(0, ladder.key.lastIndexOf(':'));
}

const DELTA_K_LETTER: Record<number, string> = { [-1]: 'p', 0: 'q', 1: 'r' };

/**
 * Group ladders into rows, drop hidden rows and assign row positions: the first row of the
 * ladders' order (ΔK = +1, K'' = 0) at the top.
 * @param ladders from bandLadders (ordered by ΔK, K'', branch)
 * @param shape rotor shape (a linear molecule gets a single row without K'')
 * @param hidden row keys not to draw
 */
export function ladderRowsBuild(ladders: readonly Ladder[], shape: TopShape, hidden: ReadonlySet<string> = new Set()): LadderRow[] {
  const rows: LadderRow[] = [];
  const byKey = new Map<string, LadderRow>();
  for (const ladder of ladders) {
    const key = ladderRowKey(ladder);
    if (hidden.has(key)) continue;
    let row = byKey.get(key);
    if (!row) {
      const letter = DELTA_K_LETTER[ladder.deltaK] ?? '?';
      const linear = shape === 'linear';
      row = {
        key,
        deltaK: ladder.deltaK,
        kLower: ladder.kLower,
        tickHtml: linear ? 'band' : `<sup>${letter}</sup>K″=${ladder.kLower}`,
        name: linear ? 'band' : `ΔK=${ladder.deltaK > 0 ? '+' : ''}${ladder.deltaK}, K''=${ladder.kLower}`,
        y: 0,
        ladders: [],
      };
      byKey.set(key, row);
      rows.push(row);
    }
    row.ladders.push(ladder);
  }
  rows.forEach((row, i) => (row.y = rows.length - 1 - i));
  return rows;
}

/**
 * Vertical extent of a rung relative to its row centre (row spacing 1): P from −h to 0, R from 0
 * to +h, Q from −h to +h, with h = 0.12 + 0.3·√I so strong lines stand out and rungs of
 * neighbouring rows never touch (h ≤ 0.42).
 * @param deltaJ −1, 0, +1
 * @param intensity relative intensity (strongest line of the band = 1)
 * @returns [bottom, top] offsets from the row centre
 */
export function rungExtent(deltaJ: number, intensity: number): [number, number] {
  const h = 0.12 + 0.3 * Math.sqrt(Math.min(Math.max(intensity, 0), 1));
  if (deltaJ < 0) return [-h, 0];
  if (deltaJ > 0) return [0, h];
  return [-h, h];
}

/** The end of a rung away from its row line (where assignment markers sit). */
export function rungTip(deltaJ: number, intensity: number): number {
  const [lo, hi] = rungExtent(deltaJ, intensity);
  return deltaJ < 0 ? lo : hi;
}

/**
 * Plotly hover template of a ladder's label, J'' taken from customdata[2]: e.g.
 * "<sup>r</sup>Q<sub>3</sub>(%{text})". Our own markup, no outside text.
 */
export function ladderLabelTemplate(ladder: Pick<Ladder, 'deltaK' | 'deltaJ' | 'kLower'>, shape: TopShape): string {
  return lineLabelHtml(ladder.deltaK, ladder.deltaJ, ladder.kLower, 0, shape).replace(/\(0\)$/, '(%{text})');
}

/**
 * Quantum numbers of a clicked rung point: ladder traces carry, in their meta, the index into the
 * line list of every vertex (`lineIndex`); the marker traces (assigned, cursor) carry
 * [J', K', J'', K''] as customdata.
 * @param meta the clicked trace's meta
 * @param pointNumber the clicked vertex
 * @param customdata the clicked vertex's customdata
 * @param lines the line list the ladder traces were built from
 * @returns the quanta, or null when the point is not a rung
 */
export function rungPointQuanta(
  meta: { lineIndex?: readonly (number | null)[] } | undefined,
  pointNumber: unknown,
  customdata: unknown,
  lines: LineList,
): TransitionQuanta | null {
  if (meta && Array.isArray(meta.lineIndex)) {
    const i = typeof pointNumber === 'number' ? meta.lineIndex[pointNumber] : null;
    if (i === null || i === undefined || !(i >= 0 && i < lines.count)) return null;
    return { jUpper: lines.jUpper[i], kUpper: lines.kUpper[i], jLower: lines.jLower[i], kLower: lines.kLower[i] };
  }
  if (Array.isArray(customdata) && customdata.length >= 4 && customdata.every((v) => Number.isInteger(v))) {
    return { jUpper: customdata[0], kUpper: customdata[1], jLower: customdata[2], kLower: customdata[3] };
  }
  return null;
}

/** Options of ladderTracesBuild. */
export interface LadderTracesOptions {
  /** Visible x range, cm^-1; rungs outside it (plus 2 % margin) are left out. */
  xRangeCm1: [number, number];
  /** Plotly axis ids the rows are drawn on. @default 'x' and 'y2' */
  xaxis?: string;
  yaxis?: string;
  /** Dark theme (lighter colours). @default false */
  isDark?: boolean;
}

/**
 * Plotly traces of the ladder rows: one trace per colour and line width (rows of one ΔK share a
 * hue every 8 K'' values; Q rungs are drawn wider); each series is one polyline of 4 vertices per
 * rung (row line, rung ends, row line), series separated by null gaps. Few traces and few SVG paths: their number is most of plotly's
 * redraw cost after a zoom. Every vertex carries its line label as text and its intensity as customdata (flat
 * arrays: nested customdata makes plotly's redraw several times slower); meta.lineIndex maps each
 * vertex back to the line list for clicks (rungPointQuanta).
 * @param rows ladder rows (ladderRowsBuild)
 * @param lines the line list the ladders index
 * @param shape top shape (for labels)
 * @param options visible range (cm^-1), axes, theme
 */
export function ladderTracesBuild(rows: readonly LadderRow[], lines: LineList, shape: TopShape, options: LadderTracesOptions): Data[] {
  const [from, to] = options.xRangeCm1;
  const margin = 0.02 * (to - from);
  const lo = from - margin;
  const hi = to + margin;
  type Group = { colour: string; width: number; deltaK: number; x: (number | null)[]; y: (number | null)[]; text: (string | null)[]; inten: (number | null)[]; lineIndex: (number | null)[] };
  const groups = new Map<string, Group>();
  for (const row of rows) {
    const colour = ladderColour(row.deltaK, row.kLower, options.isDark ?? false);
    for (const ladder of row.ladders) {
      const width = ladder.deltaJ === 0 ? 2.2 : 1.6;
      const gkey = `${colour}|${width}`;
      let g = groups.get(gkey);
      const template = ladderLabelTemplate(ladder, shape);
      let isOpen = false;
      for (const i of ladder.lineIndex) {
        const nu = lines.wavenumberCm1[i];
        if (nu < lo || nu > hi) continue;
        if (!g) {
          g = { colour, width, deltaK: row.deltaK, x: [], y: [], text: [], inten: [], lineIndex: [] };
          groups.set(gkey, g);
        }
        // Rungs of one series are joined along the row line (base → ends → base), so the series is
        // one SVG path: plotly draws every null-separated piece as a path of its own, and thousands
        // of paths were most of a redraw. Only series are separated by nulls.
        const [b, t] = rungExtent(ladder.deltaJ, lines.intensity[i]);
        const label = template.replace('%{text}', String(lines.jLower[i]));
        const inten = lines.intensity[i];
        g.x.push(nu, nu, nu, nu);
        g.y.push(row.y, row.y + b, row.y + t, row.y);
        g.text.push(label, label, label, label);
        g.inten.push(inten, inten, inten, inten);
        g.lineIndex.push(i, i, i, i);
        isOpen = true;
      }
      if (g && isOpen) {
        g.x.push(null);
        g.y.push(null);
        g.text.push(null);
        g.inten.push(null);
        g.lineIndex.push(null);
      }
    }
  }
  const out: Data[] = [];
  for (const g of groups.values()) {
    out.push({
      type: 'scatter',
      mode: 'lines',
      name: `ladders ${g.colour}`,
      x: g.x,
      y: g.y,
      xaxis: options.xaxis ?? 'x',
      yaxis: options.yaxis ?? 'y2',
      connectgaps: false,
      line: { color: g.colour, width: g.width },
      hovertemplate: '%{text}<br>%{x:.4f} cm⁻¹<br>rel. intensity %{customdata:.3g}<extra></extra>',
      text: g.text as string[],
      customdata: g.inten as unknown as number[],
      meta: { kind: 'rungs', deltaK: g.deltaK, lineIndex: g.lineIndex },
      showlegend: false,
    } as Data);
  }
  return out;
}
