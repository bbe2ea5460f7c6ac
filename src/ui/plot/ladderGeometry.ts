/**
 * Geometry of the sub-branch ladders drawn above the trace: one row per (ΔK, K'') series, P rungs
 * hanging below the row line, R rungs standing above it, Q rungs through it; rung length grows with
 * the line's intensity. Pure: ladders in, rows and rung extents out (painted by ladderScene).
 */
import type { Ladder } from '../../physics/bandLadders';
import { lineLabelHtml } from '../../physics/lineLabel';
import type { TopShape } from '../../physics/model';

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
  /** Rung colour when the row belongs to one of several bands (the band's colour family); absent: by ΔK and K''. */
  colour?: string;
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
