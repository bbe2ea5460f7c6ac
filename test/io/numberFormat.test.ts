import { describe, expect, it } from 'vitest';
import { formatFixed, formatNumber, formatValueUncertainty, numberParts, superscriptInteger } from '../../src/io/numberFormat';

describe('formatValueUncertainty', () => {
  it('writes the GUM example m = 100.02147(35) g', () => {
    // Ref: JCGM 100:2008 (GUM) §7.2.2, example "m_S = 100,021 47(35) g" (u = 0.35 mg). Exact text.
    expect(formatValueUncertainty(100.02147, 0.00035)).toBe('100.02147(35)');
  });

  it('writes small constants with a power of ten and σ in the last digits (2.0921(51)×10⁻⁷)', () => {
    // Hand-checked: 2.0921e-7 ± 5.1e-10 = (2.0921 ± 0.0051)×10⁻⁷.
    expect(formatValueUncertainty(2.0921e-7, 5.1e-10)).toBe('2.0921(51)×10⁻⁷');
    expect(formatValueUncertainty(2.0921e-7, 5.1e-10, 'ascii')).toBe('2.0921(51)e-7');
    // Negative, with σ rounding up to two digits: 3.204e-6 ± 1.26e-8 → -3.204(13)×10⁻⁶.
    expect(formatValueUncertainty(-3.2041e-6, 1.26e-8)).toBe('-3.204(13)×10⁻⁶');
  });

  it('keeps ordinary magnitudes in decimal form', () => {
    expect(formatValueUncertainty(1148.6001234, 0.0000153)).toBe('1148.600123(15)');
    expect(formatValueUncertainty(0.29135, 0.0996)).toBe('0.29(10)');
    expect(formatValueUncertainty(1148.6, 12)).toBe('1149(12)');
  });

  it('uses a power of ten when σ reaches past the decimal point', () => {
    // 12345.6 ± 250: σ's two digits are hundreds and tens → (1.235 ± 0.025)×10⁴.
    expect(formatValueUncertainty(12345.6, 250)).toBe('1.235(25)×10⁴');
  });

  it('writes a σ larger than the value at the power of σ', () => {
    // 3e-9 ± 5.1e-8 = (0.3 ± 5.1)×10⁻⁸: the value is not significant, and says so by its digits.
    expect(formatValueUncertainty(3e-9, 5.1e-8)).toBe('0.3(51)×10⁻⁸');
    expect(formatValueUncertainty(-0.2, 3.3)).toBe('-0.2(33)');
  });

  it('never writes a signed zero', () => {
    expect(formatValueUncertainty(-1e-12, 1e-6)).toBe('0.0(10)×10⁻⁶');
    expect(formatValueUncertainty(-0.000001, 0.01)).toBe('0.000(10)');
    expect(formatValueUncertainty(-0, null)).toBe('0');
  });

  it('raises the power once when rounding reaches 10', () => {
    expect(formatValueUncertainty(9.99996e-7, 1e-10)).toBe('1.00000(10)×10⁻⁶');
  });

  it('gives the value alone when σ is missing, zero, negative or not finite', () => {
    expect(formatValueUncertainty(0.5, null)).toBe('0.5');
    expect(formatValueUncertainty(1 / 3, 0)).toBe('0.3333333333');
    expect(formatValueUncertainty(2.13475981901e-7, -1)).toBe('2.134759819×10⁻⁷');
    expect(formatValueUncertainty(2.5, NaN)).toBe('2.5');
  });

  it('says what a non-finite value is', () => {
    expect(formatValueUncertainty(NaN, 0.1)).toBe('NaN');
    expect(formatValueUncertainty(Infinity, null)).toBe('∞');
    expect(formatValueUncertainty(-Infinity, null)).toBe('-∞');
  });
});

describe('formatNumber', () => {
  it('never cuts off an exponent: 2.13475981901e-7 → 2.13475981901×10⁻⁷', () => {
    expect(formatNumber(2.13475981901e-7, 12)).toBe('2.13475981901×10⁻⁷');
  });
  it('handles huge and tiny exponents, negative values and zero', () => {
    expect(formatNumber(-6.02214076e23)).toBe('-6.02214076×10²³');
    expect(formatNumber(1.5e-300)).toBe('1.5×10⁻³⁰⁰');
    expect(formatNumber(0)).toBe('0');
    expect(formatNumber(1012.37)).toBe('1012.37');
    expect(formatNumber(0.001)).toBe('0.001');
    expect(formatNumber(999999.99999, 5)).toBe('1×10⁶');
  });
});

describe('numberParts', () => {
  it('gives mantissa, uncertainty digits and exponent separately', () => {
    expect(numberParts(2.0921e-7, 5.1e-10)).toEqual({ mantissa: '2.0921', uncertainty: '51', exponent: -7 });
    expect(numberParts(0.35, null)).toEqual({ mantissa: '0.35', uncertainty: null, exponent: 0 });
  });
});

describe('superscriptInteger and formatFixed', () => {
  it('writes superscript integers', () => {
    expect(superscriptInteger(-10)).toBe('⁻¹⁰');
    expect(superscriptInteger(23)).toBe('²³');
  });
  it('writes fixed decimals without "-0.00000"', () => {
    expect(formatFixed(-0.000001, 5)).toBe('0.00000');
    expect(formatFixed(-0.00001, 5)).toBe('-0.00001');
    expect(formatFixed(1148.123456, 5)).toBe('1148.12346');
  });
});
