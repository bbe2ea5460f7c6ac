/** Small invented band and a synthetic trace of it, shared by the state tests. */
import type { Trace } from '../../src/io/trace';
import { bandLines } from '../../src/physics/bandLines';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';
import { spectrumSynthesize } from '../../src/physics/spectrum';

/** Invented prolate top, perpendicular band at 1000 cm^-1 (not a real molecule). */
export function smallModel(): BandModel {
  return {
    shape: 'prolate',
    band: 'perpendicular',
    lower: stateConstantsFrom({ B: 0.3, A: 5, DJ: 2e-7 }),
    upper: stateConstantsFrom({ origin: 1000, B: 0.298, A: 4.97, zeta: 0.25, DJ: 2e-7 }),
    temperatureK: 200,
    jMax: 12,
    kMax: 3,
    spinWeights: [1],
  };
}

/**
 * Noise-free absorbance of the model (Voigt, 50 amu, Lorentz HWHM 0.002 cm^-1, strongest line 0.5)
 * on a 0.001 cm^-1 grid. Returns the trace and the lines it was made from.
 */
export function smallTrace(model: BandModel = smallModel()): { trace: Trace; lines: ReturnType<typeof bandLines> } {
  const lines = bandLines(model, { minIntensity: 0.02 });
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < lines.count; i++) {
    lo = Math.min(lo, lines.wavenumberCm1[i]);
    hi = Math.max(hi, lines.wavenumberCm1[i]);
  }
  lo = Math.floor(lo - 1);
  hi = Math.ceil(hi + 1);
  const step = 0.001;
  const n = Math.floor((hi - lo) / step) + 1;
  const y = spectrumSynthesize(
    lines,
    { fromCm1: lo, stepCm1: step, npoints: n },
    { temperatureK: 200, massAmu: 50, lorentzHwhmCm1: 0.002 },
  );
  let max = 0;
  for (const v of y) max = Math.max(max, v);
  const x = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    x[k] = lo + k * step;
    y[k] = (0.5 * y[k]) / max;
  }
  return { trace: { wavenumberCm1: x, absorbance: y }, lines };
}
