import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { Assignment } from '../../src/fit/assignment';
import { LINE_TABLE_COLUMNS, lineTableParse, lineTableSerialize, LineTableError } from '../../src/io/lineTable';

const HCL = readFileSync(new URL('../fixtures/lines/hcl-fundamental/lines.csv', import.meta.url), 'utf8');

function parseError(text: string): string {
  try {
    lineTableParse(text, { fileName: 'L.csv' });
  } catch (err) {
    expect(err).toBeInstanceOf(LineTableError);
    return (err as Error).message;
  }
  throw new Error('expected a LineTableError');
}

describe('lineTableParse', () => {
  it('refuses an empty file', () => {
    expect(parseError('')).toMatch(/^L.csv: no header line found/);
  });

  it('reads a header-only file as no lines', () => {
    expect(lineTableParse('J_up,K_up,J_lo,K_lo,wavenumber\n').assignments).toEqual([]);
  });

  it('reads the HCl fixture with its uncertainties and notes', () => {
    const t = lineTableParse(HCL, { fileName: 'hcl.csv' });
    expect(t.assignments).toHaveLength(19);
    expect(t.assignments[0]).toEqual({
      id: 'line2',
      jUpper: 1,
      kUpper: 0,
      jLower: 0,
      kLower: 0,
      observedCm1: 2906.25,
      uncertaintyCm1: 0.05,
      isBlended: false,
      isExcluded: false,
      note: 'R(0)',
    });
    expect(t.lineNumbers[0]).toBe(2);
  });

  it('finds columns by name in any order, keeps extra columns and defaults the uncertainty to 0.001 cm^-1', () => {
    const t = lineTableParse('wavenumber, K_lo ,intensity,J_lo,k_up,J_UP\n1000.5,3,0.2,10,4,11\n');
    expect(t.assignments[0]).toMatchObject({ jUpper: 11, kUpper: 4, jLower: 10, kLower: 3, observedCm1: 1000.5, uncertaintyCm1: 0.001 });
    expect(t.extraColumns).toEqual(['intensity']);
    expect(t.extras).toEqual([{ intensity: '0.2' }]);
  });

  it('skips comments and blank lines, accepts CRLF, and counts file lines across them', () => {
    const t = lineTableParse('# measured 2024\r\nJ_up,K_up,J_lo,K_lo,wavenumber\r\n\r\n1,0,0,0,10\r\n# gap\r\n2,0,1,0,20\r\n');
    expect(t.assignments.map((a) => a.observedCm1)).toEqual([10, 20]);
    expect(t.lineNumbers).toEqual([4, 6]);
  });

  it('reads blended/excluded columns and the flags column', () => {
    const t = lineTableParse('J_up,K_up,J_lo,K_lo,wavenumber,blended,excluded\n1,0,0,0,10,yes,0\n2,0,1,0,20,,TRUE\n');
    expect(t.assignments.map((a) => [a.isBlended, a.isExcluded])).toEqual([
      [true, false],
      [false, true],
    ]);
    const f = lineTableParse('J_up,K_up,J_lo,K_lo,wavenumber,flags\n1,0,0,0,10,blended;outlier\n2,0,1,0,20,excluded\n');
    expect(f.assignments.map((a) => [a.isBlended, a.isExcluded])).toEqual([
      [true, false],
      [false, true],
    ]);
  });

  it('names file, line and field for a J that is not a whole number', () => {
    const text = 'J_up,K_up,J_lo,K_lo,wavenumber\n1,0,0,0,1\n2,0,1,0,2\n\n# c\n3,0,2,0,3\nx,0,3,0,4\n';
    expect(parseError(text)).toBe("L.csv: line 7: J_up 'x' is not a whole number");
    expect(parseError('J_up,K_up,J_lo,K_lo,wavenumber\n1,0.5,0,0,1\n')).toBe("L.csv: line 2: K_up '0.5' is not a whole number");
    expect(parseError('J_up,K_up,J_lo,K_lo,wavenumber\n1,0,-1,0,1\n')).toBe("L.csv: line 2: J_lo '-1' must be >= 0");
  });

  it('names a missing required column and a repeated one', () => {
    expect(parseError('J_up,K_up,J_lo,wavenumber\n')).toMatch(
      /^L.csv: line 1: header lacks column K_lo \(found: J_up, K_up, J_lo, wavenumber\)/,
    );
    expect(parseError('J_up,K_up,J_lo,K_lo,wavenumber,j_up\n')).toMatch(/line 1: column 'j_up' appears twice/);
  });

  it('names a bad wavenumber, uncertainty, flag and an overlong row', () => {
    const h = 'J_up,K_up,J_lo,K_lo,wavenumber,uncertainty,blended\n';
    expect(parseError(h + '1,0,0,0,abc,,\n')).toBe("L.csv: line 2: wavenumber 'abc' is not a number (cm^-1)");
    expect(parseError(h + '1,0,0,0,\n')).toBe("L.csv: line 2: wavenumber '' is not a number (cm^-1)");
    expect(parseError(h + '1,0,0,0,10,-0.1,\n')).toBe("L.csv: line 2: uncertainty '-0.1' must be a number > 0 (cm^-1)");
    expect(parseError(h + '1,0,0,0,10,,maybe\n')).toBe("L.csv: line 2: blended 'maybe' must be true/false, yes/no or 1/0");
    expect(parseError(h + '1,0,0,0,10,0.1,0,9\n')).toBe('L.csv: line 2: 8 fields, but the header names only 7 columns');
  });

  it('renames a repeated id with a warning', () => {
    const t = lineTableParse('J_up,K_up,J_lo,K_lo,wavenumber,id\n1,0,0,0,1,a\n2,0,1,0,2,a\n');
    expect(t.assignments.map((a) => a.id)).toEqual(['a', 'a#3']);
    expect(t.warnings).toEqual(["1 row renamed, id used by an earlier row ('a' → 'a#3'), at line 3"]);
  });

  it('reports all renamed rows in one warning with their count and first lines', () => {
    const rows = Array.from({ length: 13 }, (_, i) => `${i + 1},0,${i},0,${1000 + i},same`);
    const t = lineTableParse(['J_up,K_up,J_lo,K_lo,wavenumber,id', ...rows].join('\n') + '\n', { fileName: 'L.csv' });
    expect(t.assignments.map((a) => a.id).slice(0, 3)).toEqual(['same', 'same#3', 'same#4']);
    expect(t.warnings).toEqual([
      "L.csv: 12 rows renamed, id used by an earlier row ('same' → 'same#3', and so on), at lines 3, 4, 5, 6, 7, 8, 9, 10, 11, 12 and 2 more",
    ]);
  });
});

