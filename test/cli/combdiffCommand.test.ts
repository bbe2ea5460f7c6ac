import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { cliMain } from '../../src/cli/main';
import { CliError, type CliIo } from '../../src/cli/cliIo';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const HCL = 'test/fixtures/lines/hcl-fundamental/lines.csv';

async function run(args: string[], files: Record<string, string> = {}) {
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
  const code = await cliMain(['combdiff', ...args], io);
  return { code, ...out };
}

describe('combdiff command (in process)', () => {
  it('gives B″ of H³⁵Cl from the fixture lines', async () => {
    // Check value B0 = 10.440 cm^-1 (Huber & Herzberg 1979, from memory); tolerance 3 reported σ.
    const r = await run(['--lines', HCL, '--state', 'lower']);
    expect(r.code).toBe(0);
    const json = JSON.parse(r.stdout);
    expect(Object.keys(json)).toEqual(expect.arrayContaining(['B', 'DJ', 'DJK', 'nPairs']));
    expect(json.nPairs).toBe(8);
    expect(Math.abs(json.B.value - 10.44) / json.B.sigma).toBeLessThan(3);
    expect(json.DJK).toEqual({ value: 0, sigma: 0, fixed: true });
    expect(json.pairs[0]).toMatchObject({ J: 1, lineR: 2, lineP: 13 });
  });

  it('gives B′ with --state upper', async () => {
    // Check value B1 = 10.133 cm^-1 (Huber & Herzberg 1979, from memory).
    const json = JSON.parse((await run(['--lines', HCL, '--state', 'upper', '--shape', 'oblate'])).stdout);
    expect(Math.abs(json.B.value - 10.133) / json.B.sigma).toBeLessThan(3);
  });

  it('refuses a bad --state or --shape and too few pairs', async () => {
    expect(await run(['--lines', HCL, '--state', 'middle'])).toMatchObject({
      code: 1,
      stderr: "combdiff: option --state must be 'lower' or 'upper', got 'middle'\n",
    });
    expect((await run(['--lines', HCL, '--state', 'lower', '--shape', 'round'])).stderr).toMatch(/--shape must be 'prolate' or 'oblate'/);
    const few = 'J_up,K_up,J_lo,K_lo,wavenumber\n1,0,0,0,2906.25\n';
    const r = await run(['--lines', 'L.csv', '--state', 'lower'], { 'L.csv': few });
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/^combdiff: L.csv: found 0 R\(J−1\)\/P\(J\+1\) pairs/);
  });

  it('names file and line of a line with K > J', async () => {
    const bad = 'J_up,K_up,J_lo,K_lo,wavenumber\n1,0,0,0,2906.25\n3,4,2,4,2944.89\n';
    const r = await run(['--lines', 'L.csv', '--state', 'lower'], { 'L.csv': bad });
    expect(r).toMatchObject({ code: 1, stderr: 'combdiff: L.csv: line 3: K_up=4 exceeds J_up=3 (K <= J is required)\n' });
  });
});

describe('combdiff command (subprocess)', () => {
  it('runs through npx tsx src/cli/main.ts', () => {
    const stdout = execFileSync('npx', ['tsx', 'src/cli/main.ts', 'combdiff', '--lines', HCL, '--state', 'lower'], {
      cwd: ROOT,
      encoding: 'utf8',
    });
    expect(JSON.parse(stdout).nPairs).toBe(8);
  });
});
