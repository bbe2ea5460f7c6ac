/**
 * `classify` and `contour` on band traces made outside this program: test/fixtures/independent_traces
 * (make_traces.py: Python and numpy, the instrument applied by Fourier transform of the transmittance,
 * level energies, selection rules and Hönl–London factors written from Herzberg II (1945) ch. IV,
 * Norton & Beer (1976, 1977) apodizations, Griffiths & de Haseth (2007) ch. 2; molecular constants
 * round values of real molecules recalled from memory, only for realistic proportions). The truth is
 * what that script put in (cases.json). Run through the command line as a script would.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { cliRunMemory } from './cliRunMemory';
import { independentJMax, type IndependentCase } from './independentCase';

const DIR = new URL('../fixtures/independent_traces/', import.meta.url);

type Case = IndependentCase;

const cases = JSON.parse(readFileSync(new URL('cases.json', DIR), 'utf8')) as Case[];
const byName = (name: string) => cases.find((c) => c.name === name)!;
const traceFiles = (c: Case) => ({ [`${c.name}.csv`]: readFileSync(new URL(`${c.name}.csv`, DIR), 'utf8') });

async function classify(c: Case) {
  const r = await cliRunMemory(
    ['classify', '--trace', `${c.name}.csv`, '--from', String(c.from), '--to', String(c.to), '--temperature', String(c.temperature)],
    traceFiles(c),
  );
  expect(r.code, r.stderr).toBe(0);
  return JSON.parse(r.stdout) as {
    profile: string;
    type: string;
    confidence: string;
    B: number | null;
    bLow?: number;
    bHigh?: number;
    qSpacing?: number;
    origin: number;
    bMethod: string;
  };
}

/** 2[A′(1 − ζ) − B′] (C′ for an oblate top), cm^-1: the Q-branch spacing (Herzberg II ch. IV). */
const qSpacingTruth = (c: Case) => Math.abs(2 * ((c.upper.A ?? c.upper.C) * (1 - c.upper.zeta) - c.upper.B));

describe('classify on independently made traces', () => {
  it.each(cases.map((c) => [c.name, c] as const))('%s: names the profile the trace shows', async (_, c) => {
    const r = await classify(c);
    expect(r.profile).toBe(c.expect.profile);
    if (c.expect.profile === 'Q-series') {
      // Target of the unresolved-band work: the Q spacing within 3 %.
      expect(Math.abs(r.qSpacing! / qSpacingTruth(c) - 1)).toBeLessThan(0.03);
    } else {
      // Whenever B is given, the truth (B″) lies inside the range given with it.
      expect(r.B).not.toBeNull();
      expect(c.lower.B).toBeGreaterThanOrEqual(r.bLow!);
      expect(c.lower.B).toBeLessThanOrEqual(r.bHigh!);
    }
  });

  it('gives B within 10 % on every P/R band but the three oblate ones, which it rates low', async () => {
    const misses: string[] = [];
    for (const c of cases.filter((x) => x.expect.profile !== 'Q-series')) {
      const r = await classify(c);
      if (!(Math.abs(r.B! / c.lower.B - 1) <= 0.1)) misses.push(`${c.name} (${r.confidence})`);
    }
    // An oblate top's parallel band puts 41 % of its area into the Q branch, as a linear molecule's
    // Π–Σ band does: read as Π–Σ, rated low, B twice the truth (inside the wide range given). The
    // oblate perpendicular band, its Q branches merged, is read as a parallel band, rated low, B 15 %
    // high (2 % before B′ ≠ B″ envelopes were tried, which 8 more of the 641 seeded and 4 more of 128
    // independently made random P/R bands needed). random_87, kept for the contour fit below, is another
    // oblate perpendicular band with its Q branches merged: read as parallel, rated low, B −46 % (the
    // truth inside the range given).
    expect(misses).toEqual(['oblate_par (low)', 'oblate_perp (low)', 'random_87 (low)']);
  });

  it('reads resolved lines whose spacing drifts along the band (B′ − B″ = −0.8 %) as lines, origin in the central gap', async () => {
    // An N2O ν3-like band at L = 4 cm: the spacing falls from 1.1 to 0.5 cm^-1 across it, and P(1) and
    // R(0) are weak. Before the local spacing was allowed to drift the comb went unseen (PR rated low,
    // from the envelope), and with one weak line missing the origin was put 1 cm^-1 off.
    const c = byName('linear_resolved_sigma');
    const r = await classify(c);
    expect(r.bMethod).toBe('line-spacing');
    expect(r.confidence).not.toBe('low');
    expect(Math.abs(r.origin - c.upper.origin)).toBeLessThan(0.2);
  });

  it('gives a heavy prolate top’s parallel band B within 10 % though B′ is 0.7 % below B″', async () => {
    // With B′ = B″ the only envelope tried, B came out 20 % low (a CH3I ν3-like band at L = 1 cm).
    const c = byName('prolate_heavy_par');
    const r = await classify(c);
    expect(r.bMethod).toBe('envelope-fit');
    expect(Math.abs(r.B! / c.lower.B - 1)).toBeLessThan(0.1);
  });
});

