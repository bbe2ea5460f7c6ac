/**
 * Column names given in a comment line above the data ("# wavenumber transmittance"), for files
 * that have no header row of their own.
 */
import type { TraceDelimiter } from './trace';
import { delimitedFieldClean, delimitedFieldKind, DelimitedFieldKind, delimitedIsCommentAt, delimitedNewline } from './delimitedField';
import { delimitedSplitLine } from './delimitedSniff';
import { unitsOrdinateFromLabel, unitsXFromLabel } from './unitsDetect';

/** A comment line read as the header. */
export interface TraceCommentHeader {
  /** 1-based line of the comment. */
  line: number;
  /** The comment's text without its marker ('#', '%', ';', '!' or '//'). */
  text: string;
  /** Its fields split by the data's delimiter, cleaned. */
  names: string[];
}

const COMMENT_MARK = /^\s*(?:\/\/|[#%;!])+\s*/;

/**
 * The comment line that names the columns, when a delimited file has no header row: the last comment
 * line before the first data row (blank lines between them allowed), taken only when it splits into at
 * least two fields none of which is a number, names an abscissa or ordinate quantity the header rules
 * know, and either splits into as many fields as the data has columns or names the abscissa unit (so
 * "# wavenumber (cm-1) transmittance" counts, while "# path 10 cm", "# invented band" or a sentence
 * such as "# transmission cell at room temperature" does not). Stricter than a header row because a
 * comment is more often a remark than column names.
 * @param text file text (never modified)
 * @param firstDataLine 1-based line of the first data row
 * @param delimiter the data's delimiter
 * @param columns number of fields in the data rows
 * @returns the header found, or undefined
 */
export function traceCommentHeader(
  text: string,
  firstDataLine: number,
  delimiter: TraceDelimiter,
  columns: number,
): TraceCommentHeader | undefined {
  const nl = delimitedNewline(text) === '\r' ? '\r' : '\n';
  let last: { line: number; pos: number; end: number } | undefined;
  let pos = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  for (let line = 1; line < firstDataLine && pos <= text.length; line++) {
    let eol = text.indexOf(nl, pos);
    if (eol < 0) eol = text.length;
    const isBlank = text.slice(pos, eol).trim() === '';
    if (!isBlank) last = delimitedIsCommentAt(text, pos) ? { line, pos, end: eol } : undefined;
    pos = eol + 1;
  }
  if (!last) return undefined;
  const body = text.slice(last.pos, last.end).replace(/\r$/, '').replace(COMMENT_MARK, '').trim();
  if (body === '') return undefined;
  const names = delimitedSplitLine(body, delimiter).map(delimitedFieldClean);
  if (names.length < 2 || names.some((s) => s === '' || delimitedFieldKind(s) !== DelimitedFieldKind.NonNumeric)) return undefined;
  const xUnit = unitsXFromLabel(body);
  if (xUnit === undefined && unitsOrdinateFromLabel(body) === undefined) return undefined;
  if (names.length !== columns && xUnit === undefined) return undefined;
  return { line: last.line, text: body, names };
}
