import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { delimitedParseNumeric } from '../../src/io/delimitedParseNumeric';

// Reference for every value: the JavaScript engine's own Number(string), which ECMAScript requires to be
// correctly rounded for up to 20 significant digits (ECMA-262 §7.1.4.1.1, StringToNumber; from memory).
const byNumber = (text: string, col: number) =>
  text
    .split('\n')
    .filter((l) => l.trim() !== '')
    .map((l) => Number(l.split(/\s*,\s*|\s+/).filter((f) => f !== '')[col]));

describe('delimitedParseNumeric refusals (null = not plain)', () => {
  it.each([
    ['empty text', ''],
    ['a single column', '1\n2\n3\n'],
    ['a header line', 'x,y\n1,2\n'],
    ['a comment line', '# c\n1,2\n'],
    ['decimal commas with semicolons', '1234,5678;0,123\n'],
    ['semicolon delimiter', '1;2\n3;4\n'],
    ['a ragged row', '1,2\n3,4,5\n'],
    ['a blank line inside the data', '1,2\n\n3,4\n'],
    ['quoted numbers', '"1","2"\n'],
    ['a trailing comma', '1,2,\n3,4,\n'],
    ['an empty field', '1,,2\n3,4,5\n'],
    ['a lone CR line end', '1,2\r3,4\r'],
    ['NaN text', '1,NaN\n'],
    ['a bare exponent', '1,2e\n'],
    ['a sign without digits', '1,-\n'],
    ['space-separated numbers in comma mode', '1,2\n3 4,5\n'],
    ['a comma in blank-separated mode', '1 2\n3,4\n'],
  ])('returns null for %s', (_label, text) => {
    expect(delimitedParseNumeric(text)).toBeNull();
  });
  it('returns null when yColumn is beyond the columns', () => {
    expect(delimitedParseNumeric('1,2\n3,4\n', { yColumn: 2 })).toBeNull();
  });
});

describe('delimitedParseNumeric on plain text', () => {
  it('reads two comma-separated rows', () => {
    const r = delimitedParseNumeric('1000.5,0.25\n1001.5,0.5\n');
    expect(r && [Array.from(r.x), Array.from(r.y), r.columns, r.delimiter]).toEqual([[1000.5, 1001.5], [0.25, 0.5], 2, ',']);
  });
  it('reads CRLF line ends, blanks around commas, a missing final line end and trailing blank lines', () => {
    const r = delimitedParseNumeric('  1 , 2\r\n3 ,4\r\n5, 6\r\n\r\n  \n');
    expect(r && [Array.from(r.x), Array.from(r.y)]).toEqual([
      [1, 3, 5],
      [2, 4, 6],
    ]);
    expect(Array.from(delimitedParseNumeric('1,2\n3,4')!.y)).toEqual([2, 4]);
  });
  it('reads tab- and space-separated columns as blank-separated', () => {
    const r = delimitedParseNumeric('1\t2\t3\n4   5 \t 6\n', { yColumn: 2 });
    expect(r && [Array.from(r.x), Array.from(r.y), r.columns, r.delimiter]).toEqual([[1, 4], [3, 6], 3, 'whitespace']);
  });
  it('reads signs, exponents and forms without integer or fraction digits exactly as Number does', () => {
    const fields = [
      '+1.5',
      '-0.25',
      '.5',
      '5.',
      '1e3',
      '-2.5E-4',
      '+7e+2',
      '0.000000000000000000000123',
      '12345678901234567890',
      '1e400',
      '-0',
    ];
    const text = fields.map((f) => `1,${f}\n`).join('');
    const r = delimitedParseNumeric(text)!;
    fields.forEach((f, i) => expect(Object.is(r.y[i], Number(f)), f).toBe(true));
  });
  it('starts at a given offset (after a header)', () => {
    const text = 'wavenumber,absorbance\n10,1\n20,2\n';
    const r = delimitedParseNumeric(text, { start: text.indexOf('\n') + 1 });
    expect(r && Array.from(r.x)).toEqual([10, 20]);
  });
  it('reports progress from 0 to 1 in steps of at most 5 %', () => {
    const text = Array.from({ length: 20000 }, (_, i) => `${i}.5,${i}\n`).join('');
    const seen: number[] = [];
    delimitedParseNumeric(text, { onProgress: (f) => seen.push(f) });
    expect(seen.at(-1)).toBe(1);
    let prev = 0;
    for (const f of seen) {
      expect(f).toBeGreaterThanOrEqual(prev);
      expect(f - prev).toBeLessThanOrEqual(0.05);
      prev = f;
    }
  });
});

describe('delimitedParseNumeric agrees bit for bit with Number()', () => {
  // Seeded property test; the field generator covers fixed, exponential and long digit strings.
  const field = fc.oneof(
    fc.double({ noNaN: true, noDefaultInfinity: true }).map((v) => String(v)),
    fc.tuple(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.integer({ min: 0, max: 12 })).map(([v, d]) => v.toFixed(d)),
    fc.tuple(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer({ min: 0, max: 20 })).map(([v, d]) => v.toExponential(d)),
    fc
      .tuple(fc.stringMatching(/^[0-9]{1,22}$/), fc.stringMatching(/^[0-9]{0,22}$/), fc.boolean())
      .map(([a, b, neg]) => `${neg ? '-' : ''}${a}.${b}`),
  );
  it('for random rows of random fields (seed 20260101, 300 runs)', () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(field, field), { minLength: 1, maxLength: 30 }), fc.boolean(), (rows, comma) => {
        const text = rows.map(([a, b]) => (comma ? `${a},${b}` : `${a} ${b}`)).join('\n') + '\n';
        const r = delimitedParseNumeric(text);
        expect(r).not.toBeNull();
        const xs = byNumber(text, 0);
        const ys = byNumber(text, 1);
        for (let i = 0; i < rows.length; i++) {
          expect(Object.is(r!.x[i], xs[i]), rows[i][0]).toBe(true);
          expect(Object.is(r!.y[i], ys[i]), rows[i][1]).toBe(true);
        }
      }),
      { seed: 20260101, numRuns: 300 },
    );
  });
  it('for 100 000 rows in the benchmark layout (x with 4 decimals, y with 6)', () => {
    const rows = Array.from({ length: 100000 }, (_, i) => `${(400 + i * 0.0361).toFixed(4)},${(0.5 + 0.5 * Math.sin(i)).toFixed(6)}`);
    const r = delimitedParseNumeric(rows.join('\n') + '\n')!;
    let mismatches = 0;
    for (let i = 0; i < rows.length; i++) {
      const [a, b] = rows[i].split(',');
      if (!Object.is(r.x[i], Number(a)) || !Object.is(r.y[i], Number(b))) mismatches++;
    }
    expect(mismatches).toBe(0);
  });
});
