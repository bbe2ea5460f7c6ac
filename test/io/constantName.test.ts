import { describe, expect, it } from 'vitest';
import {
  constantDisplayUnit,
  constantKeysToNames,
  constantNameHtml,
  constantNameParts,
  constantNameText,
  constantToDisplayUnit,
} from '../../src/io/constantName';

// Notation: Herzberg, Molecular Spectra and Molecular Structure II (1945): ′ upper, ″ lower state,
// ν₀ band origin, D_J / D_JK / D_K centrifugal distortion, ζ Coriolis constant (from memory).
describe('constantNameText', () => {
  it('writes file keys as the trade writes the constants', () => {
    expect(constantNameText('upper.origin')).toBe('ν₀');
    expect(constantNameText('upper.B')).toBe('B′');
    expect(constantNameText('lower.A')).toBe('A″');
    expect(constantNameText('lower.DJ')).toBe('D_J″');
    expect(constantNameText('upper.DJK')).toBe('D_JK′');
    expect(constantNameText('lower.HK')).toBe('H_K″');
    expect(constantNameText('upper.zeta')).toBe('ζ');
    expect(constantNameText('upper.q')).toBe('q');
    expect(constantNameText('DK')).toBe('D_K');
  });
  it('names the constants of the effective Hamiltonians with their state primes', () => {
    // Notation: η_J, η_K, q_22, q_12 as in Papoušek and Aliev (1982) (from memory); ε for the ΔK = ±3 term.
    expect(constantNameText('upper.etaJ')).toBe('η_J′');
    expect(constantNameText('upper.q22')).toBe('q_22′');
    expect(constantNameText('lower.q12')).toBe('q_12″');
    expect(constantNameHtml('upper.eps3')).toBe('ε<sub>3</sub>′');
  });

  it('leaves an unknown key as it is', () => {
    expect(constantNameText('upper.X')).toBe('upper.X');
  });
});

describe('constantNameHtml and constantNameParts', () => {
  it('gives sub-scripted HTML and the parts', () => {
    expect(constantNameHtml('upper.DJK')).toBe('D<sub>JK</sub>′');
    expect(constantNameHtml('<b>')).toBe('&lt;b&gt;');
    expect(constantNameParts('lower.HKJ')).toEqual({ symbol: 'H', subscript: 'KJ', prime: '″', owner: '' });
  });
});

describe('names of the interaction, h3 and inversion constants and of system keys', () => {
  it('names the Coriolis and Fermi constants, h3 and the inversion expansion, with the state or interaction of a system key', () => {
    // Notation: C_1, C_2 for the Δk = ±1 and ∓2 Coriolis terms and W for Fermi, as physics/interaction/interactionTerms.ts names them.
    expect(constantNameText('v2v4.C1')).toBe('C_1 (v2v4)');
    expect(constantNameText('C1JJ')).toBe('C_1JJ');
    expect(constantNameText('LB-7/v2v4.C2K')).toBe('C_2K (LB-7/v2v4)');
    expect(constantNameText('dyad.Cz')).toBe('C_z (dyad)');
    expect(constantNameText('f.WK')).toBe('W_K (f)');
    expect(constantNameText('ground.h3')).toBe('h_3 (ground)');
    expect(constantNameText('v2v4.C4')).toBe('C_4 (v2v4)');
    expect(constantNameText('v2v4.C2JK')).toBe('C_2JK (v2v4)');
    expect(constantNameText('v2.eps')).toBe('ε (v2)');
    expect(constantNameText('upper.invB')).toBe('ΔB_inv′');
    expect(constantNameText('upper.invDJ')).toBe('ΔD_J,inv′');
    expect(constantNameText('upper.inv')).toBe('Δ_inv′');
    // A key that only looks like an inversion constant stays as it is.
    expect(constantNameText('upper.invX')).toBe('upper.invX');
    expect(constantNameParts('v4.q22')).toEqual({ symbol: 'q', subscript: '22', prime: '', owner: 'v4' });
    expect(constantNameHtml('a<b.C1')).toBe('C<sub>1</sub> (a&lt;b)');
  });
});

describe('constantKeysToNames', () => {
  it('replaces every key in a sentence and nothing else', () => {
    expect(constantKeysToNames('fix upper.DJK and lower.DK; upper.DJ is 40σ')).toBe('fix D_JK′ and D_K″; D_J′ is 40σ');
    expect(constantKeysToNames('upper.Bx stays, lower.HKJ too')).toBe('upper.Bx stays, H_KJ″ too');
  });
});

describe('constantDisplayUnit and constantToDisplayUnit', () => {
  it('converts every rotational constant, keeps ν₀ in cm⁻¹ and ζ without a unit', () => {
    // Ref: CODATA 2018, c = 299 792 458 m/s exactly, so 1 cm⁻¹ = 29 979.2458 MHz; tolerance: round-off.
    expect(constantToDisplayUnit('lower.B', 0.29135, 'MHz')).toBeCloseTo(0.29135 * 29979.2458, 6);
    expect(constantToDisplayUnit('upper.DJ', 3e-7, 'MHz')).toBeCloseTo(3e-7 * 29979.2458, 12);
    expect(constantToDisplayUnit('upper.origin', 1148.6, 'MHz')).toBe(1148.6);
    expect(constantToDisplayUnit('upper.zeta', 0.277, 'MHz')).toBe(0.277);
    expect(constantToDisplayUnit('lower.B', 0.29135, 'cm-1')).toBe(0.29135);
    expect([
      constantDisplayUnit('upper.origin', 'MHz'),
      constantDisplayUnit('upper.zeta', 'cm-1'),
      constantDisplayUnit('B', 'MHz'),
    ]).toEqual(['cm⁻¹', '', 'MHz']);
  });
});
