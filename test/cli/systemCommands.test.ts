import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { CliError, type CliIo } from '../../src/cli/cliIo';
import { cliMain } from '../../src/cli/main';
import { systemFileParse } from '../../src/io/systemFile';
import { MHZ_PER_CM1 } from '../../src/physics/constants';
import { systemLines } from '../../src/physics/system/systemLines';
import { seededGaussian } from '../fit/fitTestData';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const SYSTEM = 'test/fixtures/systems/fictitious-c3v.json';
const SYSTEM_TEXT = readFileSync(`${ROOT}/${SYSTEM}`, 'utf8');

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
  const code = await cliMain(args, io);
  return { code, ...out };
}

/**
 * A line table simulated from the fixture's constants with seeded noise: ground-state rotational lines
 * in MHz (σ 0.05 MHz), the strongest 160 lines of each infrared band (σ 0.0005 cm^-1); hot-band rows
 * carry l_lo and l_up. Optionally leaves the l columns out.
 */
function lineTable(withL = true): string {
  const file = systemFileParse(SYSTEM_TEXT);
  const l = systemLines(file.model);
  const g = seededGaussian(21);
  const rows = [`J_up,K_up,J_lo,K_lo,wavenumber,uncertainty,unit,band${withL ? ',l_up,l_lo' : ''}`];
  const count = new Map<string, number>();
  const order = Array.from({ length: l.count }, (_, i) => i).sort((a, b) => l.intensity[b] - l.intensity[a]);
  for (const i of order) {
    const band = l.bandRefs[l.bandIndex[i]].band;
    if (band === 'rot' && (l.jLower[i] > 20 || l.kLower[i] > 4)) continue;
    // Per infrared band the 120 strongest P and R lines and the 40 strongest Q lines.
    const kind = `${band}${l.deltaJ[i] === 0 ? 'Q' : 'PR'}`;
    if (band !== 'rot' && (count.get(kind) ?? 0) >= (l.deltaJ[i] === 0 ? 40 : 120)) continue;
    count.set(kind, (count.get(kind) ?? 0) + 1);
    const isMw = band === 'rot';
    const value = isMw ? l.wavenumberCm1[i] * MHZ_PER_CM1 + 0.05 * g() : l.wavenumberCm1[i] + 0.0005 * g();
    const lCols = withL ? `,${band === 'hot' ? l.lUpper[i] : ''},${band === 'hot' ? l.lLower[i] : ''}` : '';
    rows.push(
      `${l.jUpper[i]},${l.kUpper[i]},${l.jLower[i]},${l.kLower[i]},${value},${isMw ? 0.05 : 0.0005},${isMw ? 'MHz' : 'cm-1'},${band}${lCols}`,
    );
  }
  return rows.join('\n') + '\n';
}

describe('simulate with a system file', () => {
  it('lists every band with band, species, l and tag columns after the contract columns, ascending wavenumber', async () => {
    const r = await run(['simulate', '--model', SYSTEM]);
    expect(r.code).toBe(0);
    const lines = r.stdout.trim().split('\n');
    expect(lines[0]).toBe('J_up,K_up,J_lo,K_lo,wavenumber,intensity,E_lo,label,band,species,l_up,l_lo,tag_up,tag_lo');
    const rows = lines.slice(1).map((t) => t.split(','));
    expect(new Set(rows.map((c) => c[8]))).toEqual(new Set(['rot', 'nu3', 'nu6', 'hot']));
    for (let i = 1; i < rows.length; i++) expect(Number(rows[i][4])).toBeGreaterThanOrEqual(Number(rows[i - 1][4]));
    expect(Math.max(...rows.map((c) => Number(c[5])))).toBe(1);
    // Perpendicular ν6: ΔK = +1 lines end on (+l) levels (Herzberg II (1945) ch. IV).
    const up = rows.find((c) => c[8] === 'nu6' && Number(c[1]) - Number(c[3]) === 1)!;
    expect(up[10]).toBe('+1');
  });
});

