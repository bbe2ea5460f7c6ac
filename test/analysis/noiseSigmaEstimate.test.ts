import { describe, expect, it } from 'vitest';
import { noiseSigmaEstimate } from '../../src/analysis/noiseSigmaEstimate';
import { axisUniform, randomSeeded, syntheticAbsorbance } from './syntheticTrace';

describe('noiseSigmaEstimate', () => {
  it('returns 0 for an empty trace, one point and two points', () => {
    expect(noiseSigmaEstimate(new Float64Array(0), new Float64Array(0))).toBe(0);
    expect(noiseSigmaEstimate(Float64Array.of(1), Float64Array.of(2))).toBe(0);
    expect(noiseSigmaEstimate(Float64Array.of(1, 2), Float64Array.of(2, 5))).toBe(0);
  });

  it('returns 0 for a flat trace and for any straight line, even on an uneven axis', () => {
    // Gasser et al. (1986): the pseudo-residual is the misfit to the chord, 0 for a linear signal.
    const x = Float64Array.of(1000, 1000.1, 1000.35, 1000.4, 1001, 1001.7);
    expect(noiseSigmaEstimate(x, new Float64Array(6).fill(0.3))).toBe(0);
    const line = x.map((v) => 0.2 + 1e-3 * (v - 1000));
    // Round-off only: values ~0.2, a few ulp ~1e-16.
    expect(noiseSigmaEstimate(x, line)).toBeLessThan(1e-15);
  });

  it('rejects NaN, unequal lengths and a non-ascending axis, naming the field', () => {
    expect(() => noiseSigmaEstimate(Float64Array.of(1, 2, 3), Float64Array.of(0, NaN, 0))).toThrow(/absorbance\[1\]/);
    expect(() => noiseSigmaEstimate(Float64Array.of(1, 2, 3), Float64Array.of(0, 0))).toThrow(/absorbance has 2/);
    expect(() => noiseSigmaEstimate(Float64Array.of(1, 3, 2), Float64Array.of(0, 0, 0))).toThrow(/ascending/);
  });

  it('recovers the σ of seeded white noise on an even axis', () => {
    // MAD of N = 1e5 correlated pseudo-residuals: relative standard error ≈ 1.1/√N·(a few) < 1 %
    // (Hampel 1974 for the MAD's efficiency); tolerance 3 %.
    const x = axisUniform(1000, 1100, 100001);
    const y = syntheticAbsorbance(x, [], 2.5e-3, 42);
    expect(noiseSigmaEstimate(x, y) / 2.5e-3).toBeGreaterThan(0.97);
    expect(noiseSigmaEstimate(x, y) / 2.5e-3).toBeLessThan(1.03);
  });

  it('recovers σ on a strongly uneven axis (spacings varying by 10×)', () => {
    // The weights a_i, b_i make Var(e_i) = σ²(a² + b² + 1) for any spacing (Gasser et al. 1986, eq. 3).
    const rand = randomSeeded(9);
    const n = 50001;
    const x = new Float64Array(n);
    x[0] = 1000;
    for (let i = 1; i < n; i++) x[i] = x[i - 1] + 0.001 * (0.2 + 1.8 * rand());
    const y = syntheticAbsorbance(x, [], 1e-3, 5, (v) => 0.1 + 0.05 * Math.sin(v));
    const ratio = noiseSigmaEstimate(x, y) / 1e-3;
    expect(ratio).toBeGreaterThan(0.96);
    expect(ratio).toBeLessThan(1.04);
  });

  it('is barely moved by well-sampled lines covering a fifth of the trace', () => {
    // Lines of FWHM 0.02 cm^-1 sampled at 20 points per FWHM: their second differences are a few
    // per cent of σ; the median ignores the flanks. Tolerance 5 %.
    const x = axisUniform(1000, 1010, 10001);
    const lines = [];
    for (let c = 1000.05; c < 1010; c += 0.1) lines.push({ centreCm1: c, heightAbs: 0.05, fwhmCm1: 0.02, shape: 'gaussian' as const });
    const y = syntheticAbsorbance(x, lines, 1e-3, 77);
    const ratio = noiseSigmaEstimate(x, y) / 1e-3;
    expect(ratio).toBeGreaterThan(0.95);
    expect(ratio).toBeLessThan(1.05);
  });

  it('leaves out masked samples', () => {
    const x = axisUniform(0, 1, 2001);
    const y = syntheticAbsorbance(x, [], 1e-3, 3);
    // Spikes on 60 % of the samples defeat the median; masked out, they do not matter.
    const spiky = Float64Array.from(y);
    const mask = new Uint8Array(2001);
    for (let i = 800; i < 2001; i++) {
      spiky[i] += (i % 2) * 5;
      mask[i] = 1;
    }
    const expected = noiseSigmaEstimate(x.subarray(0, 800), y.subarray(0, 800));
    // The same pseudo-residuals (i = 1…798) either way, so exactly equal.
    expect(noiseSigmaEstimate(x, spiky, mask)).toBe(expected);
    expect(noiseSigmaEstimate(x, spiky)).toBeGreaterThan(10 * expected);
  });
});
