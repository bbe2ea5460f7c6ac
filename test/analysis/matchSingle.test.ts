import { describe, expect, it } from 'vitest';
import { matchSingle, matchSingleContext, matchSingleHeightScale } from '../../src/analysis/matchSingle';
import type { PeakList } from '../../src/analysis/peaksFind';
import { syntheticAssignable, syntheticBand, syntheticTruthModel } from './assistantSyntheticBand';

// The rules themselves are the assistant's (assistantMatch, tested in assistantMatch.test.ts);
// these tests check that one rung goes through them with the page's assignments.
const band = syntheticBand(syntheticTruthModel(), 0.002, 5);
const ctx = matchSingleContext({ model: band.truth, fit: null, peaks: band.peaks, minIntensity: 1e-4 });
const quanta = (i: number) => ({
  jUpper: band.lines.jUpper[i],
  kUpper: band.lines.kUpper[i],
  jLower: band.lines.jLower[i],
  kLower: band.lines.kLower[i],
});
/** Peaks with one extra peak (a copy of peak p moved by dx cm^-1), kept ascending. */
function withExtraPeak(peaks: PeakList, p: number, dx: number): PeakList {
  const idx = Array.from({ length: peaks.count }, (_, k) => k);
  idx.push(p);
  const x = (k: number, n: number) => (n === peaks.count ? peaks.wavenumberCm1[k] + dx : peaks.wavenumberCm1[k]);
  const order = idx.map((k, n) => ({ k, n, x: x(k, n) })).sort((a, b) => a.x - b.x);
  const col = <T extends Float64Array | Uint8Array>(c: T, pick: (o: (typeof order)[number]) => number): T => {
    const out = new (c.constructor as new (n: number) => T)(order.length);
    order.forEach((o, m) => (out[m] = pick(o)));
    return out;
  };
  return {
    ...peaks,
    count: order.length,
    wavenumberCm1: col(peaks.wavenumberCm1, (o) => o.x),
    height: col(peaks.height, (o) => peaks.height[o.k]),
    fwhmCm1: col(peaks.fwhmCm1, (o) => peaks.fwhmCm1[o.k]),
    snr: col(peaks.snr, (o) => peaks.snr[o.k]),
    centreSigmaCm1: col(peaks.centreSigmaCm1, (o) => peaks.centreSigmaCm1[o.k]),
    isBlend: col(peaks.isBlend, (o) => peaks.isBlend[o.k]),
  };
}

describe('matchSingle', () => {
  // An isolated, strong truth line (no comparable neighbour within a FWHM); the model is the
  // truth, so its prediction is exact and the first-guess σ (0.2 B″) is the only tolerance.
  const isolated = syntheticAssignable(band)
    .filter((i) => band.lines.intensity[i] > 0.3)
    .find((i) => {
      const o = matchSingle(ctx, quanta(i), []);
      return o.kind === 'match';
    })!;

  it('matches an isolated strong rung to the peak of its own line, with its σ distance', () => {
    expect(isolated).toBeDefined();
    const o = matchSingle(ctx, quanta(isolated), []);
    expect(o.kind).toBe('match');
    // The peak finder's centre of a clean line agrees with the truth to a small part of its FWHM.
    expect(Math.abs(band.peaks.wavenumberCm1[o.peak] - band.lines.wavenumberCm1[isolated])).toBeLessThan(0.25 * band.fwhmCm1);
    expect(o.distanceSigma).toBeLessThanOrEqual(o.toleranceSigma);
    expect(o.toleranceSigma).toBe(3);
  });

  it('declines, naming the peaks, when a second peak lies within k·σ', () => {
    const p = matchSingle(ctx, quanta(isolated), []).peak;
    const crowded = matchSingleContext({ model: band.truth, fit: null, peaks: withExtraPeak(band.peaks, p, 0.03), minIntensity: 1e-4 });
    const o = matchSingle(crowded, quanta(isolated), []);
    expect(o.kind).toBe('declined');
    expect(o.reason).toMatch(/2 peaks lie within 3σ/);
  });

  it('declines when the only peak already carries another line, naming it', () => {
    const p = matchSingle(ctx, quanta(isolated), []).peak;
    const other = isolated === 0 ? 1 : 0;
    const o = matchSingle(ctx, quanta(isolated), [{ ...quanta(other), observedCm1: band.peaks.wavenumberCm1[p] }]);
    expect(o.kind).toBe('declined');
    expect(o.reason).toMatch(/already carries/);
  });

  it('does not count the rung’s own earlier assignment as taking its peak', () => {
    const p = matchSingle(ctx, quanta(isolated), []).peak;
    const o = matchSingle(ctx, quanta(isolated), [{ ...quanta(isolated), observedCm1: band.peaks.wavenumberCm1[p] }]);
    expect(o.kind).toBe('match');
    expect(o.peak).toBe(p);
  });

  it('declines a peak far stronger than predicted once three assignments fix the height scale', () => {
    const p = matchSingle(ctx, quanta(isolated), []).peak;
    // Three other assigned lines whose peaks say "height per unit intensity" is a tenth of the
    // truth's: the isolated line's peak is then ~10× too strong (allowed 1/5…5, the assistant's default).
    const others = syntheticAssignable(band)
      .filter((i) => i !== isolated && band.lines.intensity[i] > 0.2 && matchSingle(ctx, quanta(i), []).kind === 'match')
      .slice(0, 3);
    expect(others.length).toBe(3);
    const scaled = { ...band.peaks, height: Float64Array.from(band.peaks.height) };
    const assigned = others.map((i) => {
      const k = matchSingle(ctx, quanta(i), []).peak;
      return { k, a: { ...quanta(i), observedCm1: band.peaks.wavenumberCm1[k] } };
    });
    expect(assigned.every((x) => x.k >= 0)).toBe(true);
    for (const { k } of assigned) scaled.height[k] /= 10;
    const c2 = matchSingleContext({ model: band.truth, fit: null, peaks: scaled, minIntensity: 1e-4 });
    expect(
      matchSingleHeightScale(
        c2,
        assigned.map((x) => x.a),
      ),
    ).toBeGreaterThan(0);
    const o = matchSingle(
      c2,
      quanta(isolated),
      assigned.map((x) => x.a),
    );
    expect(p).toBeGreaterThanOrEqual(0);
    expect(o.kind).toBe('declined');
    expect(o.reason).toMatch(/× the predicted height/);
  });

  it('declines a rung that is not in the predictions', () => {
    const o = matchSingle(ctx, { jUpper: 300, kUpper: 1, jLower: 299, kLower: 0 }, []);
    expect(o.kind).toBe('declined');
    expect(o.reason).toMatch(/too weak in the model/);
  });
});
