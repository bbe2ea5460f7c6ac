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
 * Quantum numbers of a clicked rung point: ladder traces carry the series in their meta and J''
 * as the point's text; the marker traces (assigned, cursor) carry [J', K', J'', K''] as customdata.
 * @returns the quanta, or null when the point is not a rung
 */
export function rungPointQuanta(
  meta: { deltaK?: number; deltaJ?: number; kLower?: number } | undefined,
  text: unknown,
  customdata: unknown,
): TransitionQuanta | null {
  if (meta && meta.deltaK !== undefined && meta.deltaJ !== undefined && meta.kLower !== undefined) {
    const j = Number(text);
    if (!Number.isInteger(j)) return null;
    return { jUpper: j + meta.deltaJ, kUpper: meta.kLower + meta.deltaK, jLower: j, kLower: meta.kLower };
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
 * One plotly line trace per ladder (ΔK, K'', branch): rung segments separated by nulls, with
 * J'' as text and the intensity as customdata on both ends (the hover template shows label,
 * position and intensity; rungPointQuanta turns a clicked point back into quanta).
 * @param rows from ladderRowsBuild
 * @param lines the line list the ladders index into (positions cm^-1, relative intensities)
 * @param shape rotor shape (for labels)
 */
export function ladderTracesBuild(rows: readonly LadderRow[], lines: LineList, shape: TopShape, options: LadderTracesOptions): Data[] {
  const [from, to] = options.xRangeCm1;
  const margin = 0.02 * (to - from);
  const lo = from - margin;
  const hi = to + margin;
  const out: Data[] = [];
  for (const row of rows) {
    const colour = ladderColour(row.deltaK, row.kLower, options.isDark ?? false);
    for (const ladder of row.ladders) {
      const x: (number | null)[] = [];
      const y: (number | null)[] = [];
      // Flat per-vertex arrays only (nested customdata makes plotly's redraw several times slower):
      // text = J'', customdata = intensity; the trace's meta names the series, so a click
      // recovers the quanta from (meta, J'') and the hover template fills in the label.
      const jText: (number | null)[] = [];
      const inten: (number | null)[] = [];
      for (const i of ladder.lineIndex) {
        const nu = lines.wavenumberCm1[i];
        if (nu < lo || nu > hi) continue;
        const [b, t] = rungExtent(ladder.deltaJ, lines.intensity[i]);
        x.push(nu, nu, null);
        y.push(row.y + b, row.y + t, null);
        jText.push(lines.jLower[i], lines.jLower[i], null);
        inten.push(lines.intensity[i], lines.intensity[i], null);
      }
      if (x.length === 0) continue;
      out.push({
        type: 'scatter',
        mode: 'lines',
        name: ladder.label,
        x,
        y,
        xaxis: options.xaxis ?? 'x',
        yaxis: options.yaxis ?? 'y2',
        connectgaps: false,
        line: { color: colour, width: ladder.deltaJ === 0 ? 2.2 : 1.6 },
        hovertemplate: `${ladderLabelTemplate(ladder, shape)}<br>%{x:.4f} cm⁻¹<br>rel. intensity %{customdata:.3g}<extra></extra>`,
        text: jText as unknown as string[],
        customdata: inten as unknown as number[],
        meta: { kind: 'rungs', ladderKey: ladder.key, deltaK: ladder.deltaK, deltaJ: ladder.deltaJ, kLower: ladder.kLower },
        showlegend: false,
      } as Data);
    }
  }
  return out;
}
