/**
 * Loomis–Wood grid: the trace cut into strips of ± a half width around each predicted rung of a
 * series, one strip per J'', so that a correctly predicted series lines up vertically.
 */
import type { Trace } from '../../io/trace';
import { sortedLowerBound } from '../../state/sortedSearch';

/** One strip centre: a rung of the series. */
export interface LoomisCentre {
  jLower: number;
  /** Predicted position, cm^-1. */
  centreCm1: number;
}

/** The heatmap data. */
export interface LoomisGrid {
  /** Bin centres as offsets from the prediction, cm^-1 (ascending, symmetric about 0). */
  offsetCm1: number[];
  /** J'' of each strip (rows, ascending). */
  jLower: number[];
  /** Predicted centre of each strip, cm^-1. */
  centreCm1: number[];
  /** z[row][bin]: largest absorbance of the samples in the bin (or the interpolated value when a
   *  bin holds no sample); null outside the trace. */
  z: (number | null)[][];
}

/**
 * Build the Loomis–Wood grid. Each bin keeps the largest absorbance among its samples, so a line
 * narrower than a bin stays visible; a bin finer than the sampling takes the linear interpolation
 * at its centre.
 * Source: F. W. Loomis and R. W. Wood, Phys. Rev. 32, 223 (1928) for the diagram (from memory);
 * binning is common practice.
 * @param trace ascending wavenumber (cm^-1) and absorbance
 * @param centres strip centres (any order; sorted by J'' in the output)
 * @param halfWidthCm1 half width of each strip, cm^-1 (> 0)
 * @param bins bins per strip (>= 2)
 */
export function loomisWoodGrid(trace: Trace, centres: readonly LoomisCentre[], halfWidthCm1: number, bins: number): LoomisGrid {
  if (!(halfWidthCm1 > 0)) throw new Error(`loomisWoodGrid: halfWidthCm1 must be > 0, got ${halfWidthCm1}`);
  if (!Number.isInteger(bins) || bins < 2) throw new Error(`loomisWoodGrid: bins must be a whole number >= 2, got ${bins}`);
  const x = trace.wavenumberCm1;
  const a = trace.absorbance;
  const width = (2 * halfWidthCm1) / bins;
  const offsetCm1 = Array.from({ length: bins }, (_, b) => -halfWidthCm1 + (b + 0.5) * width);
  const sorted = [...centres].sort((p, q) => p.jLower - q.jLower);
  const z: (number | null)[][] = [];
  for (const c of sorted) {
    const from = c.centreCm1 - halfWidthCm1;
    const row: (number | null)[] = new Array(bins).fill(null);
    let i = sortedLowerBound(x, from);
    for (; i < x.length && x[i] < from + 2 * halfWidthCm1; i++) {
      const b = Math.min(Math.floor((x[i] - from) / width), bins - 1);
      const v = a[i];
      if (!Number.isFinite(v)) continue;
      const cur = row[b];
      if (cur === null || v > cur) row[b] = v;
    }
    for (let b = 0; b < bins; b++) {
      if (row[b] !== null) continue;
      const xc = from + (b + 0.5) * width;
      const k = sortedLowerBound(x, xc);
      if (k === 0 || k >= x.length) continue;
      const f = (xc - x[k - 1]) / (x[k] - x[k - 1]);
      row[b] = a[k - 1] * (1 - f) + a[k] * f;
    }
    z.push(row);
  }
  return { offsetCm1, jLower: sorted.map((c) => c.jLower), centreCm1: sorted.map((c) => c.centreCm1), z };
}
