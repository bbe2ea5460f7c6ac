/**
 * Loading data: the demo at start-up, a dropped or chosen file (trace, model, line table or
 * project, told apart by content), and re-importing the trace with edited import choices. A failed
 * import changes nothing and says why in the message area.
 */
import type { Assignment } from '../fit/assignment';
import { lineTableParse } from '../io/lineTable';
import { systemLineTableParse, type SystemLineTable } from '../io/systemLineTable';
import { modelFileParse } from '../io/modelFile';
import type { Trace, TraceImportOutcome, TraceImportReport } from '../io/trace';
import type { TraceImportOptions } from '../io/traceImportOptions';
import { textDecode } from '../io/textDecode';
import { traceImportWarnings } from '../io/traceImportWarnings';
import { parseTraceInWorker } from '../workers/parseClient';
import { assignmentsMarkBlends, assignmentsSplitAllowed } from './assignLogic';
import { benchUpdate, messagePost } from './actionsCore';
import { modelLoadText, modelReplace } from './actionsModel';
import { projectImport } from './actionsProject';
import { confirmAsk } from './actionsSession';
import { demoFallbackTrace } from './demoFallback';
import { benchStore } from './store';
import { systemTableAssignments } from './systemLineRows';
import { systemActiveEntry } from './systemSync';
import type { TraceSource } from './spectrumSlice';

/** The file the current trace came from (kept for re-import with other choices; not persisted). */
let lastSource: { file: File | Blob | string; fileName: string } | null = null;
let importAbort: AbortController | null = null;

/** Import warnings posted to the message area (the rest are in the Trace file panel). */
const IMPORT_WARNINGS_POSTED = 4;

/** The trace parser (the worker in the page; tests may swap in importTrace). */
export type TraceParser = (
  file: File | Blob | string,
  fileName: string,
  options: Partial<TraceImportOptions>,
  onProgress: (fraction: number) => void,
  signal: AbortSignal,
) => Promise<TraceImportOutcome>;

let parser: TraceParser = parseTraceInWorker;

/** Replace the trace parser (tests). */
export function importSetParser(p: TraceParser): void {
  parser = p;
}

/** Put a trace in place (not undoable: the trace is not part of history). */
export function traceReplace(
  trace: Trace,
  report: TraceImportReport | null,
  source: TraceSource,
  overrides: Partial<TraceImportOptions> = {},
): void {
  benchUpdate(
    'load trace',
    () => ({
      trace,
      traceReport: report,
      traceSource: source,
      importOverrides: overrides,
      xRange: null,
      candidateTarget: null,
      traceImport: null,
      traceCalibration: null,
    }),
    { history: false },
  );
}

/** A message ending in a full stop (importer messages may lack one). */
export function sentence(text: string): string {
  const t = text.trim();
  return /[.!?]$/.test(t) ? t : `${t}.`;
}

/** One-line description of an import report for the message area. */
export function importReportSummary(r: TraceImportReport): string {
  const ord = { absorbance: 'absorbance', transmittance: 'transmittance', 'percent-transmittance': 'transmittance in %' }[r.ordinate];
  const skipped = r.skipped.count ? `, ${r.skipped.count} row${r.skipped.count === 1 ? '' : 's'} skipped` : '';
  return `Loaded ${r.fileName}: ${r.format === 'jcamp-dx' ? 'JCAMP-DX' : 'delimited text'}, ${r.points.toLocaleString('en')} points, ${r.rangeCm1[0].toFixed(2)}–${r.rangeCm1[1].toFixed(2)} cm⁻¹, ${ord}${skipped}.`;
}

/**
 * Read a trace file in the worker and, if it reads, make it the current trace.
 * @param file the file (or its text)
 * @param fileName shown in messages (untrusted text)
 * @param overrides import choices (format, units, ordinate, column …)
 * @param source where it came from
 * @returns true when the trace was replaced
 */
