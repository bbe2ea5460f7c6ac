import { describe, expect, it } from 'vitest';
import {
  assistantNearestPeak,
  assistantPeakContext,
  assistantPeaksCheck,
  assistantPeaksInRange,
  assistantPeaksUsable,
  assistantPeakUncertainty,
} from '../../src/analysis/assistantPeakContext';
import type { PeakList } from '../../src/analysis/peaksFind';

function peakList(x: number[], fwhm: number[], opts: { isBlend?: number[]; centreSigma?: number[] } = {}): PeakList {
  const n = x.length;
  return {
    count: n,
    wavenumberCm1: Float64Array.from(x),
    height: new Float64Array(n).fill(1),
    fwhmCm1: Float64Array.from(fwhm),
    snr: new Float64Array(n).fill(100),
    prominence: new Float64Array(n).fill(1),
    isBlend: Uint8Array.from(opts.isBlend ?? new Array(n).fill(0)),
    centreSigmaCm1: Float64Array.from(opts.centreSigma ?? new Array(n).fill(1e-4)),
    noiseSigma: 0.01,
  };
}

describe('assistantPeakContext', () => {
  it('gives an empty context for an empty list', () => {
    const c = assistantPeakContext(peakList([], []));
    expect(c.localFwhmCm1.length).toBe(0);
    expect(Number.isNaN(c.medianFwhmCm1)).toBe(true);
  });

  it('takes the running median over the peak and its neighbours, and flags wide or flagged peaks', () => {
    // Hand check with 2 neighbours each side: around peak 3 the widths are 0.01, 0.01, 0.03, 0.01, 0.01 → median 0.01.
    const p = peakList([1, 2, 3, 4, 5, 6, 7], [0.01, 0.01, 0.01, 0.03, 0.01, 0.01, 0.01], { isBlend: [0, 0, 0, 0, 0, 0, 1] });
    const c = assistantPeakContext(p, 2, 1.5);
    expect(Array.from(c.localFwhmCm1)).toEqual([0.01, 0.01, 0.01, 0.01, 0.01, 0.01, 0.01]);
    expect(Array.from(c.isPossibleBlend)).toEqual([0, 0, 0, 1, 0, 0, 1]);
    expect(c.blendReason[3]).toBe('possible blend (FWHM 0.0300 cm^-1 is 3.00× the local median)');
    expect(c.blendReason[6]).toBe('possible blend (flagged as an overlap by the peak finder)');
    expect(c.medianFwhmCm1).toBe(0.01);
  });

  it('refuses bad options and bad lists, naming them', () => {
    expect(() => assistantPeakContext(peakList([1], [0.01]), 0)).toThrow(/neighbours must be a whole number >= 1, got 0/);
    expect(() => assistantPeakContext(peakList([1], [0.01]), 2, 1)).toThrow(/blendWidthRatio must be > 1, got 1/);
    expect(() => assistantPeakContext(peakList([2, 1], [0.01, 0.01]))).toThrow(/ascending wavenumber, but \[1\] = 1 follows 2/);
    expect(assistantPeaksCheck('f', peakList([1], [0]))).toBe('f: peaks.fwhmCm1[0] must be a finite width > 0 cm^-1, got 0');
    expect(assistantPeaksCheck('f', { ...peakList([1], [0.1]), count: 3 })).toMatch(/must have at least count \(3\) entries/);
  });
});

describe('assistantPeaksUsable', () => {
  it('repairs a missing centre σ with a quarter of the FWHM and leaves good lists alone', () => {
    const good = peakList([1, 2], [0.02, 0.02]);
    expect(assistantPeaksUsable(good).peaks).toBe(good);
    const bad = peakList([1, 2], [0.02, 0.04], { centreSigma: [1e-4, NaN] });
    const fixed = assistantPeaksUsable(bad);
    expect(fixed.repaired).toEqual([1]);
    expect(Array.from(fixed.peaks.centreSigmaCm1)).toEqual([1e-4, 0.01]);
    expect(bad.centreSigmaCm1[1]).toBeNaN();
  });
});

describe('assistantPeaksInRange and assistantNearestPeak', () => {
  const p = peakList([1, 2, 3, 4], [0.1, 0.1, 0.1, 0.1]);
  it('finds the closed range by binary search', () => {
    expect(assistantPeaksInRange(p, 2, 3)).toEqual([1, 2]);
    expect(assistantPeaksInRange(p, 2.1, 2.9)).toEqual([2, 1]);
    expect(assistantPeaksInRange(p, -5, 0)).toEqual([0, -1]);
  });
  it('picks the nearest peak, the lower one on a tie', () => {
    expect(assistantNearestPeak(p, 2.4)).toBe(1);
    expect(assistantNearestPeak(p, 2.6)).toBe(2);
    expect(assistantNearestPeak(p, 2.5)).toBe(1);
    expect(assistantNearestPeak(p, 99)).toBe(3);
    expect(assistantNearestPeak(peakList([], []), 1)).toBe(-1);
  });
});

describe('assistantPeakUncertainty', () => {
  it('combines centre σ, the width floor, the overlap pull and the blend term in quadrature', () => {
    const p = peakList([1, 2, 3, 4, 5], [0.01, 0.01, 0.05, 0.01, 0.01]);
    const c = assistantPeakContext(p, 2, 1.5);
    expect(assistantPeakUncertainty(p, c, 0, 0.02, 0.25)).toBeCloseTo(Math.hypot(1e-4, 2e-4), 15);
    expect(assistantPeakUncertainty(p, c, 0, 0.02, 0.25, false, 3e-4)).toBeCloseTo(Math.hypot(1e-4, 2e-4, 3e-4), 15);
    expect(assistantPeakUncertainty(p, c, 2, 0.02, 0.25)).toBeCloseTo(Math.hypot(1e-4, 1e-3, 0.0125), 15);
    expect(assistantPeakUncertainty(p, c, 0, 0.02, 0.25, true)).toBeCloseTo(Math.hypot(1e-4, 2e-4, 2.5e-3), 15);
  });
});
