/**
 * The CLI commands' file handling (peaks --trace, fit --lines/--model, simulate --model, combdiff --lines,
 * spectrum --model): a bad file ends with exit ≠ 0 and exactly one stderr line, never a stack trace and
 * never the "internal error" exit (70) that marks an exception the command did not expect.
 */
import { execFile } from 'node:child_process';
import { readFileSync, readdirSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import type { CliIo } from '../../src/cli/cliIo';
import { cliMain } from '../../src/cli/main';
import { importTrace } from '../../src/io/traceImport';
import { traceImportWarnings } from '../../src/io/traceImportWarnings';
import { bytesTextArb, countInput, countsPrint, HANG_LIMIT_MS, mutationArb, randomTextArb } from './reliabilityHarness';

afterAll(() => countsPrint('cliFiles.test.ts'));

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const HOSTILE = new URL('../fixtures/hostile/', import.meta.url);
const hostile = (name: string) => readFileSync(new URL(name, HOSTILE), 'utf8');
const GOOD_MODEL = readFileSync(new URL('../fixtures/lines/fictitious-perpendicular/model.json', import.meta.url), 'utf8');
const GOOD_LINES = readFileSync(new URL('../fixtures/lines/fictitious-perpendicular/lines.csv', import.meta.url), 'utf8');
const GOOD_TRACE = readFileSync(new URL('../fixtures/traces/band.csv', import.meta.url), 'utf8');

/** Run one command in process on in-memory files. */
async function run(args: string[], files: Record<string, string>) {
  countInput(`cli ${args[0]}`);
  const out: string[] = [];
  const err: string[] = [];
  const io: CliIo = {
    stdout: (t) => void out.push(t),
    stderr: (t) => void err.push(t),
    readFile: (path) => {
      if (!(path in files)) throw new Error(`cannot read '${path}': no such file`);
      return files[path];
    },
  };
  const t0 = performance.now();
  const code = await cliMain(args, io);
  return { code, stdout: out.join(''), stderr: err.join(''), ms: performance.now() - t0 };
}

/** One stderr line ending in a newline, no stack frame, nothing on stdout. */
function expectOneLineRefusal(r: { code: number; stdout: string; stderr: string }, command: string) {
  expect(r.code, r.stderr).not.toBe(0);
  expect(r.code, `exit 70 is an internal error: ${r.stderr}`).not.toBe(70);
  expect(r.stderr.endsWith('\n'), JSON.stringify(r.stderr)).toBe(true);
  expect(r.stderr.slice(0, -1), JSON.stringify(r.stderr)).not.toMatch(/[\n\r\u2028\u2029\u0085]/);
  expect(r.stderr.startsWith(`${command}: `)).toBe(true);
  expect(r.stderr).not.toMatch(/\bat .*:\d+:\d+\)?$|Error:/m);
  expect(r.stdout).toBe('');
}

/** The way each command reads one file, with the other inputs good. */
const COMMANDS: Record<string, (file: string) => { args: string[]; files: Record<string, string> }> = {
  'peaks --trace': (f) => ({ args: ['peaks', '--trace', 'T.csv'], files: { 'T.csv': f } }),
  'fit --lines': (f) => ({ args: ['fit', '--model', 'M.json', '--lines', 'L.csv'], files: { 'M.json': GOOD_MODEL, 'L.csv': f } }),
  'fit --model': (f) => ({ args: ['fit', '--model', 'M.json', '--lines', 'L.csv'], files: { 'M.json': f, 'L.csv': GOOD_LINES } }),
  'simulate --model': (f) => ({ args: ['simulate', '--model', 'M.json'], files: { 'M.json': f } }),
  'combdiff --lines': (f) => ({ args: ['combdiff', '--lines', 'L.csv', '--state', 'lower'], files: { 'L.csv': f } }),
  'spectrum --model': (f) => ({
    args: ['spectrum', '--model', 'M.json', '--from', '1230', '--to', '1231', '--step', '0.01', '--mass', '80'],
    files: { 'M.json': f },
  }),
};

