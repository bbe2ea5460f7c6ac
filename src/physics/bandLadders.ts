import type { LineList, TopShape } from './model';
import { seriesLabelAscii } from './lineLabel';

/** One sub-branch series: all lines of one (ΔK, K'', ΔJ), as rungs ordered by J''. */
export interface Ladder {
  /** Stable key, e.g. "r:3:Q" (ΔK letter, K'', branch). */
  key: string;
  /** ASCII series label, e.g. "rQ3". */
  label: string;
  deltaK: number;
  deltaJ: number;
  kLower: number;
  /** Indices into the line list, ordered by ascending J''. */
  lineIndex: Int32Array;
}

/**
 * Group a line list into sub-branch ladders: for each ΔK and K'', the P, Q and R series as ordered
 * rungs in J''. Ladders come ordered by ΔK (+1, 0, −1), K'', then P, Q, R.
 * @param lines columnar line list (any order)
 */
export function bandLadders(lines: LineList, shape: TopShape): Ladder[] {
  const groups = new Map<string, { deltaK: number; deltaJ: number; kLower: number; idx: number[] }>();
  for (let i = 0; i < lines.count; i++) {
    const deltaK = lines.deltaK[i];
    const deltaJ = lines.deltaJ[i];
    const kLower = lines.kLower[i];
    const key = `${'pqr'[deltaK + 1]}:${kLower}:${'PQR'[deltaJ + 1]}`;
    let g = groups.get(key);
    if (!g) {
      g = { deltaK, deltaJ, kLower, idx: [] };
      groups.set(key, g);
    }
    g.idx.push(i);
  }
  const out: Ladder[] = [];
  for (const [key, g] of groups) {
    g.idx.sort((a, b) => lines.jLower[a] - lines.jLower[b]);
    out.push({
      key,
      label: seriesLabelAscii(g.deltaK, g.deltaJ, g.kLower, shape),
      deltaK: g.deltaK,
      deltaJ: g.deltaJ,
      kLower: g.kLower,
      lineIndex: Int32Array.from(g.idx),
    });
  }
  out.sort((a, b) => b.deltaK - a.deltaK || a.kLower - b.kLower || a.deltaJ - b.deltaJ);
  return out;
}
