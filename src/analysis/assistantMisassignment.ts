import type { Assignment } from '../fit/assignment';
import { combinationDifferences } from '../fit/combinationDifferences';
import { fitPredict } from '../fit/fitPredict';
import type { FitError, FitResult } from '../fit/fitTypes';
import { lineLabelAscii } from '../physics/lineLabel';
import { transitionWavenumber } from '../physics/termValues';
import type { BandModel } from '../physics/model';
import {
  assistantNearestPeak,
  assistantPeakContext,
  assistantPeaksCheck,
  assistantPeaksInRange,
  assistantPeaksUsable,
  type AssistantPeakContext,
} from './assistantPeakContext';
import {
  assistantCatalogue,
  assistantPairSigma,
  assistantQuantaKey,
  assistantStudentFactor,
  assistantFitScatterCm1,
} from './assistantPredict';
import { assistantRefit } from './assistantRefit';
import { assistantOptionsResolve } from './assistantOptions';
import type { AssistantAlternative, AssistantCandidatePeak, AssistantOptions, AssistantSuspect } from './assistantTypes';
import type { PeakList } from './peaksFind';

/** Inputs of assistantMisassignments. */
export interface AssistantHuntInput {
  /** Start model (constants not floated stay at these values), cm^-1. */
  model: BandModel;
  /** Keys the fit may float. */
  floatable: readonly string[];
  /** The assigned lines; AssistantLine's peakIndex is used when present. Excluded lines are checked too. */
  lines: readonly (Assignment & { peakIndex?: number | null; status?: string })[];
  /** The peak list the lines came from (for alternatives and the width floor). */
  peaks: PeakList;
  /** Its assistantPeakContext (computed when absent). */
  context?: AssistantPeakContext;
  options?: AssistantOptions;
  /**
   * The fit whose calc the user is shown for these lines (e.g. the loop's reported fit, which may
   * float fewer constants than the hunt's own); a proposal far from its calc there is suspect too.
   */
  reportedFit?: FitResult | null;
}

/** Outcome of assistantMisassignments. */
export interface AssistantHuntResult {
  /** Distrusted lines, worst first. */
  suspects: AssistantSuspect[];
  /** The fit without the lines it found > outlierSigma off (the "clean" fit), or null. */
  fit: FitResult | null;
  fitError: FitError | null;
  /** Robust scale of the normalised residuals used (≈ σ_w of the clean fit; ≥ 0.5). */
  scale: number;
  /** Notes of the fit (constants held) and of the combination-difference check. */
  notes: string[];
}

/**
 * A proposal more than this many median FWHM from where the fit puts it, with the prediction's own σ
 * below PREDICTION_SHARP_FWHM FWHM, is suspect: two lines closer than about half a width are not
 * resolved, so a centre that far off is not the line's (common practice: the resolution criterion).
 */
const OFF_LINE_FWHM = 0.5;
const PREDICTION_SHARP_FWHM = 0.25;

/**
 * A proposal more than OFF_LINE_FWHM widths from where the fit puts it is suspect, however wide its
 * prediction, when another peak lies closer to that position by at least this many line widths: the
 * match took a farther peak over a nearer one, which only the fit's broad σ allowed (a perturbed
 * stack or a crowded Q branch), so the choice between them is not the trace's.
 */
const NEARER_PEAK_FWHM = 0.5;

/**
 * A proposal more than this many line widths from where the fit puts it is suspect whatever σ the
 * fit gives it: the model does not describe that line (a perturbed level, a constant missing), so
 * which peak is its own is for the user to judge (common practice: a line far off its prediction is
 * checked by hand before it is kept).
 */
const FAR_FROM_FIT_FWHM = 3;

/**
 * Leverage (share of a line's own weight in its fitted value) above which a proposal counts as
 * unchecked: the fit follows it whatever it is. Source: hat-matrix diagonal, Hoaglin & Welsch,
 * Am. Stat. 32, 17 (1978) (from memory); 0.9 as "nearly alone" is common practice.
 */
const LEVERAGE_UNCHECKED = 0.9;

/** Normalised residuals below this many stated σ never make a line suspect (guards noise-free data). */
const SCALE_MIN = 0.5;

/**
 * 1.4826 × median |r|, at least SCALE_MIN: a robust estimate of σ_w from normalised residuals
 * that one or two misassignments do not inflate.
 * Source: median absolute deviation, Hampel (1974) J. Am. Stat. Assoc. 69, 383 (from memory).
 */
