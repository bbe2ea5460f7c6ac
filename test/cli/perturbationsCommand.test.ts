import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { inventedModel, simulatedLines } from '../fit/fitTestData';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));

function cli(args: string[]) {
  return spawnSync('npx', ['tsx', 'src/cli/main.ts', 'perturbations', ...args], { cwd: ROOT, encoding: 'utf8', timeout: 60_000 });
}

describe('perturbations command', () => {
  it('prints the findings and the reduced term values of the upper state as JSON', () => {
    // Invented band with one upper level moved by +0.05 cm^-1 in all its lines (P, Q and R).
    const truth = inventedModel('prolate', 'parallel');
    const lines = simulatedLines(truth, 600, 0.0005, 4).map((l) =>
      l.kUpper === 3 && l.jUpper === 15 ? { ...l, observedCm1: l.observedCm1 + 0.05 } : l,
    );
    const dir = mkdtempSync(join(tmpdir(), 'lb-pert-'));
    const model = {
      shape: 'prolate',
      band: 'parallel',
      lower: {
        B: truth.lower.B,
        A: { value: truth.lower.A, fixed: true },
        DJ: truth.lower.DJ,
        DJK: { value: truth.lower.DJK, fixed: true },
        DK: { value: truth.lower.DK, fixed: true },
      },
      upper: {
        origin: truth.upper.origin,
        B: truth.upper.B,
        A: truth.upper.A,
        DJ: truth.upper.DJ,
        DJK: { value: truth.upper.DJK, fixed: true },
        DK: { value: truth.upper.DK, fixed: true },
      },
      temperature: 250,
      jMax: 45,
      kMax: 12,
      spinWeights: [1],
    };
    writeFileSync(join(dir, 'm.json'), JSON.stringify(model));
    const csv = lines.map((l) => `${l.jUpper},${l.kUpper},${l.jLower},${l.kLower},${l.observedCm1},${l.uncertaintyCm1}`);
    writeFileSync(join(dir, 'l.csv'), ['J_up,K_up,J_lo,K_lo,wavenumber,uncertainty', ...csv].join('\n') + '\n');
    const r = cli(['--model', join(dir, 'm.json'), '--lines', join(dir, 'l.csv')]);
    expect(r.status, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.state).toBe('upper');
    expect(out.findings[0]).toMatchObject({ kind: 'local', k: 3, jPeak: 15 });
    // The level's shift is the injected +0.05 cm^-1 to within the noise (0.0005 cm^-1 per line).
    expect(Math.abs(out.findings[0].size - 0.05)).toBeLessThan(0.003);
    const level = out.levels.find((l: { J: number; K: number }) => l.J === 15 && l.K === 3);
    expect(level.nLines).toBeGreaterThan(1);
    // Reduced term value E − B̄·J(J+1) with B̄ the fitted B′ (within 1e-5 of the invented one): 240·1e-5.
    expect(Math.abs(level.obs - level.reducedObs - truth.upper.B * 15 * 16)).toBeLessThan(3e-3);
  });

  it('refuses a wrong --state in one line on stderr', () => {
    const r = cli(['--model', 'x.json', '--lines', 'y.csv', '--state', 'middle']);
    expect(r.status).not.toBe(0);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/--state must be 'upper' or 'lower'/);
  });
});
