/**
 * Messages between the UI thread and the trace-parse worker (`parse.worker.ts`).
 * Plain serialisable data; the Float64Array buffers of a result are transferred, not copied.
 */
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

/** Every message the worker accepts. */
export type ParseWorkerRequest = ParseRequestMessage;
/** Every message the worker sends. */
export type ParseWorkerResponse = ParseProgressMessage | ParseResultMessage | ParseErrorMessage;

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

/** Smallest progress step (fraction) worth a message; keeps the message rate low on big files. */
export const PARSE_PROGRESS_STEP = 0.01;
