/**
 * Assignment actions: click a peak (candidates open, or the selected rung is assigned to it), click
 * a rung (select it, or assign it to the open peak), step along a series, edit and delete rows.
 * Every change to the assignment list enters undo history.
 */
import {
  matchSingle,
  matchSingleContext,
  matchSingleHeightScale,
  type MatchSingleContext,
  type MatchSingleOutcome,
} from '../analysis/matchSingle';
import type { PeakList } from '../analysis/peaksFind';
import type { Assignment } from '../fit/assignment';
import type { FitResult } from '../fit/fitTypes';
import type { TransitionQuanta } from '../physics/model';
import { sortedLowerBound } from './sortedSearch';
import { assignmentsAdd, assignmentsRemove, assignmentsUpdate, peakIdAt, type AssignmentPatch } from './assignLogic';
import { benchUpdate, messagePost } from './actionsCore';
import { viewEnsureVisible, viewZoomTo } from './actionsView';
import type { CandidateTarget } from './assignmentsSlice';
import { candidateHeightScaleGuess, candidatesRank, quantaKey, type Candidate } from './candidateRank';
import { listKeysUpdate, memoLast, type ListKeys } from './memo';
import { quantaLabel, selectAssignedKeys, selectBand, selectFitResult, selectPeaks } from './selectors';
import { benchStore, type BenchState } from './store';
import { assignmentBandKey, selectDrawnBands, type DrawnBands } from './selectorsSystem';
import { systemActiveEntry } from './systemSync';
import { assignmentLevelLabels, lineLevelLabel, transitionSymmetryText } from './systemLevelLabels';
import { lineLabelAscii, lineLabelHtml } from '../physics/lineLabel';

/** What names a line of a several-band session beyond its quanta: band, species and level labels. */
type AssignmentLineRef = { band?: string; species?: string } & Pick<Assignment, 'lUpper' | 'lLower' | 'tagUpper' | 'tagLower'>;

/** Band and species of the active band (several-band session), or null. */
function activeRef(s: BenchState): { band: string; species: string } | null {
  const e = systemActiveEntry(s);
  return e ? { band: e.band, species: e.species } : null;
}

/** True when an assignment belongs to the active band (always, in a single-band session). */
function isActiveBandLine(s: BenchState, a: { band?: string; species?: string }): boolean {
  return !s.system || assignmentBandKey(s, a) === s.activeBandKey;
}

/** Ladder key ("r:3:Q") of a line's series. */
export function ladderKeyOf(q: TransitionQuanta): string {
  return `${'pqr'[q.kUpper - q.kLower + 1]}:${q.kLower}:${'PQR'[q.jUpper - q.jLower + 1]}`;
}

/**
 * Base half-width of the candidate search, cm^-1: 2.5 B'' before any fit (a first guess is often
 * a line spacing off), 1.2 B'' (about half a line spacing) with one; at least 0.05 cm^-1. Each
 * line's window widens further to 5σ of its prediction (candidatesRank).
 */
export function candidateWindowCm1(s: BenchState): number {
  return candidateWindowOf(s.model, walkFit(s) !== null);
}

function candidateWindowOf(model: BenchState['model'], hasFit: boolean): number {
  return Math.max(0.05, (hasFit ? 1.2 : 2.5) * Math.abs(model.lower.B));
}

const NO_CANDIDATES: Candidate[] = [];

/**
 * First-guess σ of a prediction before any fit, in units of B″: 2 B″, one line spacing (a first
 * guess is often 0.1–0.4 cm^-1 off, more at high J). Measured on the demo (its first guess against
 * its truth, 30 strong lone lines 0.1–0.4 cm^-1 off): the true line ranked in the top three for 23
 * of 30 (0 of 30 with the matching σ of 0.2 B″ alone).
 */
const FIRST_GUESS_SIGMA_B = 2;

const heightScaleGuess = memoLast((peaks: PeakList, cat: MatchSingleContext['cat']) => heightScaleOf(peaks, cat.lines.intensity));

