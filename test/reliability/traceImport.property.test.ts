/**
 * Property tests of importTrace (delimited text through the fast scanner and papaparse, JCAMP-DX AFFN/ASDF):
 * whatever the text, the call returns (no exception, no hang) either a usable trace (finite, strictly
 * ascending, equal-length columns) or a one-line message naming the file and, where there is one, the line.
 * Structured generators check exact values: numbers written as text read back as Number(text) (the
 * ECMAScript StringToNumber, ECMA-262 §7.1.4.1.1), and JCAMP files written by an independent ASDF encoder
 * decode to the encoded ordinates exactly; jcampconverter (npm) cross-checks a sample.
 */
import { readFileSync, readdirSync } from 'node:fs';
import fc from 'fast-check';
import { convert } from 'jcampconverter';
import { afterAll, describe, expect, it } from 'vitest';
import { importTrace } from '../../src/io/traceImport';
import type { TraceImportOptions } from '../../src/io/traceImportOptions';
import type { TraceImportOutcome } from '../../src/io/trace';
import { jcampParse } from '../../src/io/jcampParse';
import { inputIsOneLine } from '../../src/io/inputLimits';
import { jcampWrite, type JcampForm } from './jcampAsdfEncode';
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

const FIXTURE_DIR = new URL('../fixtures/traces/', import.meta.url);
const FIXTURES = readdirSync(FIXTURE_DIR)
  .filter((f) => !f.endsWith('.md') && !f.endsWith('.mjs'))
  .map((f) => readFileSync(new URL(f, FIXTURE_DIR), 'utf8'));

afterAll(() => countsPrint('traceImport.property.test.ts'));

/** Import with the hang guard and check the invariants of any outcome; returns the outcome. */
function importChecked(text: string, fileName = 'fuzz.csv', options?: Partial<TraceImportOptions>): TraceImportOutcome {
  countInput('importTrace');
  const run = timed(() => importTrace(text, fileName, options));
  if (!run.ok) throw new Error(`importTrace threw: ${String(run.error)}`);
  expect(run.ms, 'one import call').toBeLessThan(HANG_LIMIT_MS);
  const outcome = run.value;
  if (outcome.ok) {
    const { wavenumberCm1: x, absorbance: y } = outcome.trace;
    expect(x.length).toBe(y.length);
    expect(x.length).toBeGreaterThanOrEqual(2);
    for (let i = 0; i < x.length; i++) {
      if (!Number.isFinite(x[i]) || !Number.isFinite(y[i])) throw new Error(`non-finite point ${i}: ${x[i]}, ${y[i]}`);
      if (i > 0 && !(x[i] > x[i - 1])) throw new Error(`axis not strictly ascending at ${i}: ${x[i - 1]}, ${x[i]}`);
    }
    expect(outcome.report.points).toBe(x.length);
    expect(outcome.report.rangeCm1).toEqual([x[0], x[x.length - 1]]);
    for (const m of outcome.report.messages) expect(inputIsOneLine(m), JSON.stringify(m)).toBe(true);
  } else {
    const isOptionError = outcome.error.message.startsWith('importTrace: options.');
    expectGoodMessage(outcome.error.message, { prefix: isOptionError ? undefined : `${fileName}: `, line: outcome.error.line });
  }
  return outcome;
}

const TRACE_ALPHABET = '0123456789.,;\t \n\r-+eE#%!/?"@ABCDEFGHIabcdefghiJKLMNOPQRjklmnopqr%STUVWXYZs=$()XY';
const JCAMP_HEAD = '##TITLE=t\n##JCAMP-DX=4.24\n##XUNITS=1/CM\n##FIRSTX=1000\n##LASTX=1010\n##XYDATA=(X++(Y..Y))\n';

