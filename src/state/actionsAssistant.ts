/**
 * Assistant actions: run the auto-extend loop, the misassignment hunt or a series extension in the
 * assistant worker (progress, cancel), and review the proposals. Proposals enter the table only
 * when accepted; the accepts of one batch form one undo step (they coalesce under the batch's
 * label while nothing else enters history in between). A cancelled or failed job writes nothing.
 */
import type { AssistantSeries } from '../analysis/assistantSeriesExtend';
import { seriesLabelAscii } from '../physics/lineLabel';
import type { TransitionQuanta } from '../physics/model';
import { assistantJobStart } from '../workers/assistantClient';
import type { AssistantJob, AssistantJobOutput, AssistantProposalsOutput } from '../workers/assistantProtocol';
import { assignmentsRemove } from './assignLogic';
import { benchUpdate, messagePost } from './actionsCore';
import { viewEnsureVisible } from './actionsView';
import {
  assistantAcceptable,
  assistantAssignmentsAdd,
  assistantBatchNumber,
  assistantItemsOf,
  assistantStatuses,
  type AssistantStatusContext,
} from './assistantLogic';
import type { AssistantBatch, AssistantJobState, AssistantReviewFilter, AssistantReviewItem, AssistantReviewSort } from './assistantSlice';
import { quantaKey } from './candidateRank';
import { memoLast } from './memo';
import { quantaLabel, selectFitResult, selectPeaks } from './selectors';
import { benchStore, type BenchState } from './store';
import { assignmentBandKey } from './selectorsSystem';
import { systemActiveEntry } from './systemSync';

/** The job runner (the worker client; tests pass assistantJobRun wrapped in a promise). */
export type AssistantRunner = typeof assistantJobStart;

let jobAbort: AbortController | null = null;

/** Rungs a series extension predicts beyond each end of the assigned ones. */
const EXTEND_RUNGS = 5;

/** The status context of the current state. */
export function assistantStatusContextOf(s: BenchState): AssistantStatusContext {
  return {
    assignments: s.assignments,
    rejectedIds: s.assistantRejectedIds,
    batches: s.assistantBatches,
    trace: s.trace,
    shape: s.model.shape,
  };
}

/** Positions of the proposals waiting for a decision (for the plot) and whether each is doubted. */
export interface AssistantMarks {
  xCm1: number[];
  isDoubtful: boolean[];
}

let lastMarks: AssistantMarks | null = null;

const marksOf = memoLast(
  (
    items: BenchState['assistantProposals'],
    assignments: BenchState['assignments'],
    rejectedIds: BenchState['assistantRejectedIds'],
    batches: BenchState['assistantBatches'],
    trace: BenchState['trace'],
    shape: BenchState['model']['shape'],
  ): AssistantMarks | null => {
    if (items.length === 0) return (lastMarks = null);
    const st = assistantStatuses(items, { assignments, rejectedIds, batches, trace, shape });
    const xCm1: number[] = [];
    const isDoubtful: boolean[] = [];
    items.forEach((it, i) => {
      if (st[i].status !== 'open' && st[i].status !== 'peak-taken') return;
      xCm1.push(it.observedCm1);
      isDoubtful.push(it.verdict !== 'confident');
    });
    // The same marks keep the same object, so an assignment made by hand elsewhere does not redraw the plot.
    const prev = lastMarks;
    if (prev && prev.xCm1.length === xCm1.length && prev.xCm1.every((x, i) => x === xCm1[i] && prev.isDoubtful[i] === isDoubtful[i]))
      return prev;
    return (lastMarks = { xCm1, isDoubtful });
  },
);

/** The open proposals' marks for the plot, or null when there are none. */
export function selectProposalMarks(s: BenchState): AssistantMarks | null {
  return marksOf(s.assistantProposals, s.assignments, s.assistantRejectedIds, s.assistantBatches, s.trace, s.model.shape);
}

/**
 * The peaks a job can use, or null after saying in the message area why there are none.
 */
function peaksOrSay(s: BenchState): NonNullable<ReturnType<typeof selectPeaks>['peaks']> | null {
  if (!s.trace) {
    messagePost('info', 'Load a trace first: the assistant works on its found peaks.');
    return null;
  }
  const { peaks, error } = selectPeaks(s);
  if (error) {
    messagePost('error', `The assistant cannot run: peak finding failed (${error}).`);
    return null;
  }
  if (!peaks) {
    messagePost('info', 'Peaks are still being found in the trace; start the assistant again when they are shown.');
    return null;
  }
  if (peaks.count === 0) {
    messagePost('warning', `No peaks were found at SNR ≥ ${s.peakMinSnr}; lower the peak-finding threshold, then run the assistant.`);
    return null;
  }
  return peaks;
}

