import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { makeDemo } from '../../src/cli/makeDemo';
import { modelFileParse } from '../../src/io/modelFile';

const DEMO = fileURLToPath(new URL('../../public/demo/', import.meta.url));
const read = (dir: string, name: string) => readFileSync(join(dir, name), 'utf8');

describe('makeDemo', () => {
  const dir = mkdtempSync(join(tmpdir(), 'ladder-demo-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('rebuilds the committed public/demo files byte for byte (deterministic, seeded)', () => {
    makeDemo(dir);
    for (const name of ['model.json', 'truth.json', 'trace.csv', 'system.json', 'system-truth.json', 'system-trace.csv'])
      expect(read(dir, name) === read(DEMO, name), name).toBe(true);
  });

  it('writes a first guess within 0.3 % in B and 0.2 cm^-1 in the origin of the truth', () => {
    const guess = modelFileParse(read(DEMO, 'model.json'));
    const truth = modelFileParse(read(DEMO, 'truth.json'));
    expect(guess.warnings).toEqual([]);
    expect(truth.warnings).toEqual([]);
    expect(guess.name).toMatch(/fictitious/);
    for (const side of ['lower', 'upper'] as const) {
      expect(Math.abs(guess.model[side].B / truth.model[side].B - 1)).toBeLessThanOrEqual(0.003);
    }
    expect(Math.abs(guess.model.upper.origin - truth.model.upper.origin)).toBeLessThanOrEqual(0.2);
    expect(guess.model.upper.origin).not.toBe(truth.model.upper.origin);
    expect(guess.massAmu).toBe(64);
  });

  it('writes an FTIR-like transmittance trace: header, ascending grid, values in [0, 1], moderate absorbance', () => {
    const rows = read(DEMO, 'trace.csv').trimEnd().split('\n');
    expect(rows[0]).toBe('wavenumber_cm-1,transmittance');
    const x = rows.slice(1).map((r) => Number(r.split(',')[0]));
    const t = rows.slice(1).map((r) => Number(r.split(',')[1]));
    expect(x.length).toBeGreaterThanOrEqual(100_000);
    expect(x.length).toBeLessThanOrEqual(250_000);
    for (let i = 1; i < x.length; i++) expect(x[i] - x[i - 1]).toBeGreaterThan(0.0015);
    expect(Math.min(...t)).toBeGreaterThan(0);
    expect(Math.max(...t)).toBeLessThan(1);
    // Strongest line: absorbance 0.8 on a baseline near 0.95 → T ≈ 0.15; allow the noise (σ ≈ 0.004).
    const tMin = Math.min(...t);
    expect(tMin).toBeGreaterThan(0.95 * 10 ** -1 - 0.02);
    expect(tMin).toBeLessThan(0.95 * 10 ** -0.5);
  });
});
