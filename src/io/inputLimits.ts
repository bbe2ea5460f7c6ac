/**
 * Size limits shared by every importer (trace, line table, model file, project file), and the small
 * helpers that check them and quote untrusted text in messages.
 *
 * Why limits: a hostile or mistaken file (a 2e9 ##NPOINTS claim, a 40-byte JCAMP line whose DUP count
 * expands to 4e7 points, a line table of a billion rows, a trace picked as a model file) must end with a
 * one-line message, not a frozen tab or an out-of-memory crash. Each limit is far above what a real
 * file of its kind needs; the numbers behind each choice are in its doc comment.
 *
 * Non-goals: streaming files larger than one string; limits on CPU time (the parse worker runs off the
 * main thread and reports progress instead).
 */
import { ASSIGNMENT_MAX_J } from '../fit/assignment';

/** Every shared input limit. Read them from here; an importer's own option may only lower them. */
export interface InputLimits {
  /**
   * Longest text an importer reads, UTF-16 code units (characters). Below V8's longest string,
   * 2^29 − 24 = 536 870 888 code units (Node 20 `buffer.constants.MAX_STRING_LENGTH`; Chrome uses the
   * same V8 limit), so a refusal comes before the runtime's own "Invalid string length".
   */
  maxTextChars: number;
  /**
   * Most points in one trace: 5e7 points are 400 MB per Float64 column. A measured FTIR trace has
   * 1e4–1e6 points (common practice), so real files never reach it.
   */
  maxTracePoints: number;
  /** Most points a JCAMP-DX ##NPOINTS may claim (refused before any allocation). Same as maxTracePoints. */
  maxJcampPoints: number;
  /**
   * Points a JCAMP-DX file may always decode to, however short its text (see jcampMaxPointsPerChar).
   * Measured: 1e6 points decode in ~0.3 s and ~60 MB (Node 20, 2 cores), harmless for a tab.
   */
  jcampExpansionFloorPoints: number;
  /**
   * Beyond jcampExpansionFloorPoints, decoded points per character of file text. ASDF (DIF + DUP) needs
   * about 1–4 characters per point on measured, noisy data, so a real file stays far below 1000 points
   * per character; a DUP count of 4e7 in a 40-byte line (a "compression bomb": 12 s, 2 GB measured
   * without this limit) does not.
   */
  jcampMaxPointsPerChar: number;
  /** Most data rows in a line table (each row becomes an object of ~200 bytes: 2e6 rows ≈ 400 MB). */
  maxLineTableRows: number;
  /**
   * Largest J (and K) accepted in a line table or an assignment; equals the largest model jMax, so
   * every accepted line can be simulated. Defined by `ASSIGNMENT_MAX_J` in fit/assignment.
   */
  maxQuantumJ: number;
  /** Largest jMax of a model file (levels up to J = 2000 cover any room-temperature band). */
  maxModelJ: number;
  /** Largest kMax of a model file. */
  maxModelK: number;
  /**
   * Most spin-weight entries of a model file: g(K″) = spinWeights[K″ mod n] with K″ ≤ kMax ≤ 2000, so an
   * entry past index 2000 can never be read.
   */
  maxSpinWeights: number;
  /** Longest model file, characters. A model file is ~1 kB; 1e7 stops a trace picked by mistake before JSON.parse. */
  maxModelFileChars: number;
  /**
   * Deepest nesting of arrays/objects in a JSON file. Model files nest 3 levels and project files about 8;
   * JSON.parse with a reviver and JSON.stringify recurse, and overflow the stack near 2500 levels
   * (measured, Node 20 main thread; worker threads have smaller stacks), so deeper text is refused
   * before parsing.
   */
  maxJsonDepth: number;
  /** Longest untrusted text (a label value, a cell) quoted in a message, characters. */
  messageExcerptChars: number;
}

/** The limits in force (frozen). */
export const INPUT_LIMITS: Readonly<InputLimits> = Object.freeze({
  maxTextChars: 500_000_000,
  maxTracePoints: 50_000_000,
  maxJcampPoints: 50_000_000,
  jcampExpansionFloorPoints: 1_000_000,
  jcampMaxPointsPerChar: 1000,
  maxLineTableRows: 2_000_000,
  maxQuantumJ: ASSIGNMENT_MAX_J,
  maxModelJ: 2000,
  maxModelK: 2000,
  maxSpinWeights: 2001,
  maxModelFileChars: 10_000_000,
  maxJsonDepth: 200,
  messageExcerptChars: 60,
});

/** Name of one shared limit. */
export type InputLimitName = keyof InputLimits;

/** What each limit counts: the noun for the value and the unit of the limit. */
const LIMIT_WORDS: Record<InputLimitName, [string, string]> = {
  maxTextChars: ['text length', 'characters'],
  maxTracePoints: ['point count', 'points'],
  maxJcampPoints: ['point count', 'points'],
  jcampExpansionFloorPoints: ['point count', 'points'],
  jcampMaxPointsPerChar: ['expansion', 'points per character'],
  maxLineTableRows: ['row count', 'data rows'],
  maxQuantumJ: ['J', ''],
  maxModelJ: ['jMax', ''],
  maxModelK: ['kMax', ''],
  maxSpinWeights: ['spin-weight count', 'entries'],
  maxModelFileChars: ['text length', 'characters'],
  maxJsonDepth: ['nesting depth', 'levels'],
  messageExcerptChars: ['excerpt length', 'characters'],
};

