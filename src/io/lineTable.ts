/**
 * Line tables: the assigned-line CSV read by the fit and written back with calc and obs − calc.
 *
 * Read: header required; columns found by name (any order, case-insensitive):
 * J_up, K_up, J_lo, K_lo, wavenumber (cm^-1) required; uncertainty (cm^-1, default 0.001),
 * blended, excluded, flags, note, id, peak_id optional; other columns are kept as text.
 * Lines starting with '#' and blank lines are skipped. Numbers are decimal (no hex, no "Infinity").
 * Limits: INPUT_LIMITS.maxTextChars of text, maxLineTableRows rows, J and K up to maxQuantumJ.
 */
import Papa from 'papaparse';
import { ASSIGNMENT_DEFAULT_UNCERTAINTY_CM1, type Assignment } from '../fit/assignment';
import { lineLabelAscii } from '../physics/lineLabel';
import type { TopShape } from '../physics/model';
import { INPUT_LIMITS, inputExcerpt, inputLimitCheck } from './inputLimits';
import { traceLineList } from './traceSkipLog';

/** A parsed line table. */
export interface LineTable {
  /** One per data row, in file order. */
  assignments: Assignment[];
  /** 1-based line number in the file where each row starts (parallel to assignments). */
  lineNumbers: number[];
  /** Header names of the columns not interpreted (in file order). */
  extraColumns: string[];
  /** Their cells, one record per row (keys = extraColumns). */
  extras: Record<string, string>[];
  /** Non-fatal remarks, one per kind of problem, each naming the file and the lines. */
  warnings: string[];
}

/** Options of lineTableParse. */
export interface LineTableParseOptions {
  /** Named at the start of every error message. @default none */
  fileName?: string;
  /** Uncertainty of rows without one, cm^-1. @default 0.001 */
  defaultUncertaintyCm1?: number;
  /** Most data rows read; a longer table is refused. May only lower the shared limit. @default INPUT_LIMITS.maxLineTableRows (2e6) */
  maxRows?: number;
}

/** A line table that cannot be read; the message names the file, line and field. */
export class LineTableError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'LineTableError';
  }
}

const REQUIRED = ['J_up', 'K_up', 'J_lo', 'K_lo', 'wavenumber'] as const;
const OPTIONAL = ['uncertainty', 'blended', 'excluded', 'flags', 'note', 'id', 'peak_id'] as const;
type Known = (typeof REQUIRED)[number] | (typeof OPTIONAL)[number];

const TRUE_WORDS = new Set(['1', 'true', 'yes', 'y', 'x']);
const FALSE_WORDS = new Set(['', '0', 'false', 'no', 'n']);

function quoteCell(v: string): string {
  return `'${inputExcerpt(v, 40)}'`;
}

// Decimal notation only: Number() would also read '0x1F', '0b1', 'Infinity' and '' (as 0).
/** True when the line starting at `pos` begins, after blanks, with '#'. */
function isCommentAt(text: string, pos: number): boolean {
  let c = text.charCodeAt(pos);
  while (c === 32 || c === 9) c = text.charCodeAt(++pos);
  return c === 35;
}

const RE_DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * CRLF and lone CR line ends as LF, outside quoted fields only: a CR inside a quoted note is data and
 * must read back unchanged. ('""' inside quotes toggles twice, so counting quotes is enough.)
 */
function lineEndsNormalise(text: string): string {
  if (text.indexOf('\r') < 0) return text;
  let inQuotes = false;
  return text.replace(/"|\r\n?/g, (m) => {
    if (m === '"') {
      inQuotes = !inQuotes;
      return m;
    }
    return inQuotes ? m : '\n';
  });
}

/**
 * Parse an assigned-line CSV into Assignments.
 * @param text CSV text (UTF-8 string; CRLF or LF)
 * @returns assignments (wavenumber and uncertainty in cm^-1) with their file line numbers
 * @throws LineTableError such as "L.csv: line 7: J_up 'x' is not a whole number"
 */
