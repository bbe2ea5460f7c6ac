import { execFileSync, spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { modelFileParse } from '../../src/io/modelFile';
import { bandLines } from '../../src/physics/bandLines';
import { CliError, type CliIo } from '../../src/cli/cliIo';
import { cliMain } from '../../src/cli/main';
import { spectrumCommandDecimals, spectrumCommandGrid, SPECTRUM_MAX_POINTS } from '../../src/cli/spectrumCommand';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const FIXTURES = fileURLToPath(new URL('../fixtures/models/', import.meta.url));
const PROLATE = FIXTURES + 'perpendicular-prolate.json'; // mass 80 amu, T = 296 K
const OBLATE = FIXTURES + 'parallel-oblate.json'; // no mass

/** An in-memory CliIo: files from disk, streams captured. */
function memoryIo(files: Record<string, string> = {}) {
  const out: string[] = [];
  const err: string[] = [];
  const io: CliIo = {
    stdout: (t) => void out.push(t),
    stderr: (t) => void err.push(t),
    readFile: (path) => {
      if (path in files) return files[path];
      try {
        return readFileSync(path, 'utf8');
      } catch {
        throw new CliError(`cannot read '${path}': no such file`);
      }
    },
  };
  return { io, stdout: () => out.join(''), stderr: () => err.join('') };
}

async function run(args: string[], files?: Record<string, string>) {
  const m = memoryIo(files);
  const code = await cliMain(['spectrum', ...args], m.io);
  return { code, stdout: m.stdout(), stderr: m.stderr() };
}

function parseCsv(text: string): { x: number[]; y: number[]; header: string } {
  const rows = text.trimEnd().split('\n');
  const x: number[] = [];
  const y: number[] = [];
  for (const r of rows.slice(1)) {
    const [a, b] = r.split(',');
    x.push(Number(a));
    y.push(Number(b));
  }
  return { header: rows[0], x, y };
}

// CODATA 2018 (Tiesinga et al. 2021), written out so the reference is independent of constants.ts.
const C_M_S = 299_792_458;
const K_B = 1.380_649e-23;
const M_U = 1.660_539_066_6e-27;

/** Doppler HWHM α = ν/c·√(2 ln2 kT/m), cm^-1 (Demtröder, Laser Spectroscopy, ch. 3). */
const dopplerHwhm = (nu: number, T: number, massAmu: number) => (nu / C_M_S) * Math.sqrt((2 * Math.LN2 * K_B * T) / (massAmu * M_U));

/**
 * Area-normalised Voigt by direct numerical convolution of a Gaussian (HWHM α) and a Lorentzian
 * (HWHM γ): V(x) = ∫ G(t) L(x − t) dt, trapezoid rule over |t| ≤ 9σ with step ≤ min(σ, γ)/8.
 * Ref: definition of the Voigt profile, Armstrong, JQSRT 7, 61 (1967), eq. (1). Independent of the
 * project's Faddeeva code. The trapezoid rule on a Gaussian-weighted smooth integrand is accurate to
 * ~1e-9 relative at this step; the cut at 9σ drops < 1e-17 of the Gaussian.
 */
function voigtByConvolution(x: number, alpha: number, gamma: number): number {
  if (gamma === 0) {
    const r = x / alpha;
    return (Math.sqrt(Math.LN2 / Math.PI) / alpha) * Math.exp(-Math.LN2 * r * r);
  }
  const sigma = alpha / Math.sqrt(2 * Math.LN2);
  const h = Math.min(sigma, gamma) / 8;
  const n = Math.ceil((9 * sigma) / h);
  let s = 0;
  for (let i = -n; i <= n; i++) {
    const t = i * h;
    const g = Math.exp((-t * t) / (2 * sigma * sigma));
    const d = x - t;
    s += g * (gamma / Math.PI / (d * d + gamma * gamma));
  }
  return (s * h) / (sigma * Math.sqrt(2 * Math.PI));
}

describe('spectrumCommandGrid', () => {
  it('gives round((X2−X1)/DX)+1 points ending on X2', () => {
    const g = spectrumCommandGrid(1000, 1001, 0.001);
    expect(g.npoints).toBe(1001);
    expect(g.adjusted).toBe(false);
    expect(Math.abs(g.fromCm1 + (g.npoints - 1) * g.stepCm1 - 1001)).toBeLessThan(1e-9);
  });

  it('adjusts a step that does not divide the range so the last point is still X2', () => {
    const g = spectrumCommandGrid(900, 900.01, 0.003);
    expect(g.npoints).toBe(4); // round(3.33) + 1
    expect(g.adjusted).toBe(true);
    expect(g.stepCm1).toBeCloseTo(0.01 / 3, 12);
  });

  it('refuses X2 <= X1, DX <= 0, a range under half a step and absurd sizes with one-line messages', () => {
    expect(() => spectrumCommandGrid(1000, 1000, 0.1)).toThrow(/--to must be greater than --from/);
    expect(() => spectrumCommandGrid(1000, 999, 0.1)).toThrow(/--to must be greater than --from/);
    expect(() => spectrumCommandGrid(1000, 1001, 0)).toThrow(/--step must be > 0/);
    expect(() => spectrumCommandGrid(1000, 1001, -0.1)).toThrow(/--step must be > 0/);
    expect(() => spectrumCommandGrid(1000, 1000.01, 0.1)).toThrow(/shorter than half of --step/);
    expect(() => spectrumCommandGrid(0, 1000, 1e-5)).toThrow(new RegExp(`more than ${SPECTRUM_MAX_POINTS}`));
    expect(() => spectrumCommandGrid(0, 1000, 1e-300)).toThrow(/more than/);
    // Exactly 2e7 points is still allowed.
    expect(spectrumCommandGrid(0, 1999.9999, 1e-4).npoints).toBe(SPECTRUM_MAX_POINTS);
  });
});

describe('spectrumCommandDecimals', () => {
  it('prints one decimal finer than the step', () => {
    expect(spectrumCommandDecimals(1)).toBe(1);
    expect(spectrumCommandDecimals(0.25)).toBe(2);
    expect(spectrumCommandDecimals(0.01)).toBe(3);
    expect(spectrumCommandDecimals(0.002)).toBe(4);
    expect(spectrumCommandDecimals(0.001)).toBe(4);
    expect(spectrumCommandDecimals(100)).toBe(0);
    expect(spectrumCommandDecimals(1e-20)).toBe(12);
  });
});

describe('spectrum command (in process)', () => {
  it('writes x,y on the requested grid and matches a brute-force untruncated Voigt sum to 1e-4 of max', async () => {
    // Grid covers only part of the band: lines outside it must still add their Lorentz wings.
    const from = 1183;
    const to = 1187;
    const step = 0.004;
    const gamma = 0.02;
    const r = await run([
      '--model',
      PROLATE,
      '--from',
      String(from),
      '--to',
      String(to),
      '--step',
      String(step),
      '--lorentz',
      String(gamma),
    ]);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const { header, x, y } = parseCsv(r.stdout);
    expect(header).toBe('x,y');
    expect(x.length).toBe(1001);
    expect(x[0]).toBe(from);
    expect(x.at(-1)).toBe(to);
    const file = modelFileParse(readFileSync(PROLATE, 'utf8'));
    const lines = bandLines(file.model);
    const outside = Array.from(lines.wavenumberCm1).filter((nu) => nu < from || nu > to).length;
    expect(outside).toBeGreaterThan(50);
    // Brute force: every line, every point, no cut-off (every 5th point to keep the test quick).
    let maxY = 0;
    const ref: [number, number][] = [];
    for (let k = 0; k < x.length; k += 5) {
      const xk = from + k * step;
      let s = 0;
      for (let i = 0; i < lines.count; i++) {
        const nu = lines.wavenumberCm1[i];
        s += lines.intensity[i] * voigtByConvolution(xk - nu, dopplerHwhm(nu, 296, 80), gamma);
      }
      ref.push([k, s]);
      maxY = Math.max(maxY, s);
    }
    expect(maxY).toBeGreaterThan(0);
    // Tol 1e-4 of max: the headless contract's accuracy for the full (untruncated) sum.
    for (const [k, s] of ref) expect(Math.abs(y[k] - s), `x=${x[k]}`).toBeLessThan(1e-4 * maxY);
  });

  it('conserves the band area: Σ y·Δx equals Σ I_i for a pure Doppler spectrum covering the band', async () => {
    // Area normalisation of each profile (∫V = 1), so ∫y dx = Σ I_i. Tol 1e-6 relative: the trapezoid
    // rule on a Gaussian sampled at ≥ 2 points per HWHM is exact to far below that; 7-digit printing.
    const r = await run(['--model', PROLATE, '--from', '1140', '--to', '1220', '--step', '0.0004']);
    expect(r.code).toBe(0);
    const { y } = parseCsv(r.stdout);
    const area = y.reduce((a, v) => a + v, 0) * 0.0004;
    const lines = bandLines(modelFileParse(readFileSync(PROLATE, 'utf8')).model);
    const total = Array.from(lines.intensity).reduce((a, v) => a + v, 0);
    expect(Math.abs(area / total - 1)).toBeLessThan(1e-6);
  });

  it('takes the mass from --mass over the model file, and a narrower Doppler line is taller', async () => {
    // Pure Doppler: α ∝ 1/√m, so the peak of an isolated line scales as √m (Demtröder ch. 3).
    const args = ['--from', '1179.0', '--to', '1183.0', '--step', '0.0005'];
    const fromFile = parseCsv((await run(['--model', PROLATE, ...args])).stdout).y;
    const same = parseCsv((await run(['--model', PROLATE, ...args, '--mass', '80'])).stdout).y;
    const light = parseCsv((await run(['--model', PROLATE, ...args, '--mass', '20'])).stdout).y;
    expect(same).toEqual(fromFile);
    const ratio = Math.max(...fromFile) / Math.max(...light);
    // Tol 2 %: neighbouring lines' overlap changes the peak slightly.
    expect(Math.abs(ratio / 2 - 1)).toBeLessThan(0.02);
  });

  it('stops with a clear error when no mass is known, and on bad options', async () => {
    const noMass = await run(['--model', OBLATE, '--from', '900', '--to', '910', '--step', '0.01']);
    expect(noMass.code).toBe(1);
    expect(noMass.stderr).toMatch(/^spectrum: no molecular mass for the Doppler width: give --mass AMU or "mass"/);
    for (const [args, message] of [
      [['--from', '900', '--to', '910', '--step', '0.01'], /missing required option --model/],
      [['--model', PROLATE, '--to', '910', '--step', '0.01'], /missing required option --from/],
      [['--model', PROLATE, '--from', 'abc', '--to', '910', '--step', '0.01'], /option --from must be a finite number, got 'abc'/],
      [['--model', PROLATE, '--from', '910', '--to', '900', '--step', '0.01'], /--to must be greater than --from/],
      [['--model', PROLATE, '--from', '900', '--to', '910', '--step', '-1'], /--step must be > 0/],
      [['--model', PROLATE, '--from', '0', '--to', '1e6', '--step', '0.001'], /more than 20000000/],
      [['--model', PROLATE, '--from', '900', '--to', '910', '--step', '0.01', '--lorentz', '-0.1'], /--lorentz must be a half width >= 0/],
      [['--model', PROLATE, '--from', '900', '--to', '910', '--step', '0.01', '--mass', '0'], /--mass must be > 0 amu/],
      [['--model', PROLATE, '--from', '900', '--to', '910', '--step', '0.01', '--width', '2'], /unknown option --width/],
      [['--model', '/nonexistent/m.json', '--from', '900', '--to', '910', '--step', '0.01'], /cannot read '\/nonexistent\/m\.json'/],
    ] as const) {
      const r = await run([...args]);
      expect(r.code, args.join(' ')).toBe(1);
      expect(r.stdout).toBe('');
      expect(r.stderr).toMatch(message);
      expect(r.stderr.trimEnd().split('\n')).toHaveLength(1);
    }
  });

  it('refuses a bad model file in one line naming the field', async () => {
    const r = await run(['--model', 'bad.json', '--from', '900', '--to', '910', '--step', '0.01', '--mass', '50'], {
      'bad.json': JSON.stringify({
        shape: 'prolate',
        band: 'parallel',
        lower: { B: 'NaN' },
        upper: {},
        temperature: 296,
        jMax: 5,
        kMax: 2,
      }),
    });
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/^spectrum: bad\.json: model file: field 'lower\.B' is the string "NaN"/);
    expect(r.stderr.trimEnd().split('\n')).toHaveLength(1);
  });

  it('notes an adjusted step on stderr and still ends on X2', async () => {
    const r = await run(['--model', PROLATE, '--from', '1180', '--to', '1180.01', '--step', '0.003']);
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/does not divide the range/);
    const { x } = parseCsv(r.stdout);
    expect(x).toEqual([1180, 1180.0033, 1180.0067, 1180.01]);
  });
});

