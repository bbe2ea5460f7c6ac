import type { AssistantLabelCheck } from './assistantLabelCheck';
/**
 * Shared types and defaults of the assignment assistant (series extension, the auto-extend loop,
 * the misassignment hunt and the review helpers). Plain serialisable data, so the page, a worker
 * and the CLI all pass the same objects. Every position is in cm^-1.
 */
import type { Assignment } from '../fit/assignment';
import type { FitError, FitResult } from '../fit/fitTypes';
import type { TransitionQuanta } from '../physics/model';

/**
 * Review state of an assistant line.
 * - 'seed': given by the user (or picked by assistantSeedFromModel) to start from;
 * - 'accepted': a proposal the user accepted (or an assignment made by hand);
 * - 'proposed': added by the assistant, waiting for review;
 * - 'rejected': a proposal the user rejected; kept (excluded) so no later run proposes the same
 *   rung for the same peak again.
 */
export type AssistantStatus = 'seed' | 'accepted' | 'proposed' | 'rejected';

/** Who made a line: the user, the model-only seeding, the auto-extend loop or a series extension. */
export type AssistantSource = 'user' | 'auto-seed' | 'auto-extend' | 'series-extend';

/** An assignment as the assistant keeps it: an Assignment plus why and how sure. */
export interface AssistantLine extends Assignment {
  status: AssistantStatus;
  source: AssistantSource;
  /** Index into the peak list the line was matched to, or null (a user line with no peak near it). */
  peakIndex: number | null;
  /** Predicted position when the line was proposed, cm^-1 (NaN for user lines). */
  predictedCm1: number;
  /** Matching σ of the pair: prediction ⊕ peak centre ⊕ width floor, cm^-1 (NaN for user lines). */
  matchSigmaCm1: number;
  /** |observed − predicted| / matchSigmaCm1 (NaN for user lines). */
  distanceSigma: number;
  /** Plain words: why the line was proposed, weighted down or excluded. */
  reason: string;
  /** Iteration of the run that added it (0 for seeds and hand-made lines). */
  iteration: number;
}

/** A predicted rung (one transition) with its prediction. */
export interface AssistantRung extends TransitionQuanta {
  /** ASCII label ^ΔK ΔJ_K''(J''), e.g. "rQ3(12)". */
  label: string;
  /** Predicted position, cm^-1. */
  predictedCm1: number;
  /** 1σ of the prediction itself (fit covariance or series polynomial), cm^-1. */
  predictionSigmaCm1: number;
  /** Matching σ before the peak's own centre σ is added (prediction ⊕ scatter ⊕ width floor), cm^-1. */
  toleranceSigmaCm1: number;
  /** Relative intensity of the model (strongest line of the band = 1). */
  intensity: number;
}

/** A peak offered for a rung. */
export interface AssistantCandidatePeak {
  peakIndex: number;
  wavenumberCm1: number;
  /** |peak − predicted| / σ of the pair. */
  distanceSigma: number;
  /** σ of the pair, cm^-1. */
  sigmaCm1: number;
}

/**
 * Why a rung or peak was left alone.
 * - 'several-peaks': more than one peak lies within tolerance of the rung;
 * - 'several-rungs': more than one comparably strong rung lies within tolerance of the peak;
 * - 'peak-taken': the only peak within tolerance already carries another assignment (a possible blend);
 * - 'intensity-mismatch': the only peak is far stronger or weaker than the rung predicts;
 * - 'shape-mismatch': the only peak is wider than a single line and no predicted line explains it.
 */
export type AssistantAmbiguityKind = 'several-peaks' | 'several-rungs' | 'peak-taken' | 'intensity-mismatch' | 'shape-mismatch';

/** A case the assistant refused to decide, listed for the user with every candidate. */
export interface AssistantAmbiguity {
  kind: AssistantAmbiguityKind;
  /** The rung(s) involved (one for 'several-peaks', two or more for 'several-rungs'). */
  rungs: AssistantRung[];
  /** The candidate peak(s). */
  peaks: AssistantCandidatePeak[];
  /** Plain words. */
  reason: string;
}

