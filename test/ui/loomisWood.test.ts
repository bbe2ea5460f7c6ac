import { describe, expect, it } from 'vitest';
import { loomisWoodGrid } from '../../src/ui/plot/loomisWood';

/** Gaussian lines (FWHM 0.01 cm^-1) at given positions on a 0.002 cm^-1 grid. */
function trace(positions: number[], from = 990, to = 1010) {
  const n = Math.round((to - from) / 0.002) + 1;
  const x = new Float64Array(n);
  const a = new Float64Array(n);
  const s = 0.01 / 2.3548;
  for (let k = 0; k < n; k++) {
    x[k] = from + k * 0.002;
    for (const p of positions) a[k] += Math.exp(-0.5 * ((x[k] - p) / s) ** 2);
  }
  return { wavenumberCm1: x, absorbance: a };
}

describe('loomisWoodGrid', () => {
  it('refuses a non-positive half width and too few bins', () => {
    const t = trace([]);
    expect(() => loomisWoodGrid(t, [], 0, 10)).toThrow(/halfWidthCm1/);
    expect(() => loomisWoodGrid(t, [], 1, 1)).toThrow(/bins/);
  });

  it('returns no rows for no centres and symmetric bin offsets', () => {
    const g = loomisWoodGrid(trace([]), [], 0.5, 10);
    expect(g.z).toEqual([]);
    expect(g.offsetCm1[0]).toBeCloseTo(-0.45, 12);
    expect(g.offsetCm1[9]).toBeCloseTo(0.45, 12);
  });

  it('lines up a series whose lines sit at a constant offset from the predictions', () => {
    // Predictions 2 cm^-1 apart; the "observed" lines all 0.1 cm^-1 higher: the maximum of every
    // strip falls in the bin at +0.1 (bin width 0.02, so within ±0.01 of it).
    const preds = [995, 997, 999, 1001, 1003];
    const g = loomisWoodGrid(
      trace(preds.map((p) => p + 0.1)),
      preds.map((c, j) => ({ jLower: j + 3, centreCm1: c })),
      0.5,
      50,
    );
    expect(g.jLower).toEqual([3, 4, 5, 6, 7]);
    for (const row of g.z) {
      const best = row.reduce<number>((b, v, i) => ((v ?? -1) > (row[b] ?? -1) ? i : b), 0);
      expect(Math.abs(g.offsetCm1[best] - 0.1)).toBeLessThanOrEqual(0.01 + 1e-12);
      expect(row[best]).toBeGreaterThan(0.9);
    }
  });

  it('leaves bins outside the trace empty and sorts strips by J″', () => {
    const g = loomisWoodGrid(
      trace([1000]),
      [
        { jLower: 9, centreCm1: 1009.8 },
        { jLower: 2, centreCm1: 1000 },
      ],
      0.5,
      10,
    );
    expect(g.jLower).toEqual([2, 9]);
    expect(g.z[1].slice(-2)).toEqual([null, null]);
    expect(g.z[0].every((v) => v !== null)).toBe(true);
  });

  it('interpolates bins finer than the sampling', () => {
    const t = { wavenumberCm1: Float64Array.of(0, 1, 2), absorbance: Float64Array.of(0, 1, 2) };
    const g = loomisWoodGrid(t, [{ jLower: 0, centreCm1: 1 }], 0.5, 4);
    // Bin centres 0.625, 0.875 (interpolated on a = x), 1.125, 1.375; the bin holding x = 1 keeps a = 1.
    expect(g.z[0][0]).toBeCloseTo(0.625, 12);
    expect(g.z[0][1]).toBeCloseTo(0.875, 12);
    expect(g.z[0][2]).toBe(1);
    expect(g.z[0][3]).toBeCloseTo(1.375, 12);
  });
});