/**
 * Check a size against a shared limit.
 * @param name which limit
 * @param value the size found (characters, points, rows … as the limit's doc comment says)
 * @param limit the limit in force (an importer option may lower the shared one); default `INPUT_LIMITS[name]`
 * @returns null when value ≤ limit, else a clause such as
 *   "text length 600000000 is above the limit of 500000000 characters (maxTextChars)", to follow "<file>: "
 */
export function inputLimitCheck(name: InputLimitName, value: number, limit: number = INPUT_LIMITS[name]): string | null {
  if (value <= limit) return null;
  const [noun, unit] = LIMIT_WORDS[name];
  return `${noun} ${value} is above the limit of ${limit}${unit ? ` ${unit}` : ''} (${name})`;
}

/**
 * Untrusted text made safe to quote inside a one-line message: line breaks (CR, LF, U+0085, U+2028,
 * U+2029), other control characters and lone surrogates written as \uXXXX, and the result cut to
 * `maxChars` characters with '…'. Printable text (HTML included) is kept verbatim: escaping for a page
 * is the page's job.
 * @param text untrusted text (a label value, a cell, a file name)
 * @param maxChars most characters kept before '…' @default INPUT_LIMITS.messageExcerptChars
 */
export function inputExcerpt(text: string, maxChars: number = INPUT_LIMITS.messageExcerptChars): string {
  const cut = text.length > maxChars;
  let s = cut ? text.slice(0, maxChars) : text;
  // A cut inside a surrogate pair would leave half a character.
  if (cut && /[\uD800-\uDBFF]$/.test(s)) s = s.slice(0, -1);
  s = s.replace(
    // Control characters are exactly what this replaces.
    // eslint-disable-next-line no-control-regex
    /[\u0000-\u001f\u007f-\u009f\u2028\u2029]|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g,
    (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`,
  );
  return cut ? `${s}…` : s;
}

/**
 * True when a message is one line: no CR, LF, U+0085, U+2028 or U+2029 (the line breaks of Unicode
 * and ECMAScript), non-empty after trimming.
 * @param message text to check
 */
export function inputIsOneLine(message: string): boolean {
  return message.trim() !== '' && !/[\n\r\u0085\u2028\u2029]/.test(message);
}

/** Outcome of `inputJsonParse`. */
export type InputJsonOutcome =
  { ok: true; value: unknown } | { ok: false; message: string; line?: number; column?: number; field?: string };

/**
 * JSON.parse behind a length limit, with a one-line message that names the line and column of a syntax
 * error (V8's own message gives a position only for some errors and may quote raw line breaks).
 * @param text untrusted JSON text
 * @param maxChars longest text accepted, characters @default INPUT_LIMITS.maxTextChars
 * @param reviver passed to JSON.parse
 * @returns the parsed value, or a message such as "not valid JSON at line 3, column 7: Unexpected token …"
 * Source: JSON grammar of ECMA-404 (2nd ed., 2017), used for locating the error.
 */
export function inputJsonParse(
  text: string,
  maxChars: number = INPUT_LIMITS.maxTextChars,
  reviver?: (key: string, value: unknown) => unknown,
): InputJsonOutcome {
  if (typeof text !== 'string') return { ok: false, message: `not text (got ${typeof text})` };
  if (text.length > maxChars)
    return {
      ok: false,
      message: `the text is ${text.length} characters long, above the limit of ${maxChars} characters`,
      field: 'maxChars',
    };
  const deep = inputJsonDepthBeyond(text, INPUT_LIMITS.maxJsonDepth);
  if (deep)
    return {
      ok: false,
      message: `nested more than ${INPUT_LIMITS.maxJsonDepth} levels deep at line ${deep.line} (limit maxJsonDepth)`,
      line: deep.line,
      field: 'maxJsonDepth',
    };
  try {
    return { ok: true, value: JSON.parse(text, reviver) };
  } catch (err) {
    const detail = inputExcerpt(err instanceof Error ? err.message : String(err), 160);
    const at = inputJsonErrorOffset(text);
    // Valid by the grammar yet refused (a reviver's recursion too deep, out of memory): no place to name.
    if (at < 0)
      return {
        ok: false,
        message: `not readable as JSON: ${detail}${err instanceof RangeError ? ' (nested too deeply?)' : ''}`,
      };
    let line = 1;
    let lineStart = 0;
    for (let i = 0; i < at; i++)
      if (text.charCodeAt(i) === 10) {
        line++;
        lineStart = i + 1;
      }
    const column = at - lineStart + 1;
    const where = at >= text.length ? `(the text ends early, at line ${line})` : `at line ${line}, column ${column}`;
    return { ok: false, message: `not valid JSON ${where}: ${detail}`, line, column };
  }
}

/**
 * Where JSON text first opens more than `maxDepth` nested arrays/objects (brackets inside strings do not
 * count), or null. One linear pass, no parsing.
 */
function inputJsonDepthBeyond(text: string, maxDepth: number): { line: number } | null {
  let depth = 0;
  let line = 1;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 10) line++;
    if (inString) {
      if (c === 92) i++;
      else if (c === 34) inString = false;
    } else if (c === 34) inString = true;
    else if (c === 91 || c === 123) {
      if (++depth > maxDepth) return { line };
    } else if (c === 93 || c === 125) depth--;
  }
  return null;
}

/**
 * Offset of the first character at which `text` stops being valid JSON (ECMA-404), text.length when
 * the text ends before the value does, or −1 when the text is valid JSON. Iterative, so deeply nested input cannot overflow the stack.
 * Only called after JSON.parse has failed.
 */
function inputJsonErrorOffset(text: string): number {
  const n = text.length;
  let i = 0;
  // Stack of open containers: 1 = array, 2 = object.
  const stack: number[] = [];
  const skipBlank = () => {
    while (i < n) {
      const c = text.charCodeAt(i);
      if (c === 32 || c === 9 || c === 10 || c === 13) i++;
      else break;
    }
  };
  /** Scan one string starting at i (a '"'); returns false at the bad character. */
  const scanString = (): boolean => {
    i++;
    while (i < n) {
      const c = text.charCodeAt(i);
      if (c === 34) {
        i++;
        return true;
      }
      if (c < 32) return false;
      if (c === 92) {
        const e = text.charCodeAt(i + 1);
        if (e === 117) {
          if (!/^[0-9a-fA-F]{4}$/.test(text.slice(i + 2, i + 6))) {
            i += 2;
            return false;
          }
          i += 6;
        } else if ([34, 92, 47, 98, 102, 110, 114, 116].includes(e)) i += 2;
        else {
          i++;
          return false;
        }
      } else i++;
    }
    return false;
  };
  /** Scan one value at i; returns 'open' after [ or {, true after a scalar, false at a bad character. */
  const scanValue = (): boolean | 'open' => {
    const c = text.charCodeAt(i);
    if (c === 91 || c === 123) {
      stack.push(c === 91 ? 1 : 2);
      i++;
      return 'open';
    }
    if (c === 34) return scanString();
    const word = c === 116 ? 'true' : c === 102 ? 'false' : c === 110 ? 'null' : '';
    if (word) {
      // Stop at the first character that breaks the literal.
      let k = 0;
      while (k < word.length && text.charCodeAt(i + k) === word.charCodeAt(k)) k++;
      i += k;
      return k === word.length;
    }
    return scanNumber();
  };
  const isDigitAt = (k: number) => {
    const d = text.charCodeAt(k);
    return d >= 48 && d <= 57;
  };
  /** Scan one number at i; on failure i is left at the first character that cannot continue it. */
  const scanNumber = (): boolean => {
    if (text.charCodeAt(i) === 45) i++;
    if (!isDigitAt(i)) return false;
    if (text.charCodeAt(i) === 48) i++;
    else while (isDigitAt(i)) i++;
    if (text.charCodeAt(i) === 46) {
      i++;
      if (!isDigitAt(i)) return false;
      while (isDigitAt(i)) i++;
    }
    const e = text.charCodeAt(i);
    if (e === 101 || e === 69) {
      i++;
      const sign = text.charCodeAt(i);
      if (sign === 43 || sign === 45) i++;
      if (!isDigitAt(i)) return false;
      while (isDigitAt(i)) i++;
    }
    return true;
  };
  // expect: 0 value, 1 value or close (after '['), 2 key or close (after '{'), 3 key (after ','), 4 ',' or close
  let expect = 0;
  for (;;) {
    skipBlank();
    if (i >= n) return expect === 4 && stack.length === 0 ? -1 : n;
    const c = text.charCodeAt(i);
    const top = stack[stack.length - 1];
    if (expect === 4) {
      if (stack.length === 0) return i; // text after the complete value
      if (c === 44) {
        i++;
        expect = top === 1 ? 0 : 3;
      } else if ((c === 93 && top === 1) || (c === 125 && top === 2)) {
        i++;
        stack.pop();
        expect = 4;
      } else return i;
      continue;
    }
    if ((expect === 1 && c === 93) || (expect === 2 && c === 125)) {
      i++;
      stack.pop();
      expect = 4;
      continue;
    }
    if (expect === 2 || expect === 3) {
      if (c !== 34 || !scanString()) return i;
      skipBlank();
      if (i >= n) return n;
      if (text.charCodeAt(i) !== 58) return i;
      i++;
      expect = 0;
      continue;
    }
    const v = scanValue();
    if (v === false) return Math.min(i, n);
    expect = v === 'open' ? (stack[stack.length - 1] === 1 ? 1 : 2) : 4;
  }
}
