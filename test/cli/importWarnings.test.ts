/**
 * Every command that reads a trace (peaks, assign) or a line table (fit, combdiff, assign --lines) prints
 * the importer's report on stderr, one `warning: <file>: …` line per kind of problem, in the words of
 * traceImportWarnings (the page shows the same words), and exits 0 while the data are usable. Traces are
 * read from bytes, so UTF-16 files read too.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import type { CliIo } from '../../src/cli/cliIo';
import { cliMain } from '../../src/cli/main';
import { importTrace } from '../../src/io/traceImport';
import { traceImportWarnings } from '../../src/io/traceImportWarnings';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';
import { syntheticBand } from '../analysis/assistantSyntheticBand';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const HOSTILE = new URL('../fixtures/hostile/', import.meta.url);
const hostile = (name: string) => readFileSync(new URL(name, HOSTILE), 'utf8');

/** In-memory files (text or bytes); readBytes serves both, as the Node io does. */
function memoryIo(files: Record<string, string | Uint8Array>) {
  const out: string[] = [];
  const err: string[] = [];
  const get = (path: string) => {
    if (!(path in files)) throw new Error(`cannot read '${path}': no such file`);
    return files[path];
  };
  const io: CliIo = {
    stdout: (t) => void out.push(t),
    stderr: (t) => void err.push(t),
    readFile: (path) => {
      const f = get(path);
      return typeof f === 'string' ? f : new TextDecoder().decode(f);
    },
    readBytes: (path) => {
      const f = get(path);
      return typeof f === 'string' ? new TextEncoder().encode(f) : f;
    },
  };
  return { io, stdout: () => out.join(''), stderr: () => err.join('') };
}

/** UTF-16 bytes of a text, with or without the byte-order mark (the test's own encoder). */
function utf16(text: string, isLittleEndian: boolean, hasBom = true): Uint8Array {
  const units = (hasBom ? '\uFEFF' : '') + text;
  const out = new Uint8Array(units.length * 2);
  for (let i = 0; i < units.length; i++) {
    const c = units.charCodeAt(i);
    out[2 * i + (isLittleEndian ? 0 : 1)] = c & 0xff;
    out[2 * i + (isLittleEndian ? 1 : 0)] = c >> 8;
  }
  return out;
}

describe('peaks prints the importer warnings on stderr and exits 0', () => {
  it.each([
    ['nan-rows.csv', ['6 rows skipped, not finite numbers (NaN or Infinity), at lines 102, 103, 1501, 2401, 3334, 4001']],
    ['text-in-numbers.csv', ["3 rows skipped, text where a number belongs (e.g. 'abc' on line 57), at lines 57, 420, 777"]],
    ['flat-trace.csv', ['the trace is flat: all 5000 points have the same value (absorbance 0.25), so no peaks can be found in it']],
    [
      'random-order-repeats.csv',
      [
        '200 rows skipped, x repeated from an earlier row (the first row of each x is kept; y differs from the row kept in 200 of 200), at lines 92, 111, 182, 210, 233, 238, 257, 262, 263, 268 and 190 more',
        'the axis is not monotonic (first reversal at line 5); points were sorted by wavenumber',
      ],
    ],
  ])('%s', async (name, warnings) => {
    const m = memoryIo({ [name]: hostile(name) });
    expect(await cliMain(['peaks', '--trace', name], m.io)).toBe(0);
    expect(m.stderr()).toBe(warnings.map((w) => `warning: ${name}: ${w}\n`).join(''));
    expect(m.stdout().startsWith('wavenumber,height,fwhm,snr,blend,wavenumber_sigma\n')).toBe(true);
  });

  it('the flat trace gives the header only (no peak can exist), the warning saying why', async () => {
    const m = memoryIo({ 'flat.csv': hostile('flat-trace.csv') });
    expect(await cliMain(['peaks', '--trace', 'flat.csv'], m.io)).toBe(0);
    expect(m.stdout()).toBe('wavenumber,height,fwhm,snr,blend,wavenumber_sigma\n');
  });

  it('prints exactly what the page is given: traceImportWarnings of the same report', async () => {
    const text = hostile('nan-infinity.csv');
    const r = importTrace(text, 'n.csv');
    if (!r.ok) throw new Error(r.error.message);
    const m = memoryIo({ 'n.csv': text });
    expect(await cliMain(['peaks', '--trace', 'n.csv'], m.io)).toBe(0);
    expect(m.stderr()).toBe(
      traceImportWarnings(r.report)
        .map((w) => `warning: n.csv: ${w}\n`)
        .join(''),
    );
  });
});

describe('peaks reads UTF-16 and UTF-8-BOM traces like the UTF-8 one', () => {
  const text = hostile('nan-rows.csv');
  it.each([
    ['UTF-16 LE with mark', utf16(text, true)],
    ['UTF-16 BE with mark', utf16(text, false)],
    ['UTF-16 LE without mark', utf16(text, true, false)],
    ['UTF-8 with mark', new Uint8Array([0xef, 0xbb, 0xbf, ...new TextEncoder().encode(text)])],
  ])('%s: same peaks, same warning, exit 0', async (_, bytes) => {
    const plain = memoryIo({ 't.csv': text });
    expect(await cliMain(['peaks', '--trace', 't.csv'], plain.io)).toBe(0);
    const encoded = memoryIo({ 't.csv': bytes });
    expect(await cliMain(['peaks', '--trace', 't.csv'], encoded.io)).toBe(0);
    expect(encoded.stdout()).toBe(plain.stdout());
    expect(encoded.stderr()).toBe(plain.stderr());
    expect(plain.stdout().split('\n').length).toBeGreaterThan(10);
  });

  it('refuses UTF-32 with one line naming the encoding', async () => {
    const m = memoryIo({ 't.csv': new Uint8Array([0xff, 0xfe, 0, 0, 0x31, 0, 0, 0]) });
    expect(await cliMain(['peaks', '--trace', 't.csv'], m.io)).toBe(1);
    expect(m.stderr()).toBe(
      'peaks: t.csv: the file is UTF-32 LE text (byte-order mark FF FE 00 00), which is not read; save it as UTF-8 or UTF-16 (field encoding)\n',
    );
  });

  it('says what is wrong with a file that has no line breaks', async () => {
    const m = memoryIo({ 'one.csv': '1000.000,0.1234,'.repeat(10_000) });
    expect(await cliMain(['peaks', '--trace', 'one.csv'], m.io)).toBe(1);
    expect(m.stderr()).toBe(
      'peaks: one.csv: only 1 usable data point (line 1); at least 2 are needed; line 1 is 160,000 characters long and the file has no line breaks (a trace needs one line per point)\n',
    );
  });
});

