/**
 * Assignment actions: click a peak (candidates open, or the selected rung is assigned to it), click
 * a rung (select it, or assign it to the open peak), step along a series, edit and delete rows.
 * Every change to the assignment list enters undo history.
 */
import type { PeakList } from '../analysis/peaksFind';
import { fitPredict } from '../fit/fitPredict';
import type { TransitionQuanta } from '../physics/model';
import { sortedLowerBound } from './sortedSearch';
import { assignmentsAdd, assignmentsRemove, assignmentsUpdate, peakIdAt, type AssignmentPatch } from './assignLogic';
import { benchUpdate, messagePost } from './actionsCore';
import { viewEnsureVisible, viewZoomTo } from './actionsView';
import type { CandidateTarget } from './assignmentsSlice';
import { candidatesRank, quantaKey, type Candidate } from './candidateRank';
import { memoLast } from './memo';
import { quantaLabel, selectAssignedKeys, selectBand, selectPeaks } from './selectors';
import { benchStore, type BenchState } from './store';

/** Ladder key ("r:3:Q") of a line's series. */
export function ladderKeyOf(q: TransitionQuanta): string {
  return `${'pqr'[q.kUpper - q.kLower + 1]}:${q.kLower}:${'PQR'[q.jUpper - q.jLower + 1]}`;
}

/** Candidate search half-width for the current model: 1.2 B'' (about half a J spacing), at least 0.05 cm^-1. */
export function candidateWindowCm1(s: BenchState): number {
  return candidateWindowOf(s.model);
}

function candidateWindowOf(model: BenchState['model']): number {
  return Math.max(0.05, 1.2 * Math.abs(model.lower.B));
}

const NO_CANDIDATES: Candidate[] = [];

const candidates = memoLast(
  (
    target: CandidateTarget | null,
    band: ReturnType<typeof selectBand>,
    outcome: BenchState['fitOutcome'],
    assigned: Set<string>,
    model: BenchState['model'],
  ): Candidate[] => {
    if (!target) return NO_CANDIDATES;
    const result = outcome?.ok && !outcome.result.isExactlyDetermined ? outcome.result : null;
    const lines = band.lines;
    return candidatesRank(lines, target.peakCm1, {
      windowCm1: candidateWindowOf(model),
      shape: model.shape,
      assignedKeys: assigned,
      peakSigmaCm1: Number.isFinite(target.peakSigmaCm1) ? target.peakSigmaCm1 : 0,
      // Only the few lines in the window need a prediction σ: compute those (the same value
      // selectPredictionSigmas gives for line i) instead of one for every line of the band.
      ...(result ? { predictionSigmaCm1: (i: number) => fitPredict(result, quantaAt(lines, i)).sigmaCm1 } : {}),
    });
  },
);

/** Ranked candidates for the peak whose list is open ([] when none is). */
export function selectCandidates(s: BenchState): Candidate[] {
  return candidates(s.candidateTarget, selectBand(s), s.fitOutcome, selectAssignedKeys(s), s.model);
}

function peakTarget(peaks: PeakList, i: number): CandidateTarget {
  const peakCm1 = peaks.wavenumberCm1[i];
  return { peakCm1, peakId: peakIdAt(peakCm1), peakSigmaCm1: peaks.centreSigmaCm1[i] };
}

/**
 * Assign quantum numbers to an observed peak (one undo step). The new row is selected.
 * @returns the assignment id
 */
export function assignToPeak(q: TransitionQuanta, target: CandidateTarget): string {
  const s = benchStore.getState();
  const label = quantaLabel(q, s.model.shape);
  const newId = `a${s.nextAssignmentNumber}`;
  let id = newId;
  benchUpdate(
    `assign ${label}`,
    (st) => {
      const uncertaintyCm1 = Math.max(0.001, Number.isFinite(target.peakSigmaCm1) ? target.peakSigmaCm1 : 0);
      const r = assignmentsAdd(st.assignments, { ...q, observedCm1: target.peakCm1, peakId: target.peakId, uncertaintyCm1 }, newId);
      id = r.id;
      return {
        assignments: r.list,
        selectedAssignmentId: r.id,
        nextAssignmentNumber: r.id === newId ? st.nextAssignmentNumber + 1 : st.nextAssignmentNumber,
        candidateTarget: null,
      };
    },
    { history: true },
  );
  return id;
}

/**
 * A click on peak i: with a selected rung, assign it there and move the cursor to the next J of
 * its series; otherwise open the candidate list for the peak.
 */
export function peakClick(i: number): void {
  const s = benchStore.getState();
  const { peaks } = selectPeaks(s);
  if (!peaks || i < 0 || i >= peaks.count) return;
  const target = peakTarget(peaks, i);
  if (s.cursor) {
    const q = s.cursor;
    assignToPeak(q, target);
    cursorStep(1, false);
    return;
  }
  benchUpdate('candidates', () => ({ candidateTarget: target }), { history: false });
}

