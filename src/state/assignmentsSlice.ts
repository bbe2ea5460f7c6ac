import type { StateCreator } from 'zustand';
import { ASSISTANT_DEFAULTS } from '../analysis/assistantTypes';
import type { Assignment } from '../fit/assignment';
import type { TransitionQuanta } from '../physics/model';
import type { BenchState } from './store';

/** A peak whose candidate list is open. */
export interface CandidateTarget {
  /** Observed position, cm^-1. */
  peakCm1: number;
  /** Identifier of the peak. */
  peakId: string;
  /** Statistical 1σ of the peak centre, cm^-1 (NaN when unknown). */
  peakSigmaCm1: number;
}

/** Assigned lines, the selected rung (keyboard cursor) and the open candidate list. */
export interface AssignmentsSlice {
  assignments: Assignment[];
  /** Row selected in the table (and highlighted on the plot). */
  selectedAssignmentId: string | null;
  /** The rung selected for stepping and for "click a rung, then a peak". */
  cursor: TransitionQuanta | null;
  /** Peak whose candidate list is shown, or null. */
  candidateTarget: CandidateTarget | null;
  /** |obs − calc| above this is flagged even when no fit gives σ, cm^-1. */
  farToleranceCm1: number;
  /** Next numeric part of new assignment ids. */
  nextAssignmentNumber: number;
  /**
   * k of the keyboard walk: a rung is assigned only to the one peak within k·σ of its prediction
   * (σ propagated from the fit, or the first-guess σ). @default 3 (the assistant's default)
   */
  walkToleranceSigma: number;
}

/** Initial assignments state. */
export function assignmentsSliceInitial(): AssignmentsSlice {
  return {
    assignments: [],
    selectedAssignmentId: null,
    cursor: null,
    candidateTarget: null,
    farToleranceCm1: 0.02,
    nextAssignmentNumber: 1,
    walkToleranceSigma: ASSISTANT_DEFAULTS.toleranceSigma,
  };
}

/** Slice creator (state only). */
export const createAssignmentsSlice: StateCreator<BenchState, [], [], AssignmentsSlice> = () => assignmentsSliceInitial();
