/**
 * The hostile-file catalogue (test/fixtures/hostile/, listed in its README.md): every file ends with its
 * expected outcome: a refusal with exactly the message below, or data with the note below. The messages
 * are golden text reviewed by hand (changes show up in `git diff`); each must also be one line and name the
 * file and, where there is one, the line. Files that claim huge sizes must be refused without the
 * allocation they ask for.
 */
import { readFileSync, readdirSync } from 'node:fs';
import { afterAll, describe, expect, it } from 'vitest';
import { importTrace } from '../../src/io/traceImport';
import { importTraceBytes } from '../../src/io/traceImportBytes';
import { traceImportWarnings } from '../../src/io/traceImportWarnings';
import { lineTableParse } from '../../src/io/lineTable';
import { modelFileParse, ModelFileError } from '../../src/io/modelFile';
import { projectFileParse } from '../../src/io/projectFile';
import { assignmentCheck } from '../../src/fit/assignment';
import { INPUT_LIMITS } from '../../src/io/inputLimits';
import { HANG_LIMIT_MS, countInput, countsPrint, expectGoodMessage, timed } from './reliabilityHarness';

afterAll(() => countsPrint('hostileFiles.test.ts'));

const DIR = new URL('../fixtures/hostile/', import.meta.url);
const read = (name: string) => readFileSync(new URL(name, DIR), 'utf8');

/** Import a hostile trace with the hang guard. */
function trace(name: string, text = read(name)) {
  countInput('importTrace');
  const run = timed(() => importTrace(text, name));
  if (!run.ok) throw run.error;
  expect(run.ms).toBeLessThan(HANG_LIMIT_MS);
  return run.value;
}

/** Refused traces and their messages (the file name starts every message). */
const TRACE_REFUSALS: [string, string, number?][] = [
  ['empty.csv', 'empty.csv: the file is empty'],
  ['whitespace-only.csv', 'whitespace-only.csv: the file is empty'],
  ['png-header.png', 'png-header.png: no numeric data rows found'],
  ['random-bytes.bin', 'random-bytes.bin: no numeric data rows found'],
  [
    'truncated-mid-data.jdx',
    'truncated-mid-data.jdx: line 13: ##NPOINTS=20 (line 10) but the data table (lines 12–13) holds 8 points; the file ends at line 13 without ##END= (truncated?)',
    13,
  ],
  ['asdf-bad-char.jdx', "asdf-bad-char.jdx: line 13, column 7: unexpected character 'w' in compressed (ASDF) data", 13],
  [
    'dif-check-fail.jdx',
    'dif-check-fail.jdx: line 14: DIF y-check failed: the first ordinate 143 should repeat the last ordinate 142 of line 13',
    14,
  ],
  ['npoints-2e9.jdx', 'npoints-2e9.jdx: line 10: ##NPOINTS=2000000000 is above the limit of 50000000 points (maxPoints)', 10],
  [
    'dup-billion.jdx',
    'dup-billion.jdx: line 11: the compressed data expand to more than 1000000 points, over 1000 points per character of the file (limit jcampMaxPointsPerChar); a measured spectrum does not compress this far, so the file is damaged or not a spectrum',
    11,
  ],
  [
    'dup-bomb.jdx',
    'dup-bomb.jdx: line 11: the compressed data expand to more than 1000000 points, over 1000 points per character of the file (limit jcampMaxPointsPerChar); a measured spectrum does not compress this far, so the file is damaged or not a spectrum',
    11,
  ],
  [
    'label-100k.jdx',
    "label-100k.jdx: line 10: ##YFACTOR= '0.001 junkjunkjunkjunkjunkjunkjunkjunkjunkjunkjunkjunkjunkju…' is not a number",
    10,
  ],
  [
    'xunits-hz-script.jdx',
    'xunits-hz-script.jdx: line 4: ##XUNITS=<script>alert(1)</script> is not an infrared abscissa unit (expected 1/CM, MICROMETERS or NANOMETERS); set the xUnit option to override',
    4,
  ],
  ['all-nan.csv', 'all-nan.csv: no numeric data rows found (4 rows skipped: lines 2, 3, 4, 5 (NaN/Infinity))'],
  [
    'mixed-decimals.csv',
    "mixed-decimals.csv: mixed decimal separators: line 2 uses a decimal comma and line 4 uses a decimal point; set the decimal option to ',' or '.' to choose",
    4,
  ],
  [
    'nul-bytes.csv',
    'nul-bytes.csv: only 1 usable data point (line 2); at least 2 are needed (3 rows skipped: lines 3, 4, 5 (non-numeric))',
    2,
  ],
  [
    'unclosed-quote.csv',
    'unclosed-quote.csv: line 2: a double quote opened on this line is never closed, so the rest of the file would read as one field',
    2,
  ],
];