describe('CLI commands refuse hostile files with one stderr line', () => {
  const traces = readdirSync(HOSTILE).filter((f) => /\.(csv|jdx|png|bin)$/.test(f) && !f.startsWith('lines-'));
  const refusedTraces = [
    'all-nan.csv',
    'asdf-bad-char.jdx',
    'dif-check-fail.jdx',
    'dup-billion.jdx',
    'dup-bomb.jdx',
    'empty.csv',
    'label-100k.jdx',
    'mixed-decimals.csv',
    'npoints-2e9.jdx',
    'nul-bytes.csv',
    'png-header.png',
    'random-bytes.bin',
    'truncated-mid-data.jdx',
    'unclosed-quote.csv',
    'whitespace-only.csv',
    'xunits-hz-script.jdx',
  ];
  it.each(refusedTraces)('peaks --trace %s', async (name) => {
    const r = await run(['peaks', '--trace', name], { [name]: hostile(name) });
    expectOneLineRefusal(r, 'peaks');
    expect(r.stderr).toContain(name);
  });
  it("peaks reads the hostile traces that are still usable, exit 0, with the importer's warnings on stderr", async () => {
    for (const name of traces.filter((f) => !refusedTraces.includes(f))) {
      const r = await run(['peaks', '--trace', name], { [name]: hostile(name) });
      const imported = importTrace(hostile(name), name);
      if (!imported.ok) throw new Error(imported.error.message);
      // Exactly the report's warnings, one line each, in the words the page shows too.
      const expected = traceImportWarnings(imported.report).map((w) => `warning: ${name}: ${w}\n`);
      expect([name, r.code, r.stderr]).toEqual([name, 0, expected.join('')]);
      expect(r.stdout.startsWith('wavenumber,height,fwhm')).toBe(true);
    }
  });

  it.each([
    ['lines-negative-j.csv', /^fit: lines-negative-j\.csv: line 3: J_up '-1' must be >= 0\n$/],
    ['lines-j-1e12.csv', /^fit: lines-j-1e12\.csv: line 3: J_up '1e12' is above the largest J or K handled \(2000\)\n$/],
    ['lines-non-integer.csv', /^fit: lines-non-integer\.csv: line 3: J_up '2\.5' is not a whole number\n$/],
    ['lines-k-gt-j.csv', /^fit: lines-k-gt-j\.csv: line 3: K_up=5 exceeds J_up=3 \(K <= J is required\)\n$/],
    ['lines-delta-k-2.csv', /^fit: lines-delta-k-2\.csv: line 3: ΔK = 2 is not allowed in a perpendicular band \(only ΔK = ±1\)\n$/],
    ['lines-hex-wavenumber.csv', /^fit: lines-hex-wavenumber\.csv: line 2: wavenumber '0x3E9' is not a number \(cm\^-1\)\n$/],
    ['lines-infinite-sigma.csv', /^fit: lines-infinite-sigma\.csv: line 2: uncertainty 'Infinity' must be a number > 0 \(cm\^-1\)\n$/],
  ])('fit --lines %s', async (name, message) => {
    const r = await run(['fit', '--model', 'M.json', '--lines', name], { 'M.json': GOOD_MODEL, [name]: hostile(name) });
    expectOneLineRefusal(r, 'fit');
    expect(r.stderr).toMatch(message);
  });

  it.each([
    'model-wrong-types.json',
    'model-missing-fields.json',
    'model-oblate-with-a.json',
    'model-deep-junk.json',
    'model-not-json.json',
    'model-nan-literal.json',
  ])('simulate, spectrum and fit --model %s', async (name) => {
    for (const command of ['simulate --model', 'spectrum --model', 'fit --model']) {
      const { args, files } = COMMANDS[command](hostile(name));
      const r = await run(args, files);
      expectOneLineRefusal(r, args[0]);
      expect(r.stderr).toContain('M.json: model file');
    }
  });

  it('simulate refuses a model with 1e6 spin weights before building anything', async () => {
    const model = JSON.parse(GOOD_MODEL) as Record<string, unknown>;
    model.spinWeights = Array<number>(1e6).fill(1);
    const r = await run(['simulate', '--model', 'M.json'], { 'M.json': JSON.stringify(model) });
    expectOneLineRefusal(r, 'simulate');
    expect(r.stderr).toBe("simulate: M.json: model file: field 'spinWeights' is an array; expected a list with <= 2001 entries\n");
  });

  it('keeps a file name holding HTML verbatim in the message (the page escapes it)', async () => {
    const name = '<img src=x onerror=alert(1)>.csv';
    const r = await run(['peaks', '--trace', name], { [name]: '' });
    expectOneLineRefusal(r, 'peaks');
    expect(r.stderr).toBe(`peaks: ${name}: the file is empty\n`);
  });
});

