import type { Assignment } from '../../src/fit/assignment';
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

/**
 * Invented C3v symmetric top for the several-band tests (constants made up; h3 exaggerated so the
 * K = 3 pairs split visibly): split K = 3 pairs (A1/A2), an E state carrying q22, a Coriolis pair
 * v3 ↔ v4 and a hot band from the E state.
 */
export const INVENTED_C3V_SPECIES = {
  name: 'LB-3v',
  shape: 'prolate',
  mass: 40,
  abundance: 1,
  pointGroup: 'C3v',
  spinWeightsBySymmetry: { A1: 4, A2: 4, E: 2 },
  states: {
    ground: { B: 0.2512, A: { value: 5.21, fixed: true }, DJ: 2.1e-7, DJK: 3.2e-6, DK: { value: 8e-5, fixed: true }, h3: 4e-8 },
    v3: { origin: 1021.35, B: 0.2497, A: { value: 5.19, fixed: true }, DJ: 2.1e-7, DJK: 3.2e-6 },
    v4: { origin: 1052.72, degenerate: true, B: 0.2503, A: 5.18, DJ: 2.1e-7, DJK: 3.2e-6, zeta: 0.071, q22: 3.5e-4 },
    v8: { origin: 2081.4, B: 0.2488, A: { value: 5.16, fixed: true }, DJ: 2.1e-7, DJK: 3.2e-6 },
  },
  bands: [
    { name: 'nu4', upper: 'v4', lower: 'ground', strength: 1 },
    { name: 'nu3', upper: 'v3', lower: 'ground', strength: 0.6 },
    // A hot band from the E state (a band with no single-band view), weak at 200 K.
    { name: 'hot', upper: 'v8', lower: 'v4', strength: 1 },
  ],
  interactions: [{ name: 'v3v4', type: 'coriolis', states: ['v3', 'v4'], constants: { C1: 0.12 } }],
};

/** Line i of a line list as a table row at its own position (σ 0.001 cm^-1), id as given. */
export function assignmentOfLine(
  lines: {
    jUpper: ArrayLike<number>;
    kUpper: ArrayLike<number>;
    jLower: ArrayLike<number>;
    kLower: ArrayLike<number>;
    wavenumberCm1: ArrayLike<number>;
  },
  i: number,
  id: string,
): Assignment {
  return {
    id,
    jUpper: lines.jUpper[i],
    kUpper: lines.kUpper[i],
    jLower: lines.jLower[i],
    kLower: lines.kLower[i],
    observedCm1: lines.wavenumberCm1[i],
    uncertaintyCm1: 0.001,
    isBlended: false,
    isExcluded: false,
    note: '',
  };
}
