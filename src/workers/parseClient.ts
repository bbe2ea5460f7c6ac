/**
 * The only place that starts the trace-parse worker. One worker per import: aborting terminates it
 * without disturbing other imports, and the start-up cost (a few ms) is small next to reading a file.
 */
import type { TraceImportOutcome } from '../io/trace';
import type { TraceImportOptions } from '../io/traceImportOptions';
import type { ParseRequestMessage, ParseWorkerResponse } from './parseProtocol';

let nextId = 1;

function abortError(signal: AbortSignal): unknown {
  return signal.reason ?? new DOMException('trace import aborted', 'AbortError');
}

/**
 * Import a trace file in a worker thread (same result as `importTrace` from src/io/traceImport).
 * Bad content resolves with `{ ok: false, error }`; the promise rejects only when the worker fails or the
 * signal aborts (with the signal's reason, by default an AbortError DOMException).
 * @param file a File/Blob (read inside the worker) or the file text
 * @param fileName shown in messages
 * @param options overrides, see `TraceImportOptions`
 * @param onProgress called with fractions 0..1 (about every 1 %)
 * @param signal aborting terminates the worker
 */
export function parseTraceInWorker(
  file: File | Blob | string,
  fileName: string,
  options: Partial<TraceImportOptions> = {},
  onProgress?: (fraction: number) => void,
  signal?: AbortSignal,
): Promise<TraceImportOutcome> {
  if (signal?.aborted) return Promise.reject(abortError(signal));
  return new Promise<TraceImportOutcome>((resolve, reject) => {
    const id = nextId++;
    const worker = new Worker(new URL('./parse.worker.ts', import.meta.url), { type: 'module' });
    const finish = () => {
      worker.terminate();
      signal?.removeEventListener('abort', onAbort);
    };
    const onAbort = () => {
      finish();
      reject(abortError(signal as AbortSignal));
    };
    signal?.addEventListener('abort', onAbort, { once: true });
    worker.onmessage = (event: MessageEvent<ParseWorkerResponse>) => {
      const msg = event.data;
      if (!msg || msg.id !== id) return;
      if (msg.type === 'progress') onProgress?.(msg.fraction);
      else if (msg.type === 'result') {
        finish();
        resolve(msg.outcome);
      } else if (msg.type === 'error') {
        finish();
        reject(new Error(msg.message));
      }
    };
    worker.onerror = (event: ErrorEvent) => {
      finish();
      reject(new Error(`parse worker failed for ${fileName}: ${event.message || 'unknown error'}`));
    };
    worker.onmessageerror = () => {
      finish();
      reject(new Error(`parse worker: a message for ${fileName} could not be deserialised`));
    };
    const request: ParseRequestMessage = { type: 'parse', id, text: file, fileName, options };
    worker.postMessage(request);
  });
}
