import { describe, expect, it } from 'vitest';
import { traceGenerate } from '../fit/contourTraces';
import { cliRunMemory } from './cliRunMemory';

/** An in-memory CliIo over the given files. */
const run = (args: string[], files: Record<string, string>) => cliRunMemory(args, files);

// A heavy prolate perpendicular band (invented constants), weak limit, 1 % noise, L = 1 cm.
const spec = {
  shape: 'prolate',
  band: 'perpendicular',
  B: 0.25,
  unique: 5.1,
  zeta: 0.25,
  temperatureK: 296,
  opdCm: 1,
  apodization: 'triangular',
  origin: 1250,
  noiseRel: 0.01,
  seed: 3,
  peakAbsorbance: 2e-6,
} as const;
const c = traceGenerate(spec);
const traceCsv = 'wavenumber,absorbance\n' + Array.from(c.x, (x, i) => `${x.toFixed(6)},${c.noisy[i].toExponential(9)}`).join('\n') + '\n';
const model = {
  shape: 'prolate',
  band: 'perpendicular',
  lower: { B: 0.2525, A: { value: 5.1, fixed: true } },
  upper: { origin: 1250.05, B: 0.2517, A: 5.09, zeta: 0.252 },
  temperature: 296,
  jMax: c.model.jMax,
  kMax: c.model.kMax,
  spinWeights: [1],
  mass: 50,
};
const files = { 'm.json': JSON.stringify(model), 't.csv': traceCsv };
const region = ['--from', c.fromCm1.toFixed(3), '--to', c.toCm1.toFixed(3)];

describe('contour command', () => {
  it('prints the contract JSON and recovers the Q spacing combination within 4σ', async () => {
    const r = await run(
      ['contour', '--model', 'm.json', '--trace', 't.csv', ...region, '--opd', '1', '--apodization', 'triangular'],
      files,
    );
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    for (const key of ['parameters', 'rms', 'nPoints', 'scale', 'baseline', 'warnings']) expect(j).toHaveProperty(key);
    expect(j.parameters['upper.origin'].fixed).toBe(false);
    expect(j.parameters['lower.A']).toEqual({ value: 5.1, sigma: 0, fixed: true });
    const up = c.model.upper;
    const q = j.combinations["A'(1-zeta)-B'"];
    expect(Math.abs(q.value - (up.A * (1 - up.zeta) - up.B))).toBeLessThan(4 * q.sigma);
    expect(j.nPoints).toBe(c.x.length);
  });

  it('refuses bad input with one line on stderr', async () => {
    const cases: [string[], RegExp][] = [
      [['--opd', '0'], /--opd must be a maximum optical path difference > 0 cm/],
      [['--opd', '1', '--apodization', 'cosine'], /--apodization must be one of/],
      [['--opd', '1', '--float', 'upper.Q'], /cannot float 'upper.Q'/],
      [['--opd', '1', '--lorentz', '-1'], /--lorentz must be a half width >= 0/],
    ];
    for (const [extra, re] of cases) {
      const r = await run(['contour', '--model', 'm.json', '--trace', 't.csv', ...region, ...extra], files);
      expect(r.code).not.toBe(0);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
      expect(r.stderr).toMatch(re);
    }
    const outside = await run(['contour', '--model', 'm.json', '--trace', 't.csv', '--from', '10', '--to', '20', '--opd', '1'], files);
    expect(outside.stderr).toMatch(/lies outside the trace/);
    const missing = await run(['contour', '--model', 'm.json', '--trace', 'nope.csv', ...region, '--opd', '1'], files);
    expect(missing.stderr).toMatch(/cannot read 'nope.csv'/);
  });
});

