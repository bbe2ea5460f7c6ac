import { describe, expect, it } from 'vitest';
import { assistantLabelCheck, assistantLabelShift, LABEL_DECISIVE_MARGIN } from '../../src/analysis/assistantLabelCheck';
import { assistantPriorSigmas, type AssistantPosterior } from '../../src/analysis/assistantPosterior';
import type { AssistantLine, AssistantRunAudit } from '../../src/analysis/assistantTypes';
import { bandLines } from '../../src/physics/bandLines';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';
import { randomNormal, randomSeeded } from './syntheticTrace';

/** Invented prolate top, perpendicular band (cm^-1). */
const TOP: BandModel = {
  shape: 'prolate',
  band: 'perpendicular',
  lower: stateConstantsFrom({ B: 0.4187, A: 3.412, DJ: 4.1e-7, DJK: 3.3e-6, DK: 2.2e-5 }),
  upper: stateConstantsFrom({ origin: 1387.452, B: 0.4162, A: 3.376, DJ: 4.0e-7, DJK: 3.1e-6, DK: 2.1e-5, zeta: 0.213 }),
  temperatureK: 250,
  jMax: 40,
  kMax: 8,
  spinWeights: [1],
};

/** Invented linear molecule, parallel (Σ–Σ) band (cm^-1). */
const LINEAR: BandModel = {
  shape: 'linear',
  band: 'parallel',
  lower: stateConstantsFrom({ B: 0.3905, DJ: 1.3e-7 }),
  upper: stateConstantsFrom({ origin: 2143.27, B: 0.3871, DJ: 1.3e-7 }),
  temperatureK: 296,
  jMax: 40,
  kMax: 0,
  spinWeights: [1],
};

const FLOAT_TOP = [
  'upper.origin',
  'upper.B',
  'lower.B',
  'upper.A',
  'lower.A',
  'upper.zeta',
  'upper.DJ',
  'lower.DJ',
  'upper.DJK',
  'lower.DJK',
];
const FLOAT_LINEAR = ['upper.origin', 'upper.B', 'lower.B', 'upper.DJ', 'lower.DJ'];
const SIGMA_CM1 = 2e-4;

/** The truth's lines chosen by `keep`, at their positions plus seeded noise of SIGMA_CM1, as assistant lines. */
function observed(truth: BandModel, keep: (i: number, l: ReturnType<typeof bandLines>) => boolean, seed: number): AssistantLine[] {
  const l = bandLines(truth);
  const rand = randomSeeded(seed);
  const out: AssistantLine[] = [];
  for (let i = 0; i < l.count; i++) {
    if (!keep(i, l)) continue;
    out.push({
      id: `l${i}`,
      jUpper: l.jUpper[i],
      kUpper: l.kUpper[i],
      jLower: l.jLower[i],
      kLower: l.kLower[i],
      observedCm1: l.wavenumberCm1[i] + SIGMA_CM1 * randomNormal(rand),
      uncertaintyCm1: SIGMA_CM1,
      isBlended: false,
      isExcluded: false,
      note: '',
      status: 'proposed',
      source: 'auto-extend',
      peakIndex: null,
      predictedCm1: NaN,
      matchSigmaCm1: NaN,
      distanceSigma: NaN,
      reason: '',
      iteration: 1,
    });
  }
  return out;
}

/**
 * Stand-in for the trace's audit: lines of the fitted constants with intensity ≥ 0.05 of the
 * strongest (SNR ≥ 20 on a trace whose strongest line has SNR 400), predicted where the truth has no
 * line within 0.01 cm^-1 (the truth lines are the peaks).
 */
function auditAgainst(truth: BandModel): (post: AssistantPosterior) => AssistantRunAudit {
  const peaks = Float64Array.from(bandLines(truth).wavenumberCm1).sort();
  return (post) => {
    const l = bandLines(post.model, { minIntensity: 0.05 });
    let missing = 0;
    for (let i = 0; i < l.count; i++) {
      const x = l.wavenumberCm1[i];
      let lo = 0;
      let hi = peaks.length;
      while (lo < hi) {
        const mid = (lo + hi) >> 1;
        if (peaks[mid] < x) lo = mid + 1;
        else hi = mid;
      }
      const near = Math.min(Math.abs((peaks[lo] ?? Infinity) - x), Math.abs((peaks[lo - 1] ?? Infinity) - x));
      if (near > 0.01) missing++;
    }
    return { strong: l.count, missing, examples: [] };
  };
}

