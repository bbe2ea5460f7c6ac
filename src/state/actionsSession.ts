/**
 * Starting over without losing work: an in-page question before the user's work is replaced
 * (confirmAsk/confirmAnswer), a new session, and replacing the whole session as one undo step
 * (a project opened, a new session), so that the replaced session can always be brought back.
 */
import { historyRecord } from './history';
import { benchUpdate, messagePost } from './actionsCore';
import { fitCancel } from './actionsFit';
import { modelSliceInitial } from './modelSlice';
import { stateFromSession } from './session';
import { benchStore, type BenchState } from './store';
import type { ConfirmRequest } from './viewSlice';

let pending: { id: number; resolve: (choice: string | null) => void } | null = null;
let nextConfirmId = 1;

/**
 * Ask the user a question in the page (the prompt is rendered from `confirm` in the store) and wait
 * for the answer. A newer question replaces an unanswered one, which then counts as cancelled.
 * @returns the id of the chosen answer, or null when cancelled
 */
export function confirmAsk(request: Omit<ConfirmRequest, 'id'>): Promise<string | null> {
  pending?.resolve(null);
  const id = nextConfirmId++;
  return new Promise((resolve) => {
    pending = { id, resolve };
    benchUpdate('confirm', () => ({ confirm: { ...request, id } }), { history: false });
  });
}

/**
 * Answer the open question.
 * @param choice an answer's id, or null for "Cancel"
 */
export function confirmAnswer(choice: string | null): void {
  const p = pending;
  pending = null;
  benchUpdate('confirm', () => ({ confirm: null }), { history: false });
  p?.resolve(choice);
}

/**
 * Make `fields` (a whole session, from stateFromSession) the state, as one undo step that holds every
 * field it replaced as it was in `before`: undo brings the previous session back whole.
 * @param before the state to come back to (taken before any part of the change was applied)
 * @param fields the new session's fields (their history fields are ignored)
 * @param label the undo step's name ("open project p.json")
 */
export function sessionReplaceFrom(before: BenchState, fields: Partial<BenchState>, label: string): void {
  const { past: _past, future: _future, ...rest } = fields;
  const keys = Object.keys(rest);
  benchStore.setState({ ...rest, ...historyRecord(before, before, label, false, keys) });
}

/** The fields of a new, empty session: no trace, peaks, assignments or fit; the default model; the theme kept. */
export function sessionNewFields(s: BenchState): Partial<BenchState> {
  const m = modelSliceInitial();
  return {
    ...stateFromSession({ model: m.model, view: { theme: s.theme } as never }),
    traceCalibration: null,
    traceImport: null,
    confirm: null,
  };
}

/**
 * Start a new session (one undo step: Undo brings the previous one back). When assignments exist,
 * asks first.
 * @returns true when the new session was started
 */
export async function sessionNew(): Promise<boolean> {
  const n = benchStore.getState().assignments.length;
  if (n > 0) {
    const choice = await confirmAsk({
      title: 'Start a new session?',
      text: `The trace, its peaks, the ${n} assignment${n === 1 ? '' : 's'} and the fit are cleared and the model goes back to the default. Undo brings the current session back.`,
      choices: [{ id: 'new', label: 'Start a new session' }],
    });
    if (choice !== 'new') return false;
  }
  if (benchStore.getState().isFitRunning) fitCancel();
  const s = benchStore.getState();
  sessionReplaceFrom(s, sessionNewFields(s), 'new session');
  messagePost('info', 'New session: trace, assignments and fit cleared, model back to the default. Undo brings the previous session back.');
  return true;
}
