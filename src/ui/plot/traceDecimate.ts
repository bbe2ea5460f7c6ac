/**
 * Per-pixel-column min/max decimation of a sorted trace, so plotly gets at most ~2 points per
 * screen column of the visible range instead of every sample.
 */
import { sortedLowerBound } from '../../state/sortedSearch';

export { sortedLowerBound };

/** Output of traceDecimate: the kept points, in ascending x. */
export interface DecimatedTrace {
  /** Kept abscissae, cm^-1 (ascending). */
  x: Float64Array;
  /** Kept ordinates (after the optional transform). */
  y: Float64Array;
  /** True when points were dropped (the visible range held more than 2 × columns samples). */
  isDecimated: boolean;
}

/**
 * Keep, for each of `columns` equal-width columns of [fromCm1, toCm1], the samples holding the
 * column's smallest and largest y (in their original order), plus one sample beyond each edge so
 * the drawn line runs off the plot instead of stopping short. The envelope of the drawn line is then
 * the same as with every sample at that screen resolution (the usual min/max, or "M4" without the
 * first/last, decimation). Non-finite y values are skipped. When the visible range holds no more than
 * 2 × columns samples they are all returned.
 * Source: common practice for line charts of long series (e.g. Jugel et al., "M4: A
 * visualization-oriented time series data aggregation", Proc. VLDB Endow. 7 (2014) 797).
 * @param x ascending abscissae, cm^-1
 * @param y ordinates, same length
 * @param fromCm1 left edge of the visible range, cm^-1
 * @param toCm1 right edge, cm^-1 (> fromCm1)
 * @param columns number of pixel columns (>= 1)
 * @param transform optional monotone map applied to every kept y (e.g. absorbance → transmittance);
 *   min/max are chosen on the raw y, which a monotone map preserves as a set
 */
export function traceDecimate(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  fromCm1: number,
  toCm1: number,
  columns: number,
  transform?: (v: number) => number,
): DecimatedTrace {
  if (x.length !== y.length) throw new Error(`traceDecimate: x and y differ in length (${x.length} vs ${y.length})`);
  if (!(toCm1 > fromCm1)) throw new Error(`traceDecimate: toCm1 must exceed fromCm1, got ${fromCm1} … ${toCm1}`);
  if (!Number.isInteger(columns) || columns < 1) throw new Error(`traceDecimate: columns must be a whole number >= 1, got ${columns}`);
  const n = x.length;
  const f = transform ?? ((v: number) => v);
  const start = Math.max(sortedLowerBound(x, fromCm1) - 1, 0);
  const end = Math.min(sortedLowerBound(x, toCm1) + 1, n); // exclusive; one sample past the edge
  const visible = end - start;
  if (visible <= 2 * columns + 2) {
    const ox: number[] = [];
    const oy: number[] = [];
    for (let i = start; i < end; i++) {
      if (!Number.isFinite(y[i])) continue;
      ox.push(x[i]);
      oy.push(f(y[i]));
    }
    return { x: Float64Array.from(ox), y: Float64Array.from(oy), isDecimated: false };
  }
  const outX = new Float64Array(2 * columns + 2);
  const outY = new Float64Array(2 * columns + 2);
  let m = 0;
  const push = (i: number) => {
    outX[m] = x[i];
    outY[m] = f(y[i]);
    m++;
  };
  // Samples strictly outside [from, to] at the edges are kept as they are.
  let i = start;
  if (x[i] < fromCm1 && Number.isFinite(y[i])) push(i);
  if (x[i] < fromCm1) i++;
  const last = x[end - 1] > toCm1 ? end - 1 : end;
  const width = (toCm1 - fromCm1) / columns;
  const colOf = (v: number) => Math.min(Math.max(Math.floor((v - fromCm1) / width), 0), columns - 1);
  while (i < last) {
    // Membership by the same formula for every sample, so each pass consumes at least one.
    const col = colOf(x[i]);
    let iMin = -1;
    let iMax = -1;
    for (; i < last && colOf(x[i]) === col; i++) {
      const v = y[i];
      if (!Number.isFinite(v)) continue;
      if (iMin < 0 || v < y[iMin]) iMin = i;
      if (iMax < 0 || v > y[iMax]) iMax = i;
    }
    if (iMin < 0) continue;
    if (iMin === iMax) push(iMin);
    else if (iMin < iMax) {
      push(iMin);
      push(iMax);
    } else {
      push(iMax);
      push(iMin);
    }
  }
  if (last < end && Number.isFinite(y[last])) push(last);
  return { x: outX.slice(0, m), y: outY.slice(0, m), isDecimated: true };
}
