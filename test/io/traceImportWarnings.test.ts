import { describe, expect, it } from 'vitest';
import type { TraceImportIssue } from '../../src/io/trace';
import { importTrace, traceLongLineNote } from '../../src/io/traceImport';
import { importTraceBytes } from '../../src/io/traceImportBytes';
import { traceImportWarnings, traceIssueText } from '../../src/io/traceImportWarnings';
import { TraceSkipLog } from '../../src/io/traceSkipLog';

const load = (text: string) => {
  const r = importTrace(text, 't.csv');
  if (!r.ok) throw new Error(r.error.message);
  return r.report;
};
const csv = (rows: string[]) => ['x,y', ...rows].join('\n') + '\n';

describe('traceIssueText', () => {
  it('words each kind with its count and lines', () => {
    const skipped: TraceImportIssue = { kind: 'skipped', reason: 'NaN/Infinity', noun: 'row', count: 1, lines: [7], lineCount: 1 };
    expect(traceIssueText(skipped)).toBe('1 row skipped, not finite numbers (NaN or Infinity), at line 7');
    expect(traceIssueText({ kind: 'skipped', reason: "invalid value '?'", noun: 'point', count: 3, lines: [12], lineCount: 1 })).toBe(
      "3 points skipped, missing values ('?'), at line 12",
    );
    expect(traceIssueText({ kind: 'flat', points: 2, absorbance: 0 })).toBe(
      'the trace is flat: all 2 points have the same value (absorbance 0), so no peaks can be found in it',
    );
    // T = 1e-6 ↔ A = −log10(1e-6) = 6 (IUPAC Gold Book, "absorbance").
    expect(traceIssueText({ kind: 'clamped', count: 2, lines: [3, 4], transmittance: 1e-6 })).toBe(
      '2 points with transmittance ≤ 0 clamped to T = 0.000001 (A = 6): lines 3, 4',
    );
    expect(traceIssueText({ kind: 'undecodable', encoding: 'UTF-8', count: 2, firstByte: 9 })).toBe(
      '2 byte sequences are not valid UTF-8 (the first at byte 9) and read as the replacement character U+FFFD',
    );
  });

  it('counts lines past the first ten', () => {
    const lines = Array.from({ length: 20 }, (_, i) => 2 * i + 3);
    const issue: TraceImportIssue = { kind: 'skipped', reason: 'non-numeric', noun: 'row', count: 25, lines, lineCount: 25 };
    expect(traceIssueText(issue)).toBe(
      '25 rows skipped, text where a number belongs, at lines 3, 5, 7, 9, 11, 13, 15, 17, 19, 21 and 15 more',
    );
  });
});

describe('traceImportWarnings on imported text', () => {
  it('gives none for a clean trace, and none for a report saved before issues existed', () => {
    expect(traceImportWarnings(load(csv(['1000,0.1', '1001,0.2', '1002,0.1'])))).toEqual([]);
    expect(traceImportWarnings({})).toEqual([]);
  });

  it('gives one line per kind, in the order the kinds were met', () => {
    const report = load(csv(['1000,0.1', '1001,abc', '1002,NaN', '1003,0.3', 'n/a,0.2', '1004,-inf', '1005,0.2']));
    expect(traceImportWarnings(report)).toEqual([
      "2 rows skipped, text where a number belongs (e.g. 'abc' on line 3), at lines 3, 6",
      '2 rows skipped, not finite numbers (NaN or Infinity), at lines 4, 7',
    ]);
    expect(report.skipped).toEqual({ count: 4, lines: [3, 4, 6, 7] });
  });

  it('says a repeated x kept its first row and whether the y of the dropped rows differed', () => {
    const same = load(csv(['1000,0.1', '1001,0.2', '1001,0.2', '1002,0.3']));
    expect(traceImportWarnings(same)).toEqual([
      '1 row skipped, x repeated from an earlier row (the first row of each x is kept; each had the same y as the row kept), at line 4',
    ]);
    const differ = load(csv(['1000,0.1', '1001,0.2', '1001,0.5', '1002,0.3', '1002,0.3']));
    expect(traceImportWarnings(differ)).toEqual([
      '2 rows skipped, x repeated from an earlier row (the first row of each x is kept; y differs from the row kept in 1 of 2), at lines 4, 6',
    ]);
  });

  it('warns of a flat trace (every ordinate equal), and not of a trace with one different value', () => {
    const flat = load(csv(Array.from({ length: 50 }, (_, i) => `${1000 + i},0.25`)));
    expect(traceImportWarnings(flat)).toEqual([
      'the trace is flat: all 50 points have the same value (absorbance 0.25), so no peaks can be found in it',
    ]);
    const almost = load(csv([...Array.from({ length: 49 }, (_, i) => `${1000 + i},0.25`), '1049,0.2500001']));
    expect(traceImportWarnings(almost)).toEqual([]);
  });

  it('warns when points were sorted, naming the first one out of order', () => {
    expect(traceImportWarnings(load(csv(['1000,0.1', '1002,0.2', '1001,0.3', '1003,0.1'])))).toEqual([
      'the axis is not monotonic (first reversal at line 4); points were sorted by wavenumber',
    ]);
  });

  it('lists the same words among the report messages (what the page shows)', () => {
    const report = load(csv(['1000,0.1', '1001,abc', '1002,0.3']));
    expect(report.messages).toContain(traceImportWarnings(report)[0]);
  });
});