export async function traceImport(
  file: File | Blob | string,
  fileName: string,
  overrides: Partial<TraceImportOptions> = {},
  source: TraceSource = 'file',
): Promise<boolean> {
  importAbort?.abort();
  const ctrl = new AbortController();
  importAbort = ctrl;
  benchUpdate('import start', () => ({ traceImport: { fileName, fraction: 0 } }), { history: false });
  let outcome: TraceImportOutcome;
  try {
    outcome = await parser(
      file,
      fileName,
      overrides,
      (fraction) => {
        if (importAbort === ctrl) benchStore.setState({ traceImport: { fileName, fraction } });
      },
      ctrl.signal,
    );
  } catch (err) {
    if (importAbort !== ctrl) return false;
    importAbort = null;
    benchUpdate('import failed', () => ({ traceImport: null }), { history: false });
    if ((err as Error).name !== 'AbortError')
      messagePost(
        'error',
        `Could not read ${fileName}: ${sentence((err as Error).message)} The current trace and assignments are unchanged.`,
      );
    return false;
  }
  if (importAbort !== ctrl) return false;
  importAbort = null;
  if (!outcome.ok) {
    benchUpdate('import failed', () => ({ traceImport: null }), { history: false });
    const where = outcome.error.line !== undefined ? ` (line ${outcome.error.line})` : '';
    messagePost(
      'error',
      `Could not read ${fileName}${where}: ${sentence(outcome.error.message)} The current trace and assignments are unchanged.`,
    );
    return false;
  }
  lastSource = { file, fileName };
  traceReplace(outcome.trace, outcome.report, source, overrides);
  // The importer's own remarks are listed in the Trace file panel; its warnings (the words the CLI prints)
  // also go to the message area, one per kind of problem, the first few only (the area keeps six messages).
  const warnings = traceImportWarnings(outcome.report);
  messagePost(warnings.length > 0 || outcome.report.skipped.count > 0 ? 'warning' : 'info', importReportSummary(outcome.report));
  for (const w of warnings.slice(0, IMPORT_WARNINGS_POSTED)) messagePost('warning', `${fileName}: ${sentence(w)}`);
  if (warnings.length > IMPORT_WARNINGS_POSTED)
    messagePost('warning', `${fileName}: ${warnings.length - IMPORT_WARNINGS_POSTED} more warnings are listed in the Trace file panel.`);
  return true;
}

/** Cancel a running trace import (the current trace stays). */
export function traceImportCancel(): void {
  if (!importAbort) return;
  importAbort.abort();
  importAbort = null;
  benchUpdate('import cancelled', () => ({ traceImport: null }), { history: false });
  messagePost('info', 'Import cancelled; the current trace is unchanged.');
}

/** Read the current trace's file again with changed import choices. */
export async function traceReimport(overrides: Partial<TraceImportOptions>): Promise<boolean> {
  if (!lastSource) {
    messagePost(
      'warning',
      'The original file is no longer available (it is not kept across reloads); choose it again to re-import with other settings.',
    );
    return false;
  }
  return traceImport(lastSource.file, lastSource.fileName, overrides, benchStore.getState().traceSource === 'demo' ? 'demo' : 'file');
}

/** What kind of file a text is, judged by its content (extension as a tie-breaker). */
export type DroppedKind = 'project' | 'model' | 'line-table' | 'trace';

/**
 * Tell a project file, model file, line table and trace apart.
 * @param head the first few kB of the file
 * @param fileName for the extension
 */
export function droppedKind(head: string, fileName: string): DroppedKind {
  const t = head.replace(/^\uFEFF/, '').trimStart();
  if (t.startsWith('{')) return /"format"\s*:\s*"ladder-bench-project"/.test(t) ? 'project' : 'model';
  const firstLine = t.split(/\r?\n/, 1)[0] ?? '';
  if (/(^|[,;\t ])J_up([,;\t ]|$)/.test(firstLine)) return 'line-table';
  if (/\.json$/i.test(fileName)) return 'model';
  return 'trace';
}

/**
 * Open a file chosen or dropped by the user: project, model, line table or trace.
 * @returns true when something was loaded
 */
