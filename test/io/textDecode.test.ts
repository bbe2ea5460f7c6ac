import { describe, expect, it } from 'vitest';
import { textDecode, textDecodeHow, textDecodeNote, textGuessUtf16, textUtf16Units } from '../../src/io/textDecode';

/** UTF-16 code units of a string as bytes (the test's own encoder, so the decoder is not checked against itself). */
function utf16(text: string, isLittleEndian: boolean): number[] {
  const out: number[] = [];
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (isLittleEndian) out.push(c & 0xff, c >> 8);
    else out.push(c >> 8, c & 0xff);
  }
  return out;
}
const bytes = (list: number[]) => Uint8Array.from(list);
const ok = (b: Uint8Array) => {
  const r = textDecode(b);
  if (!r.ok) throw new Error(r.message);
  return r;
};

describe('textDecode', () => {
  it('reads empty input as empty UTF-8 text', () => {
    expect(ok(bytes([]))).toMatchObject({ text: '', encoding: 'UTF-8', evidence: 'default', invalidCount: 0, firstInvalidByte: -1 });
  });

  // Byte-order marks: The Unicode Standard 15.0, §23.8 "Specials", Table 2-4: UTF-8 EF BB BF,
  // UTF-16 BE FE FF, UTF-16 LE FF FE, UTF-32 BE 00 00 FE FF, UTF-32 LE FF FE 00 00.
  it('removes a UTF-8 byte-order mark and names it', () => {
    const r = ok(bytes([0xef, 0xbb, 0xbf, 0x31, 0x2c, 0x32]));
    expect(r).toMatchObject({ text: '1,2', encoding: 'UTF-8', evidence: 'byte-order mark' });
  });

  it('keeps a second U+FEFF after the mark as text (only the first is a mark)', () => {
    expect(ok(bytes([0xef, 0xbb, 0xbf, 0xef, 0xbb, 0xbf, 0x31])).text).toBe('\uFEFF1');
  });

  it('decodes UTF-16 LE and BE after their marks, non-ASCII included', () => {
    // µ is U+00B5, € is U+20AC, 𝜈 (U+1D708) is the surrogate pair D835 DF08 (Unicode 15.0, §3.9, D91).
    const text = 'x (µm),€,𝜈\n1,2\n';
    const le = ok(bytes([0xff, 0xfe, ...utf16(text, true)]));
    expect(le).toMatchObject({ text, encoding: 'UTF-16 LE', evidence: 'byte-order mark', invalidCount: 0 });
    const be = ok(bytes([0xfe, 0xff, ...utf16(text, false)]));
    expect(be).toMatchObject({ text, encoding: 'UTF-16 BE', evidence: 'byte-order mark', invalidCount: 0 });
  });

  it('counts a lone last byte of UTF-16 as one invalid sequence at its offset', () => {
    const r = ok(bytes([0xff, 0xfe, 0x31, 0x00, 0x32]));
    expect(r).toMatchObject({ text: '1\uFFFD', invalidCount: 1, firstInvalidByte: 4 });
  });

  it('refuses UTF-32 with a message naming it', () => {
    const le = textDecode(bytes([0xff, 0xfe, 0, 0, 0x31, 0, 0, 0]));
    expect(le).toEqual({
      ok: false,
      encoding: 'UTF-32 LE',
      message: 'the file is UTF-32 LE text (byte-order mark FF FE 00 00), which is not read; save it as UTF-8 or UTF-16',
    });
    const be = textDecode(bytes([0, 0, 0xfe, 0xff, 0, 0, 0, 0x31]));
    expect(be.ok ? '' : be.encoding).toBe('UTF-32 BE');
  });

  it('reads UTF-16 without a mark from its NUL bytes, in either byte order', () => {
    const text = 'wavenumber,absorbance\n1000,0.1\n';
    expect(ok(bytes(utf16(text, true)))).toMatchObject({ text, encoding: 'UTF-16 LE', evidence: 'NUL bytes' });
    expect(ok(bytes(utf16(text, false)))).toMatchObject({ text, encoding: 'UTF-16 BE', evidence: 'NUL bytes' });
  });

  it('does not take a UTF-8 file with a few NUL bytes for UTF-16', () => {
    const r = ok(new TextEncoder().encode('wavenumber,absorbance\n1000,\u00000.1\n1001,0.2\n'));
    expect(r.encoding).toBe('UTF-8');
  });

  // Well-formed UTF-8: The Unicode Standard 15.0, §3.9, Table 3-7. C0 80 is an overlong form, ED A0 80 a
  // surrogate, F4 90 80 80 is above U+10FFFF, a lone 80 or B5 a continuation byte without a lead.
  it.each([
    [[0x31, 0xc0, 0x80, 0x32], 1],
    [[0x31, 0xed, 0xa0, 0x80], 1],
    [[0xf4, 0x90, 0x80, 0x80], 0],
    [[0x41, 0x42, 0xb5], 2],
    [[0xe2, 0x82], 0],
  ])('finds the first invalid UTF-8 sequence of %j at byte %i', (list, first) => {
    const r = ok(bytes(list));
    expect(r.encoding).toBe('UTF-8');
    expect(r.invalidCount).toBeGreaterThanOrEqual(1);
    expect(r.firstInvalidByte).toBe(first);
  });

  it('accepts valid multi-byte UTF-8 without counting anything (µ C2 B5, € E2 82 AC, 𝜈 F0 9D 9C 88)', () => {
    // Encodings from the Unicode Standard 15.0, §3.9, Table 3-6 (bit distribution), for the code points above.
    const r = ok(bytes([0xc2, 0xb5, 0xe2, 0x82, 0xac, 0xf0, 0x9d, 0x9c, 0x88]));
    expect(r).toMatchObject({ text: 'µ€𝜈', invalidCount: 0, firstInvalidByte: -1 });
  });

  it('counts a genuine U+FFFD (EF BF BD) in the file as valid', () => {
    expect(ok(bytes([0xef, 0xbf, 0xbd]))).toMatchObject({ text: '\uFFFD', invalidCount: 0 });
  });

  it('offsets the first invalid byte by the mark it removed', () => {
    expect(ok(bytes([0xef, 0xbb, 0xbf, 0x31, 0xff])).firstInvalidByte).toBe(4);
  });
});

