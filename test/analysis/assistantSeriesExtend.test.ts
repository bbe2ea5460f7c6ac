import { describe, expect, it } from 'vitest';
import { assistantNearestPeak, assistantPeakContext, assistantPeaksUsable } from '../../src/analysis/assistantPeakContext';
import { assistantRefit } from '../../src/analysis/assistantRefit';
import { assistantLinesFromAssignments } from '../../src/analysis/assistantReview';
import { assistantSeriesExtend, seriesPolynomial } from '../../src/analysis/assistantSeriesExtend';
import type { AssistantLine } from '../../src/analysis/assistantTypes';
import type { BandModel } from '../../src/physics/model';
import { transitionWavenumber } from '../../src/physics/termValues';
import { syntheticAssignable, syntheticBand, syntheticIsCorrect, syntheticTruthModel } from './assistantSyntheticBand';

const truth = syntheticTruthModel();
const band = syntheticBand(truth, 1 / 400, 11);
band.peaks = assistantPeaksUsable(band.peaks).peaks;
const context = assistantPeakContext(band.peaks);
/** First guess: B′ +0.8 %, B″ +0.6 %, origin +0.3 cm^-1 (as in the target test). */
const guess: BandModel = {
  ...truth,
  lower: { ...truth.lower, B: truth.lower.B * 1.006 },
  upper: { ...truth.upper, B: truth.upper.B * 1.008, origin: truth.upper.origin + 0.3 },
};

/** rR1(J'') at the peak nearest the truth position, for the given J''. */
function rungs(js: number[]): AssistantLine[] {
  return assistantLinesFromAssignments(
    js.map((j, n) => {
      const q = { jUpper: j + 1, kUpper: 2, jLower: j, kLower: 1 };
      const k = assistantNearestPeak(band.peaks, transitionWavenumber(truth, q.jUpper, q.kUpper, q.jLower, q.kLower));
      return {
        id: `r${n}`,
        ...q,
        observedCm1: band.peaks.wavenumberCm1[k],
        uncertaintyCm1: 3e-4,
        isBlended: false,
        isExcluded: false,
        note: '',
      };
    }),
    guess,
    band.peaks,
    context,
  );
}

describe('seriesPolynomial', () => {
  it('reproduces an exact quadratic offset and gives it a σ', () => {
    // obs − model = 0.3 + 0.01(J − 10) + 0.002(J − 10)² exactly: the fit returns these coefficients (tol 1e-10).
    const lines = [7, 9, 10, 12, 14].map((j) => {
      const nu = transitionWavenumber(guess, j + 1, 2, j, 1) + 0.3 + 0.01 * (j - 10) + 0.002 * (j - 10) ** 2;
      return { id: `p${j}`, jUpper: j + 1, kUpper: 2, jLower: j, kLower: 1, observedCm1: nu, uncertaintyCm1: 1e-3 } as AssistantLine;
    });
    const p = seriesPolynomial(lines, guess);
    expect(p.degree).toBe(2);
    const at = (j: number) => p.predict(j).valueCm1;
    expect(at(10)).toBeCloseTo(0.3, 10);
    expect(at(16)).toBeCloseTo(0.3 + 0.06 + 0.072, 10);
    expect(p.predict(16).sigmaCm1).toBeGreaterThan(p.predict(10).sigmaCm1);
  });
});

describe('assistantSeriesExtend', () => {
  it('extends rR1 both ways from six rungs with the model and a series polynomial (no fit)', () => {
    const r = assistantSeriesExtend({
      model: guess,
      series: { deltaK: 1, kLower: 1, deltaJ: 1 },
      lines: rungs([8, 9, 10, 11, 12, 13]),
      peaks: band.peaks,
    });
    expect(r.method).toBe('series-polynomial');
    expect(r.label).toBe('rR1');
    expect(r.polynomial!.degree).toBe(2);
    expect(r.rungs.map((x) => x.jLower)).toEqual([5, 6, 7, 14, 15, 16]);
    expect(r.rungs.filter((x) => x.direction === 'down')).toHaveLength(3);
    // Extrapolated σ grows away from the rungs (Student factor for ν = 3 and the polynomial covariance).
    expect(r.rungs[0].predictionSigmaCm1).toBeGreaterThan(r.rungs[2].predictionSigmaCm1);
    const matched = r.rungs.filter((x) => x.status === 'match');
    expect(matched.length).toBeGreaterThanOrEqual(2);
    for (const x of matched) {
      expect(x.proposal!.status).toBe('proposed');
      expect(x.proposal!.source).toBe('series-extend');
      expect(syntheticIsCorrect(band, x.proposal!, x.proposal!.observedCm1)).toBe(true);
    }
    // Every rung shows its candidates; a match has exactly one.
    for (const x of matched) expect(x.candidates).toHaveLength(1);
  });

  it('uses the fit and its σ when one is given, and offers gaps too', () => {
    // The fit: these rungs plus 40 correct lines of other sub-bands (K'' ≤ 3, J'' ≤ 14), so that the
    // other series are predicted well enough to be checked as competitors.
    const others = assistantLinesFromAssignments(
      syntheticAssignable(band)
        .filter(
          (i) =>
            band.lines.kLower[i] <= 3 &&
            band.lines.jLower[i] <= 14 &&
            !(band.lines.kLower[i] === 1 && band.lines.deltaK[i] === 1 && band.lines.deltaJ[i] === 1),
        )
        .slice(0, 40)
        .map((i, n) => ({
          id: `o${n}`,
          jUpper: band.lines.jUpper[i],
          kUpper: band.lines.kUpper[i],
          jLower: band.lines.jLower[i],
          kLower: band.lines.kLower[i],
          observedCm1: band.peaks.wavenumberCm1[assistantNearestPeak(band.peaks, band.lines.wavenumberCm1[i])],
          uncertaintyCm1: 3e-4,
          isBlended: false,
          isExcluded: false,
          note: '',
        })),
      guess,
      band.peaks,
      context,
    );
    const lines = [...rungs([5, 6, 8, 9, 10]), ...others];
    const fit = assistantRefit(guess, ['upper.origin', 'upper.B', 'lower.B', 'upper.A', 'upper.zeta'], lines).fit!;
    const r = assistantSeriesExtend({ model: guess, series: { deltaK: 1, kLower: 1, deltaJ: 1 }, lines, peaks: band.peaks, fit, rungs: 2 });
    expect(r.method).toBe('fit');
    expect(r.rungs.map((x) => [x.jLower, x.direction])).toEqual([
      [3, 'down'],
      [4, 'down'],
      [7, 'gap'],
      [11, 'up'],
      [12, 'up'],
    ]);
    const gap = r.rungs.find((x) => x.jLower === 7)!;
    expect(gap.status).toBe('match');
    expect(syntheticIsCorrect(band, gap.proposal!, gap.proposal!.observedCm1)).toBe(true);
    expect(gap.predictionSigmaCm1).toBeGreaterThan(0);
  });

  it('needs three rungs and a series of the band', () => {
    expect(() =>
      assistantSeriesExtend({ model: guess, series: { deltaK: 1, kLower: 1, deltaJ: 1 }, lines: rungs([9, 10]), peaks: band.peaks }),
    ).toThrow(/series rR1 has 2 assigned rung\(s\); at least 3 are needed/);
    expect(() =>
      assistantSeriesExtend({ model: guess, series: { deltaK: 0, kLower: 1, deltaJ: 1 }, lines: rungs([9, 10, 11]), peaks: band.peaks }),
    ).toThrow(/the band has no series qR1/);
  });
});
