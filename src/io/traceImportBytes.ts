/**
 * Trace import from the bytes of a file: decode (`textDecode`), then `importTrace`. The parse worker
 * (a chosen or dropped file) and the command line both read traces this way.
 */
import type { TraceImportOutcome } from './trace';
import { importTrace } from './traceImport';
import type { TraceImportOptions } from './traceImportOptions';
import { inputExcerpt } from './inputLimits';
import { textDecode, textDecodeHow, textDecodeNote } from './textDecode';
import { traceIssueText } from './traceImportWarnings';
import type { TraceImportIssue } from './trace';

/**
 * Decode a trace file's bytes and import it. Like `importTrace`, never throws for bad content.
 * A text that is not UTF-8 gets a note saying how it was read ("the bytes were read as UTF-16 LE (its
 * byte-order mark)"); invalid bytes of a file that still reads become a warning (`issues`, kind
 * 'undecodable'); a refusal of a file whose bytes were not clean text says how the bytes were read.
 * @param bytes the whole file
 * @param fileName shown in messages
 * @param options see `TraceImportOptions`
 * @param onProgress fractions 0..1 of the import
 * @returns as `importTrace`, with `report.encoding` set
 * Source: The Unicode Standard 15.0, §23.8 (byte order mark), for the decoding.
 */
export function importTraceBytes(
  bytes: Uint8Array,
  fileName: string,
  options?: Partial<TraceImportOptions>,
  onProgress?: (fraction: number) => void,
): TraceImportOutcome {
  const name = typeof fileName === 'string' && fileName !== '' ? inputExcerpt(fileName, 1000) : '(unnamed)';
  const decoded = textDecode(bytes);
  if (!decoded.ok) return { ok: false, error: { message: `${name}: ${decoded.message}`, field: 'encoding' } };
  const outcome = importTrace(decoded.text, fileName, options, onProgress);
  const note = textDecodeNote(decoded);
  if (!outcome.ok) {
    // An empty file has nothing to say about its encoding.
    if (!note || /: the file is empty$/.test(outcome.error.message)) return outcome;
    return { ok: false, error: { ...outcome.error, message: `${outcome.error.message}; ${note}` } };
  }
  const messages = [...outcome.report.messages];
  const issues = [...(outcome.report.issues ?? [])];
  if (decoded.encoding !== 'UTF-8') messages.unshift(textDecodeHow(decoded));
  if (decoded.invalidCount > 0) {
    const issue: TraceImportIssue = {
      kind: 'undecodable',
      encoding: decoded.encoding,
      count: decoded.invalidCount,
      firstByte: decoded.firstInvalidByte,
    };
    issues.unshift(issue);
    messages.push(traceIssueText(issue));
  }
  const report = { ...outcome.report, encoding: decoded.encoding, messages, issues };
  return { ok: true, trace: outcome.trace, report };
}
