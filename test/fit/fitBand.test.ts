import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fitKeyParse } from '../../src/fit/bandDesign';
import { fitBand } from '../../src/fit/fitBand';
import type { FitInput, FitOutcome, FitResult } from '../../src/fit/fitTypes';
import type { BandModel } from '../../src/physics/model';
import { transitionWavenumber } from '../../src/physics/termValues';
import { inventedModel, perturbed, simulatedLines } from './fitTestData';
import { w4Input } from './w4Timing';

function ok(outcome: FitOutcome): FitResult {
  if (!outcome.ok) throw new Error(`expected a fit, got ${outcome.error.kind}: ${outcome.error.message}`);
  return outcome.result;
}

/**
 * Round-trip check (STYLE §7): every floated constant within `k` reported σ of the truth and
 * σ_w within 4 standard deviations of 1 (sd of σ_w ≈ 1/sqrt(2(N − P)) for Gaussian noise).
 * k = 3.5: at 3σ a correct fit would miss on ~0.3% of constants, at 3.5σ on ~0.05%.
 */
function expectRecovered(result: FitResult, truth: BandModel, k = 3.5): void {
  expect(result.convergence).not.toBe('max-iterations');
  for (const key of result.floated) {
    const { side, name } = fitKeyParse(key)!;
    const p = result.parameters[key];
    expect(p.fixed).toBe(false);
    expect(p.sigma).toBeGreaterThan(0);
    expect(Math.abs(p.value - truth[side][name]) / p.sigma!, key).toBeLessThan(k);
  }
  const dof = result.nLines - result.nParameters;
  expect(Math.abs(result.sigmaW! - 1)).toBeLessThan(4 / Math.sqrt(2 * dof));
}

describe('fitBand: degenerate and invalid input', () => {
  const model = inventedModel('linear', 'parallel');
  const lines = simulatedLines(model, 20, 0.001, 1);
  const floated = ['upper.origin', 'upper.B', 'lower.B'];

  it('refuses an empty line list', () => {
    const o = fitBand({ model, floated, lines: [] });
    expect(o.ok).toBe(false);
    if (!o.ok) expect(o.error.kind).toBe('too-few-lines');
  });

  it('refuses when every line is excluded', () => {
    const o = fitBand({ model, floated, lines: lines.map((l) => ({ ...l, isExcluded: true })) });
    expect(!o.ok && o.error.kind).toBe('too-few-lines');
    expect(!o.ok && o.error.message).toMatch(/All 20 lines are excluded/);
  });

  it('refuses fewer lines than floated constants and says how many are missing', () => {
    const o = fitBand({ model, floated, lines: lines.slice(0, 2) });
    expect(!o.ok && o.error.kind).toBe('too-few-lines');
    expect(!o.ok && o.error.suggestion).toMatch(/at least 1 more line/);
  });

  it('names a NaN observed position', () => {
    const bad = lines.map((l, i) => (i === 4 ? { ...l, observedCm1: NaN } : l));
    const o = fitBand({ model, floated, lines: bad });
    expect(!o.ok && o.error.kind).toBe('bad-input');
    expect(!o.ok && o.error.message).toMatch(/lines\[4\]: observedCm1 must be a finite wavenumber in cm\^-1, got NaN/);
  });

  it('names a non-positive uncertainty', () => {
    const bad = lines.map((l, i) => (i === 2 ? { ...l, uncertaintyCm1: 0 } : l));
    expect(fitBand({ model, floated, lines: bad })).toMatchObject({
      ok: false,
      error: { kind: 'bad-input', message: expect.stringMatching(/lines\[2\]: uncertaintyCm1/) },
    });
  });

  it('refuses impossible quantum numbers with the reason', () => {
    const bad = lines.map((l, i) => (i === 3 ? { ...l, kUpper: 2, jUpper: 1 } : l));
    const o = fitBand({ model, floated, lines: bad });
    expect(!o.ok && o.error.message).toMatch(/lines\[3\]: K_up=2 exceeds J_up=1/);
  });

  it('refuses an unknown or repeated key and a NaN start value', () => {
    expect(fitBand({ model, floated: ['upper.A'], lines })).toMatchObject({
      ok: false,
      error: { kind: 'bad-input', parameters: ['upper.A'] },
    });
    expect(fitBand({ model, floated: ['upper.B', 'upper.B'], lines })).toMatchObject({
      ok: false,
      error: { message: expect.stringMatching(/twice/) },
    });
    const nanModel = { ...model, lower: { ...model.lower, B: NaN } };
    expect(fitBand({ model: nanModel, floated, lines })).toMatchObject({
      ok: false,
      error: { message: expect.stringMatching(/lower\.B must be a finite number/) },
    });
  });

  it('with nothing floated reports obs − calc of the given constants', () => {
    const r = ok(fitBand({ model, floated: [], lines }));
    expect(r.convergence).toBe('nothing-floated');
    r.lines.forEach((l, i) => {
      expect(l.calc).toBe(transitionWavenumber(model, lines[i].jUpper, lines[i].kUpper, lines[i].jLower, lines[i].kLower));
    });
  });

  it('with as many lines as constants reproduces them exactly and gives no σ', () => {
    const r = ok(fitBand({ model: perturbed(model, { '+upper.origin': 0.3 }), floated, lines: lines.slice(0, 3) }));
    expect(r.isExactlyDetermined).toBe(true);
    expect(r.sigmaW).toBeNull();
    expect(r.parameters['upper.origin'].sigma).toBeNull();
    expect(r.covariance).toEqual([]);
    expect(r.warnings.join(' ')).toMatch(/Exactly determined/);
    // Three lines, three linear constants: residuals at round-off (ν ~ 800 cm^-1, ε·ν ~ 1e-13).
    for (const l of r.lines) expect(Math.abs(l.obsMinusCalc)).toBeLessThan(1e-9);
  });
});