export function assistantRobustScale(normalisedResiduals: readonly number[]): number {
  if (normalisedResiduals.length === 0) return 1;
  const a = normalisedResiduals.map(Math.abs).sort((x, y) => x - y);
  const m = a.length >> 1;
  const median = a.length % 2 ? a[m] : 0.5 * (a[m - 1] + a[m]);
  return Math.max(SCALE_MIN, 1.4826 * median);
}

/**
 * Misassignment hunt: lines whose obs − calc or combination differences disagree with the rest by
 * more than outlierSigma, each with the other assignments that would fit its peak.
 *
 * 1. Clean fit: fit all active lines (staged floating, assistantRefit), then refit without the
 *    lines more than outlierSigma·σ_eff off, σ_eff² = (σ_i s)² + σ_pred,i², s the robust scale of
 *    the normalised residuals; repeat until the excluded set is stable (≤ 5 rounds, ≤ 30 % excluded).
 * 2. A line is suspect when |obs − calc| > outlierSigma·σ_eff against the clean fit, or when every
 *    lower- or upper-state combination difference it takes part in is off by more than
 *    outlierSigma × the robust spread of all differences (then one of the pair is misassigned).
 * 3. Alternatives: rungs of the clean prediction within toleranceSigma of the observed position
 *    (pair σ as in the matching), and other peaks within tolerance of the line's own prediction.
 * Source: outlier screening by robust residuals (Hampel 1974) and combination differences
 * (Herzberg I (1950) ch. III) are common practice of line assignment.
 */
