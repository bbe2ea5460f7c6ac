import { ASSIGNMENT_DEFAULT_UNCERTAINTY_CM1, assignmentCheck, type Assignment } from '../fit/assignment';
import type { BandModel } from '../physics/model';
import { assistantNearestPeak, type AssistantPeakContext } from './assistantPeakContext';
import type { AssistantLine, AssistantSource, AssistantStatus, AssistantUndoRecord } from './assistantTypes';
import type { PeakList } from './peaksFind';

/**
 * Turn hand-made assignments (e.g. a seed line table) into assistant lines, each tied to the
 * nearest peak when that peak lies within half its local FWHM (or within 3σ of the line's own
 * uncertainty, if wider) of the observed position, so the assistant will not give that peak to
 * another rung. Observed positions and uncertainties are kept as given.
 * @param assignments lines with quantum numbers and observed positions (cm^-1)
 * @param model band type and shape (each line is checked against the selection rules)
 * @param peaks the peak list of the trace (cm^-1); may be empty
 * @param context its assistantPeakContext
 * @param status status of the new lines @default 'seed'
 * @throws Error naming the line (id and index) whose quantum numbers the band does not allow,
 *   or whose position or uncertainty is not a finite positive number
 */
export function assistantLinesFromAssignments(
  assignments: readonly Assignment[],
  model: Pick<BandModel, 'band' | 'shape'>,
  peaks: PeakList,
  context: AssistantPeakContext,
  status: AssistantStatus = 'seed',
  source: AssistantSource = 'user',
): AssistantLine[] {
  const taken = new Map<number, string>();
  return assignments.map((a, i) => {
    const where = `assistantLinesFromAssignments: line ${i + 1} (id '${a.id}')`;
    const why = assignmentCheck(a, model);
    if (why) throw new Error(`${where}: ${why}`);
    if (!Number.isFinite(a.observedCm1))
      throw new Error(`${where}: observedCm1 must be a finite wavenumber in cm^-1, got ${a.observedCm1}`);
    const sigma = a.uncertaintyCm1 ?? ASSIGNMENT_DEFAULT_UNCERTAINTY_CM1;
    if (!(sigma > 0) || !Number.isFinite(sigma)) throw new Error(`${where}: uncertaintyCm1 must be a finite number > 0, got ${sigma}`);
    let peakIndex: number | null = null;
    const k = assistantNearestPeak(peaks, a.observedCm1);
    if (k >= 0) {
      const reach = Math.max(0.5 * context.localFwhmCm1[k], 3 * Math.hypot(sigma, peaks.centreSigmaCm1[k]));
      if (Math.abs(peaks.wavenumberCm1[k] - a.observedCm1) <= reach && !taken.has(k)) peakIndex = k;
    }
    if (peakIndex !== null) taken.set(peakIndex, a.id);
    return {
      ...a,
      uncertaintyCm1: sigma,
      status,
      source,
      peakIndex,
      predictedCm1: NaN,
      matchSigmaCm1: NaN,
      distanceSigma: NaN,
      reason: peakIndex === null ? 'given by hand (no peak of the list within reach)' : 'given by hand',
      iteration: 0,
    };
  });
}

/**
 * Accept proposals: status 'proposed' → 'accepted' for the given ids (others unchanged).
 * @returns a new array; the input is not modified
 */
export function assistantAccept(lines: readonly AssistantLine[], ids: readonly string[]): AssistantLine[] {
  const want = new Set(ids);
  return lines.map((l) => (want.has(l.id) && l.status === 'proposed' ? { ...l, status: 'accepted' as const } : l));
}

/** Accept every proposal that is not excluded from the fit (suspects stay proposed for a look). */
export function assistantAcceptAll(lines: readonly AssistantLine[]): AssistantLine[] {
  return lines.map((l) => (l.status === 'proposed' && !l.isExcluded ? { ...l, status: 'accepted' as const } : l));
}

/**
 * Reject proposals (or accepted lines): status → 'rejected', excluded from the fit. The line is
 * kept so that no later run offers the same rung for the same peak again.
 * @returns a new array
 */
export function assistantReject(lines: readonly AssistantLine[], ids: readonly string[]): AssistantLine[] {
  const want = new Set(ids);
  return lines.map((l) => (want.has(l.id) && l.status !== 'seed' ? { ...l, status: 'rejected' as const, isExcluded: true } : l));
}

/**
 * Undo a whole run in one step: the lines as they were before it, plus any line added after the
 * run by someone else (neither in the previous set nor added by the run), in their current state.
 * @param current the lines now
 * @param record the run's undo record
 * @returns the restored set (new array)
 */
export function assistantUndo(current: readonly AssistantLine[], record: AssistantUndoRecord): AssistantLine[] {
  const added = new Set(record.addedIds);
  const before = new Set(record.previousLines.map((l) => l.id));
  const later = current.filter((l) => !added.has(l.id) && !before.has(l.id));
  return [...record.previousLines.map((l) => ({ ...l })), ...later];
}

/**
 * The lines that enter a fit: seeds, accepted and proposed lines not excluded.
 * @returns the lines as Assignments (the fit reads quanta, observedCm1, uncertaintyCm1, isExcluded)
 */
export function assistantFitLines(lines: readonly AssistantLine[]): AssistantLine[] {
  return lines.filter((l) => l.status !== 'rejected' && !l.isExcluded);
}
