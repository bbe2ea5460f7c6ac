import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import type { CliIo } from '../../src/cli/cliIo';
import { cliMain } from '../../src/cli/main';
import { randomNormal, randomSeeded } from '../analysis/syntheticTrace';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));

function memoryIo(files: Record<string, string>) {
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
  return { io, stdout: () => out.join(''), stderr: () => err.join('') };
}

/** Two-column CSV of Gaussian lines (FWHM 0.01 cm^-1, heights 0.1–0.3) with seeded noise σ = 1e-3. */
const CENTRES = [1000.2345678, 1000.61, 1001.1503];
function traceCsv(): string {
  const rand = randomSeeded(2024);
  const rows = ['wavenumber,absorbance'];
  for (let i = 0; i <= 1500; i++) {
    const x = 1000 + i * 0.001;
    let y = 0.01;
    CENTRES.forEach((c, k) => (y += (0.1 + 0.1 * k) * Math.exp(-4 * Math.LN2 * ((x - c) / 0.01) ** 2)));
    rows.push(`${x.toFixed(4)},${(y + 1e-3 * randomNormal(rand)).toFixed(6)}`);
  }
  return rows.join('\n') + '\n';
}

function parseCsv(text: string): { header: string; rows: number[][] } {
  const [header, ...lines] = text.trimEnd().split('\n');
  return { header, rows: lines.map((l) => l.split(',').map(Number)) };
}

describe('peaks command (in-process)', () => {
  it('prints the header and one row per line, ascending, centres within 0.05 FWHM', async () => {
    const m = memoryIo({ 't.csv': traceCsv() });
    expect(await cliMain(['peaks', '--trace', 't.csv'], m.io)).toBe(0);
    expect(m.stderr()).toBe('');
    const { header, rows } = parseCsv(m.stdout());
    expect(header.startsWith('wavenumber,height,fwhm')).toBe(true);
    expect(header).toBe('wavenumber,height,fwhm,snr,blend,wavenumber_sigma');
    expect(rows.length).toBe(3);
    for (let k = 0; k < 3; k++) {
      // SNR ≥ 100 at 10 points per FWHM: centre error ≪ 0.05 FWHM (the analysis target).
      expect(Math.abs(rows[k][0] - CENTRES[k])).toBeLessThan(0.05 * 0.01);
      expect(Math.abs(rows[k][1] / (0.1 + 0.1 * k) - 1)).toBeLessThan(0.05);
      expect(Math.abs(rows[k][2] / 0.01 - 1)).toBeLessThan(0.05);
      expect(rows[k][4]).toBe(0);
      if (k > 0) expect(rows[k][0]).toBeGreaterThan(rows[k - 1][0]);
    }
    // Wavenumbers printed with 7 decimals (finer than the 1e-6 cm^-1 asked for).
    expect(m.stdout().split('\n')[1]).toMatch(/^1000\.\d{7},/);
  });

  it('applies --min-snr', async () => {
    // Heights 0.1, 0.2, 0.3 at σ ≈ 1e-3: SNR ≈ 100, 200, 300, so --min-snr 150 keeps two.
    const m = memoryIo({ 't.csv': traceCsv() });
    expect(await cliMain(['peaks', '--trace', 't.csv', '--min-snr', '150'], m.io)).toBe(0);
    expect(parseCsv(m.stdout()).rows.length).toBe(2);
  });

  it('refuses a bad --min-snr and a missing --trace with one line', async () => {
    const a = memoryIo({});
    expect(await cliMain(['peaks', '--trace', 't.csv', '--min-snr', 'lots'], a.io)).toBe(1);
    expect(a.stderr()).toBe("peaks: option --min-snr must be a finite number, got 'lots'\n");
    const b = memoryIo({});
    expect(await cliMain(['peaks'], b.io)).toBe(1);
    expect(b.stderr()).toBe('peaks: missing required option --trace\n');
  });

  it('names the file and the line for a file the importer refuses, without a stack trace', async () => {
    const m = memoryIo({ 'bad.csv': 'x,y\n1000,0.1\n1000.1,abc\n' });
    expect(await cliMain(['peaks', '--trace', 'bad.csv'], m.io)).toBe(1);
    const err = m.stderr();
    expect(err.split('\n').length).toBe(2); // one line plus the final newline
    expect(err).toMatch(/^peaks: .*bad\.csv/);
    expect(err).toMatch(/line \d/);
    expect(err).not.toMatch(/\n\s+at /);
    expect(m.stdout()).toBe('');
  });

  it('prints only the header for a trace without lines', async () => {
    const flat = 'x,y\n' + Array.from({ length: 50 }, (_, i) => `${1000 + i * 0.01},0.5`).join('\n') + '\n';
    const m = memoryIo({ 'flat.csv': flat });
    expect(await cliMain(['peaks', '--trace', 'flat.csv'], m.io)).toBe(0);
    expect(m.stdout()).toBe('wavenumber,height,fwhm,snr,blend,wavenumber_sigma\n');
  });
});

describe('peaks command (subprocess)', () => {
  it('runs through npx tsx src/cli/main.ts and prints the same CSV', () => {
    const dir = mkdtempSync(join(tmpdir(), 'peaks-'));
    try {
      const file = join(dir, 'trace.csv');
      writeFileSync(file, traceCsv());
      const r = spawnSync('npx', ['tsx', 'src/cli/main.ts', 'peaks', '--trace', file], { cwd: ROOT, encoding: 'utf8' });
      expect(r.status).toBe(0);
      const { header, rows } = parseCsv(r.stdout);
      expect(header).toBe('wavenumber,height,fwhm,snr,blend,wavenumber_sigma');
      expect(rows.length).toBe(3);
      const bad = spawnSync('npx', ['tsx', 'src/cli/main.ts', 'peaks', '--trace', join(dir, 'missing.csv')], {
        cwd: ROOT,
        encoding: 'utf8',
      });
      expect(bad.status).toBe(1);
      expect(bad.stderr).toMatch(/^peaks: cannot read '.*missing\.csv': no such file\n$/);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