export function assistantMisassignments(input: AssistantHuntInput): AssistantHuntResult {
  const peaks = assistantPeaksUsable(input.peaks).peaks;
  const bad = assistantPeaksCheck('assistantMisassignments', peaks);
  if (bad) throw new Error(bad);
  const options = assistantOptionsResolve(input.model, input.options);
  const context = input.context ?? assistantPeakContext(peaks, options.widthNeighbours, options.blendWidthRatio);
  const { model, lines } = input;
  const shape = model.shape;
  const thr = options.outlierSigma;
  const active = lines.map((_, i) => i).filter((i) => lines[i].status !== 'rejected');
  const notes: string[] = [];
  let excluded = new Set<number>(active.filter((i) => lines[i].isExcluded));
  const userExcluded = new Set(excluded);
  let fit: FitResult | null = null;
  let fitError: FitError | null = null;
  let scale = 1;
  const effSigma = (f: FitResult, i: number, s: number) => {
    const p = fitPredict(f, lines[i]);
    const sp = Number.isFinite(p.sigmaCm1) ? p.sigmaCm1 : 0;
    return { calc: p.wavenumberCm1, sigma: Math.hypot(lines[i].uncertaintyCm1 * s, sp), predictionSigma: sp };
  };
  for (let round = 0; round < 5; round++) {
    const inFit = active.filter((i) => !excluded.has(i));
    const refit = assistantRefit(
      model,
      input.floatable,
      inFit.map((i) => ({ ...lines[i], isExcluded: false })),
      fit,
    );
    if (!refit.fit) {
      fitError = refit.error;
      break;
    }
    fit = refit.fit;
    if (round === 0) notes.push(...refit.notes);
    scale = assistantRobustScale(fit.lines.map((l) => l.normalisedResidual));
    const off = active
      .filter((i) => !userExcluded.has(i))
      .map((i) => {
        const e = effSigma(fit!, i, scale);
        return { i, z: Math.abs(lines[i].observedCm1 - e.calc) / e.sigma };
      })
      .filter((o) => o.z > thr)
      .sort((a, b) => b.z - a.z)
      .slice(0, Math.floor(0.3 * active.length));
    const next = new Set([...userExcluded, ...off.map((o) => o.i)]);
    if (next.size === excluded.size && [...next].every((i) => excluded.has(i))) break;
    excluded = next;
  }
  if (!fit) return { suspects: [], fit: null, fitError, scale, notes };
  const clean = fit;
  const finalScale = clean.sigmaW !== null ? Math.max(SCALE_MIN, clean.sigmaW) : scale;

  // Combination differences: count good and bad pairs per line.
  const cdBad = new Map<number, string[]>();
  const cdGood = new Set<number>();
  const cdLines = active.filter((i) => !userExcluded.has(i));
  for (const state of ['lower', 'upper'] as const) {
    const cd = combinationDifferences(
      cdLines.map((i) => lines[i]),
      state,
      { shape, suspectSigma: Infinity },
    );
    if (!cd.ok) continue;
    const spread = assistantRobustScale(cd.result.pairs.map((p) => p.normalisedResidual));
    for (const p of cd.result.pairs) {
      const r = cdLines[p.lineR];
      const q = cdLines[p.lineP];
      const z = p.normalisedResidual / spread;
      if (Math.abs(z) > thr) {
        const text = (other: number) =>
          `${state === 'lower' ? 'lower' : 'upper'}-state combination difference with ${labelOf(lines[other], shape)} is off by ${z.toFixed(1)}σ`;
        cdBad.set(r, [...(cdBad.get(r) ?? []), text(q)]);
        cdBad.set(q, [...(cdBad.get(q) ?? []), text(r)]);
      } else {
        cdGood.add(r);
        cdGood.add(q);
      }
    }
  }

  const cat = assistantCatalogue({
    model: clean.model,
    fit: clean,
    peaks,
    context,
    minIntensity: 1e-4,
    widthFloorFraction: options.widthFloorFraction,
    fallbackSigmaCm1: options.fallbackSigmaCm1,
  });
  const assignedKeys = new Map<string, number>();
  for (const i of active) assignedKeys.set(assistantQuantaKey(lines[i]), i);
  const dof = clean.nLines - clean.nParameters;
  const factor = dof >= 1 ? assistantStudentFactor(dof) : 1;
  const scatter = assistantFitScatterCm1(clean);
  const k = options.toleranceSigma;

  // The band's line width: the median FWHM of the peaks the lines sit on (the median over all
  // peaks can be set by baseline fringes where the band is sparse).
  const onPeak = active
    .map((i) => lines[i].peakIndex)
    .filter((p): p is number => p !== null && p !== undefined && p >= 0 && p < peaks.count);
  const lineWidthCm1 = onPeak.length >= 5 ? medianOf(onPeak.map((p) => peaks.fwhmCm1[p])) : context.medianFwhmCm1;
  const suspects: AssistantSuspect[] = [];
  for (const i of active) {
    const line = lines[i];
    const e = effSigma(clean, i, finalScale);
    const omc = line.observedCm1 - e.calc;
    const z = omc / e.sigma;
    const reasons: string[] = [];
    const isResidualOutlier = Math.abs(z) > thr;
    if (isResidualOutlier) {
      reasons.push(
        `obs − calc = ${omc.toPrecision(3)} cm^-1 is ${z.toFixed(1)}σ (σ = ${e.sigma.toPrecision(2)} cm^-1) from the fit without the outliers`,
      );
    }
    // A proposal well off the position a well-determined fit gives it is not measured at the line:
    // the peak's centre belongs to a blend or to noise, whatever its stated uncertainty says.
    const width = lineWidthCm1;
    if (
      line.status === 'proposed' &&
      width > 0 &&
      Math.abs(omc) > OFF_LINE_FWHM * width &&
      e.predictionSigma < PREDICTION_SHARP_FWHM * width
    ) {
      reasons.push(
        `obs − calc = ${omc.toPrecision(3)} cm^-1 is ${(Math.abs(omc) / width).toFixed(2)} line widths while the fit places the line to ±${e.predictionSigma.toPrecision(2)} cm^-1: the peak is not centred on the line (blend or noise)`,
      );
    }
    const reportedOmc = input.reportedFit
      ? line.observedCm1 - transitionWavenumber(input.reportedFit.model, line.jUpper, line.kUpper, line.jLower, line.kLower)
      : omc;
    const farOmc = Math.abs(reportedOmc) > Math.abs(omc) ? reportedOmc : omc;
    if (line.status === 'proposed' && width > 0 && Math.abs(farOmc) > FAR_FROM_FIT_FWHM * width) {
      reasons.push(
        `obs − calc = ${farOmc.toPrecision(3)} cm^-1 is ${(Math.abs(farOmc) / width).toFixed(1)} line widths${farOmc === omc ? '' : ' in the reported fit'}: the fit does not describe this line (a perturbed level or a missing constant?), so its peak is not checked by the model`,
      );
    } else if (line.status === 'proposed' && width > 0 && Math.abs(omc) > OFF_LINE_FWHM * width) {
      // A proposal on a farther peak than the nearest one to its prediction: the trace did not choose it.
      const q = assistantNearestPeak(peaks, e.calc);
      const dNear = q >= 0 && q !== line.peakIndex ? Math.abs(peaks.wavenumberCm1[q] - e.calc) : Infinity;
      if (dNear < Math.abs(omc) - NEARER_PEAK_FWHM * width) {
        reasons.push(
          `obs − calc = ${omc.toPrecision(3)} cm^-1 is ${(Math.abs(omc) / width).toFixed(1)} line widths, and another peak lies ${(dNear / width).toFixed(1)} line widths from where the fit puts the line: the fit's broad σ let the farther peak in, so the trace does not decide between them`,
        );
      }
    }
    // A proposal the fit passes through by construction (it alone fixes some constant, e.g. the
    // only Q line fixing q) has a residual near zero whether or not it is right: nothing checks it.
    const covScale = Math.max(1, clean.covarianceScale);
    const leverage = (e.predictionSigma / line.uncertaintyCm1) ** 2 / covScale;
    if (line.status === 'proposed' && !line.isExcluded && leverage > LEVERAGE_UNCHECKED) {
      reasons.push(
        `the fit passes through it by construction (leverage ${Math.min(leverage, 1).toFixed(2)}: it alone fixes a combination of constants), so no other line checks it`,
      );
    }
    const cdReasons = cdBad.get(i);
    if (cdReasons && !cdGood.has(i)) reasons.push(...cdReasons);
    if (reasons.length === 0) continue;

    const peakIndex = line.peakIndex ?? null;
    const centreSigma =
      peakIndex !== null && peakIndex >= 0 && peakIndex < peaks.count ? peaks.centreSigmaCm1[peakIndex] : line.uncertaintyCm1;
    const alternativeRungs: AssistantAlternative[] = [];
    const ownKey = assistantQuantaKey(line);
    for (let j = 0; j < cat.lines.count; j++) {
      const sigma = assistantPairSigma(cat.toleranceSigmaCm1[j], centreSigma);
      const d = Math.abs(line.observedCm1 - cat.predictedCm1[j]);
      if (d > k * sigma) continue;
      const q = { jUpper: cat.lines.jUpper[j], kUpper: cat.lines.kUpper[j], jLower: cat.lines.jLower[j], kLower: cat.lines.kLower[j] };
      const key = assistantQuantaKey(q);
      if (key === ownKey) continue;
      alternativeRungs.push({
        ...q,
        label: lineLabelAscii(cat.lines.deltaK[j], cat.lines.deltaJ[j], q.kLower, q.jLower, shape),
        predictedCm1: cat.predictedCm1[j],
        distanceSigma: d / sigma,
        intensity: cat.lines.intensity[j],
        isAssignedElsewhere: assignedKeys.has(key) && assignedKeys.get(key) !== i,
      });
    }
    alternativeRungs.sort((a, b) => a.distanceSigma - b.distanceSigma);

    const own = cat.indexOf.get(ownKey);
    const floorWidth = Number.isFinite(context.medianFwhmCm1) ? context.medianFwhmCm1 : 0;
    const ownTol =
      own !== undefined
        ? cat.toleranceSigmaCm1[own]
        : Math.hypot(e.predictionSigma * factor, scatter, options.widthFloorFraction * floorWidth);
    const alternativePeaks: AssistantCandidatePeak[] = [];
    const half = k * Math.hypot(ownTol, maxOf(peaks.centreSigmaCm1, peaks.count));
    const [first, last] = assistantPeaksInRange(peaks, e.calc - half, e.calc + half);
    for (let p = first; p <= last; p++) {
      if (p === peakIndex) continue;
      const sigma = assistantPairSigma(ownTol, peaks.centreSigmaCm1[p]);
      const d = Math.abs(peaks.wavenumberCm1[p] - e.calc);
      if (d <= k * sigma)
        alternativePeaks.push({ peakIndex: p, wavenumberCm1: peaks.wavenumberCm1[p], distanceSigma: d / sigma, sigmaCm1: sigma });
    }
    alternativePeaks.sort((a, b) => a.distanceSigma - b.distanceSigma);
    suspects.push({
      id: line.id,
      index: i,
      label: labelOf(line, shape),
      observedCm1: line.observedCm1,
      calcCm1: e.calc,
      obsMinusCalcCm1: omc,
      normalisedResidual: z,
      reasons,
      alternativeRungs: alternativeRungs.slice(0, 8),
      alternativePeaks: alternativePeaks.slice(0, 8),
      isResidualOnly: isResidualOutlier && reasons.length === 1,
      lineWidthCm1,
    });
  }
  suspects.sort((a, b) => Math.abs(b.normalisedResidual) - Math.abs(a.normalisedResidual));
  return { suspects, fit: clean, fitError: null, scale: finalScale, notes };
}

function labelOf(q: Assignment, shape: BandModel['shape']): string {
  return lineLabelAscii(q.kUpper - q.kLower, q.jUpper - q.jLower, q.kLower, q.jLower, shape);
}

function maxOf(a: Float64Array, n: number): number {
  let m = 0;
  for (let i = 0; i < n; i++) if (a[i] > m) m = a[i];
  return m;
}

function medianOf(values: number[]): number {
  const a = [...values].sort((x, y) => x - y);
  const m = a.length >> 1;
  return a.length % 2 ? a[m] : 0.5 * (a[m - 1] + a[m]);
}