/**
 * Run a job in the worker with progress; resolves with its output, or null when it was cancelled,
 * superseded, failed (said in the message area) or the trace changed meanwhile.
 */
async function jobRun(
  job: AssistantJob,
  what: string,
  runner: AssistantRunner,
): Promise<{ output: AssistantJobOutput; trace: BenchState['trace'] } | null> {
  jobAbort?.abort();
  const ctrl = new AbortController();
  jobAbort = ctrl;
  const trace = benchStore.getState().trace;
  const running: AssistantJobState = { kind: job.kind, what, round: 0, stage: 'starting', rowsSoFar: 0 };
  benchStore.setState({ assistantJob: running });
  let output: AssistantJobOutput;
  try {
    output = await runner(job, ctrl.signal, (round, stage, rowsSoFar) => {
      if (jobAbort === ctrl) benchStore.setState({ assistantJob: { ...running, round, stage, rowsSoFar } });
    });
  } catch (err) {
    if (jobAbort !== ctrl) return null;
    jobAbort = null;
    benchStore.setState({ assistantJob: null });
    if ((err as Error).name === 'AbortError') messagePost('info', `The assistant's ${what} was cancelled; nothing was changed.`);
    else messagePost('error', `The assistant's ${what} could not finish: ${(err as Error).message}. Nothing was changed.`);
    return null;
  }
  if (jobAbort !== ctrl) return null;
  jobAbort = null;
  benchStore.setState({ assistantJob: null });
  if (benchStore.getState().trace !== trace) {
    messagePost('warning', `The trace changed while the assistant's ${what} ran; its result was dropped (nothing was changed).`);
    return null;
  }
  return { output, trace };
}

/** Cancel the running job (terminates the worker); nothing it computed is kept. */
export function assistantCancel(): void {
  jobAbort?.abort();
}

/** Rejected items as pairs the next run must not propose again. */
function rejectedPairs(s: BenchState) {
  const ids = new Set(s.assistantRejectedIds);
  return s.assistantProposals
    .filter((p) => ids.has(p.id))
    .map((p) => ({ jUpper: p.jUpper, kUpper: p.kUpper, jLower: p.jLower, kLower: p.kLower, observedCm1: p.observedCm1 }));
}

/** Store a job's proposals as a new batch; `replace` drops earlier batches' items (rejected ones are kept). */
function batchAdd(
  output: AssistantProposalsOutput,
  trace: BenchState['trace'],
  title: (n: number) => string,
  replace: boolean,
): AssistantBatch {
  const s = benchStore.getState();
  const number = assistantBatchNumber(s.assistantNextRun, s.assignments);
  const batch: AssistantBatch = {
    number,
    kind: output.kind,
    title: title(number),
    summary: output.summary,
    doubt: output.doubt,
    warnings: output.warnings,
    ambiguous: output.ambiguous,
    fitSummary: output.fitSummary,
    trace,
  };
  const ref = systemActiveEntry(s);
  const items = assistantItemsOf(number, output.proposals).map((it) => (ref ? { ...it, band: ref.band, species: ref.species } : it));
  const newKeys = new Set(items.map((it) => quantaKey(it)));
  const rejected = new Set(s.assistantRejectedIds);
  const kept = s.assistantProposals.filter((p) => (replace ? rejected.has(p.id) : rejected.has(p.id) || !newKeys.has(quantaKey(p))));
  const keptBatches = new Set(kept.map((p) => p.batch));
  benchStore.setState({
    assistantProposals: [...kept, ...items],
    assistantBatches: [...s.assistantBatches.filter((b) => keptBatches.has(b.number)), batch],
    assistantNextRun: number + 1,
    assistantSelectedId: null,
  });
  return batch;
}

/**
 * The table lines the assistant works from: every line in a single-band session, the active band's
 * lines in a several-band one (the run, the check and the extension use the active band's model).
 */
function activeBandRows(s: BenchState): BenchState['assignments'] {
  return s.system ? s.assignments.filter((a) => assignmentBandKey(s, a) === s.activeBandKey) : s.assignments;
}

/**
 * Run the auto-extend loop: from the table's lines as seeds, or from the model alone when the table
 * is empty; on the page's found peaks. Its proposals replace the review list (rejected ones stay,
 * and are not proposed again); the table is not touched.
 * @param runner the job runner @default the worker client
 */
