import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { modelFileParse } from '../../../src/io/modelFile';
import { bandLines } from '../../../src/physics/bandLines';
import { SECOND_RADIATION_CM_K } from '../../../src/physics/constants';
import { lineDegeneracy } from '../../../src/physics/honlLondon';
import type { BandModel } from '../../../src/physics/model';
import { systemFromBandModel } from '../../../src/physics/system/systemFromBandModel';
import { systemLines } from '../../../src/physics/system/systemLines';
import type { SystemModel } from '../../../src/physics/system/systemModel';
import { vibrationalPartitionFunction, vibrationalPopulation } from '../../../src/physics/system/vibrationalPartition';

const fixture = (name: string): BandModel =>
  modelFileParse(readFileSync(new URL(`../../fixtures/models/${name}`, import.meta.url), 'utf8')).model;

function keyed(lines: { count: number; jUpper: Int32Array; kUpper: Int32Array; jLower: Int32Array; kLower: Int32Array }, i: number) {
  return `${lines.jUpper[i]},${lines.kUpper[i]},${lines.jLower[i]},${lines.kLower[i]}`;
}

describe('systemLines on a single-band model', () => {
  for (const name of ['parallel-oblate.json', 'perpendicular-prolate.json', 'perpendicular-linear.json']) {
    it(`reproduces bandLines for ${name} (same lines, positions and relative intensities to round-off)`, () => {
      const model = fixture(name);
      const old = bandLines(model);
      const neu = systemLines(systemFromBandModel(model));
      expect(neu.count).toBe(old.count);
      const byKey = new Map<string, number>();
      for (let i = 0; i < neu.count; i++) byKey.set(keyed(neu, i), i);
      expect(byKey.size).toBe(neu.count);
      let worstNu = 0;
      let worstI = 0;
      for (let i = 0; i < old.count; i++) {
        const j = byKey.get(keyed(old, i));
        expect(j, keyed(old, i)).toBeDefined();
        worstNu = Math.max(worstNu, Math.abs(neu.wavenumberCm1[j!] - old.wavenumberCm1[i]));
        worstI = Math.max(worstI, Math.abs(neu.intensity[j!] - old.intensity[i]));
        // bandLines gives the factor of one ±k component; systemLines the sum over both (lineDegeneracy).
        expect(neu.honlLondon[j!]).toBeCloseTo(old.honlLondon[i] * lineDegeneracy(model.band, old.kLower[i]), 12);
      }
      // Positions: the same arithmetic in the same order, so equal to the last bit.
      expect(worstNu).toBe(0);
      // Intensities: both normalised to the strongest line; the partition function and abundance
      // cancel up to double round-off (a few 1e-16 relative).
      expect(worstI).toBeLessThan(1e-13);
    });
  }
});

/** A fictitious C3v prolate top: ground, ν3 (A1), ν6 (E) and ν3+ν6 (E), hot band ν3+ν6 ← ν6. */
function hotBandSystem(zeta: number): SystemModel {
  const rot = { B: 0.44, A: 5.1, DJ: 6e-7, DJK: 4e-6, DK: 8e-5 };
  return {
    temperatureK: 296,
    jMax: 40,
    kMax: 12,
    species: [
      {
        name: 'X',
        shape: 'prolate',
        abundance: 1,
        spinWeights: [1],
        states: [
          { name: 'ground', isDegenerate: false, constants: { ...rot } },
          { name: 'v3', isDegenerate: false, constants: { ...rot, origin: 730 } },
          { name: 'v6', isDegenerate: true, constants: { ...rot, origin: 1010, zeta } },
          { name: 'v3v6', isDegenerate: true, constants: { ...rot, origin: 1740, zeta } },
        ],
        bands: [
          { name: 'nu3', upper: 'v3', lower: 'ground', strength: 1 },
          { name: 'hot', upper: 'v3v6', lower: 'v6', strength: 1 },
        ],
      },
    ],
  };
}