describe('hostile traces that must be refused', () => {
  it.each(TRACE_REFUSALS)('%s', (name, message, line) => {
    const r = trace(name);
    if (r.ok) throw new Error(`${name} was accepted`);
    expect(r.error.message).toBe(message);
    expect(r.error.line).toBe(line);
    expectGoodMessage(r.error.message, { prefix: `${name}: `, line });
  });

  it.each(['npoints-2e9.jdx', 'dup-billion.jdx', 'dup-bomb.jdx'])('refuses %s without allocating what it claims', (name) => {
    // 2e9 or 1e9 points would be 16–32 GB of Float64Array; the refusal must come before any of it.
    // Tolerance 64 MB: other allocations of the run (the text, small builders) stay far below it.
    const before = process.memoryUsage().arrayBuffers;
    const r = trace(name);
    const grown = process.memoryUsage().arrayBuffers - before;
    expect(r.ok).toBe(false);
    expect(grown).toBeLessThan(64 * 2 ** 20);
  });
});

describe('hostile traces that are still usable, with what was done said in the report', () => {
  it('truncated-no-end.jdx: all 20 points, with a note that ##END= is missing', () => {
    const r = trace('truncated-no-end.jdx');
    if (!r.ok) throw new Error(r.error.message);
    expect(r.report.points).toBe(20);
    expect(r.report.messages).toContain('no ##END= label after the data (file ends at line 16); the file may be truncated');
    // Ordinates of the DIFDUP table × YFACTOR 0.001 (values written by generate.mjs).
    const y20 = [100, 101, 103, 106, 110, 115, 115, 115, 117, 120, 124, 129, 135, 142, 140, 137, 133, 128, 122, 115];
    expect(Array.from(r.trace.absorbance)).toEqual(y20.map((v) => v * 0.001));
  });

  it('nan-infinity.csv: NaN, Infinity, -inf and 1e999 rows skipped and listed by line', () => {
    const r = trace('nan-infinity.csv');
    if (!r.ok) throw new Error(r.error.message);
    expect(Array.from(r.trace.wavenumberCm1)).toEqual([1000, 1003, 1003.5]);
    expect(r.report.messages).toContain('5 rows skipped, not finite numbers (NaN or Infinity), at lines 3, 4, 5, 6, 7');
  });

  it('duplicate-x.csv: the first of each repeated abscissa is kept, the others listed', () => {
    const r = trace('duplicate-x.csv');
    if (!r.ok) throw new Error(r.error.message);
    expect(Array.from(r.trace.wavenumberCm1)).toEqual([1000, 1000.5, 1001, 1001.5]);
    expect(Array.from(r.trace.absorbance)).toEqual([0.1, 0.2, 0.3, 0.4]);
    expect(r.report.messages).toContain(
      '2 rows skipped, x repeated from an earlier row (the first row of each x is kept; y differs from the row kept in 2 of 2), at lines 4, 6',
    );
  });

  it('descending-gap.csv: stored ascending, the gap kept (not filled), the reversal reported', () => {
    const r = trace('descending-gap.csv');
    if (!r.ok) throw new Error(r.error.message);
    expect(Array.from(r.trace.wavenumberCm1)).toEqual([1002, 1002.5, 1003, 1009, 1009.5, 1010]);
    expect(Array.from(r.trace.absorbance)).toEqual([0.22, 0.21, 0.2, 0.12, 0.11, 0.1]);
    expect(r.report.wasDescending).toBe(true);
    expect(r.report.messages).toContain('the axis ran from high to low in the file; it is stored ascending');
  });

  it('bom-cr-only.csv: a BOM and old-Mac CR line ends read like any CSV', () => {
    const r = trace('bom-cr-only.csv');
    if (!r.ok) throw new Error(r.error.message);
    expect(Array.from(r.trace.wavenumberCm1)).toEqual([1000, 1001, 1002]);
    expect(r.report.columnNames).toEqual(['wavenumber', 'absorbance']);
  });

  it('huge-exponents.csv: 1e309 and a 400-digit number overflow to Infinity and are skipped; 1e-400 reads as 0, -0 as −0', () => {
    // IEEE 754 binary64: largest finite 1.797…e308, smallest subnormal 4.9e-324 (IEEE Std 754-2019).
    const r = trace('huge-exponents.csv');
    if (!r.ok) throw new Error(r.error.message);
    expect(Array.from(r.trace.wavenumberCm1)).toEqual([1000, 1002, 1003, 1005]);
    expect(Array.from(r.trace.absorbance)).toEqual([1e308, 0, -0, 0.5]);
    expect(r.report.messages).toContain('2 rows skipped, not finite numbers (NaN or Infinity), at lines 3, 6');
  });

  it('keeps a file name holding HTML verbatim in the message (the page escapes it, the importer does not)', () => {
    const name = '<img src=x onerror=alert(1)>.csv';
    const r = trace(name, '');
    if (r.ok) throw new Error('accepted');
    expect(r.error.message).toBe(`${name}: the file is empty`);
    // A line break in a name is escaped so the message stays one line.
    const r2 = trace('a\nb.csv', '');
    expect(r2.ok ? '' : r2.error.message).toBe('a\\u000ab.csv: the file is empty');
  });
});

