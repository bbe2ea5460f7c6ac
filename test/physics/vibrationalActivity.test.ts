import { describe, expect, it } from 'vitest';
import { vibrationalActivity } from '../../src/physics/vibrationalActivity';

// Γ_vib of textbook molecules and their infrared-active fundamentals:
// Herzberg, Molecular Spectra and Molecular Structure II (1945), ch. II tables of fundamentals
// (CO2, H2O, NH3, BF3, CH4, C6H6), recalled; degrees of freedom 3N − 5 (linear) or 3N − 6 checked.
describe('vibrationalActivity', () => {
  it('gives a linear symmetric triatomic two infrared fundamentals and a bent one three', () => {
    const linear = vibrationalActivity('Dinfh', { 'Sigmag+': 1, 'Sigmau+': 1, Piu: 1 }); // CO2
    expect(linear.degreesOfFreedom).toBe(4); // 3·3 − 5
    expect(linear.infraredActive).toEqual({ parallel: 1, perpendicular: 1 });
    expect(linear.inactive).toBe(1);
    const bent = vibrationalActivity('C2v', { A1: 2, B2: 1 }); // H2O (B2 in the yz-plane convention)
    expect(bent.degreesOfFreedom).toBe(3); // 3·3 − 6
    expect(bent.infraredActiveTotal).toBe(3);
  });

  it('separates pyramidal (C3v) from planar (D3h) XY3', () => {
    const nh3 = vibrationalActivity('C3v', { A1: 2, E: 2 });
    expect(nh3.degreesOfFreedom).toBe(6);
    expect(nh3.infraredActive).toEqual({ parallel: 2, perpendicular: 2 });
    const planar = vibrationalActivity('D3h', { "A1'": 1, "A2''": 1, "E'": 2 }); // BF3
    expect(planar.degreesOfFreedom).toBe(6);
    expect(planar.infraredActive).toEqual({ parallel: 1, perpendicular: 2 });
    expect(planar.inactive).toBe(1);
  });

  it('gives CH4 two infrared fundamentals (F2) and benzene four', () => {
    const ch4 = vibrationalActivity('Td', { A1: 1, E: 1, F2: 2 });
    expect(ch4.degreesOfFreedom).toBe(9);
    expect(ch4.infraredActive).toEqual({ 'spherical-top': 2 });
    const benzene = vibrationalActivity('D6h', {
      A1g: 2,
      A2g: 1,
      B2g: 2,
      E1g: 1,
      E2g: 4,
      A2u: 1,
      B1u: 2,
      B2u: 2,
      E1u: 3,
      E2u: 2,
    });
    expect(benzene.fundamentals).toBe(20);
    expect(benzene.degreesOfFreedom).toBe(30); // 3·12 − 6
    expect(benzene.infraredActive).toEqual({ parallel: 1, perpendicular: 3 });
  });

  it('names an unknown species or a bad count', () => {
    expect(() => vibrationalActivity('Dinfh', { Sigma: 1 })).toThrow(/"Sigma" is not a species of Dinfh/);
    expect(() => vibrationalActivity('C3v', { A1: -1 })).toThrow(/whole number >= 0/);
    expect(() => vibrationalActivity('C3v', { F2: 1 })).toThrow(/not a species of C3v/);
  });
});
