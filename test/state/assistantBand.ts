/**
 * An invented perpendicular band with a known truth for the assistant's tests (page and state):
 * the truth's lines drawn as Voigt profiles with seeded noise, a first-guess model a little off,
 * and a few true lines to seed a run. Not a real molecule.
 */
import type { Trace } from '../../src/io/trace';
import { bandLines } from '../../src/physics/bandLines';
import { stateConstantsFrom, type BandModel, type LineList } from '../../src/physics/model';
import { spectrumSynthesize } from '../../src/physics/spectrum';

/** The true constants (cm^-1, K). */
export function assistantBandTruth(): BandModel {
  return {
    shape: 'prolate',
    band: 'perpendicular',
    lower: stateConstantsFrom({ B: 0.2532, A: 4.105, DJ: 2.1e-7, DJK: 1.1e-6 }),
    upper: stateConstantsFrom({ origin: 1052.314, B: 0.2518, A: 4.071, zeta: 0.31, DJ: 2.0e-7, DJK: 1.2e-6 }),
    temperatureK: 150,
    jMax: 30,
    kMax: 5,
    spinWeights: [1],
  };
}

/** The first guess the page starts from: origin 0.03 cm^-1 high, B″ and B′ 0.1 % off, A′ 0.2 % off, ζ 2 % off. */
export function assistantBandGuess(): BandModel {
  const t = assistantBandTruth();
  return {
    ...t,
    lower: { ...t.lower, B: t.lower.B * 1.001 },
    upper: { ...t.upper, origin: t.upper.origin + 0.03, B: t.upper.B * 1.001, A: t.upper.A * 0.998, zeta: t.upper.zeta * 1.02 },
  };
}

/** Mulberry32 (seeded). */
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * Absorbance trace of the truth: Voigt profiles (60 amu, Lorentz HWHM 0.002 cm^-1) on a 0.0015 cm^-1
 * grid, strongest line 0.6, Gaussian noise σ = 0.002 (seeded).
 * @returns the trace, the truth's lines (intensity ≥ 0.005) and the noise σ
 */
export function assistantBandTrace(seed = 7): { trace: Trace; lines: LineList; noiseSigma: number } {
  const truth = assistantBandTruth();
  const lines = bandLines(truth, { minIntensity: 0.005 });
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < lines.count; i++) {
    lo = Math.min(lo, lines.wavenumberCm1[i]);
    hi = Math.max(hi, lines.wavenumberCm1[i]);
  }
  lo = Math.floor(lo - 1);
  hi = Math.ceil(hi + 1);
  const step = 0.0015;
  const n = Math.floor((hi - lo) / step) + 1;
  const y = spectrumSynthesize(
    lines,
    { fromCm1: lo, stepCm1: step, npoints: n },
    { temperatureK: 150, massAmu: 60, lorentzHwhmCm1: 0.002 },
  );
  let max = 0;
  for (const v of y) max = Math.max(max, v);
  const r = rng(seed);
  const noiseSigma = 0.002;
  const x = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    x[k] = lo + k * step;
    const g = Math.sqrt(-2 * Math.log(1 - r())) * Math.cos(2 * Math.PI * r());
    y[k] = (0.6 * y[k]) / max + noiseSigma * g;
  }
  return { trace: { wavenumberCm1: x, absorbance: y }, lines, noiseSigma };
}

/** Indices of the n strongest truth lines with K″ ≤ kMax (seeds a user would pick first). */
export function assistantBandStrongest(lines: LineList, n: number, kMax = 2): number[] {
  return Array.from({ length: lines.count }, (_, i) => i)
    .filter((i) => lines.kLower[i] <= kMax)
    .sort((a, b) => lines.intensity[b] - lines.intensity[a])
    .slice(0, n);
}
