/**
 * Bytes of a text file to a string: the encoding told by a byte-order mark (UTF-8, UTF-16 LE/BE), or
 * UTF-16 without one recognised by its NUL bytes, else UTF-8. Used by the command line and by the page's
 * parse worker, so both read a file the same way.
 */

/** Encodings read by `textDecode`. */
export type TextEncodingName = 'UTF-8' | 'UTF-16 LE' | 'UTF-16 BE';

/** How the encoding was chosen. */
export type TextEncodingEvidence = 'byte-order mark' | 'NUL bytes' | 'default';

/** What `textDecode` returns. */
export type TextDecodeOutcome =
  | {
      ok: true;
      /** The text, without its byte-order mark. */
      text: string;
      encoding: TextEncodingName;
      evidence: TextEncodingEvidence;
      /** Byte sequences not valid in `encoding` (each decoded as U+FFFD; a lone last byte of UTF-16 counts as one). */
      invalidCount: number;
      /** 0-based offset of the first of them, −1 when there is none. */
      firstInvalidByte: number;
    }
  | {
      ok: false;
      /** Encoding found, e.g. 'UTF-32 LE'. */
      encoding: string;
      /** One line saying why the bytes are not read, naming the encoding. */
      message: string;
    };

/**
 * Share of NUL bytes in one byte position of the 16-bit pairs above which a text without a byte-order
 * mark is taken as UTF-16 (ASCII text in UTF-16 has a NUL in every pair: share 1). Common practice,
 * not a standard: UTF-8 text has no NUL bytes at all, so any threshold well above the few NULs of a
 * damaged file works.
 */
export const TEXT_UTF16_NUL_SHARE = 0.4;
/** Most of the other position's bytes that may be NUL for the guess (ASCII-range UTF-16 has none). */
export const TEXT_UTF16_OTHER_NUL_SHARE = 0.05;
/** Bytes looked at for the UTF-16 guess. */
const SNIFF_BYTES = 4096;

/** The part of TextDecoder used here (the pure modules compile without DOM or Node type names). */
type Utf8Decoder = { decode(bytes: Uint8Array): string };
const Decoder = (globalThis as unknown as { TextDecoder: new (label: string, options?: { ignoreBOM?: boolean }) => Utf8Decoder })
  .TextDecoder;

/**
 * Decode the bytes of a text file.
 * Byte-order marks: EF BB BF → UTF-8; FF FE → UTF-16 LE; FE FF → UTF-16 BE (Unicode Standard 15.0,
 * §23.8 and Table 2-4). UTF-32 marks (FF FE 00 00, 00 00 FE FF) are refused with a message naming the
 * encoding. Without a mark, text whose first 4096 bytes hold NULs in at least 40 % of the odd (even)
 * byte positions and in at most 5 % of the others is read as UTF-16 LE (BE); everything else as UTF-8,
 * invalid sequences becoming U+FFFD and counted.
 * @param bytes the whole file
 * @returns the text (mark removed) and the encoding, or why it cannot be read
 * Source: The Unicode Standard 15.0, §3.9 (UTF-8, UTF-16 encoding forms), §23.8 (byte order mark).
 */
export function textDecode(bytes: Uint8Array): TextDecodeOutcome {
  const b = bytes;
  if (b.length >= 4 && b[0] === 0xff && b[1] === 0xfe && b[2] === 0 && b[3] === 0) return refuseUtf32('UTF-32 LE', 'FF FE 00 00');
  if (b.length >= 4 && b[0] === 0 && b[1] === 0 && b[2] === 0xfe && b[3] === 0xff) return refuseUtf32('UTF-32 BE', '00 00 FE FF');
  if (b.length >= 3 && b[0] === 0xef && b[1] === 0xbb && b[2] === 0xbf) return utf8(b.subarray(3), 3, 'byte-order mark');
  if (b.length >= 2 && b[0] === 0xff && b[1] === 0xfe) return utf16(b, 2, true, 'byte-order mark');
  if (b.length >= 2 && b[0] === 0xfe && b[1] === 0xff) return utf16(b, 2, false, 'byte-order mark');
  const guess = textGuessUtf16(b);
  if (guess) return utf16(b, 0, guess === 'UTF-16 LE', 'NUL bytes');
  return utf8(b, 0, 'default');
}

/**
 * Whether bytes without a byte-order mark look like UTF-16: many NUL bytes in every second position
 * and almost none in the others (see `textDecode`).
 * @returns the byte order, or undefined
 */
export function textGuessUtf16(bytes: Uint8Array): 'UTF-16 LE' | 'UTF-16 BE' | undefined {
  const pairs = Math.floor(Math.min(bytes.length, SNIFF_BYTES) / 2);
  if (pairs < 2) return undefined;
  let evenNul = 0;
  let oddNul = 0;
  for (let i = 0; i < pairs; i++) {
    if (bytes[2 * i] === 0) evenNul++;
    if (bytes[2 * i + 1] === 0) oddNul++;
  }
  if (oddNul >= TEXT_UTF16_NUL_SHARE * pairs && evenNul <= TEXT_UTF16_OTHER_NUL_SHARE * pairs) return 'UTF-16 LE';
  if (evenNul >= TEXT_UTF16_NUL_SHARE * pairs && oddNul <= TEXT_UTF16_OTHER_NUL_SHARE * pairs) return 'UTF-16 BE';
  return undefined;
}

/**
 * How the bytes were read, e.g. "the bytes were read as UTF-16 LE (its byte-order mark)".
 * @param decoded a successful `textDecode` outcome
 */
