import { describe, expect, it } from 'vitest';
import type { LineList } from '../../src/physics/model';
import { candidateHeightScaleGuess, candidatesRank, quantaKey } from '../../src/state/candidateRank';

/** A hand-made line list: positions (cm^-1) and intensities chosen to test the ordering. */
function lines(pos: number[], inten: number[]): LineList {
  const n = pos.length;
  const i32 = (f: (i: number) => number) => Int32Array.from({ length: n }, (_, i) => f(i));
  return {
    count: n,
    jUpper: i32((i) => i + 1),
    kUpper: i32(() => 1),
    jLower: i32((i) => i),
    kLower: i32(() => 0),
    deltaK: Int8Array.from({ length: n }, () => 1),
    deltaJ: Int8Array.from({ length: n }, () => 1),
    wavenumberCm1: Float64Array.from(pos),
    intensity: Float64Array.from(inten),
    eLowerCm1: new Float64Array(n),
    honlLondon: new Float64Array(n),
  };
}

describe('candidatesRank', () => {
  it('refuses a non-finite peak and a non-positive window, naming the function', () => {
    const l = lines([1], [1]);
    expect(() => candidatesRank(l, NaN, { windowCm1: 1, shape: 'prolate' })).toThrow(/candidatesRank: peakCm1/);
    expect(() => candidatesRank(l, 1, { windowCm1: 0, shape: 'prolate' })).toThrow(/windowCm1/);
  });

  it('returns nothing for an empty line list', () => {
    expect(candidatesRank(lines([], []), 100, { windowCm1: 1, shape: 'prolate' })).toEqual([]);
  });

  it('orders by distance without a fit and puts much weaker lines last', () => {
    // Peak at 100.00: lines at +0.01 (weak, 0.5 % of the strongest), −0.02, +0.05.
    const l = lines([100.01, 99.98, 100.05], [0.002, 0.4, 0.3]);
    const c = candidatesRank(l, 100, { windowCm1: 0.1, shape: 'prolate' });
    expect(c.map((x) => x.lineIndex)).toEqual([1, 2, 0]);
    expect(c[2].isWeak).toBe(true);
    expect(c[0].distanceCm1).toBeCloseTo(0.02, 12);
    expect(c[0].distanceSigma).toBeNull();
    expect(c[0].labelAscii).toBe('rR0(1)');
  });

  it('orders by distance in σ of the prediction once a fit gives σ', () => {
    // Line 0 is nearer in cm^-1 but predicted to 0.001 (10 σ away); line 1 is 0.02 away with σ 0.01 (2 σ).
    const l = lines([100.01, 99.98], [0.5, 0.5]);
    const sig = [0.001, 0.01];
    const c = candidatesRank(l, 100, { windowCm1: 0.1, shape: 'prolate', predictionSigmaCm1: (i) => sig[i] });
    expect(c.map((x) => x.lineIndex)).toEqual([1, 0]);
    // σ combines prediction and peak in quadrature: √(0.01² + 0.005²).
    const c2 = candidatesRank(l, 100, { windowCm1: 0.1, shape: 'prolate', predictionSigmaCm1: (i) => sig[i], peakSigmaCm1: 0.005 });
    expect(c2[0].distanceSigma).toBeCloseTo(0.02 / Math.hypot(0.01, 0.005), 10);
  });

  it('fills up to minCount with the nearest lines outside the window and caps at maxCount', () => {
    const l = lines([90, 95, 110, 120], [1, 1, 1, 1]);
    const c = candidatesRank(l, 100, { windowCm1: 1, minCount: 2, shape: 'prolate' });
    expect(c.map((x) => x.predictedCm1)).toEqual([95, 90]);
    const many = lines(
      Array.from({ length: 30 }, (_, i) => 100 + i * 0.001),
      Array(30).fill(1),
    );
    expect(candidatesRank(many, 100, { windowCm1: 1, shape: 'prolate' }).length).toBe(30);
    expect(candidatesRank(many, 100, { windowCm1: 1, shape: 'prolate', maxCount: 9 }).length).toBe(9);
  });

  it('widens the window to 5σ of a poorly predicted line, so the right line is not cut off', () => {
    // Peak at 100.00; the line at 100.40 lies outside the ±0.1 base window but its prediction σ is
    // 0.1 cm^-1 (4σ away); the line at 100.30 has σ 0.01 (30σ) and stays out.
    const l = lines([100.4, 100.3], [1, 1]);
    const sig = [0.1, 0.01];
    const c = candidatesRank(l, 100, { windowCm1: 0.1, minCount: 0, shape: 'prolate', predictionSigmaCm1: (i) => sig[i] });
    expect(c.map((x) => x.lineIndex)).toEqual([0]);
    expect(c[0].distanceSigma).toBeCloseTo(4, 12);
  });

  it('ranks by position and intensity together once the height scale is known', () => {
    // Peak 100.000 of height 0.5; scale 1 absorbance per unit intensity. Line 0: 0.5σ off but
    // predicted 50× too weak (intensity 0.01); line 1: 1.5σ off with the right height (0.5).
    // Scores: line 0: 0.25 + (3 ln 50 / ln 5)² ≈ 52.8; line 1: 2.25 + 0 = 2.25, so line 1 first.
    const l = lines([100.005, 99.985], [0.01, 0.5]);
    const c = candidatesRank(l, 100, {
      windowCm1: 0.1,
      shape: 'prolate',
      predictionSigmaCm1: () => 0.01,
      peakHeight: 0.5,
      heightScale: 1,
    });
    expect(c.map((x) => x.lineIndex)).toEqual([1, 0]);
    expect(c[0].heightRatio).toBeCloseTo(1, 12);
    expect(c[1].heightRatio).toBeCloseTo(50, 12);
    // Offered lines only.
    expect(candidatesRank(l, 100, { windowCm1: 0.1, shape: 'prolate', isOffered: (i) => i === 0 }).map((x) => x.lineIndex)).toEqual([0]);
  });

  it('marks lines already assigned', () => {
    const l = lines([100, 100.1], [1, 1]);
    const assigned = new Set([quantaKey({ jUpper: 2, kUpper: 1, jLower: 1, kLower: 0 })]);
    const c = candidatesRank(l, 100.09, { windowCm1: 1, shape: 'prolate', assignedKeys: assigned });
    expect(c.find((x) => x.lineIndex === 1)!.isAssigned).toBe(true);
    expect(c.find((x) => x.lineIndex === 0)!.isAssigned).toBe(false);
  });
});

