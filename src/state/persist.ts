/**
 * Autosave to IndexedDB (idb-keyval): every change is saved shortly after it happens and a reload
 * restores the session. The session is kept as records, each written only when its part changed:
 * - 'trace': the trace as typed arrays;
 * - 'assignments' and 'fit': those session fields as project-file JSON (projectPartSerialize);
 * - 'session': the rest, as a project file without those fields (small: a zoom or a tab change
 *   writes only this one, never the 5,000 assignments again).
 * In the page, IndexedDB is read and written in the parse worker (storeGetInWorker …): its
 * serialisation of a 1e6-point trace blocked the page for ~0.3 s. On restore the records are read
 * back through the project-file reader (also in the worker), so a saved session is validated (and
 * migrated) exactly like a project file. A session saved before the split (everything in 'session')
 * still restores: a field inside 'session' wins over its record.
 */
import { createStore, delMany, getMany, setMany, type UseStore } from 'idb-keyval';
import { PROJECT_PART_NAMES, projectFileSerialize, projectPartSerialize, type ProjectFit, type ProjectPartName } from '../io/projectFile';
import type { Trace } from '../io/trace';
import { messagePost } from './actionsCore';
import { projectReader } from './actionsProject';
import { storeDelInWorker, storeGetInWorker, storeSetInWorker } from '../workers/parseClient';
import { sessionOf, stateFromSession } from './session';
import { benchStore, type BenchState } from './store';

const SESSION_KEY = 'session';
const TRACE_KEY = 'trace';
/** Record key of each separately saved session field. */
const PART_KEYS: Record<ProjectPartName, string> = { assignments: 'assignments', fit: 'fit' };
/** Delay between a change and its save, ms (a burst of edits is saved once). */
const SAVE_DELAY_MS = 300;

/** Where the autosave keeps its records: IndexedDB in the page; tests may pass a map. */
export interface PersistStorage {
  getMany(keys: string[]): Promise<unknown[]>;
  /** Writes all entries or none (one transaction). */
  setMany(entries: [string, unknown][]): Promise<void>;
  delMany(keys: string[]): Promise<void>;
}

const STORE_NAME = { db: 'ladder-bench', store: 'autosave' };

let db: UseStore | null = null;
function idbStore(): UseStore {
  db ??= createStore(STORE_NAME.db, STORE_NAME.store);
  return db;
}

/** IndexedDB on this thread (where there is no Worker). */
const idbStorage: PersistStorage = {
  getMany: (keys) => getMany(keys, idbStore()),
  setMany: (entries) => setMany(entries, idbStore()),
  delMany: (keys) => delMany(keys, idbStore()),
};

/** IndexedDB in the parse worker: the page only copies the values (writing a 1e6-point trace here blocked it ~0.3 s). */
const workerStorage: PersistStorage = {
  getMany: (keys) => storeGetInWorker(STORE_NAME, keys),
  setMany: (entries) => storeSetInWorker(STORE_NAME, entries),
  delMany: (keys) => storeDelInWorker(STORE_NAME, keys),
};

function defaultStorage(): PersistStorage {
  return typeof Worker !== 'undefined' ? workerStorage : idbStorage;
}

let storage: PersistStorage = defaultStorage();

/** Replace the storage (tests); null puts the default back. Forgets what was saved. */
export function persistSetStorage(s: PersistStorage | null): void {
  storage = s ?? defaultStorage();
  forgetSaved();
}

let timer: ReturnType<typeof setTimeout> | null = null;
let unsubscribe: (() => void) | null = null;
let hasWarned = false;
let pending: Promise<void> = Promise.resolve();

/** The values last written to each record (compared by identity; undefined: not known to be saved). */
let savedTrace: Trace | null | undefined;
let savedAssignments: BenchState['assignments'] | undefined;
let savedFit: ProjectFit | undefined;

function forgetSaved(): void {
  savedTrace = undefined;
  savedAssignments = undefined;
  savedFit = undefined;
}

/** The fit section is unchanged when each of its fields is the same value. */
function fitSame(a: ProjectFit | undefined, b: ProjectFit): boolean {
  return (
    !!a &&
    a.outcome === b.outcome &&
    a.lineIds === b.lineIds &&
    a.finishedAt === b.finishedAt &&
    a.modelBeforeAccept === b.modelBeforeAccept &&
    a.isAccepted === b.isAccepted
  );
}