export function lineTableParse(text: string, options: LineTableParseOptions = {}): LineTable {
  // The name is shown verbatim (HTML included: the page escapes it) but kept on one line.
  const prefix = options.fileName ? `${inputExcerpt(options.fileName, 1000)}: ` : '';
  const defaultSigma = options.defaultUncertaintyCm1 ?? ASSIGNMENT_DEFAULT_UNCERTAINTY_CM1;
  const maxRows = Math.min(options.maxRows ?? Infinity, INPUT_LIMITS.maxLineTableRows);
  const fail = (line: number, msg: string): never => {
    throw new LineTableError(`${prefix}line ${line}: ${msg}`);
  };
  if (typeof text !== 'string') throw new LineTableError(`${prefix}lineTableParse: text must be a string, got ${typeof text}`);
  const tooLong = inputLimitCheck('maxTextChars', text.length);
  if (tooLong) throw new LineTableError(`${prefix}${tooLong}`);
  const normalised = lineEndsNormalise(text.replace(/^\uFEFF/, ''));

  // Collect rows with the line each starts on (quoted fields may span lines).
  const rows: { cells: string[]; line: number }[] = [];
  let counted = 0;
  let lineAtCounted = 1;
  let rowStart = 0;
  const lineOf = (pos: number): number => {
    for (let i = counted; i < pos; i++) if (normalised.charCodeAt(i) === 10) lineAtCounted++;
    counted = Math.max(counted, pos);
    return lineAtCounted;
  };
  let parseError: { line: number; message: string } | null = null;
  let tooManyLine = 0;
  Papa.parse<string[]>(normalised, {
    delimiter: ',',
    newline: '\n',
    skipEmptyLines: false,
    step: (result, parser) => {
      const start = rowStart;
      const line = lineOf(start);
      rowStart = result.meta.cursor;
      if (result.errors.length > 0 && !parseError) {
        parseError = { line, message: result.errors[0].message };
        parser.abort();
        return;
      }
      const cells = result.data;
      if (cells.length === 1 && cells[0].trim() === '') return;
      // A comment is a line whose text starts with '#'; a quoted first cell "#…" is data (and gets its error).
      if (isCommentAt(normalised, start)) return;
      // Header plus maxLineTableRows data rows.
      if (rows.length > maxRows) {
        tooManyLine = line;
        parser.abort();
        return;
      }
      rows.push({ cells, line });
    },
  });
  if (parseError) fail((parseError as { line: number }).line, `malformed CSV: ${(parseError as { message: string }).message}`);
  if (tooManyLine) fail(tooManyLine, `more than ${maxRows} data rows (limit maxLineTableRows); split the table`);
  if (rows.length === 0) throw new LineTableError(`${prefix}no header line found; expected a header naming ${REQUIRED.join(', ')}`);

  const header = rows[0];
  const column: Partial<Record<Known, number>> = {};
  const extraColumns: string[] = [];
  const extraIndex: number[] = [];
  const seen = new Map<string, number>();
  header.cells.forEach((raw, idx) => {
    const name = raw.trim();
    const lower = name.toLowerCase();
    if (seen.has(lower)) fail(header.line, `column ${quoteCell(name)} appears twice in the header`);
    seen.set(lower, idx);
    const known = [...REQUIRED, ...OPTIONAL].find((k) => k.toLowerCase() === lower);
    if (known) column[known] = idx;
    else {
      extraColumns.push(name);
      extraIndex.push(idx);
    }
  });
  const missing = REQUIRED.filter((k) => column[k] === undefined);
  if (missing.length) {
    fail(
      header.line,
      `header lacks column${missing.length > 1 ? 's' : ''} ${missing.join(', ')} (found: ${inputExcerpt(header.cells.map((c) => c.trim()).join(', '), 200)}); expected J_up,K_up,J_lo,K_lo,wavenumber[,uncertainty]`,
    );
  }

  const assignments: Assignment[] = [];
  const lineNumbers: number[] = [];
  const extras: Record<string, string>[] = [];
  const warnings: string[] = [];
  const ids = new Set<string>();
  const renamed: { line: number; from: string; to: string }[] = [];
  const width = header.cells.length;
  for (const row of rows.slice(1)) {
    const { cells, line } = row;
    if (cells.length > width) fail(line, `${cells.length} fields, but the header names only ${width} columns`);
    const cell = (k: Known): string | undefined => {
      const idx = column[k];
      return idx === undefined ? undefined : (cells[idx] ?? '').trim();
    };
    const whole = (k: 'J_up' | 'K_up' | 'J_lo' | 'K_lo'): number => {
      const v = cell(k)!;
      if (v === '') fail(line, `${k} is empty`);
      const n = RE_DECIMAL.test(v) ? Number(v) : NaN;
      if (!Number.isInteger(n)) fail(line, `${k} ${quoteCell(v)} is not a whole number`);
      if (n < 0) fail(line, `${k} ${quoteCell(v)} must be >= 0`);
      if (n > INPUT_LIMITS.maxQuantumJ)
        fail(line, `${k} ${quoteCell(v)} is above the largest J or K handled (${INPUT_LIMITS.maxQuantumJ})`);
      return n;
    };
    const jUpper = whole('J_up');
    const kUpper = whole('K_up');
    const jLower = whole('J_lo');
    const kLower = whole('K_lo');
    const wn = cell('wavenumber')!;
    const observedCm1 = RE_DECIMAL.test(wn) ? Number(wn) : NaN;
    if (!Number.isFinite(observedCm1)) fail(line, `wavenumber ${quoteCell(wn)} is not a number (cm^-1)`);
    const un = cell('uncertainty') ?? '';
    let uncertaintyCm1 = defaultSigma;
    if (un !== '') {
      uncertaintyCm1 = RE_DECIMAL.test(un) ? Number(un) : NaN;
      if (!Number.isFinite(uncertaintyCm1) || uncertaintyCm1 <= 0) fail(line, `uncertainty ${quoteCell(un)} must be a number > 0 (cm^-1)`);
    }
    const flagWords = (cell('flags') ?? '')
      .toLowerCase()
      .split(/[\s;|]+/)
      .filter(Boolean);
    const flag = (k: 'blended' | 'excluded'): boolean => {
      const v = cell(k);
      if (v === undefined) return flagWords.includes(k);
      const lower = v.toLowerCase();
      if (TRUE_WORDS.has(lower)) return true;
      if (FALSE_WORDS.has(lower)) return false;
      return fail(line, `${k} ${quoteCell(v)} must be true/false, yes/no or 1/0`);
    };
    const isBlended = flag('blended');
    const isExcluded = flag('excluded');
    const idCell = cell('id') ?? '';
    let id = idCell !== '' ? idCell : `line${line}`;
    if (ids.has(id)) {
      renamed.push({ line, from: id, to: `${id}#${line}` });
      id = `${id}#${line}`;
    }
    ids.add(id);
    const assignment: Assignment = {
      id,
      jUpper,
      kUpper,
      jLower,
      kLower,
      observedCm1,
      uncertaintyCm1,
      isBlended,
      isExcluded,
      note: cells[column.note ?? -1] ?? '',
    };
    const peak = cell('peak_id') ?? '';
    if (peak !== '') assignment.peakId = peak;
    assignments.push(assignment);
    lineNumbers.push(line);
    const extra: Record<string, string> = {};
    extraColumns.forEach((name, k) => (extra[name] = cells[extraIndex[k]] ?? ''));
    extras.push(extra);
  }
  if (renamed.length > 0) {
    const first = renamed[0];
    const n = renamed.length;
    warnings.push(
      `${prefix}${n} row${n === 1 ? '' : 's'} renamed, id used by an earlier row (${quoteCell(first.from)} → ${quoteCell(first.to)}` +
        `${n > 1 ? ', and so on' : ''}), at ${traceLineList(renamed.map((r) => r.line))}`,
    );
  }
  return { assignments, lineNumbers, extraColumns, extras, warnings };
}

