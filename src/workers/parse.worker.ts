/**
 * Worker entry for trace import: unpacks a request, calls `importTrace`, posts progress and the outcome
 * back (transferring the trace buffers). All parsing logic lives in src/io.
 */
import { importTrace } from '../io/traceImport';
import { TRACE_IMPORT_DEFAULTS } from '../io/traceImportOptions';
import {
  PARSE_PROGRESS_STEP,
  parseOutcomeTransferables,
  type ParseWorkerRequest,
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
  if (!request || request.type !== 'parse') return;
  const { id, fileName } = request;
  try {
    let text: string;
    if (typeof request.text === 'string') text = request.text;
    else {
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
      text = await request.text.text();
    }
    let sent = -1;
    const outcome = importTrace(text, fileName, request.options, (fraction) => {
      if (fraction - sent >= PARSE_PROGRESS_STEP || (fraction === 1 && sent < 1)) {
        sent = fraction;
        scope.postMessage({ type: 'progress', id, fraction }, []);
      }
    });
    scope.postMessage({ type: 'result', id, outcome }, parseOutcomeTransferables(outcome));
  } catch (err) {
    const message = `parse worker: ${fileName}: ${err instanceof Error ? err.message : String(err)}`;
    scope.postMessage({ type: 'error', id, message }, []);
  }
}
