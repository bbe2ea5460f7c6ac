/**
 * Autosave to IndexedDB (idb-keyval): every change is saved shortly after it happens and a reload
 * restores the session. The trace is stored as typed arrays under its own key, written only when it
 * changes; the rest goes through the project-file writer/reader, so a saved session is validated
 * (and migrated) on restore exactly like a project file.
 */
import { createStore, del, get, set, type UseStore } from 'idb-keyval';
import type { Trace } from '../io/trace';
import { projectFileParse, projectFileSerialize } from '../io/projectFile';
import { messagePost } from './actionsCore';
import { sessionOf, stateFromSession } from './session';
import { benchStore, type BenchState } from './store';

const SESSION_KEY = 'session';
const TRACE_KEY = 'trace';
/** Delay between a change and its save, ms (a burst of edits is saved once). */
const SAVE_DELAY_MS = 300;

let db: UseStore | null = null;
function store(): UseStore {
  db ??= createStore('ladder-bench', 'autosave');
  return db;
}

let timer: ReturnType<typeof setTimeout> | null = null;
let savedTrace: Trace | null | undefined;
let unsubscribe: (() => void) | null = null;
let hasWarned = false;
let pending: Promise<void> = Promise.resolve();

/** Fields whose change is worth a save (not progress counters or messages). */
function saveRelevant(a: BenchState, b: BenchState): boolean {
  return (
    a.model !== b.model ||
    a.floated !== b.floated ||
    a.assignments !== b.assignments ||
    a.trace !== b.trace ||
    a.fitOutcome !== b.fitOutcome ||
    a.xRange !== b.xRange ||
    a.hiddenRows !== b.hiddenRows ||
    a.theme !== b.theme ||
    a.tab !== b.tab ||
    a.ordinate !== b.ordinate ||
    a.symmetry !== b.symmetry ||
    a.modelName !== b.modelName ||
    a.massAmu !== b.massAmu ||
    a.lorentzHwhmCm1 !== b.lorentzHwhmCm1 ||
    a.minIntensity !== b.minIntensity ||
    a.peakMinSnr !== b.peakMinSnr ||
    a.peakBaseline !== b.peakBaseline ||
    a.showSimulated !== b.showSimulated ||
    a.showObsMinusSim !== b.showObsMinusSim ||
    a.showPeaks !== b.showPeaks ||
    a.loomisSeriesKey !== b.loomisSeriesKey ||
    a.loomisHalfWidthCm1 !== b.loomisHalfWidthCm1 ||
    a.combinationState !== b.combinationState ||
    a.tableQuery !== b.tableQuery ||
    a.isFitAccepted !== b.isFitAccepted ||
    a.farToleranceCm1 !== b.farToleranceCm1
  );
}

/** Write the current session now. */
export function persistSaveNow(): Promise<void> {
  if (timer) {
    clearTimeout(timer);
    timer = null;
  }
  const s = benchStore.getState();
  const work = async () => {
    try {
      if (s.trace !== savedTrace) {
        await set(TRACE_KEY, s.trace ? { wavenumberCm1: s.trace.wavenumberCm1, absorbance: s.trace.absorbance } : null, store());
        savedTrace = s.trace;
      }
      const text = projectFileSerialize({ ...sessionOf(s), trace: null }, { appVersion: 'autosave', savedAt: new Date().toISOString() });
      await set(SESSION_KEY, text, store());
    } catch (err) {
      if (!hasWarned) {
        hasWarned = true;
        messagePost('warning', `Autosave is not available in this browser (${(err as Error).message}); export a project file to keep your work.`);
      }
    }
  };
  pending = pending.then(work);
  return pending;
}

/** Start saving every relevant change (idempotent). */
export function persistStart(): void {
  if (unsubscribe) return;
  unsubscribe = benchStore.subscribe((now, before) => {
    if (!saveRelevant(now, before)) return;
    if (timer) clearTimeout(timer);
    timer = setTimeout(() => void persistSaveNow(), SAVE_DELAY_MS);
  });
  if (typeof window !== 'undefined') {
    window.addEventListener('pagehide', () => void persistSaveNow());
  }
}

/** Stop autosaving (tests). */
export function persistStop(): void {
  unsubscribe?.();
  unsubscribe = null;
}

/**
 * Restore the autosaved session, if there is one.
 * @returns true when a session was restored
 */
export async function persistRestore(): Promise<boolean> {
  let text: unknown;
  let trace: unknown;
  try {
    [text, trace] = await Promise.all([get(SESSION_KEY, store()), get(TRACE_KEY, store())]);
  } catch {
    return false;
  }
  if (typeof text !== 'string') return false;
  const r = projectFileParse(text);
  if (!r.ok) {
    messagePost('warning', `The autosaved session could not be restored (${r.message}); the demo was loaded instead.`);
    return false;
  }
  const t = trace as Trace | null | undefined;
  const isTrace = !!t && t.wavenumberCm1 instanceof Float64Array && t.absorbance instanceof Float64Array && t.wavenumberCm1.length === t.absorbance.length;
  const session = { ...r.session, trace: isTrace ? (t as Trace) : null };
  const fields = stateFromSession(session);
  benchStore.setState(fields);
  savedTrace = benchStore.getState().trace;
  return true;
}

/** Forget the autosaved session (the "new session" button). */
export async function persistClear(): Promise<void> {
  try {
    await Promise.all([del(SESSION_KEY, store()), del(TRACE_KEY, store())]);
  } catch {
    // Nothing saved, nothing to clear.
  }
  savedTrace = undefined;
}
