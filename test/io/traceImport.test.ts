import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { importTrace } from '../../src/io/traceImport';
import type { TraceImportOptions } from '../../src/io/traceImportOptions';

const fixture = (name: string) => readFileSync(new URL(`../fixtures/traces/${name}`, import.meta.url), 'utf8');
const load = (text: string, name = 'test.csv', options?: Partial<TraceImportOptions>) => {
  const r = importTrace(text, name, options);
  if (!r.ok) throw new Error(r.error.message);
  return r;
};
const loadFixture = (name: string, options?: Partial<TraceImportOptions>) => load(fixture(name), name, options);
const refusal = (text: string, name = 'test.csv', options?: Partial<TraceImportOptions>) => {
  const r = importTrace(text, name, options);
  if (r.ok) throw new Error('expected a refusal');
  return r.error;
};
const arr = (a: Float64Array) => Array.from(a);

describe('importTrace refusals', () => {
  it('refuses an empty or blank file', () => {
    expect(refusal('').message).toBe('test.csv: the file is empty');
    expect(refusal(' \n\t\n').message).toBe('test.csv: the file is empty');
  });
  it('refuses text without numeric rows', () => {
    expect(refusal('wavenumber,absorbance\nfoo,bar\n').message).toBe('test.csv: no numeric data rows found');
  });
  it('refuses a single usable row, naming its line', () => {
    expect(refusal('x,y\n1000,0.5\nfoo,bar\n').message).toBe(
      'test.csv: only 1 usable data point (line 2); at least 2 are needed (1 row skipped: line 3 (non-numeric))',
    );
  });
  it('refuses rows that all carry NaN, listing them', () => {
    expect(refusal('1,NaN\n2,nan\n3,inf\n').message).toBe(
      'test.csv: no numeric data rows found (3 rows skipped: lines 1, 2, 3 (NaN/Infinity))',
    );
  });
  it('refuses text above maxChars before reading it', () => {
    const e = refusal('1,2\n3,4\n', 'big.csv', { maxChars: 5 });
    expect([e.message, e.field]).toEqual(['big.csv: the text is 8 characters long, above the limit of 5 (maxChars)', 'maxChars']);
  });
  it('refuses bad options with the option named', () => {
    expect(refusal('1,2\n3,4\n', 'a.csv', { yColumn: 0 }).message).toBe(
      'importTrace: options.yColumn must be an integer >= 1 (column 0 is the abscissa), got 0',
    );
  });
  it('refuses a non-string text without throwing', () => {
    expect(refusal(42 as unknown as string).message).toBe('test.csv: importTrace: text must be a string, got number');
  });
  it('refuses mixed decimal separators', () => {
    expect(refusal(fixture('mixed_decimals.csv'), 'mixed_decimals.csv').message).toBe(
      "mixed_decimals.csv: mixed decimal separators: line 2 uses a decimal comma and line 4 uses a decimal point; set the decimal option to ',' or '.' to choose",
    );
  });
  it('refuses a JCAMP-DX abscissa unit that is not infrared', () => {
    const t = fixture('band_affn.jdx').replace('##XUNITS=1/CM', '##XUNITS=HZ');
    const e = refusal(t, 'nmr.jdx');
    expect([e.message, e.line, e.field]).toEqual([
      'nmr.jdx: line 4: ##XUNITS=HZ is not an infrared abscissa unit (expected 1/CM, MICROMETERS or NANOMETERS); set the xUnit option to override',
      4,
      'XUNITS',
    ]);
    expect(load(t, 'nmr.jdx', { xUnit: 'cm-1' }).report.points).toBe(64);
  });
  it('passes JCAMP-DX refusals through with the file name and line', () => {
    const e = refusal(fixture('band_affn.jdx').replace('##NPOINTS=64', '##NPOINTS=2e9'), 'huge.jdx');
    expect(e.message).toBe('huge.jdx: line 12: ##NPOINTS=2000000000 is above the limit of 50000000 points (maxPoints)');
  });
});

