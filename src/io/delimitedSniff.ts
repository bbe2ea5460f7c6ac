/**
 * Guessing the field delimiter of a delimited trace file from its first data-looking lines.
 */
import Papa from 'papaparse';
import type { TraceDelimiter } from './trace';
import { DelimitedFieldKind, delimitedFieldClean, delimitedFieldKind, delimitedIsCommentAt, delimitedNewline } from './delimitedField';

/** Delimiter chosen by `delimitedSniff` and what the sample looked like. */
export interface DelimitedSniffResult {
  delimiter: TraceDelimiter;
  /** Most common number of fields among the sampled data lines. */
  columns: number;
  /** Sampled lines that split into ≥ 2 numeric leading fields with this delimiter. */
  matchingLines: number;
  /** Sampled data-looking lines (starting with a digit, sign or point). */
  sampledLines: number;
}

/** Candidates in order of preference when they fit the sample equally well. */
const CANDIDATES: TraceDelimiter[] = [';', '\t', ',', 'whitespace'];
const MAX_SAMPLE = 60;
const MAX_SCAN_LINES = 5000;

/**
 * Split one line with a delimiter, honouring double quotes for the single-character delimiters.
 * @param line one line without its line end
 */
export function delimitedSplitLine(line: string, delimiter: TraceDelimiter): string[] {
  if (delimiter === 'whitespace') {
    const t = line.trim();
    return t.length === 0 ? [''] : t.split(/[ \t]+/);
  }
  if (line.indexOf('"') < 0) return line.split(delimiter);
  const rows = Papa.parse<string[]>(line, { delimiter, newline: '\n', header: false }).data;
  return rows[0] ?? [''];
}

/**
 * Pick the delimiter under which most sampled data lines split into at least two numeric leading fields.
 * @param text file text (never modified)
 * @param start offset where scanning starts
 * @param forced a delimiter given by the user, tested alone
 * @param isDecimalComma true when the user said the decimals are commas (',' is then not a candidate)
 * @returns the choice, or null when no sampled line splits into two numbers under any candidate
 */
export function delimitedSniff(text: string, start: number, forced?: TraceDelimiter, isDecimalComma = false): DelimitedSniffResult | null {
  const sample: string[] = [];
  const nl = delimitedNewline(text) === '\r' ? '\r' : '\n';
  let pos = start;
  for (let scanned = 0; pos < text.length && scanned < MAX_SCAN_LINES && sample.length < MAX_SAMPLE; scanned++) {
    let eol = text.indexOf(nl, pos);
    if (eol < 0) eol = text.length;
    if (!delimitedIsCommentAt(text, pos)) {
      const line = text.slice(pos, eol).replace(/\r$/, '');
      const first = line.trimStart().charCodeAt(0);
      // digit, '+', '-', '.', or a quote that may open a quoted number
      if ((first >= 48 && first <= 57) || first === 43 || first === 45 || first === 46 || first === 34) sample.push(line);
    }
    pos = eol + 1;
  }
  if (sample.length === 0) return null;

  let best: DelimitedSniffResult | null = null;
  for (const d of forced ? [forced] : CANDIDATES.filter((c) => !(isDecimalComma && c === ','))) {
    let matching = 0;
    const counts = new Map<number, number>();
    for (const line of sample) {
      const fields = delimitedSplitLine(line, d);
      if (fields.length < 2) continue;
      const k0 = delimitedFieldKind(delimitedFieldClean(fields[0]));
      const k1 = delimitedFieldKind(delimitedFieldClean(fields[1]));
      if (k0 === DelimitedFieldKind.NonNumeric || k1 === DelimitedFieldKind.NonNumeric) continue;
      matching++;
      counts.set(fields.length, (counts.get(fields.length) ?? 0) + 1);
    }
    if (matching === 0) continue;
    let columns = 2;
    let top = -1;
    for (const [c, k] of counts) if (k > top || (k === top && c < columns)) [columns, top] = [c, k];
    if (!best || matching > best.matchingLines) best = { delimiter: d, columns, matchingLines: matching, sampledLines: sample.length };
  }
  return best;
}
