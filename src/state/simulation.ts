/**
 * The simulated spectrum shown over the trace: Voigt lines from the current model on a uniform
 * grid, scaled and offset to the measured absorbance, and the difference obs − sim.
 */
import { arrayMedianInPlace, arraySelectInPlace } from '../analysis/arrayMedian';
import type { Trace } from '../io/trace';
import type { LineList } from '../physics/model';
import { spectrumSynthesize } from '../physics/spectrum';

/** A simulated spectrum on a uniform grid plus its comparison with the trace. */
export interface SimulatedSpectrum {
  /** Grid abscissae, cm^-1 (uniform, ascending). */
  xCm1: Float64Array;
  /** Simulated absorbance on the grid (after scaling). */
  absorbance: Float64Array;
  /** Scale applied to the unit-area line sum to match the trace (1/max when there is no trace). */
  scale: number;
  /** Offset added after scaling (the trace's baseline absorbance; 0 without a trace). */
  offset: number;
  /** obs − sim at each trace point (absorbance), or null without a trace. */
  obsMinusSim: Float64Array | null;
}

/** Options of simulationBuild. */
export interface SimulationOptions {
  temperatureK: number;
  massAmu: number;
  lorentzHwhmCm1: number;
  /** Most grid points. @default 400000 */
  maxPoints?: number;
}

/** Doppler HWHM per cm^-1 of line position at 1 K and 1 amu: √(2 ln2 k/(m_u c²)). */
const DOPPLER_HWHM_PER_CM1 = 3.581e-7;

/** Quantile of the strong-line level used to match heights (the top 0.1 % of samples). */
const MATCH_QUANTILE = 0.999;

function quantiles(values: Float64Array): { median: number; high: number } {
  const scratch = values.filter(Number.isFinite);
  const n = scratch.length;
  if (n === 0) return { median: 0, high: 0 };
  const high = arraySelectInPlace(scratch, n, Math.min(n - 1, Math.floor(MATCH_QUANTILE * n)));
  return { median: arrayMedianInPlace(scratch, n), high };
}

/**
 * Simulate the band over the trace's range (or the lines' range without a trace) and match it to
 * the trace: a·s + b with a = (q(obs) − m(obs)) / (q(s) − m(s)) and b = m(obs) − a·m(s), m the
 * median (the baseline level) and q the 99.9 % quantile (the strong-line level) over the trace
 * points (s interpolated linearly). Unlike a least-squares scale this does not collapse to 0 while
 * a first-guess model puts the lines beside the observed ones; for a trace that is exactly a·s + b
 * it returns a and b.
 * Grid step: a quarter of the narrowest Voigt FWHM (Olivero–Longbothum) at the range's low end, but
 * no finer than the trace sampling and no more than maxPoints points.
 * Source: Doppler width as Demtröder, Laser Spectroscopy (2008) eq. 3.43 (from memory);
 * Olivero & Longbothum, JQSRT 17, 233 (1977) for the Voigt FWHM.
 * @param lines predicted lines (cm^-1, relative intensities)
 * @param trace the measured trace, or null
 * @returns grid, scaled absorbance and obs − sim, or null when there are no lines
 */
export function simulationBuild(lines: LineList, trace: Trace | null, options: SimulationOptions): SimulatedSpectrum | null {
  if (lines.count === 0) return null;
  let lo: number;
  let hi: number;
  if (trace && trace.wavenumberCm1.length > 1) {
    lo = trace.wavenumberCm1[0];
    hi = trace.wavenumberCm1[trace.wavenumberCm1.length - 1];
  } else {
    lo = Infinity;
    hi = -Infinity;
    for (let i = 0; i < lines.count; i++) {
      lo = Math.min(lo, lines.wavenumberCm1[i]);
      hi = Math.max(hi, lines.wavenumberCm1[i]);
    }
    const pad = Math.max(1, 0.02 * (hi - lo));
    lo -= pad;
    hi += pad;
  }
  const fG = 2 * DOPPLER_HWHM_PER_CM1 * Math.max(lo, 1) * Math.sqrt(options.temperatureK / options.massAmu);
  const fL = 2 * options.lorentzHwhmCm1;
  const fwhm = 0.5346 * fL + Math.sqrt(0.2166 * fL * fL + fG * fG);
  const maxPoints = options.maxPoints ?? 400_000;
  let step = fwhm / 4;
  if (trace && trace.wavenumberCm1.length > 1) step = Math.max(step, (hi - lo) / (trace.wavenumberCm1.length - 1));
  step = Math.max(step, (hi - lo) / (maxPoints - 1));
  const npoints = Math.max(2, Math.floor((hi - lo) / step) + 1);
  const y = spectrumSynthesize(
    lines,
    { fromCm1: lo, stepCm1: step, npoints },
    {
      temperatureK: options.temperatureK,
      massAmu: options.massAmu,
      lorentzHwhmCm1: options.lorentzHwhmCm1,
    },
  );
  const xCm1 = new Float64Array(npoints);
  for (let k = 0; k < npoints; k++) xCm1[k] = lo + k * step;
  const at = (x: number): number => {
    const t = (x - lo) / step;
    const k = Math.floor(t);
    if (k < 0) return y[0];
    if (k >= npoints - 1) return y[npoints - 1];
    const f = t - k;
    return y[k] * (1 - f) + y[k + 1] * f;
  };
  let scale: number;
  let offset = 0;
  let obsMinusSim: Float64Array | null = null;
  if (trace && trace.wavenumberCm1.length > 1) {
    const n = trace.wavenumberCm1.length;
    const sAt = new Float64Array(n);
    for (let i = 0; i < n; i++) sAt[i] = at(trace.wavenumberCm1[i]);
    const qo = quantiles(trace.absorbance);
    const qs = quantiles(sAt);
    scale = qs.high > qs.median ? (qo.high - qo.median) / (qs.high - qs.median) : 0;
    offset = qo.median - scale * qs.median;
    obsMinusSim = sAt;
    for (let i = 0; i < n; i++) obsMinusSim[i] = trace.absorbance[i] - (scale * sAt[i] + offset);
  } else {
    let max = 0;
    for (let k = 0; k < npoints; k++) max = Math.max(max, y[k]);
    scale = max > 0 ? 1 / max : 0;
  }
  for (let k = 0; k < npoints; k++) y[k] = y[k] * scale + offset;
  return { xCm1, absorbance: y, scale, offset, obsMinusSim };
}
