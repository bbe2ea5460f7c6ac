/**
 * `fit` on perpendicular bands to an E state with the standard effective Hamiltonian (ζ, etaJ, q22
 * diagonalised in (k, ℓ)), for a C3v and a D3h top at constants like those published for real
 * molecules: lines simulated through `simulate` with seeded noise, fitted through the CLI from a first
 * guess off by a user's typical error, constants back within their σ; the rank test's words for a
 * set one perpendicular band cannot determine; and q12 refused in D3h in words.
 *
 * Constants (cm⁻¹), recalled from memory to about 1 % and not re-checked (they only need to be
 * realistic in size and sign; the truth of the test is the simulation itself):
 * - C3v: CH3F ground state and ν6 (E, ~1182 cm⁻¹): B0 ≈ 0.8518, A0 ≈ 5.182, DJ ≈ 2.0e-6,
 *   DJK ≈ 1.47e-5; ν6 ζ ≈ 0.28, q22 of a few 1e-4 (cf. the CH3F ν6 analyses in J. Mol. Spectrosc.).
 * - D3h: SO3 (³²S¹⁶O₃, spin-0 ¹⁶O: only A1′/A1″ levels, weights {A1: 1, A2: 0, E: 0}) ground
 *   state and ν4 (E′, ~530 cm⁻¹): B0 ≈ 0.3485, C0 ≈ B0/2 (planar), ζ4 ≈ −0.79.
 */
import { describe, expect, it } from 'vitest';
import { seededGaussian } from '../fit/fitTestData';
import { cliRunMemory } from './cliRunMemory';

const run = (args: string[], files: Record<string, string>) => cliRunMemory(args, files);

type Constants = Record<string, number | { value: number; fixed: true }>;

interface Case {
  name: string;
  shape: 'prolate' | 'oblate';
  pointGroup: 'C3v' | 'D3h';
  spinWeightsBySymmetry: Record<string, number>;
  temperature: number;
  jMax: number;
  kMax: number;
  lower: Constants;
  upper: Record<string, number>;
  /** The first guess: upper constants as a user would start them (from an analogue, a prediction). */
  guess: Record<string, number>;
}

/** CH3F-like ν6 (C3v), constants from memory (see the file comment). */
const CH3F: Case = {
  name: 'CH3F nu6',
  shape: 'prolate',
  pointGroup: 'C3v',
  spinWeightsBySymmetry: { A1: 4, A2: 4, E: 2 },
  temperature: 296,
  jMax: 30,
  kMax: 10,
  lower: { B: 0.85179, A: { value: 5.182, fixed: true }, DJ: 2.0e-6, DJK: 1.47e-5, DK: { value: 7.6e-5, fixed: true } },
  upper: { origin: 1182.67, B: 0.8503, A: 5.118, DJ: 2.0e-6, DJK: 1.45e-5, DK: 7.4e-5, zeta: 0.2806, etaJ: 1.2e-5, q22: 3.4e-4 },
  // Origin from the Q-branch maxima (~0.05 cm⁻¹), B′ = B″, A′ 1 % off, ζ 5 %, q22 30 %, etaJ 0.
  guess: { origin: 1182.62, B: 0.85179, A: 5.17, DJ: 2.0e-6, DJK: 1.47e-5, DK: 7.6e-5, zeta: 0.295, etaJ: 0, q22: 2.4e-4 },
};

/** SO3-like ν4 (D3h, oblate), constants from memory (see the file comment). */
const SO3: Case = {
  name: 'SO3 nu4',
  shape: 'oblate',
  pointGroup: 'D3h',
  spinWeightsBySymmetry: { A1: 1, A2: 0, E: 0 },
  temperature: 296,
  jMax: 50,
  kMax: 30,
  lower: { B: 0.348543, C: { value: 0.174271, fixed: true }, DJ: 3.1e-7, DJK: -5.4e-7, DK: { value: 2.6e-7, fixed: true } },
  upper: { origin: 530.086, B: 0.348383, C: 0.174125, DJ: 3.1e-7, DJK: -5.5e-7, DK: 2.6e-7, zeta: -0.7907, q22: 8.1e-5 },
  guess: { origin: 530.05, B: 0.348543, C: 0.17427, DJ: 3.1e-7, DJK: -5.4e-7, DK: 2.6e-7, zeta: -0.75, q22: 1.0e-4 },
};

const SIGMA_CM1 = 2e-4;

function modelJson(c: Case, upper: Record<string, number>, lower: Constants = c.lower, extra: Record<string, unknown> = {}): string {
  return JSON.stringify({
    shape: c.shape,
    band: 'perpendicular',
    pointGroup: c.pointGroup,
    spinWeightsBySymmetry: c.spinWeightsBySymmetry,
    lower,
    upper,
    temperature: c.temperature,
    jMax: c.jMax,
    kMax: c.kMax,
    ...extra,
  });
}

