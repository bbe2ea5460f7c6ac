import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { combDiffValue, combinationDifferences, type CombDiffOutcome, type CombDiffResult } from '../../src/fit/combinationDifferences';
import { lineTableParse } from '../../src/io/lineTable';
import { levelEnergy } from '../../src/physics/termValues';
import { stateConstantsFrom } from '../../src/physics/model';
import { inventedModel, seededUniform, simulatedLines } from './fitTestData';

function ok(o: CombDiffOutcome): CombDiffResult {
  if (!o.ok) throw new Error(`expected a result, got ${o.error.kind}: ${o.error.message}`);
  return o.result;
}

const HCL = lineTableParse(readFileSync(new URL('../fixtures/lines/hcl-fundamental/lines.csv', import.meta.url), 'utf8')).assignments;

describe('combDiffValue', () => {
  it('equals F(J+1, K) − F(J−1, K) of levelEnergy for random constants', () => {
    // Checks the derivation in the file comment against the physics module's term values.
    // Tolerance 1e-10 relative: round-off of differences of terms up to ~1e4 cm^-1.
    const u = seededUniform(77);
    for (let trial = 0; trial < 50; trial++) {
      const s = stateConstantsFrom({ B: 0.1 + u(), A: 1 + 5 * u(), DJ: 1e-6 * u(), DJK: 1e-5 * (u() - 0.5), DK: 1e-4 * u() });
      const J = 1 + Math.floor(60 * u());
      const K = Math.floor((J - 1) * u());
      const direct = levelEnergy(s, 'prolate', J + 1, K) - levelEnergy(s, 'prolate', J - 1, K);
      expect(combDiffValue(s.B, s.DJ, s.DJK, J, K) / direct).toBeCloseTo(1, 10);
    }
  });
});

