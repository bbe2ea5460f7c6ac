import { describe, expect, it } from 'vitest';
import {
  ATOMIC_MASS_KG,
  BOLTZMANN_J_PER_K,
  MHZ_PER_CM1,
  PLANCK_J_S,
  SECOND_RADIATION_CM_K,
  SPEED_OF_LIGHT_CM_PER_S,
  SPEED_OF_LIGHT_M_PER_S,
  mhzToWavenumber,
  wavenumberToMhz,
} from '../../src/physics/constants';

// Ref: E. Tiesinga, P. J. Mohr, D. B. Newell, B. N. Taylor, "CODATA recommended values of the
// fundamental physical constants: 2018", Rev. Mod. Phys. 93, 025010 (2021), Table XXXI (values
// written out here from that table; c, h, k exact in the 2019 SI).
const CODATA_2018 = {
  cMPerS: 299_792_458,
  hJS: 6.626_070_15e-34,
  kJPerK: 1.380_649e-23,
  muKg: 1.660_539_066_60e-27,
  muKgStdUncertainty: 0.000_000_000_50e-27,
  c2MK: 1.438_776_877e-2, // printed as 1.438 776 877... × 10^-2 m K (exact, truncated in the table)
};

describe('constants (CODATA 2018)', () => {
  it('holds the exact SI values of c, h and k', () => {
    expect(SPEED_OF_LIGHT_M_PER_S).toBe(CODATA_2018.cMPerS);
    expect(SPEED_OF_LIGHT_CM_PER_S).toBe(CODATA_2018.cMPerS * 100);
    expect(PLANCK_J_S).toBe(CODATA_2018.hJS);
    expect(BOLTZMANN_J_PER_K).toBe(CODATA_2018.kJPerK);
  });

  it('holds the atomic mass constant within its CODATA standard uncertainty', () => {
    expect(Math.abs(ATOMIC_MASS_KG - CODATA_2018.muKg)).toBeLessThanOrEqual(CODATA_2018.muKgStdUncertainty);
  });

  it('has c2 equal to hc/k computed from the exact constants', () => {
    const c2FromRatioCmK = (CODATA_2018.hJS * CODATA_2018.cMPerS * 100) / CODATA_2018.kJPerK;
    // The stored c2 has 10 significant digits (as the CODATA table prints it): relative tol 1e-9.
    expect(Math.abs(SECOND_RADIATION_CM_K / c2FromRatioCmK - 1)).toBeLessThan(1e-9);
    expect(Math.abs(SECOND_RADIATION_CM_K - CODATA_2018.c2MK * 100)).toBeLessThan(1e-12);
  });

  it('converts 1 cm^-1 to 29 979.2458 MHz and back', () => {
    // 1 cm^-1 ↔ c/(1 cm) = 29 979.2458 MHz exactly (c exact). Tol: double rounding, 1e-12 relative.
    expect(MHZ_PER_CM1).toBeCloseTo(29_979.2458, 9);
    expect(wavenumberToMhz(1)).toBeCloseTo(29_979.2458, 9);
    expect(mhzToWavenumber(29_979.2458)).toBeCloseTo(1, 12);
    for (const x of [0, 1e-6, 0.851_794, 5.182, 1234.5678]) {
      expect(Math.abs(mhzToWavenumber(wavenumberToMhz(x)) - x)).toBeLessThanOrEqual(1e-15 * Math.max(1, x));
    }
  });
});
