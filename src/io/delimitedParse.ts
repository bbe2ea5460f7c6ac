/**
 * General reader for delimited trace text (comma, tab, semicolon or blank-separated, with or without a
 * header, comment and preamble lines, decimal points or commas, extra columns), through papaparse.
 * Returns raw columns in file units with the 1-based line of every point; unit and ordinate handling
 * happen later in `traceAssemble`.
 */
import Papa from 'papaparse';
import type { TraceDecimal, TraceDelimiter } from './trace';
import { TraceColumnBuilder } from './traceColumns';
import { TraceSkipLog } from './traceSkipLog';
import {
  DelimitedFieldKind,
  delimitedFieldClean,
  delimitedFieldKind,
  delimitedFieldValue,
  delimitedIsCommentAt,
  delimitedNewline,
} from './delimitedField';
import { delimitedSniff, delimitedSplitLine } from './delimitedSniff';

/** Options of `delimitedParse` (already validated by `traceImportOptionsResolve`). */
export interface DelimitedParseOptions {
  /** 0-based ordinate column. @default 1 */
  yColumn: number;
  /** @default 'auto' */
  delimiter: TraceDelimiter | 'auto';
  /** @default 'auto' */
  decimal: TraceDecimal | 'auto';
  /** Most data rows accepted. @default 5e7 */
  maxPoints: number;
  /** Fraction 0..1 of the text read. */
  onProgress?: (fraction: number) => void;
}

/** Raw columns of a delimited file. */
export interface DelimitedColumns {
  /** Column 0, file units. */
  x: Float64Array;
  /** Column `yColumn`, file units. */
  y: Float64Array;
  /** 1-based line of every point. */
  lines: Int32Array;
  delimiter: TraceDelimiter;
  decimal: TraceDecimal;
  /** Most common number of fields in the first data rows. */
  columns: number;
  /** Fields of the header line (the last non-comment line before the data), when it has ≥ 2 fields. */
  columnNames?: string[];
  /** Rows inside the data that could not be read (comment and blank lines are not counted). */
  skipped: TraceSkipLog;
}

/** A refusal with the line at fault. */
export interface DelimitedParseError {
  message: string;
  line?: number;
  field?: string;
}

/**
 * Read a delimited trace file into raw columns.
 * @param text file text (never modified)
 * @param options see `DelimitedParseOptions`
 * @returns columns, or an error naming what is wrong (without the file name; the caller prefixes it)
 */