/** The rough height scale of a peak list against line intensities, memoised on both (several-band candidates). */
const heightScaleOf = memoLast((peaks: PeakList, intensity: Float64Array) =>
  candidateHeightScaleGuess(peaks.height.subarray(0, peaks.count), intensity),
);

/** An assignment's key (band key | quanta | tags), kept per assignment object while the active band stays. */
const assignedSystemKeyOf = memoLast((activeBandKey: string | null) => {
  const known = new WeakMap<Assignment, string>();
  return (a: Assignment): string => {
    let key = known.get(a);
    if (key === undefined)
      known.set(a, (key = `${assignmentBandKey({ activeBandKey }, a)}|${quantaKey(a)}|${a.tagUpper ?? ''}|${a.tagLower ?? ''}`));
    return key;
  };
});

let assignedSystemKeysLast: ListKeys<Assignment> | null = null;

/**
 * Keys of the assigned lines of a several-band session (key → count): updated per change of the
 * table by the rows that changed (memo/listKeysUpdate), not rebuilt per change or per peak clicked.
 */
function assignedSystemKeys(assignments: BenchState['assignments'], activeBandKey: string | null): ReadonlyMap<string, number> {
  assignedSystemKeysLast = listKeysUpdate(assignedSystemKeysLast, assignments, assignedSystemKeyOf(activeBandKey));
  return assignedSystemKeysLast.counts;
}

/** Height scale from the assignments (≥ 3 single peaks), else the rough rank-matched guess. */
function candidateHeightScale(ctx: MatchSingleContext, assignments: BenchState['assignments']): number {
  const fromAssigned = matchSingleHeightScale(ctx, assignments);
  return Number.isFinite(fromAssigned) ? fromAssigned : heightScaleGuess(ctx.peaks, ctx.cat);
}

const candidates = memoLast(
  (
    target: CandidateTarget | null,
    ctx: MatchSingleContext | null,
    hasFit: boolean,
    assigned: ReadonlyMap<string, number>,
    assignments: BenchState['assignments'],
    model: BenchState['model'],
    minIntensity: number,
  ): Candidate[] => {
    if (!target || !ctx) return NO_CANDIDATES;
    const { cat, peaks } = ctx;
    const p = peakNearest(peaks, target.peakCm1, 1e-6);
    // Predictions (and their σ) from the fit when there is one, as the keyboard walk uses them.
    const lines = { ...cat.lines, wavenumberCm1: cat.predictedCm1 };
    return candidatesRank(lines, target.peakCm1, {
      windowCm1: candidateWindowOf(model, hasFit),
      shape: model.shape,
      assignedKeys: assigned,
      peakSigmaCm1: Number.isFinite(target.peakSigmaCm1) ? target.peakSigmaCm1 : 0,
      // Before a fit, the first guess's error is unknown: σ₀ = max(matching σ, 2 B″).
      predictionSigmaCm1: hasFit
        ? (i) => cat.toleranceSigmaCm1[i]
        : (i) => Math.max(cat.toleranceSigmaCm1[i], FIRST_GUESS_SIGMA_B * Math.abs(model.lower.B)),
      ...(p >= 0 ? { peakHeight: peaks.height[p], heightScale: candidateHeightScale(ctx, assignments) } : {}),
      intensityRatioMax: ctx.options.intensityRatioMax,
      isOffered: (i) => cat.lines.intensity[i] >= minIntensity,
    });
  },
);

/**
 * Candidates from every band switched on (several-band session): the same ranking over the drawn
 * lines (intensities on one scale), each band's first-guess σ from its own B″ (the joint fit's
 * prediction σ are not propagated per line yet, so the first-guess σ is used with a fit too).
 */