describe('line tables: renamed rows reported once, by kind, exit 0', () => {
  const LINES = readFileSync(new URL('../fixtures/lines/fictitious-perpendicular/lines.csv', import.meta.url), 'utf8');
  const MODEL = readFileSync(new URL('../fixtures/lines/fictitious-perpendicular/model.json', import.meta.url), 'utf8');
  /** The table with an id column in which rows 2–4 all say 'dup' (lines 3 and 4 repeat line 2's id). */
  const withIds = (table: string) =>
    table
      .trimEnd()
      .split('\n')
      .map((row, i) => `${row},${i === 0 ? 'id' : i <= 3 ? 'dup' : `r${i}`}`)
      .join('\n') + '\n';
  const WARNING = "warning: L.csv: 2 rows renamed, id used by an earlier row ('dup' → 'dup#3', and so on), at lines 3, 4\n";

  it('fit', async () => {
    const m = memoryIo({ 'M.json': MODEL, 'L.csv': withIds(LINES) });
    expect(await cliMain(['fit', '--model', 'M.json', '--lines', 'L.csv'], m.io)).toBe(0);
    expect(m.stderr()).toBe(WARNING);
    expect(JSON.parse(m.stdout()).nLines).toBe(LINES.trim().split('\n').length - 1);
  });

  it('combdiff', async () => {
    const hcl = readFileSync(new URL('../fixtures/lines/hcl-fundamental/lines.csv', import.meta.url), 'utf8');
    const m = memoryIo({ 'L.csv': withIds(hcl) });
    expect(await cliMain(['combdiff', '--lines', 'L.csv', '--state', 'lower', '--shape', 'linear'], m.io)).toBe(0);
    expect(m.stderr()).toBe(WARNING);
  });
});

describe('assign prints the trace warnings and the seed table warnings before its summary', () => {
  // Invented prolate top (the truth of test/fixtures/assign/model-guess.json, see its README).
  const PROLATE: BandModel = {
    shape: 'prolate',
    band: 'perpendicular',
    lower: stateConstantsFrom({ B: 0.9123, A: 5.512, DJ: 2.2e-6, DJK: 1.1e-5 }),
    upper: stateConstantsFrom({ origin: 1511.37, B: 0.9061, A: 5.463, DJ: 2.2e-6, DJK: 1.0e-5, zeta: 0.284 }),
    temperatureK: 200,
    jMax: 22,
    kMax: 4,
    spinWeights: [1],
  };
  it('NaN rows in the trace: one warning line, exit 0, lines still assigned', async () => {
    const band = syntheticBand(PROLATE, 1 / 300, 17);
    const x = band.trace.wavenumberCm1;
    const rows = ['wavenumber,absorbance'];
    for (let k = 0; k < x.length; k++)
      rows.push(`${x[k].toFixed(4)},${k === 10 || k === 20 ? 'NaN' : band.trace.absorbance[k].toFixed(6)}`);
    const fixtures = new URL('../fixtures/assign/', import.meta.url);
    const m = memoryIo({
      'M.json': readFileSync(new URL('model-guess.json', fixtures), 'utf8'),
      'S.csv': readFileSync(new URL('seeds.csv', fixtures), 'utf8'),
      'T.csv': rows.join('\n') + '\n',
    });
    expect(await cliMain(['assign', '--model', 'M.json', '--trace', 'T.csv', '--lines', 'S.csv'], m.io)).toBe(0);
    const stderr = m.stderr().split('\n');
    expect(stderr[0]).toBe('warning: T.csv: 2 rows skipped, not finite numbers (NaN or Infinity), at lines 12, 22');
    expect(stderr[1]).toMatch(/^assign: T\.csv: \d+ peaks/);
    expect(m.stdout().trim().split('\n').length).toBeGreaterThan(20);
  });
});

describe('the CLI as a subprocess reads a UTF-16 LE file from disk', () => {
  const dir = mkdtempSync(join(tmpdir(), 'cli-utf16-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  it('peaks on a UTF-16 LE (BOM) trace with NaN rows: warning on stderr, exit 0', () => {
    const file = join(dir, 'trace16.csv');
    writeFileSync(file, utf16(hostile('nan-rows.csv'), true));
    const r = spawnSync('npx', ['tsx', 'src/cli/main.ts', 'peaks', '--trace', file], { cwd: ROOT, encoding: 'utf8', timeout: 60_000 });
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).toBe(
      `warning: ${file}: 6 rows skipped, not finite numbers (NaN or Infinity), at lines 102, 103, 1501, 2401, 3334, 4001\n`,
    );
    expect(r.stdout.startsWith('wavenumber,height,fwhm')).toBe(true);
  });
});
