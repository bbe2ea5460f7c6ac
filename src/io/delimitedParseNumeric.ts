/**
 * Fast path for plain numeric column text ("x,y\n", "x\ty\n", "x  y  z\n"): a hand-written scanner into
 * Float64Array that refuses (returns null) anything it cannot prove it reads exactly as the general
 * papaparse path would: headers, comments, blank lines inside the data, quotes, decimal commas, ragged rows.
 */

/** Options of `delimitedParseNumeric`. */
export interface DelimitedParseNumericOptions {
  /**
   * Character offset where the data rows start (after a header or comment preamble).
   * @default 0
   */
  start: number;
  /**
   * 0-based column returned as `y`.
   * @default 1
   */
  yColumn: number;
  /**
   * Field delimiter to accept: ',' (with optional blanks around it), 'whitespace' (runs of spaces/tabs),
   * or 'auto' (',' when the first row has a comma, else whitespace).
   * @default 'auto'
   */
  delimiter: ',' | 'whitespace' | 'auto';
  /**
   * Most rows read; on the next row the scan stops and returns `isOverLimit: true` (so a huge file
   * ends in a refusal instead of filling memory).
   * @default Infinity
   */
  maxRows: number;
  /** Called with the fraction (0..1) of the text scanned, about every 2 %. */
  onProgress?: (fraction: number) => void;
}

/** Columns read by `delimitedParseNumeric`, in file order and file units. */
export interface DelimitedNumericColumns {
  /** Column 0 of every row. */
  x: Float64Array;
  /** Column `yColumn` of every row. */
  y: Float64Array;
  /** Number of fields in every row. */
  columns: number;
  /** Delimiter the rows used. */
  delimiter: ',' | 'whitespace';
  /** True when the text holds more than `maxRows` rows; x and y are then empty. */
  isOverLimit?: boolean;
}

// Powers of ten that are exact in binary64 (10^22 is the largest); a constant lookup table.
const POW10 = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

const MAX_EXACT = 9007199254740991; // 2^53 − 1
const TAB = 9;
const LF = 10;
const CR = 13;
const SPACE = 32;
const PLUS = 43;
const COMMA = 44;
const MINUS = 45;
const DOT = 46;
const E_UPPER = 69;
const E_LOWER = 101;

/**
 * Read plain numeric delimited text into columns, or return null when the text is not plain.
 * "Plain" means: every row (line) holds the same number (≥ 2) of numbers written as
 * `[+-]digits[.digits][e[+-]digits]` with '.' decimals, separated by commas or by blank runs; no blank
 * lines except at the end; LF or CRLF line ends. Values equal `Number(field)` exactly: a digit string
 * whose integer value stays below 2^53 is scaled by an exact power of ten ≤ 1e22 (one correctly rounded
 * operation); anything else goes through `Number`.
 * @param text the file text (never modified)
 * @param options see `DelimitedParseNumericOptions`
 * @returns x (column 0) and y (column `yColumn`) in file units, or null
 * Source: Clinger, "How to read floating point numbers accurately", PLDI 1990 (the exact fast case).
 */