describe('classify command', () => {
  it('prints the contract JSON for a Q-series', async () => {
    const r = await run(['classify', '--trace', 't.csv', ...region, '--temperature', '296'], files);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.profile).toBe('Q-series');
    expect(j.type).toBe('symmetric-top-perpendicular');
    // 2[A′(1−ζ) − B′] (Herzberg II ch. IV) within the 3 % target.
    const up = c.model.upper;
    expect(Math.abs(j.qSpacing / (2 * (up.A * (1 - up.zeta) - up.B)) - 1)).toBeLessThan(0.03);
    expect(typeof j.evidence).toBe('string');
    expect(j).toHaveProperty('origin');
    expect(j).toHaveProperty('B');
  });

  it('adds qSeriesEnvelope with --q-envelope and keeps every other field as without it', async () => {
    const plain = JSON.parse((await run(['classify', '--trace', 't.csv', ...region, '--temperature', '296'], files)).stdout);
    const r = await run(['classify', '--trace', 't.csv', ...region, '--temperature', '296', '--q-envelope'], files);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(plain).not.toHaveProperty('qSeriesEnvelope');
    for (const key of Object.keys(plain)) expect(j, key).toHaveProperty(key);
    expect(j.profile).toBe(plain.profile);
    expect(j.qSpacing).toBe(plain.qSpacing);
    const e = j.qSeriesEnvelope;
    expect(['prolate', 'oblate']).toContain(e.shape);
    // The band's B = 0.25 cm^-1 (B′ = 0.997 B″ here, unlike the fit's rigid model) inside the range
    // of B that fits, and A − B = 4.85 cm^-1 inside its range.
    expect(e.bLow).toBeLessThanOrEqual(0.25);
    expect(e.bHigh).toBeGreaterThanOrEqual(0.25);
    expect(e.uniqueMinusBLow).toBeLessThanOrEqual(4.85);
    expect(e.uniqueMinusBHigh).toBeGreaterThanOrEqual(4.85);
    // B is given from it only with a range within a factor 1.5, then never called determined beyond ±10 %.
    if (j.bMethod === 'envelope-fit') expect(j.bHigh / j.bLow).toBeLessThanOrEqual(1.5 * 1.11);
  }, 60_000);

  it('adds qSeriesContour with --opd L --apodization NAME, B from it within 10 % (B″ = 0.25 cm^-1 generated), every other field kept', async () => {
    const plain = JSON.parse((await run(['classify', '--trace', 't.csv', ...region, '--temperature', '296'], files)).stdout);
    const r = await run(
      ['classify', '--trace', 't.csv', ...region, '--temperature', '296', '--opd', '1', '--apodization', 'triangular'],
      files,
    );
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(plain).not.toHaveProperty('qSeriesContour');
    for (const key of Object.keys(plain)) expect(j, key).toHaveProperty(key);
    expect(j.profile).toBe(plain.profile);
    const k = j.qSeriesContour;
    expect(typeof k.determined).toBe('boolean');
    expect(typeof k.whyNot).toBe('string');
    // Where B is given from the contour it is within 10 % of the generated 0.25 cm^-1, and a
    // determined B has the truth inside B ± 2σ.
    if (j.B !== null) expect(Math.abs(j.B / 0.25 - 1)).toBeLessThan(0.1);
    if (j.bDetermined) {
      expect(j.bLow).toBeLessThanOrEqual(0.25);
      expect(j.bHigh).toBeGreaterThanOrEqual(0.25);
    }
  }, 600_000);

  it('refuses --opd 0 and --apodization without --opd, saying which', async () => {
    const a = await run(['classify', '--trace', 't.csv', ...region, '--opd', '0'], files);
    expect(a.code).toBe(1);
    expect(a.stderr).toMatch(/--opd must be a maximum optical path difference > 0 cm, got 0/);
    const b = await run(['classify', '--trace', 't.csv', ...region, '--apodization', 'boxcar'], files);
    expect(b.stderr).toMatch(/--apodization needs --opd/);
    const d = await run(['classify', '--trace', 't.csv', ...region, '--opd', '1', '--apodization', 'cosine'], files);
    expect(d.stderr).toMatch(/--apodization must be one of/);
  });

  it('refuses --spin-weights without --opd, and weights that are not one to three numbers ≥ 0, saying which', async () => {
    const a = await run(['classify', '--trace', 't.csv', ...region, '--spin-weights', '4,2,2'], files);
    expect(a.code).toBe(1);
    expect(a.stderr).toMatch(/--spin-weights needs --opd/);
    for (const w of ['4,2,x', '1,2,3,4', '0,0,0', '-1,2,2']) {
      const b = await run(['classify', '--trace', 't.csv', ...region, '--opd', '1', '--spin-weights', w], files);
      expect(b.code, w).toBe(1);
      expect(b.stderr, w).toMatch(new RegExp(`--spin-weights must be one to three numbers ≥ 0 .* got '${w}'`));
      expect(b.stderr.trim().split('\n'), w).toHaveLength(1);
    }
  });

  it('refuses an inverted region and a bad temperature', async () => {
    const a = await run(['classify', '--trace', 't.csv', '--from', '1300', '--to', '1200'], files);
    expect(a.code).toBe(1);
    expect(a.stderr).toMatch(/^classify: --to must be greater than --from/);
    const b = await run(['classify', '--trace', 't.csv', ...region, '--temperature', '-5'], files);
    expect(b.stderr).toMatch(/--temperature must be > 0 K/);
  });
});
