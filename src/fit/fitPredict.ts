import type { LineList, TransitionQuanta } from '../physics/model';
import { transitionWavenumber } from '../physics/termValues';
import { bandLineGradient } from './bandDesign';
import type { FitResult } from './fitTypes';

/** A predicted line position with its propagated uncertainty. */
export interface FitPrediction {
  /** Predicted position from the fitted constants, cm^-1. */
  wavenumberCm1: number;
  /** 1σ uncertainty of the prediction from the fit's covariance, cm^-1 (NaN when the fit gave none). */
  sigmaCm1: number;
}

function sigmaFrom(result: FitResult, g: Float64Array): number {
  const c = result.covariance;
  const n = result.floated.length;
  if (n === 0) return 0;
  if (c.length !== n) return NaN;
  let v = 0;
  for (let a = 0; a < n; a++) {
    if (g[a] === 0) continue;
    let row = 0;
    for (let b = 0; b < n; b++) row += c[a][b] * g[b];
    v += g[a] * row;
  }
  return Math.sqrt(Math.max(v, 0));
}

/**
 * Where a line should be according to a fit, and how well the fit pins it down:
 * ν from the fitted constants and σ_ν = sqrt(g C gᵀ) with g = ∂ν/∂θ over the floated constants
 * and C their covariance. Use (peak − ν)/σ to judge a candidate assignment.
 * Source: first-order error propagation, Bevington & Robinson (2003) ch. 3 (error propagation with covariances).
 * @param result a successful FitResult
 * @param q quantum numbers of the line (not checked against the band; see assignmentCheck)
 * @returns position and 1σ, both cm^-1
 */
export function fitPredict(result: FitResult, q: TransitionQuanta): FitPrediction {
  const g = bandLineGradient(result.model, result.floated, q);
  return {
    wavenumberCm1: transitionWavenumber(result.model, q.jUpper, q.kUpper, q.jLower, q.kLower),
    sigmaCm1: sigmaFrom(result, g),
  };
}

/**
 * fitPredict over a whole line list (e.g. bandLines of the fitted model).
 * @param result a successful FitResult
 * @param lines columnar line list; only the quantum numbers are read
 * @returns positions and 1σ, cm^-1, one per line
 */
export function fitPredictLines(result: FitResult, lines: LineList): { wavenumberCm1: Float64Array; sigmaCm1: Float64Array } {
  const wavenumberCm1 = new Float64Array(lines.count);
  const sigmaCm1 = new Float64Array(lines.count);
  const g = new Float64Array(result.floated.length);
  const q: TransitionQuanta = { jUpper: 0, kUpper: 0, jLower: 0, kLower: 0 };
  for (let i = 0; i < lines.count; i++) {
    q.jUpper = lines.jUpper[i];
    q.kUpper = lines.kUpper[i];
    q.jLower = lines.jLower[i];
    q.kLower = lines.kLower[i];
    bandLineGradient(result.model, result.floated, q, g);
    wavenumberCm1[i] = transitionWavenumber(result.model, q.jUpper, q.kUpper, q.jLower, q.kLower);
    sigmaCm1[i] = sigmaFrom(result, g);
  }
  return { wavenumberCm1, sigmaCm1 };
}

/**
 * The 1σ of fitPredict for many lines in one pass (one gradient buffer, no per-line objects);
 * equal, value for value, to `fitPredict(result, quanta[i]).sigmaCm1`.
 * Source: as fitPredict (σ_ν = sqrt(g C gᵀ), Bevington & Robinson (2003) ch. 3).
 * @param result a successful FitResult
 * @param quanta the lines' quantum numbers (not checked against the band)
 * @param out optional output of length quanta.length
 * @returns 1σ of each predicted position, cm^-1 (NaN where the fit gave no covariance)
 */
export function fitPredictSigmas(
  result: FitResult,
  quanta: readonly TransitionQuanta[],
  out: Float64Array = new Float64Array(quanta.length),
): Float64Array {
  if (out.length < quanta.length) throw new Error(`fitPredictSigmas: out must hold ${quanta.length} values, got ${out.length}`);
  const g = new Float64Array(result.floated.length);
  for (let i = 0; i < quanta.length; i++) {
    bandLineGradient(result.model, result.floated, quanta[i], g);
    out[i] = sigmaFrom(result, g);
  }
  return out;
}