/** Options of lineTableSerialize. */
export interface LineTableSerializeOptions {
  /** Rotor shape (for the labels). */
  shape: TopShape;
  /** Calculated positions, cm^-1, parallel to the assignments (blank cells when absent). */
  calcCm1?: ArrayLike<number>;
  /** Outlier flags from a fit, parallel to the assignments. */
  isOutlier?: ArrayLike<boolean>;
  /**
   * Write the `band` and `species` columns (io/systemLineTable.ts reads them) after the usual ones,
   * from each assignment's band and species (blank when it names none). @default false
   */
  hasBandColumns?: boolean;
  /**
   * With hasBandColumns: also write `l_up`, `l_lo`, `tag_up`, `tag_lo` (io/systemLineTable.ts reads
   * them back; blank where the assignment carries none). @default false
   */
  hasLevelColumns?: boolean;
  /**
   * With hasLevelColumns: the symmetry species of each row's upper and lower level (`sym_up`,
   * `sym_lo`, as `simulate` writes them; read back as notes only), parallel to the assignments;
   * null for a row whose species are not known.
   */
  symmetryOf?: (index: number) => { symUpper: string; symLower: string } | null;
}

/** Shortest text that reads back as the same double (String drops the sign of −0). */
function numberText(v: number): string {
  return Object.is(v, -0) ? '-0' : String(v);
}

