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
  /** |distance| over the combined σ of prediction and peak; null without a fit. */
  distanceSigma: number | null;
  /** Relative intensity (strongest line = 1). */
  intensity: number;
  labelAscii: string;
  /** Label markup (no outside text). */
  labelHtml: string;
  /** Already assigned (to this or another peak). */
  isAssigned: boolean;
  /** Much weaker (< 1 %) than the strongest line in the window. */
  isWeak: boolean;
}

/** Options of candidatesRank. */
export interface CandidatesRankOptions {
  /** Lines within ± this of the peak are candidates, cm^-1. */
  windowCm1: number;
  /** At most this many are returned. @default 9 */
  maxCount?: number;
  /** When fewer than this many lie in the window, the nearest lines fill up to it. @default 3 */
  minCount?: number;
  /** Predicted 1σ of line i from the last fit, cm^-1 (absent without a fit). */
  predictionSigmaCm1?: (lineIndex: number) => number;
  /** 1σ of the peak centre, cm^-1. @default 0 */
  peakSigmaCm1?: number;
  /** Quanta keys (see quantaKey) of assigned lines. */
  assignedKeys?: ReadonlySet<string>;
  shape: TopShape;
}

/** A stable text key for quantum numbers: "J',K',J'',K''". */
export function quantaKey(q: TransitionQuanta): string {
  return `${q.jUpper},${q.kUpper},${q.jLower},${q.kLower}`;
}

/**
 * Candidate transitions for a peak, best first.
 * Without a fit the order is by |peak − predicted| in cm^-1; with one, by that distance in units
 * of σ = √(σ_pred² + σ_peak²), which prefers well-predicted lines. In both cases lines weaker than
 * 1 % of the strongest line in the window go after the others (a first guess rarely matches a weak
 * line where a strong one is close). Ties break by intensity, strongest first.
 * Source: common practice (nearest-prediction assignment with an intensity check).
 * @param lines predicted lines (positions cm^-1, relative intensities)
 * @param peakCm1 observed peak position, cm^-1
 */
export function candidatesRank(lines: LineList, peakCm1: number, options: CandidatesRankOptions): Candidate[] {
  if (!Number.isFinite(peakCm1)) throw new Error(`candidatesRank: peakCm1 must be finite, got ${peakCm1}`);
  if (!(options.windowCm1 > 0)) throw new Error(`candidatesRank: windowCm1 must be > 0, got ${options.windowCm1}`);
  const maxCount = options.maxCount ?? 9;
  const minCount = options.minCount ?? 3;
  const inWindow: number[] = [];
  const all: { i: number; d: number }[] = [];
  for (let i = 0; i < lines.count; i++) {
    const d = Math.abs(peakCm1 - lines.wavenumberCm1[i]);
    if (d <= options.windowCm1) inWindow.push(i);
    else all.push({ i, d });
  }
  if (inWindow.length < minCount) {
    all.sort((a, b) => a.d - b.d);
    for (const { i } of all.slice(0, minCount - inWindow.length)) inWindow.push(i);
  }
  let iMax = 0;
  for (const i of inWindow) iMax = Math.max(iMax, lines.intensity[i]);
  const peakSigma = options.peakSigmaCm1 ?? 0;
  const cands: (Candidate & { score: number })[] = inWindow.map((i) => {
    const predictedCm1 = lines.wavenumberCm1[i];
    const distanceCm1 = peakCm1 - predictedCm1;
    let distanceSigma: number | null = null;
    if (options.predictionSigmaCm1) {
      const s = Math.hypot(options.predictionSigmaCm1(i), peakSigma);
      distanceSigma = s > 0 && Number.isFinite(s) ? Math.abs(distanceCm1) / s : null;
    }
    const q = { jUpper: lines.jUpper[i], kUpper: lines.kUpper[i], jLower: lines.jLower[i], kLower: lines.kLower[i] };
    return {
      ...q,
      lineIndex: i,
      predictedCm1,
      distanceCm1,
      distanceSigma,
      intensity: lines.intensity[i],
      labelAscii: lineLabelAscii(lines.deltaK[i], lines.deltaJ[i], q.kLower, q.jLower, options.shape),
      labelHtml: lineLabelHtml(lines.deltaK[i], lines.deltaJ[i], q.kLower, q.jLower, options.shape),
      isAssigned: options.assignedKeys?.has(quantaKey(q)) ?? false,
      isWeak: lines.intensity[i] < 0.01 * iMax,
      score: distanceSigma ?? Math.abs(distanceCm1),
    };
  });
  cands.sort((a, b) => Number(a.isWeak) - Number(b.isWeak) || a.score - b.score || b.intensity - a.intensity);
  return cands.slice(0, maxCount).map(({ score: _score, ...c }) => c);
}
