import { describe, expect, it } from 'vitest';
import { Matrix, solve } from 'ml-matrix';
import { calibrationFit, type CalibrationPair } from '../../src/analysis/calibrationFit';
import { randomNormal, randomSeeded } from './syntheticTrace';

/** Reference lines between 1000 and 3000 cm^-1 observed on an axis with scale error δ and offset. */
function pairs(seed: number, n: number, delta: number, offset: number, noise: number, withSigma: boolean): CalibrationPair[] {
  const rand = randomSeeded(seed);
  const out: CalibrationPair[] = [];
  for (let i = 0; i < n; i++) {
    const ref = 1000 + 2000 * rand();
    // ν_ref = (1 + δ) ν_obs + offset, so ν_obs = (ν_ref − offset)/(1 + δ), plus the measuring noise.
    const obs = (ref - offset) / (1 + delta) + noise * randomNormal(rand);
    out.push(withSigma ? { observedCm1: obs, referenceCm1: ref, referenceSigmaCm1: noise } : { observedCm1: obs, referenceCm1: ref });
  }
  return out;
}

describe('calibrationFit: refusals', () => {
  it('needs at least one pair, or two with an offset', () => {
    expect(() => calibrationFit([], { withOffset: false })).toThrow(/at least 1 pair.*got 0/);
    expect(() => calibrationFit([{ observedCm1: 1000, referenceCm1: 1000.001 }], { withOffset: true })).toThrow(/at least 2 pair.*got 1/);
  });

  it('refuses NaN, non-positive wavenumbers and bad sigmas, naming the pair and field', () => {
    expect(() => calibrationFit([{ observedCm1: NaN, referenceCm1: 1 }], { withOffset: false })).toThrow(
      /pairs\[0\]\.observedCm1 .* got NaN/,
    );
    expect(() => calibrationFit([{ observedCm1: 1, referenceCm1: -2 }], { withOffset: false })).toThrow(/pairs\[0\]\.referenceCm1/);
    expect(() => calibrationFit([{ observedCm1: 1, referenceCm1: 1, referenceSigmaCm1: 0 }], { withOffset: false })).toThrow(
      /referenceSigmaCm1 must be .* got 0/,
    );
    const mixed = [
      { observedCm1: 1000, referenceCm1: 1000, referenceSigmaCm1: 1e-4 },
      { observedCm1: 2000, referenceCm1: 2000 },
    ];
    expect(() => calibrationFit(mixed, { withOffset: false })).toThrow(/given for 1 of 2 pairs/);
  });

  it('refuses an offset fit when every observed wavenumber is the same', () => {
    const same = [
      { observedCm1: 1500, referenceCm1: 1500.002 },
      { observedCm1: 1500, referenceCm1: 1500.004 },
    ];
    expect(() => calibrationFit(same, { withOffset: true })).toThrow(/identical \(1500 cm\^-1\)/);
    // Without an offset the same points are a fine (over-determined) δ fit.
    expect(calibrationFit(same, { withOffset: false }).n).toBe(2);
  });
});

describe('calibrationFit: exactly determined', () => {
  it('gives δ = ν_ref/ν_obs − 1 from one pair and no σ', () => {
    const r = calibrationFit([{ observedCm1: 2000, referenceCm1: 2000.006 }], { withOffset: false });
    // 0.006/2000 = 3e-6; round-off 1e-16 relative of 2000 → 1e-13 absolute in δ·ν; tolerance 1e-15 on δ.
    expect(Math.abs(r.delta - 3e-6)).toBeLessThan(1e-15);
    expect(r.isExactlyDetermined).toBe(true);
    expect(r.deltaSigma).toBeNull();
    expect(r.sigmaW).toBeNull();
    expect(r.offsetCm1).toBe(0);
  });

  it('passes through two pairs exactly with an offset', () => {
    const r = calibrationFit(
      [
        { observedCm1: 1000, referenceCm1: 1000.004 },
        { observedCm1: 3000, referenceCm1: 3000.01 },
      ],
      { withOffset: true },
    );
    // Slope (3000.01 − 1000.004)/2000 = 1.000003, offset 1000.004 − 1.000003·1000 = 0.001.
    expect(Math.abs(r.delta - 3e-6)).toBeLessThan(1e-13);
    expect(Math.abs(r.offsetCm1 - 0.001)).toBeLessThan(1e-10);
    expect(r.isExactlyDetermined).toBe(true);
    expect(r.offsetSigmaCm1).toBeNull();
    for (const v of r.residualsCm1) expect(Math.abs(v)).toBeLessThan(1e-10);
  });
});

