/** Reading a trace file for a CLI command: bytes decoded as the page does, the importer's warnings on stderr. */
import type { Trace, TraceImportOutcome, TraceImportReport } from '../io/trace';
import { importTrace } from '../io/traceImport';
import { importTraceBytes } from '../io/traceImportBytes';
import { traceImportWarnings } from '../io/traceImportWarnings';
import { CliError, type CliIo } from './cliIo';

/**
 * Import a trace file: from its bytes (`importTraceBytes`: byte-order marks, UTF-16) when the io can
 * read bytes, else from its text. Never throws for bad content.
 * @param path file path, also the name in messages
 */
export function cliReadTrace(path: string, io: CliIo): TraceImportOutcome {
  return io.readBytes ? importTraceBytes(io.readBytes(path), path) : importTrace(io.readFile(path), path);
}

/**
 * Print the import's warnings on stderr, one line per kind of problem:
 * `warning: <file>: <text>` with the words of `traceImportWarnings` (the page shows the same words).
 */
export function cliPrintTraceWarnings(report: TraceImportReport, io: CliIo): void {
  for (const w of traceImportWarnings(report)) io.stderr(`warning: ${report.fileName}: ${w}\n`);
}

/**
 * Read a trace for a command that needs one: the importer's warnings on stderr, or a CliError naming
 * the file and the line at fault.
 */
export function cliLoadTrace(path: string, io: CliIo): Trace {
  const outcome = cliReadTrace(path, io);
  if (!outcome.ok) {
    const { message, line } = outcome.error;
    const named = message.includes(path) ? message : `${path}: ${message}`;
    throw new CliError(`${named}${line !== undefined && !new RegExp(`\\bline ${line}\\b`).test(message) ? ` (line ${line})` : ''}`);
  }
  cliPrintTraceWarnings(outcome.report, io);
  return outcome.trace;
}
