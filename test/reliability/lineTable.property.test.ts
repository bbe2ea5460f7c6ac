/**
 * Property tests of lineTableParse: for any text it returns assignments whose quantum numbers are whole,
 * in range and whose positions are finite, or throws LineTableError (never another error, never hangs) with
 * a one-line message naming the file and the line; and export → import returns the rows exactly,
 * notes and ids with commas, quotes, line breaks, HTML and any Unicode included.
 */
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import type { Assignment } from '../../src/fit/assignment';
import { INPUT_LIMITS } from '../../src/io/inputLimits';
import { lineTableParse, lineTableSerialize, LineTableError, type LineTable } from '../../src/io/lineTable';
import type { TopShape } from '../../src/physics/model';
import {
  HANG_LIMIT_MS,
  bytesTextArb,
  countInput,
  countsPrint,
  expectGoodMessage,
  mutationArb,
  randomTextArb,
  timed,
} from './reliabilityHarness';

afterAll(() => countsPrint('lineTable.property.test.ts'));

const fixture = (path: string) => readFileSync(new URL(`../fixtures/lines/${path}`, import.meta.url), 'utf8');
const FIXTURES = [fixture('hcl-fundamental/lines.csv'), fixture('fictitious-perpendicular/lines.csv')];
const FILE = 'L.csv';

/** Parse with the hang guard; check the invariants of either outcome. */
function parseChecked(text: string): LineTable | LineTableError {
  countInput('lineTableParse');
  const run = timed(() => lineTableParse(text, { fileName: FILE }));
  expect(run.ms, 'one parse call').toBeLessThan(HANG_LIMIT_MS);
  if (!run.ok) {
    if (!(run.error instanceof LineTableError)) throw new Error(`lineTableParse threw a ${String(run.error)}`);
    const m = run.error.message;
    expectGoodMessage(m, { prefix: `${FILE}: ` });
    // Every refusal but "no header" names the line.
    expect(m, m).toMatch(/^L\.csv: (line \d+: |no header line found)/);
    return run.error;
  }
  const t = run.value;
  const lineCount = text.split(/\r\n|\r|\n/).length;
  expect(t.lineNumbers.length).toBe(t.assignments.length);
  t.assignments.forEach((a, i) => {
    for (const q of [a.jUpper, a.kUpper, a.jLower, a.kLower])
      expect(Number.isInteger(q) && q >= 0 && q <= INPUT_LIMITS.maxQuantumJ, String(q)).toBe(true);
    expect(Number.isFinite(a.observedCm1)).toBe(true);
    expect(Number.isFinite(a.uncertaintyCm1) && a.uncertaintyCm1 > 0).toBe(true);
    expect(t.lineNumbers[i]).toBeGreaterThanOrEqual(1);
    expect(t.lineNumbers[i]).toBeLessThanOrEqual(lineCount);
    if (i > 0) expect(t.lineNumbers[i]).toBeGreaterThan(t.lineNumbers[i - 1]);
  });
  expect(new Set(t.assignments.map((a) => a.id)).size).toBe(t.assignments.length);
  for (const w of t.warnings) expectGoodMessage(w, { prefix: `${FILE}: ` });
  return t;
}

/** Untrusted text of every kind: delimiters, quotes, CR/LF, '#', HTML, any Unicode (incl. lone surrogates). */
const hostileText = fc.oneof(
  fc.string({
    unit: fc.constantFrom('a', ' ', ',', '"', '\n', '\r', '\r\n', '#', 'é', '1', '<', '>', '&', '\t', ';', '\u2028'),
    maxLength: 12,
  }),
  fc.string({ unit: 'binary', maxLength: 8 }),
  fc.constantFrom('<script>alert(1)</script>', '=cmd|" /C calc"!A0', '#not a comment', 'x\r\ny', '"quoted"'),
);

const assignmentsArb = fc.array(
  fc.record({
    jUpper: fc.nat(INPUT_LIMITS.maxQuantumJ),
    kUpper: fc.nat(INPUT_LIMITS.maxQuantumJ),
    jLower: fc.nat(INPUT_LIMITS.maxQuantumJ),
    kLower: fc.nat(INPUT_LIMITS.maxQuantumJ),
    observedCm1: fc.double({ noNaN: true, noDefaultInfinity: true }),
    uncertaintyCm1: fc.oneof(fc.double({ noNaN: true, min: 5e-324, max: 1e300 }), fc.constantFrom(1e-9, 0.001, 0.05)),
    isBlended: fc.boolean(),
    isExcluded: fc.boolean(),
    note: hostileText,
    // Ids are trimmed when read, so generated ids carry no surrounding blanks.
    id: hostileText.filter((s) => s.trim() === s && s !== ''),
    peakId: fc.option(
      hostileText.filter((s) => s.trim() === s && s !== ''),
      { nil: undefined },
    ),
  }),
  { maxLength: 15 },
);

