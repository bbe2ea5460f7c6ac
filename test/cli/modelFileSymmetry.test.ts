import { describe, expect, it } from 'vitest';
import { cliRunMemory } from './cliRunMemory';

const run = (args: string[], files: Record<string, string>) => cliRunMemory(args, files);

/** An invented perpendicular band of a prolate top (fictitious constants), with extra model-file fields. */
function model(top: Record<string, unknown>, upper: Record<string, unknown> = {}) {
  return JSON.stringify({
    shape: 'prolate',
    band: 'perpendicular',
    lower: { B: 0.3427, A: { value: 2.871, fixed: true } },
    upper: { origin: 1187.42, B: 0.3411, A: 2.852, zeta: 0.243, ...upper },
    temperature: 260,
    jMax: 12,
    kMax: 6,
    ...top,
  });
}

describe('single-band model files with the Hamiltonian keys (run through the system engine)', () => {
  it('simulates a model with pointGroup and q22, with the symmetry columns, and fits its keys as upper.q22', async () => {
    const files = { 'm.json': model({ pointGroup: 'C3v', spinWeightsBySymmetry: { A1: 4, A2: 4, E: 2 } }, { q22: 5e-4 }) };
    const sim = await run(['simulate', '--model', 'm.json'], files);
    expect(sim.code).toBe(0);
    const rows = sim.stdout.trim().split('\n');
    expect(rows[0]).toBe('J_up,K_up,J_lo,K_lo,wavenumber,intensity,E_lo,label,band,species,l_up,l_lo,tag_up,tag_lo,sym_up,sym_lo');
    // Fit the simulated positions back (σ 1e-4 cm⁻¹, no noise): upper.q22 is a key like upper.B.
    const table = ['J_up,K_up,J_lo,K_lo,wavenumber,uncertainty,tag_up,tag_lo'];
    for (const row of rows.slice(1)) {
      const c = row.split(',');
      table.push(`${c[0]},${c[1]},${c[2]},${c[3]},${c[4]},0.0001,${c[12]},${c[13]}`);
    }
    const start = model({ pointGroup: 'C3v', spinWeightsBySymmetry: { A1: 4, A2: 4, E: 2 } }, { q22: 4e-4 });
    const fit = await run(['fit', '--model', 'start.json', '--lines', 'l.csv'], { 'start.json': start, 'l.csv': table.join('\n') + '\n' });
    expect(fit.stderr).toBe('');
    expect(fit.code).toBe(0);
    const out = JSON.parse(fit.stdout) as { parameters: Record<string, { value: number }>; rms: number };
    // Positions printed to 1e-7 cm⁻¹: q22 back to 1e-9 cm⁻¹ (its lines move by q22·J(J+1) ~ 0.08 cm⁻¹).
    expect(Math.abs(out.parameters['upper.q22'].value - 5e-4)).toBeLessThan(1e-9);
    expect(out.rms).toBeLessThan(1e-6);
  });

  it('names the model file path when a key is refused', async () => {
    const d3h = await run(['simulate', '--model', 'm.json'], { 'm.json': model({ pointGroup: 'D3h' }, { q12: 1e-4 }) });
    expect(d3h.code).not.toBe(0);
    expect(d3h.stderr).toMatch(/model file: field 'upper\.q12' is not allowed in point group D3h/);
    const none = await run(['simulate', '--model', 'm.json'], { 'm.json': model({}, { etaK: 1e-5 }) });
    expect(none.stderr).toMatch(/model file: field 'upper\.etaK' .*add "pointGroup": "C3v" or "D3h" to the model file/);
  });

  it('accepts qJ of a linear Π state, whose e/f levels the system engine holds', async () => {
    const lin = JSON.stringify({
      shape: 'linear',
      band: 'perpendicular',
      lower: { B: 0.1516 },
      upper: { origin: 222.9, B: 0.1521, q: 1.5e-4, qJ: -2e-9 },
      temperature: 296,
      jMax: 20,
    });
    const r = await run(['simulate', '--model', 'lin.json'], { 'lin.json': lin });
    expect(r.code).toBe(0);
    // Ref: Q(1) at origin + B'(2 − 1) − B''·2 − ½(q + 2qJ)·2 (f level; DEVELOPERS.md Π formula with q_eff = q + qJ·J(J+1)).
    const q1 = r.stdout.split('\n').find((row) => row.includes(',Q(1),'))!;
    const want = 222.9 + 0.1521 * 1 - 0.1516 * 2 - 0.5 * (1.5e-4 + -2e-9 * 2) * 2;
    expect(Math.abs(Number(q1.split(',')[4]) - want)).toBeLessThan(1e-7);
  });
});
