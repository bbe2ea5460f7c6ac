import { fitPredictLines } from '../fit/fitPredict';
import type { FitResult } from '../fit/fitTypes';
import { bandLines } from '../physics/bandLines';
import { lineLabelAscii } from '../physics/lineLabel';
import type { BandModel, LineList, TransitionQuanta } from '../physics/model';
import { assistantNearestPeak, type AssistantPeakContext } from './assistantPeakContext';
import type { AssistantRung } from './assistantTypes';
import { assistantPosteriorPredict, type AssistantPosterior } from './assistantPosterior';
import type { PeakList } from './peaksFind';

/** Every line of the band with its predicted position and matching σ. */
export interface AssistantCatalogue {
  /** bandLines of the prediction model (intensities relative, strongest = 1). */
  lines: LineList;
  /** Predicted positions, cm^-1. */
  predictedCm1: Float64Array;
  /** 1σ of each prediction (fit covariance × Student factor, or the fallback), cm^-1. */
  predictionSigmaCm1: Float64Array;
  /** Matching σ without the peak's centre σ: prediction ⊕ scatter ⊕ width floor, cm^-1. */
  toleranceSigmaCm1: Float64Array;
  /** Line indices in ascending predicted position. */
  order: Int32Array;
  /** Index of a line by its quanta key (assistantQuantaKey). */
  indexOf: Map<string, number>;
  /** With a posterior: ∂ν/∂θ of every line over posterior.keys, row-major count × keys.length. */
  gradient?: Float64Array;
}

/** Stable key of a transition's quantum numbers, "J',K',J'',K''". */
export function assistantQuantaKey(q: TransitionQuanta): string {
  return `${q.jUpper},${q.kUpper},${q.jLower},${q.kLower}`;
}

/** Two-sided 97.5 % Student-t quantiles for 1…30 degrees of freedom. Source: Abramowitz & Stegun (1964) Table 26.10 (values from memory, 3 decimals). */
const T975 = [
  12.706, 4.303, 3.182, 2.776, 2.571, 2.447, 2.365, 2.306, 2.262, 2.228, 2.201, 2.179, 2.16, 2.145, 2.131, 2.12, 2.11, 2.101, 2.093, 2.086,
  2.08, 2.074, 2.069, 2.064, 2.06, 2.056, 2.052, 2.048, 2.045, 2.042,
];

/**
 * How much wider a fit's 1σ must be taken when σ_w itself comes from few degrees of freedom:
 * t_0.975(ν) / 1.96 (1 for ν → ∞; 1.31 at ν = 5; 6.5 at ν = 1).
 * Source: Student-t quantiles, Abramowitz & Stegun (1964) Table 26.10; beyond ν = 30 the
 * first-order expansion t ≈ z(1 + (z² + 1)/(4ν)) (A&S 26.7.5, from memory).
 * @param dof degrees of freedom N − P (≥ 1)
 */
export function assistantStudentFactor(dof: number): number {
  if (!(dof >= 1)) return T975[0] / 1.96;
  if (dof <= 30) return T975[Math.floor(dof) - 1] / 1.96;
  return 1 + (1.96 * 1.96 + 1) / (4 * dof);
}

/** Robust spread of a fit's residuals, cm^-1: 1.4826 × median |obs − calc| over the fitted lines (0 without lines). */
export function assistantFitScatterCm1(fit: FitResult): number {
  const r = fit.lines.filter((l) => !l.isExcluded).map((l) => Math.abs(l.obsMinusCalc));
  if (r.length === 0) return 0;
  r.sort((a, b) => a - b);
  const m = r.length >> 1;
  const median = r.length % 2 ? r[m] : 0.5 * (r[m - 1] + r[m]);
  // 1.4826 = 1/Φ⁻¹(3/4): the median absolute deviation of a normal sample estimates σ.
  return 1.4826 * median;
}