describe('importTrace on delimited fixtures', () => {
  it('reads a CSV with a wavenumber/absorbance header through the fast path', () => {
    const { trace, report } = loadFixture('band.csv');
    expect(report).toMatchObject({
      format: 'delimited',
      xUnit: 'cm-1',
      ordinate: 'absorbance',
      points: 64,
      rangeCm1: [1037, 1100],
      wasDescending: true,
      usedFastPath: true,
      delimiter: ',',
      decimal: '.',
      columnNames: ['wavenumber (cm-1)', 'absorbance'],
      skipped: { count: 0, lines: [] },
    });
    expect(trace.wavenumberCm1[0]).toBe(1037);
    expect(trace.absorbance[63]).toBe(0.0579); // first row of the file, stored last
    expect(report.messages).toContain('the axis ran from high to low in the file; it is stored ascending');
  });
  it('reads a tab-separated %T file (header "%T") and converts to absorbance', () => {
    const { trace, report } = loadFixture('tab_percent_descending.txt');
    expect(report).toMatchObject({
      ordinate: 'percent-transmittance',
      delimiter: '\t',
      columnNames: ['Wavenumber', '%T'],
      wasDescending: true,
    });
    // Ref: A = 2 − log10(%T) (IUPAC Gold Book); rows 1000.0 → 98.9 %T and 1002.0 → 35.0 %T. Tolerance 1e-15 (round-off).
    expect(trace.wavenumberCm1[0]).toBe(1000);
    expect(trace.absorbance[0]).toBeCloseTo(2 - Math.log10(98.9), 15);
    expect(trace.absorbance[2]).toBeCloseTo(2 - Math.log10(35.0), 15);
  });
  it('reads semicolons with decimal commas', () => {
    const { trace, report } = loadFixture('semicolon_decimal_comma.csv');
    expect(report).toMatchObject({ delimiter: ';', decimal: ',', usedFastPath: false });
    expect(arr(trace.wavenumberCm1)).toEqual([1234.5678, 1235, 1235.5, 1236.25]);
    expect(arr(trace.absorbance)).toEqual([0.123, 0.25, 0.5, 0.125]);
  });
  it('reads blank-separated data after four comment styles and a preamble', () => {
    const { trace, report } = loadFixture('whitespace_comments.dat');
    expect(report).toMatchObject({ delimiter: 'whitespace', points: 4, columnNames: ['wavenumber', 'absorbance'], skipped: { count: 0 } });
    expect(arr(trace.absorbance)).toEqual([0.01, 0.012, 0.3, 0.045]);
  });
  it('converts a µm axis with transmittance to wavenumbers and absorbance', () => {
    const { trace, report } = loadFixture('wavelength_um_transmittance.csv');
    expect(report).toMatchObject({ xUnit: 'um', ordinate: 'transmittance', wasDescending: false });
    // Ref: ν̃ = 1e4/λ(µm): 5.5 → 1818.18…, 5 → 2000, 4.5 → 2222.2…, 4 → 2500 cm^-1; tolerance 1e-9 (round-off).
    const expected = [5.5, 5, 4.5, 4].map((l) => 1e4 / l);
    arr(trace.wavenumberCm1).forEach((v, i) => expect(v).toBeCloseTo(expected[i], 9));
    expect(trace.absorbance[0]).toBeCloseTo(-Math.log10(0.99), 15);
    expect(report.messages).toContain('µm (vacuum) wavelengths converted to wavenumbers');
  });
  it('converts an nm axis with %T to wavenumbers and absorbance', () => {
    const { trace, report } = loadFixture('wavelength_nm_percent.csv');
    expect(report).toMatchObject({ xUnit: 'nm', ordinate: 'percent-transmittance' });
    // Ref: ν̃ = 1e7/λ(nm): 3333.333 nm → 3000.0003 cm^-1, 2000 nm → 5000 cm^-1.
    expect(trace.wavenumberCm1[0]).toBeCloseTo(1e7 / 3333.333, 9);
    expect(trace.wavenumberCm1[3]).toBe(5000);
    expect(trace.absorbance[1]).toBeCloseTo(1, 15); // 10 %T
  });
  it('reads the chosen column of a file with extra columns', () => {
    const { trace, report } = loadFixture('extra_columns.csv', { yColumn: 3 });
    expect(report).toMatchObject({
      yColumn: 3,
      ordinate: 'absorbance',
      columnNames: ['wavenumber', 'sample single beam', 'reference single beam', 'absorbance', 'flag'],
    });
    // The fixture's absorbance column is −log10(sample/reference) rounded to 7 decimals (Beer–Lambert);
    // tolerance 5e-8 = half a unit in the 7th decimal.
    const rows = fixture('extra_columns.csv')
      .trim()
      .split('\n')
      .slice(1)
      .map((l) => l.split(','));
    rows.forEach((r, i) => expect(Math.abs(trace.absorbance[i] + Math.log10(Number(r[1]) / Number(r[2])))).toBeLessThan(5e-8));
  });
  it('reads the single-beam column as transmittance-like when asked (yColumn 1, ordinate override)', () => {
    const { trace, report } = loadFixture('extra_columns.csv', { yColumn: 1, ordinate: 'transmittance' });
    expect(report.ordinate).toBe('transmittance');
    expect(trace.absorbance[0]).toBeCloseTo(-Math.log10(0.81), 15);
  });
  it('skips bad rows and lists their lines with the reasons', () => {
    const { trace, report } = loadFixture('bad_rows.csv');
    expect(report.skipped).toEqual({ count: 7, lines: [4, 6, 8, 9, 10, 12, 14] });
    // One message per kind of problem, each with its count and lines (the words of traceImportWarnings).
    expect(report.messages.slice(1)).toEqual([
      "3 rows skipped, text where a number belongs (e.g. 'n/a' on line 4), at lines 4, 9, 14",
      '3 rows skipped, not finite numbers (NaN or Infinity), at lines 6, 10, 12',
      '1 row skipped, x repeated from an earlier row (the first row of each x is kept; y differs from the row kept in 1 of 1), at line 8',
    ]);
    expect(arr(trace.wavenumberCm1)).toEqual([900, 900.5, 901, 902, 903, 904]);
    expect(trace.absorbance[3]).toBe(0.5); // the first 902.0 row is kept, the duplicate on line 8 dropped
  });
  it('caps the line list at ten with "and N more"', () => {
    // Lines 2, 4, …, 30 hold data; lines 3, 5, …, 31 are bad.
    const text = 'x,y\n' + Array.from({ length: 30 }, (_, k) => (k % 2 ? 'bad,row' : `${k + 1},0.${k + 1}`)).join('\n');
    const { report } = load(text);
    expect(report.messages).toContain(
      "15 rows skipped, text where a number belongs (e.g. 'bad' on line 3), at lines 3, 5, 7, 9, 11, 13, 15, 17, 19, 21 and 5 more",
    );
    expect(report.skipped.lines.length).toBe(15);
  });
  it('reads quoted fields through papaparse', () => {
    const { report } = loadFixture('quoted.csv');
    expect(report).toMatchObject({ usedFastPath: false, points: 3, columnNames: ['Wavenumber (cm-1)', 'Absorbance'] });
  });
  it('guesses transmittance from the values of a file without a header, and says so', () => {
    const { trace, report } = loadFixture('no_header_transmittance.csv');
    expect(report.ordinate).toBe('transmittance');
    expect(report.messages).toContain(
      'the ordinate is not named in the file; read as transmittance (fraction) from the values (values in [0.42, 1], median 0.98); set the ordinate option to override',
    );
    expect(Object.is(trace.absorbance[4], 0)).toBe(true);
  });
  // A strongly absorbing band: T values with median 0.3 would be guessed as absorbance from the values alone.
  const deepBand = ['2000.0 0.35', '2000.5 0.20', '2001.0 0.05', '2001.5 0.30', '2002.0 0.90', '2002.5 0.25'].join('\n');
  it('reads the column names of a leading # comment line as the header (fast and general readers)', () => {
    for (const [text, fast] of [
      [`# wavenumber transmittance\n${deepBand}\n`, true],
      [`% sample: invented\n#wavenumber   transmittance\n\n${deepBand}\n`, true],
      // A quoted field sends the file to the general reader.
      [`# wavenumber,transmittance\n${deepBand.replace(/ /g, ',').replace('2000.0', '"2000.0"')}\n`, false],
    ] as const) {
      const { trace, report } = load(text, 'deep.txt');
      expect(report).toMatchObject({ usedFastPath: fast, ordinate: 'transmittance', columnNames: ['wavenumber', 'transmittance'] });
      expect(trace.absorbance[2]).toBeCloseTo(-Math.log10(0.05), 14);
      expect(report.messages.some((m) => m.startsWith('column names read from the comment on line'))).toBe(true);
    }
  });
  it('reads units from a comment header that splits into more fields than the data has columns', () => {
    const { report } = load('# wavelength (um)   %T\n4.0 35\n4.5 20\n5.0 5\n5.5 30\n6.0 90\n', 'um.txt');
    expect([report.xUnit, report.ordinate]).toEqual(['um', 'percent-transmittance']);
  });
  it('does not take a comment sentence or a comment with numbers for a header', () => {
    for (const comment of ['# transmission cell at room temperature', '# path 10 cm', '# invented band']) {
      const { report } = load(`${comment}\n${deepBand}\n`, 'deep.txt');
      expect(report.ordinate).toBe('absorbance');
      expect(report.columnNames).toBeUndefined();
    }
    // A header row that is not a comment still wins over a comment above it.
    const { report } = load(`# wavenumber transmittance\nx absorbance\n${deepBand}\n`, 'deep.txt');
    expect([report.ordinate, report.columnNames]).toEqual(['absorbance', ['x', 'absorbance']]);
  });
  it('hints at µm when an unlabelled axis spans 2.5–25', () => {
    const { report } = load('2.5,0.1\n10,0.2\n25,0.3\n');
    expect(report.messages).toContain(
      "the abscissa runs from 2.5 to 25 and was read as cm^-1; if these are wavelengths in µm, set xUnit to 'um'",
    );
  });
  it('honours xUnit and ordinate overrides', () => {
    const { trace, report } = load('2.5,50\n10,10\n', 'a.csv', { xUnit: 'um', ordinate: 'percent-transmittance' });
    expect([report.xUnit, report.ordinate]).toEqual(['um', 'percent-transmittance']);
    expect(arr(trace.wavenumberCm1)).toEqual([1000, 4000]);
    expect(trace.absorbance[0]).toBeCloseTo(1, 15);
  });
  it('sorts an unordered axis and reports it', () => {
    const { trace, report } = load('3,0.3\n1,0.1\n2,0.2\n');
    expect(arr(trace.wavenumberCm1)).toEqual([1, 2, 3]);
    expect(report.messages).toContain('the axis is not monotonic (first reversal at line 3); points were sorted by wavenumber');
  });
  it('clamps T ≤ 0 and names how many points', () => {
    const { report } = load('x,T\n1,0.9\n2,0\n3,-0.01\n4,0.95\n');
    expect(report.messages).toContain('2 points with transmittance ≤ 0 clamped to T = 0.000001 (A = 6): lines 3, 4');
  });
  it('reads CRLF and BOM-prefixed files', () => {
    const { report, trace } = load('\uFEFFwavenumber,absorbance\r\n1,0.5\r\n2,0.25\r\n');
    expect([report.usedFastPath, report.columnNames, arr(trace.absorbance)]).toEqual([true, ['wavenumber', 'absorbance'], [0.5, 0.25]]);
  });
});

