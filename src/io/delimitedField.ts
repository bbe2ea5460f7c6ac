/**
 * Classifying and reading one field of a delimited trace file.
 */

/** What a field holds (plain numbers, so the type survives isolated-module transpilers). */
export const DelimitedFieldKind = {
  NonNumeric: 0,
  /** Digits without a decimal separator (reads the same with '.' or ','). */
  Integer: 1,
  /** A number with a decimal point. */
  DecimalPoint: 2,
  /** A number with a decimal comma. */
  DecimalComma: 3,
  /** NaN, Inf, Infinity (any case, optional sign). */
  NonFinite: 4,
} as const;
/** One of the `DelimitedFieldKind` values. */
export type DelimitedFieldKind = (typeof DelimitedFieldKind)[keyof typeof DelimitedFieldKind];

const RE_INT = /^[+-]?\d+(?:[eE][+-]?\d+)?$/;
const RE_DOT = /^[+-]?(?:\d+\.\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
const RE_COMMA = /^[+-]?(?:\d+,\d*|,\d+)(?:[eE][+-]?\d+)?$/;
const RE_NONFINITE = /^[+-]?(?:nan|inf|infinity)$/i;

/**
 * Trim blanks (and a BOM) and one pair of surrounding double quotes.
 * @param field raw field text
 */
export function delimitedFieldClean(field: string): string {
  let s = field.trim();
  if (s.length >= 2 && s.charCodeAt(0) === 34 && s.charCodeAt(s.length - 1) === 34) s = s.slice(1, -1).trim();
  return s;
}

/**
 * Kind of a cleaned field (see `delimitedFieldClean`).
 * @param s cleaned field text
 */
export function delimitedFieldKind(s: string): DelimitedFieldKind {
  if (s.length === 0) return DelimitedFieldKind.NonNumeric;
  if (RE_INT.test(s)) return DelimitedFieldKind.Integer;
  if (RE_DOT.test(s)) return DelimitedFieldKind.DecimalPoint;
  if (RE_COMMA.test(s)) return DelimitedFieldKind.DecimalComma;
  if (RE_NONFINITE.test(s)) return DelimitedFieldKind.NonFinite;
  return DelimitedFieldKind.NonNumeric;
}

/**
 * Numeric value of a cleaned field of known kind (NaN for NonNumeric).
 * @param s cleaned field text
 * @param kind from `delimitedFieldKind`
 */
export function delimitedFieldValue(s: string, kind: DelimitedFieldKind): number {
  switch (kind) {
    case DelimitedFieldKind.Integer:
    case DelimitedFieldKind.DecimalPoint:
      return Number(s);
    case DelimitedFieldKind.DecimalComma:
      return Number(s.replace(',', '.'));
    case DelimitedFieldKind.NonFinite: {
      const t = s.toLowerCase();
      if (t.endsWith('nan')) return NaN;
      return t.startsWith('-') ? -Infinity : Infinity;
    }
    default:
      return NaN;
  }
}

/**
 * True when the raw line starting at `pos` is a comment: first non-blank characters '#', '%', ';', '!' or '//'.
 * @param text file text
 * @param pos offset of the line start
 */
export function delimitedIsCommentAt(text: string, pos: number): boolean {
  let c = text.charCodeAt(pos);
  while (c === 32 || c === 9) c = text.charCodeAt(++pos);
  if (c === 35 || c === 37 || c === 59 || c === 33) return true; // # % ; !
  return c === 47 && text.charCodeAt(pos + 1) === 47; // //
}

/**
 * Line end used by a text: '\r\n', '\n', or '\r' alone (old Mac files), judged from the first line end.
 * @param text file text
 */
export function delimitedNewline(text: string): '\n' | '\r\n' | '\r' {
  const lf = text.indexOf('\n');
  if (lf > 0 && text.charCodeAt(lf - 1) === 13) return '\r\n';
  if (lf < 0 && text.indexOf('\r') >= 0) return '\r';
  return '\n';
}