export async function assistantRunStart(runner: AssistantRunner = assistantJobStart): Promise<void> {
  const s = benchStore.getState();
  const peaks = peaksOrSay(s);
  if (!peaks) return;
  const rows = activeBandRows(s);
  const n = rows.length;
  const what = n > 0 ? `run from the ${n} line${n === 1 ? '' : 's'} of the table` : 'run from the model alone';
  const done = await jobRun(
    { kind: 'run', model: s.model, floatable: [...s.floated], peaks, assignments: rows, rejected: rejectedPairs(s) },
    what,
    runner,
  );
  if (!done || done.output.kind !== 'run') return;
  const batch = batchAdd(done.output, done.trace, (k) => `run ${k}`, true);
  const nConfident = done.output.proposals.filter((p) => p.verdict === 'confident').length;
  messagePost(
    batch.doubt ? 'warning' : 'info',
    `Assistant ${batch.title}: ${done.output.proposals.length} proposal(s), ${nConfident} confident, for review; the table is unchanged until you accept.` +
      (batch.doubt ? ` The run as a whole is in doubt: ${batch.doubt}.` : ''),
  );
}

/** The series of the selected rung, else of the selected table row, else null. */
function seriesOfSelection(s: BenchState): AssistantSeries | null {
  const q: TransitionQuanta | null = s.cursor ?? s.assignments.find((a) => a.id === s.selectedAssignmentId) ?? null;
  if (!q) return null;
  return { deltaK: q.kUpper - q.kLower, kLower: q.kLower, deltaJ: q.jUpper - q.jLower };
}

/**
 * Extend a sub-branch series by up to EXTEND_RUNGS rungs at each end and in its gaps; the matches
 * join the review list as a batch of their own.
 * @param runner the job runner @default the worker client
 * @param chosen the series (ΔK, K″, ΔJ) @default the series of the selected rung, else of the selected table row
 */
export async function assistantExtendStart(runner: AssistantRunner = assistantJobStart, chosen?: AssistantSeries): Promise<void> {
  const s = benchStore.getState();
  const series = chosen ?? seriesOfSelection(s);
  if (!series) {
    messagePost('info', 'Select a rung of the series to extend (click it on the plot) or a row of the table first.');
    return;
  }
  const peaks = peaksOrSay(s);
  if (!peaks) return;
  const label = seriesLabelAscii(series.deltaK, series.deltaJ, series.kLower, s.model.shape);
  const fit = selectFitResult(s);
  const done = await jobRun(
    {
      kind: 'extend',
      model: s.model,
      floatable: [...s.floated],
      peaks,
      assignments: activeBandRows(s),
      series,
      fit: fit && !fit.isExactlyDetermined ? fit : null,
      rungs: EXTEND_RUNGS,
    },
    `extension of ${label}`,
    runner,
  );
  if (!done || done.output.kind !== 'extend') return;
  const batch = batchAdd(done.output, done.trace, (k) => `series ${label} (run ${k})`, false);
  messagePost('info', `Assistant ${batch.title}: ${done.output.proposals.length} rung(s) proposed for review. ${done.output.summary}`);
}

/**
 * Run the misassignment hunt on the table's lines; its suspects are listed with their reasons (the
 * table is not touched).
 * @param runner the job runner @default the worker client
 */
export async function assistantHuntStart(runner: AssistantRunner = assistantJobStart): Promise<void> {
  const s = benchStore.getState();
  const rows = activeBandRows(s);
  if (rows.length === 0) {
    messagePost('info', s.system ? 'The table has no lines of the active band to check yet.' : 'The table has no lines to check yet.');
    return;
  }
  const peaks = peaksOrSay(s);
  if (!peaks) return;
  const n = rows.length;
  const done = await jobRun(
    { kind: 'hunt', model: s.model, floatable: [...s.floated], peaks, assignments: rows },
    `check of the ${n} table line${n === 1 ? '' : 's'}`,
    runner,
  );
  if (!done || done.output.kind !== 'hunt') return;
  const { suspects, notes, fitSummary } = done.output;
  benchStore.setState({ assistantHunt: { suspects, notes, fitSummary, nChecked: n, trace: done.trace } });
  messagePost(
    suspects.length ? 'warning' : 'info',
    suspects.length
      ? `The check found ${suspects.length} suspect line(s) in the table; see the list in the Assistant panel.`
      : `The check found no suspect among the ${n} table lines.`,
  );
}

/** Titles of the batches, by number. */
function titleOf(s: BenchState): (batch: number) => string {
  const m = new Map(s.assistantBatches.map((b) => [b.number, b.title]));
  return (n) => m.get(n) ?? `run ${n}`;
}

