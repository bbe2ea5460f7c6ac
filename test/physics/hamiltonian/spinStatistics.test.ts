import { describe, expect, it } from 'vitest';
import { nondegenerateStateLevels } from '../../../src/physics/hamiltonian/nondegenerateStateLevels';
import { levelSpinWeight, spinStatisticsSpeciesTable, type SpinStatistics } from '../../../src/physics/hamiltonian/spinStatistics';

/** CH3X (three spin-½ H) in C3v(M), per component function (convention of spinStatistics.ts). */
const CH3X: SpinStatistics = { kind: 'species', pointGroup: 'C3v', weights: { A1: 4, A2: 4, E: 2 } };
/** Planar XY3 with spin-0 Y (e.g. ¹¹BF3 without the B and F spins, or S¹⁶O3) in D3h(M): only A1 species occur. */
const XY3_SPIN0: SpinStatistics = {
  kind: 'species',
  pointGroup: 'D3h',
  weights: spinStatisticsSpeciesTable('D3h', { A1: 1, A2: 0, E: 0 }),
};

/** Sum of the level weights at (J, K), per k function (the K > 0 pair counts two functions). */
function weightPerFunction(stats: SpinStatistics, J: number, K: number, group: 'C3v' | 'D3h'): number {
  const levels = nondegenerateStateLevels(group === 'C3v' ? { B: 0.3, A: 5 } : { B: 0.3, C: 0.15 }, J, {
    shape: group === 'C3v' ? 'prolate' : 'oblate',
    pointGroup: group,
  }).levels;
  const sum = levels.filter((l) => l.K === K).reduce((s, l) => s + levelSpinWeight(stats, l), 0);
  return sum / (K > 0 ? 2 : 1);
}

describe('spinStatistics', () => {
  it('expands an unprimed D3h key to both primed species and refuses unknown or missing species', () => {
    expect(spinStatisticsSpeciesTable('D3h', { A1: 1, A2: 0, E: 0 })).toEqual({
      "A1'": 1,
      "A1''": 1,
      "A2'": 0,
      "A2''": 0,
      "E'": 0,
      "E''": 0,
    });
    expect(() => spinStatisticsSpeciesTable('C3v', { A1: 4, A2: 4, B1: 1, E: 2 })).toThrow(/"B1" is not a species of C3v/);
    expect(() => spinStatisticsSpeciesTable('C3v', { A1: 4, E: 2 })).toThrow(/no weight for A2/);
    expect(() => spinStatisticsSpeciesTable('C3v', { A1: -1, A2: 4, E: 2 })).toThrow(/finite number >= 0/);
    expect(() => spinStatisticsSpeciesTable('Td', { A1: 1 })).toThrow(/not supported/);
  });

  it('gives a CH3X top the old spinWeights [4, 2, 2] by K mod 3 (K = 3n : K ≠ 3n = 2 : 1)', () => {
    // Ref: Herzberg II (1945) ch. I sec. 3: for C3v XYZ3 with spin-½ Z, levels with K = 3n have twice the
    // statistical weight of those with K ≠ 3n (K > 0) — from memory; the project's demo model uses
    // spinWeights [4, 2, 2]. Exact small integers: compared exactly.
    const kMod: SpinStatistics = { kind: 'kMod', weights: [4, 2, 2] };
    for (const J of [0, 1, 2, 5, 9]) {
      for (let K = 0; K <= J; K++) {
        expect(weightPerFunction(CH3X, J, K, 'C3v')).toBe(weightPerFunction(kMod, J, K, 'C3v'));
        expect(weightPerFunction(CH3X, J, K, 'C3v')).toBe(K % 3 === 0 ? 4 : 2);
      }
    }
  });

  it('leaves a D3h XY3 with spin-0 Y only even J in K = 0, only K = 3n, and one of each K = 3n pair', () => {
    // Ref: Herzberg II (1945) ch. I sec. 3 (planar XY3, spin-0 Y: K = 0 levels with odd J and all K ≠ 3n
    // levels are missing) and Bunker and Jensen (1998) ch. 8 (only A1' and A1'' rovibronic species for
    // identical spin-0 bosons), both from memory.
    for (let J = 0; J <= 8; J++) {
      expect(weightPerFunction(XY3_SPIN0, J, 0, 'D3h')).toBe(J % 2 === 0 ? 1 : 0);
      for (let K = 1; K <= J; K++) expect(weightPerFunction(XY3_SPIN0, J, K, 'D3h')).toBe(K % 3 === 0 ? 0.5 : 0);
    }
  });

  it('counts an E level twice its per-function weight, and a kMod weight per function', () => {
    const e = nondegenerateStateLevels({}, 4, { shape: 'prolate', pointGroup: 'C3v' }).levels.find((l) => l.K === 1)!;
    expect(e.species).toBe('E');
    expect(levelSpinWeight(CH3X, e)).toBe(4);
    expect(levelSpinWeight({ kind: 'kMod', weights: [4, 2, 2] }, e)).toBe(4);
    expect(levelSpinWeight({ kind: 'kMod', weights: [4, 2, 2] }, { K: 3, species: 'A1', degeneracy: 1 })).toBe(4);
    expect(levelSpinWeight({ kind: 'kMod', weights: [4, 2, 2] }, { K: 3, species: 'A1' })).toBe(8);
  });
});
