/**
 * A small JCAMP-DX writer for the round-trip tests, written from the pseudo-digit tables of the standard
 * (McDonald & Wilks, Appl. Spectrosc. 42 (1988) 151, ASDF section; from memory):
 *   SQZ  @ A–I = 0…9, a–i = −1…−9 (first digit and sign of an absolute value)
 *   DIF  % J–R = 0…9, j–r = −1…−9 (first digit and sign of a difference)
 *   DUP  S–Z, s = 1…9 (the previous token occurs N times in all)
 * DIF lines end with the y-check: the next line starts with the last ordinate again, as SQZ.
 * Independent of src/io/jcampAsdf.ts (encoder, not decoder), so decode(encode(y)) = y is a real check.
 */

/** Ordinate forms the writer produces. */
export type JcampForm = 'AFFN' | 'PAC' | 'SQZ' | 'SQZDUP' | 'DIF' | 'DIFDUP';

function pseudo(value: number, positive: string, negative: string): string {
  const digits = String(Math.abs(value));
  const first = Number(digits[0]);
  const head = value < 0 ? negative[first - 1] : positive[first];
  return head + digits.slice(1);
}

/** SQZ token of an integer. */
export function asdfSqz(value: number): string {
  return pseudo(value, '@ABCDEFGHI', 'abcdefghi');
}

/** DIF token of an integer difference. */
export function asdfDif(delta: number): string {
  return pseudo(delta, '%JKLMNOPQR', 'jklmnopqr');
}

/** DUP token for a run of `count` ≥ 2 equal tokens. */
export function asdfDup(count: number): string {
  const digits = String(count);
  return 'STUVWXYZs'[Number(digits[0]) - 1] + digits.slice(1);
}

/** AFFN text of a number: shortest round-trip digits, exponent as 'E' (a lowercase 'e' is SQZ −5). */
function affn(v: number): string {
  return (Object.is(v, -0) ? '-0' : String(v)).replace('e', 'E');
}

/** Replace runs of equal tokens by the token and a DUP count. */
function dupCompress(tokens: string[]): string[] {
  const out: string[] = [];
  for (let i = 0; i < tokens.length;) {
    let j = i + 1;
    while (j < tokens.length && tokens[j] === tokens[i]) j++;
    out.push(tokens[i]);
    if (j - i >= 2) out.push(asdfDup(j - i));
    i = j;
  }
  return out;
}

/** Input of `jcampWrite`. */
export interface JcampWriteInput {
  /** Ordinates in file units before YFACTOR (integers for SQZ/DIF/DIFDUP; any finite number for AFFN/PAC). */
  y: number[];
  firstX: number;
  lastX: number;
  yFactor: number;
  form: JcampForm;
  /** Ordinates per data line, cycled. */
  perLine: number[];
  /** Write ##END= (true) or leave the file cut after the table. */
  hasEnd: boolean;
}

/**
 * Write a (X++(Y..Y)) JCAMP-DX 5.01 infrared file. Each line starts with the abscissa of its first
 * ordinate, FIRSTX + i·(LASTX − FIRSTX)/(NPOINTS − 1), written by String() (exact for the reader's X check).
 */
export function jcampWrite(input: JcampWriteInput): string {
  const { y, firstX, lastX, yFactor, form } = input;
  const n = y.length;
  const step = n > 1 ? (lastX - firstX) / (n - 1) : 0;
  const head = [
    '##TITLE=round trip (generated)',
    '##JCAMP-DX=5.01',
    '##DATA TYPE=INFRARED SPECTRUM',
    '##XUNITS=1/CM',
    '##YUNITS=ABSORBANCE',
    '##XFACTOR=1',
    `##YFACTOR=${yFactor}`,
    `##FIRSTX=${firstX}`,
    `##LASTX=${lastX}`,
    `##NPOINTS=${n}`,
    '##XYDATA=(X++(Y..Y))',
  ];
  const lines: string[] = [];
  let i = 0;
  let k = 0;
  const isDif = form === 'DIF' || form === 'DIFDUP';
  let lastLineEndsDif = false;
  while (i < n) {
    const count = Math.max(1, input.perLine[k++ % input.perLine.length]);
    // A DIF line after a DIF line repeats the previous line's last ordinate (the y-check).
    const from = isDif && lastLineEndsDif ? i - 1 : i;
    const to = Math.min(n, i + count);
    const x = String(firstX + from * step);
    const ys = y.slice(from, to);
    let body: string;
    if (form === 'AFFN') body = ' ' + ys.map(affn).join(' ');
    else if (form === 'PAC') body = ys.map((v) => (v < 0 || Object.is(v, -0) ? affn(v) : '+' + affn(v))).join('');
    else if (form === 'SQZ') body = ys.map(asdfSqz).join('');
    else if (form === 'SQZDUP') body = dupCompress(ys.map(asdfSqz)).join('');
    else {
      const tokens = [asdfSqz(ys[0])];
      for (let m = 1; m < ys.length; m++) tokens.push(asdfDif(ys[m] - ys[m - 1]));
      body = (form === 'DIFDUP' ? dupCompress(tokens) : tokens).join('');
    }
    lines.push(x + body);
    lastLineEndsDif = isDif && ys.length > 1;
    i = to;
  }
  return [...head, ...lines, ...(input.hasEnd ? ['##END='] : [])].join('\n') + '\n';
}
