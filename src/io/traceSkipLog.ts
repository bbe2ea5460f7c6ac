/**
 * Book-keeping of rows or points left out during a trace import, by 1-based line number and reason,
 * and the plain-language summary shown to the user.
 */

/** Why a row or point was left out. */
export type TraceSkipReason =
  'non-numeric' | 'missing column' | 'NaN/Infinity' | "invalid value '?'" | 'duplicate x' | 'non-positive wavelength';

/** Most line numbers kept in a report; the count stays exact beyond it. */
export const TRACE_SKIP_LINES_KEPT = 100_000;

/** Rows or points skipped, with their line numbers (kept up to `TRACE_SKIP_LINES_KEPT`). */
export class TraceSkipLog {
  count = 0;
  readonly lines: number[] = [];
  readonly byReason = new Map<TraceSkipReason, number>();
  /** Line numbers by reason (together at most `TRACE_SKIP_LINES_KEPT`), in the order recorded. */
  readonly linesByReason = new Map<TraceSkipReason, number[]>();

  /** The first offending text recorded for each reason, with its line. */
  readonly firstText = new Map<TraceSkipReason, { line: number; text: string }>();

  /**
   * Record one skipped row/point found at 1-based `line`.
   * @param text the offending field, shown (cut to 40 characters) for the first skip of a reason
   */
  add(line: number, reason: TraceSkipReason, text?: string): void {
    this.count++;
    if (text !== undefined && !this.firstText.has(reason)) this.firstText.set(reason, { line, text });
    if (this.lines.length < TRACE_SKIP_LINES_KEPT) {
      this.lines.push(line);
      const list = this.linesByReason.get(reason);
      if (list) list.push(line);
      else this.linesByReason.set(reason, [line]);
    }
    this.byReason.set(reason, (this.byReason.get(reason) ?? 0) + 1);
  }

  /** Line numbers ascending, without repeats (several JCAMP points can share a line). */
  sortedLines(): number[] {
    return sortedUnique(this.lines);
  }

  /**
   * The skips by reason, in the order the reasons first occurred: count, the first `kept` line numbers
   * (ascending, without repeats) and how many distinct lines the reason stands for.
   * @param kept most line numbers kept per reason
   */
  kinds(kept = TRACE_SKIP_LINES_REPORTED): TraceSkipKind[] {
    return [...this.byReason.entries()].map(([reason, count]) => {
      const recorded = this.linesByReason.get(reason) ?? [];
      const lines = sortedUnique(recorded);
      // Skips past the cap have unknown lines: count each as a line of its own.
      const lineCount = lines.length + (count - recorded.length);
      const first = this.firstText.get(reason);
      return { reason, count, lines: lines.slice(0, kept), lineCount, ...(first ? { firstText: first } : {}) };
    });
  }
}

/** Line numbers kept per reason in an import report (the messages show the first ten). */
export const TRACE_SKIP_LINES_REPORTED = 20;

/** Rows or points skipped for one reason. */
export interface TraceSkipKind {
  reason: TraceSkipReason;
  /** Rows (delimited text) or points (JCAMP-DX) skipped for this reason. */
  count: number;
  /** First 1-based line numbers, ascending, without repeats (at most TRACE_SKIP_LINES_REPORTED). */
  lines: number[];
  /** Distinct lines the skips sit on (≥ lines.length; several JCAMP points may share a line). */
  lineCount: number;
  /** The first offending text and its line, when the reader recorded one (untrusted text, not cut). */
  firstText?: { line: number; text: string };
}

function sortedUnique(lines: readonly number[]): number[] {
  const s = Float64Array.from(lines).sort();
  const out: number[] = [];
  for (let i = 0; i < s.length; i++) if (i === 0 || s[i] !== s[i - 1]) out.push(s[i]);
  return out;
}

/**
 * "line 5" / "lines 5, 9, 12" / "lines 1, 2, ..., 10 and 7 more", for messages.
 * @param lines ascending 1-based line numbers
 * @param total number of lines the list stands for (may exceed lines.length when the list was capped)
 * @param cap most numbers written out
 */
export function traceLineList(lines: readonly number[], total = lines.length, cap = 10): string {
  if (total === 1 && lines.length === 1) return `line ${lines[0]}`;
  const shown = lines.slice(0, cap).join(', ');
  const more = total - Math.min(cap, lines.length);
  return `lines ${shown}${more > 0 ? ` and ${more} more` : ''}`;
}

/**
 * Summary message, e.g. "3 rows skipped: lines 5, 9, 12 (non-numeric: 2, NaN/Infinity: 1)".
 * @param noun 'row' for delimited text, 'point' for JCAMP-DX tables (several points per line)
 * @returns undefined when nothing was skipped
 */
export function traceSkipMessage(log: TraceSkipLog, noun: 'row' | 'point'): string | undefined {
  if (log.count === 0) return undefined;
  const lines = log.sortedLines();
  const reasons = [...log.byReason.entries()].map(([r, n]) => (log.byReason.size > 1 ? `${r}: ${n}` : r));
  const lineTotal = log.lines.length === log.count ? lines.length : lines.length + (log.count - log.lines.length);
  return `${log.count} ${noun}${log.count === 1 ? '' : 's'} skipped: ${traceLineList(lines, lineTotal)} (${reasons.join(', ')})`;
}
