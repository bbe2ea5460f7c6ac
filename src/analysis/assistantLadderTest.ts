/**
 * Assigning a rung whose prediction is still too uncertain for a direct match: every peak in its
 * window is tried as a hypothesis, and a hypothesis is kept only when the lines it makes
 * predictable land on peaks clearly more often than under every rival hypothesis.
 */
import type { AssistantPeakContext } from './assistantPeakContext';
import { assistantNearestPeak, assistantPeaksInRange, assistantWindowLimitCm1 } from './assistantPeakContext';
import type { AssistantPosterior } from './assistantPosterior';
import type { AssistantCatalogue } from './assistantPredict';
import type { AssistantOptionsResolved } from './assistantTypes';
import type { PeakList } from './peaksFind';
import type { BandModel } from '../physics/model';

/** Inputs of assistantLadderTest. */
export interface AssistantLadderTestInput {
  model: Pick<BandModel, 'shape' | 'band'>;
  cat: AssistantCatalogue;
  post: AssistantPosterior;
  peaks: PeakList;
  context: AssistantPeakContext;
  options: AssistantOptionsResolved;
  /** 1 for catalogue rungs already assigned. */
  isRungAssigned: Uint8Array;
  /** 1 for rungs already sharp enough for a direct match (they are not evidence for a hypothesis). */
  isSharp: Uint8Array;
  /** Label of the line on each peak ('' when free). */
  peakOwner: string[];
  /** Rungs worth testing (unassigned, strong enough, window too wide for a direct match). */
  candidates: readonly number[];
  /** Peak height per unit relative intensity (NaN when not yet known). */
  heightScale: number;
  /** Smallest predicted peak height worth testing, absorbance. */
  minHeight: number;
  /** Expected unrelated peaks allowed in a window where peaks are sparse (assistantWindowLimitCm1). */
  chancePeaks: number;
}

/** A hypothesis the data single out. */
export interface AssistantLadderPick {
  rung: number;
  peak: number;
  /** Lines made predictable by the hypothesis that land on exactly one free peak of plausible height. */
  confirmed: number;
  /** Strong lines made predictable that land on no peak at all. */
  missing: number;
  /** Lines made predictable (strong enough to be seen). */
  testable: number;
  /** Net score (confirmed − missing) of the best rival peak for the same rung. */
  rivalScore: number;
  /** Hypotheses tried (peaks, or peak pairs for a two-rung hypothesis). */
  tried: number;
  /** The other rung of a two-rung hypothesis (the next J'' of the same series), or −1. */
  withRung: number;
}

/** Sub-band index as assistantSubBandIndex (repeated here to keep the import graph acyclic). */
function subBandOf(model: Pick<BandModel, 'shape' | 'band'>, deltaK: number, kLower: number): number {
  if (model.shape === 'linear') return 0;
  return model.band === 'perpendicular' ? deltaK * kLower : kLower;
}

/** Most candidate peaks tried per rung. */
const MAX_PEAKS_TRIED = 40;
/** Most rungs per call tested with a partner rung (each costs up to MAX_PEAKS_TRIED² hypotheses). */
const MAX_DEEP_RUNGS = 12;
/** Most rungs tested per call (the sharpest of each sub-band first). */
const MAX_RUNGS_TESTED = 80;
/** A hypothesis needs at least this net score… */
const MIN_SCORE = 4;
/** …at least this fraction of its testable lines confirmed… */
const MIN_CONFIRMED_FRACTION = 0.5;
/** …and every rival at most this fraction of its score. */
const MAX_RIVAL_FRACTION = 0.4;

/**
 * Test hypotheses for rungs predicted too loosely to match directly. For a rung r with predicted
 * ν_r and tolerance variance V_r, each free peak y within k·sqrt(V_r + σ_y²) whose height fits is
 * a hypothesis; conditioning the posterior on it moves every other line i to
 * ν_i' = ν_i + c_ir (y − ν_r)/(V_r + σ_y²) with variance V_i' = V_i − c_ir²/(V_r + σ_y²),
 * c_ir = f² g_iᵀ C g_r (the lines' covariance through the constants). The lines that become
 * predictable (window k·σ' within maxWindowFwhm FWHM, not before) are the evidence: each one
 * with exactly one free peak of plausible height in its window confirms, each strong one with no
 * peak at all counts against. A rung's best hypothesis is kept when its net score is ≥ 4, at
 * least half its testable lines confirm and no rival peak scores above 0.4 of it.
 * Source: conditional Gaussian (Kalman) update of the prediction, e.g. Bishop, Pattern Recognition
 * and Machine Learning (2006) eq. 2.81–2.82; testing a trial assignment by the lines it predicts is
 * the common practice of assignment by hand (a Loomis–Wood series must continue).
 * @returns at most one pick per rung, best first; no two picks share a peak
 */