describe('spectrum command (subprocess)', () => {
  it('prints the same CSV as the in-process run, and fails with one line and no stack trace', async () => {
    const args = ['spectrum', '--model', PROLATE, '--from', '1175', '--to', '1176', '--step', '0.002', '--lorentz', '0.001'];
    const out = execFileSync('npx', ['tsx', 'src/cli/main.ts', ...args], { cwd: ROOT, encoding: 'utf8' });
    const m = memoryIo();
    expect(await cliMain(args, m.io)).toBe(0);
    expect(out).toBe(m.stdout());
    const bad = spawnSync(
      'npx',
      [
        'tsx',
        'src/cli/main.ts',
        'spectrum',
        '--model',
        FIXTURES + 'bad-oblate-with-A.json',
        '--from',
        '1',
        '--to',
        '2',
        '--step',
        '0.1',
        '--mass',
        '40',
      ],
      {
        cwd: ROOT,
        encoding: 'utf8',
      },
    );
    expect(bad.status).toBe(1);
    expect(bad.stdout).toBe('');
    expect(bad.stderr.trimEnd().split('\n')).toHaveLength(1);
    expect(bad.stderr).toMatch(/field 'lower\.A'/);
    expect(bad.stderr).not.toMatch(/\n\s+at /);
  });
});