/**
 * Import warnings: one per kind of problem, with its count and first lines, in the words of
 * traceImportWarnings (the page and the CLI show exactly these); the data stay usable.
 */
const TRACE_WARNINGS: [string, string[], number][] = [
  ['nan-rows.csv', ['6 rows skipped, not finite numbers (NaN or Infinity), at lines 102, 103, 1501, 2401, 3334, 4001'], 4994],
  ['text-in-numbers.csv', ["3 rows skipped, text where a number belongs (e.g. 'abc' on line 57), at lines 57, 420, 777"], 997],
  ['flat-trace.csv', ['the trace is flat: all 5000 points have the same value (absorbance 0.25), so no peaks can be found in it'], 5000],
  [
    'random-order-repeats.csv',
    [
      '200 rows skipped, x repeated from an earlier row (the first row of each x is kept; y differs from the row kept in 200 of 200), at lines 92, 111, 182, 210, 233, 238, 257, 262, 263, 268 and 190 more',
      'the axis is not monotonic (first reversal at line 5); points were sorted by wavenumber',
    ],
    1000,
  ],
];

describe('hostile traces that read with warnings', () => {
  it.each(TRACE_WARNINGS)('%s', (name, warnings, points) => {
    const r = trace(name);
    if (!r.ok) throw new Error(r.error.message);
    expect(traceImportWarnings(r.report)).toEqual(warnings);
    expect(r.report.points).toBe(points);
    // The panel lists the same words among the report's notes.
    for (const w of warnings) expect(r.report.messages).toContain(w);
    for (const w of warnings) expectGoodMessage(w);
  });

  it('random-order-repeats.csv: stored strictly ascending, the first row of each repeated x kept', () => {
    const r = trace('random-order-repeats.csv');
    if (!r.ok) throw new Error(r.error.message);
    const x = r.trace.wavenumberCm1;
    for (let i = 1; i < x.length; i++) expect(x[i]).toBeGreaterThan(x[i - 1]);
    // Which of the two rows of a repeated x comes first is fixed by the seeded shuffle: read it from the file.
    const rows = read('random-order-repeats.csv').trim().split('\n').slice(1);
    const first = new Map<string, number>();
    for (const row of rows) {
      const [xs, ys] = row.split(',');
      if (!first.has(xs)) first.set(xs, Number(ys));
    }
    for (let i = 0; i < x.length; i++) expect(r.trace.absorbance[i]).toBe(first.get(x[i].toFixed(2)));
  });
});

/** A small trace in the given text, as bytes of an encoding (the tests write their own encoded fixtures). */
const SMALL_TRACE = 'wavenumber,absorbance\n1000.0,0.10\n1000.5,0.30\n1001.0,0.12\n';
function utf16Bytes(text: string, isLittleEndian: boolean, hasBom: boolean): Uint8Array {
  const units = (hasBom ? '\uFEFF' : '') + text;
  const out = new Uint8Array(units.length * 2);
  for (let i = 0; i < units.length; i++) {
    const c = units.charCodeAt(i);
    out[2 * i + (isLittleEndian ? 0 : 1)] = c & 0xff;
    out[2 * i + (isLittleEndian ? 1 : 0)] = c >> 8;
  }
  return out;
}