describe('lineTableParse on hostile text: LineTableError only, one-line messages naming file and line', () => {
  it('random strings and random bytes', () => {
    fc.assert(
      fc.property(fc.oneof(randomTextArb('J_upK_lowavenumber,0123456789.-+eE"#\n\r '), bytesTextArb()), (text) => void parseChecked(text)),
      { numRuns: 4000, seed: 301 },
    );
  });

  it('random text after a valid header', () => {
    const header = 'J_up,K_up,J_lo,K_lo,wavenumber,uncertainty,blended,excluded,flags,note,id,peak_id\n';
    fc.assert(
      fc.property(randomTextArb('0123456789.,-+eE"#\n\r xyYNtrue'), (text) => void parseChecked(header + text)),
      { numRuns: 4000, seed: 302 },
    );
  });

  it('mutations of the line-table fixtures and of exported tables', () => {
    const exported = fc.sample(assignmentsArb, { numRuns: 10, seed: 9 }).map((rows) =>
      lineTableSerialize(
        rows.map((r, i) => withId(r, i)),
        { shape: 'prolate' },
      ),
    );
    fc.assert(
      fc.property(mutationArb([...FIXTURES, ...exported]), (text) => void parseChecked(text)),
      { numRuns: 5000, seed: 303 },
    );
  });

  it('hostile cell values in every column of a valid row', () => {
    const columns = ['J_up', 'K_up', 'J_lo', 'K_lo', 'wavenumber', 'uncertainty', 'blended', 'excluded', 'flags', 'note', 'id', 'peak_id'];
    const good = ['3', '1', '2', '0', '1000.5', '0.001', 'no', 'no', '', 'n', 'a1', 'p1'];
    const cell = fc.oneof(
      fc.constantFrom(
        '-1',
        '1e12',
        '2.5',
        '0x10',
        '0b1',
        'Infinity',
        'NaN',
        '1e999',
        '-0',
        '',
        ' ',
        '1,5',
        '""',
        '"3"',
        '2001',
        '1e3',
        '3.0',
      ),
      hostileText,
    );
    fc.assert(
      fc.property(fc.nat(columns.length - 1), cell, (k, v) => {
        const row = [...good];
        row[k] = /[",\r\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v;
        const r = parseChecked(`${columns.join(',')}\n${row.join(',')}\n`);
        if (r instanceof LineTableError) return;
        // A row starting with '#' is a comment line by the format's definition.
        if (row[0].trimStart().startsWith('#')) return void expect(r.assignments).toEqual([]);
        // Accepted cells read as decimal numbers (Number() of the cell; no hex slips through).
        const a = r.assignments[0];
        if (k < 4) expect([a.jUpper, a.kUpper, a.jLower, a.kLower][k]).toBe(Number(v));
        if (k === 4) expect(a.observedCm1).toBe(Number(v));
      }),
      { numRuns: 3000, seed: 304 },
    );
  });
});

function withId(r: Omit<Assignment, 'id'> & { id: string }, i: number): Assignment {
  // Ids must be unique in a table: the index is appended.
  const a: Assignment = { ...r, id: `${r.id}${i}` };
  if (a.peakId === undefined) delete a.peakId;
  return a;
}

describe('line table round trip: export → import returns the rows exactly', () => {
  it('random assignments with hostile notes and ids, extreme doubles, all flags, every shape', () => {
    fc.assert(
      fc.property(assignmentsArb, fc.constantFrom<TopShape>('prolate', 'oblate', 'linear'), (rows, shape) => {
        const table = rows.map(withId);
        const back = parseChecked(lineTableSerialize(table, { shape }));
        if (back instanceof LineTableError) throw back;
        // −0 is written as "-0" and read back as −0; toEqual tells them apart.
        expect(back.assignments).toEqual(table);
        expect(back.warnings).toEqual([]);
      }),
      { numRuns: 1500, seed: 305 },
    );
  });

  it('writes calc and obs − calc that read back as the same doubles', () => {
    fc.assert(
      fc.property(assignmentsArb, fc.array(fc.double({ noNaN: true }), { minLength: 15, maxLength: 15 }), (rows, calc) => {
        const table = rows.map(withId);
        const text = lineTableSerialize(table, { shape: 'prolate', calcCm1: calc });
        const back = parseChecked(text);
        if (back instanceof LineTableError) throw back;
        back.extras.forEach((e, i) => {
          if (Number.isFinite(calc[i])) {
            expect(Number(e.calc)).toBe(calc[i]);
            expect(Number(e.obs_minus_calc)).toBe(table[i].observedCm1 - calc[i]);
          } else expect(e.calc).toBe('');
        });
      }),
      { numRuns: 500, seed: 306 },
    );
  });
});
