import { describe, expect, it } from 'vitest';
import { workloadsPrepare, workloadsRead } from './workloads';

// Smoke run of every benchmark workload at reduced grid/row size: checks that each one runs and gives
// a sensible answer. No timing is asserted here (timings live in `npm run bench`).
describe('benchmark workloads (smoke run)', () => {
  const file = workloadsRead();
  const work = Object.fromEntries(workloadsPrepare(file, 0.02).map((w) => [w.name, w]));

  it('W1 enumerates the perpendicular band with the intensity cut applied', () => {
    const lines = work.W1.run() as { count: number; intensity: Float64Array };
    expect(lines.count).toBe(work.W1.size);
    let min = Infinity;
    for (let i = 0; i < lines.count; i++) min = Math.min(min, lines.intensity[i]);
    expect(min).toBeGreaterThanOrEqual(file.W1.cut);
  });

  it('W2 and W3 give a spectrum with peaks', () => {
    const y = work.W2.run() as Float64Array;
    expect(y.length).toBe(work.W2.size);
    expect(Math.max(...y)).toBeGreaterThan(0);
    const peaks = work.W3.run() as { count: number };
    expect(peaks.count).toBeGreaterThan(100);
  });

  it('W4 recovers the true constants from the perturbed start', () => {
    // The workload's noise is uniform with σ = 0.0005 cm^-1 equal to the stated uncertainty, so the
    // fit must end with σ_w near 1 and every floated constant within 4σ of the truth.
    const outcome = work.W4.run() as { ok: true; result: { sigmaW: number; parameters: Record<string, { value: number; sigma: number }> } };
    expect(outcome.result.sigmaW).toBeGreaterThan(0.9);
    expect(outcome.result.sigmaW).toBeLessThan(1.1);
    const truth = file.W1.model;
    for (const key of file.W4.floated as string[]) {
      const [side, name] = key.split('.');
      const p = outcome.result.parameters[key];
      expect(Math.abs(p.value - truth[side][name]), key).toBeLessThan(4 * p.sigma);
    }
  });

  it('W5 parses every row of the CSV text', () => {
    const cols = work.W5.run() as { x: Float64Array; y: Float64Array };
    expect(cols.x.length).toBe(work.W5.size);
    expect(cols.x[0]).toBe(1000);
    expect(cols.y[0]).toBe(0.5);
  });
});
