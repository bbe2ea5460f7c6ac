import { assistantPeaksInRange } from './assistantPeakContext';
import type { PeakList } from './peaksFind';

/** Most grid steps on each side for each B direction. */
const SEARCH_MAX_STEPS = 250;

/** Windows of assistantShiftSearch: centre and half width of δ, s and d, cm^-1. */
export interface AssistantShiftWindows {
  deltaCentre: number;
  deltaWindow: number;
  sumCentre: number;
  sumWindow: number;
  diffCentre: number;
  diffWindow: number;
}

/** Best shift found by assistantShiftSearch. */
export interface AssistantShiftBest {
  delta: number;
  sum: number;
  diff: number;
  /** Lines with a peak within τ/2 at the best shift. */
  count: number;
  /** Lines used. */
  n: number;
  /** Median fraction over the grid (chance coincidences). */
  chance: number;
  /** Best count at any δ more than 2τ from the best δ (any s, d): how clear the optimum is. */
  secondCount: number;
  /** The shift (δ, s, d) of secondCount, when there is one. */
  second?: { delta: number; sum: number; diff: number };
  /** Best count within ±τ of the window centre δ (any s, d): how well no shift does. */
  centreCount: number;
  sumStep: number;
  diffStep: number;
}

/**
 * Grid search of (δ, s, d) maximising the number of lines i with a peak within τ/2 of
 * ν_i + δ + s·dSum(i) + d·dDiff(i); δ by a histogram in steps of τ, s and d in steps that move the
 * farthest line by τ (at most SEARCH_MAX_STEPS per side). Ties go to the smallest change.
 * Source: discrete cross-correlation of predicted line positions with the observed peaks (common
 * practice for aligning a predicted stick spectrum); histogram voting as in the Hough transform
 * (Duda & Hart, Commun. ACM 15, 11 (1972), from memory).
 * @param peaks observed peaks (ascending, cm^-1)
 * @param tau matching width τ, cm^-1 (> 0)
 * @param idx indices of the lines used (into position)
 * @param position predicted positions, cm^-1
 * @param dSum ∂ν/∂s of line i; dDiff ∂ν/∂d (dimensionless; return 0 for a δ-only search)
 * @param w centres and half widths of δ, s, d (cm^-1)
 */
export function assistantShiftSearch(
  peaks: PeakList,
  tau: number,
  idx: number[],
  position: Float64Array,
  dSum: (i: number) => number,
  dDiff: (i: number) => number,
  w: AssistantShiftWindows,
): AssistantShiftBest {
  const n = idx.length;
  const nu = Float64Array.from(idx, (i) => position[i]);
  const ds = Float64Array.from(idx, dSum);
  const dd = Float64Array.from(idx, dDiff);
  const steps = (d: Float64Array, window: number): { count: number; step: number } => {
    let max = 0;
    for (const v of d) max = Math.max(max, Math.abs(v));
    if (!(max > 0) || !(window > 0)) return { count: 0, step: 0 };
    const count = Math.min(SEARCH_MAX_STEPS, Math.ceil((window * max) / tau));
    return { count, step: window / count };
  };
  const sg = steps(ds, w.sumWindow);
  const dg = steps(dd, w.diffWindow);
  const nDelta = Math.max(1, Math.ceil(w.deltaWindow / tau));
  const bins = 2 * nDelta + 1;
  const score = new Int32Array(bins);
  const stamp = new Int32Array(bins);
  // How often each score occurs over the grid (for the median: the chance level).
  const histogram = new Float64Array(n + 1);
  const bestPerBin = new Int32Array(bins);
  const sumPerBin = new Float64Array(bins);
  const diffPerBin = new Float64Array(bins);
  let best: AssistantShiftBest = {
    delta: w.deltaCentre,
    sum: w.sumCentre,
    diff: w.diffCentre,
    count: -1,
    n,
    chance: 0,
    secondCount: 0,
    centreCount: 0,
    sumStep: sg.step,
    diffStep: dg.step,
  };
  let bestBin = nDelta;
  let bestCost = Infinity;
  for (let a = -sg.count; a <= sg.count; a++) {
    const sum = w.sumCentre + a * sg.step;
    for (let c = -dg.count; c <= dg.count; c++) {
      const diff = w.diffCentre + c * dg.step;
      score.fill(0);
      stamp.fill(-1);
      for (let k = 0; k < n; k++) {
        const x = nu[k] + sum * ds[k] + diff * dd[k] + w.deltaCentre;
        const [first, last] = assistantPeaksInRange(peaks, x - nDelta * tau - tau, x + nDelta * tau + tau);
        for (let p = first; p <= last; p++) {
          const shift = peaks.wavenumberCm1[p] - x;
          // Bins whose centre (b − nDelta)·τ lies within τ/2 of the shift (one or two bins).
          const lo = Math.max(0, Math.ceil((shift - 0.5 * tau) / tau + nDelta));
          const hi = Math.min(bins - 1, Math.floor((shift + 0.5 * tau) / tau + nDelta));
          for (let b = lo; b <= hi; b++) {
            if (stamp[b] === k) continue;
            stamp[b] = k;
            score[b]++;
          }
        }
      }
      for (let b = 0; b < bins; b++) {
        histogram[score[b]]++;
        if (score[b] > bestPerBin[b]) {
          bestPerBin[b] = score[b];
          sumPerBin[b] = sum;
          diffPerBin[b] = diff;
        }
        if (score[b] < best.count) continue;
        const deltaRel = (b - nDelta) * tau;
        const cost =
          Math.abs(deltaRel) / Math.max(w.deltaWindow, tau) +
          (sg.count ? Math.abs(a) / sg.count : 0) +
          (dg.count ? Math.abs(c) / dg.count : 0);
        if (score[b] > best.count || cost < bestCost) {
          best = { ...best, delta: w.deltaCentre + deltaRel, sum, diff, count: score[b] };
          bestCost = cost;
          bestBin = b;
        }
      }
    }
  }
  let cells = 0;
  for (const h of histogram) cells += h;
  let seen = 0;
  let median = 0;
  for (let v = 0; v <= n; v++) {
    seen += histogram[v];
    if (seen >= cells / 2) {
      median = v;
      break;
    }
  }
  best.chance = n > 0 ? median / n : 0;
  for (let b = 0; b < bins; b++) {
    if (Math.abs(b - bestBin) > 2 && bestPerBin[b] > best.secondCount) {
      best.secondCount = bestPerBin[b];
      best.second = { delta: w.deltaCentre + (b - nDelta) * tau, sum: sumPerBin[b], diff: diffPerBin[b] };
    }
  }
  for (let b = nDelta - 1; b <= nDelta + 1; b++) if (b >= 0 && b < bins) best.centreCount = Math.max(best.centreCount, bestPerBin[b]);
  if (best.count < 0) best.count = 0;
  return best;
}
