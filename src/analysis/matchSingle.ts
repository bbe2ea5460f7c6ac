/**
 * One rung, one decision: the assignment assistant's matching rules (assistantMatch) applied to a
 * single rung the user points at (the page's keyboard walk). Nothing here re-implements a rule:
 * the catalogue, the pair σ, the one-to-one, intensity and blend tests are the assistant's own.
 */
import type { FitResult } from '../fit/fitTypes';
import type { BandModel, TransitionQuanta } from '../physics/model';
import { assistantMatch } from './assistantMatch';
import { assistantOptionsResolve } from './assistantOptions';
import { assistantNearestPeak, assistantPeakContext, assistantPeaksUsable, type AssistantPeakContext } from './assistantPeakContext';
import { assistantCatalogue, assistantPairSigma, assistantQuantaKey, assistantRungOf, type AssistantCatalogue } from './assistantPredict';
import type { AssistantOptions, AssistantOptionsResolved } from './assistantTypes';
import type { PeakList } from './peaksFind';

/** Everything the single-rung match needs that does not change from one key press to the next. */
export interface MatchSingleContext {
  cat: AssistantCatalogue;
  context: AssistantPeakContext;
  peaks: PeakList;
  options: AssistantOptionsResolved;
  shape: BandModel['shape'];
}

/** Inputs of matchSingleContext. */
export interface MatchSingleContextInput {
  /** The model the lines are predicted from when there is no fit (cm^-1, K). */
  model: BandModel;
  /** The current fit (its constants and covariance give the predictions and their σ), or null. */
  fit: FitResult | null;
  peaks: PeakList;
  /** Lines weaker than this (strongest = 1) are not in the catalogue (rivals included). */
  minIntensity: number;
  /** The assistant's options (toleranceSigma k above all). */
  options?: AssistantOptions;
}

/**
 * Build the catalogue of predictions (position, σ, tolerance σ) and the peak context once.
 * Predictions come from the fit when there is one (σ from its covariance, Student-widened, plus
 * its residual scatter and a width floor), else from the model with the assistant's first-guess
 * σ (fallbackSigmaCm1, a tenth of the line spacing). See assistantCatalogue.
 * Source: assistantCatalogue (first-order error propagation, Bevington & Robinson 2003 ch. 3).
 * @throws Error for an invalid option (naming it)
 */
export function matchSingleContext(input: MatchSingleContextInput): MatchSingleContext {
  const options = assistantOptionsResolve(input.model, input.options);
  const peaks = assistantPeaksUsable(input.peaks).peaks;
  const context = assistantPeakContext(peaks, options.widthNeighbours, options.blendWidthRatio);
  const cat = assistantCatalogue({
    model: input.fit ? input.fit.model : input.model,
    fit: input.fit,
    peaks,
    context,
    minIntensity: input.minIntensity,
    widthFloorFraction: options.widthFloorFraction,
    fallbackSigmaCm1: options.fallbackSigmaCm1,
  });
  return { cat, context, peaks, options, shape: input.model.shape };
}

/** An existing assignment as the match sees it. */
export interface MatchSingleAssigned extends TransitionQuanta {
  /** Observed position, cm^-1 (a peak centre when made on the page). */
  observedCm1: number;
  isBlended?: boolean;
  isExcluded?: boolean;
}

/** Index of the peak an assignment sits on (its centre within 1e-6 cm^-1), or −1. */
function peakOf(peaks: PeakList, observedCm1: number): number {
  const p = assistantNearestPeak(peaks, observedCm1);
  return p >= 0 && Math.abs(peaks.wavenumberCm1[p] - observedCm1) <= 1e-6 ? p : -1;
}

/**
 * Peak height per unit relative intensity (absorbance): the median of height / predicted
 * intensity over assignments on single (not blended, not possibly blended) peaks; NaN with
 * fewer than 3 (the assistant's rule: the intensity test starts once 3 lines fix the scale).
 * Source: common practice (intensity check of an assignment against the simulated band).
 */
export function matchSingleHeightScale(ctx: MatchSingleContext, assigned: readonly MatchSingleAssigned[]): number {
  const ratios: number[] = [];
  for (const a of assigned) {
    if (a.isBlended || a.isExcluded) continue;
    const p = peakOf(ctx.peaks, a.observedCm1);
    if (p < 0 || ctx.context.isPossibleBlend[p]) continue;
    const i = ctx.cat.indexOf.get(assistantQuantaKey(a));
    if (i === undefined || !(ctx.cat.lines.intensity[i] > 0)) continue;
    ratios.push(ctx.peaks.height[p] / ctx.cat.lines.intensity[i]);
  }
  if (ratios.length < 3) return NaN;
  ratios.sort((x, y) => x - y);
  const m = ratios.length >> 1;
  return ratios.length % 2 ? ratios[m] : 0.5 * (ratios[m - 1] + ratios[m]);
}

