/**
 * The one way actions change the store: `benchUpdate(label, recipe, { history })`. An action that
 * enters history (assignments, model edits) records the tracked fields before the change; zoom,
 * pan and panel toggles pass `history: false`.
 */
import { historyChanged, historyRecord, historyRedo, historyUndo } from './history';
import { benchStore, type BenchState } from './store';
import { systemSyncPatch } from './systemSync';
import type { BenchMessage } from './viewSlice';

/** How an action treats undo history. */
export interface UpdateOptions {
  /** Record an undo step when a tracked field changes. */
  history: boolean;
  /** Merge with the previous step when it has the same label (typing in one field). @default false */
  coalesce?: boolean;
  /**
   * Further store fields this change replaces that undo must put back (e.g. the model's name with a
   * model file, every session field with a project). Their old values go into the undo step.
   */
  extraKeys?: readonly (keyof BenchState)[];
}

/**
 * Apply a change to the store.
 * @param label what the change is, in words (shown by undo/redo)
 * @param recipe returns the fields to set, given the current state
 */
export function benchUpdate(label: string, recipe: (s: BenchState) => Partial<BenchState>, options: UpdateOptions): void {
  const before = benchStore.getState();
  const patch = systemSyncPatch(before, recipe(before));
  if (!options.history) {
    benchStore.setState(patch);
    return;
  }
  const after = { ...before, ...patch };
  const extraKeys = options.extraKeys ?? [];
  if (!historyChanged(before, after) && !extraKeys.some((k) => before[k] !== after[k])) {
    benchStore.setState(patch);
    return;
  }
  benchStore.setState({ ...patch, ...historyRecord(before, before, label, options.coalesce, extraKeys) });
}

/** Undo the last model edit or assignment change. @returns the label undone, or null */
export function undo(): string | null {
  const s = benchStore.getState();
  const r = historyUndo(s, s);
  if (!r) return null;
  const { label, ...fields } = r;
  benchStore.setState({ ...(fields as Partial<BenchState>), candidateTarget: null });
  return label;
}

/** Redo what undo took back. @returns the label redone, or null */
export function redo(): string | null {
  const s = benchStore.getState();
  const r = historyRedo(s, s);
  if (!r) return null;
  const { label, ...fields } = r;
  benchStore.setState({ ...(fields as Partial<BenchState>), candidateTarget: null });
  return label;
}

/** Most messages kept on the page. */
const MESSAGES_KEPT = 6;

/**
 * Show a message in the page's message area.
 * @param text plain words (rendered as text; may quote file content safely)
 * @returns the message id
 */
export function messagePost(level: BenchMessage['level'], text: string): number {
  const s = benchStore.getState();
  const id = s.nextMessageId;
  const messages = [...s.messages.filter((m) => m.text !== text), { id, level, text }].slice(-MESSAGES_KEPT);
  benchStore.setState({ messages, nextMessageId: id + 1 });
  return id;
}

/** Remove a message. */
export function messageDismiss(id: number): void {
  benchStore.setState((s) => ({ messages: s.messages.filter((m) => m.id !== id) }));
}
