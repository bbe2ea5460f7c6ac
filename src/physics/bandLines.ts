import { SECOND_RADIATION_CM_K } from './constants';
import { honlLondonFactor, lineDegeneracy } from './honlLondon';
import type { BandModel, LineList } from './model';
import { levelEnergy, upperLevelEnergy } from './termValues';

/** Options of bandLines. */
export interface BandLinesOptions {
  /**
   * Drop lines whose normalised intensity is below this (relative to the strongest = 1).
   * @default 0 (keep every allowed line)
   */
  minIntensity?: number;
}

/** Largest number of lines bandLines may allocate for (guards against absurd jMax/kMax). */
export const BAND_LINES_MAX = 5_000_000;

/**
 * Enumerate every allowed line of a band with its position and relative intensity.
 *
 * Selection rules: parallel ΔK = 0, ΔJ = 0, ±1, no Q line for K = 0; perpendicular ΔK = ±1,
 * ΔJ = 0, ±1, from K'' = 0 only ΔK = +1; J >= K in both states; J'' <= jMax, K'' <= kMax.
 * A linear molecule has K'' = 0 only (Σ–Σ parallel, Π–Σ perpendicular with K' = |l| = 1).
 * Lines are grouped by ΔK, then K'', then branch (P, Q, R), then J'' ascending.
 *
 * Intensity ∝ ν · n · g(K'') · HL · exp(−c2 E''/T) · (1 − exp(−c2 ν/T)), normalised so the strongest
 * line is 1; n = lineDegeneracy, g the nuclear-spin weight, HL = honlLondonFactor.
 * Lines at non-positive wavenumber (only for unphysical models) are dropped.
 * Source: Herzberg II (1945) ch. IV for the selection rules and intensity expression; the Boltzmann
 * factor with c2 = hc/k (CODATA 2018).
 * @param model band model (cm^-1, K)
 * @returns columnar line list. WARNING: the columns are views on larger buffers (no copy is made);
 *   slice them before transferring the buffers to a worker if memory matters.
 */