/** The first guess: the truth moved by errors of the size a user makes (origin 0.2 cm^-1, B 0.3 %, A 0.5 %, ζ 0.01). */
function guessOf(truth: BandModel): BandModel {
  const m: BandModel = { ...truth, lower: { ...truth.lower }, upper: { ...truth.upper } };
  m.upper.origin += 0.2;
  m.upper.B *= 1.003;
  m.lower.B *= 1.003;
  if (truth.shape !== 'linear') {
    m.upper.A *= 1.005;
    m.lower.A *= 1.005;
    m.upper.zeta += 0.01;
  }
  return m;
}

describe('assistantLabelCheck', () => {
  it('decides the labels of several sub-bands of a perpendicular band (every rival loses by the margin)', () => {
    const lines = observed(TOP, (i, l) => l.kLower[i] <= 4 && l.jLower[i] <= 30 && l.jLower[i] >= 1, 1);
    const guess = guessOf(TOP);
    const r = assistantLabelCheck({ model: guess, priors: assistantPriorSigmas(guess, FLOAT_TOP), lines, auditOf: auditAgainst(TOP) });
    expect(r.rivals.length).toBe(6);
    expect(r.isDecided, r.text).toBe(true);
    expect(r.margin).toBeGreaterThanOrEqual(LABEL_DECISIVE_MARGIN);
  });

  it('does not decide a single sub-band: a neighbouring sub-band label fits it as well (the origin absorbs the shift)', () => {
    // One sub-band alone (rK0) carries no K information: its J structure is that of pK1 too.
    const lines = observed(TOP, (i, l) => l.kLower[i] === 0 && l.jLower[i] >= 2 && l.jLower[i] <= 30, 2);
    const guess = guessOf(TOP);
    const r = assistantLabelCheck({ model: guess, priors: assistantPriorSigmas(guess, FLOAT_TOP), lines, auditOf: () => null });
    expect(r.isDecided, r.text).toBe(false);
    expect(r.closest!.what).toMatch(/sub-band/);
    expect(r.text).toMatch(/fit (almost as well|better) with/);
  });

  it('decides the J numbering of a Σ–Σ band when the lines beside the band gap are observed, not without them', () => {
    const guess = guessOf(LINEAR);
    const priors = assistantPriorSigmas(guess, FLOAT_LINEAR);
    const all = observed(LINEAR, (i, l) => l.jLower[i] <= 35, 3);
    const withGap = assistantLabelCheck({ model: guess, priors, lines: all, auditOf: auditAgainst(LINEAR) });
    expect(withGap.isDecided, withGap.text).toBe(true);
    // Without R(0), P(1) and the lines the gap test leans on, a shift by one rung fits as well
    // (the origin and B absorb it: common practice knows the gap decides the numbering).
    const far = all.filter((l) => l.jLower >= 6);
    const r = assistantLabelCheck({ model: guess, priors, lines: far, auditOf: () => null });
    expect(r.isDecided, r.text).toBe(false);
    expect(r.closest!.what).toMatch(/rung/);
  });

  it('says when a rival fits better than the labels found (a ladder one rung off)', () => {
    const guess = guessOf(LINEAR);
    const priors = assistantPriorSigmas(guess, FLOAT_LINEAR);
    // Truth lines labelled one rung low (m − 1): R(J) called R(J−1), P(J) called P(J+1).
    const shifted = observed(LINEAR, (i, l) => l.jLower[i] >= 1 && l.jLower[i] <= 35, 4).map((l) => {
      const dJ = l.jUpper - l.jLower;
      const jLower = l.jLower - dJ;
      return { ...l, jLower, jUpper: jLower + dJ };
    });
    const r = assistantLabelCheck({ model: guess, priors, lines: shifted, auditOf: auditAgainst(LINEAR) });
    expect(r.isDecided, r.text).toBe(false);
    expect(r.margin).toBeLessThan(0);
    expect(r.text).toMatch(/fit better with the P and R branches numbered one rung up/);
  });

  it('lets the intensities along J decide a numbering the positions leave open, and only the right way', () => {
    const guess = guessOf(LINEAR);
    const priors = assistantPriorSigmas(guess, FLOAT_LINEAR);
    const truthLines = bandLines(LINEAR);
    const rand = randomSeeded(6);
    // Peak heights: the true intensities with 5 % scatter (line i on peak i).
    const heights = Float64Array.from(truthLines.intensity, (v) => v * Math.exp(0.05 * randomNormal(rand)));
    const onPeaks = (ls: AssistantLine[]) => ls.map((l) => ({ ...l, peakIndex: Number(l.id.slice(1)) }));
    const far = onPeaks(observed(LINEAR, (i, l) => l.jLower[i] >= 3 && l.jLower[i] <= 35, 5));
    const blind = assistantLabelCheck({ model: guess, priors, lines: far, auditOf: () => null });
    expect(blind.isDecided, blind.text).toBe(false);
    const seen = assistantLabelCheck({ model: guess, priors, lines: far, auditOf: () => null, peakHeights: heights });
    expect(seen.isDecided, seen.text).toBe(true);
    expect(Math.min(...seen.rivals.map((r) => r.intensity))).toBeGreaterThan(0);
    // The same peaks labelled one rung low: the intensities now speak for the rival, never for the labels.
    const shifted = far.map((l) => {
      const dJ = l.jUpper - l.jLower;
      const jLower = l.jLower - dJ;
      return { ...l, jLower, jUpper: jLower + dJ };
    });
    const wrong = assistantLabelCheck({ model: guess, priors, lines: shifted, auditOf: () => null, peakHeights: heights });
    expect(wrong.isDecided, wrong.text).toBe(false);
    expect(wrong.rivals.find((r) => /numbered one rung up/.test(r.what))!.intensity).toBeLessThan(0);
  });
});