/** Write the items to the table as one undo step (coalesced with earlier accepts of the same batches). */
function acceptItems(items: AssistantReviewItem[]): void {
  const s = benchStore.getState();
  const batches = [...new Set(items.map((it) => it.batch))].sort((a, b) => a - b);
  const title = titleOf(s);
  const label = `accept proposals of ${batches.map(title).join(', ')}`;
  benchUpdate(label, (st) => ({ assignments: assistantAssignmentsAdd(st.assignments, items, title) }), { history: true, coalesce: true });
}

/**
 * Accept proposals one by one (any verdict: the user has looked at them). Refused: rejected,
 * stale, or a transition the table already has (said in a message).
 * @returns how many were written
 */
export function assistantAccept(ids: readonly string[]): number {
  const s = benchStore.getState();
  const { take, skipped } = assistantAcceptable(s.assistantProposals, ids, assistantStatusContextOf(s), 'one');
  if (take.length) acceptItems(take);
  if (skipped.length) {
    const shape = s.model.shape;
    messagePost('warning', `Not accepted: ${skipped.map((x) => `${quantaLabel(x.item, shape)} (${x.why})`).join('; ')}.`);
  }
  return take.length;
}

/**
 * Accept every open, confident proposal (doubtful, excluded and peak-sharing ones stay open for a
 * decision one by one). One undo step.
 * @returns how many were written and how many were left open
 */
export function assistantAcceptAll(): { accepted: number; left: number } {
  const s = benchStore.getState();
  const ids = s.assistantProposals.map((p) => p.id);
  const { take, skipped } = assistantAcceptable(s.assistantProposals, ids, assistantStatusContextOf(s), 'all');
  const left = skipped.filter((x) => x.why !== 'rejected').length;
  if (take.length) acceptItems(take);
  messagePost(
    'info',
    take.length
      ? `Accepted ${take.length} confident proposal(s) into the table (one undo step)${left ? `; ${left} left for a decision one by one` : ''}. Fit to bring the model's constants (and the ladders) to them.`
      : `No confident open proposal to accept${left ? `; ${left} wait for a decision one by one` : ''}.`,
  );
  return { accepted: take.length, left };
}

/** Reject proposals: they stay in the list (filter "rejected") and later runs do not propose them again. The table is not touched. */
export function assistantReject(ids: readonly string[]): void {
  const s = benchStore.getState();
  const inTable = new Set(s.assignments.map((a) => a.id));
  const add = ids.filter((id) => !inTable.has(id) && s.assistantProposals.some((p) => p.id === id));
  if (add.length === 0) return;
  benchStore.setState({ assistantRejectedIds: [...new Set([...s.assistantRejectedIds, ...add])] });
}

/** Take back a rejection (the proposal is open again). */
export function assistantReopen(ids: readonly string[]): void {
  const drop = new Set(ids);
  benchStore.setState((s) => ({ assistantRejectedIds: s.assistantRejectedIds.filter((id) => !drop.has(id)) }));
}

/** Select a proposal (highlighted on the plot and brought into view); null clears. */
export function assistantSelect(id: string | null): void {
  const s = benchStore.getState();
  const p = id ? s.assistantProposals.find((x) => x.id === id) : undefined;
  benchStore.setState({ assistantSelectedId: p ? p.id : null });
  if (p) viewEnsureVisible(p.observedCm1);
}

/** Set the review list's filter or order. */
export function assistantSetView(patch: { filter?: AssistantReviewFilter; sort?: AssistantReviewSort }): void {
  benchStore.setState((s) => ({ assistantFilter: patch.filter ?? s.assistantFilter, assistantSort: patch.sort ?? s.assistantSort }));
}

/** Remove a suspect line from the table (one undo step); the hunt's list shows it as removed while it is not in the table. */
export function assistantSuspectRemove(id: string): void {
  const s = benchStore.getState();
  const a = s.assignments.find((x) => x.id === id);
  if (!a) return;
  benchUpdate(
    `delete ${quantaLabel(a, s.model.shape)} (suspect)`,
    (st) => ({
      assignments: assignmentsRemove(st.assignments, [id]),
      selectedAssignmentId: st.selectedAssignmentId === id ? null : st.selectedAssignmentId,
    }),
    { history: true },
  );
}

/** Look at a suspect: select its table row (highlighted on the plot) and bring it into view. */
export function assistantSuspectReview(id: string): void {
  const a = benchStore.getState().assignments.find((x) => x.id === id);
  if (!a) {
    messagePost('info', 'That line is no longer in the table.');
    return;
  }
  benchUpdate('select row', () => ({ selectedAssignmentId: id }), { history: false });
  viewEnsureVisible(a.observedCm1);
}
