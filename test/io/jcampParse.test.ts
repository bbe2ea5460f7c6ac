import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { convert } from 'jcampconverter';
import { jcampDetect, jcampParse } from '../../src/io/jcampParse';

const fixture = (name: string) => readFileSync(new URL(`../fixtures/traces/${name}`, import.meta.url), 'utf8');
const parse = (text: string, maxPoints = 5e7) => {
  const r = jcampParse(text, { maxPoints });
  if (!r.ok) throw new Error(r.error.message);
  return r.columns;
};
const refusal = (text: string, maxPoints = 5e7) => {
  const r = jcampParse(text, { maxPoints });
  if (r.ok) throw new Error('expected a refusal');
  return r.error;
};
const head = (extra = '', n = 10) =>
  `##TITLE=t\n##JCAMP-DX=4.24\n##XUNITS=1/CM\n##YUNITS=ABSORBANCE\n##FIRSTX=1\n##LASTX=${n}\n##NPOINTS=${n}\n${extra}##XYDATA=(X++(Y..Y))\n`;

describe('jcampDetect', () => {
  it('sees ##TITLE= or ##JCAMP-DX= near the top, not in plain CSV', () => {
    expect(jcampDetect(fixture('band_affn.jdx'))).toBe(true);
    expect(jcampDetect('\n  ## jcamp-dx = 5.01\n')).toBe(true);
    expect(jcampDetect(fixture('band.csv'))).toBe(false);
    expect(jcampDetect('# ##TITLE= inside a comment\n1,2\n')).toBe(false);
  });
});

describe('jcampParse on files written to the standard', () => {
  const affn = parse(fixture('band_affn.jdx'));
  it('reads the AFFN (X++(Y..Y)) fixture: 64 points from FIRSTX to LASTX, YFACTOR applied', () => {
    expect(affn.x.length).toBe(64);
    expect([affn.x[0], affn.x[63]]).toEqual([1100, 1037]);
    expect(affn.y[0]).toBe(579 * 0.0001);
    expect([affn.version, affn.xUnits?.value, affn.yUnits?.value]).toEqual(['4.24', '1/CM', 'ABSORBANCE']);
    expect(affn.messages).toEqual([]);
  });
  it.each(['band_pac.jdx', 'band_sqz.jdx', 'band_difdup.jdx'])('decodes %s to exactly the AFFN values', (name) => {
    const c = parse(fixture(name));
    expect(Array.from(c.x)).toEqual(Array.from(affn.x));
    expect(Array.from(c.y)).toEqual(Array.from(affn.y));
  });
  it('reads the (XY..XY) fixture to the same values', () => {
    const c = parse(fixture('band_xypoints.jdx'));
    expect(Array.from(c.x)).toEqual(Array.from(affn.x));
    expect(Array.from(c.y)).toEqual(Array.from(affn.y));
  });
  it('matches the CSV copy of the band (same numbers written as decimals)', () => {
    const rows = fixture('band.csv')
      .trim()
      .split('\n')
      .slice(1)
      .map((l) => l.split(',').map(Number));
    // Tolerance 1e-15 absolute: 579 × 1e-4 and Number("0.0579") may differ by one ulp.
    rows.forEach(([x, y], i) => {
      expect(affn.x[i]).toBe(x);
      expect(Math.abs(affn.y[i] - y)).toBeLessThan(1e-15);
    });
  });
  it('reads the 5.01 fixture with $$ comments and ##$ private labels', () => {
    const c = parse(fixture('band_difdup.jdx'));
    expect(c.version).toBe('5.01');
    expect(c.title).toBe('fictitious band, (X++(Y..Y)) band_difdup.jdx');
  });
  it.each([
    ['band_affn.jdx', (t: string) => t],
    ['band_pac.jdx', (t: string) => t],
    ['band_sqz.jdx', (t: string) => t],
    ['band_difdup.jdx', (t: string) => t],
    ['band_xypoints.jdx', (t: string) => t.replace('##XYPOINTS=', '##XYDATA=')],
    ['film_um_transmittance.jdx', (t: string) => t],
  ])('agrees with jcampconverter on %s', (name, adapt) => {
    // jcampconverter (npm) is an independent decoder; it reads (XY..XY) only under ##XYDATA.
    // Tolerance 1e-12: it accumulates DELTAX where we compute FIRSTX + i·step.
    const text = fixture(name);
    const mine = parse(text);
    const theirs = convert(adapt(text)).flatten[0].spectra[0].data as { x: number[]; y: number[] };
    expect(theirs.x.length).toBe(mine.x.length);
    for (let i = 0; i < mine.x.length; i++) {
      expect(Math.abs(mine.x[i] - theirs.x[i])).toBeLessThan(1e-12);
      expect(Math.abs(mine.y[i] - theirs.y[i])).toBeLessThan(1e-12);
    }
  });
  it('reads µm abscissae with XFACTOR and keeps file order', () => {
    const c = parse(fixture('film_um_transmittance.jdx'));
    expect(c.x.length).toBe(11);
    expect(c.x[0]).toBe(2.5);
    expect(c.x[10]).toBeCloseTo(2.6, 14);
    expect(c.y[10]).toBeCloseTo(0.948, 14);
  });
  it("reads (XY..XY) pairs separated by ';' with a '?' ordinate as NaN", () => {
    const c = parse(fixture('overtone_nm_percent.jdx'));
    expect(Array.from(c.x)).toEqual([1600, 1600.5, 1601, 1601.5, 1602, 1602.5]);
    expect(Number.isNaN(c.y[2])).toBe(true);
    expect(Array.from(c.lines)).toEqual([12, 12, 12, 13, 13, 13]);
  });
  it('accepts a final line that holds only the y-check value', () => {
    const c = parse(head('', 9) + '1BJ%j\n4BjW\n9c\n##END=\n', 9);
    expect(Array.from(c.y)).toEqual([2, 3, 3, 2, 1, 0, -1, -2, -3]);
  });
  it('reads the first spectrum of a LINK file and notes the further blocks', () => {
    const link =
      '##TITLE=outer\n##JCAMP-DX=5.01\n##DATA TYPE=LINK\n##BLOCKS=3\n' +
      '##TITLE=structure\n##JCAMP-CS=3.7\n##END=\n' +
      '##TITLE=first spectrum\n##JCAMP-DX=5.01\n##XUNITS=1/CM\n##YUNITS=ABSORBANCE\n##FIRSTX=1\n##LASTX=3\n##NPOINTS=3\n##XYDATA=(X++(Y..Y))\n1 5 6 7\n##END=\n' +
      '##TITLE=second spectrum\n##END=\n##END=\n';
    const c = parse(link);
    expect([c.title, Array.from(c.y)]).toEqual(['first spectrum', [5, 6, 7]]);
    expect(c.messages[0]).toBe('the file holds further blocks (line 18); only the first spectrum was read');
  });
  it('joins a title continued on the next line', () => {
    expect(
      parse('##TITLE=a long\n  title\n##JCAMP-DX=4.24\n##FIRSTX=1\n##LASTX=2\n##NPOINTS=2\n##XYDATA=(X++(Y..Y))\n1 1 2\n##END=\n').title,
    ).toBe('a long title');
  });
  it('takes the abscissa step from DELTAX when LASTX is missing, and counts points without NPOINTS', () => {
    const c = parse('##TITLE=t\n##JCAMP-DX=4.24\n##FIRSTX=10\n##DELTAX=-0.5\n##XYDATA=(X++(Y..Y))\n10 1 2 3\n##END=\n');
    expect(Array.from(c.x)).toEqual([10, 9.5, 9]);
    expect(c.messages).toContain('no ##NPOINTS label: 3 points decoded');
  });
});

