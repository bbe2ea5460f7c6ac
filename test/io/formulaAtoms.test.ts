import { describe, expect, it } from 'vitest';
import { formulaAtoms } from '../../src/io/formulaAtoms';
import { gammaVibParse } from '../../src/io/gammaVibParse';

describe('formulaAtoms', () => {
  it('refuses an empty formula and says where a formula stops reading', () => {
    expect(() => formulaAtoms('  ')).toThrow(/empty/);
    expect(() => formulaAtoms('CH3-F')).toThrow(/'-' at character 4/);
    expect(() => formulaAtoms('(CH3')).toThrow(/without '\)'/);
    expect(() => formulaAtoms('CH3)')).toThrow(/without '\('/);
  });

  it('counts atoms with counts and groups (hand-checked)', () => {
    expect(formulaAtoms('CH3F')).toEqual({ atoms: 5, elements: { C: 1, H: 3, F: 1 } });
    expect(formulaAtoms('SF6').atoms).toBe(7);
    expect(formulaAtoms('(CH3)3N')).toEqual({ atoms: 13, elements: { C: 3, H: 9, N: 1 } });
    expect(formulaAtoms('CH3CN').elements).toEqual({ C: 2, H: 3, N: 1 });
  });
});

describe('gammaVibParse', () => {
  it('refuses an empty or unreadable representation', () => {
    expect(() => gammaVibParse('')).toThrow(/empty/);
    expect(() => gammaVibParse('3A1 + ?')).toThrow(/"\?" does not read/);
  });

  it('reads sums and colon lists', () => {
    // CH3F (C3v): Γ_vib = 3A1 + 3E (Herzberg II (1945), from memory).
    expect(gammaVibParse('3A1 + 3E')).toEqual({ A1: 3, E: 3 });
    expect(gammaVibParse('A1:3, E:3')).toEqual({ A1: 3, E: 3 });
    expect(gammaVibParse("2A1' + A2'' + 2E'")).toEqual({ "A1'": 2, "A2''": 1, "E'": 2 });
  });
});
