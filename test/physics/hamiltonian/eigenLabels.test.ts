import { describe, expect, it } from 'vitest';
import { eigenLabelsAssign } from '../../../src/physics/hamiltonian/eigenLabels';

describe('eigenLabelsAssign', () => {
  it('labels the identity by itself with weight 1', () => {
    const r = eigenLabelsAssign([1, 0, 0, 0, 1, 0, 0, 0, 1], 3);
    expect([...r.basisIndex]).toEqual([0, 1, 2]);
    expect([...r.weight]).toEqual([1, 1, 1]);
  });

  it('gives two different labels to two vectors whose largest component is the same basis function', () => {
    // Hand-worked weights |c|²: column 0 (0.64, 0.36, 0), column 1 (0.49, 0.09, 0.42), column 2 (0, 0, 1).
    // Columns 0 and 1 both peak on basis 0. Greedy by weight: (2, basis 2) = 1, then (0, basis 0) = 0.64,
    // then column 1 takes the only basis left, 1, with weight 0.09 (a label to flag as uncertain).
    const c3 = Math.sqrt(0.42);
    const v = [0.8, 0.6, 0, 0.7, -0.3, c3, 0, 0, 1];
    const r = eigenLabelsAssign(v, 3);
    expect([...r.basisIndex]).toEqual([0, 1, 2]);
    expect(r.weight[1]).toBeCloseTo(0.09, 12);
  });

  it('refuses a too-short coefficient array', () => {
    expect(() => eigenLabelsAssign([1, 0], 2)).toThrow(/need 4 coefficients/);
  });
});
