import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { CliError, type CliIo } from '../../src/cli/cliIo';
import { cliMain } from '../../src/cli/main';
import { modelFileParse } from '../../src/io/modelFile';
import { bandLines } from '../../src/physics/bandLines';

const PROLATE = fileURLToPath(new URL('../fixtures/models/perpendicular-prolate.json', import.meta.url)); // mass 80 amu, T = 296 K

async function run(args: string[]) {
  const out: string[] = [];
  const err: string[] = [];
  const io: CliIo = {
    stdout: (t) => void out.push(t),
    stderr: (t) => void err.push(t),
    readFile: (path) => {
      try {
        return readFileSync(path, 'utf8');
      } catch {
        throw new CliError(`cannot read '${path}': no such file`);
      }
    },
  };
  const code = await cliMain(['spectrum', ...args], io);
  return { code, stdout: out.join(''), stderr: err.join('') };
}

function column(text: string): { x: number[]; y: number[] } {
  const rows = text.trimEnd().split('\n').slice(1);
  return { x: rows.map((r) => Number(r.split(',')[0])), y: rows.map((r) => Number(r.split(',')[1])) };
}

describe('spectrum --opd', () => {
  const base = ['--model', PROLATE, '--from', '1170', '--to', '1190', '--step', '0.02'];

  it('leaves the output unchanged without --opd and refuses instrument options without it', async () => {
    const plain = await run(base);
    expect(plain.code).toBe(0);
    expect(plain.stderr).toBe('');
    const bad = await run([...base, '--apodization', 'triangular']);
    expect(bad.code).toBe(1);
    expect(bad.stderr).toMatch(/^spectrum: --apodization needs --opd L/);
  });

  it('refuses a bad L, apodization or depth scale with one line', async () => {
    for (const [extra, re] of [
      [['--opd', '0'], /--opd must be a maximum optical path difference > 0 cm, got 0/],
      [['--opd', 'x'], /--opd must be a finite number/],
      [['--opd', '1', '--apodization', 'hann'], /--apodization must be one of boxcar, .*got 'hann'/],
      [['--opd', '1', '--depth-scale', '-1'], /--depth-scale must be >= 0/],
    ] as [string[], RegExp][]) {
      const r = await run([...base, ...extra]);
      expect(r.code).toBe(1);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
      expect(r.stderr).toMatch(re);
    }
  });

  it('gives the weak-limit instrument-smoothed band, and says the column is an optical depth', async () => {
    // With a tiny depth scale S the apparent optical depth is S × Σ I_i ILS(x − ν_i) (weak limit,
    // Griffiths & de Haseth 2007 ch. 2), ILS = L sinc²(πΔνL) for triangular apodization (closed form,
    // written out here). Tolerance 2 % of the peak: the lines' Doppler width (~1e-3 cm^-1) against
    // 1/L = 1 cm^-1, the 12/L cut of far wings and the 7 printed digits.
    const S = 1e-6;
    const r = await run([...base, '--opd', '1', '--apodization', 'triangular', '--depth-scale', String(S)]);
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/apparent optical depth −ln T/);
    const { x, y } = column(r.stdout);
    expect(x).toHaveLength(1001);
    const lines = bandLines(modelFileParse(readFileSync(PROLATE, 'utf8')).model);
    const ils = (d: number) => {
      const z = Math.PI * d;
      return z === 0 ? 1 : (Math.sin(z) / z) ** 2;
    };
    let peak = 0;
    let worst = 0;
    for (let i = 0; i < x.length; i += 7) {
      let direct = 0;
      for (let j = 0; j < lines.count; j++) direct += S * lines.intensity[j] * ils(x[i] - lines.wavenumberCm1[j]);
      peak = Math.max(peak, direct);
      worst = Math.max(worst, Math.abs(direct - y[i]));
    }
    expect(worst).toBeLessThan(0.02 * peak);
  });

  it('saturates strong lines: the apparent optical depth grows less than the true one', async () => {
    // Beer–Lambert: scaling τ by 100 scales the weak-limit output by 100 but a saturated one by less.
    const weak = column((await run([...base, '--opd', '2', '--depth-scale', '1e-5'])).stdout).y;
    const strong = column((await run([...base, '--opd', '2', '--depth-scale', '1e-3'])).stdout).y;
    const ratio = Math.max(...strong) / Math.max(...weak);
    expect(ratio).toBeLessThan(90);
    expect(ratio).toBeGreaterThan(1);
  });
});
