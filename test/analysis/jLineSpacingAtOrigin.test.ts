import { describe, expect, it } from 'vitest';
import { jLineSpacingAtOrigin, type Peak } from '../../src/analysis/bandShapeClassify';

// Lines of a Σ–Σ band with B′ ≠ B″: P(J) = ν0 − (B′ + B″)J + (B′ − B″)J², R(J) = ν0 + 2B′ + (3B′ − B″)J +
// (B′ − B″)J² (Herzberg II (1945) ch. IV); the spacing at the origin is dν/dm = B′ + B″ at m = 0.
const ORIGIN = 2000;
const B_LOWER = 1.0;
const B_UPPER = 0.99;
const peakAt = (x: number, index: number): Peak => ({ x, height: 1, prominence: 1, index });
function bandPeaks(): Peak[] {
  const xs: number[] = [];
  for (let J = 1; J <= 25; J++) xs.push(ORIGIN - (B_UPPER + B_LOWER) * J + (B_UPPER - B_LOWER) * J * J);
  for (let J = 0; J <= 25; J++) xs.push(ORIGIN + 2 * B_UPPER + (3 * B_UPPER - B_LOWER) * J + (B_UPPER - B_LOWER) * J * J);
  return xs.sort((a, b) => a - b).map(peakAt);
}

describe('jLineSpacingAtOrigin', () => {
  it('reads B′ + B″ at the origin from lines whose spacing drifts, to first order in B′ − B″', () => {
    // The straight line in ν − ν0 is first order: with B′ − B″ = −1 % of B″ and J to 25 it reads 1.2 % low.
    const r = jLineSpacingAtOrigin(bandPeaks(), 2, ORIGIN)!;
    expect(r.bothSides).toBe(true);
    expect(Math.abs(r.spacing / (B_UPPER + B_LOWER) - 1)).toBeLessThan(0.015);
  });

  it('is not pulled off by other lines three quarters of a spacing beside some of the J lines', () => {
    // Four P lines (38–50 cm^-1 below the origin, J = 18 … 21) with a hot-band or K-split companion 0.75
    // spacing above each: the pairs companion–next line fall inside the accepted gap window and, fitted
    // with the rest by plain least squares, moved the spacing at the origin by several per cent
    // (an independently made prolate parallel band, random band 1105 of make_traces.py: B −11 %).
    const peaks = bandPeaks();
    const extra = peaks.filter((p) => p.x < ORIGIN - 38 && p.x > ORIGIN - 50).map((p) => peakAt(p.x + 0.75 * 2.0, -1));
    expect(extra.length).toBeGreaterThanOrEqual(4);
    const all = [...peaks, ...extra].sort((a, b) => a.x - b.x);
    const r = jLineSpacingAtOrigin(all, 2, ORIGIN)!;
    const clean = jLineSpacingAtOrigin(peaks, 2, ORIGIN)!;
    // Within 0.5 % of what the clean lines give (plain least squares over all pairs: 4.4 % off).
    expect(Math.abs(r.spacing / clean.spacing - 1)).toBeLessThan(0.005);
  });
});
