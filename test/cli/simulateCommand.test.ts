import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { CliError, type CliIo } from '../../src/cli/cliIo';
import { cliMain } from '../../src/cli/main';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const FIXTURES = fileURLToPath(new URL('../fixtures/models/', import.meta.url));
const PROLATE = FIXTURES + 'perpendicular-prolate.json';

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

async function simulate(args: string[], files?: Record<string, string>) {
  const m = memoryIo(files);
  const code = await cliMain(['simulate', ...args], m.io);
  return { code, stdout: m.stdout(), stderr: m.stderr() };
}

type Row = Record<string, string>;
function table(csv: string): { header: string[]; rows: Row[] } {
  const [head, ...body] = csv.trimEnd().split('\n');
  const header = head.split(',');
  return { header, rows: body.map((l) => Object.fromEntries(l.split(',').map((v, i) => [header[i], v]))) };
}

// Fixture constants (cm^-1), repeated here for the hand computation.
const LO = { B: 0.31, A: 2.65, DJ: 3e-7, DJK: 2e-6, DK: 1.6e-5 };
const UP = { origin: 1180, B: 0.3085, A: 2.63, DJ: 3e-7, DJK: 2.1e-6, DK: 1.5e-5, zeta: 0.27 };
const F = (s: typeof LO, J: number, K: number) =>
  s.B * J * (J + 1) + (s.A - s.B) * K * K - s.DJ * (J * (J + 1)) ** 2 - s.DJK * J * (J + 1) * K * K - s.DK * K ** 4;

describe('simulate command (in process)', () => {
  it('writes the contract header and one row per line in ascending wavenumber', async () => {
    const r = await simulate(['--model', PROLATE]);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    const { header, rows } = table(r.stdout);
    expect(header.slice(0, 7)).toEqual(['J_up', 'K_up', 'J_lo', 'K_lo', 'wavenumber', 'intensity', 'E_lo']);
    // Count by the contract's selection rules (jMax 12, kMax 4, perpendicular): for each K'' the
    // ΔK = +1 branches give R: 13 − K, Q: 12 − K, P: 11 − K lines; ΔK = −1 (K'' ≥ 1) R, Q, P: 13 − K each.
    let expected = 0;
    for (let K = 0; K <= 4; K++) {
      expected += 13 - K + (12 - K) + Math.max(0, 11 - K);
      if (K > 0) expected += 3 * (13 - K);
    }
    expect(rows.length).toBe(expected);
    const nu = rows.map((x) => Number(x.wavenumber));
    for (let i = 1; i < nu.length; i++) expect(nu[i]).toBeGreaterThanOrEqual(nu[i - 1]);
    const inten = rows.map((x) => Number(x.intensity));
    expect(Math.max(...inten)).toBe(1);
    expect(Math.min(...inten)).toBeGreaterThan(0);
  });

  it('puts rR0(0) and pP3(5) where the term-value formula says', async () => {
    const { rows } = table((await simulate(['--model', PROLATE])).stdout);
    // rR0(0): J'' = 0, K'' = 0 → J' = 1, K' = 1, Coriolis −2A'ζK' (Herzberg II 1945, eq. (IV,45)).
    const rr = rows.find((x) => x.label === 'rR0(0)')!;
    expect([rr.J_up, rr.K_up, rr.J_lo, rr.K_lo]).toEqual(['1', '1', '0', '0']);
    const nuRR = UP.origin + F(UP, 1, 1) - 2 * UP.A * UP.zeta * 1 - F(LO, 0, 0);
    // Tol 1e-7 cm^-1: the CSV prints 7 decimals.
    expect(Math.abs(Number(rr.wavenumber) - nuRR)).toBeLessThan(1e-7);
    const pp = rows.find((x) => x.label === 'pP3(5)')!;
    expect([pp.J_up, pp.K_up, pp.J_lo, pp.K_lo]).toEqual(['4', '2', '5', '3']);
    const nuPP = UP.origin + F(UP, 4, 2) + 2 * UP.A * UP.zeta * 2 - F(LO, 5, 3);
    expect(Math.abs(Number(pp.wavenumber) - nuPP)).toBeLessThan(1e-7);
    expect(Math.abs(Number(pp.E_lo) - F(LO, 5, 3))).toBeLessThan(1e-6);
  });

  it('applies the spin weights [4, 2, 2]: the K″ = 3 lines are twice as strong as the rule without them', async () => {
    const weighted = table((await simulate(['--model', PROLATE])).stdout).rows;
    const plainText = JSON.stringify({ ...JSON.parse(readFileSync(PROLATE, 'utf8')), spinWeights: [1] });
    const plain = table((await simulate(['--model', 'plain.json'], { 'plain.json': plainText })).stdout).rows;
    const I = (rows: Row[], label: string) => Number(rows.find((x) => x.label === label)!.intensity);
    // Ratio of ratios, normalisation cancels; g(3)/g(1) = 4/2. Tol 1e-5: 6 printed digits.
    const r = I(weighted, 'rQ3(6)') / I(weighted, 'rQ1(6)') / (I(plain, 'rQ3(6)') / I(plain, 'rQ1(6)'));
    expect(Math.abs(r - 2)).toBeLessThan(1e-5);
  });

  it('drops weak lines with --min-intensity', async () => {
    const all = table((await simulate(['--model', PROLATE])).stdout).rows;
    const strong = table((await simulate(['--model', PROLATE, '--min-intensity', '0.5'])).stdout).rows;
    expect(strong.length).toBe(all.filter((x) => Number(x.intensity) >= 0.5).length);
  });

  it.each([
    ['not JSON', '{', /model file is not valid JSON/],
    [
      'a missing field',
      JSON.stringify({ shape: 'prolate', lower: {}, upper: {}, temperature: 296, jMax: 5, kMax: 2 }),
      /field 'band' is missing/,
    ],
    [
      'a wrong type',
      JSON.stringify({ shape: 'prolate', band: 'parallel', lower: {}, upper: {}, temperature: 'hot', jMax: 5, kMax: 2 }),
      /field 'temperature' is the string "hot"/,
    ],
    [
      'A on an oblate top',
      JSON.stringify({ shape: 'oblate', band: 'parallel', lower: { A: 1 }, upper: {}, temperature: 296, jMax: 5, kMax: 2 }),
      /field 'lower\.A'/,
    ],
    [
      'an unknown constant',
      JSON.stringify({ shape: 'prolate', band: 'parallel', lower: { Bee: 1 }, upper: {}, temperature: 296, jMax: 5, kMax: 2 }),
      /field 'lower\.Bee'/,
    ],
  ])('refuses a model file with %s: exit 1, one line on stderr, no stack trace', async (_what, text, message) => {
    const r = await simulate(['--model', 'm.json'], { 'm.json': text });
    expect(r.code).toBe(1);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(/^simulate: m\.json: /);
    expect(r.stderr).toMatch(message);
    expect(r.stderr.trimEnd().split('\n')).toHaveLength(1);
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });

  it('reports a missing --model and an unreadable file', async () => {
    expect((await simulate([])).stderr).toMatch(/^simulate: missing required option --model\n$/);
    const r = await simulate(['--model', '/no/such/file.json']);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/cannot read '\/no\/such\/file\.json'/);
  });
});

describe('simulate command (subprocess)', () => {
  it('prints the same CSV through `npx tsx src/cli/main.ts` as in process', async () => {
    const out = execFileSync('npx', ['tsx', 'src/cli/main.ts', 'simulate', '--model', PROLATE], { cwd: ROOT, encoding: 'utf8' });
    expect(out).toBe((await simulate(['--model', PROLATE])).stdout);
  });
});
