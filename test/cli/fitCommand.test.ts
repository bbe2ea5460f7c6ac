import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { cliMain } from '../../src/cli/main';
import { CliError, type CliIo } from '../../src/cli/cliIo';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const FIX = 'test/fixtures/lines/fictitious-perpendicular';
const TRUTH = JSON.parse(readFileSync(`${ROOT}/${FIX}/truth.json`, 'utf8'));

/** In-memory io: files from `files` first, then from disk (relative to the project root). */
function memoryIo(files: Record<string, string> = {}) {
  const out = { stdout: '', stderr: '' };
  const io: CliIo = {
    stdout: (t) => void (out.stdout += t),
    stderr: (t) => void (out.stderr += t),
    readFile: (p) => {
      if (p in files) return files[p];
      try {
        return readFileSync(`${ROOT}/${p}`, 'utf8');
      } catch {
        throw new CliError(`cannot read '${p}': no such file`);
      }
    },
  };
  return { io, out };
}

async function run(args: string[], files?: Record<string, string>) {
  const { io, out } = memoryIo(files);
  const code = await cliMain(['fit', ...args], io);
  return { code, ...out };
}

const LINEAR_MODEL = JSON.stringify({
  shape: 'linear',
  band: 'parallel',
  lower: { B: 0.39, DJ: 1.3e-7 },
  upper: { origin: 812.4, B: 0.389, DJ: 1.35e-7 },
  temperature: 250,
  jMax: 40,
});