function lText(l: -1 | 0 | 1 | undefined): string {
  return l === undefined ? '' : l > 0 ? '+1' : l < 0 ? '-1' : '0';
}

function symCells(sym: { symUpper: string; symLower: string } | null): string[] {
  return sym ? [sym.symUpper, sym.symLower] : ['', ''];
}

/** Column order of a written line table. */
export const LINE_TABLE_COLUMNS = [
  'J_up',
  'K_up',
  'J_lo',
  'K_lo',
  'wavenumber',
  'uncertainty',
  'label',
  'calc',
  'obs_minus_calc',
  'flags',
  'note',
  'id',
  'peak_id',
] as const;

/**
 * Write assignments as an assigned-line CSV (columns LINE_TABLE_COLUMNS; numbers in full
 * double precision, so lineTableParse reads back the same assignments exactly).
 * label is ^ΔK ΔJ_K''(J'') in ASCII; flags holds "blended", "excluded", "outlier" separated by ';'.
 * @param assignments rows to write (wavenumber, uncertainty in cm^-1)
 * @returns CSV text with a header line, LF line ends, trailing newline
 */
export function lineTableSerialize(assignments: readonly Assignment[], options: LineTableSerializeOptions): string {
  const levels = options.hasBandColumns === true && options.hasLevelColumns === true;
  const data = assignments.map((a, i) => {
    const calc = options.calcCm1?.[i];
    const hasCalc = calc !== undefined && Number.isFinite(calc);
    const flags = [a.isBlended && 'blended', a.isExcluded && 'excluded', options.isOutlier?.[i] && 'outlier'].filter(Boolean).join(';');
    return [
      String(a.jUpper),
      String(a.kUpper),
      String(a.jLower),
      String(a.kLower),
      numberText(a.observedCm1),
      numberText(a.uncertaintyCm1),
      lineLabelAscii(a.kUpper - a.kLower, a.jUpper - a.jLower, a.kLower, a.jLower, options.shape),
      hasCalc ? numberText(calc) : '',
      hasCalc ? numberText(a.observedCm1 - calc) : '',
      flags,
      a.note,
      a.id,
      a.peakId ?? '',
      ...(options.hasBandColumns ? [a.band ?? '', a.species ?? ''] : []),
      ...(levels ? [lText(a.lUpper), lText(a.lLower), a.tagUpper ?? '', a.tagLower ?? ''] : []),
      ...(levels && options.symmetryOf ? symCells(options.symmetryOf(i)) : []),
    ];
  });
  const fields = options.hasBandColumns ? [...LINE_TABLE_COLUMNS, 'band', 'species'] : [...LINE_TABLE_COLUMNS];
  if (levels) fields.push('l_up', 'l_lo', 'tag_up', 'tag_lo');
  if (levels && options.symmetryOf) fields.push('sym_up', 'sym_lo');
  return Papa.unparse({ fields, data }, { newline: '\n', quotes: false }) + '\n';
}
