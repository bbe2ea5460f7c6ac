import { lineariseCovariance, type Linearisation } from './leastSquaresLinearise';

/** Uncertainty statistics of a converged weighted least-squares fit. */
export interface FitStatistics {
  /** sqrt(χ²/(N − P)), dimensionless; sqrt(χ²/N) when nothing is floated; null when N = P. */
  sigmaW: number | null;
  /** Factor applied to the unit-weight covariance: σ_w² when σ_w > 1, else 1. */
  covarianceScale: number;
  /** 1σ of each floated parameter (all 0 when exactly determined or not linearised). */
  sigmas: Float64Array;
  /** Scaled covariance, [] when exactly determined. */
  covariance: number[][];
  /** Correlation matrix, [] when exactly determined. */
  correlation: number[][];
}

/**
 * σ_w, covariance and correlation of a fit, shared by the single-band and the joint fit so both
 * follow one rule: the covariance (J^T W J)^-1 is scaled by σ_w² only when σ_w > 1, so stated line
 * uncertainties are never shrunk by a fit that scatters less than they claim.
 * Source: P. R. Bevington and D. K. Robinson, Data Reduction and Error Analysis, 3rd ed. (2003),
 * ch. 7–8 (from memory).
 * @param chi2 weighted χ² (dimensionless)
 * @param nLines lines in the fit (N)
 * @param nParameters floated parameters (P)
 * @param lin the linearisation at the solution (null when none was made)
 * @param isExactlyDetermined N = P: no σ can be given
 */
export function fitStatistics(
  chi2: number,
  nLines: number,
  nParameters: number,
  lin: Linearisation | null,
  isExactlyDetermined: boolean,
): FitStatistics {
  const dof = nLines - nParameters;
  const sigmaW = dof > 0 ? Math.sqrt(chi2 / dof) : nParameters === 0 ? Math.sqrt(chi2 / nLines) : null;
  const covarianceScale = sigmaW !== null && sigmaW > 1 ? sigmaW * sigmaW : 1;
  const sigmas = new Float64Array(nParameters);
  let covariance: number[][] = [];
  let correlation: number[][] = [];
  if (lin && !isExactlyDetermined && sigmaW !== null) {
    const unit = lineariseCovariance(lin);
    const n = nParameters;
    for (let a = 0; a < n; a++) sigmas[a] = Math.sqrt(unit[a * n + a] * covarianceScale);
    covariance = Array.from({ length: n }, (_, a) => Array.from({ length: n }, (_, b) => unit[a * n + b] * covarianceScale));
    correlation = Array.from({ length: n }, (_, a) =>
      Array.from({ length: n }, (_, b) => (a === b ? 1 : unit[a * n + b] / Math.sqrt(unit[a * n + a] * unit[b * n + b]))),
    );
  }
  return { sigmaW, covarianceScale, sigmas, covariance, correlation };
}
