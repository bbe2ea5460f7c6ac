/**
 * A synthetic perpendicular band for the assistant tests: truth lines from bandLines, a trace from
 * spectrumSynthesize with seeded white noise, its peaks from peaksFind, and a first-guess model
 * with deliberate errors. Invented constants (no real molecule). Test helper, not part of the product.
 */
import { peakProminence, type LocalMaxima } from '../../src/analysis/peakProminence';
import { peaksFind, type PeakList } from '../../src/analysis/peaksFind';
import type { Trace } from '../../src/io/trace';
import { bandLines } from '../../src/physics/bandLines';
import { stateConstantsFrom, type BandModel, type LineList } from '../../src/physics/model';
import { spectrumSynthesize } from '../../src/physics/spectrum';
import { randomNormal, randomSeeded } from './syntheticTrace';

/** Invented prolate top, perpendicular band (constants in cm^-1, ζ dimensionless). */
export function syntheticTruthModel(): BandModel {
  return {
    shape: 'prolate',
    band: 'perpendicular',
    lower: stateConstantsFrom({ B: 0.4187, A: 3.412, DJ: 4.1e-7, DJK: 3.3e-6, DK: 2.2e-5 }),
    upper: stateConstantsFrom({ origin: 1387.452, B: 0.4162, A: 3.376, DJ: 4.0e-7, DJK: 3.1e-6, DK: 2.1e-5, zeta: 0.213 }),
    temperatureK: 250,
    jMax: 40,
    kMax: 8,
    spinWeights: [1],
  };
}

/**
 * Invented prolate top, parallel band (no real molecule; cm^-1). A′ − A″ = −0.012 and B′ − B″ =
 * −0.003 put K = 3 about 0.08 cm^-1 (≈ 9 line widths of the synthetic trace) from K = 0 in every
 * cluster, so the K components are resolved but lie within a few widths of each other.
 */
export function syntheticParallelTruthModel(): BandModel {
  return {
    shape: 'prolate',
    band: 'parallel',
    lower: stateConstantsFrom({ B: 0.352, A: 2.81, DJ: 3e-7, DJK: 2e-6 }),
    upper: stateConstantsFrom({ origin: 1043.27, B: 0.349, A: 2.798, DJ: 3e-7, DJK: 2e-6 }),
    temperatureK: 120,
    jMax: 30,
    kMax: 8,
    spinWeights: [1],
  };
}

/** The band's trace, peaks and truth. */
export interface SyntheticBand {
  truth: BandModel;
  lines: LineList;
  trace: Trace;
  peaks: PeakList;
  /** Noise 1σ, absorbance. */
  noiseSigma: number;
  /** Noise-free absorbance at each truth line's centre (same order as lines). */
  heightAtLine: Float64Array;
  /** Noise-free absorbance on the trace grid. */
  cleanAbsorbance: Float64Array;
  /** Voigt FWHM of the lines, cm^-1 (Olivero–Longbothum at the band centre). */
  fwhmCm1: number;
}

/** Mass (amu), Lorentz HWHM (cm^-1) and grid step (cm^-1) of the synthetic trace. */
export const SYNTHETIC_MASS_AMU = 46;
export const SYNTHETIC_LORENTZ_HWHM_CM1 = 0.004;
export const SYNTHETIC_STEP_CM1 = 0.003;

/**
 * Synthesize the band: absorbance scaled so the tallest point is 1, plus white noise of σ = noise.
 * @param truth model of the truth
 * @param noise noise 1σ (absorbance)
 * @param seed noise seed
 */
export function syntheticBand(truth: BandModel, noise: number, seed: number): SyntheticBand {
  const lines = bandLines(truth);
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < lines.count; i++) {
    lo = Math.min(lo, lines.wavenumberCm1[i]);
    hi = Math.max(hi, lines.wavenumberCm1[i]);
  }
  const from = Math.floor(lo - 1);
  const npoints = Math.round((Math.ceil(hi + 1) - from) / SYNTHETIC_STEP_CM1) + 1;
  const opts = { temperatureK: truth.temperatureK, massAmu: SYNTHETIC_MASS_AMU, lorentzHwhmCm1: SYNTHETIC_LORENTZ_HWHM_CM1 };
  const y = spectrumSynthesize(lines, { fromCm1: from, stepCm1: SYNTHETIC_STEP_CM1, npoints }, opts);
  let yMax = 0;
  for (const v of y) yMax = Math.max(yMax, v);
  const rand = randomSeeded(seed);
  const x = new Float64Array(npoints);
  const a = new Float64Array(npoints);
  for (let k = 0; k < npoints; k++) {
    x[k] = from + k * SYNTHETIC_STEP_CM1;
    a[k] = y[k] / yMax + noise * randomNormal(rand);
  }
  // Noise-free height at each line centre: the line's own peak plus its neighbours' overlap.
  const heightAtLine = new Float64Array(lines.count);
  for (let i = 0; i < lines.count; i++) {
    const k = (lines.wavenumberCm1[i] - from) / SYNTHETIC_STEP_CM1;
    const k0 = Math.floor(k);
    const t = k - k0;
    heightAtLine[i] = ((1 - t) * y[k0] + t * y[Math.min(k0 + 1, npoints - 1)]) / yMax;
  }
  // Doppler HWHM α = ν/c √(2 ln2 kT/m); Voigt FWHM by Olivero & Longbothum (1977).
  const nu = truth.upper.origin;
  const alpha = (nu / 299792458) * Math.sqrt((2 * Math.LN2 * 1.380649e-23 * truth.temperatureK) / (SYNTHETIC_MASS_AMU * 1.6605390666e-27));
  const fL = 2 * SYNTHETIC_LORENTZ_HWHM_CM1;
  const fG = 2 * alpha;
  const fwhmCm1 = 0.5346 * fL + Math.sqrt(0.2166 * fL * fL + fG * fG);
  const trace = { wavenumberCm1: x, absorbance: a };
  const cleanAbsorbance = Float64Array.from(y, (v) => v / yMax);
  const peaks = peaksFind(trace, { minSnr: 5 });
  return { truth, lines, trace, peaks, noiseSigma: noise, heightAtLine, cleanAbsorbance, fwhmCm1 };
}