/** Inputs of assistantCatalogue. */
export interface AssistantCatalogueInput {
  /** Prediction model: the fit's model when there is a fit, else the start model. */
  model: BandModel;
  /** The current fit, or null (predictions from the model with the fallback σ). */
  fit: FitResult | null;
  peaks: PeakList;
  context: AssistantPeakContext;
  /** Lines below this relative intensity are left out. */
  minIntensity: number;
  /** Width floor fraction of the local FWHM. */
  widthFloorFraction: number;
  /** σ of a prediction the fit cannot give (exactly determined, or no fit), cm^-1. */
  fallbackSigmaCm1: number;
  /**
   * Posterior of the constants (assistantPosteriorFit): when given, positions and σ come from it
   * (every constant's uncertainty included), not from `fit`; `fit` then only gives the scatter.
   */
  posterior?: AssistantPosterior;
}

/**
 * Predict every line of the band and the σ within which its peak is sought.
 *
 * σ_tol² = (f_t σ_pred)² + s² + (w·FWHM_local)²: σ_pred from the fit's covariance (fitPredictLines),
 * f_t = assistantStudentFactor(N − P), s the robust scatter of the fit's residuals (covers
 * constants held at wrong model values, so early tolerances are wide and narrow as the fit
 * improves), FWHM_local the running median width at the nearest peak. The pair σ adds the peak's
 * own centre σ in quadrature (assistantPairSigma).
 * Source: first-order error propagation (Bevington & Robinson 2003, ch. 3) via fitPredictLines;
 * the floor is common practice.
 */
export function assistantCatalogue(input: AssistantCatalogueInput): AssistantCatalogue {
  const { model, fit, peaks, context } = input;
  const lines = bandLines(model, { minIntensity: input.minIntensity });
  const n = lines.count;
  const predictedCm1 = new Float64Array(n);
  const predictionSigmaCm1 = new Float64Array(n);
  const toleranceSigmaCm1 = new Float64Array(n);
  let factor = 1;
  let scatter = 0;
  let gradient: Float64Array | undefined;
  if (input.posterior) {
    const p = assistantPosteriorPredict(input.posterior, lines);
    gradient = p.gradient;
    predictedCm1.set(p.wavenumberCm1);
    predictionSigmaCm1.set(p.sigmaCm1);
    scatter = input.posterior.scatterCm1;
  } else if (fit) {
    const p = fitPredictLines(fit, lines);
    predictedCm1.set(p.wavenumberCm1);
    predictionSigmaCm1.set(p.sigmaCm1);
    const dof = fit.nLines - fit.nParameters;
    factor = dof >= 1 ? assistantStudentFactor(dof) : 1;
    scatter = assistantFitScatterCm1(fit);
  } else {
    predictedCm1.set(lines.wavenumberCm1);
    predictionSigmaCm1.fill(NaN);
  }
  const fallbackWidth = Number.isFinite(context.medianFwhmCm1) ? context.medianFwhmCm1 : 0;
  for (let i = 0; i < n; i++) {
    let s = predictionSigmaCm1[i];
    const exact = !input.posterior && (!Number.isFinite(s) || (fit !== null && fit.isExactlyDetermined && fit.nParameters > 0));
    if (exact) {
      s = input.fallbackSigmaCm1;
      predictionSigmaCm1[i] = s;
    } else if (!input.posterior) {
      s *= factor;
      predictionSigmaCm1[i] = s;
    }
    const k = assistantNearestPeak(peaks, predictedCm1[i]);
    const width = k >= 0 ? context.localFwhmCm1[k] : fallbackWidth;
    const floor = input.widthFloorFraction * width;
    toleranceSigmaCm1[i] = Math.sqrt(s * s + scatter * scatter + floor * floor);
  }
  const order = Int32Array.from({ length: n }, (_, i) => i).sort((a, b) => predictedCm1[a] - predictedCm1[b]);
  const indexOf = new Map<string, number>();
  for (let i = 0; i < n; i++) {
    indexOf.set(`${lines.jUpper[i]},${lines.kUpper[i]},${lines.jLower[i]},${lines.kLower[i]}`, i);
  }
  return { lines, predictedCm1, predictionSigmaCm1, toleranceSigmaCm1, order, indexOf, gradient };
}

/** σ of a rung–peak pair, cm^-1: the rung's tolerance σ and the peak's centre σ in quadrature. */
export function assistantPairSigma(toleranceSigmaCm1: number, peakCentreSigmaCm1: number): number {
  return Math.hypot(toleranceSigmaCm1, peakCentreSigmaCm1);
}

