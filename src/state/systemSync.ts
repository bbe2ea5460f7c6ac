/**
 * Keeps a several-band session consistent: an edit of the active band's single-band view (`model`,
 * `floated`) is written into the system in the same store update, so undo, autosave and every band
 * see one model.
 */
import { memoLast } from './memo';
import { systemApplyView, systemBandEntries, type SystemBandEntry } from './systemBands';
import type { BenchState } from './store';

/** The bands of a system with their views (memoised on the system). */
export const systemEntriesOf = memoLast(systemBandEntries);

/** The active band's entry, or null (single-band session, or no such band). */
export function systemActiveEntry(s: Pick<BenchState, 'system' | 'activeBandKey'>): SystemBandEntry | null {
  if (!s.system) return null;
  return systemEntriesOf(s.system).find((e) => e.key === s.activeBandKey) ?? null;
}

/**
 * The patch an action makes, plus the system written back when the patch edits the active band's
 * view and leaves the system itself alone.
 * @param before the state the patch applies to
 * @param patch the fields the action sets
 */
export function systemSyncPatch(before: BenchState, patch: Partial<BenchState>): Partial<BenchState> {
  if (!before.system || 'system' in patch || 'activeBandKey' in patch) return patch;
  if (!('model' in patch) && !('floated' in patch)) return patch;
  const model = patch.model ?? before.model;
  const floated = patch.floated ?? before.floated;
  if (model === before.model && floated === before.floated) return patch;
  const entry = systemActiveEntry(before);
  if (!entry?.view) return patch;
  // A patch that also sets the system's floated set (e.g. fixing a suggested key) is the base it edits.
  const r = systemApplyView(
    before.system,
    patch.systemFloated ?? before.systemFloated,
    patch.systemTies ?? before.systemTies,
    entry,
    model,
    floated,
  );
  return { ...patch, system: r.system, systemFloated: r.floated };
}