/** Another assignment that would fit a suspect line's peak, or another peak for its rung. */
export interface AssistantAlternative extends TransitionQuanta {
  label: string;
  /** Predicted position of this alternative rung, cm^-1. */
  predictedCm1: number;
  /** |observed − predicted| / σ. */
  distanceSigma: number;
  /** Relative intensity of the alternative rung (strongest line of the band = 1). */
  intensity: number;
  /** Whether another line of the set already carries these quantum numbers (then a swap is likely). */
  isAssignedElsewhere: boolean;
}

/** A line the misassignment hunt distrusts. */
export interface AssistantSuspect {
  /** Id of the line (AssistantLine.id / Assignment.id). */
  id: string;
  /** Index into the input lines. */
  index: number;
  label: string;
  observedCm1: number;
  /** Calculated from the clean fit, cm^-1. */
  calcCm1: number;
  /** obs − calc, cm^-1. */
  obsMinusCalcCm1: number;
  /** (obs − calc)/σ_eff with σ_eff = line σ × robust σ_w ⊕ prediction σ. */
  normalisedResidual: number;
  /** Plain words, one per test failed (obs − calc, combination difference). */
  reasons: string[];
  /** Other rungs predicted within tolerance of the observed position, best first. */
  alternativeRungs: AssistantAlternative[];
  /** Other peaks within tolerance of this line's own predicted position, best first. */
  alternativePeaks: AssistantCandidatePeak[];
  /**
   * The only test failed is obs − calc against the clean fit (no combination difference, no
   * off-line or leverage test): the residual is large against the line's own σ only.
   */
  isResidualOnly: boolean;
  /** The band's line width the tests used (median FWHM of the peaks the lines sit on), cm^-1. */
  lineWidthCm1: number;
}

/** Tuning of the assistant; every field optional, ASSISTANT_DEFAULTS holds the defaults. */
export interface AssistantOptions {
  /** k: a peak matches a rung when |peak − prediction| ≤ k·σ of the pair. @default 3 */
  toleranceSigma?: number;
  /** Width floor of the matching σ, as a fraction of the local median FWHM. @default 0.1 */
  widthFloorFraction?: number;
  /** Floor of a peak position's 1σ in the fit (systematic part), fraction of its FWHM. @default 0.02 */
  positionFloorFraction?: number;
  /** A peak wider than this multiple of the running median FWHM is a possible blend. @default 1.5 */
  blendWidthRatio?: number;
  /** Peaks on each side used for the running median FWHM. @default 10 */
  widthNeighbours?: number;
  /** A possible blend's position 1σ gets this fraction of its FWHM added in quadrature. @default 0.25 */
  blendUncertaintyFraction?: number;
  /**
   * A rung weaker than 1/dominanceRatio of the candidate does not compete for its peak (it cannot
   * make the peak); within a factor dominanceRatio the two are ambiguous. @default 4
   */
  dominanceRatio?: number;
  /** A weaker rung within tolerance and at least this fraction of the candidate makes the line a possible blend. @default 0.1 */
  blendPartnerFraction?: number;
  /** Only rungs predicted at least this SNR (from the intensity scale of the assigned peaks) are offered. @default 10 */
  minPredictedSnr?: number;
  /** Observed/predicted peak height must lie within [1/f, f] (once ≥ 3 assigned peaks fix the scale). @default 3 */
  intensityRatioMax?: number;
  /**
   * A rung is offered only while its k·σ half window is at most this many local FWHMs; a rung
   * predicted less well waits for a better fit (a wide window in a crowded trace nearly always
   * holds some peak). @default 1
   */
  maxWindowFwhm?: number;
  /** J'' range grows by this many rungs beyond the assigned ones per iteration. @default 4 */
  reachJStep?: number;
  /** Most iterations of the auto-extend loop. @default 60 */
  maxIterations?: number;
  /** A fitted line more than this many σ from the fit is a suspect (misassignment hunt). @default 3 */
  outlierSigma?: number;
  /**
   * During the loop, a machine-made line more than this many robust σ from the fit is excluded from
   * the fit (kept, with the reason). Looser than outlierSigma: a correct line pulled by a neighbour
   * barely moves the constants, a wrong one is usually far off. @default 4
   */
  excludeSigma?: number;
  /**
   * Prediction σ used when the fit gives none (exactly determined), cm^-1.
   * @default 0.1 × 2B'' (a tenth of the line spacing)
   */
  fallbackSigmaCm1?: number;
}

