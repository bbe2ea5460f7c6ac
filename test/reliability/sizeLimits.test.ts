/**
 * Size limits end in a message, on every reading path: delimited text (fast scanner, papaparse, blank-
 * separated), JCAMP-DX (##NPOINTS, DUP expansion, (XY..XY) pairs), line tables (rows) and model files.
 * Limits are lowered through the importers' options so the tests stay small; the shared defaults are
 * checked in inputLimits.test.ts and by the huge-claim fixtures in hostileFiles.test.ts.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { importTrace } from '../../src/io/traceImport';
import { lineTableParse } from '../../src/io/lineTable';
import { INPUT_LIMITS } from '../../src/io/inputLimits';
import { countInput, countsPrint, expectGoodMessage } from './reliabilityHarness';

afterAll(() => countsPrint('sizeLimits.test.ts'));

function refusal(text: string, maxPoints: number, name = 'big.txt') {
  countInput('importTrace');
  const r = importTrace(text, name, { maxPoints });
  if (r.ok) throw new Error(`accepted ${r.report.points} points`);
  expectGoodMessage(r.error.message, { prefix: `${name}: `, line: r.error.line });
  return r.error;
}

describe('importTrace maxPoints on every reader', () => {
  const rows = (n: number, row: (i: number) => string) => Array.from({ length: n }, (_, i) => row(i)).join('\n') + '\n';
  it('plain numeric CSV (fast scanner): refused at the first row over the limit', () => {
    const text = rows(11, (i) => `${1000 + i},0.5`);
    const e = refusal(text, 10);
    expect([e.message, e.line, e.field]).toEqual(['big.txt: more than 10 data rows (limit maxPoints), at line 11', 11, 'maxPoints']);
    countInput('importTrace');
    expect(
      importTrace(
        rows(10, (i) => `${1000 + i},0.5`),
        'ok.csv',
        { maxPoints: 10 },
      ).ok,
    ).toBe(true);
  });
  it('CSV with comments (papaparse path) and blank-separated text (line splitter)', () => {
    const withComments = rows(11, (i) => `# row ${i}\n${1000 + i};0.5`);
    expect(refusal(withComments, 10).message).toBe('big.txt: more than 10 data rows (limit maxPoints), at line 22');
    const blanks = 'x y\n' + rows(11, (i) => `${1000 + i}   0.5`).replace(/\n(?=.)/g, '\n\n');
    // Header on line 1, rows on even lines 2, 4, …: the 11th row is on line 22.
    expect(refusal(blanks, 10).line).toBe(22);
  });
  it('JCAMP-DX: ##NPOINTS over the limit, a table longer than the limit, (XY..XY) pairs over the limit', () => {
    const head = '##TITLE=t\n##JCAMP-DX=4.24\n##XUNITS=1/CM\n##YUNITS=ABSORBANCE\n##FIRSTX=1\n##LASTX=20\n';
    expect(refusal(`${head}##NPOINTS=20\n##XYDATA=(X++(Y..Y))\n1 1 2\n##END=\n`, 10, 'a.jdx').message).toBe(
      'a.jdx: line 7: ##NPOINTS=20 is above the limit of 10 points (maxPoints)',
    );
    expect(refusal(`${head}##XYDATA=(X++(Y..Y))\n1 ${'5 '.repeat(11)}\n##END=\n`, 10, 'b.jdx').message).toBe(
      'b.jdx: line 8: the data table holds more than 10 points (limit maxPoints)',
    );
    const pairs = Array.from({ length: 11 }, (_, i) => `${i + 1},0.5`).join(' ');
    expect(refusal(`${head}##XYPOINTS=(XY..XY)\n${pairs}\n##END=\n`, 10, 'c.jdx').message).toBe(
      'c.jdx: line 8: the data table holds more than 10 points (limit maxPoints)',
    );
  });
  it('maxChars is checked before any reading', () => {
    countInput('importTrace');
    const r = importTrace('1,2\n3,4\n', 'a.csv', { maxChars: 7 });
    expect(r.ok ? '' : r.error.message).toBe('a.csv: the text is 8 characters long, above the limit of 7 (maxChars)');
  });
});

describe('JCAMP-DX expansion limit (DUP counts)', () => {
  const head = '##TITLE=t\n##JCAMP-DX=4.24\n##XUNITS=1/CM\n##YUNITS=ABSORBANCE\n##FIRSTX=1\n##LASTX=2\n##XYDATA=(X++(Y..Y))\n';
  it(`decodes up to jcampExpansionFloorPoints (${INPUT_LIMITS.jcampExpansionFloorPoints}) points from a short file, refuses one more`, () => {
    // 'S' + digits is a DUP count 1…: the previous ordinate occurs that many times in all (JCAMP-DX ASDF).
    const floor = INPUT_LIMITS.jcampExpansionFloorPoints;
    countInput('importTrace', 2);
    const atFloor = importTrace(`${head}1 5S${String(floor).slice(1)}\n##END=\n`, 'floor.jdx');
    if (!atFloor.ok) throw new Error(atFloor.error.message);
    expect(atFloor.report.points).toBe(floor);
    const over = importTrace(`${head}1 5S${String(floor + 1).slice(1)}\n##END=\n`, 'over.jdx');
    expect(over.ok ? '' : over.error.message).toMatch(/^over\.jdx: line 8: the compressed data expand to more than 1000000 points/);
  });
});

describe('lineTableParse maxRows', () => {
  const table = (n: number) => 'J_up,K_up,J_lo,K_lo,wavenumber\n# note\n' + '1,0,0,0,1000.5\n'.repeat(n);
  it('reads a table at the limit and refuses one row more, naming the line of that row', () => {
    countInput('lineTableParse', 2);
    expect(lineTableParse(table(5), { fileName: 'L.csv', maxRows: 5 }).assignments).toHaveLength(5);
    expect(() => lineTableParse(table(6), { fileName: 'L.csv', maxRows: 5 })).toThrow(
      'L.csv: line 8: more than 5 data rows (limit maxLineTableRows); split the table',
    );
  });
});
