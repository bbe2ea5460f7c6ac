import { describe, expect, it } from 'vitest';
import { assistantAutoExtend } from '../../src/analysis/assistantAutoExtend';
import { assistantNearestPeak, assistantPeakContext, assistantPeaksUsable } from '../../src/analysis/assistantPeakContext';
import { assistantLinesFromAssignments } from '../../src/analysis/assistantReview';
import type { Assignment } from '../../src/fit/assignment';
import type { BandModel } from '../../src/physics/model';
import { syntheticAssignable, syntheticBand, syntheticIsCorrect, syntheticTruthModel } from './assistantSyntheticBand';

/** The model file floats these; the sextic constants are absent from it (held at 0). */
const FLOATABLE = [
  'upper.origin',
  'upper.B',
  'lower.B',
  'upper.A',
  'upper.zeta',
  'upper.DJ',
  'lower.DJ',
  'upper.DJK',
  'lower.DJK',
  'upper.DK',
  'lower.DK',
];

describe('assistantAutoExtend when the residuals demand constants the model holds', () => {
  // Truth: the synthetic perpendicular band (syntheticTruthModel) with invented sextic constants of
  // the size DJ²/B × 10…50 (HJ 4e-12, HJK 2e-11 cm^-1: 0.02 cm^-1, two line widths, at J'' = 40);
  // the first guess is the truth without them, as a user who does not yet know they are needed.
  const truth = syntheticTruthModel();
  truth.lower.HJ = 3e-11;
  truth.upper.HJ = 3.3e-11;
  truth.lower.HJK = 1e-10;
  truth.upper.HJK = 1.1e-10;
  const guess: BandModel = {
    ...truth,
    lower: { ...truth.lower, HJ: 0, HJK: 0 },
    upper: { ...truth.upper, HJ: 0, HJK: 0, origin: truth.upper.origin + 0.2 },
  };
  const band = syntheticBand(truth, 1 / 400, 12);
  band.peaks = assistantPeaksUsable(band.peaks).peaks;
  const context = assistantPeakContext(band.peaks);
  const L = band.lines;
  // Ten seeds: the strongest assignable P and R lines with K'' ≤ 2, J'' ≤ 15, two per sub-band at most.
  const perSub = new Map<string, number>();
  const seeds: Assignment[] = [];
  for (const i of syntheticAssignable(band)
    .filter((i) => L.kLower[i] <= 2 && L.jLower[i] <= 15 && L.deltaJ[i] !== 0)
    .sort((a, b) => L.intensity[b] - L.intensity[a])) {
    const key = `${L.deltaK[i]},${L.kLower[i]}`;
    if ((perSub.get(key) ?? 0) >= 2 || seeds.length >= 10) continue;
    perSub.set(key, (perSub.get(key) ?? 0) + 1);
    const k = assistantNearestPeak(band.peaks, L.wavenumberCm1[i]);
    seeds.push({
      id: `s${seeds.length}`,
      jUpper: L.jUpper[i],
      kUpper: L.kUpper[i],
      jLower: L.jLower[i],
      kLower: L.kLower[i],
      observedCm1: band.peaks.wavenumberCm1[k],
      uncertaintyCm1: 0.001,
      isBlended: false,
      isExcluded: false,
      note: '',
    });
  }
  const run = assistantAutoExtend({
    model: guess,
    floatable: FLOATABLE,
    peaks: band.peaks,
    lines: assistantLinesFromAssignments(seeds, guess, band.peaks, context),
  });
  const confident = run.lines.filter((l) => l.status !== 'rejected' && !l.isExcluded);
  const correct = confident.filter((l) => syntheticIsCorrect(band, l, l.observedCm1));
  const assignable = syntheticAssignable(band);
  const found = new Set(correct.map((l) => `${l.jUpper},${l.kUpper},${l.jLower},${l.kLower}`));
  const recall =
    assignable.filter((i) => found.has(`${L.jUpper[i]},${L.kUpper[i]},${L.jLower[i]},${L.kLower[i]}`)).length / assignable.length;
  console.log(
    `demanded constants: recall ${(100 * recall).toFixed(1)} %, precision ${((100 * correct.length) / confident.length).toFixed(2)} %; ${run.warnings.filter((w) => /centrifugal/.test(w)).join(' | ')}`,
  );

  it('says which held constants the lines demand and predicts with them', () => {
    const w = run.warnings.find((x) => /held centrifugal constants/.test(x));
    expect(w).toBeDefined();
    expect(w).toMatch(/upper\.HJ/);
    expect(w).toMatch(/add them to the model/);
    // The reported fit floats only what the model floats.
    expect(run.fit!.floated.some((k) => /H/.test(k))).toBe(false);
  });

  it('still assigns ≥ 90 % of the assignable lines at ≥ 99 % precision (targets of the synthetic test above)', () => {
    expect(recall).toBeGreaterThanOrEqual(0.9);
    expect(correct.length / confident.length).toBeGreaterThanOrEqual(0.99);
  });
});