describe('lineTableSerialize', () => {
  it('writes the documented columns with label, calc and obs − calc', () => {
    const t = lineTableParse(HCL);
    const csv = lineTableSerialize(t.assignments.slice(0, 1), { shape: 'linear', calcCm1: [2906.2], isOutlier: [true] });
    const [header, row] = csv.trimEnd().split('\n');
    expect(header.split(',')).toEqual([...LINE_TABLE_COLUMNS]);
    const cells = row.split(',');
    expect(cells.slice(0, 11)).toEqual([
      '1',
      '0',
      '0',
      '0',
      '2906.25',
      '0.05',
      'R(0)',
      '2906.2',
      String(2906.25 - 2906.2),
      'outlier',
      'R(0)',
    ]);
  });

  it('labels symmetric-top lines ^ΔK ΔJ_K″(J″)', () => {
    const a: Assignment = {
      id: 'x',
      jUpper: 12,
      kUpper: 4,
      jLower: 12,
      kLower: 3,
      observedCm1: 1,
      uncertaintyCm1: 1,
      isBlended: false,
      isExcluded: false,
      note: '',
    };
    expect(lineTableSerialize([a], { shape: 'prolate' }).split('\n')[1].split(',')[6]).toBe('rQ3(12)');
  });

  it('reads back exactly what it wrote, for any assignments (property test, 300 cases)', () => {
    // fast-check 4.11 generates assignments with arbitrary doubles and notes containing commas,
    // quotes, newlines and '#'; the round trip must return identical objects.
    const assignment = fc.record({
      jUpper: fc.nat(200),
      kUpper: fc.nat(200),
      jLower: fc.nat(200),
      kLower: fc.nat(200),
      observedCm1: fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e6, max: 1e6 }),
      uncertaintyCm1: fc.double({ noNaN: true, min: 1e-9, max: 10 }),
      isBlended: fc.boolean(),
      isExcluded: fc.boolean(),
      note: fc.string({ unit: fc.constantFrom('a', ' ', ',', '"', '\n', '#', 'é', '1') }),
      peakId: fc.option(fc.stringMatching(/^[a-z0-9]{1,6}$/), { nil: undefined }),
    });
    fc.assert(
      fc.property(fc.array(assignment, { maxLength: 12 }), (rows) => {
        const withIds: Assignment[] = rows.map((r, i) => {
          const a: Assignment = { id: `a${i}`, ...r };
          if (a.peakId === undefined) delete a.peakId;
          return a;
        });
        const back = lineTableParse(lineTableSerialize(withIds, { shape: 'prolate' })).assignments;
        expect(back).toEqual(withIds);
      }),
      { numRuns: 300, seed: 20240601 },
    );
  });
});