describe('fitBand: round trips with seeded noise', () => {
  it('recovers a prolate perpendicular band (lower A and DK fixed) from perturbed start values', () => {
    const truth = inventedModel('prolate', 'perpendicular');
    const lines = simulatedLines(truth, 800, 0.0005, 42);
    const start = perturbed(truth, {
      '+upper.origin': 0.05,
      'upper.B': 1.0005,
      'upper.A': 1.002,
      '+upper.zeta': 0.01,
      'lower.B': 0.9995,
      'upper.DJ': 1.2,
    });
    const floated = [
      'upper.origin',
      'upper.B',
      'upper.A',
      'upper.DJ',
      'upper.DJK',
      'upper.DK',
      'upper.zeta',
      'lower.B',
      'lower.DJ',
      'lower.DJK',
    ];
    const r = ok(fitBand({ model: start, floated, lines }));
    expectRecovered(r, truth);
    expect(r.parameters['lower.A']).toEqual({ value: truth.lower.A, sigma: 0, fixed: true });
    expect(r.outliers.length).toBeLessThanOrEqual(8); // 0.27% of 800 Gaussian lines expected beyond 3σ: ~2
  });

  it('recovers an oblate parallel band', () => {
    const truth = inventedModel('oblate', 'parallel');
    const lines = simulatedLines(truth, 500, 0.001, 7);
    const floated = ['upper.origin', 'upper.B', 'upper.C', 'upper.DJ', 'upper.DJK', 'upper.DK', 'lower.B', 'lower.DJ', 'lower.DJK'];
    const r = ok(fitBand({ model: perturbed(truth, { 'upper.B': 1.001, 'upper.C': 0.99 }), floated, lines }));
    expectRecovered(r, truth);
  });

  it('recovers a linear Σ–Σ band', () => {
    const truth = inventedModel('linear', 'parallel');
    const lines = simulatedLines(truth, 70, 0.0002, 3);
    const floated = ['upper.origin', 'upper.B', 'upper.DJ', 'lower.B', 'lower.DJ'];
    expectRecovered(ok(fitBand({ model: perturbed(truth, { '+upper.origin': -0.2 }), floated, lines })), truth);
  });

  it('recovers a linear Π–Σ band with its l-type doubling constant q', () => {
    const truth = inventedModel('linear', 'perpendicular');
    const lines = simulatedLines(truth, 120, 0.0005, 5);
    const floated = ['upper.origin', 'upper.B', 'upper.DJ', 'upper.q', 'lower.B', 'lower.DJ'];
    const r = ok(fitBand({ model: perturbed(truth, { 'upper.q': 1.5 }), floated, lines }));
    expectRecovered(r, truth);
  });

  it('recovers a prolate parallel band with sextic HJ in both states', () => {
    const truth = inventedModel('prolate', 'parallel', { lower: { HJ: 4e-13 }, upper: { HJ: 5e-13 }, jMax: 80 });
    const lines = simulatedLines(truth, 1500, 0.0005, 11);
    const floated = [
      'upper.origin',
      'upper.B',
      'upper.A',
      'upper.DJ',
      'upper.DJK',
      'upper.DK',
      'upper.HJ',
      'lower.B',
      'lower.DJ',
      'lower.DJK',
      'lower.HJ',
    ];
    expectRecovered(ok(fitBand({ model: truth, floated, lines })), truth);
  });

  it('reports standard errors that match the scatter of repeated fits (Monte Carlo, 200 seeds)', () => {
    // The reported σ should equal the spread of the estimates over independent noise draws.
    // With 200 draws the sample standard deviation has a relative standard error of 1/sqrt(2·199) ≈ 5%;
    // tolerance 15% (3 standard errors).
    const truth = inventedModel('linear', 'parallel');
    const floated = ['upper.origin', 'upper.B', 'lower.B', 'upper.DJ', 'lower.DJ'];
    const values: number[] = [];
    let sigma = 0;
    for (let seed = 1; seed <= 200; seed++) {
      const r = ok(fitBand({ model: truth, floated, lines: simulatedLines(truth, 40, 0.001, 1000 + seed) }));
      values.push(r.parameters['lower.B'].value);
      // σ is scaled by σ_w only when σ_w > 1 (fitResultBuild); dividing by max(1, σ_w) gives the
      // unscaled σ of the stated uncertainties, whose average over seeds the scatter must match.
      sigma += r.parameters['lower.B'].sigma! / Math.max(1, r.sigmaW!) / 200;
    }
    const mean = values.reduce((s, v) => s + v, 0) / values.length;
    const sd = Math.sqrt(values.reduce((s, v) => s + (v - mean) ** 2, 0) / (values.length - 1));
    expect(sd / sigma).toBeGreaterThan(0.85);
    expect(sd / sigma).toBeLessThan(1.15);
  });

  it('fits the 5,000 strongest lines of benchmark W4 with 13 floated constants', () => {
    // Workload W4 of bench/workloads.json: uniform noise of sd 0.0005 cm^-1 with the same
    // stated uncertainty, so σ_w ≈ 1. Correctness only; timing is in test/fit/w4Timing.ts.
    const workloads = JSON.parse(readFileSync(new URL('../../bench/workloads.json', import.meta.url), 'utf8'));
    const { input, truth } = w4Input(workloads);
    const r = ok(fitBand(input));
    expect(r.nLines).toBe(5000);
    expect(r.nParameters).toBe(13);
    expectRecovered(r, truth);
    expect(r.iterations).toBeLessThanOrEqual(6);
    expect(r.outliers).toEqual([]); // uniform noise never exceeds sqrt(3)·σ
  });
});

