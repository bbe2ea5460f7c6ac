/**
 * Messages between the main thread and the assistant worker, and the plain data its jobs take and
 * give back. Three jobs: a whole run of the auto-extend loop, the misassignment hunt on the table,
 * and the extension of one sub-branch series. Every position is in cm^-1.
 */
import type { AssistantSeries } from '../analysis/assistantSeriesExtend';
import type { AssistantOptions, AssistantSuspect } from '../analysis/assistantTypes';
import type { PeakList } from '../analysis/peaksFind';
import type { Assignment } from '../fit/assignment';
import type { FitResult } from '../fit/fitTypes';
import type { BandModel, TransitionQuanta } from '../physics/model';

/** A pair the user rejected earlier: this rung is not to be proposed for the peak at this position again. */
export interface AssistantRejectedPair extends TransitionQuanta {
  /** Position of the peak it was proposed for, cm^-1. */
  observedCm1: number;
}

/** What every job reads: the band, the page's peaks and the assignment table. */
interface AssistantJobBase {
  /** The active band's model (cm^-1, K). */
  model: BandModel;
  /** Keys the fits may float (the page's floated constants). */
  floatable: string[];
  /** The page's found peaks, ascending. */
  peaks: PeakList;
  /** The assignment table as it is (seeds for a run; the lines checked by the hunt). */
  assignments: Assignment[];
}

/** Run the auto-extend loop from the table's lines (or from the model alone when there are none). */
export interface AssistantRunJob extends AssistantJobBase {
  kind: 'run';
  /** Pairs rejected in earlier reviews (never proposed again). */
  rejected: AssistantRejectedPair[];
  options?: AssistantOptions;
}

/** The misassignment hunt over the table's lines. */
export interface AssistantHuntJob extends AssistantJobBase {
  kind: 'hunt';
  options?: AssistantOptions;
}

/** Predict further rungs of one sub-branch series and match them to peaks. */
export interface AssistantExtendJob extends AssistantJobBase {
  kind: 'extend';
  series: AssistantSeries;
  /** The page's last fit (predictions with σ), or null to learn the series' offset from its rungs. */
  fit: FitResult | null;
  /** Rungs predicted beyond each end. */
  rungs: number;
  options?: AssistantOptions;
}

/** Every job the assistant worker runs. */
export type AssistantJob = AssistantRunJob | AssistantHuntJob | AssistantExtendJob;

/**
 * How sure the assistant is of a proposal.
 * - 'confident': matched one-to-one, within tolerance, nothing against it;
 * - 'doubtful': the misassignment hunt distrusts it, or the run as a whole is in doubt;
 * - 'excluded': the run kept it out of its fit (an outlier, or unresolved K components on one peak).
 */
export type AssistantVerdict = 'confident' | 'doubtful' | 'excluded';

/** One proposed line, ready for review. */
export interface AssistantProposal extends TransitionQuanta {
  /** Unique within the page; becomes the assignment's id when accepted. */
  id: string;
  /** Observed (peak) position, cm^-1. */
  observedCm1: number;
  /** 1σ of the position the fit would use, cm^-1. */
  uncertaintyCm1: number;
  /** Predicted position when it was proposed, cm^-1 (NaN when unknown). */
  predictedCm1: number;
  /** Calculated position from the run's final fit, cm^-1 (NaN without one). */
  calcCm1: number;
  /** |observed − predicted| in σ of the pair when proposed (NaN when unknown). */
  distanceSigma: number;
  /** Possibly a blend: weighted down in the fit. */
  isBlended: boolean;
  verdict: AssistantVerdict;
  /** Why it was proposed (the assistant's words). */
  reason: string;
  /** Why it is doubted or excluded ('' for a confident one). */
  doubt: string;
}

/** Outcome of a run or a series extension: proposals for the review list. */
export interface AssistantProposalsOutput {
  kind: 'run' | 'extend';
  proposals: AssistantProposal[];
  /** One line saying what the job started from and did. */
  summary: string;
  /** Why the whole batch is in doubt, or null. */
  doubt: string | null;
  /** The assistant's warnings and notes, plain words. */
  warnings: string[];
  /** Cases left undecided (never proposed), plain words. */
  ambiguous: string[];
  /** The run's final fit in one line, or null. */
  fitSummary: string | null;
}

/** Outcome of the hunt. */
export interface AssistantHuntOutput {
  kind: 'hunt';
  suspects: AssistantSuspect[];
  notes: string[];
  /** The clean fit in one line, or why there is none. */
  fitSummary: string;
}

/** Every job's outcome. */
export type AssistantJobOutput = AssistantProposalsOutput | AssistantHuntOutput;

/** Main thread → worker. */
export interface AssistantWorkerRequest {
  type: 'job';
  id: number;
  job: AssistantJob;
}

/** Worker → main thread. `error` carries the assistant's own message (bad input). */
export type AssistantWorkerResponse =
  | { type: 'progress'; id: number; round: number; stage: string; rowsSoFar: number }
  | { type: 'result'; id: number; output: AssistantJobOutput }
  | { type: 'error'; id: number; message: string };