const candidatesSystem = memoLast(
  (
    target: CandidateTarget | null,
    drawn: DrawnBands,
    peaks: PeakList | null,
    assignments: BenchState['assignments'],
    activeBandKey: string | null,
    hasFit: boolean,
    minIntensity: number,
  ): Candidate[] => {
    if (!target || !drawn.entries || !drawn.bandOfLine) return NO_CANDIDATES;
    const { lines, entries, bandOfLine } = drawn;
    const bOf = entries.map((e) => Math.abs(e.view?.lower.B ?? 0));
    const window = Math.max(...bOf.map((b) => Math.max(0.05, (hasFit ? 1.2 : 2.5) * b)), 0.05);
    const p = peaks ? peakNearest(peaks, target.peakCm1, 1e-6) : -1;
    const assigned = assignedSystemKeys(assignments, activeBandKey);
    const ranked = candidatesRank(lines, target.peakCm1, {
      windowCm1: window,
      shape: entries[0].view?.shape ?? 'prolate',
      peakSigmaCm1: Number.isFinite(target.peakSigmaCm1) ? target.peakSigmaCm1 : 0,
      predictionSigmaCm1: (i) => Math.max(0.001, FIRST_GUESS_SIGMA_B * (hasFit ? 0.1 : 1) * bOf[bandOfLine[i]]),
      ...(peaks && p >= 0 ? { peakHeight: peaks.height[p], heightScale: heightScaleOf(peaks, lines.intensity) } : {}),
      isOffered: (i) => lines.intensity[i] >= minIntensity,
    });
    return ranked.map((c) => {
      const e = entries[bandOfLine[c.lineIndex]];
      const shape = e.view?.shape ?? 'prolate';
      const deltaK = c.kUpper - c.kLower;
      const deltaJ = c.jUpper - c.jLower;
      const lv = drawn.levels ? lineLevelLabel(drawn.levels, c.lineIndex) : null;
      return {
        ...c,
        band: e.band,
        species: e.species,
        ...(lv ? { ...assignmentLevelLabels(lv), symmetryText: transitionSymmetryText(lv) } : {}),
        isAssigned: assigned.has(`${e.key}|${quantaKey(c)}|${lv?.tagUpper ?? ''}|${lv?.tagLower ?? ''}`),
        labelAscii: lineLabelAscii(deltaK, deltaJ, c.kLower, c.jLower, shape),
        labelHtml: lineLabelHtml(deltaK, deltaJ, c.kLower, c.jLower, shape),
      };
    });
  },
);

/** Ranked candidates for the peak whose list is open ([] when none is). */
export function selectCandidates(s: BenchState): Candidate[] {
  if (!s.candidateTarget) return NO_CANDIDATES;
  if (s.system)
    return candidatesSystem(
      s.candidateTarget,
      selectDrawnBands(s),
      selectPeaks(s).peaks,
      s.assignments,
      s.activeBandKey,
      s.fitOutcome?.ok === true,
      s.minIntensity,
    );
  return candidates(
    s.candidateTarget,
    walkContextOf(s),
    walkFit(s) !== null,
    selectAssignedKeys(s),
    s.assignments,
    s.model,
    s.minIntensity,
  );
}

function peakTarget(peaks: PeakList, i: number): CandidateTarget {
  const peakCm1 = peaks.wavenumberCm1[i];
  return { peakCm1, peakId: peakIdAt(peakCm1), peakSigmaCm1: peaks.centreSigmaCm1[i] };
}

/**
 * Assign quantum numbers to an observed peak (one undo step). The new row is selected.
 * @returns the assignment id
 */
