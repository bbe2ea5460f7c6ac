import { describe, expect, it } from 'vitest';
import {
  unitsAbsorbanceToTransmittance,
  unitsNmToCm1,
  unitsPercentTransmittanceToAbsorbance,
  unitsTransmittanceToAbsorbance,
  unitsUmToCm1,
} from '../../src/io/units';

describe('unitsUmToCm1 / unitsNmToCm1', () => {
  // Ref: ν̃ = 1/λ (IUPAC Green Book, Cohen et al. 2007, §2.7; from memory); 1 cm = 1e4 µm = 1e7 nm.
  // These quotients are exact in binary64, so the tolerance is zero.
  it('turns 10 µm into 1000 cm^-1 and 2.5 µm into 4000 cm^-1', () => {
    expect(unitsUmToCm1(10)).toBe(1000);
    expect(unitsUmToCm1(2.5)).toBe(4000);
  });
  it('turns 500 nm into 20000 cm^-1 and 2000 nm into 5000 cm^-1', () => {
    expect(unitsNmToCm1(500)).toBe(20000);
    expect(unitsNmToCm1(2000)).toBe(5000);
  });
  it('gives the same wavenumber for a wavelength in µm and the same wavelength in nm', () => {
    // 1 µm = 1000 nm; tolerance 1 ulp-scale (1e-12 relative) for the two roundings.
    for (const um of [1.3, 3.3, 7.77, 15.2]) expect(unitsNmToCm1(um * 1000)).toBeCloseTo(unitsUmToCm1(um), 9);
  });
});

describe('ordinate conversions', () => {
  // Ref: A = −log10 T, %T = 100 T (IUPAC Gold Book "absorbance"; from memory).
  it('maps T = 1, 0.1, 0.01 to A = 0, 1, 2', () => {
    expect(unitsTransmittanceToAbsorbance(1)).toBe(0);
    expect(unitsTransmittanceToAbsorbance(0.1)).toBeCloseTo(1, 15);
    expect(unitsTransmittanceToAbsorbance(0.01)).toBeCloseTo(2, 15);
  });
  it('maps 100 %T, 10 %T and 1 %T to A = 0, 1, 2', () => {
    expect(unitsPercentTransmittanceToAbsorbance(100)).toBe(0);
    expect(unitsPercentTransmittanceToAbsorbance(10)).toBeCloseTo(1, 15);
    expect(unitsPercentTransmittanceToAbsorbance(1)).toBeCloseTo(2, 15);
  });
  it('round-trips A → T → A to round-off over A in [−0.1, 6]', () => {
    // Tolerance 1e-13 absolute: log10 and pow each add a few ulp.
    for (let a = -0.1; a <= 6; a += 0.037) expect(unitsTransmittanceToAbsorbance(unitsAbsorbanceToTransmittance(a))).toBeCloseTo(a, 13);
  });
});
