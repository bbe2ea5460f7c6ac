/** Local maxima of a trace with their prominences (columnar; see {@link peakProminence}). */
export interface LocalMaxima {
  count: number;
  /** Sample index of each maximum (middle sample of a flat top), ascending. */
  index: Int32Array;
  /** Prominence of each maximum, ordinate unit (≥ 0). */
  prominence: Float64Array;
}

/**
 * Every interior local maximum of `y` and its topographic prominence, in O(n).
 *
 * A local maximum is y[i−1] < y[i] ≥ y[i+1]; a flat top (run of equal samples) counts once, at its
 * middle sample, when a drop follows it. End samples are never maxima. For a maximum p the left base
 * is the lowest value in (l, p], l being the nearest index left of p with y[l] > y[p] (or the trace
 * start); the right base likewise; prominence = y[p] − max(left base, right base). Equal heights do not
 * stop the search, as in SciPy.
 *
 * Algorithm (our own O(n) formulation): one pass finds the maxima and the lowest value of each valley
 * between consecutive maxima. Only maxima can stop a base search (the first higher sample either is a
 * maximum or lies on a slope rising to a higher one) and only valley minima can be bases, so a
 * monotonic stack over the maxima, each entry carrying the lowest valley it has absorbed, gives every
 * base in one sweep per direction; each maximum is pushed and popped once.
 * Source: definition of SciPy `signal.peak_prominences` (Virtanen et al., Nat. Methods 17, 261 (2020),
 * function documentation), i.e. the topographic prominence of a summit.
 * @param y ordinate (any unit)
 * @returns maxima and prominences (ordinate unit); the higher base is y[index] − prominence
 */
export function peakProminence(y: ArrayLike<number>): LocalMaxima {
  const n = y.length;
  // At most one maximum per two samples, so no buffer ever grows. The passes are separate functions
  // so that V8 optimises each loop on its own feedback (one big function kept deoptimising on entry to
  // the second loop, doubling the run time of the first calls).
  const capacity = n > 2 ? ((n - 1) >> 1) + 1 : 0;
  const work: ProminenceWork = {
    index: new Int32Array(capacity),
    valley: new Float64Array(capacity + 1),
    prominence: new Float64Array(capacity),
    stackHeight: new Float64Array(capacity),
    stackLow: new Float64Array(capacity),
  };
  const m = prominenceLeftPass(y, work);
  prominenceRightPass(y, work, m);
  return { count: m, index: work.index.subarray(0, m), prominence: work.prominence.subarray(0, m) };
}

interface ProminenceWork {
  index: Int32Array;
  /** valley[k]: lowest value between maximum k−1 (or the start) and maximum k; valley[count] after the last. */
  valley: Float64Array;
  /** Left base after the left pass, prominence after the right pass. */
  prominence: Float64Array;
  stackHeight: Float64Array;
  stackLow: Float64Array;
}

/** Finds the maxima and valley minima and, with the stack, each left base. Returns the count. */
function prominenceLeftPass(y: ArrayLike<number>, work: ProminenceWork): number {
  const { index, valley, prominence, stackHeight, stackLow } = work;
  const n = y.length;
  let top = -1;
  let m = 0;
  let low = n > 0 ? y[0] : 0;
  // rising: y[i] > y[i−1], carried over from the previous comparison (one compare per sample).
  let rising = n > 1 && y[1] > y[0];
  for (let i = 1; i < n - 1; i++) {
    const v = y[i];
    const after = y[i + 1];
    low = Math.min(low, v);
    const wasRising = rising;
    rising = after > v;
    if (!wasRising || rising) continue;
    let peak = i;
    if (v === after) {
      let j = i + 1;
      while (j < n - 1 && y[j + 1] === v) j++;
      i = j;
      if (j >= n - 1) continue;
      rising = y[j + 1] > v;
      if (rising) continue;
      peak = (peak + j) >> 1;
    }
    valley[m] = low;
    index[m] = peak;
    let lowest = low;
    while (top >= 0 && stackHeight[top] <= v) {
      const s = stackLow[top];
      if (s < lowest) lowest = s;
      top--;
    }
    stackHeight[++top] = v;
    stackLow[top] = lowest;
    prominence[m++] = lowest;
    low = v;
  }
  if (n > 0 && y[n - 1] < low) low = y[n - 1];
  valley[m] = low;
  return m;
}

/** Right bases by the mirror sweep; turns the stored left bases into prominences. */
function prominenceRightPass(y: ArrayLike<number>, work: ProminenceWork, m: number): void {
  const { index, valley, prominence, stackHeight, stackLow } = work;
  let top = -1;
  for (let k = m - 1; k >= 0; k--) {
    const h = y[index[k]];
    let lowest = valley[k + 1];
    while (top >= 0 && stackHeight[top] <= h) {
      const s = stackLow[top];
      if (s < lowest) lowest = s;
      top--;
    }
    stackHeight[++top] = h;
    stackLow[top] = lowest;
    const leftBase = prominence[k];
    prominence[k] = h - (leftBase > lowest ? leftBase : lowest);
  }
}