/**
 * Index of the peak nearest a position within maxDistanceCm1, or -1.
 * @param peaks ascending peak list
 * @param positionCm1 cm^-1
 * @param maxDistanceCm1 cm^-1
 */
export function peakNearest(peaks: PeakList, positionCm1: number, maxDistanceCm1: number): number {
  const k = sortedLowerBound(peaks.wavenumberCm1, positionCm1);
  let best = -1;
  let bestD = Infinity;
  for (const i of [k - 1, k]) {
    if (i < 0 || i >= peaks.count) continue;
    const d = Math.abs(peaks.wavenumberCm1[i] - positionCm1);
    if (d < bestD) {
      best = i;
      bestD = d;
    }
  }
  return bestD <= maxDistanceCm1 ? best : -1;
}

/**
 * A click on the trace away from a peak marker: act on the nearest peak within ±tolerance.
 * @param positionCm1 where the click landed, cm^-1
 * @param toleranceCm1 how far to look, cm^-1
 */
export function traceClickAt(positionCm1: number, toleranceCm1: number): void {
  const { peaks } = selectPeaks(benchStore.getState());
  if (!peaks) return;
  const i = peakNearest(peaks, positionCm1, toleranceCm1);
  if (i < 0) {
    messagePost(
      'info',
      `No peak found within ${toleranceCm1.toPrecision(2)} cm⁻¹ of ${positionCm1.toFixed(4)} cm⁻¹; lower the peak-finding SNR threshold to find weaker peaks.`,
    );
    return;
  }
  peakClick(i);
}

/**
 * A click on a rung: with a candidate list open, assign the rung to that peak; otherwise select
 * the rung (clicking the selected rung again deselects it).
 */
export function rungClick(q: TransitionQuanta): void {
  const s = benchStore.getState();
  if (s.candidateTarget) {
    assignToPeak(q, s.candidateTarget);
    return;
  }
  const same = s.cursor && quantaKey(s.cursor) === quantaKey(q);
  benchUpdate('select rung', () => ({ cursor: same ? null : { ...q } }), { history: false });
}

/** Assign the n-th (0-based) candidate of the open list. @returns false when there is none */
export function candidateAssign(n: number): boolean {
  const s = benchStore.getState();
  const c = selectCandidates(s)[n];
  if (!c || !s.candidateTarget) return false;
  assignToPeak(c, s.candidateTarget);
  return true;
}

/** Close the candidate list and deselect the rung. */
export function selectionClear(): void {
  benchUpdate('clear selection', () => ({ candidateTarget: null, cursor: null }), { history: false });
}

/**
 * Move the rung cursor along its series by dir J'' steps (±1). Without a cursor, starts at the
 * strongest line. Keeps the rung on screen unless `follow` is false.
 */
export function cursorStep(dir: number, follow = true): void {
  const s = benchStore.getState();
  const band = selectBand(s);
  if (band.lines.count === 0) return;
  let next: TransitionQuanta | null = null;
  if (!s.cursor) {
    let best = 0;
    for (let i = 1; i < band.lines.count; i++) if (band.lines.intensity[i] > band.lines.intensity[best]) best = i;
    next = quantaAt(band.lines, best);
  } else {
    const ladder = band.ladderByKey.get(ladderKeyOf(s.cursor));
    if (!ladder) return;
    const js = Array.from(ladder.lineIndex, (i) => band.lines.jLower[i]);
    const cur = s.cursor.jLower;
    let to = js.indexOf(cur);
    if (to >= 0) to += dir;
    else if (dir > 0) to = js.findIndex((j) => j > cur);
    else {
      to = -1;
      for (let k = 0; k < js.length; k++) if (js[k] < cur) to = k;
    }
    if (to < 0 || to >= js.length) to = Math.min(Math.max(to, 0), js.length - 1);
    next = quantaAt(band.lines, ladder.lineIndex[to]);
  }
  benchUpdate('move cursor', () => ({ cursor: next }), { history: false });
  if (follow && next) {
    const i = band.indexOf.get(quantaKey(next));
    if (i !== undefined) viewEnsureVisible(band.lines.wavenumberCm1[i]);
  }
}

/** Move the rung cursor to the series of the next (dir = +1) or previous K'' with the same ΔK and branch, nearest J''. */
export function cursorStepK(dir: number): void {
  const s = benchStore.getState();
  if (!s.cursor) return cursorStep(0);
  const band = selectBand(s);
  const dk = s.cursor.kUpper - s.cursor.kLower;
  const dj = s.cursor.jUpper - s.cursor.jLower;
  for (let k = s.cursor.kLower + dir; k >= 0 && k <= s.model.kMax; k += dir) {
    const key = ladderKeyOf({ jUpper: dj, kUpper: k + dk, jLower: 0, kLower: k });
    const ladder = band.ladderByKey.get(key);
    if (!ladder || ladder.lineIndex.length === 0) continue;
    let best = ladder.lineIndex[0];
    for (const i of ladder.lineIndex)
      if (Math.abs(band.lines.jLower[i] - s.cursor.jLower) < Math.abs(band.lines.jLower[best] - s.cursor.jLower)) best = i;
    const next = quantaAt(band.lines, best);
    benchUpdate('move cursor', () => ({ cursor: next }), { history: false });
    viewEnsureVisible(band.lines.wavenumberCm1[best]);
    return;
  }
}

