import { describe, expect, it } from 'vitest';
import { combinationHint } from '../../src/state/combinationHint';

// Pairing rule: Herzberg, Molecular Spectra and Molecular Structure II (1945), ch. IV, from memory:
// Δ₂F″(J) = R(J−1) − P(J+1) share the upper level; Δ₂F′(J) = R(J) − P(J) share the lower level.
const q = (jUpper: number, kUpper: number, jLower: number, kLower: number) => ({ jUpper, kUpper, jLower, kLower });

describe('combinationHint', () => {
  it('says that Q lines never pair and asks for the R and P sub-branches when only Q lines are assigned', () => {
    const t = combinationHint([q(5, 4, 5, 3), q(6, 4, 6, 3), q(5, 2, 5, 3)], 'lower');
    expect(t).toContain('Assigned now: 1 pQ, 2 rQ.');
    expect(t).toContain('Q lines never pair: assign the R and P sub-branches');
    expect(t).toMatch(/^A lower-state pair is an R line and a P line/);
  });
  it('names the missing partner sub-branch of each ΔK', () => {
    const t = combinationHint([q(6, 4, 5, 3), q(7, 4, 6, 3), q(4, 2, 5, 3)], 'upper');
    expect(t).toContain('Assign rP lines to pair with the 2 rR; pR lines to pair with the 1 pP.');
    expect(t).toMatch(/^An upper-state pair/);
  });
  it('says when nothing is assigned, and writes a linear molecule without ΔK letters', () => {
    expect(combinationHint([], 'lower')).toContain('Nothing is assigned yet.');
    expect(combinationHint([q(6, 0, 5, 0)], 'lower', true)).toContain('Assign P lines to pair with the 1 R.');
  });
});
