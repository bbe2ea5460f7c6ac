import { describe, expect, it } from 'vitest';
import { convert } from 'jcampconverter';
import { jcampAsdfDecodeLine } from '../../src/io/jcampAsdf';

const decode = (line: string, max = 1000) => {
  const r = jcampAsdfDecodeLine(line, max);
  if (!r.ok) throw new Error(r.error.message);
  return r.value;
};
const failure = (line: string, max = 1000) => {
  const r = jcampAsdfDecodeLine(line, max);
  if (r.ok) throw new Error('expected a failure');
  return r.error;
};

/** Decode one (X++(Y..Y)) line with jcampconverter (an independent npm implementation). */
function byJcampconverter(line: string, n: number): number[] {
  const text = `##TITLE=t\n##JCAMP-DX=4.24\n##XUNITS=1/CM\n##YUNITS=ABSORBANCE\n##FIRSTX=1\n##LASTX=${n}\n##NPOINTS=${n}\n##XYDATA=(X++(Y..Y))\n${line}\n##END=\n`;
  return Array.from(convert(text).flatten[0].spectra[0].data.y as number[]);
}

describe('jcampAsdfDecodeLine: the example of the standard', () => {
  // Ref: McDonald & Wilks, Appl. Spectrosc. 42 (1988) 151, ASDF section: the ordinates 2 3 3 2 1 0 −1 −2 −3
  // at X = 1 written in AFFN, PAC, SQZ, DIF and DIFDUP form (from memory). Exact: integers.
  const expected = [2, 3, 3, 2, 1, 0, -1, -2, -3];
  it.each([
    ['AFFN', '1 2 3 3 2 1 0 -1 -2 -3'],
    ['PAC', '1+2+3+3+2+1+0-1-2-3'],
    ['SQZ', '1BCCBA@abc'],
    ['DIF', '1BJ%jjjjjj'],
    ['DIFDUP', '1BJ%jX'],
  ])('decodes the %s form', (_form, line) => {
    const v = decode(line);
    expect(v.x).toBe(1);
    expect(v.y).toEqual(expected);
  });
  it('agrees with jcampconverter on the five forms', () => {
    for (const line of ['1 2 3 3 2 1 0 -1 -2 -3', '1+2+3+3+2+1+0-1-2-3', '1BCCBA@abc', '1BJ%jjjjjj', '1BJ%jX'])
      expect(byJcampconverter(line, 9), line).toEqual(expected);
  });
  it('marks DIF-ended lines (the next line must repeat the last ordinate)', () => {
    expect(decode('1BJ%jX').endsWithDif).toBe(true);
    expect(decode('1BCCBA@abc').endsWithDif).toBe(false);
  });
});

describe('jcampAsdfDecodeLine: pseudo-digit tables', () => {
  // Ref: same standard, SQZ/DIF/DUP character tables (from memory).
  it('reads every SQZ character with trailing digits', () => {
    const pos = '@ABCDEFGHI';
    const neg = 'abcdefghi';
    for (let d = 0; d <= 9; d++) expect(decode(`0 ${pos[d]}25`).y, pos[d]).toEqual([Number(`${d}25`)]);
    for (let d = 1; d <= 9; d++) expect(decode(`0 ${neg[d - 1]}25`).y, neg[d - 1]).toEqual([-Number(`${d}25`)]);
  });
  it('reads every DIF character as a difference from the previous ordinate', () => {
    const pos = '%JKLMNOPQR';
    const neg = 'jklmnopqr';
    for (let d = 0; d <= 9; d++) expect(decode(`0 A000${pos[d]}`).y, pos[d]).toEqual([1000, 1000 + d]);
    for (let d = 1; d <= 9; d++) expect(decode(`0 A000${neg[d - 1]}0`).y, neg[d - 1]).toEqual([1000, 1000 - d * 10]);
  });
  it('reads every DUP character and multi-digit counts (count includes the first occurrence)', () => {
    const dup = 'STUVWXYZs';
    for (let d = 1; d <= 9; d++) expect(decode(`0 E${dup[d - 1]}`).y.length, dup[d - 1]).toBe(d);
    expect(decode('0 @S2').y).toEqual(new Array(12).fill(0));
    expect(decode('0 AJT').y).toEqual([1, 2, 3]);
  });
  it('reads decimals after pseudo-digits and AFFN exponents with a sign', () => {
    expect(decode('10 A.5 1.5E+03 2.5e-1').y).toEqual([1.5, 1500, 0.25]);
  });
  it("reads 'E' between digits without a sign as the SQZ digit 5 (1E5 → 1, 55)", () => {
    expect(decode('0 1E5').y).toEqual([1, 55]);
  });
  it("reads '?' as an invalid (NaN) ordinate", () => {
    expect(decode('0 A ? B').y.map(String)).toEqual(['1', 'NaN', '2']);
  });
  it('accepts commas and tabs as AFFN separators', () => {
    expect(decode('5,1,\t2').y).toEqual([1, 2]);
  });
});

describe('jcampAsdfDecodeLine failures', () => {
  it('names an unexpected character and its column', () => {
    expect(failure('1BJ%jt')).toEqual({ column: 6, message: "unexpected character 't' in compressed (ASDF) data", isOverflow: false });
    expect(failure('1 2 #').column).toBe(5);
  });
  it('refuses a DIF character with nothing on the line to add to', () => {
    expect(failure('100J').message).toBe("DIF character 'J' has no ordinate before it on this line to add to");
  });
  it('refuses a DUP character right after the abscissa', () => {
    expect(failure('100T').message).toBe("DUP character 'T' has no ordinate before it to repeat");
  });
  it('refuses a sign without digits', () => {
    expect(failure('100 -').message).toBe("'-' is not followed by a number");
  });
  it('refuses an empty line', () => {
    expect(failure('   ').message).toBe('empty data line');
  });
  it('stops an absurd DUP count at the budget without expanding it', () => {
    // A DUP count of 10^15 would need 8 PB; the guard must answer at once.
    const e = failure('0 @S000000000000000', 100);
    expect(e.isOverflow).toBe(true);
  });
});