describe('fit command (in process)', () => {
  it('fits the fictitious perpendicular fixture and prints the contract JSON', async () => {
    const r = await run(['--model', `${FIX}/model.json`, '--lines', `${FIX}/lines.csv`]);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const json = JSON.parse(r.stdout);
    for (const key of [
      'parameters',
      'rms',
      'sigmaW',
      'nLines',
      'residuals',
      'warnings',
      'lines',
      'iterations',
      'conditionNumber',
      'correlation',
      'nParameters',
    ]) {
      expect(json).toHaveProperty(key);
    }
    expect(json.nLines).toBe(150);
    expect(json.nParameters).toBe(10);
    // Added keys: ν = N − P, and the covariance factor (σ_w² only when σ_w > 1).
    expect(json.degreesOfFreedom).toBe(140);
    expect(json.covarianceScale).toBe(json.sigmaW > 1 ? json.sigmaW ** 2 : 1);
    expect(json.residuals).toHaveLength(150);
    expect(json.residuals.every((x: unknown) => typeof x === 'number')).toBe(true);
    expect(json.lines[0]).toMatchObject({ J_up: 17, K_up: 1, J_lo: 17, K_lo: 0, isOutlier: expect.any(Boolean) });
    expect(json.residuals[0]).toBe(json.lines[0].obsMinusCalc);
    // Every allowed constant is listed; fixed ones with sigma 0.
    expect(Object.keys(json.parameters)).toHaveLength(20); // 11 upper (origin … HK, zeta) + 9 lower
    expect(json.parameters['lower.A']).toEqual({ value: 2.913, sigma: 0, fixed: true });
    expect(json.parameters['upper.HK']).toEqual({ value: 0, sigma: 0, fixed: true });
    // Round trip against the constants the fixture was generated from (3.5 reported σ).
    for (const [key, p] of Object.entries(json.parameters) as [string, { value: number; sigma: number; fixed: boolean }][]) {
      if (p.fixed) continue;
      const [side, name] = key.split('.');
      expect(Math.abs(p.value - TRUTH[side][name]) / p.sigma, key).toBeLessThan(3.5);
    }
    // rms is the unweighted sqrt(mean (obs − calc)²) in cm^-1.
    const rms = Math.sqrt(json.residuals.reduce((s: number, x: number) => s + x * x, 0) / 150);
    expect(json.rms).toBeCloseTo(rms, 15);
    expect(json.sigmaW).toBeGreaterThan(0.8);
    expect(json.sigmaW).toBeLessThan(1.2);
  });

  it('fits the HCl fundamental as a linear Σ–Σ band from rough start values', async () => {
    // Check values B0 = 10.440, B1 = 10.133 cm^-1 for H35Cl (Huber & Herzberg 1979, from memory);
    // tolerance 3 reported σ. Lines from test/fixtures/lines/hcl-fundamental (from memory, σ = 0.05).
    const dir = 'test/fixtures/lines/hcl-fundamental';
    const r = await run(['--model', `${dir}/model.json`, '--lines', `${dir}/lines.csv`]);
    expect(r.code).toBe(0);
    const json = JSON.parse(r.stdout);
    expect(json.nLines).toBe(19);
    expect(Object.keys(json.parameters).sort()).toEqual([
      'lower.B',
      'lower.DJ',
      'lower.HJ',
      'upper.B',
      'upper.DJ',
      'upper.HJ',
      'upper.origin',
      'upper.q',
    ]);
    expect(Math.abs(json.parameters['lower.B'].value - 10.44) / json.parameters['lower.B'].sigma).toBeLessThan(3);
    expect(Math.abs(json.parameters['upper.B'].value - 10.133) / json.parameters['upper.B'].sigma).toBeLessThan(3);
  });

  it('refuses an under-determined model with exit 1 and names the constants on stderr', async () => {
    const r = await run(['--model', `${FIX}/model-underdetermined.json`, '--lines', `${FIX}/lines.csv`]);
    expect(r.code).toBe(1);
    expect(r.stdout).toBe('');
    expect(r.stderr.trimEnd().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/^fit: The fit is under-determined/);
    expect(r.stderr).toMatch(/lower\.A/);
    expect(r.stderr).toMatch(/upper\.A/);
    expect(r.stderr).toMatch(/upper\.zeta/);
    expect(r.stderr).toMatch(/Fix lower\.A/);
  });

  it('names file, line and field for a bad lines file', async () => {
    const csv =
      'J_up,K_up,J_lo,K_lo,wavenumber\n1,0,0,0,813.2\n2,0,1,0,814.0\n0,0,1,0,811.6\n3,0,2,0,814.8\n1,0,2,0,810.8\nx,0,3,0,815.5\n';
    const r = await run(['--model', 'm.json', '--lines', 'L.csv'], { 'm.json': LINEAR_MODEL, 'L.csv': csv });
    expect(r.code).toBe(1);
    expect(r.stderr).toBe("fit: L.csv: line 7: J_up 'x' is not a whole number\n");
  });

  it('names the line of impossible quantum numbers', async () => {
    const csv = 'J_up,K_up,J_lo,K_lo,wavenumber\n1,0,0,0,813.2\n2,1,1,0,814.0\n';
    const r = await run(['--model', 'm.json', '--lines', 'L.csv'], { 'm.json': LINEAR_MODEL, 'L.csv': csv });
    expect(r.code).toBe(1);
    expect(r.stderr).toBe('fit: L.csv: line 3: K_up must be 0 for a Σ–Σ band of a linear molecule, got 1\n');
  });

  it('refuses too few lines and a missing option', async () => {
    const csv = 'J_up,K_up,J_lo,K_lo,wavenumber\n1,0,0,0,813.2\n';
    const r = await run(['--model', 'm.json', '--lines', 'L.csv'], { 'm.json': LINEAR_MODEL, 'L.csv': csv });
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/^fit: 1 line cannot determine 5 floated constants/);
    const m = await run(['--model', 'm.json'], { 'm.json': LINEAR_MODEL });
    expect(m).toMatchObject({ code: 1, stderr: 'fit: missing required option --lines\n' });
  });

  it('uses the default uncertainty 0.001 cm^-1 when the column is absent', async () => {
    const lines = readFileSync(`${ROOT}/${FIX}/lines.csv`, 'utf8')
      .replace(/,0\.0005$/gm, '')
      .replace('wavenumber,uncertainty', 'wavenumber');
    const r = await run(['--model', `${FIX}/model.json`, '--lines', 'L.csv'], { 'L.csv': lines });
    const json = JSON.parse(r.stdout);
    expect(json.lines.every((l: { sigma: number }) => l.sigma === 0.001)).toBe(true);
    // Noise sd 0.0005 against a stated 0.001: σ_w ≈ 0.5.
    expect(json.sigmaW).toBeGreaterThan(0.4);
    expect(json.sigmaW).toBeLessThan(0.6);
  });
});

describe('fit command (subprocess)', () => {
  it('runs through npx tsx src/cli/main.ts with JSON on stdout', () => {
    const stdout = execFileSync('npx', ['tsx', 'src/cli/main.ts', 'fit', '--model', `${FIX}/model.json`, '--lines', `${FIX}/lines.csv`], {
      cwd: ROOT,
      encoding: 'utf8',
    });
    const json = JSON.parse(stdout);
    expect(json.nLines).toBe(150);
    expect(json.parameters['upper.origin'].fixed).toBe(false);
  });

  it('exits non-zero for an under-determined model', () => {
    let status = 0;
    let stderr = '';
    try {
      execFileSync(
        'npx',
        ['tsx', 'src/cli/main.ts', 'fit', '--model', `${FIX}/model-underdetermined.json`, '--lines', `${FIX}/lines.csv`],
        {
          cwd: ROOT,
          encoding: 'utf8',
          stdio: ['ignore', 'pipe', 'pipe'],
        },
      );
    } catch (err) {
      status = (err as { status: number }).status;
      stderr = (err as { stderr: string }).stderr;
    }
    expect(status).toBe(1);
    expect(stderr).toMatch(/under-determined.*lower\.A/);
  });
});