/** The simulated lines with seeded noise as a line table (tags kept, as a spectroscopist's assignments). */
async function linesOf(c: Case, seed: number): Promise<{ table: string; count: number }> {
  const sim = await run(['simulate', '--model', 'truth.json'], { 'truth.json': modelJson(c, c.upper) });
  expect(sim.code, sim.stderr).toBe(0);
  const rows = sim.stdout.trim().split('\n');
  const head = rows[0].split(',');
  const col = (n: string) => head.indexOf(n);
  const noise = seededGaussian(seed);
  const table = ['J_up,K_up,J_lo,K_lo,wavenumber,uncertainty,tag_up,tag_lo'];
  let count = 0;
  for (const row of rows.slice(1)) {
    const f = row.split(',');
    // Lines weaker than 1 % of the strongest would not be measured.
    if (Number(f[col('intensity')]) < 0.01) continue;
    const nu = Number(f[col('wavenumber')]) + SIGMA_CM1 * noise();
    table.push(
      [f[col('J_up')], f[col('K_up')], f[col('J_lo')], f[col('K_lo')], nu.toFixed(6), SIGMA_CM1, f[col('tag_up')], f[col('tag_lo')]].join(
        ',',
      ),
    );
    count++;
  }
  return { table: table.join('\n') + '\n', count };
}

interface FitJson {
  parameters: Record<string, { value: number; sigma: number; fixed: boolean }>;
  sigmaW: number;
  rms: number;
  nLines: number;
}

describe.each([
  [CH3F, 21],
  [SO3, 22],
])('fit of a perpendicular band to an E state through the CLI: %s', (c: Case, seed: number) => {
  it('converges from a first guess off by a user’s error and recovers every floated constant within 3σ', async () => {
    const { table, count } = await linesOf(c, seed);
    expect(count).toBeGreaterThan(500);
    const fit = await run(['fit', '--model', 'guess.json', '--lines', 'lines.csv'], {
      'guess.json': modelJson(c, c.guess),
      'lines.csv': table,
    });
    expect(fit.stderr).toBe('');
    expect(fit.code).toBe(0);
    const r = JSON.parse(fit.stdout) as FitJson;
    // σ_w ≈ 1 when the model reproduces its own lines (3σ band for ν ≈ 1000: ±0.07).
    expect(Math.abs(r.sigmaW - 1)).toBeLessThan(0.1);
    const truth: [string, number][] = [
      ...Object.entries(c.upper).map(([k, v]) => [`upper.${k}`, v] as [string, number]),
      ...Object.entries(c.lower)
        .filter(([, v]) => typeof v === 'number')
        .map(([k, v]) => [`lower.${k}`, v as number] as [string, number]),
    ];
    const summary = truth.map(([k]) => `${k} ${r.parameters[k].value.toPrecision(8)}(${r.parameters[k].sigma.toPrecision(2)})`);
    console.info(`${c.name}: ${r.nLines} lines, σ_w ${r.sigmaW.toFixed(3)}, rms ${r.rms.toExponential(2)} cm⁻¹; ${summary.join(', ')}`);
    for (const [key, value] of truth) {
      const p = r.parameters[key];
      expect(p.fixed, key).toBe(false);
      expect(Math.abs(p.value - value), `${key}: ${p.value} ± ${p.sigma} (truth ${value})`).toBeLessThan(3 * p.sigma);
    }
  });

  it('names, in words, the constants one perpendicular band cannot separate (A″ or C″ with A′ or C′ and ζ)', async () => {
    // q22 and etaJ left out of truth and guess: the textbook case, where the K structure of the
    // ΔK = ±1 lines gives A′(1 − ζ) and A′ − A″ only (q22's ℓ-type resonance would tie them weakly).
    const k = c.shape === 'oblate' ? 'C' : 'A';
    const lower = { ...c.lower, [k]: (c.lower[k] as { value: number }).value };
    const without = (v: Record<string, number>) => Object.fromEntries(Object.entries(v).filter(([n]) => n !== 'q22' && n !== 'etaJ'));
    const { table } = await linesOf({ ...c, upper: without(c.upper) }, seed);
    const fit = await run(['fit', '--model', 'g.json', '--lines', 'l.csv'], {
      'g.json': modelJson(c, without(c.guess), lower),
      'l.csv': table,
    });
    expect(fit.code).not.toBe(0);
    expect(fit.stderr).toMatch(new RegExp(`under-determined.*lower\\.${k}, upper\\.${k}, upper\\.zeta`));
    expect(fit.stderr).toMatch(/ΔK = ±1 lines of a perpendicular band fix only A′\(1 − ζ\) and A′ − A″/);
    expect(fit.stderr).toMatch(new RegExp(`Fix lower\\.${k} at a value known from elsewhere`));
  });
});

describe('point-group rules in words', () => {
  it('refuses q12 for the D3h top (its ℓ(2,−1) term is forbidden there) and accepts it for the C3v one', async () => {
    const d3h = await run(['fit', '--model', 'm.json', '--lines', 'l.csv'], {
      'm.json': modelJson(SO3, { ...SO3.guess, q12: 1e-5 }),
      'l.csv': 'J_up,K_up,J_lo,K_lo,wavenumber,uncertainty\n',
    });
    expect(d3h.code).not.toBe(0);
    expect(d3h.stderr).toMatch(/model file: field 'upper\.q12' is not allowed in point group D3h/);
    const c3v = await run(['simulate', '--model', 'm.json'], { 'm.json': modelJson(CH3F, { ...CH3F.upper, q12: 1e-5 }) });
    expect(c3v.code, c3v.stderr).toBe(0);
  });
});
