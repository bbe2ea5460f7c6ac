/**
 * A trace simulated in memory from the built-in demo model, used when the demo files cannot be
 * fetched (so the page still opens onto something to assign).
 */
import type { Trace } from '../io/trace';
import { bandLines } from '../physics/bandLines';
import type { BandModel } from '../physics/model';
import { spectrumSynthesize } from '../physics/spectrum';

/** Mulberry32 pseudo-random generator (seeded, uniform on [0, 1)). Source: T. Ettinger, public-domain PRNG (2017), from memory. */
function mulberry32(seed: number): () => number {
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
 * Simulate an absorbance trace: Voigt lines of the model (Doppler at its temperature for massAmu,
 * Lorentz HWHM 0.003 cm^-1), strongest line at absorbance 0.8, Gaussian noise σ = 0.004 (Box–Muller,
 * seeded), on a grid of stepCm1 over the band plus 5 cm^-1.
 * @param model band model (cm^-1, K)
 * @param massAmu molecular mass, amu
 * @param stepCm1 grid step, cm^-1 @default 0.002
 */
export function demoFallbackTrace(model: BandModel, massAmu: number, stepCm1 = 0.002): Trace {
  const lines = bandLines(model, { minIntensity: 1e-4 });
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < lines.count; i++) {
    lo = Math.min(lo, lines.wavenumberCm1[i]);
    hi = Math.max(hi, lines.wavenumberCm1[i]);
  }
  lo = Math.floor(lo - 5);
  hi = Math.ceil(hi + 5);
  const npoints = Math.floor((hi - lo) / stepCm1) + 1;
  const y = spectrumSynthesize(
    lines,
    { fromCm1: lo, stepCm1, npoints },
    { temperatureK: model.temperatureK, massAmu, lorentzHwhmCm1: 0.003 },
  );
  let max = 0;
  for (let k = 0; k < npoints; k++) max = Math.max(max, y[k]);
  const rand = mulberry32(20240611);
  const x = new Float64Array(npoints);
  for (let k = 0; k < npoints; k++) {
    x[k] = lo + k * stepCm1;
    const g = Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());
    y[k] = (0.8 * y[k]) / max + 0.004 * g;
  }
  return { wavenumberCm1: x, absorbance: y };
}