describe('importTrace on hostile text: never throws, never hangs, data or a one-line message', () => {
  // Seeds fixed so a failure is reproducible; numRuns sized for a few seconds per property.
  it('random strings (any code points, the parser alphabet, hostile tokens)', () => {
    fc.assert(
      fc.property(randomTextArb(TRACE_ALPHABET), (text) => {
        importChecked(text);
        importChecked(JCAMP_HEAD + text, 'fuzz.jdx');
      }),
      { numRuns: 3000, seed: 101 },
    );
  });

  it('random bytes decoded as latin1 or UTF-8', () => {
    fc.assert(
      fc.property(bytesTextArb(), (text) => void importChecked(text, 'bytes.bin')),
      { numRuns: 2000, seed: 102 },
    );
  });

  it('mutations of the trace fixtures (edits, truncation, swapped lines, NaN/1e999/-0, decimal commas, BOM, CR, NUL)', () => {
    fc.assert(
      fc.property(mutationArb(FIXTURES), (text) => void importChecked(text, 'mutated.txt')),
      { numRuns: 8000, seed: 103 },
    );
  });

  it('mutations of generated delimited tables and JCAMP-DX files', () => {
    const seeds = [
      ...fc.sample(delimitedTableArb, { numRuns: 20, seed: 7 }).map((t) => t.text),
      ...fc.sample(jcampCaseArb, { numRuns: 20, seed: 8 }).map((c) => c.text),
    ];
    fc.assert(
      fc.property(mutationArb(seeds), (text) => void importChecked(text, 'mutated.txt')),
      { numRuns: 4000, seed: 104 },
    );
  });

  it('random option values, valid or not, on a valid file', () => {
    const anyValue = fc.oneof(fc.string({ maxLength: 5 }), fc.integer(), fc.double(), fc.constant(undefined), fc.constant(null));
    const optionsArb = fc.record(
      {
        format: fc.oneof(fc.constantFrom('auto', 'delimited', 'jcamp-dx'), anyValue),
        yColumn: fc.oneof(fc.integer({ min: -2, max: 6 }), anyValue),
        xUnit: fc.oneof(fc.constantFrom('auto', 'cm-1', 'um', 'nm'), anyValue),
        ordinate: fc.oneof(fc.constantFrom('auto', 'absorbance', 'transmittance', 'percent-transmittance'), anyValue),
        delimiter: fc.oneof(fc.constantFrom('auto', ',', '\t', ';', 'whitespace'), anyValue),
        decimal: fc.oneof(fc.constantFrom('auto', '.', ','), anyValue),
        maxChars: fc.oneof(fc.integer({ min: 0, max: 2000 }), anyValue),
        maxPoints: fc.oneof(fc.integer({ min: 0, max: 100 }), anyValue),
      },
      { requiredKeys: [] },
    );
    fc.assert(
      fc.property(fc.nat(FIXTURES.length - 1), optionsArb, (i, options) => {
        importChecked(FIXTURES[i], 'options.txt', options as Partial<TraceImportOptions>);
      }),
      { numRuns: 1500, seed: 105 },
    );
  });
});

/** A delimited numeric table and the values it must read back as. */
interface DelimitedCase {
  text: string;
  yColumn: number;
  x: number[];
  y: number[];
}

