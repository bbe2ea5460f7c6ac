/**
 * The assignment assistant on the page: the job running in the worker, the review list of its
 * proposals and the misassignment hunt's findings. Proposals are not assignments: only accepting
 * one writes it to the table (an undo step). Nothing here is saved or undone itself.
 */
import type { StateCreator } from 'zustand';
import type { AssistantSuspect } from '../analysis/assistantTypes';
import type { Trace } from '../io/trace';
import type { AssistantProposal } from '../workers/assistantProtocol';
import type { BenchState } from './store';

/** The job in the worker and its progress. */
export interface AssistantJobState {
  kind: 'run' | 'hunt' | 'extend';
  /** What runs, in words ("run 3 from the 12 lines of the table"). */
  what: string;
  /** Loop round reached (0 before the first). */
  round: number;
  /** What runs: the attempt of the start and what its last round did, or the search under way (round 0). */
  stage: string;
  /** Lines proposed so far. */
  rowsSoFar: number;
}

/** One run or series extension whose proposals are in the review list. */
export interface AssistantBatch {
  /** Run number, unique on the page; proposal ids start with it. */
  number: number;
  kind: 'run' | 'extend';
  /** "run 2", "series rQ3 (run 3)". */
  title: string;
  summary: string;
  /** Why the whole batch is in doubt, or null. */
  doubt: string | null;
  warnings: string[];
  /** Cases left undecided, plain words. */
  ambiguous: string[];
  fitSummary: string | null;
  /** The trace whose peaks the proposals sit on (by identity): another trace makes them stale. */
  trace: Trace | null;
}

/** A proposal in the review list. */
export interface AssistantReviewItem extends AssistantProposal {
  /** Number of the batch it came from. */
  batch: number;
  /** Band and species it was proposed for (a several-band session: the band active at run time). */
  band?: string;
  species?: string;
}

/** The hunt's findings on the table. */
export interface AssistantHuntState {
  suspects: AssistantSuspect[];
  notes: string[];
  fitSummary: string;
  /** Number of table lines checked. */
  nChecked: number;
  /** The trace the check ran on (by identity). */
  trace: Trace | null;
}

/** Which proposals the review list shows. */
export type AssistantReviewFilter = 'open' | 'all' | 'confident' | 'doubtful' | 'accepted' | 'rejected';

/** Order of the review list. */
export type AssistantReviewSort = 'position' | 'label' | 'sigma' | 'omc';

/** The assistant's part of the store. */
export interface AssistantSlice {
  assistantJob: AssistantJobState | null;
  assistantBatches: AssistantBatch[];
  assistantProposals: AssistantReviewItem[];
  /** Ids of rejected proposals (the next run is told not to propose them again). */
  assistantRejectedIds: string[];
  /** Proposal selected in the review list (highlighted on the plot), or null. */
  assistantSelectedId: string | null;
  assistantHunt: AssistantHuntState | null;
  assistantFilter: AssistantReviewFilter;
  assistantSort: AssistantReviewSort;
  /** Number the next run or extension gets. */
  assistantNextRun: number;
}

/** Initial assistant state. */
export function assistantSliceInitial(): AssistantSlice {
  return {
    assistantJob: null,
    assistantBatches: [],
    assistantProposals: [],
    assistantRejectedIds: [],
    assistantSelectedId: null,
    assistantHunt: null,
    assistantFilter: 'open',
    assistantSort: 'position',
    assistantNextRun: 1,
  };
}

/** Slice creator (state only). */
export const createAssistantSlice: StateCreator<BenchState, [], [], AssistantSlice> = () => assistantSliceInitial();