describe('TraceSkipLog.kinds', () => {
  it('groups lines by reason, ascending, without repeats, with the distinct line count', () => {
    const log = new TraceSkipLog();
    for (const [line, reason] of [
      [9, 'non-numeric'],
      [4, 'NaN/Infinity'],
      [4, 'NaN/Infinity'],
      [5, 'non-numeric'],
    ] as const)
      log.add(line, reason);
    expect(log.kinds()).toEqual([
      { reason: 'non-numeric', count: 2, lines: [5, 9], lineCount: 2 },
      { reason: 'NaN/Infinity', count: 2, lines: [4], lineCount: 1 },
    ]);
    expect(log.kinds(1)[0].lines).toEqual([5]);
  });
});

describe('traceLongLineNote', () => {
  it('says nothing about ordinary lines', () => {
    expect(traceLongLineNote('x,y\n1,2\n')).toBeUndefined();
    expect(traceLongLineNote('a'.repeat(1000))).toBeUndefined();
  });
  it('names the longest line, its length and the line breaks (LF, or CR-only)', () => {
    expect(traceLongLineNote('a'.repeat(1001))).toBe(
      'line 1 is 1,001 characters long and the file has no line breaks (a trace needs one line per point)',
    );
    expect(traceLongLineNote(`x\r${'b'.repeat(2000)}\r`)).toBe(
      'line 2 is 2,000 characters long and the file has only 2 line breaks (a trace needs one line per point)',
    );
  });
});

describe('importTraceBytes', () => {
  it('sets the encoding and adds a note for UTF-16; a refusal keeps its words and adds how the bytes were read', () => {
    const text = 'x,y\n1000,0.1\n1001,0.2\n';
    const le = Uint8Array.from([0xff, 0xfe, ...[...text].flatMap((c) => [c.charCodeAt(0), 0])]);
    const r = importTraceBytes(le, 'le.csv');
    if (!r.ok) throw new Error(r.error.message);
    expect(r.report.encoding).toBe('UTF-16 LE');
    expect(r.report.messages[0]).toBe('the bytes were read as UTF-16 LE (its byte-order mark)');
    const bad = Uint8Array.from([0xff, 0xfe, ...[...'x,y\nabc\n'].flatMap((c) => [c.charCodeAt(0), 0])]);
    const refused = importTraceBytes(bad, 'bad.csv');
    expect(refused.ok ? '' : refused.error.message).toBe(
      'bad.csv: no numeric data rows found; the bytes were read as UTF-16 LE (its byte-order mark)',
    );
  });
  it('says nothing about the encoding of an empty file', () => {
    const r = importTraceBytes(Uint8Array.from([0xff, 0xfe]), 'e.csv');
    expect(r.ok ? '' : r.error.message).toBe('e.csv: the file is empty');
  });
});

describe('the first offending text', () => {
  it('is quoted (cut after 40 characters) for text in a number column; an empty field is named as such', () => {
    const one = load(csv(['1000,0.1', `1001,${'z'.repeat(60)}`, '1002,0.3']));
    expect(traceImportWarnings(one)).toEqual([`1 row skipped, text where a number belongs ('${'z'.repeat(40)}…'), at line 3`]);
    const empty = load(csv(['1000,0.1', '1001, ', '1002,0.3']));
    expect(traceImportWarnings(empty)).toEqual(['1 row skipped, text where a number belongs (an empty field), at line 3']);
  });
});