describe('importTrace on JCAMP-DX fixtures', () => {
  it('reads the DIFDUP fixture (5.01) like its CSV copy', () => {
    const jdx = loadFixture('band_difdup.jdx');
    const csv = loadFixture('band.csv');
    expect(jdx.report).toMatchObject({
      format: 'jcamp-dx',
      points: 64,
      wasDescending: true,
      title: 'fictitious band, (X++(Y..Y)) band_difdup.jdx',
    });
    expect(arr(jdx.trace.wavenumberCm1)).toEqual(arr(csv.trace.wavenumberCm1));
    // Tolerance 1e-15: integer × YFACTOR against the decimal text (one ulp).
    arr(jdx.trace.absorbance).forEach((a, i) => expect(Math.abs(a - csv.trace.absorbance[i])).toBeLessThan(1e-15));
  });
  it('reads a µm transmittance JCAMP-DX file', () => {
    const { trace, report } = loadFixture('film_um_transmittance.jdx');
    expect(report).toMatchObject({ xUnit: 'um', ordinate: 'transmittance', points: 11, wasDescending: false });
    // Ref: ν̃ = 1e4/λ: 2.6 µm → 3846.15… cm^-1, 2.5 µm → 4000 cm^-1; A = −log10(0.95) at 2.5 µm.
    expect(trace.wavenumberCm1[0]).toBeCloseTo(1e4 / 2.6, 9);
    expect(trace.wavenumberCm1[10]).toBe(4000);
    expect(trace.absorbance[10]).toBeCloseTo(-Math.log10(0.95), 14);
  });
  it("reads an nm %T (XY..XY) file and skips the '?' point by line", () => {
    const { trace, report } = loadFixture('overtone_nm_percent.jdx');
    expect(report).toMatchObject({ xUnit: 'nm', ordinate: 'percent-transmittance', points: 5, skipped: { count: 1, lines: [12] } });
    expect(report.messages).toContain("1 point skipped, missing values ('?'), at line 12");
    expect(trace.wavenumberCm1[4]).toBe(1e7 / 1600);
  });
  it('reads a transmittance JCAMP-DX file whose values are percent as %T, and says so', () => {
    const t = fixture('overtone_nm_percent.jdx').replace('##YUNITS=%T', '##YUNITS=TRANSMITTANCE');
    const { report } = load(t, 'p.jdx');
    expect(report.ordinate).toBe('percent-transmittance');
    expect(report.messages).toContain("'TRANSMITTANCE' with values up to 99 read as percent transmittance");
  });
});