describe('fitBand: lines and hooks', () => {
  const truth = inventedModel('prolate', 'perpendicular');
  const floated = ['upper.origin', 'upper.B', 'upper.A', 'upper.zeta', 'upper.DJ', 'upper.DJK', 'lower.B', 'lower.DJ', 'lower.DJK'];

  it('flags a line shifted by 20σ as an outlier and names it', () => {
    const lines = simulatedLines(truth, 300, 0.001, 9);
    lines[17] = { ...lines[17], observedCm1: lines[17].observedCm1 + 0.02 };
    const r = ok(fitBand({ model: truth, floated, lines }));
    expect(r.lines[17].isOutlier).toBe(true);
    expect(r.outliers).toContain(17);
    expect(r.warnings.join(' ')).toMatch(/more than 3 times/);
  });

  it('leaves excluded lines out of the fit but still reports their obs − calc', () => {
    const lines = simulatedLines(truth, 300, 0.001, 9);
    const clean = ok(fitBand({ model: truth, floated, lines }));
    const withBad = [...lines, { ...lines[0], observedCm1: lines[0].observedCm1 + 5, isExcluded: true }];
    const r = ok(fitBand({ model: truth, floated, lines: withBad }));
    expect(r.nLines).toBe(300);
    expect(r.lines[300].isExcluded).toBe(true);
    expect(r.lines[300].isOutlier).toBe(false);
    expect(r.lines[300].obsMinusCalc).toBeCloseTo(5 + clean.lines[0].obsMinusCalc, 9);
    expect(r.parameters['upper.B'].value).toBe(clean.parameters['upper.B'].value);
  });

  it('gives the same constants whatever the order of the lines', () => {
    // Tolerance 1e-9 σ: only the summation order changes.
    const lines = simulatedLines(truth, 300, 0.001, 4);
    const a = ok(fitBand({ model: truth, floated, lines }));
    const b = ok(fitBand({ model: truth, floated, lines: [...lines].reverse() }));
    for (const key of floated) {
      expect(Math.abs(a.parameters[key].value - b.parameters[key].value)).toBeLessThan(1e-6 * a.parameters[key].sigma!);
    }
    expect(b.lines[0].obs).toBe(lines[299].observedCm1);
  });

  it('reports progress per iteration and can be cancelled', () => {
    const input: FitInput = { model: perturbed(truth, { '+upper.origin': 0.1 }), floated, lines: simulatedLines(truth, 200, 0.001, 2) };
    const seen: number[] = [];
    const r = ok(fitBand(input, { onProgress: (it, chi2) => (expect(chi2).toBeGreaterThanOrEqual(0), seen.push(it)) }));
    expect(seen).toEqual(Array.from({ length: r.iterations }, (_, i) => i + 1));
    expect(fitBand(input, { shouldCancel: () => true })).toMatchObject({ ok: false, error: { kind: 'cancelled' } });
  });

  it('returns a correlation matrix with unit diagonal and a covariance consistent with σ', () => {
    const r = ok(fitBand({ model: truth, floated, lines: simulatedLines(truth, 300, 0.001, 6) }));
    r.floated.forEach((key, a) => {
      expect(r.correlation[a][a]).toBe(1);
      expect(Math.sqrt(r.covariance[a][a])).toBeCloseTo(r.parameters[key].sigma!, 15);
      r.floated.forEach((_, b) => expect(Math.abs(r.correlation[a][b])).toBeLessThanOrEqual(1 + 1e-12));
    });
    expect(r.conditionNumber).toBeGreaterThan(1);
  });
});
