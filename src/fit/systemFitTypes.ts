/**
 * Input and result types of the joint fit of several bands (fit/systemFit.ts). Plain serialisable data.
 */
import type { FitConvergence, FitError } from './fitTypes';

/** How a constant enters a joint fit. */
export type SystemParameterStatus = 'floated' | 'fixed' | 'tied';

/** One constant of one state, with its fit key and status (io/systemFile.ts makes these). */
export interface SystemParameter {
  /** Fit key: "<state>.<constant>" or "<species>/<state>.<constant>". */
  key: string;
  speciesIndex: number;
  state: string;
  name: string;
  /** Value, cm^-1 (ζ dimensionless); for a tied constant the value of the one it follows. */
  value: number;
  status: SystemParameterStatus;
  /** For a tied constant: the key of the floated or fixed constant it follows (chains resolved). */
  same?: string;
}

/** One observed line of the joint fit, its levels fully labelled (see systemLineResolve). */
export interface SystemFitLine {
  speciesIndex: number;
  /** Band name within the species. */
  band: string;
  jUpper: number;
  kUpper: number;
  lUpper: -1 | 0 | 1;
  tagUpper: string;
  jLower: number;
  kLower: number;
  lLower: -1 | 0 | 1;
  tagLower: string;
  /** Observed position, cm^-1. */
  observedCm1: number;
  /** 1σ, cm^-1. */
  uncertaintyCm1: number;
  /** Left out of the fit but predicted. @default false */
  isExcluded?: boolean;
  /** Unit the line was measured in (results repeat obs, calc and obs − calc in MHz for MHz lines). @default 'cm-1' */
  unit?: 'cm-1' | 'MHz';
}

/** One constant in a joint-fit result. */
export interface SystemFitParameterResult {
  /** Value, cm^-1 (ζ dimensionless). */
  value: number;
  /** 1σ; 0 for a fixed constant; null when the fit is exactly determined. */
  sigma: number | null;
  fixed: boolean;
  /** For a tied constant: the key it follows (its value and σ are that constant's). */
  same?: string;
}

/** One input line in a joint-fit result (input order). */
export interface SystemFitLineResult extends SystemFitLine {
  species: string;
  /** Observed, calculated and obs − calc, cm^-1. */
  obs: number;
  calc: number;
  obsMinusCalc: number;
  /** 1σ, cm^-1. */
  sigma: number;
  normalisedResidual: number;
  isOutlier: boolean;
  isExcluded: boolean;
  /** For MHz lines: obs, calc, obs − calc and σ in MHz. */
  obsMHz?: number;
  calcMHz?: number;
  obsMinusCalcMHz?: number;
  sigmaMHz?: number;
}

/** Per-band statistics of a joint fit. */
export interface SystemFitBandSummary {
  species: string;
  band: string;
  nLines: number;
  /** Unweighted rms of obs − calc over the band's fitted lines, cm^-1. */
  rmsCm1: number;
  /** sqrt(Σ((o − c)/σ)²/n) over the band's fitted lines (not corrected for degrees of freedom). */
  rmsNormalised: number;
}

/** Outcome of a successful joint fit. */
export interface SystemFitResult {
  /** Every constant of every state, by fit key. */
  parameters: Record<string, SystemFitParameterResult>;
  /** Floated keys, in the order of the covariance and correlation matrices. */
  floated: string[];
  covariance: number[][];
  correlation: number[][];
  nLines: number;
  nParameters: number;
  /** N − P. */
  degreesOfFreedom: number;
  chi2: number;
  rmsCm1: number;
  sigmaW: number | null;
  /** Factor applied to the unit-weight covariance: σ_w² when σ_w > 1, else 1. */
  covarianceScale: number;
  isExactlyDetermined: boolean;
  lines: SystemFitLineResult[];
  outliers: number[];
  bands: SystemFitBandSummary[];
  iterations: number;
  convergence: FitConvergence;
  convergenceMessage: string;
  conditionNumber: number;
  warnings: string[];
}

/** Result of systemFit: a result or a refusal, never an exception for bad data. */
export type SystemFitOutcome = { ok: true; result: SystemFitResult } | { ok: false; error: FitError };
