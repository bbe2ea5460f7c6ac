/**
 * The only place that starts the parse worker. One worker per parse job: aborting terminates it
 * without disturbing other jobs, and the start-up cost (a few ms) is small next to reading a file.
 * Storage requests (the autosave) share one long-lived worker instead: they are frequent and small.
 */
import type { ProjectFileHeader, ProjectFileOutcome, ProjectPartName, ProjectSession } from '../io/projectFile';
import type { TraceImportOutcome } from '../io/trace';
import type { TraceImportOptions } from '../io/traceImportOptions';
import type { ParseWorkerRequest, ParseWorkerResponse, StoreName, StoreRequestMessage, StoreResultMessage } from './parseProtocol';

let nextId = 1;

function abortError(signal: AbortSignal, what: string): unknown {
  return signal.reason ?? new DOMException(`${what} aborted`, 'AbortError');
}

/** A request without its id (given here). */
type RequestBody = ParseWorkerRequest extends infer R ? (R extends ParseWorkerRequest ? Omit<R, 'id'> : never) : never;

/**
 * Run one request in a new parse worker and resolve with what `pick` takes from its reply.
 * @param body the request
 * @param fileName for messages
 * @param what for the abort error ("trace import", "project read" …)
 * @param pick the value of a final reply, or undefined for a message that is not the reply
 */
function workerRun<T>(
  body: RequestBody,
  fileName: string,
  what: string,
  pick: (msg: ParseWorkerResponse) => T | undefined,
  onProgress?: (fraction: number) => void,
  signal?: AbortSignal,
  transfer: Transferable[] = [],
): Promise<T> {
  if (signal?.aborted) return Promise.reject(abortError(signal, what));
  return new Promise<T>((resolve, reject) => {
    const id = nextId++;
    const worker = new Worker(new URL('./parse.worker.ts', import.meta.url), { type: 'module' });
    const finish = () => {
      worker.terminate();
      signal?.removeEventListener('abort', onAbort);
    };
    const onAbort = () => {
      finish();
      reject(abortError(signal as AbortSignal, what));
    };
    signal?.addEventListener('abort', onAbort, { once: true });
    worker.onmessage = (event: MessageEvent<ParseWorkerResponse>) => {
      const msg = event.data;
      if (!msg || msg.id !== id) return;
      if (msg.type === 'progress') onProgress?.(msg.fraction);
      else if (msg.type === 'error') {
        finish();
        reject(new Error(msg.message));
      } else {
        const value = pick(msg);
        if (value === undefined) return;
        finish();
        resolve(value);
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
    worker.postMessage({ ...body, id } as ParseWorkerRequest, transfer);
  });
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
  return workerRun(
    { type: 'parse', text: file, fileName, options },
    fileName,
    'trace import',
    (msg) => (msg.type === 'result' ? msg.outcome : undefined),
    onProgress,
    signal,
  );
}

/**
 * Read a project file in a worker thread (same result as `projectFileParse` from src/io/projectFile;
 * the trace's buffers are transferred, not copied). A file that cannot be read resolves with
 * `{ ok: false, message }`; the promise rejects only when the worker fails or the signal aborts.
 * @param file a File/Blob (read inside the worker) or the file text
 * @param fileName shown in messages
 * @param parts session fields saved apart from the text (the autosave), see `projectFileParse`
 * @param signal aborting terminates the worker
 */
export function projectReadInWorker(
  file: File | Blob | string,
  fileName: string,
  parts: Partial<Record<ProjectPartName, string>> = {},
  signal?: AbortSignal,
): Promise<ProjectFileOutcome> {
  return workerRun(
    { type: 'project-read', text: file, fileName, parts },
    fileName,
    'project read',
    (msg) => (msg.type === 'project-read-result' ? msg.outcome : undefined),
    undefined,
    signal,
  );
}

/**
 * Write a session as project-file text in a worker thread (same text as `projectFileSerialize`).
 * The session is copied to the worker (the store keeps its trace), which costs far less than encoding
 * a large trace here.
 * @param session the whole session
 * @param header app version and time of saving
 */
export function projectWriteInWorker(session: ProjectSession, header: ProjectFileHeader): Promise<string> {
  return workerRun({ type: 'project-write', session, header }, 'the project', 'project write', (msg) =>
    msg.type === 'project-write-result' ? msg.text : undefined,
  );
}

// ---------------------------------------------------------------- storage (one long-lived worker)

let storeWorker: Worker | null = null;
const storePending = new Map<number, { resolve: (msg: StoreResultMessage) => void; reject: (err: Error) => void }>();

function storeWorkerGet(): Worker {
  if (storeWorker) return storeWorker;
  const worker = new Worker(new URL('./parse.worker.ts', import.meta.url), { type: 'module' });
  const fail = (message: string) => {
    if (storeWorker === worker) storeWorker = null;
    worker.terminate();
    const waiting = [...storePending.values()];
    storePending.clear();
    for (const p of waiting) p.reject(new Error(message));
  };
  worker.onmessage = (event: MessageEvent<ParseWorkerResponse>) => {
    const msg = event.data;
    const p = msg ? storePending.get(msg.id) : undefined;
    if (!p) return;
    storePending.delete(msg.id);
    if (msg.type === 'error') p.reject(new Error(msg.message));
    else if (msg.type === 'store-values' || msg.type === 'store-done') p.resolve(msg);
    else p.reject(new Error(`storage worker: unexpected reply '${msg.type}'`));
  };
  worker.onerror = (event: ErrorEvent) => fail(`storage worker failed: ${event.message || 'unknown error'}`);
  worker.onmessageerror = () => fail('storage worker: a message could not be deserialised');
  storeWorker = worker;
  return worker;
}

type StoreBody = StoreRequestMessage extends infer R ? (R extends StoreRequestMessage ? Omit<R, 'id'> : never) : never;

function storeRequest(body: StoreBody): Promise<StoreResultMessage> {
  return new Promise((resolve, reject) => {
    const id = nextId++;
    storePending.set(id, { resolve, reject });
    try {
      storeWorkerGet().postMessage({ ...body, id } as StoreRequestMessage);
    } catch (err) {
      // A value that cannot be cloned: nothing was sent.
      storePending.delete(id);
      reject(err instanceof Error ? err : new Error(String(err)));
    }
  });
}

/**
 * Read keys from an IndexedDB store in the worker (idb-keyval's getMany); typed arrays in the values
 * are transferred, so reading a large trace neither deserialises nor copies it on this thread.
 * @returns the values, undefined for a missing key
 */
export async function storeGetInWorker(name: StoreName, keys: string[]): Promise<unknown[]> {
  const msg = await storeRequest({ type: 'store-get', name, keys });
  return msg.type === 'store-values' ? msg.values : [];
}

/**
 * Write entries to an IndexedDB store in the worker, all in one transaction (idb-keyval's setMany).
 * The values are copied to the worker (structured clone), which costs far less here than IndexedDB's
 * own serialisation would.
 */
export async function storeSetInWorker(name: StoreName, entries: [string, unknown][]): Promise<void> {
  await storeRequest({ type: 'store-set', name, entries });
}

/** Delete keys from an IndexedDB store in the worker (idb-keyval's delMany). */
export async function storeDelInWorker(name: StoreName, keys: string[]): Promise<void> {
  await storeRequest({ type: 'store-del', name, keys });
}
