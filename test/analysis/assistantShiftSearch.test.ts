import { describe, expect, it } from 'vitest';
import { assistantShiftSearch } from '../../src/analysis/assistantShiftSearch';
import type { PeakList } from '../../src/analysis/peaksFind';
import { randomSeeded } from './syntheticTrace';

function peaksAt(x: number[]): PeakList {
  const s = [...x].sort((a, b) => a - b);
  const n = s.length;
  return {
    count: n,
    wavenumberCm1: Float64Array.from(s),
    height: new Float64Array(n).fill(1),
    fwhmCm1: new Float64Array(n).fill(0.01),
    snr: new Float64Array(n).fill(50),
    prominence: new Float64Array(n).fill(1),
    isBlend: new Uint8Array(n),
    centreSigmaCm1: new Float64Array(n).fill(1e-4),
    noiseSigma: 0.02,
  };
}

describe('assistantShiftSearch', () => {
  // A ladder ν_m = 1000 + 0.8 m + 0.002 m² (m = −15…15, m ≠ 0), observed 0.237 cm^-1 higher with the
  // quadratic coefficient 0.0015 larger, among 60 seeded random peaks over the same range.
  const ms = Array.from({ length: 31 }, (_, i) => i - 15).filter((m) => m !== 0);
  const predicted = Float64Array.from(ms, (m) => 1000 + 0.8 * m + 0.002 * m * m);
  const rand = randomSeeded(21);
  const clutter = Array.from({ length: 60 }, () => 985 + 30 * rand());
  const observed = ms.map((m) => 1000.237 + 0.8 * m + 0.0035 * m * m);
  const peaks = peaksAt([...observed, ...clutter]);
  const idx = ms.map((_, i) => i);

  it('finds an origin shift alone within a grid step', () => {
    const flat = peaksAt(ms.map((m) => 1000.237 + 0.8 * m + 0.002 * m * m).concat(clutter));
    const r = assistantShiftSearch(
      flat,
      0.01,
      idx,
      predicted,
      () => 0,
      () => 0,
      {
        deltaCentre: 0,
        deltaWindow: 0.35,
        sumCentre: 0,
        sumWindow: 0,
        diffCentre: 0,
        diffWindow: 0,
      },
    );
    // Bins of τ = 0.01 cm^-1: the found δ is within τ/2 of 0.237.
    expect(Math.abs(r.delta - 0.237)).toBeLessThanOrEqual(0.005 + 1e-12);
    expect(r.count).toBe(30);
    expect(r.chance).toBeLessThan(0.2);
    expect(r.secondCount).toBeLessThan(15);
  });

  it('finds shift and curvature together (d along m², s along m)', () => {
    const r = assistantShiftSearch(
      peaks,
      0.01,
      idx,
      predicted,
      (i) => ms[i],
      (i) => ms[i] * ms[i],
      {
        deltaCentre: 0,
        deltaWindow: 0.35,
        sumCentre: 0,
        sumWindow: 0.004,
        diffCentre: 0,
        diffWindow: 0.004,
      },
    );
    expect(r.count).toBe(30);
    expect(Math.abs(r.delta - 0.237)).toBeLessThanOrEqual(0.01);
    // d is found within one grid step (the step moves the farthest line, m = 15, by ≤ τ).
    expect(Math.abs(r.diff - 0.0015)).toBeLessThanOrEqual(r.diffStep);
    expect(Math.abs(r.sum)).toBeLessThanOrEqual(r.sumStep);
  });
});
