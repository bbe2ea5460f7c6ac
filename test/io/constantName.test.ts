import { describe, expect, it } from 'vitest';
import { constantKeysToNames, constantNameHtml, constantNameParts, constantNameText } from '../../src/io/constantName';

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
  it('leaves an unknown key as it is', () => {
    expect(constantNameText('upper.X')).toBe('upper.X');
  });
});

describe('constantNameHtml and constantNameParts', () => {
  it('gives sub-scripted HTML and the parts', () => {
    expect(constantNameHtml('upper.DJK')).toBe('D<sub>JK</sub>′');
    expect(constantNameHtml('<b>')).toBe('&lt;b&gt;');
    expect(constantNameParts('lower.HKJ')).toEqual({ symbol: 'H', subscript: 'KJ', prime: '″' });
  });
});

describe('constantKeysToNames', () => {
  it('replaces every key in a sentence and nothing else', () => {
    expect(constantKeysToNames('fix upper.DJK and lower.DK; upper.DJ is 40σ')).toBe('fix D_JK′ and D_K″; D_J′ is 40σ');
    expect(constantKeysToNames('upper.Bx stays, lower.HKJ too')).toBe('upper.Bx stays, H_KJ″ too');
  });
});
