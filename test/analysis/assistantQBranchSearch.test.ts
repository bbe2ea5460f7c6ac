import { describe, expect, it } from 'vitest';
import { assistantPriorSigmas } from '../../src/analysis/assistantPosterior';
import { assistantQBranchSearch } from '../../src/analysis/assistantQBranchSearch';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';
import { syntheticBand } from './assistantSyntheticBand';

/**
 * An invented linear molecule's Π–Σ band (cm^-1): l-type doubling q = 1 % of B'' moves the Q lines
 * against the P and R lines by q·J(J+1)/2 each way (Herzberg I (1950) ch. V, from memory), i.e.
 * 1.7 cm^-1 apart at J = 20: far outside any matching window.
 */
const Q_TRUE = 0.004;
function piSigma(band: 'perpendicular' | 'parallel'): BandModel {
  return {
    shape: 'linear',
    band,
    lower: stateConstantsFrom({ B: 0.4 }),
    upper: stateConstantsFrom({ origin: 2100, B: 0.398, q: band === 'perpendicular' ? Q_TRUE : 0 }),
    temperatureK: 250,
    jMax: 40,
    kMax: 0,
    spinWeights: [1],
  };
}

/** Distance (cm^-1) from a seed's peak to the true Q line of its J (truth model, bandLines). */
function trueQDistance(band: ReturnType<typeof syntheticBand>, l: { jLower: number; observedCm1: number }): number {
  let nearest = Infinity;
  for (let i = 0; i < band.lines.count; i++) {
    if (band.lines.jLower[i] !== l.jLower || band.lines.deltaJ[i] !== 0) continue;
    nearest = Math.min(nearest, Math.abs(band.lines.wavenumberCm1[i] - l.observedCm1));
  }
  return nearest;
}

describe('assistantQBranchSearch', () => {
  it('places the Q branch of a Π–Σ band whose q the P and R lines left at 0, with the true labels', () => {
    const truth = piSigma('perpendicular');
    const band = syntheticBand(truth, 0.002, 11);
    // What the P and R fit gives: their levels right (B' + q/2 absorbs q), the Q branch 2q·J(J+1)/2 off.
    const fitted: BandModel = { ...truth, upper: { ...truth.upper, B: truth.upper.B + Q_TRUE / 2, q: 0 } };
    const found = assistantQBranchSearch(fitted, 0.02 * 0.4, band.peaks, new Set());
    expect(found.lines.length, found.text).toBeGreaterThanOrEqual(3);
    for (const l of found.lines) {
      expect(l.jUpper).toBe(l.jLower);
      // The true Q line of that J (truth model, bandLines) lies under the seed's peak.
      expect(trueQDistance(band, l), `Q(${l.jLower})`).toBeLessThan(0.25 * band.fwhmCm1);
    }
  });

  it('places a dense Q branch that a far q fills nearly as well within half a width, by the tight window', () => {
    // An invented heavier Π–Σ band (cm^-1): B' − B'' = −1.5e-4 packs the Q lines about a width apart
    // at J ≈ 30, so sliding the ladder along q lands most of them on some other Q line's peak.
    const truth: BandModel = {
      shape: 'linear',
      band: 'perpendicular',
      lower: stateConstantsFrom({ B: 0.1 }),
      upper: stateConstantsFrom({ origin: 2295.7, B: 0.09985, q: 4e-4 }),
      temperatureK: 320,
      jMax: 60,
      kMax: 0,
      spinWeights: [1],
    };
    const band = syntheticBand(truth, 0.002, 21);
    const fitted: BandModel = { ...truth, upper: { ...truth.upper, B: truth.upper.B + 2e-4, q: 0 } };
    const qSigma = assistantPriorSigmas(truth, ['upper.origin', 'upper.B', 'lower.B', 'upper.q'])['upper.q'];
    const found = assistantQBranchSearch(fitted, qSigma, band.peaks, new Set());
    // The loose count alone does not stand out here (that is what the tight window is for).
    expect(found.text).toMatch(/within 0\.15 of a line width/);
    expect(found.lines.length, found.text).toBeGreaterThanOrEqual(3);
    for (const l of found.lines) {
      expect(trueQDistance(band, l), `Q(${l.jLower})`).toBeLessThan(0.25 * band.fwhmCm1);
    }
  });

  it('invents no Q branch in a trace that has none (a Σ–Σ band with the same P and R lines)', () => {
    const band = syntheticBand(piSigma('parallel'), 0.002, 12);
    const fitted = piSigma('perpendicular');
    const found = assistantQBranchSearch({ ...fitted, upper: { ...fitted.upper, q: 0 } }, 0.02 * 0.4, band.peaks, new Set());
    expect(found.lines, found.text).toHaveLength(0);
  });

  it('says why it does nothing for a band that is not Π–Σ', () => {
    const band = syntheticBand(piSigma('parallel'), 0.002, 13);
    const found = assistantQBranchSearch(piSigma('parallel'), 0.008, band.peaks, new Set());
    expect(found.lines).toHaveLength(0);
    expect(found.text).toMatch(/not a Π–Σ band/);
  });
});
