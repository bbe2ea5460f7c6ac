/**
 * Test helpers (not a test file): seeded random numbers and simulated line lists with noise.
 */
import { bandLines } from '../../src/physics/bandLines';
import { stateConstantsFrom, type BandModel, type StateConstants } from '../../src/physics/model';
import type { FitLineInput } from '../../src/fit/fitTypes';

/** Mulberry32 generator: uniform in [0, 1), fully determined by the seed (common practice). */
export function seededUniform(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal deviates by the Box–Muller transform (Box & Muller, Ann. Math. Stat. 29, 610 (1958)). */
export function seededGaussian(seed: number): () => number {
  const u = seededUniform(seed);
  return () => {
    const u1 = 1 - u();
    const u2 = u();
    return Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2);
  };
}

/** An invented band model (fictitious molecule); constants in cm^-1. */
export function inventedModel(
  shape: BandModel['shape'],
  band: BandModel['band'],
  overrides: { lower?: Partial<StateConstants>; upper?: Partial<StateConstants>; jMax?: number; kMax?: number } = {},
): BandModel {
  const u = shape === 'prolate' ? 'A' : 'C';
  const lower: Partial<StateConstants> =
    shape === 'linear'
      ? { B: 0.3907, DJ: 1.3e-7 }
      : { B: 0.2958, [u]: shape === 'prolate' ? 2.913 : 0.1812, DJ: 2.7e-7, DJK: 1.6e-6, DK: shape === 'prolate' ? 4.1e-5 : -1.2e-6 };
  const upper: Partial<StateConstants> =
    shape === 'linear'
      ? { origin: 812.4375, B: 0.3891, DJ: 1.35e-7, q: band === 'perpendicular' ? 2.1e-4 : 0 }
      : {
          origin: 1234.5678,
          B: 0.2941,
          [u]: shape === 'prolate' ? 2.887 : 0.1805,
          DJ: 2.8e-7,
          DJK: 1.7e-6,
          DK: shape === 'prolate' ? 4.0e-5 : -1.1e-6,
          zeta: band === 'perpendicular' ? 0.2375 : 0,
        };
  return {
    shape,
    band,
    lower: stateConstantsFrom({ ...lower, ...overrides.lower }),
    upper: stateConstantsFrom({ ...upper, ...overrides.upper }),
    temperatureK: 250,
    jMax: overrides.jMax ?? 45,
    kMax: shape === 'linear' ? 0 : (overrides.kMax ?? 12),
    spinWeights: [1],
  };
}

/**
 * The `count` strongest lines of a model with Gaussian noise of σ = sigmaCm1 (seeded), each
 * carrying uncertainty sigmaCm1. Order: intensity descending, ties by J'', K'', J', K'.
 */
export function simulatedLines(model: BandModel, count: number, sigmaCm1: number, seed: number): FitLineInput[] {
  const l = bandLines(model);
  const order = Array.from({ length: l.count }, (_, i) => i).sort(
    (a, b) => l.intensity[b] - l.intensity[a] || l.jLower[a] - l.jLower[b] || l.kLower[a] - l.kLower[b] || l.jUpper[a] - l.jUpper[b],
  );
  const g = seededGaussian(seed);
  return order.slice(0, count).map((i) => ({
    jUpper: l.jUpper[i],
    kUpper: l.kUpper[i],
    jLower: l.jLower[i],
    kLower: l.kLower[i],
    observedCm1: l.wavenumberCm1[i] + sigmaCm1 * g(),
    uncertaintyCm1: sigmaCm1,
  }));
}

/** Copy of a model with some constants changed ("upper.B": x multiplies, "+upper.origin": x adds). */
export function perturbed(model: BandModel, changes: Record<string, number>): BandModel {
  const out: BandModel = { ...model, lower: { ...model.lower }, upper: { ...model.upper } };
  for (const [k, v] of Object.entries(changes)) {
    const add = k.startsWith('+');
    const [side, name] = (add ? k.slice(1) : k).split('.') as ['lower' | 'upper', keyof StateConstants];
    out[side][name] = add ? out[side][name] + v : out[side][name] * v;
  }
  return out;
}