describe('jcampParse refusals and warnings', () => {
  const difdup = fixture('band_difdup.jdx');
  const dataLines = difdup.split('\n');
  const firstData = dataLines.findIndex((l) => l.startsWith('##XYDATA')) + 1; // 0-based index of the first data line

  it('refuses a failed DIF y-check, naming both lines', () => {
    // Line 2 of the table starts with the check value B036 (2036); make it C036 (3036).
    const bad = difdup.replace('\n1084B036', '\n1084C036');
    const e = refusal(bad);
    expect(e.message).toBe(
      `line ${firstData + 2}: DIF y-check failed: the first ordinate 3036 should repeat the last ordinate 2036 of line ${firstData + 1}`,
    );
    expect(e.line).toBe(firstData + 2);
  });
  it('refuses a wrong compression character with line and column', () => {
    const e = refusal(difdup.replace('1062I99Q3', '1062I99t3'));
    const line = dataLines.findIndex((l) => l.startsWith('1062')) + 1;
    expect(e.message).toBe(`line ${line}, column 8: unexpected character 't' in compressed (ASDF) data`);
  });
  it('refuses a truncated file with the NPOINTS mismatch, the data lines and the missing ##END=', () => {
    const cut = difdup.slice(0, difdup.indexOf('1062'));
    const e = refusal(cut);
    const n = cut.split('\n').length;
    expect(e.message).toMatch(
      new RegExp(
        `^line ${firstData + 3}: ##NPOINTS=64 \\(line 16\\) but the data table \\(lines ${firstData + 1}–${firstData + 3}\\) holds 39 points; the file ends at line ${n} without ##END= \\(truncated\\?\\)$`,
      ),
    );
  });
  it('refuses an NPOINTS larger than the table', () => {
    const e = refusal(fixture('band_affn.jdx').replace('##NPOINTS=64', '##NPOINTS=65'));
    expect(e.message).toMatch(/^line \d+: ##NPOINTS=65 \(line 12\) but the data table \(lines 14–21\) holds 64 points/);
    expect(e.field).toBe('NPOINTS');
  });
  it('refuses an NPOINTS smaller than the table at the line that overflows it', () => {
    const e = refusal(fixture('band_affn.jdx').replace('##NPOINTS=64', '##NPOINTS=60'));
    expect(e.message).toBe('line 21: the data table holds more than ##NPOINTS=60 (line 12) points');
  });
  it('locates a lost data line with the abscissa check', () => {
    const lines = fixture('band_affn.jdx').split('\n');
    lines.splice(15, 1); // drop line 16, the 1084 line (8 points)
    const e = refusal(lines.join('\n'));
    expect(e.message).toBe(
      'line 16: ##NPOINTS=64 (line 12) but the data table (lines 14–20) holds 56 points; ' +
        'the abscissa check first fails at line 16 (X = 1076, expected 1084, 8.0 points ahead)',
    );
    expect(e.line).toBe(16);
  });
  it('refuses an absurd NPOINTS before allocating anything', () => {
    const e = refusal(head().replace('##NPOINTS=10', '##NPOINTS=2000000000') + '1 2 3\n##END=\n');
    expect(e.message).toBe('line 7: ##NPOINTS=2000000000 is above the limit of 50000000 points (maxPoints)');
  });
  it('refuses a DUP count that would expand beyond NPOINTS', () => {
    const e = refusal(head() + '1 @Z999999999999\n##END=\n');
    expect(e.message).toBe('line 9: the data table holds more than ##NPOINTS=10 (line 7) points');
  });
  it.each([
    ['a non-integer NPOINTS', '##NPOINTS=10', '##NPOINTS=10.5', 'line 7: ##NPOINTS=10.5 must be a positive integer'],
    ['a non-numeric NPOINTS', '##NPOINTS=10', '##NPOINTS=ten', "line 7: ##NPOINTS= 'ten' is not a number"],
    ['a zero YFACTOR', '##NPOINTS=10\n', '##NPOINTS=10\n##YFACTOR=0\n', 'line 8: ##YFACTOR=0 must be a non-zero finite number'],
    ['a missing FIRSTX', '##FIRSTX=1\n', '', 'line 7: ##FIRSTX is missing (required for an (X++(Y..Y)) table)'],
  ])('refuses %s', (_label, from, to, message) => {
    expect(refusal((head() + '1 1 2 3 4 5 6 7 8 9 10\n##END=\n').replace(from, to)).message).toBe(message);
  });
  it('refuses NTUPLES, peak-table-only files and NMR table forms', () => {
    expect(refusal('##TITLE=t\n##JCAMP-DX=5.01\n##NTUPLES=NMR SPECTRUM\n##END=\n').message).toBe(
      'line 3: ##NTUPLES (multi-dimensional) data are not supported; export the spectrum as ##XYDATA',
    );
    expect(refusal('##TITLE=t\n##JCAMP-DX=4.24\n##PEAK TABLE=(XY..XY)\n1,2 3,4\n##END=\n').message).toBe(
      'line 3: the file holds only a peak table, no continuous trace',
    );
    expect(refusal('##TITLE=t\n##JCAMP-DX=5.01\n##FIRSTX=1\n##LASTX=2\n##XYDATA=(X++(R..R))\n1 1 2\n##END=\n').message).toBe(
      "line 5: data table form '(X++(R..R))' is not supported (expected (X++(Y..Y)) or (XY..XY))",
    );
  });
  it('refuses a file without a data table', () => {
    expect(refusal('##TITLE=t\n##JCAMP-DX=4.24\n##END=\n').message).toBe('no ##XYDATA or ##XYPOINTS data table found');
  });
  it('refuses an (XY..XY) table with a lone abscissa or a non-number', () => {
    expect(refusal('##TITLE=t\n##XYPOINTS=(XY..XY)\n1,2 3\n##END=\n').message).toBe(
      'line 3: the (XY..XY) table ends with an abscissa without its ordinate',
    );
    expect(refusal('##TITLE=t\n##XYPOINTS=(XY..XY)\n1,2 3,x4\n##END=\n').message).toBe(
      "line 3: 'x4' is not a number in the (XY..XY) table",
    );
  });
  it('notes a missing ##END= when the counts still agree', () => {
    const c = parse(head('', 3) + '1 1 2 3\n');
    expect(c.messages).toContain('no ##END= label after the data (file ends at line 10); the file may be truncated');
  });
  it('notes a FIRSTY that disagrees with the decoded first ordinate (a wrong YFACTOR)', () => {
    const c = parse(fixture('band_affn.jdx').replace('##YFACTOR=0.0001', '##YFACTOR=0.001'));
    expect(c.messages[0]).toMatch(/^##FIRSTY=0.0579 \(line 11\) but the first ordinate decodes to 0.579 /);
  });
});
