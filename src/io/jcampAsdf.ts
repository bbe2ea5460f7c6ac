/**
 * Decoder for one data line of a JCAMP-DX (X++(Y..Y)) table in AFFN or ASDF form (PAC, SQZ, DIF, DUP).
 *
 * Pseudo-digits (JCAMP-DX IR, McDonald & Wilks 1988, ASDF section; from memory):
 *   SQZ  @ A B C D E F G H I = 0 1 … 9,   a b c d e f g h i = −1 … −9   (absolute value, first digit + sign)
 *   DIF  % J K L M N O P Q R = 0 1 … 9,   j k l m n o p q r = −1 … −9   (difference from the previous value)
 *   DUP  S T U V W X Y Z s   = 1 2 … 9                                   (the previous token occurs N times in all)
 *   PAC  + or − starts a new number; AFFN numbers are separated by blanks or commas.
 *   ?    an invalid (missing) ordinate (JCAMP-DX 5.01, Lampen et al. 1999; from memory).
 * An E/e directly after a digit and followed by a sign and a digit is an AFFN exponent ("1.5E+03"),
 * not the SQZ digit 5 / −5.
 */

/** Decoded data line. */
export interface JcampAsdfLine {
  /** Abscissa written at the start of the line (file units, before XFACTOR). */
  x: number;
  /** Ordinates of the line in order (file units, before YFACTOR); NaN for '?'. */
  y: number[];
  /** The last ordinate came from a DIF token (or a DUP of one): the next line repeats it as a check. */
  endsWithDif: boolean;
}

/** A decoding failure at a 1-based column of the line. */
export interface JcampAsdfError {
  column: number;
  message: string;
  /** True when the failure is only that the line holds more than `maxValues` ordinates. */
  isOverflow: boolean;
}

const SQZ = 1;
const DIF = 2;
const DUP = 3;
// Character class and digit value of every pseudo-digit (a constant lookup table).
const CLASS = new Uint8Array(128);
const DIGIT = new Int8Array(128);
{
  const set = (chars: string, cls: number, from: number, step: number) => {
    for (let k = 0; k < chars.length; k++) {
      CLASS[chars.charCodeAt(k)] = cls;
      DIGIT[chars.charCodeAt(k)] = from + step * k;
    }
  };
  set('@ABCDEFGHI', SQZ, 0, 1);
  set('abcdefghi', SQZ, -1, -1);
  set('%JKLMNOPQR', DIF, 0, 1);
  set('jklmnopqr', DIF, -1, -1);
  set('STUVWXYZs', DUP, 1, 1);
}

const isDigit = (c: number) => c >= 48 && c <= 57;

/**
 * Decode one (X++(Y..Y)) data line (comments already removed).
 * @param line the line text
 * @param maxValues most ordinates this line may produce (guards DUP counts against absurd expansion)
 * @returns the abscissa, the ordinates and whether the line ended in DIF form, or an error with its column
 * Source: McDonald & Wilks, Appl. Spectrosc. 42 (1988) 151, ASDF compression (from memory).
 */
export function jcampAsdfDecodeLine(
  line: string,
  maxValues: number,
): { ok: true; value: JcampAsdfLine } | { ok: false; error: JcampAsdfError } {
  const n = line.length;
  const y: number[] = [];
  let x = NaN;
  let hasX = false;
  let last = NaN;
  let lastDelta = 0;
  let lastKind = 0; // 0 none, SQZ (absolute), DIF
  let i = 0;
  const fail = (column: number, message: string, isOverflow = false) => ({
    ok: false as const,
    error: { column, message, isOverflow },
  });
  const tooMany = (column: number) => fail(column, `the line expands to more than ${maxValues} ordinates`, true);

  while (i < n) {
    const c = line.charCodeAt(i);
    if (c === 32 || c === 9 || c === 44) {
      i++;
      continue;
    }
    const col = i + 1;
    const cls = c < 128 ? CLASS[c] : 0;
    if (isDigit(c) || c === 43 || c === 45 || c === 46) {
      // AFFN / PAC number.
      const s = i;
      if (c === 43 || c === 45) i++;
      let digits = 0;
      while (i < n && isDigit(line.charCodeAt(i))) {
        i++;
        digits++;
      }
      if (i < n && line.charCodeAt(i) === 46) {
        i++;
        while (i < n && isDigit(line.charCodeAt(i))) {
          i++;
          digits++;
        }
      }
      if (digits === 0) return fail(col, `'${line[s]}' is not followed by a number`);
      const e = line.charCodeAt(i);
      if ((e === 69 || e === 101) && (line.charCodeAt(i + 1) === 43 || line.charCodeAt(i + 1) === 45) && isDigit(line.charCodeAt(i + 2))) {
        i += 2;
        while (i < n && isDigit(line.charCodeAt(i))) i++;
      }
      const v = Number(line.slice(s, i));
      if (!hasX) {
        x = v;
        hasX = true;
      } else {
        if (y.length >= maxValues) return tooMany(col);
        y.push(v);
      }
      last = v;
      lastKind = SQZ;
      continue;
    }
    if (c === 63) {
      // '?': invalid ordinate.
      i++;
      if (!hasX) return fail(col, "'?' cannot stand for the abscissa");
      if (y.length >= maxValues) return tooMany(col);
      y.push(NaN);
      last = NaN;
      lastKind = SQZ;
      continue;
    }
    if (cls === SQZ || cls === DIF) {
      const s = i;
      i++;
      let dot = false;
      while (i < n) {
        const d = line.charCodeAt(i);
        if (isDigit(d)) i++;
        else if (d === 46 && !dot) {
          dot = true;
          i++;
        } else break;
      }
      const digit = DIGIT[c];
      const mag = Number(String(Math.abs(digit)) + line.slice(s + 1, i));
      const v = digit < 0 ? -mag : mag;
      if (cls === SQZ) {
        if (!hasX) {
          x = v;
          hasX = true;
        } else {
          if (y.length >= maxValues) return tooMany(col);
          y.push(v);
        }
        last = v;
        lastKind = SQZ;
      } else {
        if (!hasX) return fail(col, `DIF character '${line[s]}' cannot stand for the abscissa`);
        if (y.length === 0) return fail(col, `DIF character '${line[s]}' has no ordinate before it on this line to add to`);
        if (y.length >= maxValues) return tooMany(col);
        last = last + v;
        lastDelta = v;
        y.push(last);
        lastKind = DIF;
      }
      continue;
    }
    if (cls === DUP) {
      const s = i;
      i++;
      while (i < n && isDigit(line.charCodeAt(i))) i++;
      const count = Number(String(DIGIT[c]) + line.slice(s + 1, i));
      if (y.length === 0) return fail(col, `DUP character '${line[s]}' has no ordinate before it to repeat`);
      if (y.length + count - 1 > maxValues) return tooMany(col);
      for (let k = 1; k < count; k++) {
        if (lastKind === DIF) last += lastDelta;
        y.push(last);
      }
      continue;
    }
    // One UTF-16 unit, shown as \uXXXX when it is a control, a line break or half a surrogate pair.
    const isPrintable = c >= 32 && c !== 127 && !(c >= 0x80 && c <= 0x9f) && c !== 0x2028 && c !== 0x2029 && (c < 0xd800 || c > 0xdfff);
    const shown = isPrintable ? line[i] : `\\u${c.toString(16).padStart(4, '0')}`;
    return fail(col, `unexpected character '${shown}' in compressed (ASDF) data`);
  }
  if (!hasX) return fail(1, 'empty data line');
  return { ok: true, value: { x, y, endsWithDif: lastKind === DIF } };
}