function quantaAt(lines: ReturnType<typeof selectBand>['lines'], i: number): TransitionQuanta {
  return { jUpper: lines.jUpper[i], kUpper: lines.kUpper[i], jLower: lines.jLower[i], kLower: lines.kLower[i] };
}

/**
 * Assign the cursor rung to the peak nearest its predicted position (within the candidate window),
 * then step to the next J''.
 * @returns false (with a message) when there is no cursor or no peak near enough
 */
export function cursorAssignNearest(): boolean {
  const s = benchStore.getState();
  if (!s.cursor) {
    messagePost('info', 'Select a rung first (click it, or press → to start at the strongest line).');
    return false;
  }
  const band = selectBand(s);
  const i = band.indexOf.get(quantaKey(s.cursor));
  const { peaks } = selectPeaks(s);
  if (i === undefined || !peaks) return false;
  const nu = band.lines.wavenumberCm1[i];
  const p = peakNearest(peaks, nu, candidateWindowCm1(s) / 2);
  if (p < 0) {
    messagePost(
      'info',
      `No peak within ${(candidateWindowCm1(s) / 2).toPrecision(2)} cm⁻¹ of ${quantaLabel(s.cursor, s.model.shape)} at ${nu.toFixed(4)} cm⁻¹.`,
    );
    return false;
  }
  assignToPeak(s.cursor, peakTarget(peaks, p));
  cursorStep(1);
  return true;
}

/**
 * Assign the cursor rung (or a given line) to the peak nearest a position (Loomis–Wood clicks).
 * @param q the line
 * @param positionCm1 cm^-1
 * @param toleranceCm1 how far to look for a peak, cm^-1
 */
export function assignNearPosition(q: TransitionQuanta, positionCm1: number, toleranceCm1: number): boolean {
  const { peaks } = selectPeaks(benchStore.getState());
  if (!peaks) return false;
  const p = peakNearest(peaks, positionCm1, toleranceCm1);
  if (p < 0) {
    messagePost('info', `No peak within ${toleranceCm1.toPrecision(2)} cm⁻¹ of ${positionCm1.toFixed(4)} cm⁻¹.`);
    return false;
  }
  assignToPeak(q, peakTarget(peaks, p));
  return true;
}

/** Select a table row and zoom the plot to it (view only). */
export function assignmentSelect(id: string | null, zoom = true): void {
  const s = benchStore.getState();
  const a = id ? s.assignments.find((x) => x.id === id) : undefined;
  benchUpdate(
    'select row',
    () => ({
      selectedAssignmentId: a ? a.id : null,
      cursor: a ? { jUpper: a.jUpper, kUpper: a.kUpper, jLower: a.jLower, kLower: a.kLower } : s.cursor,
    }),
    { history: false },
  );
  if (a && zoom) {
    const w = s.xRange ? Math.min((s.xRange[1] - s.xRange[0]) / 2, 4 * candidateWindowCm1(s)) : 4 * candidateWindowCm1(s);
    viewZoomTo(a.observedCm1, w);
  }
}

/**
 * Edit an assignment (one undo step; a run of edits to one field of one row merges).
 * @returns an error sentence, or null
 */
export function assignmentEdit(id: string, patch: AssignmentPatch): string | null {
  const field = Object.keys(patch).join(',');
  try {
    const s = benchStore.getState();
    const list = assignmentsUpdate(s.assignments, id, patch);
    const a = list.find((x) => x.id === id)!;
    // Undo labels name the line, never the internal id.
    benchUpdate(`edit ${field} of ${quantaLabel(a, s.model.shape)}`, () => ({ assignments: list }), {
      history: true,
      coalesce: field === 'note' || field === 'uncertaintyCm1',
    });
    return null;
  } catch (err) {
    return (err as Error).message;
  }
}

/** The line label of an assignment for an undo label ("rQ3(12)"), or "an assignment". */
function deletedName(id: string): string {
  const s = benchStore.getState();
  const a = s.assignments.find((x) => x.id === id);
  return a ? quantaLabel(a, s.model.shape) : 'an assignment';
}

/** Delete assignments (one undo step). */
export function assignmentDelete(ids: readonly string[]): void {
  if (ids.length === 0) return;
  benchUpdate(
    ids.length === 1 ? `delete ${deletedName(ids[0])}` : `delete ${ids.length} assignments`,
    (s) => ({
      assignments: assignmentsRemove(s.assignments, ids),
      selectedAssignmentId: ids.includes(s.selectedAssignmentId ?? '') ? null : s.selectedAssignmentId,
    }),
    { history: true },
  );
}
