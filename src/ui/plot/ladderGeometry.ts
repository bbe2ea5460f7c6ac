/**
 * Geometry of the sub-branch ladders drawn above the trace: one row per (ΔK, K'') series, P rungs
 * hanging below the row line, R rungs standing above it, Q rungs through it; rung length grows with
 * the line's intensity. Pure: ladders and lines in, plotly trace objects out.
 */
import type { Data } from 'plotly.js';
import type { Ladder } from '../../physics/bandLadders';
import { lineLabelHtml } from '../../physics/lineLabel';
import type { LineList, TopShape } from '../../physics/model';
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
 * hover text (label, position, intensity) on both ends and customdata [J', K', J'', K''] for clicks.
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
      const text: (string | null)[] = [];
      const custom: (number[] | null)[] = [];
      for (const i of ladder.lineIndex) {
        const nu = lines.wavenumberCm1[i];
        if (nu < lo || nu > hi) continue;
        const [b, t] = rungExtent(ladder.deltaJ, lines.intensity[i]);
        const label = `${lineLabelHtml(lines.deltaK[i], lines.deltaJ[i], lines.kLower[i], lines.jLower[i], shape)}<br>${nu.toFixed(4)} cm⁻¹<br>rel. intensity ${lines.intensity[i].toPrecision(3)}`;
        const q = [lines.jUpper[i], lines.kUpper[i], lines.jLower[i], lines.kLower[i]];
        x.push(nu, nu, null);
        y.push(row.y + b, row.y + t, null);
        text.push(label, label, null);
        custom.push(q, q, null);
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
        hovertext: text as string[],
        hovertemplate: '%{hovertext}<extra></extra>',
        customdata: custom as unknown as number[][],
        meta: { kind: 'rungs', ladderKey: ladder.key },
        showlegend: false,
      } as Data);
    }
  }
  return out;
}
