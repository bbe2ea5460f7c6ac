/** Actions of the wavenumber calibration: fit reference pairs, apply to the trace, revert. */
import { calibrationApply, calibrationRevert } from '../analysis/calibrationApply';
import { calibrationFit, type AxisCalibration, type CalibrationFit, type CalibrationPair } from '../analysis/calibrationFit';
import type { Assignment } from '../fit/assignment';
import { benchUpdate, messagePost } from './actionsCore';
import { calibrationCompose, calibrationTraceApply, calibrationTraceRevert } from './calibrationLogic';
import { benchStore } from './store';

/**
 * Fit ν_true = (1 + δ) ν_obs (+ offset) to the pairs. Observed positions are on the trace's current
 * axis. Returns the fit, or null with a message in the page when the pairs cannot be fitted.
 */
export function calibrationRun(pairs: readonly CalibrationPair[], withOffset: boolean): CalibrationFit | null {
  try {
    return calibrationFit(pairs, { withOffset });
  } catch (err) {
    messagePost('error', `Calibration: ${(err as Error).message}`);
    return null;
  }
}

/** Assigned observed positions moved by the same axis correction (they were read off the trace). */
function assignmentsMoved(assignments: Assignment[], cal: AxisCalibration, revert: boolean): Assignment[] {
  if (assignments.length === 0) return assignments;
  const obs = assignments.map((a) => a.observedCm1);
  const moved = revert ? calibrationRevert(obs, cal) : calibrationApply(obs, cal);
  return assignments.map((a, i) => ({ ...a, observedCm1: moved[i] }));
}

/**
 * Apply a fitted calibration to the trace axis; peaks follow (they are found on the trace) and the
 * observed positions of existing assignments are corrected by the same amount (an undoable step).
 */
export function calibrationApplyToTrace(fit: CalibrationFit): void {
  const s = benchStore.getState();
  if (!s.trace) {
    messagePost('error', 'Calibration: there is no trace to calibrate.');
    return;
  }
  const cal = { delta: fit.delta, offsetCm1: fit.offsetCm1 };
  const total = s.traceCalibration ? calibrationCompose(s.traceCalibration, cal) : cal;
  benchUpdate('calibrate axis', () => ({ trace: calibrationTraceApply(s.trace!, cal), traceCalibration: total }), { history: false });
  benchUpdate('calibrate assigned positions', (st) => ({ assignments: assignmentsMoved(st.assignments, cal, false) }), { history: true });
  messagePost(
    'info',
    `Wavenumber axis calibrated: δ = ${total.delta.toExponential(4)}, offset ${total.offsetCm1.toFixed(6)} cm⁻¹ in all (revert restores the file's axis).`,
  );
}

/** Take the calibration off again, back to the axis as read from the file. */
export function calibrationRevertTrace(): void {
  const s = benchStore.getState();
  if (!s.trace || !s.traceCalibration) return;
  const cal = s.traceCalibration;
  benchUpdate('revert calibration', () => ({ trace: calibrationTraceRevert(s.trace!, cal), traceCalibration: null }), { history: false });
  benchUpdate('revert assigned positions', (st) => ({ assignments: assignmentsMoved(st.assignments, cal, true) }), { history: true });
  messagePost('info', 'Calibration reverted: the axis is as read from the file.');
}