const delimitedTableArb: fc.Arbitrary<DelimitedCase> = fc
  .record({
    rows: fc.integer({ min: 2, max: 40 }),
    columns: fc.integer({ min: 2, max: 4 }),
    yPick: fc.nat(),
    delimiter: fc.constantFrom(',', '\t', ';', ' ', '   ', ' \t', ', '),
    wantsDecimalComma: fc.boolean(),
    hasHeader: fc.boolean(),
    comments: fc.array(fc.tuple(fc.nat(), fc.constantFrom('# a note', '% remark', '// tool v1', '! bang', '  # indented')), {
      maxLength: 3,
    }),
    blankInside: fc.boolean(),
    eol: fc.constantFrom('\n', '\r\n', '\r'),
    isDescending: fc.boolean(),
    decimals: fc.integer({ min: 0, max: 6 }),
    x0: fc.integer({ min: 1, max: 5_000_000 }),
    steps: fc.array(fc.integer({ min: 1, max: 1000 }), { minLength: 40, maxLength: 40 }),
    values: fc.array(fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e6, max: 1e6 }), { minLength: 160, maxLength: 160 }),
    yFormat: fc.constantFrom('shortest', 'fixed', 'exponent'),
    fixedDigits: fc.integer({ min: 0, max: 10 }),
    trailingBlank: fc.boolean(),
    hasBom: fc.boolean(),
  })
  .map((g) => {
    const isDecimalComma = g.wantsDecimalComma && !g.delimiter.includes(',');
    const sep = (s: string) => (isDecimalComma ? s.replace('.', ',') : s);
    const yColumn = 1 + (g.yPick % (g.columns - 1));
    // x on a grid of 10^-decimals: distinct decimal strings, so distinct doubles.
    const scale = 10 ** g.decimals;
    const xs: string[] = [];
    let units = g.x0;
    for (let r = 0; r < g.rows; r++) {
      units += g.steps[r];
      xs.push((units / scale).toFixed(g.decimals));
    }
    if (g.isDescending) xs.reverse();
    const fmt = (v: number) =>
      g.yFormat === 'shortest' ? String(v) : g.yFormat === 'fixed' ? v.toFixed(g.fixedDigits) : v.toExponential(g.fixedDigits);
    const lines: string[] = [];
    if (g.hasHeader) lines.push(['wavenumber', 'signal', 'extra', 'more'].slice(0, g.columns).join(g.delimiter));
    const x: number[] = [];
    const y: number[] = [];
    for (let r = 0; r < g.rows; r++) {
      const cells = [sep(xs[r])];
      for (let c = 1; c < g.columns; c++) cells.push(sep(fmt(g.values[(r * 4 + c) % g.values.length])));
      lines.push(cells.join(g.delimiter));
      // Reference value: ECMAScript Number() of the written text (decimal comma read as a point).
      x.push(Number(cells[0].replace(',', '.')));
      y.push(Number(cells[yColumn].replace(',', '.')));
    }
    for (const [at, comment] of g.comments) lines.splice(at % (lines.length + 1), 0, comment);
    if (g.blankInside) lines.splice(1 + (g.rows >> 1), 0, '');
    let text = (g.hasBom ? '\uFEFF' : '') + lines.join(g.eol) + g.eol + (g.trailingBlank ? g.eol : '');
    if (text.startsWith('\uFEFF\n')) text = text.slice(1);
    const order = x.map((_, i) => i).sort((a, b) => x[a] - x[b]);
    return { text, yColumn, x: order.map((i) => x[i]), y: order.map((i) => y[i]) };
  });

describe('importTrace on generated delimited tables: values read back exactly', () => {
  it('random delimiters, decimal separators, headers, comments, line ends and number formats', () => {
    const paths = { fast: 0, general: 0 };
    fc.assert(
      fc.property(delimitedTableArb, (c) => {
        const outcome = importChecked(c.text, 'table.csv', { xUnit: 'cm-1', ordinate: 'absorbance', yColumn: c.yColumn });
        if (!outcome.ok) throw new Error(`refused: ${outcome.error.message}\n${c.text}`);
        paths[outcome.report.usedFastPath ? 'fast' : 'general']++;
        // Exact: both readers must give Number(text) (toEqual also tells +0 from −0).
        expect(Array.from(outcome.trace.wavenumberCm1)).toEqual(c.x);
        expect(Array.from(outcome.trace.absorbance)).toEqual(c.y);
      }),
      { numRuns: 1500, seed: 106 },
    );
    // Both readers (the plain-numeric scanner and papaparse) were exercised.
    expect(paths.fast).toBeGreaterThan(50);
    expect(paths.general).toBeGreaterThan(100);
  });
});

/** A generated JCAMP-DX file and the columns it encodes. */
interface JcampCase {
  text: string;
  form: JcampForm;
  /** Ordinates before YFACTOR. */
  yRaw: number[];
  yFactor: number;
  firstX: number;
  lastX: number;
}