describe('simulate → fit round trip', () => {
  it('reads the simulate output back as a line table (band and l columns) and fits it to zero residuals', async () => {
    const sim = await run(['simulate', '--model', SYSTEM, '--min-intensity', '0.001']);
    expect(sim.code).toBe(0);
    const fit = await run(['fit', '--model', SYSTEM, '--lines', 'sim.csv'], { 'sim.csv': sim.stdout });
    expect(fit.stderr).toBe('');
    expect(fit.code).toBe(0);
    const out = JSON.parse(fit.stdout);
    // simulate prints positions to 1e-7 cm^-1, so residuals stay below that rounding (5e-8) plus the fit's slack.
    expect(Math.max(...out.residuals.map(Math.abs))).toBeLessThan(1e-7);
    expect(new Set(out.lines.map((l: { band: string }) => l.band))).toEqual(new Set(['nu3', 'nu6', 'hot']));
  });
});

describe('spectrum with a system file', () => {
  it('sums the bands of every species', async () => {
    const json = JSON.parse(SYSTEM_TEXT);
    const twin = { ...json, species: [json.species[0], { ...json.species[0], name: 'Y' }] };
    const args = ['--from', '1000', '--to', '1030', '--step', '0.01'];
    const one = await run(['spectrum', '--model', 'one.json', ...args], { 'one.json': SYSTEM_TEXT });
    const two = await run(['spectrum', '--model', 'two.json', ...args], { 'two.json': JSON.stringify(twin) });
    expect(one.code).toBe(0);
    expect(two.code).toBe(0);
    const y1 = one.stdout
      .trim()
      .split('\n')
      .slice(1)
      .map((t) => Number(t.split(',')[1]));
    const y2 = two.stdout
      .trim()
      .split('\n')
      .slice(1)
      .map((t) => Number(t.split(',')[1]));
    // Two identical species: every line twice, on the same intensity scale (strongest = 1 in both files),
    // so y doubles; tolerance 1e-6 relative for the 7 printed digits.
    const peak = Math.max(...y1);
    expect(peak).toBeGreaterThan(0);
    y1.forEach((v, k) => expect(Math.abs(y2[k] - 2 * v)).toBeLessThanOrEqual(1e-6 * peak));
  });

  it('asks for the mass of a species that has none', async () => {
    const json = JSON.parse(SYSTEM_TEXT);
    delete json.species[0].mass;
    const r = await run(['spectrum', '--model', 's.json', '--from', '1000', '--to', '1001', '--step', '0.1'], {
      's.json': JSON.stringify(json),
    });
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/species 'X'/);
  });
});

