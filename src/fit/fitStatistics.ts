import type { FitConvergence } from './fitTypes';
import { lineariseCovariance, type Linearisation } from './leastSquaresLinearise';

/** σ_w outside [1/FIT_SIGMA_W_WARN, FIT_SIGMA_W_WARN] earns a warning (common practice). */
const FIT_SIGMA_W_WARN = 3;

/**
 * Below this many degrees of freedom σ_w is itself too uncertain (relative standard error about
 * 1/sqrt(2ν), i.e. > 22 %) for the constants' σ to mean much: warned in words. Common practice.
 */
export const FIT_FEW_DOF = 10;

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

/** What the statistics warnings of a fit are built from. */
export interface FitStatisticsWarningInput {
  convergence: FitConvergence;
  iterations: number;
  isExactlyDetermined: boolean;
  sigmaW: number | null;
  nLines: number;
  nParameters: number;
}

/**
 * Plain-language warnings about a fit's statistics, the same for the single-band and the joint
 * fit: no convergence, exactly determined, too few degrees of freedom, σ_w far from 1.
 */
export function fitStatisticsWarnings(c: FitStatisticsWarningInput): string[] {
  const w: string[] = [];
  if (c.convergence === 'max-iterations') {
    w.push(`The fit stopped after ${c.iterations} iterations without converging; the constants may not be final.`);
  }
  if (c.isExactlyDetermined) {
    w.push(
      `Exactly determined: ${c.nLines} lines for ${c.nParameters} floated constants, so the constants reproduce the lines exactly and no uncertainties can be given. Assign more lines to obtain them.`,
    );
  } else if (c.sigmaW !== null && c.nParameters > 0) {
    const dof = c.nLines - c.nParameters;
    const s = c.sigmaW.toPrecision(3);
    const notScaled =
      c.sigmaW < 1 ? ' The uncertainties follow from the stated line uncertainties; they are not scaled down by σ_w below 1.' : '';
    if (dof < FIT_FEW_DOF) {
      const rel = Math.round(100 / Math.sqrt(2 * dof));
      w.push(
        `Only ${dof} degree${dof === 1 ? '' : 's'} of freedom (${c.nLines} lines − ${c.nParameters} floated constants): σ_w = ${s} is itself uncertain by about ${rel} %, so the uncertainties of the constants mean little.${notScaled} Assign more lines (or float fewer constants) before trusting them.`,
      );
    }
    if (c.sigmaW > FIT_SIGMA_W_WARN) {
      w.push(
        `σ_w = ${s}: the lines scatter about ${s} times more than their stated uncertainties, and every uncertainty has been scaled up by σ_w. Check for misassignments (see the outliers), constants missing from the model, or uncertainties set too small.`,
      );
    } else if (c.sigmaW < 1 / FIT_SIGMA_W_WARN && dof >= FIT_FEW_DOF) {
      w.push(
        `σ_w = ${s}: over ${dof} degrees of freedom the residuals are much smaller than the stated uncertainties; the stated uncertainties may be set too large.${notScaled}`,
      );
    }
  }
  return w;
}