describe('textUtf16Units (the fallback decoder)', () => {
  it('gives what the platform decoder gives, in both byte orders, across its 8192-unit chunks', () => {
    const text = 'x (µm),€,𝜈\n'.repeat(2000);
    expect(textUtf16Units(bytes(utf16(text, true)), true)).toBe(text);
    expect(textUtf16Units(bytes(utf16(text, false)), false)).toBe(text);
    expect(textUtf16Units(bytes([]), true)).toBe('');
  });
});

describe('textGuessUtf16', () => {
  it('needs at least two 16-bit units', () => {
    expect(textGuessUtf16(bytes([0x31, 0x00]))).toBeUndefined();
  });
  it('leaves random-looking bytes alone (NULs in both positions)', () => {
    expect(textGuessUtf16(bytes([0, 0, 0, 0, 0x31, 0x32, 0, 0]))).toBeUndefined();
  });
});

describe('textDecodeHow, textDecodeNote', () => {
  it('says how the bytes were read and what was wrong with them', () => {
    const le = ok(bytes(utf16('1,2\n3,4\n', true)));
    expect(textDecodeHow(le)).toBe('the bytes were read as UTF-16 LE (NUL bytes in every second position, no byte-order mark)');
    expect(textDecodeNote(ok(bytes([0x31, 0x32])))).toBeUndefined();
    expect(textDecodeNote(ok(bytes([0x31, 0xff, 0xfe, 0x32])))).toBe(
      'the bytes were read as UTF-8 (no byte-order mark) and 2 byte sequences are not valid UTF-8, the first at byte 1: is it a text file, or text in another encoding?',
    );
  });
});