describe('fit with a system file', () => {
  it('fits microwave and infrared lines of four bands together and reports in the fit contract shape', async () => {
    const r = await run(['fit', '--model', SYSTEM, '--lines', 'l.csv'], { 'l.csv': lineTable() });
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    for (const k of [
      'parameters',
      'rms',
      'sigmaW',
      'nLines',
      'residuals',
      'warnings',
      'lines',
      'floated',
      'correlation',
      'degreesOfFreedom',
      'bands',
    ])
      expect(out, k).toHaveProperty(k);
    expect(out.parameters['v3v6.DJ'].same).toBe('v6.DJ');
    expect(out.parameters['ground.A']).toEqual({ value: 5.097, sigma: 0, fixed: true });
    const mw = out.lines.find((l: { unit: string }) => l.unit === 'MHz');
    expect(mw.band).toBe('rot');
    expect(mw.obsMinusCalcMHz).toBeCloseTo(mw.obsMinusCalc * MHZ_PER_CM1, 9);
    // Round trip: the truth is the file's own values; within 3.5σ, σ_w within 4 sd of 1.
    const truth = systemFileParse(SYSTEM_TEXT);
    for (const key of out.floated) {
      const p = out.parameters[key];
      const t = truth.parameters.find((q) => q.key === key)!.value;
      expect(Math.abs(p.value - t) / p.sigma, key).toBeLessThan(3.5);
    }
    expect(Math.abs(out.sigmaW - 1)).toBeLessThan(4 / Math.sqrt(2 * out.degreesOfFreedom));
  });

  it('refuses a hot-band row that does not say which ±l level it joins, naming the line and the choice', async () => {
    const r = await run(['fit', '--model', SYSTEM, '--lines', 'l.csv'], { 'l.csv': lineTable(false) });
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/^fit: l\.csv: line \d+: .*names 2 lines of band 'hot'.*give l_lo\/l_up/);
  });

  it('reads an old single-band model with MHz rows as a one-band system, converting the MHz rows', async () => {
    const model = JSON.stringify({
      shape: 'linear',
      band: 'parallel',
      lower: { B: 0.39, DJ: { value: 0, fixed: true } },
      upper: { origin: 812.4, B: 0.389, DJ: { value: 0, fixed: true } },
      temperature: 296,
      jMax: 30,
    });
    // Exact lines of an invented band (ν0 = 812.4375, B′ = 0.3891, B″ = 0.3907 cm^-1); one of them given in MHz.
    const nu = (jUp: number, jLo: number) => 812.4375 + 0.3891 * jUp * (jUp + 1) - 0.3907 * jLo * (jLo + 1);
    const rows = ['J_up,K_up,J_lo,K_lo,wavenumber,uncertainty,unit'];
    for (let j = 1; j < 12; j++) rows.push(`${j + 1},0,${j},0,${nu(j + 1, j)},0.0005,cm-1`, `${j},0,${j + 1},0,${nu(j, j + 1)},0.0005,`);
    rows.push(`1,0,0,0,${(nu(1, 0) * MHZ_PER_CM1).toFixed(3)},15,MHz`);
    const r = await run(['fit', '--model', 'm.json', '--lines', 'l.csv'], { 'm.json': model, 'l.csv': rows.join('\n') + '\n' });
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    const mw = out.lines.find((l: { unit: string }) => l.unit === 'MHz');
    // Read as cm^-1 the row would sit 2.4e7 cm^-1 away; converted, it fits to its rounding (0.0005 MHz).
    expect(Math.abs(mw.obsMinusCalcMHz)).toBeLessThan(0.01);
    expect(out.parameters['lower.B'].value).toBeCloseTo(0.3907, 9);
  });
});

describe('combdiff with a system file', () => {
  it('pools the ground-state differences of every band that shares the state', async () => {
    const r = await run(['combdiff', '--model', SYSTEM, '--lines', 'l.csv', '--state', 'ground'], { 'l.csv': lineTable() });
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(new Set(out.pairs.map((p: { band: string }) => p.band))).toEqual(new Set(['rot', 'nu3', 'nu6']));
    const b0 = 13287.0 / MHZ_PER_CM1;
    expect(Math.abs(out.B.value - b0) / out.B.sigma).toBeLessThan(3.5);
  });

  it('keeps the old invocation without --model unchanged', async () => {
    const r = await run(['combdiff', '--lines', 'test/fixtures/lines/hcl-fundamental/lines.csv', '--state', 'lower', '--shape', 'linear']);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout).B.value).toBeGreaterThan(10);
  });
});

describe('commands that take a single-band model', () => {
  it('perturbations refuses a system file with a clear message', async () => {
    const r = await run(['perturbations', '--model', SYSTEM, '--lines', 'l.csv'], { 'l.csv': 'J_up,K_up,J_lo,K_lo,wavenumber\n' });
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/is a system file .*takes a single-band model file/);
  });
  it('assign takes a system file (test/cli/assignSystem.test.ts) and says when the trace has no peaks', async () => {
    const r = await run(['assign', '--model', SYSTEM, '--trace', 'x.csv'], { 'x.csv': 'x,y\n1,0\n2,0\n' });
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/x\.csv: no peaks found at SNR >= 5/);
  });
});
