import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { perturbationScan, perturbationSearch } from '../../src/analysis/perturbationScan';
import { fitBand } from '../../src/fit/fitBand';
import { levelTermValues } from '../../src/fit/levelTermValues';
import type { FitLineInput } from '../../src/fit/fitTypes';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';
import { inventedModel, simulatedLines } from '../fit/fitTestData';

/**
 * Shift of the lower member of an avoided crossing between a level E1 and a perturber E2 coupled by
 * W: E = (E1+E2)/2 − sign(E2−E1)·sqrt(((E1−E2)/2)² + W²) for the level that continues E1; its shift
 * from E1 changes sign where E2 − E1 does. Source: the two-level problem of quantum mechanics
 * (C. Cohen-Tannoudji, B. Diu, F. Laloë, Quantum Mechanics vol. 1 (1977), ch. IV, complement C_IV —
 * from memory); written here independently of the code under test.
 */
function crossingShift(e1: number, e2: number, w: number): number {
  const mean = (e1 + e2) / 2;
  const half = (e1 - e2) / 2;
  const root = Math.sqrt(half * half + w * w);
  return (e1 >= e2 ? mean + root : mean - root) - e1;
}

describe('perturbationScan', () => {
  it('finds nothing in an unperturbed band with noise (no false alarms at 5σ)', () => {
    const truth = inventedModel('prolate', 'parallel');
    const lines = simulatedLines(truth, 900, 0.0005, 11);
    const r = fitBand({ model: truth, floated: ['upper.origin', 'upper.B', 'upper.A', 'upper.DJ', 'lower.B', 'lower.DJ'], lines });
    if (!r.ok) throw new Error(r.error.message);
    const s = perturbationScan(levelTermValues(r.result, 'upper'));
    expect(s.nLevels).toBeGreaterThan(300);
    expect(s.findings).toEqual([]);
  });

  it("names the K' stack and the J' of a level crossing injected into one stack", () => {
    // Invented band; K' = 5 crosses a perturber of smaller effective B at J'c ≈ 24 (coupling W).
    const truth = inventedModel('prolate', 'parallel');
    const lines = simulatedLines(truth, 1200, 0.0005, 21);
    const kPert = 5;
    const w = 0.02; // cm^-1
    const slope = 0.003; // cm^-1 per unit of J(J+1): perturber's B is 0.003 lower
    const jCross = 24;
    const x0 = jCross * (jCross + 1) + 12; // the crossing lies between J' = 24 and 25
    const perturbed: FitLineInput[] = lines.map((l) => {
      if (l.kUpper !== kPert) return l;
      const x = l.jUpper * (l.jUpper + 1);
      // Level E1 relative to the perturber E2: E1 − E2 = slope·(x − x0).
      return { ...l, observedCm1: l.observedCm1 + crossingShift(slope * (x - x0), 0, w) };
    });
    const floated = ['upper.origin', 'upper.B', 'upper.A', 'upper.DJ', 'lower.B', 'lower.DJ'];
    const search = perturbationSearch({ model: truth, floated, lines: perturbed }, 'upper');
    if (!search.ok) throw new Error(search.error.message);
    const top = search.result.scan.findings[0];
    expect(top.k).toBe(kPert);
    // The largest shift sits next to the crossing (|E1 − E2| smallest at J' = 24 or 25).
    expect(Math.abs(top.jPeak - 24.5)).toBeLessThanOrEqual(1.5);
    const kFlagged = new Set(search.result.scan.findings.map((f) => f.k));
    expect([...kFlagged]).toEqual([kPert]);
    expect(search.result.scan.findings.some((f) => f.kind === 'local' && f.description.includes('changes sign'))).toBe(true);
  });

  it('rejects levels with a non-finite o − c or σ ≤ 0, naming the level', () => {
    const bad = [
      {
        state: 'upper' as const,
        j: 3,
        k: 1,
        component: 0,
        energyObsCm1: 1,
        energyCalcCm1: 1,
        obsMinusCalcCm1: NaN,
        sigmaCm1: 0.001,
        nLines: 1,
        spreadCm1: 0,
        reducedObsCm1: 0,
        reducedCalcCm1: 0,
      },
    ];
    expect(() => perturbationScan(bad)).toThrow(/J=3 K=1/);
    expect(perturbationScan([]).findings).toEqual([]);
  });

  it("points at the perturbed K' = 8 stack of CH3CN v4 = 1 in the published HITRAN 2012 lines", () => {
    // Ref: Rothman et al., JQSRT 130 (2013) 4–50 (HITRAN 2012), CH3CN ν4 lines; σ from the HITRAN
    // position-uncertainty code (code n: σ < 10^-(n−1) cm^-1, the upper bound of its range — HITRAN
    // documentation, Rothman et al. JQSRT 96 (2005) 139, table 5, from memory). Start values: ground
    // state B, DJ, DJK of CH3CN to about 1 % (from memory); A fixed (a parallel band fixes only A′ − A″).
    const rows = readFileSync(new URL('../fixtures/real/hitran2012/ch3cn_nu4_hitran2012.tsv', import.meta.url), 'utf8')
      .trim()
      .split('\n')
      .slice(1)
      .map((l) => l.split('\t'));
    const lines: FitLineInput[] = rows
      .filter((r) => Math.abs(+r[5]) === Math.abs(+r[9]))
      .map((r) => ({
        jUpper: +r[4],
        kUpper: Math.abs(+r[5]),
        jLower: +r[8],
        kLower: Math.abs(+r[9]),
        observedCm1: +r[0],
        uncertaintyCm1: 10 ** -(+r[12] - 1),
      }));
    expect(lines.length).toBe(1311);
    const model: BandModel = {
      shape: 'prolate',
      band: 'parallel',
      temperatureK: 296,
      jMax: 60,
      kMax: 25,
      spinWeights: [4, 2, 2],
      lower: stateConstantsFrom({ B: 0.3068, A: 5.27, DJ: 1.27e-7, DJK: 5.9e-6 }),
      upper: stateConstantsFrom({ origin: 920.29, B: 0.3062, A: 5.27, DJ: 1.27e-7, DJK: 5.9e-6 }),
    };
    const floated = [
      'upper.origin',
      'upper.B',
      'upper.A',
      'upper.DJ',
      'upper.DJK',
      'upper.DK',
      'upper.HJK',
      'lower.B',
      'lower.DJ',
      'lower.DJK',
      'lower.HJK',
    ];
    const search = perturbationSearch({ model, floated, lines }, 'upper');
    if (!search.ok) throw new Error(search.error.message);
    const { findings } = search.result.scan;
    // The single most significant finding is in K' = 8: its published J' = 8 level leaves the smooth
    // model by ~0.19 cm^-1, where the lines' stated uncertainty is ≤ 0.001 cm^-1.
    expect(findings[0].k).toBe(8);
    expect(Math.abs(findings[0].sizeCm1)).toBeGreaterThan(0.05);
    // Near J' ≈ 40 the K' = 7, 8 and 9 stacks all show a local shift: a perturber crossing there.
    for (const k of [7, 8, 9]) expect(findings.some((f) => f.kind === 'local' && f.k === k && f.jFrom <= 41 && f.jTo >= 38)).toBe(true);
    // Setting the perturbed levels aside lowers the rms of the fit.
    expect(search.result.rmsLastCm1).toBeLessThan(search.result.rmsFirstCm1);
  });
});