export function delimitedParse(
  text: string,
  options: DelimitedParseOptions,
): { ok: true; columns: DelimitedColumns } | { ok: false; error: DelimitedParseError } {
  const { yColumn, maxPoints, onProgress } = options;
  const forcedDelimiter = options.delimiter === 'auto' ? undefined : options.delimiter;
  const sniff = delimitedSniff(text, 0, forcedDelimiter, options.decimal === ',');
  if (!sniff) {
    const hint = forcedDelimiter ? ` with delimiter ${JSON.stringify(forcedDelimiter)}` : '';
    return { ok: false, error: { message: `no numeric data rows found${hint}` } };
  }
  const delimiter = sniff.delimiter;

  const allowComma = options.decimal !== '.';
  const allowPoint = options.decimal !== ',';
  const isNumber = (k: DelimitedFieldKind) =>
    k === DelimitedFieldKind.Integer ||
    k === DelimitedFieldKind.NonFinite ||
    (k === DelimitedFieldKind.DecimalPoint && allowPoint) ||
    (k === DelimitedFieldKind.DecimalComma && allowComma);

  const out = new TraceColumnBuilder(Math.min(maxPoints, text.length / 8));
  const skipped = new TraceSkipLog();
  let preamble: string[] | undefined;
  let hasData = false;
  let missingColumnRows = 0;
  let maxFieldsSeen = 0;
  let firstCommaLine = 0;
  let firstPointLine = 0;
  let tooMany = 0;
  let unclosedQuoteLine = 0;

  /** Handle one row; returns false to stop reading. */
  const onRow = (fields: string[], rowStart: number, line: number): boolean => {
    if (fields.length === 1 && fields[0].trim() === '') return true;
    if (delimitedIsCommentAt(text, rowStart)) return true;
    const f0 = delimitedFieldClean(fields[0]);
    const k0 = delimitedFieldKind(f0);
    const hasY = fields.length > yColumn;
    const fy = hasY ? delimitedFieldClean(fields[yColumn]) : '';
    const ky = hasY ? delimitedFieldKind(fy) : DelimitedFieldKind.NonNumeric;
    if (isNumber(k0) && hasY && isNumber(ky)) {
      if (out.length >= maxPoints) {
        tooMany = line;
        return false;
      }
      hasData = true;
      if (k0 === DelimitedFieldKind.DecimalComma || ky === DelimitedFieldKind.DecimalComma) firstCommaLine ||= line;
      if (k0 === DelimitedFieldKind.DecimalPoint || ky === DelimitedFieldKind.DecimalPoint) firstPointLine ||= line;
      out.push(delimitedFieldValue(f0, k0), delimitedFieldValue(fy, ky), line);
      return true;
    }
    if (isNumber(k0) && !hasY) {
      missingColumnRows++;
      if (fields.length > maxFieldsSeen) maxFieldsSeen = fields.length;
    }
    if (!hasData) preamble = fields;
    else if (isNumber(k0) && !hasY) skipped.add(line, 'missing column');
    else skipped.add(line, 'non-numeric', isNumber(k0) ? fy : f0);
    return true;
  };

  // Line ends: LF, CRLF, or lone CR (old Mac files).
  // Rows are split at LF (or at CR for CR-only files); a CR left before the LF is trimmed with the field,
  // so files mixing CRLF and LF line ends read correctly.
  const nlChar = delimitedNewline(text) === '\r' ? '\r' : '\n';
  const progressStep = Math.max(1, Math.floor(text.length / 50));
  let nextProgress = progressStep;

  if (delimiter === 'whitespace') {
    // papaparse has no "run of blanks" delimiter, so blank-separated files are split here, line by line.
    let pos = 0;
    for (let line = 1; pos <= text.length; line++) {
      let eol = text.indexOf(nlChar, pos);
      if (eol < 0) eol = text.length;
      if (!onRow(delimitedSplitLine(text.slice(pos, eol), 'whitespace'), pos, line)) break;
      pos = eol + 1;
      if (onProgress && pos >= nextProgress) {
        onProgress(Math.min(1, pos / text.length));
        nextProgress = pos + progressStep;
      }
    }
  } else {
    let rowStart = 0;
    let line = 1;
    Papa.parse<string[]>(text, {
      delimiter,
      newline: nlChar,
      header: false,
      skipEmptyLines: false,
      step: (results, parser) => {
        // papaparse reads an unclosed quote to the end of the text: every later row would vanish into one field.
        if (results.errors.some((e) => e.code === 'MissingQuotes')) {
          unclosedQuoteLine = line;
          parser.abort();
          return;
        }
        if (!onRow(results.data, rowStart, line)) {
          parser.abort();
          return;
        }
        const next = results.meta.cursor;
        // Usually one line end per row; a quoted field may hold more.
        for (let p = text.indexOf(nlChar, rowStart); p >= 0 && p < next; p = text.indexOf(nlChar, p + 1)) line++;
        rowStart = next;
        if (onProgress && next >= nextProgress) {
          onProgress(Math.min(1, next / text.length));
          nextProgress = next + progressStep;
        }
      },
    });
  }

  if (unclosedQuoteLine)
    return {
      ok: false,
      error: {
        message: `line ${unclosedQuoteLine}: a double quote opened on this line is never closed, so the rest of the file would read as one field`,
        line: unclosedQuoteLine,
      },
    };
  if (tooMany)
    return {
      ok: false,
      error: { message: `more than ${maxPoints} data rows (limit maxPoints), at line ${tooMany}`, line: tooMany, field: 'maxPoints' },
    };
  if (!hasData) {
    if (missingColumnRows > 0)
      return {
        ok: false,
        error: {
          message: `column ${yColumn + 1} (yColumn = ${yColumn}) not found: the numeric rows have at most ${maxFieldsSeen} column${maxFieldsSeen === 1 ? '' : 's'}`,
          field: 'yColumn',
        },
      };
    return { ok: false, error: { message: 'no numeric data rows found' } };
  }
  if (options.decimal === 'auto' && firstCommaLine && firstPointLine) {
    const [a, b] = firstCommaLine < firstPointLine ? [firstCommaLine, firstPointLine] : [firstPointLine, firstCommaLine];
    const sepA = a === firstCommaLine ? 'a decimal comma' : 'a decimal point';
    const sepB = a === firstCommaLine ? 'a decimal point' : 'a decimal comma';
    return {
      ok: false,
      error: {
        message: `mixed decimal separators: line ${a} uses ${sepA} and line ${b} uses ${sepB}; set the decimal option to ',' or '.' to choose`,
        line: b,
        field: 'decimal',
      },
    };
  }
  const decimal: TraceDecimal = options.decimal === ',' || (options.decimal === 'auto' && firstCommaLine) ? ',' : '.';
  const cols = out.finish();
  const columnNames = preamble && preamble.length >= 2 ? preamble.map(delimitedFieldClean) : undefined;
  return { ok: true, columns: { ...cols, delimiter, decimal, columns: sniff.columns, columnNames, skipped } };
}
