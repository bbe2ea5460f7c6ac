/**
 * Ranking of candidate transitions for an observed peak: which predicted lines could it be?
 */
import { lineLabelAscii, lineLabelHtml } from '../physics/lineLabel';
import type { LineList, TopShape, TransitionQuanta } from '../physics/model';

/** One candidate transition for a peak. */
export interface Candidate extends TransitionQuanta {
  /** Index into the line list. */
  lineIndex: number;
  /** Predicted position, cm^-1. */
  predictedCm1: number;
  /** peak − predicted, cm^-1. */
  distanceCm1: number;
  /** |distance| over the combined σ of prediction and peak; null when no σ is given. */
  distanceSigma: number | null;
  /** Observed peak height over the height the line's intensity predicts (null before a scale is known). */
  heightRatio: number | null;
  /** Relative intensity (strongest line = 1). */
  intensity: number;
  labelAscii: string;
  /** Label markup (no outside text). */
  labelHtml: string;
  /** Already assigned (to this or another peak). */
  isAssigned: boolean;
  /** Much weaker (< 1 %) than the strongest line in the window. */
  isWeak: boolean;
  /** Band and species of the line in a several-band session. */
  band?: string;
  species?: string;
  /** Level labels in a several-band session (state/systemLevelLabels.ts), where the band leaves a choice or a point group is declared. */
  lUpper?: -1 | 0 | 1;
  lLower?: -1 | 0 | 1;
  tagUpper?: string;
  tagLower?: string;
  /** The levels' symmetry as shown ("A2 ← A1"), '' or absent when unknown. */
  symmetryText?: string;
}

/** Options of candidatesRank. */
export interface CandidatesRankOptions {
  /** Lines within ± this of the peak are always candidates, cm^-1. */
  windowCm1: number;
  /**
   * The window of line i widens to windowSigma × its σ (σ_pred ⊕ σ_peak) when that is wider, so a
   * poorly predicted line is still offered. @default 5
   */
  windowSigma?: number;
  /** At most this many are returned (the list scrolls; keys 1–9 reach the first nine). @default 40 */
  maxCount?: number;
  /** When fewer than this many lie in the window, the nearest lines fill up to it. @default 3 */
  minCount?: number;
  /** 1σ of line i's prediction, cm^-1: from the fit, or a first-guess σ (absent: ranking by cm^-1). */
  predictionSigmaCm1?: (lineIndex: number) => number;
  /** 1σ of the peak centre, cm^-1. @default 0 */
  peakSigmaCm1?: number;
  /** Observed height of the peak (absorbance), for the intensity agreement. */
  peakHeight?: number;
  /** Peak height per unit relative intensity (absorbance), NaN/absent while unknown. */
  heightScale?: number;
  /** Height ratio counted as a 3σ disagreement (the assistant's limit of a plausible match). @default 5 */
  intensityRatioMax?: number;
  /** Lines for which this returns false are never offered (e.g. below the drawn intensity cut). */
  isOffered?: (lineIndex: number) => boolean;
  /** Quanta keys (see quantaKey) of assigned lines (a set, or a key → count map). */
  assignedKeys?: Pick<ReadonlySet<string>, 'has'>;
  shape: TopShape;
}

/** A height at the limit ratio counts as a position this many σ off (the assistant's default k). */
const INTENSITY_AT_LIMIT_SIGMA = 3;

/** A stable text key for quantum numbers: "J',K',J'',K''". */
export function quantaKey(q: TransitionQuanta): string {
  return `${q.jUpper},${q.kUpper},${q.jLower},${q.kLower}`;
}

/**
 * Candidate transitions for a peak, best first.
 *
 * A line is offered when it lies within ±max(windowCm1, windowSigma·σ) of the peak, σ being its
 * prediction σ ⊕ the peak's centre σ, so the search widens with the model's uncertainty. Ranking
 * combines position and intensity into one score, like a χ²:
 *   score = z² + (3·ln r / ln f)²,
 * z = |peak − predicted| / σ, r the ratio of the
 * observed height to the height the line's intensity predicts (once a height scale is known), or,
 * before that, the strongest line in the window over this one (a weak line rarely makes a peak a
 * strong one could), and f = intensityRatioMax: a height a factor f off (the assistant's limit of a
 * plausible match) counts as much as a position 3σ off (its position tolerance). Ties break by
 * intensity, strongest first. Without any σ the order is by |peak − predicted| with lines weaker
 * than 1 % of the strongest in the window last. Such weak lines are flagged in either case.
 * Source: common practice (assignment by prediction with an intensity check); the score is the
 * sum of squared normalised deviations (Bevington & Robinson 2003 ch. 6, from memory).
 * @param lines predicted lines (positions cm^-1, relative intensities)
 * @param peakCm1 observed peak position, cm^-1
 */