describe('importTrace ordinate round trips', () => {
  // Absorbance values written as T or %T with 17 significant digits come back to round-off.
  // Tolerance 1e-13 absolute: T = 10^−A, the 17-digit text and log10 each add a few ulp.
  const a = Array.from({ length: 50 }, (_, i) => 0.02 + 2.5 * Math.exp(-(((i - 25) / 4) ** 2)));
  const x = a.map((_, i) => 1000 + i * 0.5);
  it.each([
    ['absorbance', (v: number) => v],
    ['transmittance', (v: number) => 10 ** -v],
    ['percent-transmittance', (v: number) => 100 * 10 ** -v],
  ] as const)('A → %s → A', (ordinate, to) => {
    const text = x.map((xi, i) => `${xi},${to(a[i]).toPrecision(17)}`).join('\n');
    const { trace, report } = load(text, 'rt.csv', { ordinate });
    expect(report.ordinate).toBe(ordinate);
    arr(trace.absorbance).forEach((v, i) => expect(Math.abs(v - a[i])).toBeLessThan(1e-13));
  });
  it('the value guess recognises the same band written as T and as %T', () => {
    expect(load(x.map((xi, i) => `${xi},${(10 ** -a[i]).toFixed(6)}`).join('\n')).report.ordinate).toBe('transmittance');
    expect(load(x.map((xi, i) => `${xi},${(100 * 10 ** -a[i]).toFixed(4)}`).join('\n')).report.ordinate).toBe('percent-transmittance');
    expect(load(x.map((xi, i) => `${xi},${a[i].toFixed(6)}`).join('\n')).report.ordinate).toBe('absorbance');
  });
});