export function textDecodeHow(decoded: Extract<TextDecodeOutcome, { ok: true }>): string {
  const how =
    decoded.evidence === 'byte-order mark'
      ? 'its byte-order mark'
      : decoded.evidence === 'NUL bytes'
        ? 'NUL bytes in every second position, no byte-order mark'
        : 'no byte-order mark';
  return `the bytes were read as ${decoded.encoding} (${how})`;
}

/**
 * A clause for a file that decoded but could not be read as a trace, naming the encoding, e.g. "the
 * bytes were read as UTF-8 (no byte-order mark) and 37 byte sequences are not valid UTF-8, the first at
 * byte 0: is it a text file, or text in another encoding?"; undefined for clean UTF-8 (nothing to say).
 * @param decoded a successful `textDecode` outcome
 */
export function textDecodeNote(decoded: Extract<TextDecodeOutcome, { ok: true }>): string | undefined {
  const n = decoded.invalidCount;
  if (n > 0) {
    return (
      `${textDecodeHow(decoded)} and ${n} byte sequence${n === 1 ? ' is' : 's are'} not valid ${decoded.encoding}, ` +
      `the first at byte ${decoded.firstInvalidByte}: is it a text file, or text in another encoding?`
    );
  }
  return decoded.encoding !== 'UTF-8' ? textDecodeHow(decoded) : undefined;
}

function refuseUtf32(encoding: string, mark: string): TextDecodeOutcome {
  return {
    ok: false,
    encoding,
    message: `the file is ${encoding} text (byte-order mark ${mark}), which is not read; save it as UTF-8 or UTF-16`,
  };
}

function utf8(body: Uint8Array, offset: number, evidence: TextEncodingEvidence): TextDecodeOutcome {
  // ignoreBOM: a second mark after the first is content (U+FEFF), not to be eaten.
  const text = new Decoder('utf-8', { ignoreBOM: true }).decode(body);
  let invalidCount = 0;
  let firstInvalidByte = -1;
  // Only a text holding U+FFFD can have had invalid bytes; then locate them (the rare, slower path).
  if (text.indexOf('\uFFFD') >= 0) {
    const scan = utf8Invalid(body);
    invalidCount = scan.count;
    firstInvalidByte = scan.first < 0 ? -1 : scan.first + offset;
  }
  return { ok: true, text, encoding: 'UTF-8', evidence, invalidCount, firstInvalidByte };
}

/**
 * Invalid UTF-8 sequences: a byte that cannot start a sequence, or a start byte whose continuation
 * bytes are missing or out of range, counts once (Unicode 15.0, Table 3-7, well-formed byte sequences).
 */
function utf8Invalid(b: Uint8Array): { count: number; first: number } {
  let count = 0;
  let first = -1;
  const bad = (i: number) => {
    count++;
    if (first < 0) first = i;
  };
  for (let i = 0; i < b.length;) {
    const c = b[i];
    if (c < 0x80) {
      i++;
      continue;
    }
    let need: number;
    let lo = 0x80;
    let hi = 0xbf;
    if (c >= 0xc2 && c <= 0xdf) need = 1;
    else if (c >= 0xe0 && c <= 0xef) {
      need = 2;
      if (c === 0xe0) lo = 0xa0;
      if (c === 0xed) hi = 0x9f;
    } else if (c >= 0xf0 && c <= 0xf4) {
      need = 3;
      if (c === 0xf0) lo = 0x90;
      if (c === 0xf4) hi = 0x8f;
    } else {
      bad(i);
      i++;
      continue;
    }
    let k = 1;
    for (; k <= need && i + k < b.length; k++) {
      const d = b[i + k];
      if (k === 1 ? d < lo || d > hi : d < 0x80 || d > 0xbf) break;
    }
    if (k <= need) {
      bad(i);
      i += k;
    } else i += need + 1;
  }
  return { count, first };
}

/**
 * UTF-16 bytes (no mark, even length) to a string, unit by unit (lone surrogates kept): the fallback for a
 * platform without a UTF-16 TextDecoder.
 * @param body the bytes, two per code unit
 * @param isLittleEndian byte order
 * Source: The Unicode Standard 15.0, §3.9 (UTF-16 encoding form), §2.6 (encoding schemes).
 */
export function textUtf16Units(body: Uint8Array, isLittleEndian: boolean): string {
  const units = body.length >> 1;
  const codes = new Uint16Array(units);
  for (let i = 0, p = 0; i < units; i++, p += 2) codes[i] = isLittleEndian ? body[p] | (body[p + 1] << 8) : (body[p] << 8) | body[p + 1];
  const CHUNK = 8192;
  const parts: string[] = [];
  for (let i = 0; i < units; i += CHUNK) parts.push(String.fromCharCode(...codes.subarray(i, i + CHUNK)));
  return parts.join('');
}

function utf16(b: Uint8Array, offset: number, isLittleEndian: boolean, evidence: TextEncodingEvidence): TextDecodeOutcome {
  const units = Math.floor((b.length - offset) / 2);
  const body = b.subarray(offset, offset + 2 * units);
  let text: string;
  try {
    // The platform decoder is ~15× faster than building the string here (Chromium, Firefox and Node all have it).
    text = new Decoder(isLittleEndian ? 'utf-16le' : 'utf-16be', { ignoreBOM: true }).decode(body);
  } catch {
    text = textUtf16Units(body, isLittleEndian);
  }
  // A lone last byte cannot be half of a 16-bit unit: count it and show it as U+FFFD.
  const isOdd = (b.length - offset) % 2 === 1;
  if (isOdd) text += '\uFFFD';
  return {
    ok: true,
    text,
    encoding: isLittleEndian ? 'UTF-16 LE' : 'UTF-16 BE',
    evidence,
    invalidCount: isOdd ? 1 : 0,
    firstInvalidByte: isOdd ? b.length - 1 : -1,
  };
}
