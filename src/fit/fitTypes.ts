/**
 * Input, options and result types of the band fit, shared by the UI, the worker and the CLI
 * (one file, so all three agree on the defaults). Everything here is plain serialisable data.
 */
import type { BandModel, TransitionQuanta } from '../physics/model';

/** One observed line offered to the fit. `Assignment` (fit/assignment.ts) satisfies this shape. */
export interface FitLineInput extends TransitionQuanta {
  /** Observed position, cm^-1. */
  observedCm1: number;
  /** 1σ uncertainty of the position, cm^-1 (weight 1/σ²). */
  uncertaintyCm1: number;
  /** Excluded lines are predicted and reported but do not enter the fit. @default false */
  isExcluded?: boolean;
}

/** Tolerances of the fit; every field is optional, FIT_DEFAULTS gives the defaults. */
export interface FitOptions {
  /** Most Gauss–Newton/Levenberg–Marquardt iterations. @default 50 */
  maxIterations?: number;
  /** Converged when one step lowers χ² by less than this fraction of χ². @default 1e-10 */
  chi2RelativeTolerance?: number;
  /**
   * Converged when every parameter moves by less than this many of its (unit-weight)
   * standard errors in one step. @default 1e-6
   */
  stepToleranceSigma?: number;
  /**
   * Rank test: a singular value of the column-scaled weighted Jacobian below this fraction
   * of the largest counts as zero (the fit is then refused as under-determined).
   * @default 1e-10
   */
  rankRelativeTolerance?: number;
  /** A line is an outlier when |obs − calc| exceeds this many of its own σ. @default 3 */
  outlierSigma?: number;
}

/** Default values of FitOptions. */
export const FIT_DEFAULTS: Required<FitOptions> = {
  maxIterations: 50,
  chi2RelativeTolerance: 1e-10,
  stepToleranceSigma: 1e-6,
  // About 1e6 times the double-precision round-off: exact dependences between columns
  // (A' and A'' in a parallel band) land near 1e-16, real but weak determinations well above.
  rankRelativeTolerance: 1e-10,
  outlierSigma: 3,
};

/** Everything a band fit needs (plain data, can be posted to the worker). */
export interface FitInput {
  /** Start values of every constant (cm^-1) and the band/shape. */
  model: BandModel;
  /** Keys "upper.<name>" / "lower.<name>" of the floated constants; all others stay fixed. */
  floated: readonly string[];
  /** Observed lines, in the caller's order (results keep this order). */
  lines: readonly FitLineInput[];
  options?: FitOptions;
}

/** Callbacks of a fit (not serialisable, so kept out of FitInput). */
export interface FitHooks {
  /** Called after every iteration with its number (1-based) and the weighted χ². */
  onProgress?: (iteration: number, chi2: number) => void;
  /** Polled once per iteration; returning true stops the fit with error kind 'cancelled'. */
  shouldCancel?: () => boolean;
}

/** One constant in a fit result. */
export interface FitParameterResult {
  /** Value, cm^-1 (ζ dimensionless). */
  value: number;
  /** 1σ standard error, same unit; 0 for a fixed constant; null when the fit is exactly determined. */
  sigma: number | null;
  fixed: boolean;
}

/** One input line in a fit result (same order as FitInput.lines). */
export interface FitLineResult extends TransitionQuanta {
  /** Observed position, cm^-1. */
  obs: number;
  /** Position calculated from the fitted constants, cm^-1. */
  calc: number;
  /** obs − calc, cm^-1. */
  obsMinusCalc: number;
  /** The line's stated 1σ uncertainty, cm^-1. */
  sigma: number;
  /** (obs − calc)/sigma, dimensionless. */
  normalisedResidual: number;
  /** |normalisedResidual| > outlierSigma (only lines in the fit are flagged). */
  isOutlier: boolean;
  isExcluded: boolean;
}

/** Why the iteration stopped. */
export type FitConvergence = 'chi2-change' | 'step-size' | 'no-further-decrease' | 'max-iterations' | 'nothing-floated';

/** Outcome of a successful fit. */
export interface FitResult {
  /** Every constant allowed for the shape, keyed "upper.<name>" / "lower.<name>". */
  parameters: Record<string, FitParameterResult>;
  /** Floated keys, in the order of the covariance and correlation matrices. */
  floated: string[];
  /** Covariance of the floated constants (scaled by covarianceScale), units products of theirs; [] when exactly determined. */
  covariance: number[][];
  /** Correlation matrix of the floated constants (dimensionless); [] when exactly determined. */
  correlation: number[][];
  /** Lines in the fit (not excluded). */
  nLines: number;
  nParameters: number;
  /** Degrees of freedom ν = N − P (nLines − nParameters). */
  degreesOfFreedom: number;
  /**
   * Factor applied to (JᵀWJ)⁻¹ to give the covariance: σ_w² when σ_w > 1, else 1 (never scaled down).
   * Dimensionless.
   */
  covarianceScale: number;
  /** Weighted χ² = Σ ((obs − calc)/σ)², dimensionless. */
  chi2: number;
  /** Unweighted sqrt(mean (obs − calc)²) over the fitted lines, cm^-1. */
  rmsCm1: number;
  /** sqrt(χ²/(N − P)), dimensionless; null when N = P. */
  sigmaW: number | null;
  /** True when N = P: the constants reproduce the lines exactly and no σ can be given. */
  isExactlyDetermined: boolean;
  /** Per input line, in input order. */
  lines: FitLineResult[];
  /** Indices (into lines) of the outliers. */
  outliers: number[];
  iterations: number;
  convergence: FitConvergence;
  /** Plain words for the convergence reason. */
  convergenceMessage: string;
  /** Ratio of largest to smallest singular value of the column-scaled weighted Jacobian. */
  conditionNumber: number;
  /** The start model with the fitted values in place. */
  model: BandModel;
  /** Plain-language remarks (nearly undetermined constants, poor σ_w, …). */
  warnings: string[];
}

/** Kinds of refusal. */
export type FitErrorKind = 'bad-input' | 'too-few-lines' | 'unused-parameter' | 'underdetermined' | 'diverged' | 'cancelled';

/** Why a fit was refused; no constants are given for undetermined parameters. */
export interface FitError {
  kind: FitErrorKind;
  /** Plain-language explanation. */
  message: string;
  /** Keys of the parameters involved (e.g. the null space of the Jacobian). */
  parameters: string[];
  /** What to change, in words (e.g. "fix lower.A"). */
  suggestion: string;
  /** Keys the suggestion proposes to fix (may be empty). */
  fixSuggested: string[];
}

/** Result of fitBand: a FitResult or a FitError, never an exception for bad data. */
export type FitOutcome = { ok: true; result: FitResult } | { ok: false; error: FitError };