/** Index order of the truth lines by position. */
function byPosition(lines: LineList): Int32Array {
  return Int32Array.from({ length: lines.count }, (_, i) => i).sort((a, b) => lines.wavenumberCm1[a] - lines.wavenumberCm1[b]);
}

/**
 * Truth lines that a careful person could assign: the noise-free spectrum has a maximum within a
 * quarter FWHM of the line that is ≥ minSnr·σ high and stands ≥ minSnr/2·σ above its
 * surroundings (its peak stands; a shoulder on a stronger line does not), and no other line of at
 * least `comparable` × its intensity lies within one FWHM.
 */
export function syntheticAssignable(band: SyntheticBand, minSnr = 20, comparable = 0.3): number[] {
  const { lines } = band;
  const order = byPosition(lines);
  const maxima = peakProminence(band.cleanAbsorbance);
  const out: number[] = [];
  for (let s = 0; s < order.length; s++) {
    const i = order[s];
    if (band.heightAtLine[i] < minSnr * band.noiseSigma) continue;
    if (
      !hasMaximumNear(band, maxima, lines.wavenumberCm1[i], 0.25 * band.fwhmCm1, minSnr * band.noiseSigma, 0.5 * minSnr * band.noiseSigma)
    )
      continue;
    let ok = true;
    for (let t = s - 1; t >= 0 && lines.wavenumberCm1[i] - lines.wavenumberCm1[order[t]] < band.fwhmCm1; t--) {
      if (lines.intensity[order[t]] >= comparable * lines.intensity[i]) ok = false;
    }
    for (let t = s + 1; t < order.length && lines.wavenumberCm1[order[t]] - lines.wavenumberCm1[i] < band.fwhmCm1; t++) {
      if (lines.intensity[order[t]] >= comparable * lines.intensity[i]) ok = false;
    }
    if (ok) out.push(i);
  }
  return out;
}

/**
 * Whether the noise-free spectrum has a local maximum within ±half of x (cm^-1) that is at least
 * minHeight high and stands at least minProminence above its surroundings (SciPy prominence).
 */
function hasMaximumNear(
  band: SyntheticBand,
  maxima: LocalMaxima,
  xCm1: number,
  half: number,
  minHeight: number,
  minProminence: number,
): boolean {
  const x = band.trace.wavenumberCm1;
  const y = band.cleanAbsorbance;
  for (let m = 0; m < maxima.count; m++) {
    const k = maxima.index[m];
    if (Math.abs(x[k] - xCm1) > half + (x[1] - x[0])) continue;
    if (y[k] >= minHeight && maxima.prominence[m] >= minProminence) return true;
  }
  return false;
}

/**
 * Whether an assignment of these quanta at `observedCm1` is right: the truth line lies within
 * half a FWHM of the observed position and carries at least a quarter of the intensity of the
 * strongest truth line within that half width (so it makes a real part of the peak).
 */
export function syntheticIsCorrect(
  band: SyntheticBand,
  q: { jUpper: number; kUpper: number; jLower: number; kLower: number },
  observedCm1: number,
): boolean {
  const { lines } = band;
  let own = -1;
  let strongest = 0;
  for (let i = 0; i < lines.count; i++) {
    if (Math.abs(lines.wavenumberCm1[i] - observedCm1) > 0.5 * band.fwhmCm1) continue;
    strongest = Math.max(strongest, lines.intensity[i]);
    if (lines.jUpper[i] === q.jUpper && lines.kUpper[i] === q.kUpper && lines.jLower[i] === q.jLower && lines.kLower[i] === q.kLower)
      own = i;
  }
  return own >= 0 && lines.intensity[own] >= 0.25 * strongest;
}