/** Fields whose change is worth a save (not progress counters or messages). */
function saveRelevant(a: BenchState, b: BenchState): boolean {
  return (
    a.model !== b.model ||
    a.floated !== b.floated ||
    a.system !== b.system ||
    a.systemFloated !== b.systemFloated ||
    a.activeBandKey !== b.activeBandKey ||
    a.hiddenBands !== b.hiddenBands ||
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
    a.massSource !== b.massSource ||
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

/** Resolves in a later task (setTimeout 0): the page may paint and answer input in between. */
function taskNext(): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, 0));
}

/** Write the current session now (only the records whose part changed since the last save). */
export function persistSaveNow(): Promise<void> {
  if (timer) {
    clearTimeout(timer);
    timer = null;
  }
  const s = benchStore.getState();
  const work = async () => {
    try {
      const session = sessionOf(s);
      const entries: [string, unknown][] = [];
      const isTraceNew = s.trace !== savedTrace;
      const isAssignmentsNew = s.assignments !== savedAssignments;
      const isFitNew = !fitSame(savedFit, session.fit);
      if (isTraceNew) entries.push([TRACE_KEY, s.trace ? { wavenumberCm1: s.trace.wavenumberCm1, absorbance: s.trace.absorbance } : null]);
      // Each large text is built in a task of its own, and posted to the storage worker in another:
      // the fit of 10,000 lines is a text of about 4 MB (25–40 ms to build, 10–20 ms to copy), and
      // one task doing all of it after each fit blocked the page for 60–90 ms.
      if (isAssignmentsNew) entries.push([PART_KEYS.assignments, projectPartSerialize('assignments', session.assignments)]);
      if (isFitNew) {
        if (isAssignmentsNew) await taskNext();
        entries.push([PART_KEYS.fit, projectPartSerialize('fit', session.fit)]);
      }
      const head = projectFileSerialize(
        { ...session, trace: null },
        { appVersion: 'autosave', savedAt: new Date().toISOString() },
        PROJECT_PART_NAMES,
      );
      entries.push([SESSION_KEY, head]);
      // Copying a new trace to the storage worker takes 10–20 ms: done in a task of its own, not after the texts were built.
      if (isTraceNew || isAssignmentsNew || isFitNew) await taskNext();
      // One transaction: the head never names parts that were not written with it.
      await storage.setMany(entries);
      if (isTraceNew) savedTrace = s.trace;
      if (isAssignmentsNew) savedAssignments = s.assignments;
      if (isFitNew) savedFit = session.fit;
    } catch (err) {
      if (!hasWarned) {
        hasWarned = true;
        messagePost(
          'warning',
          `Autosave is not available in this browser (${(err as Error).message}); export a project file to keep your work.`,
        );
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
  if (timer) clearTimeout(timer);
  timer = null;
}

/**
 * Restore the autosaved session, if there is one. The project-file text is read by the project
 * reader (the parse worker in the page).
 * @returns true when a session was restored
 */
export async function persistRestore(): Promise<boolean> {
  let values: unknown[];
  try {
    values = await storage.getMany([SESSION_KEY, TRACE_KEY, ...PROJECT_PART_NAMES.map((n) => PART_KEYS[n])]);
  } catch {
    return false;
  }
  const [text, trace, ...partTexts] = values;
  if (typeof text !== 'string') return false;
  const parts: Partial<Record<ProjectPartName, string>> = {};
  PROJECT_PART_NAMES.forEach((name, i) => {
    if (typeof partTexts[i] === 'string') parts[name] = partTexts[i] as string;
  });
  const r = await projectReader()(text, 'the autosaved session', parts);
  if (!r.ok) {
    messagePost('warning', `The autosaved session could not be restored (${r.message}); the demo was loaded instead.`);
    return false;
  }
  const t = trace as Trace | null | undefined;
  const isTrace =
    !!t &&
    t.wavenumberCm1 instanceof Float64Array &&
    t.absorbance instanceof Float64Array &&
    t.wavenumberCm1.length === t.absorbance.length;
  const session = { ...r.session, trace: isTrace ? (t as Trace) : null };
  const fields = stateFromSession(session);
  benchStore.setState(fields);
  // The trace record holds this trace. The parts are written again on the next save: a session of
  // the older layout has none yet, and a stale record may sit beside a head that carries the field.
  savedTrace = benchStore.getState().trace;
  savedAssignments = undefined;
  savedFit = undefined;
  return true;
}