describe('CLI commands on random hostile files: a result or one stderr line, never an internal error', () => {
  const seeds: Record<string, string[]> = {
    'peaks --trace': [GOOD_TRACE, hostile('truncated-no-end.jdx'), hostile('descending-gap.csv')],
    'fit --lines': [GOOD_LINES],
    'fit --model': [GOOD_MODEL],
    'simulate --model': [GOOD_MODEL],
    'combdiff --lines': [GOOD_LINES],
    'spectrum --model': [GOOD_MODEL],
  };
  it.each(Object.keys(COMMANDS))('%s', async (command) => {
    const text = fc.oneof(
      { weight: 3, arbitrary: mutationArb(seeds[command]) },
      { weight: 1, arbitrary: randomTextArb('0123456789.,-+eE"#{}[]:\n ') },
      { weight: 1, arbitrary: bytesTextArb(200) },
    );
    await fc.assert(
      fc.asyncProperty(text, async (file) => {
        const { args, files } = COMMANDS[command](file);
        const r = await run(args, files);
        expect(r.ms).toBeLessThan(HANG_LIMIT_MS);
        if (r.code === 0) expect(r.stdout.length).toBeGreaterThan(0);
        else expectOneLineRefusal(r, args[0]);
      }),
      // fit and spectrum do real work on valid inputs (~10–50 ms each), hence fewer runs.
      { numRuns: command.startsWith('fit') || command.startsWith('spectrum') ? 150 : 400, seed: 401 },
    );
  });
});

describe('CLI as a subprocess (real file reading, real exit codes)', () => {
  it('refuses a PNG, a DUP bomb, deeply nested JSON and J = 1e12 with one stderr line each', async () => {
    const cases: [string[], RegExp][] = [
      [
        ['peaks', '--trace', 'test/fixtures/hostile/png-header.png'],
        // Read from its bytes, the refusal also says how they were decoded.
        /^peaks: .*png-header\.png: no numeric data rows found; the bytes were read as UTF-8 \(no byte-order mark\) and 2 byte sequences are not valid UTF-8, the first at byte 0: is it a text file, or text in another encoding\?\n$/,
      ],
      [
        ['peaks', '--trace', 'test/fixtures/hostile/dup-bomb.jdx'],
        /^peaks: .*dup-bomb\.jdx: line 11: the compressed data expand to more than 1000000 points/,
      ],
      [
        ['simulate', '--model', 'test/fixtures/hostile/model-deep-junk.json'],
        /^simulate: .*model-deep-junk\.json: model file is nested more than 200 levels deep at line 9 \(limit maxJsonDepth\)\n$/,
      ],
      [
        ['fit', '--model', 'test/fixtures/lines/fictitious-perpendicular/model.json', '--lines', 'test/fixtures/hostile/lines-j-1e12.csv'],
        /^fit: .*lines-j-1e12\.csv: line 3: J_up '1e12' is above the largest J or K handled \(2000\)\n$/,
      ],
    ];
    // Started together: each start-up of tsx takes a second or two.
    const results = await Promise.all(
      cases.map(
        ([args]) =>
          new Promise<{ status: number | null; stdout: string; stderr: string }>((resolve) => {
            countInput(`cli ${args[0]} (subprocess)`);
            execFile(
              'npx',
              ['tsx', 'src/cli/main.ts', ...args],
              { cwd: ROOT, encoding: 'utf8', timeout: 60_000 },
              (error, stdout, stderr) => resolve({ status: error ? ((error as { code?: number }).code ?? null) : 0, stdout, stderr }),
            );
          }),
      ),
    );
    results.forEach((r, k) => {
      expect(r.status, r.stderr).toBe(1);
      expect(r.stderr).toMatch(cases[k][1]);
      expect(r.stderr.split('\n').length, r.stderr).toBe(2);
      expect(r.stdout).toBe('');
    });
  });
});