export function candidatesRank(lines: LineList, peakCm1: number, options: CandidatesRankOptions): Candidate[] {
  if (!Number.isFinite(peakCm1)) throw new Error(`candidatesRank: peakCm1 must be finite, got ${peakCm1}`);
  if (!(options.windowCm1 > 0)) throw new Error(`candidatesRank: windowCm1 must be > 0, got ${options.windowCm1}`);
  const maxCount = options.maxCount ?? 40;
  const minCount = options.minCount ?? 3;
  const windowSigma = options.windowSigma ?? 5;
  const peakSigma = options.peakSigmaCm1 ?? 0;
  const sigmaOf = (i: number): number | null => {
    if (!options.predictionSigmaCm1) return null;
    const s = Math.hypot(options.predictionSigmaCm1(i), peakSigma);
    return s > 0 && Number.isFinite(s) ? s : null;
  };
  const inWindow: number[] = [];
  const all: { i: number; d: number }[] = [];
  for (let i = 0; i < lines.count; i++) {
    if (options.isOffered && !options.isOffered(i)) continue;
    const d = Math.abs(peakCm1 - lines.wavenumberCm1[i]);
    const s = sigmaOf(i);
    if (d <= Math.max(options.windowCm1, s === null ? 0 : windowSigma * s)) inWindow.push(i);
    else all.push({ i, d });
  }
  if (inWindow.length < minCount) {
    all.sort((a, b) => a.d - b.d);
    for (const { i } of all.slice(0, minCount - inWindow.length)) inWindow.push(i);
  }
  let iMax = 0;
  for (const i of inWindow) iMax = Math.max(iMax, lines.intensity[i]);
  const lnF = Math.log(options.intensityRatioMax ?? 5);
  const scale = options.heightScale;
  const hasScale = scale !== undefined && Number.isFinite(scale) && scale > 0 && options.peakHeight !== undefined;
  const cands: (Candidate & { score: number })[] = inWindow.map((i) => {
    const predictedCm1 = lines.wavenumberCm1[i];
    const distanceCm1 = peakCm1 - predictedCm1;
    const s = sigmaOf(i);
    const distanceSigma = s === null ? null : Math.abs(distanceCm1) / s;
    const intensity = lines.intensity[i];
    const heightRatio = hasScale && intensity > 0 ? options.peakHeight! / (scale! * intensity) : null;
    const r = heightRatio ?? (intensity > 0 ? iMax / intensity : Infinity);
    const intensityTerm = Number.isFinite(r) && r > 0 ? (INTENSITY_AT_LIMIT_SIGMA * Math.log(r)) / lnF : 1e3;
    const z = distanceSigma ?? Math.abs(distanceCm1);
    const q = { jUpper: lines.jUpper[i], kUpper: lines.kUpper[i], jLower: lines.jLower[i], kLower: lines.kLower[i] };
    return {
      ...q,
      lineIndex: i,
      predictedCm1,
      distanceCm1,
      distanceSigma,
      heightRatio,
      intensity,
      labelAscii: lineLabelAscii(lines.deltaK[i], lines.deltaJ[i], q.kLower, q.jLower, options.shape),
      labelHtml: lineLabelHtml(lines.deltaK[i], lines.deltaJ[i], q.kLower, q.jLower, options.shape),
      isAssigned: options.assignedKeys?.has(quantaKey(q)) ?? false,
      isWeak: intensity < 0.01 * iMax,
      score: z * z + intensityTerm * intensityTerm,
    };
  });
  if (options.predictionSigmaCm1) cands.sort((a, b) => a.score - b.score || b.intensity - a.intensity);
  // No σ at all: by distance in cm^-1, much weaker lines last (a distance in cm^-1 and an
  // intensity ratio have no common scale).
  else
    cands.sort(
      (a, b) => Number(a.isWeak) - Number(b.isWeak) || Math.abs(a.distanceCm1) - Math.abs(b.distanceCm1) || b.intensity - a.intensity,
    );
  return cands.slice(0, maxCount).map(({ score: _score, ...c }) => c);
}

/**
 * The k largest positive values, descending, in one pass (a short sorted buffer: the full sort of a
 * 1e6-point trace's peaks and a several-band line list took 12 ms per peak click).
 */
function largestPositive(values: ArrayLike<number>, k: number): number[] {
  const top: number[] = [];
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!(v > 0) || (top.length === k && v <= top[k - 1])) continue;
    let j = top.length === k ? k - 1 : top.length;
    while (j > 0 && top[j - 1] < v) {
      top[j] = top[j - 1];
      j--;
    }
    top[j] = v;
  }
  return top;
}

/** How many of the strongest peaks and lines the rough height scale matches. */
const SCALE_GUESS_RANKS = 30;

/**
 * A rough peak height per unit relative intensity before any line is assigned: the median over
 * k = 1…30 of (k-th highest peak) / (k-th strongest predicted line), matching the strongest peaks
 * with the strongest lines by rank. Good to a factor of about two where the strong lines stand
 * alone, worse in piled-up Q branches; used only until assignments give the scale.
 * Source: derived here (a rank (quantile–quantile) match of two distributions, common practice).
 * @param heights peak heights (absorbance)
 * @param intensities relative intensities of the predicted lines
 * @returns absorbance per unit relative intensity, NaN when either list is empty
 */
export function candidateHeightScaleGuess(heights: ArrayLike<number>, intensities: ArrayLike<number>): number {
  const h = largestPositive(heights, SCALE_GUESS_RANKS);
  const l = largestPositive(intensities, SCALE_GUESS_RANKS);
  const n = Math.min(SCALE_GUESS_RANKS, h.length, l.length);
  if (n === 0) return NaN;
  const r = Array.from({ length: n }, (_, k) => h[k] / l[k]).sort((a, b) => a - b);
  return n % 2 ? r[n >> 1] : 0.5 * (r[n / 2 - 1] + r[n / 2]);
}