export async function fileOpen(file: File): Promise<boolean> {
  // Decoded like the whole file will be (a UTF-16 model or line table reads too); a head cut inside a
  // character only spoils its end.
  const headDecoded = textDecode(new Uint8Array(await file.slice(0, 4096).arrayBuffer()));
  const head = headDecoded.ok ? headDecoded.text : '';
  const kind = droppedKind(head, file.name);
  if (kind === 'trace') return traceOpenAsking(file, file.name);
  // A project is read in the parse worker, file and all (its trace makes it large).
  if (kind === 'project') {
    const n = benchStore.getState().assignments.length;
    if (n > 0) {
      const choice = await confirmAsk({
        title: `Open the project ${file.name}?`,
        text: `It replaces the current session: the trace, the model, the ${n} assignment${n === 1 ? '' : 's'} and the fit. Undo (Ctrl+Z) brings the current session back.`,
        choices: [{ id: 'open', label: 'Open and replace the session' }],
      });
      if (choice !== 'open') {
        messagePost('info', `${file.name} was not opened; the session is unchanged.`);
        return false;
      }
    }
    return projectImport(file, file.name);
  }
  const decoded = textDecode(new Uint8Array(await file.arrayBuffer()));
  if (!decoded.ok) {
    messagePost('error', `Could not read ${file.name}: ${sentence(decoded.message)} Nothing was changed.`);
    return false;
  }
  const text = decoded.text;
  if (kind === 'model') return modelLoadText(text, file.name);
  return lineTableLoadText(text, file.name);
}

/**
 * Load another trace chosen by the user. When assignments exist, asks first whether to keep them
 * (their observed positions stay those measured on the previous trace) or clear them (with the fit;
 * one undo step), and says afterwards which it did. Cancelling loads nothing.
 * @returns true when the trace was replaced
 */
export async function traceOpenAsking(file: File | Blob | string, fileName: string): Promise<boolean> {
  const n = benchStore.getState().assignments.length;
  let isClearing = false;
  if (n > 0) {
    const choice = await confirmAsk({
      title: `Load the trace ${fileName}?`,
      text: `There ${n === 1 ? 'is 1 assignment' : `are ${n} assignments`} on the current trace. Keep them (their observed positions stay those of the current trace, so check them against the new one), or clear them with the fit (Undo brings them back).`,
      choices: [
        { id: 'keep', label: `Load and keep the ${n} assignment${n === 1 ? '' : 's'}` },
        { id: 'clear', label: 'Load and clear the assignments' },
      ],
    });
    if (choice === null) {
      messagePost('info', `${fileName} was not loaded; the trace and assignments are unchanged.`);
      return false;
    }
    isClearing = choice === 'clear';
  }
  const isLoaded = await traceImport(file, fileName);
  if (!isLoaded || n === 0) return isLoaded;
  if (isClearing) {
    benchUpdate(
      `clear ${n} assignments`,
      () => ({ assignments: [], selectedAssignmentId: null, cursor: null, fitOutcome: null, fitLineIds: [], fitFinishedAt: null }),
      { history: true, extraKeys: ['fitOutcome', 'fitLineIds', 'fitFinishedAt'] },
    );
    messagePost('info', `The ${n} assignments of the previous trace were cleared with the fit; Undo brings them back.`);
  } else {
    messagePost(
      'warning',
      `The ${n} assignments of the previous trace were kept; their observed positions are from that trace, so check them against ${fileName}.`,
    );
  }
  return true;
}

/**
 * Read a line table (CSV with J_up, K_up, J_lo, K_lo, wavenumber …) and add its rows to the
 * assignments (one undo step); rows with the same quanta replace the existing ones.
 */