/** Model file of a case started off the truth (origin by 0.09/L, B′ and B″ by +0.3 %, A′ or C′ by −0.3 %, ζ by +0.006). */
function startModel(c: Case): string {
  const fixed = (v: number) => ({ value: v, fixed: true });
  const jMax = independentJMax(c);
  const state = (s: Record<string, number>, upper: boolean) => {
    const out: Record<string, unknown> = { B: s.B * 1.003 };
    for (const k of ['DJ', 'DJK', 'DK']) if (s[k] !== undefined) out[k] = fixed(s[k]);
    const u = s.A !== undefined ? 'A' : s.C !== undefined ? 'C' : null;
    if (u) out[u] = upper ? s[u] * 0.997 : fixed(s[u]);
    if (upper) out.origin = s.origin + 0.09 / c.opd;
    if (upper && s.zeta !== undefined) out.zeta = s.zeta + 0.006;
    return out;
  };
  return JSON.stringify({
    shape: c.shape,
    band: c.band,
    lower: state(c.lower, false),
    upper: state(c.upper, true),
    temperature: c.temperature,
    jMax,
    kMax: c.shape === 'linear' ? 0 : jMax,
    spinWeights: c.spinWeights ?? [1],
    mass: c.mass,
  });
}

/** `contour` of a case from startModel, on its own trace or on the given text. */
async function contour(c: Case, traceText?: string) {
  const files = traceText === undefined ? traceFiles(c) : { [`${c.name}.csv`]: traceText };
  const r = await cliRunMemory(
    [
      'contour',
      '--model',
      'm.json',
      '--trace',
      `${c.name}.csv`,
      '--from',
      String(c.from),
      '--to',
      String(c.to),
      '--opd',
      String(c.opd),
      '--apodization',
      c.apodization,
    ],
    { ...files, 'm.json': startModel(c) },
  );
  expect(r.code, r.stderr).toBe(0);
  return JSON.parse(r.stdout) as {
    parameters: Record<string, { value: number; sigma: number; fixed: boolean }>;
    combinations: Record<string, { value: number; sigma: number }>;
    rms: number;
    warnings: string[];
  };
}

/** How many of its σ a fitted value lies from the truth. */
const sigmasOff = (q: { value: number; sigma: number }, truth: number) => Math.abs(q.value - truth) / q.sigma;