export function assignToPeak(q: TransitionQuanta & AssignmentLineRef, target: CandidateTarget): string {
  const s = benchStore.getState();
  // In a several-band session a line names its band: the candidate's, else the active band's (rung cursor).
  const ref = s.system ? (q.band !== undefined && q.species !== undefined ? { band: q.band, species: q.species } : activeRef(s)) : null;
  // The line's level labels (A1/A2, s/a, ±l) go with it, so the joint fit can tell a split pair apart.
  const levels = ref
    ? assignmentLevelLabels({ lUpper: q.lUpper ?? 0, lLower: q.lLower ?? 0, tagUpper: q.tagUpper ?? '', tagLower: q.tagLower ?? '' })
    : {};
  const sym = transitionSymmetryText(levels);
  const label = quantaLabel(q, s.model.shape) + (sym ? ` ${sym}` : '') + (ref ? ` (${ref.band}, ${ref.species})` : '');
  const newId = `a${s.nextAssignmentNumber}`;
  let id = newId;
  benchUpdate(
    `assign ${label}`,
    (st) => {
      const uncertaintyCm1 = Math.max(0.001, Number.isFinite(target.peakSigmaCm1) ? target.peakSigmaCm1 : 0);
      const quanta = { jUpper: q.jUpper, kUpper: q.kUpper, jLower: q.jLower, kLower: q.kLower };
      const r = assignmentsAdd(
        st.assignments,
        { ...quanta, ...(ref ?? {}), ...levels, observedCm1: target.peakCm1, peakId: target.peakId, uncertaintyCm1 },
        newId,
      );
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
export function rungClick(q: TransitionQuanta & AssignmentLineRef): void {
  const s = benchStore.getState();
  if (s.candidateTarget) {
    assignToPeak(q, s.candidateTarget);
    return;
  }
  const same =
    s.cursor &&
    quantaKey(s.cursor) === quantaKey(q) &&
    (s.cursor as AssignmentLineRef).tagUpper === q.tagUpper &&
    (s.cursor as AssignmentLineRef).tagLower === q.tagLower;
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

/** What a plot click may change, kept so the second click of a double-click can take it back. */
type ClickUndo = Pick<
  BenchState,
  'assignments' | 'past' | 'future' | 'cursor' | 'candidateTarget' | 'selectedAssignmentId' | 'nextAssignmentNumber'
>;
let clickUndo: ClickUndo | null = null;

/** Remember the state before a plot click acts (the first click of what may become a double-click). */
export function plotClickBegin(): void {
  const s = benchStore.getState();
  clickUndo = {
    assignments: s.assignments,
    past: s.past,
    future: s.future,
    cursor: s.cursor,
    candidateTarget: s.candidateTarget,
    selectedAssignmentId: s.selectedAssignmentId,
    nextAssignmentNumber: s.nextAssignmentNumber,
  };
}

/**
 * The second click of a double-click: a double-click is one gesture (zoom out), so whatever its
 * first click did (an assignment, a cursor step, a candidate list opened, a rung selected) is
 * taken back, leaving no trace in the undo history. Call before zooming out.
 */
export function plotClickTakeBack(): void {
  const u = clickUndo;
  clickUndo = null;
  if (!u) return;
  const s = benchStore.getState();
  // Only when nothing else entered history since the first click (it made at most one step).
  const isClickOnly = s.past === u.past || (s.past.length === u.past.length + 1 && s.past[u.past.length - 1] === u.past.at(-1));
  if (isClickOnly) benchStore.setState(u);
  else benchStore.setState({ cursor: u.cursor, candidateTarget: u.candidateTarget });
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

const walkContext = memoLast(
  (model: BenchState['model'], fit: FitResult | null, peaks: PeakList, minIntensity: number, toleranceSigma: number): MatchSingleContext =>
    // Rivals down to a quarter of the weakest drawn line take part (the assistant's dominance ratio).
    matchSingleContext({ model, fit, peaks, minIntensity: minIntensity / 4, options: { toleranceSigma } }),
);

/** The fit the walk predicts from: the last successful fit unless it was exactly determined. */
function walkFit(s: BenchState): FitResult | null {
  // A joint fit's keys name the system's states ("LB-7/v4.B"), which the one-band prediction cannot
  // read: the walk then uses first-guess σ rather than σ from the wrong constants.
  if (s.system) return null;
  const r = selectFitResult(s);
  return r && !r.isExactlyDetermined ? r : null;
}

/** The walk's (and the candidate list's) predictions for the current state, or null without peaks. */
function walkContextOf(s: BenchState): MatchSingleContext | null {
  const { peaks } = selectPeaks(s);
  if (!peaks || peaks.count === 0) return null;
  return walkContext(s.model, walkFit(s), peaks, s.minIntensity, s.walkToleranceSigma);
}

/**
 * What the keyboard walk would do with a rung now (no change to the state): the assistant's
 * matching rules applied to that rung alone (analysis/matchSingle).
 * @returns null without peaks or with an invalid tolerance
 */
function walkDecide(s: BenchState, q: TransitionQuanta): MatchSingleOutcome | null {
  const ctx = walkContextOf(s);
  return ctx ? matchSingle(ctx, q, s.assignments) : null;
}

/**
 * Set k of the keyboard walk (a rung is matched only within k·σ of its prediction).
 * @returns an error sentence, or null
 */
export function walkToleranceSet(k: number): string | null {
  if (!(Number.isFinite(k) && k >= 0.5 && k <= 20)) return `the walk tolerance must be a number of σ from 0.5 to 20, got ${k}`;
  benchUpdate('walk tolerance', () => ({ walkToleranceSigma: k }), { history: false });
  return null;
}

/**
 * The keyboard walk: assign the cursor rung to its peak when the assistant's rules find exactly
 * one (within k·σ of the prediction, height compatible, no rival), then step to the next J″.
 * Where it is unsure it assigns nothing, leaves the cursor where it is and says why.
 * @returns true when a line was assigned
 */
export function cursorAssignMatched(): boolean {
  const s = benchStore.getState();
  if (!s.cursor) {
    messagePost('info', 'Select a rung first (click it, or press → to start at the strongest line).');
    return false;
  }
  const { peaks } = selectPeaks(s);
  if (!peaks) {
    messagePost('info', 'There are no peaks to assign to yet (load a trace, or wait for peak finding).');
    return false;
  }
  const q = s.cursor;
  const label = quantaLabel(q, s.model.shape);
  let d: MatchSingleOutcome | null;
  try {
    d = walkDecide(s, q);
  } catch (err) {
    messagePost('error', `${label} was not assigned: ${(err as Error).message}.`);
    return false;
  }
  if (!d) return false;
  const basis = walkFit(s)
    ? 'σ from the current fit'
    : s.system
      ? 'first-guess σ (the joint fit gives no per-line σ to the walk yet)'
      : 'first-guess σ (no fit yet)';
  if (d.kind === 'declined') {
    messagePost(
      'warning',
      `${label} not assigned: ${d.reason} (tolerance ${d.toleranceSigma}σ, ${basis}). Click its peak to assign it by hand, or press → to skip.`,
    );
    return false;
  }
  const existing = s.assignments.find((a) => quantaKey(a) === quantaKey(q) && isActiveBandLine(s, a));
  if (existing && existing.observedCm1 === peaks.wavenumberCm1[d.peak]) {
    cursorStep(1);
    return false;
  }
  if (existing) {
    messagePost(
      'warning',
      `${label} is already assigned at ${existing.observedCm1.toFixed(4)} cm⁻¹, but the walk finds ${peaks.wavenumberCm1[d.peak].toFixed(4)} cm⁻¹ (${d.distanceSigma.toFixed(1)}σ); it was left as it is. Click a peak to re-assign it.`,
    );
    return false;
  }
  assignToPeak(q, peakTarget(peaks, d.peak));
  messagePost(
    d.isBlend ? 'warning' : 'info',
    `Assigned ${label} at ${peaks.wavenumberCm1[d.peak].toFixed(4)} cm⁻¹: ${d.distanceSigma.toFixed(1)}σ from ${d.predictedCm1.toFixed(4)} cm⁻¹ ` +
      `(within ${d.toleranceSigma}σ = ±${(d.toleranceSigma * d.sigmaCm1).toPrecision(2)} cm⁻¹, ${basis})` +
      (d.isBlend ? `; possible blend: ${d.reason.split('; ').slice(1).join('; ') || 'see the peak'}` : '') +
      '.',
  );
  cursorStep(1);
  return true;
}

/**
 * Assign the cursor rung (or a given line) to the peak nearest a position (Loomis–Wood clicks).
 * @param q the line
 * @param positionCm1 cm^-1
 * @param toleranceCm1 how far to look for a peak, cm^-1
 */
export function assignNearPosition(
  q: TransitionQuanta & { band?: string; species?: string },
  positionCm1: number,
  toleranceCm1: number,
): boolean {
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
