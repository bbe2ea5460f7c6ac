import { describe, expect, it } from 'vitest';
import { assistantRefit } from '../../src/analysis/assistantRefit';
import type { FitLineInput } from '../../src/fit/fitTypes';
import { bandLines } from '../../src/physics/bandLines';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';
import { transitionWavenumber } from '../../src/physics/termValues';
import { randomNormal, randomSeeded } from './syntheticTrace';

/** Invented prolate top, perpendicular band. */
const TRUTH: BandModel = {
  shape: 'prolate',
  band: 'perpendicular',
  lower: stateConstantsFrom({ B: 0.52, A: 3.9, DJ: 8e-7, DJK: 5e-6 }),
  upper: stateConstantsFrom({ origin: 950.25, B: 0.515, A: 3.85, DJ: 8e-7, DJK: 5e-6, zeta: 0.2 }),
  temperatureK: 296,
  jMax: 30,
  kMax: 5,
  spinWeights: [1],
};
const ALL = ['upper.origin', 'upper.B', 'lower.B', 'upper.A', 'lower.A', 'upper.zeta', 'upper.DJ', 'lower.DJ', 'upper.DJK', 'lower.DJK'];

function linesOf(filter: (q: { jLower: number; kLower: number; deltaK: number; deltaJ: number }) => boolean): FitLineInput[] {
  const l = bandLines(TRUTH);
  const out: FitLineInput[] = [];
  for (let i = 0; i < l.count; i++) {
    if (!filter({ jLower: l.jLower[i], kLower: l.kLower[i], deltaK: l.deltaK[i], deltaJ: l.deltaJ[i] })) continue;
    const q = { jUpper: l.jUpper[i], kUpper: l.kUpper[i], jLower: l.jLower[i], kLower: l.kLower[i] };
    out.push({ ...q, observedCm1: transitionWavenumber(TRUTH, q.jUpper, q.kUpper, q.jLower, q.kLower), uncertaintyCm1: 1e-4 });
  }
  return out;
}

describe('assistantRefit', () => {
  it('fits a single line with the origin alone and never throws on tiny sets', () => {
    const one = linesOf((q) => q.kLower === 0 && q.deltaJ === 1 && q.jLower === 3);
    expect(one).toHaveLength(1);
    const r = assistantRefit(TRUTH, ALL, one);
    expect(r.fit).not.toBeNull();
    expect(r.floated).toEqual(['upper.origin']);
    expect(r.fit!.isExactlyDetermined).toBe(true);
    const none = assistantRefit(TRUTH, ALL, []);
    expect(none.fit).toBeNull();
    expect(none.error?.kind).toBe('too-few-lines');
  });

  it('floats origin and both B for one sub-band, and waits with the K constants', () => {
    const rR0 = linesOf((q) => q.kLower === 0 && q.deltaK === 1 && q.deltaJ === 1 && q.jLower <= 8);
    const r = assistantRefit(TRUTH, ALL, rR0);
    expect(r.floated).toEqual(['upper.origin', 'upper.B', 'lower.B']);
    expect(r.notes.join(' ')).toMatch(/not yet floated .*upper\.A/);
  });

  it('holds the constant the rank diagnosis names for a perpendicular band (A″ with A′ and ζ)', () => {
    // One perpendicular band fixes only A′ − A″ and A′(1 − ζ) (rankDiagnosis note): one of the three must be held.
    const low = linesOf((q) => q.kLower <= 3 && q.jLower <= 9 && q.deltaJ !== 0);
    const r = assistantRefit(TRUTH, ALL, low);
    expect(r.fit).not.toBeNull();
    expect(r.floated).toContain('upper.A');
    expect(r.floated).toContain('upper.zeta');
    expect(r.floated).not.toContain('lower.A');
    expect(r.notes.join(' ')).toMatch(/lower\.A held at the model value/);
    // Exact data and the true lower.A: the fit returns the truth (tol 1e-9 relative, round-off).
    expect(r.fit!.parameters['upper.A'].value).toBeCloseTo(3.85, 8);
  });

  it('holds a centrifugal constant the lines leave below 2σ at its model value', () => {
    // Lines with J'' ≤ 12 of K'' ≤ 3 and seeded noise of σ = 0.01 cm^-1: the DJK term of a line,
    // ΔJK differences of DJK·J(J+1)K² (5e-6 × 156 × 9 ≈ 7e-3 cm^-1 at most), cannot be told from noise.
    const rand = randomSeeded(3);
    const some = linesOf((q) => q.kLower <= 3 && q.jLower <= 12 && q.deltaJ !== 0).map((l) => ({
      ...l,
      observedCm1: l.observedCm1 + 0.01 * randomNormal(rand),
      uncertaintyCm1: 0.01,
    }));
    const r = assistantRefit(TRUTH, ALL, some);
    expect(r.fit).not.toBeNull();
    expect(r.floated.some((k) => k.endsWith('DJK'))).toBe(false);
    expect(r.notes.join(' ')).toMatch(/DJK.*held at the model value.*not yet determined/);
  });

  it('only ever floats keys it is allowed to', () => {
    const many = linesOf((q) => q.kLower <= 5 && q.deltaJ !== 0);
    const r = assistantRefit(TRUTH, ['upper.origin', 'upper.B'], many);
    expect(r.floated).toEqual(['upper.origin', 'upper.B']);
  });
});