describe('contour on independently made traces', () => {
  // The targets of the unresolved-band work: the residual near the noise (here the fit's rms, which
  // holds the noise: at most 1.5× it), the origin and B′ − B″ within 4σ of the truth.
  it.each(['prolate_heavy_perp', 'prolate_heavy_par', 'linear_heavy_sigma', 'linear_light_pi', 'oblate_perp'].map((n) => [n]))(
    '%s: fits to the noise with origin and B′ − B″ within 4σ',
    async (name) => {
      const c = byName(name);
      const r = await contour(c);
      expect(r.rms / c.noiseSigmaAbsorbance).toBeLessThan(1.5);
      expect(sigmasOff(r.parameters['upper.origin'], c.upper.origin)).toBeLessThan(4);
      expect(sigmasOff(r.combinations["B'-B''"], c.upper.B - c.lower.B)).toBeLessThan(4);
      if (c.band === 'perpendicular' && c.shape !== 'linear') {
        const k = c.shape === 'prolate' ? "A'(1-zeta)-B'" : "C'(1-zeta)-B'";
        const u = c.upper.A ?? c.upper.C;
        expect(sigmasOff(r.combinations[k], u * (1 - c.upper.zeta) - c.upper.B)).toBeLessThan(4);
      }
    },
    60_000,
  );

  it('gets out of a stall from a unique constant a few tenths of a per cent off by starting again near C″', async () => {
    // random_114 (make_traces.py --random, kept): an oblate perpendicular band whose fit, started with
    // C′ 0.3 % low, stopped at 5.2× the noise with the origin 8σ off; run again from the best C′ of a
    // grid about C″ it reaches the noise (with C′ at the truth it did from the start).
    const c = byName('random_114');
    const r = await contour(c);
    expect(r.rms / c.noiseSigmaAbsorbance).toBeLessThan(1.5);
    expect(sigmasOff(r.parameters['upper.origin'], c.upper.origin)).toBeLessThan(4);
    expect(r.warnings.join(' ')).toMatch(/run again from the best C′ between C″ − 1.5 % and C″ \+ 1 % it ended lower/);
  }, 60_000);

  it('starts again near C″ also from just above the noise when the lines are weak, where the stall had the origin 11σ off', async () => {
    // random_87 (make_traces.py --random, kept): a weak oblate perpendicular band (peak τ 0.003) whose
    // fit, started with C′ 0.3 % low, stopped at 1.05× the noise with the origin 11σ and B 15σ off;
    // on weak lines the run from near C″ starts above 1.03× the noise, and it reaches the truth.
    const c = byName('random_87');
    const r = await contour(c);
    expect(r.rms / c.noiseSigmaAbsorbance).toBeLessThan(1.5);
    expect(sigmasOff(r.parameters['upper.origin'], c.upper.origin)).toBeLessThan(4);
    expect(sigmasOff(r.parameters['lower.B'], c.lower.B)).toBeLessThan(4);
    expect(sigmasOff(r.combinations["C'(1-zeta)-B'"], c.upper.C! * (1 - c.upper.zeta!) - c.upper.B)).toBeLessThan(4);
  }, 60_000);

  it('warns that B′ and B″ are not to be trusted on the optically thick perpendicular band, where they are off by far more than σ', async () => {
    // Peak τ 3 at the Doppler width: the fit reaches the noise (χ² rippled by overlaps of saturated
    // lines) with B″ several tens of σ off; the warning says so.
    const c = byName('prolate_heavy_perp_thick');
    const r = await contour(c);
    expect(r.rms / c.noiseSigmaAbsorbance).toBeLessThan(1.5);
    expect(sigmasOff(r.parameters['lower.B'], c.lower.B)).toBeGreaterThan(4);
    expect(r.warnings.join(' ')).toMatch(/Optically thick lines in a perpendicular band.*B′ and B″ themselves/s);
  }, 60_000);

  it('says when the fit leaves far more than the noise (a trace scaled up past what Doppler-limited lines can absorb)', async () => {
    // The heavy Σ–Σ trace with its absorbance multiplied by 5000 after the instrument: lines that
    // narrow would have to be optically thick to make it, and the saturated model cannot follow.
    const c = byName('linear_heavy_sigma');
    const text = readFileSync(new URL(`${c.name}.csv`, DIR), 'utf8')
      .trim()
      .split('\n')
      .map((line, i) => (i === 0 ? line : line.replace(/,(.*)$/, (_, v: string) => `,${(Number(v) * 5000).toExponential(6)}`)))
      .join('\n');
    const out = await contour(c, text);
    expect(out.warnings.join(' ')).toMatch(/The fit leaves [\d.]+× the noise/);
  }, 60_000);
});