/** The catalogue entry i as a plain AssistantRung. */
export function assistantRungOf(cat: AssistantCatalogue, i: number, shape: BandModel['shape']): AssistantRung {
  const l = cat.lines;
  return {
    jUpper: l.jUpper[i],
    kUpper: l.kUpper[i],
    jLower: l.jLower[i],
    kLower: l.kLower[i],
    label: lineLabelAscii(l.deltaK[i], l.deltaJ[i], l.kLower[i], l.jLower[i], shape),
    predictedCm1: cat.predictedCm1[i],
    predictionSigmaCm1: cat.predictionSigmaCm1[i],
    toleranceSigmaCm1: cat.toleranceSigmaCm1[i],
    intensity: l.intensity[i],
  };
}

/** Catalogue lines weaker than this fraction of the line do not enter its overlap estimate. */
const OVERLAP_MIN_FRACTION = 0.02;

/**
 * Expected pull of a line's observed maximum by the predicted lines around it, cm^-1 (signed:
 * positive when the maximum moves to higher wavenumber), and the strongest neighbour responsible.
 *
 * The neighbourhood (±4 FWHM, lines ≥ 2 % of this one) is modelled as a sum of Lorentzians of the
 * local FWHM w with the predicted positions and intensities; the maximum nearest to the line's
 * own prediction is found on a grid of w/40 over ±w/2 and refined by a parabola through the
 * best three points. Lorentzian wings are the widest of the Voigt family, so for Doppler-limited
 * lines this overstates the pull (the line is then weighted down a little more than needed).
 * Source: derived here (maximum of a sum of Lorentzians); Lorentz profile, e.g. Hollas (1998) sec. 2.3.
 * @param cat the catalogue (predicted positions, intensities)
 * @param i catalogue index of the line
 * @param widthCm1 local FWHM w, cm^-1 (> 0)
 */
export function assistantOverlapShift(cat: AssistantCatalogue, i: number, widthCm1: number): { shiftCm1: number; neighbour: number } {
  const x0 = cat.predictedCm1[i];
  const own = cat.lines.intensity[i];
  if (!(widthCm1 > 0) || !(own > 0)) return { shiftCm1: 0, neighbour: -1 };
  const sorted = cat.order;
  // Position of line i in the sorted order, by binary search on its predicted position.
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (cat.predictedCm1[sorted[mid]] < x0 - 4 * widthCm1) lo = mid + 1;
    else hi = mid;
  }
  const near: number[] = [];
  let strongest = -1;
  let strongestPull = 0;
  for (let s = lo; s < sorted.length && cat.predictedCm1[sorted[s]] <= x0 + 4 * widthCm1; s++) {
    const j = sorted[s];
    if (j === i || cat.lines.intensity[j] < OVERLAP_MIN_FRACTION * own) continue;
    near.push(j);
    const d = cat.predictedCm1[j] - x0;
    const u = 1 + (4 * d * d) / (widthCm1 * widthCm1);
    const pull = (cat.lines.intensity[j] / own) * (Math.abs(d) / (u * u));
    if (pull > strongestPull) {
      strongestPull = pull;
      strongest = j;
    }
  }
  if (near.length === 0) return { shiftCm1: 0, neighbour: -1 };
  const inv = 4 / (widthCm1 * widthCm1);
  const f = (x: number): number => {
    let y = own / (1 + inv * (x - x0) * (x - x0));
    for (const j of near) {
      const d = x - cat.predictedCm1[j];
      y += cat.lines.intensity[j] / (1 + inv * d * d);
    }
    return y;
  };
  const h = widthCm1 / 40;
  // Climb from the line's own position to the nearest maximum (at most ±20 steps = ±w/2).
  let k = 0;
  let fk = f(x0);
  for (let step = 0; step < 20; step++) {
    const up = f(x0 + (k + 1) * h);
    const down = f(x0 + (k - 1) * h);
    if (up > fk && up >= down) {
      k++;
      fk = up;
    } else if (down > fk) {
      k--;
      fk = down;
    } else break;
  }
  const fm = f(x0 + (k - 1) * h);
  const fp = f(x0 + (k + 1) * h);
  const curv = fm - 2 * fk + fp;
  const frac = curv < 0 ? (0.5 * (fm - fp)) / curv : 0;
  return { shiftCm1: (k + Math.max(-0.5, Math.min(0.5, frac))) * h, neighbour: strongest };
}