describe('calibrationFit: recovering a known δ', () => {
  it('recovers δ = 3e-6 within its reported σ, and the σ matches the noise', () => {
    // 40 lines, 2e-4 cm^-1 noise. Expected σ_δ = σ / √Σν² ≈ 2e-4 / (√40 · 2160) ≈ 1.5e-8 (OLS through
    // the origin, Bevington & Robinson 2003 ch. 6). Check |δ − 3e-6| < 4σ_δ and σ_δ within 25 % of that
    // expectation (σ_w from 39 dof has ≈ 11 % standard error).
    const ps = pairs(1, 40, 3e-6, 0, 2e-4, false);
    const r = calibrationFit(ps, { withOffset: false });
    const sumNu2 = ps.reduce((s, p) => s + p.observedCm1 ** 2, 0);
    const expected = 2e-4 / Math.sqrt(sumNu2);
    expect(r.deltaSigma).not.toBeNull();
    expect(Math.abs(r.delta - 3e-6)).toBeLessThan(4 * (r.deltaSigma as number));
    expect((r.deltaSigma as number) / expected).toBeGreaterThan(0.75);
    expect((r.deltaSigma as number) / expected).toBeLessThan(1.25);
    expect((r.sigmaW as number) / 2e-4).toBeGreaterThan(0.75);
    expect((r.sigmaW as number) / 2e-4).toBeLessThan(1.25);
    expect(r.rmsCm1).toBeLessThan(3e-4);
  });

  it('has σ_δ and σ_offset that match the scatter over 300 seeded repeats (pull sd near 1)', () => {
    // Pull = (estimate − truth)/reported σ. With σ scaled by σ_w (8 dof) the pulls follow Student's t
    // with 8 dof, sd √(8/6) = 1.155 (Student 1908); 300 repeats give ±4 % on the sd; tolerance ±12 %.
    const pullsDelta: number[] = [];
    const pullsOffset: number[] = [];
    for (let seed = 1; seed <= 300; seed++) {
      const r = calibrationFit(pairs(seed, 10, 3e-6, 0.002, 3e-4, true), { withOffset: true });
      pullsDelta.push((r.delta - 3e-6) / (r.deltaSigma as number));
      pullsOffset.push((r.offsetCm1 - 0.002) / (r.offsetSigmaCm1 as number));
    }
    const sd = (a: number[]) => Math.sqrt(a.reduce((s, v) => s + v * v, 0) / a.length);
    const t8 = Math.sqrt(8 / 6);
    expect(sd(pullsDelta) / t8).toBeGreaterThan(0.88);
    expect(sd(pullsDelta) / t8).toBeLessThan(1.12);
    expect(sd(pullsOffset) / t8).toBeGreaterThan(0.88);
    expect(sd(pullsOffset) / t8).toBeLessThan(1.12);
  });

  it('agrees with a generic weighted least-squares solve by ml-matrix, including the covariance', () => {
    // Normal equations (AᵀWA) p = AᵀW b with A = [ν_obs, 1], b = ν_ref − ν_obs, dense solve in
    // ml-matrix; covariance σ_w² (AᵀWA)⁻¹. Tolerance 1e-6 relative (the dense route loses ~1e-10 to
    // the ν² ~ 1e7 conditioning that the centred form avoids).
    const rand = randomSeeded(77);
    const ps = pairs(5, 25, -7e-6, 0.004, 1e-4, false).map((p) => ({ ...p, referenceSigmaCm1: 5e-5 + 2e-4 * rand() }));
    const r = calibrationFit(ps, { withOffset: true });
    const a = new Matrix(ps.map((p) => [p.observedCm1, 1]));
    const w = ps.map((p) => 1 / (p.referenceSigmaCm1 as number) ** 2);
    const b = ps.map((p) => p.referenceCm1 - p.observedCm1);
    const ata = new Matrix(2, 2);
    const atb = new Matrix(2, 1);
    for (let i = 0; i < ps.length; i++) {
      for (let j = 0; j < 2; j++) {
        atb.set(j, 0, atb.get(j, 0) + w[i] * a.get(i, j) * b[i]);
        for (let k = 0; k < 2; k++) ata.set(j, k, ata.get(j, k) + w[i] * a.get(i, j) * a.get(i, k));
      }
    }
    const sol = solve(ata, atb);
    expect(Math.abs(r.delta / sol.get(0, 0) - 1)).toBeLessThan(1e-6);
    expect(Math.abs(r.offsetCm1 - sol.get(1, 0))).toBeLessThan(1e-6 * Math.abs(sol.get(1, 0)) + 1e-9);
    let chi2 = 0;
    for (let i = 0; i < ps.length; i++) chi2 += w[i] * (b[i] - sol.get(0, 0) * ps[i].observedCm1 - sol.get(1, 0)) ** 2;
    const s2 = chi2 / (ps.length - 2);
    const cov = solve(ata, Matrix.eye(2, 2)).mul(s2);
    expect(Math.abs((r.deltaSigma as number) / Math.sqrt(cov.get(0, 0)) - 1)).toBeLessThan(1e-6);
    expect(Math.abs((r.offsetSigmaCm1 as number) / Math.sqrt(cov.get(1, 1)) - 1)).toBeLessThan(1e-6);
    const corr = cov.get(0, 1) / Math.sqrt(cov.get(0, 0) * cov.get(1, 1));
    expect(Math.abs((r.deltaOffsetCorrelation as number) - corr)).toBeLessThan(1e-6);
  });
});
