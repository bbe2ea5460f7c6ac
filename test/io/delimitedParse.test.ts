import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { delimitedParse, type DelimitedParseOptions } from '../../src/io/delimitedParse';
import { delimitedParseNumeric } from '../../src/io/delimitedParseNumeric';

const fixture = (name: string) => readFileSync(new URL(`../fixtures/traces/${name}`, import.meta.url), 'utf8');
const opts = (o: Partial<DelimitedParseOptions> = {}): DelimitedParseOptions => ({
  yColumn: 1,
  delimiter: 'auto',
  decimal: 'auto',
  maxPoints: 5e7,
  ...o,
});
const parse = (text: string, o: Partial<DelimitedParseOptions> = {}) => {
  const r = delimitedParse(text, opts(o));
  if (!r.ok) throw new Error(r.error.message);
  return r.columns;
};
const refusal = (text: string, o: Partial<DelimitedParseOptions> = {}) => {
  const r = delimitedParse(text, opts(o));
  if (r.ok) throw new Error('expected a refusal');
  return r.error;
};

describe('delimitedParse refusals', () => {
  it('refuses text without numeric rows', () => {
    expect(refusal('a,b\nc,d\n').message).toBe('no numeric data rows found');
    expect(refusal('# only a comment\n').message).toBe('no numeric data rows found');
  });
  it('names the missing column when yColumn is beyond the data', () => {
    const e = refusal('1,2\n3,4\n', { yColumn: 3 });
    expect(e.message).toBe('column 4 (yColumn = 3) not found: the numeric rows have at most 2 columns');
    expect(e.field).toBe('yColumn');
  });
  it('refuses a file mixing decimal commas and points, naming both lines', () => {
    const e = refusal(fixture('mixed_decimals.csv'));
    expect(e.message).toBe(
      "mixed decimal separators: line 2 uses a decimal comma and line 4 uses a decimal point; set the decimal option to ',' or '.' to choose",
    );
    expect([e.line, e.field]).toEqual([4, 'decimal']);
  });
  it('refuses more rows than maxPoints, naming the line', () => {
    expect(refusal('1,1\n2,2\n3,3\n4,4\n', { maxPoints: 3 }).message).toBe('more than 3 data rows (limit maxPoints), at line 4');
  });
});