describe('importTrace progress and purity', () => {
  const rows = (n: number, sep = ',', dec = '.') =>
    Array.from({ length: n }, (_, i) =>
      `${(400 + i * 0.01).toFixed(4)}${sep}${(0.5 + 0.4 * Math.sin(i / 50)).toFixed(6)}`.replace(/\./g, dec),
    ).join('\n');
  it.each([
    ['the fast path', rows(200000)],
    ['the papaparse path', rows(200000, ';', ',')],
    [
      'the JCAMP-DX reader',
      '##TITLE=big\n##JCAMP-DX=4.24\n##XUNITS=1/CM\n##YUNITS=ABSORBANCE\n##FIRSTX=0\n##LASTX=49999\n##NPOINTS=50000\n##XYDATA=(X++(Y..Y))\n' +
        Array.from({ length: 5000 }, (_, k) => `${k * 10} ${Array.from({ length: 10 }, (_, j) => (k * 10 + j) % 977).join(' ')}`).join(
          '\n',
        ) +
        '\n##END=\n',
    ],
  ])('reports monotone progress from 0 to 1 in steps ≤ 5 %% on a large input read by %s', (_label, text) => {
    const seen: number[] = [];
    const r = importTrace(text, 'p', {}, (f) => seen.push(f));
    expect(r.ok).toBe(true);
    expect(seen[0]).toBe(0);
    expect(seen.at(-1)).toBe(1);
    for (let i = 1; i < seen.length; i++) {
      expect(seen[i]).toBeGreaterThan(seen[i - 1]);
      expect(seen[i] - seen[i - 1]).toBeLessThanOrEqual(0.05 + 1e-12);
    }
  });
  it('leaves frozen options untouched and gives the same result twice', () => {
    const options = Object.freeze({ yColumn: 1 });
    const text = fixture('band.csv');
    const a = load(text, 'a', options);
    const b = load(text, 'a', options);
    expect(arr(a.trace.absorbance)).toEqual(arr(b.trace.absorbance));
    expect(a.trace.absorbance).not.toBe(b.trace.absorbance);
  });
  it('reads 1,000,000 plain "x,y" rows with the right first and last values', () => {
    const n = 1_000_000;
    const parts: string[] = new Array(n);
    for (let i = 0; i < n; i++) parts[i] = `${(400 + i * 0.0036).toFixed(4)},${((i % 1000) / 1000 + 0.000001).toFixed(6)}\n`;
    const { trace, report } = load('wavenumber,absorbance\n' + parts.join(''), 'million.csv');
    expect([report.points, report.usedFastPath]).toEqual([n, true]);
    expect(trace.wavenumberCm1[0]).toBe(400);
    expect(trace.absorbance[0]).toBe(0.000001);
    expect(trace.wavenumberCm1[n - 1]).toBe(Number((400 + (n - 1) * 0.0036).toFixed(4)));
    expect(trace.absorbance[n - 1]).toBe(Number((999 / 1000 + 0.000001).toFixed(6)));
  });
});