export function assistantLadderTest(input: AssistantLadderTestInput): AssistantLadderPick[] {
  const { cat, post, peaks, context, options } = input;
  const grad = cat.gradient;
  const p = post.keys.length;
  if (!grad || p === 0 || input.candidates.length === 0) return [];
  const k = options.toleranceSigma;
  const f2 = post.studentFactor * post.studentFactor;
  const n = cat.lines.count;
  const heightOk = (peak: number, intensity: number): boolean => {
    if (!(input.heightScale > 0)) return true;
    const r = peaks.height[peak] / (input.heightScale * intensity);
    return r <= options.intensityRatioMax && r >= 1 / options.intensityRatioMax;
  };
  // Rungs to test: per sub-band, the sharpest first.
  const bySub = new Map<number, number[]>();
  for (const r of input.candidates) {
    const m = subBandOf(input.model, cat.lines.deltaK[r], cat.lines.kLower[r]);
    if (!bySub.has(m)) bySub.set(m, []);
    bySub.get(m)!.push(r);
  }
  const order: number[] = [];
  for (const list of bySub.values()) list.sort((a, b) => cat.toleranceSigmaCm1[a] - cat.toleranceSigmaCm1[b]);
  for (let round = 0; order.length < MAX_RUNGS_TESTED; round++) {
    let added = false;
    for (const list of bySub.values()) {
      if (round < Math.min(list.length, 2)) {
        order.push(list[round]);
        added = true;
      }
    }
    if (!added) break;
  }
  const windowLimit = Float64Array.from({ length: n }, (_, i) =>
    assistantWindowLimitCm1(peaks, context, cat.predictedCm1[i], options.maxWindowFwhm, input.chancePeaks),
  );
  // The sharpest rungs first, whatever their sub-band (only they can be tested with few peaks).
  order.sort((a, b) => cat.toleranceSigmaCm1[a] - cat.toleranceSigmaCm1[b]);
  const cg = new Float64Array(p);
  /** Tolerance-scale covariance of every line with line r: f² g_iᵀ C g_r. */
  const covWith = (r: number): Float64Array => {
    const gr = grad.subarray(r * p, (r + 1) * p);
    for (let a = 0; a < p; a++) {
      let t = 0;
      for (let b = 0; b < p; b++) t += post.covariance[a * p + b] * gr[b];
      cg[a] = t;
    }
    const out = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      let c = 0;
      const o = i * p;
      for (let a = 0; a < p; a++) c += grad[o + a] * cg[a];
      out[i] = c * f2;
    }
    return out;
  };
  const centreVar = (x: number): number => {
    const q = assistantNearestPeak(peaks, x);
    return q >= 0 ? peaks.centreSigmaCm1[q] ** 2 : 0;
  };
  const isCounted = (i: number): boolean =>
    !input.isRungAssigned[i] &&
    !input.isSharp[i] &&
    (!Number.isFinite(input.heightScale) || input.heightScale * cat.lines.intensity[i] >= input.minHeight);
  const isStrong = (i: number): boolean =>
    Number.isFinite(input.heightScale) && input.heightScale * cat.lines.intensity[i] >= 3 * input.minHeight;
  /** Lines whose window, with the remaining variance v(i), is narrow enough to test. */
  const testableOf = (exclude: number[], variance: (i: number) => number): number[] => {
    const out: number[] = [];
    for (let i = 0; i < n; i++) {
      if (exclude.includes(i) || !isCounted(i)) continue;
      const v = variance(i);
      if (!(v > 0)) continue;
      if (k * Math.sqrt(v) > windowLimit[i]) continue;
      out.push(i);
    }
    return out;
  };
  /** Evidence for one hypothesis: positions ν_i + shift(i), variances v(i). */
  const evidence = (testable: number[], position: (i: number) => number, variance: (i: number) => number, taken: number[]) => {
    let confirmed = 0;
    let missing = 0;
    for (const i of testable) {
      const nu = position(i);
      const w = k * Math.sqrt(variance(i) + centreVar(nu));
      const [a, b] = assistantPeaksInRange(peaks, nu - w, nu + w);
      if (b < a) {
        if (isStrong(i)) missing++;
        continue;
      }
      if (b === a && input.peakOwner[a] === '' && !taken.includes(a) && heightOk(a, cat.lines.intensity[i])) confirmed++;
    }
    return { confirmed, missing, net: confirmed - missing };
  };
  const peakChoices = (centre: number, half: number, rung: number, taken: number[]): number[] => {
    const [first, last] = assistantPeaksInRange(peaks, centre - half, centre + half);
    if (last < first || last - first + 1 > MAX_PEAKS_TRIED) return [];
    const out: number[] = [];
    for (let y = first; y <= last; y++) {
      if (input.peakOwner[y] !== '' || usedPeaks.has(y) || taken.includes(y)) continue;
      if (heightOk(y, cat.lines.intensity[rung])) out.push(y);
    }
    return out;
  };
  /** The next rung of r's series (J'' ± 1), unassigned and strong enough, best conditioned on r. */
  const partnerOf = (r: number, c1: Float64Array, d1: number): number => {
    let best = -1;
    let bestVar = Infinity;
    for (const step of [-1, 1]) {
      const jLo = cat.lines.jLower[r] + step;
      const key = `${jLo + cat.lines.deltaJ[r]},${cat.lines.kUpper[r]},${jLo},${cat.lines.kLower[r]}`;
      const j = cat.indexOf.get(key);
      if (j === undefined || !isCounted(j)) continue;
      const v = cat.toleranceSigmaCm1[j] ** 2 - (c1[j] * c1[j]) / d1;
      if (v < bestVar) {
        bestVar = v;
        best = j;
      }
    }
    return best;
  };
  const picks: AssistantLadderPick[] = [];
  const usedPeaks = new Set<number>();
  let nDeep = 0;
  for (const r of order.slice(0, MAX_RUNGS_TESTED)) {
    const c1 = covWith(r);
    const d1 = cat.toleranceSigmaCm1[r] ** 2 + centreVar(cat.predictedCm1[r]);
    const v1 = (i: number) => cat.toleranceSigmaCm1[i] ** 2 - (c1[i] * c1[i]) / d1;
    const testable = testableOf([r], v1);
    const scores: { peaks: number[]; rungs: number[]; net: number; confirmed: number; missing: number }[] = [];
    let nTestable = testable.length;
    if (testable.length >= MIN_SCORE) {
      for (const y of peakChoices(cat.predictedCm1[r], k * Math.sqrt(d1), r, [])) {
        const shift = (peaks.wavenumberCm1[y] - cat.predictedCm1[r]) / d1;
        const e = evidence(testable, (i) => cat.predictedCm1[i] + c1[i] * shift, v1, [y]);
        scores.push({ peaks: [y], rungs: [r], ...e });
      }
    } else if (nDeep < MAX_DEEP_RUNGS) {
      // One line more cannot pin anything down here: try r with the next rung of its series.
      const r2 = partnerOf(r, c1, d1);
      if (r2 < 0) continue;
      nDeep++;
      const c2 = covWith(r2);
      const c12 = c1[r2];
      const c2c = Float64Array.from(c2, (c, i) => c - (c1[i] * c12) / d1);
      const v2r = cat.toleranceSigmaCm1[r2] ** 2 - (c12 * c12) / d1;
      const d2 = v2r + centreVar(cat.predictedCm1[r2]);
      const v12 = (i: number) => v1(i) - (c2c[i] * c2c[i]) / d2;
      const testable2 = testableOf([r, r2], v12);
      nTestable = testable2.length;
      if (testable2.length < MIN_SCORE) continue;
      for (const y1 of peakChoices(cat.predictedCm1[r], k * Math.sqrt(d1), r, [])) {
        const s1 = (peaks.wavenumberCm1[y1] - cat.predictedCm1[r]) / d1;
        const nu2 = cat.predictedCm1[r2] + c12 * s1;
        for (const y2 of peakChoices(nu2, k * Math.sqrt(d2), r2, [y1])) {
          const s2 = (peaks.wavenumberCm1[y2] - nu2) / d2;
          const e = evidence(testable2, (i) => cat.predictedCm1[i] + c1[i] * s1 + c2c[i] * s2, v12, [y1, y2]);
          scores.push({ peaks: [y1, y2], rungs: [r, r2], ...e });
        }
      }
    }
    if (scores.length === 0) continue;
    scores.sort((a, b) => b.net - a.net);
    const best = scores[0];
    const rival = scores.length > 1 ? scores[1].net : 0;
    if (best.net < MIN_SCORE || best.confirmed < MIN_CONFIRMED_FRACTION * nTestable) continue;
    if (rival > MAX_RIVAL_FRACTION * best.net) continue;
    best.rungs.forEach((rung, t) => {
      usedPeaks.add(best.peaks[t]);
      picks.push({
        rung,
        peak: best.peaks[t],
        confirmed: best.confirmed,
        missing: best.missing,
        testable: nTestable,
        rivalScore: rival,
        tried: scores.length,
        withRung: best.rungs.length > 1 ? best.rungs[1 - t] : -1,
      });
    });
  }
  picks.sort((a, b) => b.confirmed - a.confirmed);
  return picks;
}
