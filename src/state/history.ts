/**
 * Undo/redo of model edits and assignments. Each action says whether it enters history (as in
 * excalidraw's `captureUpdate`): assignment and model edits do, zoom/pan/panels do not. A snapshot
 * holds references to the immutable model and assignment arrays, so it costs nothing to take.
 */
import type { StateCreator } from 'zustand';
import type { Assignment } from '../fit/assignment';
import type { BandModel } from '../physics/model';
import type { SystemModel } from '../physics/system/systemModel';
import type { ModelSymmetry } from './modelSlice';
import type { BenchState } from './store';

/** What undo restores. */
export interface HistorySnapshot {
  model: BandModel;
  floated: string[];
  symmetry: ModelSymmetry | null;
  minIntensity: number;
  assignments: Assignment[];
  /** The several-band model, its floated keys and the active band (absent in snapshots taken before systems). */
  system?: SystemModel | null;
  systemFloated?: string[];
  activeBandKey?: string | null;
  /** Short description of the change that followed this snapshot ("assign rQ3(12)"). */
  label: string;
  /**
   * Other store fields the change replaced and undo puts back (a model file's name, a whole session
   * opened from a project): field name → value before the change. Absent for ordinary edits.
   */
  extra?: Record<string, unknown>;
}

/** Undo and redo stacks (newest last). */
export interface HistorySlice {
  past: HistorySnapshot[];
  future: HistorySnapshot[];
}

/** Most snapshots kept. */
export const HISTORY_LIMIT = 200;

/** Initial history state. */
export function historySliceInitial(): HistorySlice {
  return { past: [], future: [] };
}

/** Slice creator (state only). */
export const createHistorySlice: StateCreator<BenchState, [], [], HistorySlice> = () => historySliceInitial();

/** The part of the state a snapshot covers. */
export type HistoryTracked = Omit<HistorySnapshot, 'label'>;

/**
 * Take a snapshot of the tracked fields, and of the `extraKeys` fields of `s` when given.
 * @param extraKeys further fields of `s` to keep (see HistorySnapshot.extra)
 */
export function historySnapshot(s: HistoryTracked, label: string, extraKeys?: readonly string[]): HistorySnapshot {
  const snap: HistorySnapshot = {
    model: s.model,
    floated: s.floated,
    symmetry: s.symmetry,
    minIntensity: s.minIntensity,
    assignments: s.assignments,
    label,
  };
  if (s.system !== undefined) {
    snap.system = s.system;
    snap.systemFloated = s.systemFloated;
    snap.activeBandKey = s.activeBandKey;
  }
  if (extraKeys && extraKeys.length > 0) {
    const extra: Record<string, unknown> = {};
    for (const k of extraKeys) extra[k] = (s as unknown as Record<string, unknown>)[k];
    snap.extra = extra;
  }
  return snap;
}

/** True when two states differ in a tracked field (by reference: every edit makes new objects). */
export function historyChanged(a: HistoryTracked, b: HistoryTracked): boolean {
  return (
    a.model !== b.model ||
    a.floated !== b.floated ||
    a.symmetry !== b.symmetry ||
    a.minIntensity !== b.minIntensity ||
    a.assignments !== b.assignments ||
    a.system !== b.system ||
    a.systemFloated !== b.systemFloated ||
    a.activeBandKey !== b.activeBandKey
  );
}

/**
 * Record `before` on the undo stack (dropping the redo stack), unless `coalesce` is set and the
 * previous entry carries the same label (a run of keystrokes in one field is one undo step).
 * @returns new stacks
 */
export function historyRecord(
  h: HistorySlice,
  before: HistoryTracked,
  label: string,
  coalesce = false,
  extraKeys?: readonly string[],
): HistorySlice {
  const last = h.past[h.past.length - 1];
  if (coalesce && last && last.label === label && !extraKeys?.length) return { past: h.past, future: [] };
  const past = [...h.past, historySnapshot(before, label, extraKeys)];
  if (past.length > HISTORY_LIMIT) past.splice(0, past.length - HISTORY_LIMIT);
  return { past, future: [] };
}

/**
 * Step back: the newest snapshot becomes current and the current state goes onto the redo stack
 * (with the same extra fields, so redo puts those back too).
 * @returns the fields to set (the snapshot's extra fields included), or null when there is nothing to undo
 */
export function historyUndo(
  h: HistorySlice,
  current: HistoryTracked,
): (HistoryTracked & HistorySlice & { label: string } & Record<string, unknown>) | null {
  const snap = h.past[h.past.length - 1];
  if (!snap) return null;
  const { label, extra, ...restored } = snap;
  const keys = extra ? Object.keys(extra) : undefined;
  return { ...extra, ...restored, label, past: h.past.slice(0, -1), future: [...h.future, historySnapshot(current, label, keys)] };
}

/**
 * Step forward again (inverse of historyUndo).
 * @returns the fields to set, or null when there is nothing to redo
 */
export function historyRedo(
  h: HistorySlice,
  current: HistoryTracked,
): (HistoryTracked & HistorySlice & { label: string } & Record<string, unknown>) | null {
  const snap = h.future[h.future.length - 1];
  if (!snap) return null;
  const { label, extra, ...restored } = snap;
  const keys = extra ? Object.keys(extra) : undefined;
  return { ...extra, ...restored, label, past: [...h.past, historySnapshot(current, label, keys)], future: h.future.slice(0, -1) };
}