export function bandLines(model: BandModel, options: BandLinesOptions = {}): LineList {
  checkModel(model);
  const { jMax, band, shape, lower, spinWeights } = model;
  const kMax = shape === 'linear' ? 0 : Math.min(model.kMax, jMax);
  const nDeltaK = band === 'parallel' ? 1 : 2;
  const capacity = (kMax + 1) * nDeltaK * 3 * (jMax + 1);
  if (capacity > BAND_LINES_MAX) {
    throw new Error(`bandLines: jMax=${jMax} and kMax=${kMax} would give up to ${capacity} lines, more than ${BAND_LINES_MAX}`);
  }
  const jUp = new Int32Array(capacity);
  const kUp = new Int32Array(capacity);
  const jLo = new Int32Array(capacity);
  const kLo = new Int32Array(capacity);
  const dK = new Int8Array(capacity);
  const dJ = new Int8Array(capacity);
  const nu = new Float64Array(capacity);
  const inten = new Float64Array(capacity);
  const eLo = new Float64Array(capacity);
  const hl = new Float64Array(capacity);

  const c2OverT = SECOND_RADIATION_CM_K / model.temperatureK;
  const nWeights = spinWeights.length;
  const deltaKs = band === 'parallel' ? [0] : [1, -1];
  // Per (ΔK, K'') block: lower energies and Boltzmann weights per J'', upper energies per J' (for
  // the P/R and Q parities separately, which differ only for a linear Π state's l-doubling).
  const lowerE = new Float64Array(jMax + 1);
  const lowerPop = new Float64Array(jMax + 1);
  const upperEPR = new Float64Array(jMax + 2);
  const upperEQ = new Float64Array(jMax + 2);
  const upperPopPR = new Float64Array(jMax + 2);
  const upperPopQ = new Float64Array(jMax + 2);
  const isLinearPerp = shape === 'linear' && band === 'perpendicular';
  let n = 0;
  let maxI = 0;
  for (const deltaK of deltaKs) {
    for (let K = 0; K <= kMax; K++) {
      if (deltaK === -1 && K === 0) continue;
      const kUpper = shape === 'linear' ? (band === 'perpendicular' ? 1 : 0) : K + deltaK;
      const signK = shape === 'linear' ? kUpper : deltaK;
      const weight = spinWeights[K % nWeights];
      if (weight === 0) continue;
      const prefactor = weight * lineDegeneracy(band, K);
      for (let J = K; J <= jMax; J++) {
        const e = levelEnergy(lower, shape, J, K);
        lowerE[J] = e;
        lowerPop[J] = Math.exp(-c2OverT * e);
      }
      for (let J = kUpper; J <= jMax + 1; J++) {
        upperEPR[J] = upperLevelEnergy(model, J, kUpper, signK, 1);
        upperEQ[J] = isLinearPerp ? upperLevelEnergy(model, J, kUpper, signK, 0) : upperEPR[J];
        upperPopPR[J] = Math.exp(-c2OverT * upperEPR[J]);
        upperPopQ[J] = isLinearPerp ? Math.exp(-c2OverT * upperEQ[J]) : upperPopPR[J];
      }
      const hlK = isLinearPerp ? 0 : K;
      const hlDeltaK = isLinearPerp ? 1 : deltaK;
      for (let deltaJ = -1; deltaJ <= 1; deltaJ++) {
        const upperE = deltaJ === 0 ? upperEQ : upperEPR;
        const upperPop = deltaJ === 0 ? upperPopQ : upperPopPR;
        for (let J = Math.max(K, kUpper - deltaJ); J <= jMax; J++) {
          const factor = honlLondonFactor(J, hlK, deltaJ, hlDeltaK);
          if (factor <= 0) continue;
          const jUpper = J + deltaJ;
          const eLower = lowerE[J];
          const wavenumber = upperE[jUpper] - eLower;
          if (!(wavenumber > 0)) continue;
          // exp(−c2E''/T)(1 − exp(−c2ν/T)) = exp(−c2E''/T) − exp(−c2E'/T): two exponentials per level
          // instead of one per line; below x = c2ν/T = 0.01 the difference cancels, so use expm1.
          const x = c2OverT * wavenumber;
          const boltzmann = x < 1e-2 ? lowerPop[J] * -Math.expm1(-x) : lowerPop[J] - upperPop[jUpper];
          const intensity = prefactor * wavenumber * factor * boltzmann;
          jUp[n] = jUpper;
          kUp[n] = kUpper;
          jLo[n] = J;
          kLo[n] = K;
          dK[n] = kUpper - K;
          dJ[n] = deltaJ;
          nu[n] = wavenumber;
          inten[n] = intensity;
          eLo[n] = eLower;
          hl[n] = factor;
          if (intensity > maxI) maxI = intensity;
          n++;
        }
      }
    }
  }
  // Divide rather than multiply by 1/maxI so the strongest line comes out exactly 1.
  const scale = maxI > 0 ? maxI : Infinity;
  const cut = options.minIntensity ?? 0;
  let m = 0;
  for (let i = 0; i < n; i++) {
    const rel = inten[i] / scale;
    if (rel < cut) continue;
    jUp[m] = jUp[i];
    kUp[m] = kUp[i];
    jLo[m] = jLo[i];
    kLo[m] = kLo[i];
    dK[m] = dK[i];
    dJ[m] = dJ[i];
    nu[m] = nu[i];
    inten[m] = rel;
    eLo[m] = eLo[i];
    hl[m] = hl[i];
    m++;
  }
  return {
    count: m,
    jUpper: jUp.subarray(0, m),
    kUpper: kUp.subarray(0, m),
    jLower: jLo.subarray(0, m),
    kLower: kLo.subarray(0, m),
    deltaK: dK.subarray(0, m),
    deltaJ: dJ.subarray(0, m),
    wavenumberCm1: nu.subarray(0, m),
    intensity: inten.subarray(0, m),
    eLowerCm1: eLo.subarray(0, m),
    honlLondon: hl.subarray(0, m),
  };
}

function checkModel(model: BandModel): void {
  const { jMax, kMax, temperatureK, spinWeights } = model;
  if (!Number.isInteger(jMax) || jMax < 0) throw new Error(`bandLines: jMax must be an integer >= 0, got ${jMax}`);
  if (!Number.isInteger(kMax) || kMax < 0) throw new Error(`bandLines: kMax must be an integer >= 0, got ${kMax}`);
  if (!(temperatureK > 0) || !Number.isFinite(temperatureK)) {
    throw new Error(`bandLines: temperatureK must be a finite number > 0, got ${temperatureK}`);
  }
  if (spinWeights.length === 0 || spinWeights.some((w) => !(w >= 0) || !Number.isFinite(w))) {
    throw new Error(`bandLines: spinWeights must be a non-empty list of finite numbers >= 0, got [${spinWeights.join(', ')}]`);
  }
  for (const side of ['lower', 'upper'] as const) {
    for (const [name, value] of Object.entries(model[side])) {
      if (!Number.isFinite(value)) throw new Error(`bandLines: ${side}.${name} must be finite, got ${value}`);
    }
  }
}