/** Default values of AssistantOptions (fallbackSigmaCm1 depends on the model, see assistantOptionsResolve). */
export const ASSISTANT_DEFAULTS: Required<Omit<AssistantOptions, 'fallbackSigmaCm1'>> = {
  toleranceSigma: 3,
  // Two lines closer than ~0.3 FWHM are unresolved anyway; below that a peak centre carries
  // systematic errors (wings of neighbours, baseline) that no statistical σ shows.
  widthFloorFraction: 0.1,
  positionFloorFraction: 0.02,
  blendWidthRatio: 1.5,
  widthNeighbours: 10,
  blendUncertaintyFraction: 0.25,
  dominanceRatio: 4,
  blendPartnerFraction: 0.1,
  minPredictedSnr: 10,
  intensityRatioMax: 3,
  maxWindowFwhm: 1,
  reachJStep: 4,
  maxIterations: 60,
  outlierSigma: 3,
  excludeSigma: 4,
};

/** Resolved options (every field present). */
export type AssistantOptionsResolved = Required<AssistantOptions>;

/** One pass of the auto-extend loop, for the progress log. */
export interface AssistantIteration {
  iteration: number;
  /** Lines in the fit of this iteration. */
  nLinesInFit: number;
  /** Floated constants of this iteration's fit. */
  floated: string[];
  /** Unweighted rms obs − calc of the fit, cm^-1 (NaN without a fit). */
  rmsCm1: number;
  /** Median matching σ of the rungs offered, cm^-1. */
  medianToleranceCm1: number;
  /** J'' reach step used (reachJStep, or doubled after an iteration that added nothing). */
  reachJStep: number;
  /** Rungs within reach left for later because their window was wider than maxWindowFwhm. */
  nWaiting: number;
  /** Lines proposed in this iteration. */
  nProposed: number;
  /** Proposals excluded after this iteration's refit (outliers). */
  nExcluded: number;
}

/** What undoes a run in one step: the set before it and the ids it added. */
export interface AssistantUndoRecord {
  /** The lines exactly as they were before the run. */
  previousLines: AssistantLine[];
  /** Ids of the lines the run added. */
  addedIds: string[];
}

/** Outcome of assistantAutoExtend. */
export interface AssistantRunResult {
  /** The previous lines (unchanged) followed by the lines the run added. */
  lines: AssistantLine[];
  /** Ids of the lines added (all with status 'proposed' or, for model-only seeds, 'seed'). */
  addedIds: string[];
  /** Cases left for the user (never decided automatically), from the last iteration. */
  ambiguous: AssistantAmbiguity[];
  /** Misassignment hunt on the final set. */
  suspects: AssistantSuspect[];
  /** The final fit, or null when no fit could be made. */
  fit: FitResult | null;
  /** Why the final fit failed, when it did. */
  fitError: FitError | null;
  /** Constants floated in the final fit. */
  floated: string[];
  /** Plain-language notes of the fits (constants held fixed and why). */
  fitNotes: string[];
  iterations: AssistantIteration[];
  undo: AssistantUndoRecord;
  warnings: string[];
  /**
   * Why the run as a whole is doubtful (the final constants predict strong lines where the trace
   * has none), or null. A doubtful run's proposals are for review only, never for the table.
   */
  doubt: string | null;
  /** The consistency audit behind `doubt` (null when the intensity scale was unknown). */
  audit: AssistantRunAudit | null;
  /**
   * For a run with no user line (started from the model alone): the rival labellings (J numbering,
   * sub-band) fitted in place of the labels found; when one fits nearly as well, `doubt` says so.
   * Absent or null when not checked.
   */
  labelCheck?: AssistantLabelCheck | null;
}

/** Consistency audit of a finished run. */
export interface AssistantRunAudit {
  /** Strong lines predicted to within the matching window. */
  strong: number;
  /** Of those, lines with no peak in their window. */
  missing: number;
  /** A few of the missing ones, "label at position". */
  examples: string[];
}