describe('candidateHeightScaleGuess', () => {
  // Its definition: the median over k = 1…30 of (k-th highest positive height) / (k-th strongest positive
  // intensity), written here with full sorts; the function keeps only the 30 largest in one pass.
  const byDefinition = (heights: number[], intensities: number[]) => {
    const h = heights.filter((v) => v > 0).sort((a, b) => b - a);
    const l = intensities.filter((v) => v > 0).sort((a, b) => b - a);
    const n = Math.min(30, h.length, l.length);
    if (n === 0) return NaN;
    const r = Array.from({ length: n }, (_, k) => h[k] / l[k]).sort((a, b) => a - b);
    return n % 2 ? r[n >> 1] : 0.5 * (r[n / 2 - 1] + r[n / 2]);
  };

  it('equals the full-sort definition on random lists with ties, zeros, negatives and fewer than 30 values', () => {
    let seed = 7;
    const rand = () => ((seed = (seed * 16807) % 2147483647) - 1) / 2147483646;
    for (let t = 0; t < 500; t++) {
      const heights = Array.from({ length: Math.floor(rand() * 90) }, () => (rand() < 0.2 ? -rand() : rand() < 0.1 ? 0.5 : rand()));
      const intensities = Array.from({ length: Math.floor(rand() * 90) }, () => (rand() < 0.2 ? 0 : rand() < 0.1 ? 0.25 : rand()));
      expect(candidateHeightScaleGuess(heights, intensities)).toEqual(byDefinition(heights, intensities));
    }
    expect(candidateHeightScaleGuess(Float64Array.of(3, 1, 2), Float64Array.of(0, 0))).toBeNaN();
  });
});