describe('hostile encodings (importTraceBytes; fixtures written by the test)', () => {
  // Byte-order marks: Unicode Standard 15.0, §23.8 and Table 2-4 (UTF-8 EF BB BF, UTF-16 BE FE FF, UTF-16 LE FF FE).
  it.each([
    ['utf16le-bom.csv', utf16Bytes(SMALL_TRACE, true, true), 'the bytes were read as UTF-16 LE (its byte-order mark)'],
    ['utf16be-bom.csv', utf16Bytes(SMALL_TRACE, false, true), 'the bytes were read as UTF-16 BE (its byte-order mark)'],
    [
      'utf16le-no-bom.csv',
      utf16Bytes(SMALL_TRACE, true, false),
      'the bytes were read as UTF-16 LE (NUL bytes in every second position, no byte-order mark)',
    ],
    [
      'utf16be-no-bom.csv',
      utf16Bytes(SMALL_TRACE, false, false),
      'the bytes were read as UTF-16 BE (NUL bytes in every second position, no byte-order mark)',
    ],
  ])('%s reads as the same trace, with a note naming the encoding', (name, bytes, note) => {
    countInput('importTraceBytes');
    const r = importTraceBytes(bytes, name);
    if (!r.ok) throw new Error(r.error.message);
    expect(Array.from(r.trace.wavenumberCm1)).toEqual([1000, 1000.5, 1001]);
    expect(Array.from(r.trace.absorbance)).toEqual([0.1, 0.3, 0.12]);
    expect(r.report.columnNames).toEqual(['wavenumber', 'absorbance']);
    expect(r.report.messages[0]).toBe(note);
    expect(traceImportWarnings(r.report)).toEqual([]);
  });

  it('utf8-bom.csv reads with no note and no warning', () => {
    const bytes = new Uint8Array([0xef, 0xbb, 0xbf, ...new TextEncoder().encode(SMALL_TRACE)]);
    const r = importTraceBytes(bytes, 'utf8-bom.csv');
    if (!r.ok) throw new Error(r.error.message);
    expect(r.report.encoding).toBe('UTF-8');
    expect(r.report.columnNames).toEqual(['wavenumber', 'absorbance']);
    expect(r.report.messages.some((m) => /bytes were read/.test(m))).toBe(false);
    expect(traceImportWarnings(r.report)).toEqual([]);
  });

  it('utf32le-bom.csv is refused with a message naming the encoding', () => {
    const bytes = new Uint8Array([0xff, 0xfe, 0, 0, 0x31, 0, 0, 0]);
    const r = importTraceBytes(bytes, 'utf32le-bom.csv');
    expect(r.ok ? '' : r.error.message).toBe(
      'utf32le-bom.csv: the file is UTF-32 LE text (byte-order mark FF FE 00 00), which is not read; save it as UTF-8 or UTF-16',
    );
  });

  it('latin1-header.csv (µ as the single byte B5) reads, with a warning naming the byte', () => {
    // ISO 8859-1 puts µ at B5; in UTF-8 a lone B5 is a continuation byte with no lead (invalid).
    const text = 'wavenumber (cm-1),absorbance (\u00b5)\n1000,0.1\n1001,0.2\n';
    const bytes = Uint8Array.from(text, (c) => c.charCodeAt(0));
    const r = importTraceBytes(bytes, 'latin1-header.csv');
    if (!r.ok) throw new Error(r.error.message);
    expect(traceImportWarnings(r.report)).toEqual([
      '1 byte sequence is not valid UTF-8 (the first at byte 30) and read as the replacement character U+FFFD',
    ]);
  });

  it('random-bytes.bin, read from its bytes, is refused with how the bytes were read', () => {
    const bytes = new Uint8Array(readFileSync(new URL('random-bytes.bin', DIR)));
    const r = importTraceBytes(bytes, 'random-bytes.bin');
    expect(r.ok ? '' : r.error.message).toBe(
      'random-bytes.bin: no numeric data rows found; the bytes were read as UTF-8 (no byte-order mark) and 222 byte sequences are not valid UTF-8, the first at byte 1: is it a text file, or text in another encoding?',
    );
  });
});