/** What the single-rung match decided. */
export interface MatchSingleOutcome {
  /** 'match': exactly one way, by the assistant's rules; 'declined': unsure, with the reason. */
  kind: 'match' | 'declined';
  /** Peak index of the match (−1 when declined). */
  peak: number;
  /** Predicted position of the rung, cm^-1 (NaN when the rung is not in the catalogue). */
  predictedCm1: number;
  /** σ of the pair (prediction tolerance ⊕ peak centre σ) of the match, or of the rung alone when declined, cm^-1. */
  sigmaCm1: number;
  /** |peak − predicted| / σ of the match (NaN when declined). */
  distanceSigma: number;
  /** The k of "within k·σ" used. */
  toleranceSigma: number;
  /** The peak may hold another line too (from the assistant's blend tests). */
  isBlend: boolean;
  /** Plain words: why this peak, or why none. */
  reason: string;
}

/**
 * Decide the peak of one rung by the assistant's rules: exactly one peak within k·σ of the
 * prediction (σ from the current fit, or the first-guess σ), that peak free, its height
 * compatible with the predicted intensity (once three assignments fix the scale), and no
 * comparably strong unassigned rung competing for it; an unresolved K stack counts as one line.
 * Anything else is declined with the assistant's own words. The rung's own earlier assignment
 * does not count as taking its peak.
 * Source: assistantMatch (one-to-one assignment by prediction, common practice).
 * @param ctx from matchSingleContext
 * @param rung the rung's quantum numbers
 * @param assigned the current assignments (positions cm^-1)
 */
export function matchSingle(ctx: MatchSingleContext, rung: TransitionQuanta, assigned: readonly MatchSingleAssigned[]): MatchSingleOutcome {
  const { cat, peaks, options } = ctx;
  const k = options.toleranceSigma;
  const key = assistantQuantaKey(rung);
  const i = cat.indexOf.get(key);
  if (i === undefined) {
    return {
      kind: 'declined',
      peak: -1,
      predictedCm1: NaN,
      sigmaCm1: NaN,
      distanceSigma: NaN,
      toleranceSigma: k,
      isBlend: false,
      reason: 'the line is too weak in the model to be matched (below the intensity cut of the predictions)',
    };
  }
  const others = assigned.filter((a) => assistantQuantaKey(a) !== key);
  const isRungAssigned = new Uint8Array(cat.lines.count);
  const peakOwner: string[] = new Array(peaks.count).fill('');
  for (const a of others) {
    const j = cat.indexOf.get(assistantQuantaKey(a));
    if (j !== undefined) isRungAssigned[j] = 1;
    const p = peakOf(peaks, a.observedCm1);
    if (p >= 0) {
      const label =
        j !== undefined ? assistantRungOf(cat, j, ctx.shape).label : `J′=${a.jUpper} K′=${a.kUpper} J″=${a.jLower} K″=${a.kLower}`;
      peakOwner[p] = peakOwner[p] ? `${peakOwner[p]}, ${label}` : label;
    }
  }
  const heightScale = matchSingleHeightScale(ctx, others);
  // The assistant offers only rungs predicted to stand out of the noise; a weaker one would take
  // whatever peak is near.
  const predictedHeight = heightScale * cat.lines.intensity[i];
  const minHeight = options.minPredictedSnr * peaks.noiseSigma;
  if (Number.isFinite(predictedHeight) && peaks.noiseSigma > 0 && predictedHeight < minHeight) {
    return {
      kind: 'declined',
      peak: -1,
      predictedCm1: cat.predictedCm1[i],
      sigmaCm1: cat.toleranceSigmaCm1[i],
      distanceSigma: NaN,
      toleranceSigma: k,
      isBlend: false,
      reason: `the line is predicted at ${(predictedHeight / peaks.noiseSigma).toPrecision(2)}× the noise, below the ${options.minPredictedSnr}× needed to tell it from another line's peak`,
    };
  }
  const { matches, ambiguous } = assistantMatch({
    cat,
    peaks,
    context: ctx.context,
    shape: ctx.shape,
    candidates: [i],
    isRungAssigned,
    peakOwner,
    forbidden: new Set(),
    heightScale,
    options,
  });
  const predictedCm1 = cat.predictedCm1[i];
  const m = matches.find((x) => x.rung === i);
  if (m) {
    return {
      kind: 'match',
      peak: m.peak,
      predictedCm1,
      sigmaCm1: m.sigmaCm1,
      distanceSigma: m.distanceSigma,
      toleranceSigma: k,
      isBlend: m.isBlend,
      reason: m.reason,
    };
  }
  const amb = ambiguous.find((x) => x.rungs.some((r) => assistantQuantaKey(r) === key)) ?? ambiguous[0];
  const nearest = assistantNearestPeak(peaks, predictedCm1);
  const sigmaCm1 = assistantPairSigma(cat.toleranceSigmaCm1[i], nearest >= 0 ? peaks.centreSigmaCm1[nearest] : 0);
  const reason = amb
    ? amb.reason
    : `no peak within ${k}σ = ±${(k * sigmaCm1).toPrecision(2)} cm^-1 of the prediction ${predictedCm1.toFixed(4)} cm^-1` +
      (nearest >= 0 ? ` (nearest ${peaks.wavenumberCm1[nearest].toFixed(4)} cm^-1)` : '');
  return { kind: 'declined', peak: -1, predictedCm1, sigmaCm1, distanceSigma: NaN, toleranceSigma: k, isBlend: false, reason };
}
