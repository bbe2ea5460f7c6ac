/**
 * Worker entry for trace import and project files: unpacks a request, calls `importTrace`,
 * `projectFileParse` or `projectFileSerialize`, posts progress and the outcome back (transferring the
 * trace buffers). All parsing logic lives in src/io.
 */
import { createStore, delMany, getMany, setMany, type UseStore } from 'idb-keyval';
import { INPUT_LIMITS } from '../io/inputLimits';
import { projectFileParse, projectFileSerialize } from '../io/projectFile';
import { textDecode } from '../io/textDecode';
import { importTrace } from '../io/traceImport';
import { importTraceBytes } from '../io/traceImportBytes';
import { TRACE_IMPORT_DEFAULTS } from '../io/traceImportOptions';
import {
  PARSE_PROGRESS_STEP,
  parseOutcomeTransferables,
  projectOutcomeTransferables,
  storeValuesTransferables,
  type ParseWorkerRequest,
  type StoreName,
  type StoreRequestMessage,
  type ParseWorkerResponse,
} from './parseProtocol';

/** The part of the dedicated-worker global scope used here (the main tsconfig has no WebWorker lib). */
interface ParseWorkerScope {
  postMessage(message: ParseWorkerResponse, transfer: Transferable[]): void;
  onmessage: ((event: MessageEvent<ParseWorkerRequest>) => void) | null;
}

const scope = self as unknown as ParseWorkerScope;

scope.onmessage = (event) => {
  void handle(event.data);
};

async function handle(request: ParseWorkerRequest): Promise<void> {
  if (request?.type === 'project-read') return projectRead(request);
  if (request?.type === 'project-write') return projectWrite(request);
  if (request?.type === 'store-get' || request?.type === 'store-set' || request?.type === 'store-del') return storeRun(request);
  if (!request || request.type !== 'parse') return;
  const { id, fileName } = request;
  try {
    // A file is read as bytes and decoded by importTraceBytes (byte-order marks, UTF-16), as the CLI does.
    let bytes: Uint8Array | undefined;
    if (typeof request.text !== 'string') {
      const maxChars = request.options?.maxChars ?? TRACE_IMPORT_DEFAULTS.maxChars;
      // Checked before reading: a file this large would not fit in one string anyway.
      if (request.text.size > maxChars) {
        scope.postMessage(
          {
            type: 'result',
            id,
            outcome: {
              ok: false,
              error: {
                message: `${fileName}: the file is ${request.text.size} bytes, above the limit of ${maxChars} characters (maxChars)`,
                field: 'maxChars',
              },
            },
          },
          [],
        );
        return;
      }
      bytes = new Uint8Array(await request.text.arrayBuffer());
    }
    let sent = -1;
    const onProgress = (fraction: number) => {
      if (fraction - sent >= PARSE_PROGRESS_STEP || (fraction === 1 && sent < 1)) {
        sent = fraction;
        scope.postMessage({ type: 'progress', id, fraction }, []);
      }
    };
    const outcome = bytes
      ? importTraceBytes(bytes, fileName, request.options, onProgress)
      : importTrace(request.text as string, fileName, request.options, onProgress);
    scope.postMessage({ type: 'result', id, outcome }, parseOutcomeTransferables(outcome));
  } catch (err) {
    const message = `parse worker: ${fileName}: ${err instanceof Error ? err.message : String(err)}`;
    scope.postMessage({ type: 'error', id, message }, []);
  }
}

async function projectRead(request: Extract<ParseWorkerRequest, { type: 'project-read' }>): Promise<void> {
  const { id, fileName } = request;
  try {
    let text: string;
    if (typeof request.text === 'string') text = request.text;
    else {
      // A UTF-8 file has at least one byte per character: one within the limit in bytes is within it in characters.
      if (request.text.size > INPUT_LIMITS.maxTextChars) {
        const message = `project file: the file is ${request.text.size} bytes, above the limit of ${INPUT_LIMITS.maxTextChars} characters (maxTextChars)`;
        scope.postMessage({ type: 'project-read-result', id, outcome: { ok: false, message } }, []);
        return;
      }
      // Decoded like a trace (a project re-saved as UTF-16 still opens).
      const decoded = textDecode(new Uint8Array(await request.text.arrayBuffer()));
      if (!decoded.ok) {
        scope.postMessage({ type: 'project-read-result', id, outcome: { ok: false, message: `project file: ${decoded.message}` } }, []);
        return;
      }
      text = decoded.text;
    }
    const outcome = projectFileParse(text, request.parts);
    scope.postMessage({ type: 'project-read-result', id, outcome }, projectOutcomeTransferables(outcome));
  } catch (err) {
    scope.postMessage({ type: 'error', id, message: `parse worker: ${fileName}: ${err instanceof Error ? err.message : String(err)}` }, []);
  }
}

function projectWrite(request: Extract<ParseWorkerRequest, { type: 'project-write' }>): void {
  const { id } = request;
  try {
    const text = projectFileSerialize(request.session, request.header);
    scope.postMessage({ type: 'project-write-result', id, text }, []);
  } catch (err) {
    scope.postMessage(
      { type: 'error', id, message: `parse worker: writing the project: ${err instanceof Error ? err.message : String(err)}` },
      [],
    );
  }
}

const stores = new Map<string, UseStore>();
function storeOf(name: StoreName): UseStore {
  const key = `${name.db}\u0000${name.store}`;
  let s = stores.get(key);
  if (!s) {
    s = createStore(name.db, name.store);
    stores.set(key, s);
  }
  return s;
}

async function storeRun(request: StoreRequestMessage): Promise<void> {
  const { id } = request;
  try {
    const store = storeOf(request.name);
    if (request.type === 'store-get') {
      const values = await getMany(request.keys, store);
      scope.postMessage({ type: 'store-values', id, values }, storeValuesTransferables(values));
      return;
    }
    if (request.type === 'store-set') await setMany(request.entries, store);
    else await delMany(request.keys, store);
    scope.postMessage({ type: 'store-done', id }, []);
  } catch (err) {
    scope.postMessage({ type: 'error', id, message: `storage worker: ${err instanceof Error ? err.message : String(err)}` }, []);
  }
}