export function lineTableLoadText(text: string, fileName: string): boolean {
  let rows: Assignment[];
  let warnings: string[];
  let lineNumbers: number[];
  let systemTable: SystemLineTable | null = null;
  try {
    const table = lineTableParse(text, { fileName });
    if (benchStore.getState().system) systemTable = systemLineTableParse(text, { fileName });
    rows = table.assignments;
    warnings = table.warnings;
    lineNumbers = table.lineNumbers;
  } catch (err) {
    messagePost('error', `Could not read the line table: ${(err as Error).message}. The assignments are unchanged.`);
    return false;
  }
  const s = benchStore.getState();
  const active = systemActiveEntry(s);
  // Transitions the band cannot have (ΔK = ±2 in a perpendicular band, …) never enter the list; with
  // several bands each row is checked in its own band (band and species columns, else the active band).
  const { kept, refused } =
    s.system && active && systemTable
      ? systemTableAssignments(systemTable, s.system, active)
      : assignmentsSplitAllowed(rows, lineNumbers, s.model);
  rows = kept;
  let n = s.nextAssignmentNumber;
  if (rows.length > 0) {
    benchUpdate(
      `load line table ${fileName}`,
      (st) => {
        const key = (a: Assignment) => `${a.species ?? ''}/${a.band ?? ''}|${a.jUpper},${a.kUpper},${a.jLower},${a.kLower}`;
        const incoming = new Map(rows.map((r) => [key(r), r]));
        const kept = st.assignments.filter((a) => !incoming.has(key(a)));
        const ids = new Set(kept.map((a) => a.id));
        const added = rows.map((r) => (ids.has(r.id) || !r.id ? { ...r, id: `a${n++}` } : r));
        return { assignments: assignmentsMarkBlends([...kept, ...added]), nextAssignmentNumber: n };
      },
      { history: true },
    );
  }
  for (const w of warnings) messagePost('warning', sentence(w));
  if (refused.length > 0) {
    const shown = refused
      .slice(0, 5)
      .map((r) => `line ${r.lineNumber}: ${r.reason}`)
      .join('; ');
    messagePost(
      'warning',
      `Read ${rows.length} assigned line${rows.length === 1 ? '' : 's'} from ${fileName}; refused ${refused.length} row${refused.length === 1 ? '' : 's'} whose transition cannot exist in ${s.system ? 'its' : `this ${s.model.band}`} band (${shown}${refused.length > 5 ? '; …' : ''}).`,
    );
    return rows.length > 0;
  }
  messagePost('info', `Read ${rows.length} assigned lines from ${fileName}.`);
  return true;
}

/** The demo files being fetched: each resolves to its content, or null when it is not there. */
export interface DemoFetch {
  modelText: Promise<string | null>;
  traceBlob: Promise<Blob | null>;
}

/**
 * Start fetching both demo files (model and trace) from our own server at once, so start-up can
 * overlap them with restoring the session; pass the result to demoLoad.
 */
export function demoFetch(): DemoFetch {
  const base = import.meta.env?.BASE_URL ?? '/';
  const get = <T>(path: string, read: (r: Response) => Promise<T>): Promise<T | null> =>
    fetch(`${base}${path}`)
      .then(
        (r) => (r.ok ? read(r) : null),
        () => null,
      )
      .catch(() => null);
  return { modelText: get('demo/model.json', (r) => r.text()), traceBlob: get('demo/trace.csv', (r) => r.blob()) };
}

/**
 * Load the demo: the model and trace from /demo/ (fetched from our own server), or, when they are
 * not there, the built-in model with a trace simulated in memory. The trace parse starts in its
 * worker before the model is applied, so the (main-thread) model update and the parse overlap.
 * @param fetched files already being fetched (demoFetch), else fetched here
 */
export async function demoLoad(fetched: DemoFetch = demoFetch()): Promise<void> {
  const traceBlob = await fetched.traceBlob;
  const traceDone = traceBlob ? traceImport(traceBlob, 'demo/trace.csv', {}, 'demo').catch(() => false) : Promise.resolve(false);
  const modelText = await fetched.modelText;
  if (modelText) {
    try {
      const f = modelFileParse(modelText);
      modelReplace({ ...f, name: f.name ?? 'demo model' }, 'load demo model');
    } catch (err) {
      messagePost('warning', `The demo model could not be read (${(err as Error).message}); using the built-in one.`);
    }
  }
  const traceLoaded = await traceDone;
  if (!traceLoaded) {
    const s = benchStore.getState();
    traceReplace(demoFallbackTrace(s.model, s.massAmu), null, 'simulated-demo');
    messagePost('info', 'The demo trace file was not found; showing a spectrum simulated from the model instead.');
  }
  // The demo has many K″ rows: start with the lower ones visible (all can be shown in the ladder list).
  const kMax = benchStore.getState().model.kMax;
  const hidden: string[] = [];
  for (let k = 9; k <= kMax; k++) hidden.push(`r:${k}`, `p:${k}`, `q:${k}`);
  benchUpdate('ladder rows', () => ({ hiddenRows: hidden }), { history: false });
}