describe('one enormous line (generated by the test: 50 MB is not committed)', () => {
  it('a 50,000,000-character file with no line break says so, with the length of line 1', () => {
    // "x,y," repeated: one row of ten million fields; only its first two make a point.
    const unit = '1000.000,0.1234,';
    const text = unit.repeat(50_000_000 / unit.length);
    expect(text.length).toBe(50_000_000);
    const r = importTrace(text.replaceAll(',', ' '), 'one-line.txt');
    expect(r.ok ? '' : r.error.message).toBe(
      'one-line.txt: only 1 usable data point (line 1); at least 2 are needed; line 1 is 50,000,000 characters long and the file has no line breaks (a trace needs one line per point)',
    );
  });

  it('a header line and one 26,000-character data line: fewer line breaks than the data need', () => {
    const text = 'wavenumber,absorbance\n' + Array.from({ length: 2000 }, (_, i) => `${1000 + i},0.12345,`).join('');
    const r = importTrace(text, 'two-lines.csv');
    if (r.ok) throw new Error('accepted');
    expect(r.error.message).toMatch(
      /^two-lines\.csv: only 1 usable data point \(line 2\); at least 2 are needed; line 2 is [\d,]+ characters long and the file has only 1 line break \(a trace needs one line per point\)$/,
    );
    expectGoodMessage(r.error.message, { prefix: 'two-lines.csv: ', line: 2 });
  });
});

describe('hostile line tables', () => {
  it.each([
    ['lines-negative-j.csv', "lines-negative-j.csv: line 3: J_up '-1' must be >= 0"],
    ['lines-j-1e12.csv', "lines-j-1e12.csv: line 3: J_up '1e12' is above the largest J or K handled (2000)"],
    ['lines-non-integer.csv', "lines-non-integer.csv: line 3: J_up '2.5' is not a whole number"],
    ['lines-hex-wavenumber.csv', "lines-hex-wavenumber.csv: line 2: wavenumber '0x3E9' is not a number (cm^-1)"],
    ['lines-infinite-sigma.csv', "lines-infinite-sigma.csv: line 2: uncertainty 'Infinity' must be a number > 0 (cm^-1)"],
  ])('%s is refused by the reader', (name, message) => {
    countInput('lineTableParse');
    expect(() => lineTableParse(read(name), { fileName: name })).toThrow(message);
    try {
      lineTableParse(read(name), { fileName: name });
    } catch (err) {
      expectGoodMessage((err as Error).message, { prefix: `${name}: ` });
    }
  });

  it.each([
    ['lines-k-gt-j.csv', 'K_up=5 exceeds J_up=3 (K <= J is required)'],
    ['lines-delta-k-2.csv', 'ΔK = 2 is not allowed in a perpendicular band (only ΔK = ±1)'],
  ])('%s reads, and its second row is refused by assignmentCheck for a perpendicular band', (name, reason) => {
    // K ≤ J and ΔK = ±1 for a perpendicular band of a symmetric top (Herzberg, Infrared and Raman
    // Spectra, 1945, ch. IV; from memory); whether ΔK is allowed depends on the band, so the reader keeps it.
    countInput('lineTableParse');
    const t = lineTableParse(read(name), { fileName: name });
    const model = { band: 'perpendicular', shape: 'prolate' } as const;
    expect(t.assignments.map((a) => assignmentCheck(a, model))).toEqual([null, reason]);
  });

  it('assignmentCheck refuses J above the largest model jMax even when the rest of the line is allowed', () => {
    const model = { band: 'parallel', shape: 'prolate' } as const;
    const q = (j: number) => ({ jUpper: j + 1, kUpper: 1, jLower: j, kLower: 1 });
    expect(assignmentCheck(q(INPUT_LIMITS.maxQuantumJ - 1), model)).toBeNull();
    expect(assignmentCheck(q(INPUT_LIMITS.maxQuantumJ), model)).toBe('J_up=2001 is above the largest J handled (2000)');
    expect(assignmentCheck(q(1e12), model)).toBe('J_up=1000000000001 is above the largest J handled (2000)');
  });
});

