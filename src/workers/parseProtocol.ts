/**
 * Messages between the UI thread and the parse worker (`parse.worker.ts`): trace import, project
 * files read and written. Plain serialisable data; the Float64Array buffers of a result are
 * transferred, not copied.
 */
import type { ProjectFileHeader, ProjectFileOutcome, ProjectPartName, ProjectSession } from '../io/projectFile';
import type { TraceImportOutcome } from '../io/trace';
import type { TraceImportOptions } from '../io/traceImportOptions';

/** UI → worker: parse this text (or file, read inside the worker so a big file never blocks the UI). */
export interface ParseRequestMessage {
  type: 'parse';
  id: number;
  text: string | Blob;
  fileName: string;
  options: Partial<TraceImportOptions>;
}

/** Worker → UI: fraction 0..1 of the import done. */
export interface ParseProgressMessage {
  type: 'progress';
  id: number;
  fraction: number;
}

/** Worker → UI: the import outcome (a refusal of bad content is a result too, with `ok: false`). */
export interface ParseResultMessage {
  type: 'result';
  id: number;
  outcome: TraceImportOutcome;
}

/** Worker → UI: the worker itself failed (file unreadable, internal error). */
export interface ParseErrorMessage {
  type: 'error';
  id: number;
  message: string;
}

/** UI → worker: read this project file (or file, read inside the worker) with `projectFileParse`. */
export interface ProjectReadRequestMessage {
  type: 'project-read';
  id: number;
  text: string | Blob;
  fileName: string;
  /** Session fields saved apart from the text (the autosave's layout), see `projectFileParse`. */
  parts: Partial<Record<ProjectPartName, string>>;
}

/** Worker → UI: what `projectFileParse` returned (the trace buffers transferred). */
export interface ProjectReadResultMessage {
  type: 'project-read-result';
  id: number;
  outcome: ProjectFileOutcome;
}

/** UI → worker: write this session as project-file text with `projectFileSerialize`. */
export interface ProjectWriteRequestMessage {
  type: 'project-write';
  id: number;
  session: ProjectSession;
  header: ProjectFileHeader;
}

/** Worker → UI: the project-file text. */
export interface ProjectWriteResultMessage {
  type: 'project-write-result';
  id: number;
  text: string;
}

/** An IndexedDB database and object store (as idb-keyval's createStore takes them). */
export interface StoreName {
  db: string;
  store: string;
}

/**
 * UI → worker: key-value storage done in the worker, so that IndexedDB's serialisation of a large
 * trace (hundreds of ms for 16 MB in Chromium) does not block the page. 'store-set' writes all
 * entries in one transaction.
 */
export type StoreRequestMessage =
  | { type: 'store-get'; id: number; name: StoreName; keys: string[] }
  | { type: 'store-set'; id: number; name: StoreName; entries: [string, unknown][] }
  | { type: 'store-del'; id: number; name: StoreName; keys: string[] };

/** Worker → UI: the values read (typed arrays transferred), or that a write or delete is done. */
export type StoreResultMessage = { type: 'store-values'; id: number; values: unknown[] } | { type: 'store-done'; id: number };

/** Every message the worker accepts. */
export type ParseWorkerRequest = ParseRequestMessage | ProjectReadRequestMessage | ProjectWriteRequestMessage | StoreRequestMessage;
/** Every message the worker sends. */
export type ParseWorkerResponse =
  ParseProgressMessage | ParseResultMessage | ParseErrorMessage | ProjectReadResultMessage | ProjectWriteResultMessage | StoreResultMessage;

/**
 * Buffers of stored values that can be transferred: those of typed arrays that are a value or a
 * property of one (the trace record is { wavenumberCm1, absorbance }).
 */
export function storeValuesTransferables(values: unknown[]): ArrayBuffer[] {
  const found = new Set<ArrayBuffer>();
  const take = (v: unknown) => {
    if (ArrayBuffer.isView(v) && v.buffer instanceof ArrayBuffer) found.add(v.buffer);
  };
  for (const v of values) {
    take(v);
    if (v && typeof v === 'object' && !ArrayBuffer.isView(v)) for (const p of Object.values(v)) take(p);
  }
  return [...found];
}

/**
 * Buffers of an outcome that can be transferred to the receiving thread (the trace columns).
 * @param outcome an import outcome
 * @returns the distinct ArrayBuffers of `trace.wavenumberCm1` and `trace.absorbance` (empty for a refusal)
 */
export function parseOutcomeTransferables(outcome: TraceImportOutcome): ArrayBuffer[] {
  if (!outcome.ok) return [];
  const buffers = [outcome.trace.wavenumberCm1.buffer, outcome.trace.absorbance.buffer];
  return [...new Set(buffers)].filter((b): b is ArrayBuffer => b instanceof ArrayBuffer);
}

/**
 * Buffers of a project read that can be transferred (the session's trace columns).
 * @param outcome what `projectFileParse` returned
 * @returns the distinct ArrayBuffers of the trace (empty when there is none)
 */
export function projectOutcomeTransferables(outcome: ProjectFileOutcome): ArrayBuffer[] {
  const trace = outcome.ok ? outcome.session.trace : null;
  if (!trace) return [];
  const buffers = [trace.wavenumberCm1.buffer, trace.absorbance.buffer];
  return [...new Set(buffers)].filter((b): b is ArrayBuffer => b instanceof ArrayBuffer);
}

/** Smallest progress step (fraction) worth a message; keeps the message rate low on big files. */
export const PARSE_PROGRESS_STEP = 0.01;