describe('systemLines across bands', () => {
  it('gives a hot band its Boltzmann factor g·exp(−c2 G″/T) relative to the cold band, with no hand factor', () => {
    // Harmonic picture (equal rotational constants, ζ = 0, hot-band origin = cold-band origin):
    // every hot-band line sits on a cold-band line, and the band ratio is the lower states' population
    // ratio g_v exp(−c2 G_v/T) with g_v = 2 for the degenerate v6.
    // Ref: Boltzmann distribution, Herzberg II (1945) ch. V; hot bands ch. IV (intensity ratio of a
    // hot band to its fundamental = population ratio of the lower levels when the transition moments are equal).
    const lines = systemLines(hotBandSystem(0));
    let cold = 0;
    let hot = 0;
    for (let i = 0; i < lines.count; i++) {
      if (lines.bandRefs[lines.bandIndex[i]].band === 'nu3') cold += lines.strength[i];
      else hot += lines.strength[i];
    }
    const expected = 2 * Math.exp((-SECOND_RADIATION_CM_K * 1010) / 296);
    // Tolerance: the J'' <= 40, K'' <= 12 truncation is the same in both bands, so only round-off remains.
    expect(hot / cold).toBeCloseTo(expected, 12);
    expect(Math.abs(hot / cold / expected - 1)).toBeLessThan(1e-12);
  });

  it('splits a degenerate lower state into (+l) and (−l) series with their Coriolis terms in both states', () => {
    // ΔK = 0, Δℓ = 0 between two degenerate states: a level (K, l) goes to (K, l); with ζ' = ζ'' and
    // A' = A'' the Coriolis terms −2AζKl cancel in the line position but not in the lower level energy.
    // Ref: Herzberg II (1945) ch. IV eq. (IV,45) (first-order Coriolis energy of a degenerate state).
    const zeta = 0.3;
    const lines = systemLines(hotBandSystem(zeta));
    const hotIndex = lines.bandRefs.findIndex((b) => b.band === 'hot');
    let plus = 0;
    let minus = 0;
    for (let i = 0; i < lines.count; i++) {
      if (lines.bandIndex[i] !== hotIndex) continue;
      expect(lines.lUpper[i]).toBe(lines.lLower[i]);
      expect(lines.deltaK[i]).toBe(0);
      if (lines.kLower[i] === 3 && lines.jLower[i] === 5 && lines.deltaJ[i] === 1) {
        const eRot = 0.44 * 30 + (5.1 - 0.44) * 9 - 6e-7 * 900 - 4e-6 * 30 * 9 - 8e-5 * 81;
        const coriolis = -2 * 5.1 * zeta * 3 * lines.lLower[i];
        expect(lines.eLowerCm1[i]).toBeCloseTo(1010 + eRot + coriolis, 9);
        if (lines.lLower[i] > 0) plus++;
        else minus++;
      }
    }
    expect([plus, minus]).toEqual([1, 1]);
  });

  it('places a perpendicular hot band from a nondegenerate excited state with the upper Coriolis term', () => {
    // ν3+ν6 ← ν3 (E ← A, lower state excited): ΔK = +1 reaches the (+l) levels at −2A′ζ′K′, ΔK = −1 the (−l)
    // levels at +2A′ζ′K′; the band origin is G′ − G″.
    // Ref: Herzberg II (1945) ch. IV eq. (IV,45) and the ΔK = ±1, Δℓ = ±1 (same sign) rule.
    const zeta = 0.3;
    const model = hotBandSystem(zeta);
    model.species[0].bands = [{ name: 'hot2', upper: 'v3v6', lower: 'v3', strength: 1 }];
    const lines = systemLines(model);
    const F = (J: number, K: number) =>
      0.44 * J * (J + 1) + (5.1 - 0.44) * K * K - 6e-7 * (J * (J + 1)) ** 2 - 4e-6 * J * (J + 1) * K * K - 8e-5 * K ** 4;
    let seen = 0;
    for (let i = 0; i < lines.count; i++) {
      if (lines.jLower[i] !== 8 || lines.kLower[i] !== 2 || lines.deltaJ[i] !== 1) continue;
      const kUp = lines.kUpper[i];
      const l = kUp > 2 ? 1 : -1;
      expect(lines.lUpper[i]).toBe(l);
      const expected = 1740 - 730 + F(9, kUp) - 2 * 5.1 * zeta * kUp * l - F(8, 2);
      // Tolerance: round-off of energies near 2000 cm^-1 (1e-9 cm^-1).
      expect(Math.abs(lines.wavenumberCm1[i] - expected)).toBeLessThan(1e-9);
      seen++;
    }
    expect(seen).toBe(2);
  });

  it('sums the vibrational partition function over the listed states with their degeneracies', () => {
    // Ref: Q_v = Σ g_v exp(−c2 G_v/T), Herzberg II (1945) ch. V (from memory).
    const q = vibrationalPartitionFunction(hotBandSystem(0).species[0], 296);
    const c = SECOND_RADIATION_CM_K / 296;
    expect(q).toBeCloseTo(1 + Math.exp(-c * 730) + 2 * Math.exp(-c * 1010) + 2 * Math.exp(-c * 1740), 14);
  });

  it('gives each state its Boltzmann fraction g exp(−c2 G/T)/Q_vib, summing to 1', () => {
    // Ref: Boltzmann distribution over vibrational states, Herzberg II (1945) ch. V.
    const species = hotBandSystem(0).species[0];
    const fractions = species.states.map((s) => vibrationalPopulation(species, s.name, 296));
    expect(fractions.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 14);
    expect(fractions[2] / fractions[0]).toBeCloseTo(2 * Math.exp((-SECOND_RADIATION_CM_K * 1010) / 296), 14);
  });

  it('scales an isotopologue by its abundance', () => {
    const one = hotBandSystem(0).species[0];
    const model: SystemModel = { ...hotBandSystem(0), species: [one, { ...one, name: 'Y', abundance: 0.32 }] };
    const lines = systemLines(model);
    let x = 0;
    let y = 0;
    for (let i = 0; i < lines.count; i++) {
      if (lines.bandRefs[lines.bandIndex[i]].species === 'X') x += lines.strength[i];
      else y += lines.strength[i];
    }
    // Same constants, so only the abundance differs (round-off tolerance).
    expect(y / x).toBeCloseTo(0.32, 13);
  });
});