describe('hostile model files', () => {
  const refusal = (text: string): string => {
    countInput('modelFileParse');
    try {
      modelFileParse(text);
    } catch (err) {
      expect(err).toBeInstanceOf(ModelFileError);
      expectGoodMessage((err as Error).message, { prefix: 'model file' });
      return (err as Error).message;
    }
    throw new Error('accepted');
  };

  it.each([
    ['model-wrong-types.json', `model file: field 'temperature' is the string "296 K"; expected a number`],
    ['model-missing-fields.json', `model file: field 'band' is missing; expected one of "parallel", "perpendicular"`],
    [
      'model-oblate-with-a.json',
      `model file: field 'lower.A' is not a lower-state constant of an oblate model (an oblate top gives "C" in place of "A"); expected one of B, C, DJ, DJK, DK, HJ, HJK, HKJ, HK`,
    ],
    ['model-deep-junk.json', 'model file is nested more than 200 levels deep at line 9 (limit maxJsonDepth)'],
    [
      'model-not-json.json',
      `model file is not valid JSON at line 4, column 3: Expected ',' or '}' after property value in JSON at position 47`,
    ],
    [
      'model-nan-literal.json',
      `model file is not valid JSON at line 1, column 57: Unexpected token 'N', ..."r": {"B": NaN}}\\u000a" is not valid JSON`,
    ],
  ])('%s', (name, message) => {
    expect(refusal(read(name))).toBe(message);
  });

  it('model-deep-unknown-field.json reads, with a warning naming the ignored field', () => {
    countInput('modelFileParse');
    expect(modelFileParse(read('model-deep-unknown-field.json')).warnings).toEqual(["model file: unknown top-level field 'junk' ignored"]);
  });

  it('a model with 1e6 spin weights (2 MB, made here, not stored) is refused by length', () => {
    const model = JSON.parse(read('model-wrong-types.json')) as Record<string, unknown>;
    Object.assign(model, { temperature: 296, jMax: 12, spinWeights: Array<number>(1e6).fill(1) });
    expect(refusal(JSON.stringify(model))).toBe(`model file: field 'spinWeights' is an array; expected a list with <= 2001 entries`);
  });

  it('a trace picked as a model file is refused at its first character, and a 12 MB text by length', () => {
    expect(refusal(read('nan-infinity.csv'))).toMatch(/^model file is not valid JSON at line 1, column 1: /);
    expect(refusal(' '.repeat(12_000_000))).toBe(
      'model file: the text is 12000000 characters long, above the limit of 10000000 characters (maxModelFileChars); is this really a model file?',
    );
  });
});

describe('hostile project files', () => {
  const parse = (name: string) => {
    countInput('projectFileParse');
    return projectFileParse(read(name));
  };
  it('project-newer-version.json is refused with advice', () => {
    const r = parse('project-newer-version.json');
    expect(r.ok ? '' : r.message).toBe(
      'project file: version 3 was written by a newer Ladder Bench (9.0.0); this one reads versions up to 2. Open it with the newer version, or export the model file and line table from there and open those here.',
    );
  });
  it('project-no-model.json is refused naming session.model', () => {
    const r = parse('project-no-model.json');
    expect(r.ok ? '' : r.message).toBe("project file: field 'session.model' is missing");
  });
  it('project-missing-fields.json reads the model and names each missing field', () => {
    const r = parse('project-missing-fields.json');
    if (!r.ok) throw new Error(r.message);
    expect(Object.keys(r.session)).toEqual(['model']);
    expect(r.messages).toHaveLength(17);
    expect(r.messages).toContain("field 'session.assignments' is missing; the default is used");
  });
  it('project-extra-fields.json ignores the unknown fields, says so, and keeps the known ones', () => {
    const r = parse('project-extra-fields.json');
    if (!r.ok) throw new Error(r.message);
    expect(r.session.peakMinSnr).toBe(5);
    expect(r.messages.slice(0, 2)).toEqual(["unknown top-level field 'extra' ignored", "unknown field 'session.colour' ignored"]);
  });
  it('project-nan-trace.json drops the trace with a reason instead of loading NaN', () => {
    const r = parse('project-nan-trace.json');
    if (!r.ok) throw new Error(r.message);
    expect(r.session.trace).toBeUndefined();
    expect(r.messages).toContain('session.trace: point 1 is not finite (1001 cm^-1, absorbance NaN); the trace was not loaded');
  });
  it('project-big-j.json does not load an assignment with J = 1e12', () => {
    const r = parse('project-big-j.json');
    if (!r.ok) throw new Error(r.message);
    expect(r.session.assignments).toEqual([]);
    expect(r.messages.join('\n')).toMatch(/1 of 1 assignments were not loaded: session.assignments\[0\] \(jUpper/);
  });
});

describe('the catalogue', () => {
  it('README.md lists every file of the folder', () => {
    const readme = read('README.md');
    for (const f of readdirSync(DIR)) if (f !== 'README.md') expect(readme, f).toContain(`\`${f}\``);
  });
});
