/**
 * Project export/import: the whole session as a project file, read back to the same state. In the
 * page the file is read and written in the parse worker (a 1e6-point trace is ~20 MB of text);
 * where there is no Worker (Node, tests) the same functions run here.
 */
import {
  projectFileParse,
  projectFileSerialize,
  type ProjectFileHeader,
  type ProjectFileOutcome,
  type ProjectPartName,
  type ProjectSession,
} from '../io/projectFile';
import { projectReadInWorker, projectWriteInWorker } from '../workers/parseClient';
import { messagePost } from './actionsCore';
import { sessionReplaceFrom } from './actionsSession';
import { sessionOf, stateFromSession } from './session';
import { benchStore, type BenchState } from './store';

/** Reads project-file text (or a file) as `projectFileParse` does; the worker in the page. */
export type ProjectReader = (
  file: File | Blob | string,
  fileName: string,
  parts?: Partial<Record<ProjectPartName, string>>,
) => Promise<ProjectFileOutcome>;
/** Writes a session as `projectFileSerialize` does; the worker in the page. */
export type ProjectWriter = (session: ProjectSession, header: ProjectFileHeader) => Promise<string>;

/** The main-thread reader (no Worker: Node, tests). */
export const projectReadHere: ProjectReader = async (file, _fileName, parts = {}) =>
  projectFileParse(typeof file === 'string' ? file : await file.text(), parts);
/** The main-thread writer (no Worker: Node, tests). */
export const projectWriteHere: ProjectWriter = async (session, header) => projectFileSerialize(session, header);

const hasWorker = typeof Worker !== 'undefined';
let reader: ProjectReader = hasWorker ? projectReadInWorker : projectReadHere;
let writer: ProjectWriter = hasWorker ? projectWriteInWorker : projectWriteHere;

/** Replace the project reader and writer (tests); null puts the default back. */
export function projectSetIo(r: ProjectReader | null, w: ProjectWriter | null = null): void {
  reader = r ?? (hasWorker ? projectReadInWorker : projectReadHere);
  writer = w ?? (hasWorker ? projectWriteInWorker : projectWriteHere);
}

/** The project reader in use (the autosave restore reads with it too). */
export function projectReader(): ProjectReader {
  return reader;
}

/**
 * The current session as project-file text (on this thread).
 * @param appVersion from package.json
 * @param savedAt ISO 8601 time
 */
export function projectExportText(appVersion: string, savedAt: string = new Date().toISOString()): string {
  return projectFileSerialize(sessionOf(benchStore.getState()), { appVersion, savedAt });
}

/**
 * The current session as project-file text, written by the project writer (the worker in the page):
 * the same text as projectExportText, without encoding the trace on the main thread.
 * @param appVersion from package.json
 * @param savedAt ISO 8601 time
 */
export function projectExportTextAsync(appVersion: string, savedAt: string = new Date().toISOString()): Promise<string> {
  return writer(sessionOf(benchStore.getState()), { appVersion, savedAt });
}

/**
 * Make a read project file the session, or say why it could not be read (the session is then unchanged).
 * Opening is one undo step: Undo brings back the session that was replaced, trace and all.
 * @param before the state to come back to on undo @default the current state
 * @returns true when loaded
 */
export function projectApply(r: ProjectFileOutcome, fileName: string, before: BenchState = benchStore.getState()): boolean {
  if (!r.ok) {
    messagePost('error', `Could not open ${fileName}: ${r.message}. The current session is unchanged.`);
    return false;
  }
  sessionReplaceFrom(before, stateFromSession(r.session), `open project ${fileName}`);
  for (const m of r.messages) messagePost('warning', `${fileName}: ${m}`);
  messagePost(
    'info',
    `Project ${fileName} opened (${r.session.assignments?.length ?? 0} assignments). Undo brings the previous session back.`,
  );
  return true;
}

/**
 * Replace the session with a project file's content, read on this thread. A file that cannot be read
 * changes nothing.
 * @returns true when loaded
 */
export function projectImportText(text: string, fileName: string): boolean {
  return projectApply(projectFileParse(text), fileName);
}

let openSerial = 0;

/**
 * Replace the session with a project file's content, read by the project reader (the worker in the
 * page; this thread only applies the result); one undo step. A file that cannot be read, or a reader that fails,
 * changes nothing; when a second project is opened before the first is read, only the second is applied.
 * @param file the file, or its text
 * @param fileName shown in messages (untrusted text)
 * @returns true when loaded
 */
export async function projectImport(file: File | Blob | string, fileName: string): Promise<boolean> {
  const serial = ++openSerial;
  let r: ProjectFileOutcome;
  try {
    r = await reader(file, fileName);
  } catch (err) {
    if (serial !== openSerial) return false;
    const text = (err as Error).message.trim();
    messagePost(
      'error',
      `Could not open ${fileName}: ${/[.!?]$/.test(text) ? text.slice(0, -1) : text}. The current session is unchanged.`,
    );
    return false;
  }
  if (serial !== openSerial) return false;
  if (!r.ok) return projectApply(r, fileName);
  // Applied in two tasks: the trace, model and view first, the assignments and fit in the next task
  // (with 5,000 assignments, one update rendering both was a main-thread task over 100 ms).
  const { session } = r;
  const before = benchStore.getState();
  const deferred = { assignments: session.assignments, fit: session.fit, nextAssignmentNumber: session.nextAssignmentNumber };
  // The undo history stays as it was until the second task records the whole opening as one step.
  const { past: _past, future: _future, ...first } = stateFromSession({ ...session, assignments: [], fit: undefined });
  benchStore.setState(first);
  await new Promise((resolve) => setTimeout(resolve, 0));
  // Another project (or file) replaced this one meanwhile: leave it.
  if (serial !== openSerial || benchStore.getState().trace !== first.trace || benchStore.getState().model !== first.model) return false;
  return projectApply({ ...r, session: { ...session, ...deferred } }, fileName, before);
}