const jcampCaseArb: fc.Arbitrary<JcampCase> = fc
  .record({
    n: fc.integer({ min: 2, max: 200 }),
    form: fc.constantFrom<JcampForm>('AFFN', 'PAC', 'SQZ', 'SQZDUP', 'DIF', 'DIFDUP'),
    y0: fc.integer({ min: -1_000_000, max: 1_000_000 }),
    // Many zero steps, so DUP runs (of equal values and of equal differences) occur.
    steps: fc.array(fc.oneof(fc.constant(0), fc.constant(7), fc.integer({ min: -50_000, max: 50_000 })), {
      minLength: 200,
      maxLength: 200,
    }),
    floats: fc.array(fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e9, max: 1e9 }), { minLength: 200, maxLength: 200 }),
    perLine: fc.array(fc.integer({ min: 1, max: 25 }), { minLength: 1, maxLength: 5 }),
    firstX: fc.integer({ min: 400, max: 5000 }),
    span: fc.integer({ min: -4000, max: 4000 }).filter((s) => s !== 0),
    yFactor: fc.constantFrom(1, 0.001, 1e-4, 0.5, 2 ** -10, 3),
    hasEnd: fc.boolean(),
  })
  .map((g) => {
    const isInteger = g.form !== 'AFFN' && g.form !== 'PAC';
    const yRaw: number[] = [];
    let v = g.y0;
    for (let i = 0; i < g.n; i++) {
      if (isInteger) {
        yRaw.push(v);
        v += g.steps[i];
      } else yRaw.push(g.floats[i]);
    }
    const lastX = g.firstX + g.span;
    const text = jcampWrite({ y: yRaw, firstX: g.firstX, lastX, yFactor: g.yFactor, form: g.form, perLine: g.perLine, hasEnd: g.hasEnd });
    return { text, form: g.form, yRaw, yFactor: g.yFactor, firstX: g.firstX, lastX };
  });

describe('JCAMP-DX round trip: ASDF encoder → decoder returns the same numbers exactly', () => {
  it('AFFN, PAC, SQZ, SQZ+DUP, DIF and DIF+DUP tables with y-checks, any YFACTOR, with or without ##END=', () => {
    let crossChecked = 0;
    fc.assert(
      fc.property(jcampCaseArb, (c) => {
        countInput('jcampParse');
        const run = timed(() => jcampParse(c.text, { maxPoints: 5e7 }));
        if (!run.ok) throw new Error(`jcampParse threw: ${String(run.error)}`);
        expect(run.ms).toBeLessThan(HANG_LIMIT_MS);
        const r = run.value;
        if (!r.ok) throw new Error(`refused: ${r.error.message}\n${c.text}`);
        const n = c.yRaw.length;
        // Ordinates: file value × YFACTOR, one rounding, the definition of YFACTOR (JCAMP-DX 4.24).
        expect(Array.from(r.columns.y)).toEqual(c.yRaw.map((v) => v * c.yFactor));
        // Abscissae: equally spaced from FIRSTX to LASTX over NPOINTS (the (X++(Y..Y)) definition).
        const step = (c.lastX - c.firstX) / (n - 1);
        expect(Array.from(r.columns.x)).toEqual(c.yRaw.map((_, i) => c.firstX + i * step));
        // Through importTrace: ascending, same values.
        const imported = importChecked(c.text, 'gen.jdx');
        if (!imported.ok) throw new Error(imported.error.message);
        const asc = c.lastX > c.firstX ? [...r.columns.y] : [...r.columns.y].reverse();
        expect(Array.from(imported.trace.absorbance)).toEqual(asc);
        // jcampconverter 12.5.3 reads an AFFN exponent inside (X++(Y..Y)) as SQZ digits ('1.5E-3' → 1.5, 5, −3),
        // so only tables without exponents are cross-checked.
        const hasExponent = /\dE[+-]\d/.test(c.text.slice(c.text.indexOf('##XYDATA')));
        if (crossChecked < 150 && !hasExponent) {
          // jcampconverter (npm, an independent decoder): same ordinates; relative 1e-12 because it may
          // scale by YFACTOR in another order (one extra rounding at most).
          crossChecked++;
          const theirs = convert(c.text).flatten[0].spectra[0].data.y as number[];
          expect(theirs.length).toBe(n);
          for (let i = 0; i < n; i++) {
            const want = c.yRaw[i] * c.yFactor;
            expect(Math.abs(theirs[i] - want)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(want)));
          }
        }
      }),
      { numRuns: 1500, seed: 107 },
    );
    expect(crossChecked).toBe(150);
  });

  it('truncating a generated file anywhere gives data or a message naming the line', () => {
    fc.assert(
      fc.property(jcampCaseArb, fc.double({ min: 0, max: 1, noNaN: true }), (c, at) => {
        importChecked(c.text.slice(0, Math.floor(at * c.text.length)), 'cut.jdx');
      }),
      { numRuns: 1500, seed: 108 },
    );
  });
});