describe('delimitedParse layouts', () => {
  it('reads semicolons with decimal commas ("1234,5678;0,123")', () => {
    const c = parse(fixture('semicolon_decimal_comma.csv'));
    expect([c.delimiter, c.decimal, c.columnNames]).toEqual([';', ',', ['wavenumber (cm-1)', 'absorbance']]);
    expect(Array.from(c.x)).toEqual([1234.5678, 1235, 1235.5, 1236.25]);
    expect(Array.from(c.y)).toEqual([0.123, 0.25, 0.5, 0.125]);
    expect(Array.from(c.lines)).toEqual([2, 3, 4, 5]);
  });
  it('reads a tab-separated file with a header', () => {
    const c = parse(fixture('tab_percent_descending.txt'));
    expect([c.delimiter, c.columnNames]).toEqual(['\t', ['Wavenumber', '%T']]);
    expect(c.x[0]).toBe(1005);
    expect(c.y[2]).toBe(60.2);
  });
  it('skips #, %, ;, // comment lines and a preamble; the last preamble line is the header', () => {
    const c = parse(fixture('whitespace_comments.dat'));
    expect([c.delimiter, c.columnNames]).toEqual(['whitespace', ['wavenumber', 'absorbance']]);
    expect(Array.from(c.x)).toEqual([2100, 2100.5, 2101, 2101.5]);
    // Line 9 is a comment inside the data: ignored, not reported as skipped.
    expect(Array.from(c.lines)).toEqual([7, 8, 10, 11]);
    expect(c.skipped.count).toBe(0);
  });
  it('reads quoted header and fields', () => {
    const c = parse(fixture('quoted.csv'));
    expect(c.columnNames).toEqual(['Wavenumber (cm-1)', 'Absorbance']);
    expect(Array.from(c.y)).toEqual([0.0125, 0.025, 0.5]);
  });
  it('reads a quoted decimal comma in a comma-separated file', () => {
    const c = parse('"1,5","0,25"\n"2,5","0,5"\n');
    expect([Array.from(c.x), Array.from(c.y), c.decimal]).toEqual([[1.5, 2.5], [0.25, 0.5], ',']);
  });
  it('picks the requested column of a file with extra columns, text columns included', () => {
    const c = parse(fixture('extra_columns.csv'), { yColumn: 3 });
    expect(Array.from(c.y)).toEqual([0.0457575, 0.3424227, 0.0944212, 0.0050795]);
    expect(c.columnNames?.[3]).toBe('absorbance');
  });
  it('counts lines correctly with CRLF and with lone CR line ends', () => {
    expect(Array.from(parse('h1;h2\r\n1;2\r\nx;y\r\n3;4\r\n').lines)).toEqual([2, 4]);
    expect(Array.from(parse('h1;h2\r1;2\rx;y\r3;4\r').lines)).toEqual([2, 4]);
  });
  it('reads a file that mixes CRLF and LF line ends', () => {
    const c = parse('h1;h2\r\n1;2\n3;4\r\n5;6\n');
    expect([Array.from(c.x), Array.from(c.y), Array.from(c.lines)]).toEqual([
      [1, 3, 5],
      [2, 4, 6],
      [2, 3, 4],
    ]);
  });
  it('counts lines correctly when a quoted field spans two lines', () => {
    const c = parse('"a\nb",y\n1,2\n3,4\n');
    expect(Array.from(c.lines)).toEqual([3, 4]);
  });
  it('records non-numeric rows inside the data with their lines; NaN/Infinity values pass through', () => {
    const c = parse(fixture('bad_rows.csv'));
    expect(c.skipped.sortedLines()).toEqual([4, 9, 14]);
    expect(c.skipped.byReason.get('non-numeric')).toBe(3);
    expect(Array.from(c.y).map(String)).toContain('NaN');
    expect(Array.from(c.y)).toContain(Infinity);
    expect(Array.from(c.y)).toContain(-Infinity);
  });
  it('records rows lacking the ordinate column as "missing column"', () => {
    const c = parse('1,2\n3\n5,6\n');
    expect([c.skipped.sortedLines(), c.skipped.byReason.get('missing column')]).toEqual([[2], 1]);
  });
  it('with decimal forced to "," skips rows written with points instead of refusing', () => {
    const c = parse(fixture('mixed_decimals.csv'), { decimal: ',' });
    expect(c.skipped.sortedLines()).toEqual([4]);
    expect(Array.from(c.x)).toEqual([800, 801, 803]);
  });
  it('honours a forced delimiter', () => {
    const c = parse('1;2,5\n3;4,5\n', { delimiter: ';' });
    expect(Array.from(c.y)).toEqual([2.5, 4.5]);
  });
});

describe('delimitedParse agrees with the fast path on plain text', () => {
  it('gives identical columns for 5000 plain rows (comma and blank separated)', () => {
    // Seeded linear congruential values, so the test is reproducible.
    let s = 12345;
    const rnd = () => (s = (s * 1103515245 + 12345) % 2147483648) / 2147483648;
    const rows = Array.from({ length: 5000 }, (_, i) => [
      (500 + i * 0.25).toFixed(4),
      (rnd() * 2 - 0.5).toExponential(5),
      rnd().toFixed(6),
    ]);
    for (const sep of [',', '  ']) {
      const text = rows.map((r) => r.join(sep)).join('\n') + '\n';
      const fast = delimitedParseNumeric(text, { yColumn: 2 })!;
      const slow = parse(text, { yColumn: 2 });
      expect(Array.from(slow.x)).toEqual(Array.from(fast.x));
      expect(Array.from(slow.y)).toEqual(Array.from(fast.y));
    }
  });
});