describe('assistantLabelShift', () => {
  // Running number m = −J'' for P lines, J'' + 1 for R lines (Herzberg II (1945) ch. IV, from memory);
  // sub-band index ΔK·K'' of a perpendicular band (… pQ1 = −1, rQ0 = 0, rQ1 = 1 …).
  const p5 = { jUpper: 4, kUpper: 1, jLower: 5, kLower: 0 };
  const r5 = { jUpper: 6, kUpper: 1, jLower: 5, kLower: 0 };
  it('moves P(5) (m = −5) to P(4) and R(5) (m = 6) to R(6) one rung up', () => {
    expect(assistantLabelShift(TOP, { kind: 'rung', step: 1 }, p5)).toEqual({ jUpper: 3, kUpper: 1, jLower: 4, kLower: 0 });
    expect(assistantLabelShift(TOP, { kind: 'rung', step: 1 }, r5)).toEqual({ jUpper: 7, kUpper: 1, jLower: 6, kLower: 0 });
  });
  it("moves every J'' by one and keeps ΔJ", () => {
    expect(assistantLabelShift(TOP, { kind: 'j', step: -1 }, r5)).toEqual({ jUpper: 5, kUpper: 1, jLower: 4, kLower: 0 });
  });
  it('moves rR0 one sub-band down to pR1 and one up to rR1 in a perpendicular band, K″ by one in a parallel band', () => {
    expect(assistantLabelShift(TOP, { kind: 'subBand', step: -1 }, r5)).toEqual({ jUpper: 6, kUpper: 0, jLower: 5, kLower: 1 });
    expect(assistantLabelShift(TOP, { kind: 'subBand', step: 1 }, r5)).toEqual({ jUpper: 6, kUpper: 2, jLower: 5, kLower: 1 });
    const parallel = { ...TOP, band: 'parallel' as const };
    expect(assistantLabelShift(parallel, { kind: 'subBand', step: 1 }, { jUpper: 6, kUpper: 2, jLower: 5, kLower: 2 })).toEqual({
      jUpper: 6,
      kUpper: 3,
      jLower: 5,
      kLower: 3,
    });
  });
});