describe('combinationDifferences', () => {
  it('refuses fewer than two pairs', () => {
    const o = combinationDifferences(HCL.filter((l) => l.jUpper <= 1 && l.jLower <= 2).slice(0, 2), 'lower', { shape: 'linear' });
    expect(!o.ok && o.error.kind).toBe('too-few-pairs');
    expect(!o.ok && o.error.message).toMatch(/found [01] R\(J−1\)\/P\(J\+1\) pairs/);
  });

  it('refuses a line with K > J and names its index', () => {
    const bad = [...HCL, { jUpper: 3, kUpper: 5, jLower: 2, kLower: 5, observedCm1: 1, uncertaintyCm1: 1 }];
    const o = combinationDifferences(bad, 'lower');
    expect(!o.ok && o.error.lineIndex).toBe(19);
  });

  it('gives B″ and B′ of H³⁵Cl from the textbook P and R lines (worked example)', () => {
    // Ref: HCl fundamental line positions as reproduced from Herzberg, Spectra of Diatomic
    // Molecules (1950) ch. III (from memory; see test/fixtures/lines/hcl-fundamental/README.md).
    // Check values: B0 = 10.440 cm^-1 and B1 = 10.133 cm^-1 for H35Cl from Be = 10.5934,
    // αe = 0.3072 cm^-1 (K. P. Huber and G. Herzberg, Constants of Diatomic Molecules (1979),
    // from memory), De ≈ 5.3e-4 cm^-1. Tolerance: 3 reported σ (two-decimal data, σ = 0.05 cm^-1).
    const lower = ok(combinationDifferences(HCL, 'lower', { shape: 'linear' }));
    expect(lower.nPairs).toBe(8);
    expect(Math.abs(lower.B.value - 10.44) / lower.B.sigma!).toBeLessThan(3);
    expect(Math.abs(lower.DJ.value - 5.3e-4) / lower.DJ.sigma!).toBeLessThan(3);
    expect(lower.DJK).toEqual({ value: 0, sigma: 0, fixed: true });
    const upper = ok(combinationDifferences(HCL, 'upper', { shape: 'linear' }));
    expect(upper.nPairs).toBe(9);
    expect(Math.abs(upper.B.value - 10.133) / upper.B.sigma!).toBeLessThan(3);
    // R(0) − P(2) = 62.69 cm^-1 is the first ground-state difference Δ2F″(1) ≈ 6B″.
    expect(lower.pairs[0]).toMatchObject({ j: 1, k: 0, differenceCm1: expect.closeTo(62.69, 10) });
  });

  it('says DJK is fixed at 0 when every pair has K = 0', () => {
    const r = ok(combinationDifferences(HCL, 'lower', { shape: 'prolate' }));
    expect(r.DJK.fixed).toBe(true);
    expect(r.warnings[0]).toMatch(/All pairs have K = 0, so DJK cannot be determined/);
  });

  it('recovers B″, DJ″, DJK″ and B′, DJ′, DJK′ of a simulated perpendicular band (Coriolis cancels)', () => {
    // Round trip: invented prolate perpendicular band with ζ = 0.2375, seeded noise σ = 0.0005 cm^-1;
    // constants within 3.5 reported σ (see fitBand.test.ts for the choice of 3.5).
    const truth = inventedModel('prolate', 'perpendicular');
    const lines = simulatedLines(truth, 2000, 0.0005, 13);
    for (const state of ['lower', 'upper'] as const) {
      const r = ok(combinationDifferences(lines, state));
      const t = truth[state];
      expect(r.nPairs).toBeGreaterThan(100);
      expect(Math.abs(r.B.value - t.B) / r.B.sigma!).toBeLessThan(3.5);
      expect(Math.abs(r.DJ.value - t.DJ) / r.DJ.sigma!).toBeLessThan(3.5);
      expect(Math.abs(r.DJK.value - t.DJK) / r.DJK.sigma!).toBeLessThan(3.5);
      expect(Math.abs(r.sigmaW! - 1)).toBeLessThan(4 / Math.sqrt(2 * (r.nPairs - 3)));
    }
  });

  it('gives plot data Δ2F/(J+½) against (J+½)² for each pair', () => {
    const r = ok(combinationDifferences(HCL, 'lower', { shape: 'linear' }));
    for (const p of r.pairs) {
      expect(p.x).toBe((p.j + 0.5) ** 2);
      expect(p.y).toBeCloseTo(p.differenceCm1 / (p.j + 0.5), 12);
      expect(p.sigmaY).toBeCloseTo(p.sigmaCm1 / (p.j + 0.5), 12);
      expect(HCL[p.lineR].jUpper).toBe(p.j);
      expect(HCL[p.lineP].jUpper).toBe(p.j);
    }
  });

  it('names both lines of a pair that disagrees by more than 3σ', () => {
    const truth = inventedModel('prolate', 'parallel');
    const lines = simulatedLines(truth, 600, 0.0005, 21);
    const victim = lines.findIndex((l) => l.jUpper - l.jLower === 1 && l.kLower === 2 && l.jLower === 9);
    lines[victim] = { ...lines[victim], observedCm1: lines[victim].observedCm1 + 0.01 };
    const r = ok(combinationDifferences(lines, 'lower', { lineName: (i) => `row ${i}` }));
    const suspects = r.suspects.map((s) => r.pairs[s]);
    expect(suspects.length).toBeGreaterThan(0);
    expect(suspects.every((p) => p.lineR === victim || p.lineP === victim)).toBe(true);
    expect(r.warnings.join(' ')).toMatch(new RegExp(`row ${victim} and row \\d+ .*likely misassigned`));
  });

  it('ignores excluded lines', () => {
    const r = ok(
      combinationDifferences(
        HCL.map((l, i) => (i === 0 ? { ...l, isExcluded: true } : l)),
        'lower',
        { shape: 'linear' },
      ),
    );
    expect(r.nPairs).toBe(7);
  });

  it('refuses to mix ΔK = 0 and ΔK = ±1 lines', () => {
    const lines = [
      { jUpper: 5, kUpper: 2, jLower: 4, kLower: 1, observedCm1: 1, uncertaintyCm1: 1 },
      { jUpper: 5, kUpper: 1, jLower: 4, kLower: 1, observedCm1: 1, uncertaintyCm1: 1 },
    ];
    const o = combinationDifferences(lines, 'lower');
    expect(!o.ok && o.error).toMatchObject({ kind: 'bad-input', lineIndex: 1, message: expect.stringMatching(/cannot be mixed/) });
  });
});
