/**
 * Checks of the assignment benchmark's own physics (test/bench/assign/assignBenchBand.ts), which is
 * written apart from src/physics so that it can catch errors there.
 */
import { describe, expect, it } from 'vitest';
import { bandLines } from '../../src/physics/bandLines';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';
import { benchBand, benchLines, benchPseudoVoigt, type BenchTruth } from './assign/assignBenchBand';

describe('assignment benchmark generator', () => {
  it('gives the Voigt FWHM limits and the equal-width value of the pseudo-Voigt', () => {
    // Pure Gauss and pure Lorentz: the FWHM is the component's own (exact in TCH eq. 3).
    expect(benchPseudoVoigt(0.01, 0).fwhm).toBeCloseTo(0.01, 12);
    expect(benchPseudoVoigt(0, 0.01).fwhm).toBeCloseTo(0.01, 12);
    expect(benchPseudoVoigt(0, 0.01).eta).toBeCloseTo(1, 4);
    // Equal widths: Olivero & Longbothum, JQSRT 17, 233 (1977): f_V = 0.5346 f_L + sqrt(0.2166 f_L² + f_G²)
    // = 1.6376 f; TCH is quoted to ~1 % of the exact Voigt, so 0.5 % agreement is required.
    expect(benchPseudoVoigt(1, 1).fwhm / 1.6376).toBeCloseTo(1, 2);
  });

  it('puts every line where the project physics does, with the same relative intensities', () => {
    // Two implementations of the contract formulas (DEVELOPERS.md) must agree to round-off:
    // positions to 1e-9 cm^-1, intensities (normalised to the strongest) to 1e-9.
    for (const id of [0, 1, 2, 4, 5]) {
      const truth = benchBand(id, { jLimit: 30, kLimit: 8 }).truth;
      const model: BandModel = {
        shape: truth.shape,
        band: truth.band,
        lower: stateConstantsFrom(truth.lower),
        upper: stateConstantsFrom(truth.upper),
        temperatureK: truth.temperatureK,
        jMax: 30,
        kMax: 8,
        spinWeights: truth.spinWeights,
      };
      const ours = benchLines(truth, 30, 8);
      const max = Math.max(...ours.map((l) => l.area));
      const theirs = bandLines(model);
      const byKey = new Map<string, number>();
      for (let i = 0; i < theirs.count; i++)
        byKey.set(`${theirs.jUpper[i]},${theirs.kUpper[i]},${theirs.jLower[i]},${theirs.kLower[i]}`, i);
      for (const l of ours) {
        const i = byKey.get(`${l.jUpper},${l.kUpper},${l.jLower},${l.kLower}`);
        expect(i, `band ${id} line ${l.jUpper},${l.kUpper},${l.jLower},${l.kLower}`).toBeDefined();
        expect(Math.abs(theirs.wavenumberCm1[i!] - l.nuCm1)).toBeLessThan(1e-9);
        expect(Math.abs(theirs.intensity[i!] - l.area / max)).toBeLessThan(1e-9);
      }
    }
  });

  it('obeys the Hönl–London sum rule of a perpendicular band', () => {
    // Herzberg II (1945) eq. (IV,72): for a lower level J'', K'' > 0 the factors of all branches of both
    // ΔK = ±1 sum to 2(2J''+1) per ±k pair; at T → ∞ with unit ν-weighting the line strengths of one
    // lower level then sum to that. Checked with ν ≈ constant (B tiny, origin large), tolerance 1e-6.
    const truth: BenchTruth = {
      shape: 'prolate',
      band: 'perpendicular',
      lower: { B: 1e-6, A: 2e-6 },
      upper: { origin: 1000, B: 1e-6, A: 2e-6, zeta: 0 },
      temperatureK: 1e9,
      spinWeights: [1],
      massAmu: 30,
      lorentzHwhmCm1: 0.001,
    };
    const lines = benchLines(truth, 12, 5);
    const sumOf = (j: number, k: number) =>
      lines
        .filter((l) => l.jLower === j && l.kLower === k)
        .reduce((s, l) => s + l.area / (l.nuCm1 * (1 - Math.exp((-1.438776877 * l.nuCm1) / 1e9))), 0);
    for (const [j, k] of [
      [5, 2],
      [8, 5],
      [12, 1],
    ])
      expect(sumOf(j, k) / (2 * (2 * j + 1))).toBeCloseTo(1, 6);
  });
});