export function delimitedParseNumeric(text: string, options?: Partial<DelimitedParseNumericOptions>): DelimitedNumericColumns | null {
  const start = options?.start ?? 0;
  const yColumn = options?.yColumn ?? 1;
  const onProgress = options?.onProgress;
  const maxRows = options?.maxRows ?? Infinity;
  const n = text.length;
  if (!(start >= 0 && start < n) || !Number.isInteger(yColumn) || yColumn < 1) return null;

  let isComma: boolean;
  const mode = options?.delimiter ?? 'auto';
  if (mode === 'auto') {
    let eol = text.indexOf('\n', start);
    if (eol < 0) eol = n;
    const comma = text.indexOf(',', start);
    isComma = comma >= 0 && comma < eol;
  } else isComma = mode === ',';

  // Capacity guess from the first row's length, capped so a short first row cannot trigger a huge
  // allocation; doubling covers the rest.
  let firstEol = text.indexOf('\n', start);
  if (firstEol < 0) firstEol = n;
  const guess = Math.ceil(((n - start) / Math.max(4, firstEol - start + 1)) * 1.05) + 16;
  let cap = Math.min(guess, 1 << 21);
  let xs = new Float64Array(cap);
  let ys = new Float64Array(cap);

  let columns = -1;
  let rows = 0;
  let i = start;
  const progressStep = Math.max(1, Math.floor((n - start) / 50));
  let nextProgress = start + progressStep;

  while (i < n) {
    // One row.
    let c = text.charCodeAt(i);
    while (c === SPACE || c === TAB) c = text.charCodeAt(++i);
    if (i >= n) break;
    if (c === LF || c === CR) {
      // Blank line: fine only when nothing but blank lines follows.
      for (let k = i; k < n; k++) {
        const d = text.charCodeAt(k);
        if (d !== LF && d !== CR && d !== SPACE && d !== TAB) return null;
      }
      break;
    }
    let col = 0;
    let xv = 0;
    let yv = 0;
    for (;;) {
      // One number.
      const tokenStart = i;
      let neg = false;
      if (c === MINUS) {
        neg = true;
        c = text.charCodeAt(++i);
      } else if (c === PLUS) c = text.charCodeAt(++i);
      let mant = 0;
      let digits = 0;
      let scale = 0;
      while (c >= 48 && c <= 57) {
        mant = mant * 10 + (c - 48);
        digits++;
        c = text.charCodeAt(++i);
      }
      if (c === DOT) {
        c = text.charCodeAt(++i);
        while (c >= 48 && c <= 57) {
          mant = mant * 10 + (c - 48);
          digits++;
          scale++;
          c = text.charCodeAt(++i);
        }
      }
      if (digits === 0) return null;
      let exp = 0;
      if (c === E_LOWER || c === E_UPPER) {
        c = text.charCodeAt(++i);
        let expNeg = false;
        if (c === MINUS) {
          expNeg = true;
          c = text.charCodeAt(++i);
        } else if (c === PLUS) c = text.charCodeAt(++i);
        let expDigits = 0;
        while (c >= 48 && c <= 57) {
          if (exp < 100000) exp = exp * 10 + (c - 48);
          expDigits++;
          c = text.charCodeAt(++i);
        }
        if (expDigits === 0) return null;
        if (expNeg) exp = -exp;
      }
      const e10 = exp - scale;
      let v: number;
      // Every partial mantissa below 2^53 was an exact integer, so one scaling step rounds correctly.
      if (mant <= MAX_EXACT && e10 >= -22 && e10 <= 22) {
        v = e10 >= 0 ? mant * POW10[e10] : mant / POW10[-e10];
        if (neg) v = -v;
      } else v = Number(text.slice(tokenStart, i));
      if (col === 0) xv = v;
      if (col === yColumn) yv = v;
      col++;

      // Between fields.
      let sawBlank = false;
      while (c === SPACE || c === TAB) {
        sawBlank = true;
        c = text.charCodeAt(++i);
      }
      if (c === COMMA) {
        if (!isComma) return null;
        c = text.charCodeAt(++i);
        while (c === SPACE || c === TAB) c = text.charCodeAt(++i);
        continue;
      }
      if (c === LF || c === CR || i >= n) break;
      if (isComma || !sawBlank) return null;
    }
    if (columns < 0) {
      if (col < 2 || col <= yColumn) return null;
      columns = col;
    } else if (col !== columns) return null;

    if (rows >= maxRows)
      return { x: new Float64Array(0), y: new Float64Array(0), columns, delimiter: isComma ? ',' : 'whitespace', isOverLimit: true };
    if (rows === cap) {
      cap *= 2;
      const nx = new Float64Array(cap);
      const ny = new Float64Array(cap);
      nx.set(xs);
      ny.set(ys);
      xs = nx;
      ys = ny;
    }
    xs[rows] = xv;
    ys[rows] = yv;
    rows++;

    // Line end: LF or CRLF (a lone CR is not plain).
    if (c === CR) {
      c = text.charCodeAt(++i);
      if (c !== LF && i < n) return null;
    }
    if (c === LF) ++i;
    if (onProgress && i >= nextProgress) {
      onProgress((i - start) / (n - start));
      nextProgress = i + progressStep;
    }
  }
  if (rows === 0) return null;
  onProgress?.(1);
  return { x: xs.slice(0, rows), y: ys.slice(0, rows), columns, delimiter: isComma ? ',' : 'whitespace' };
}
