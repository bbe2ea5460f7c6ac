import type { Trace } from '../io/trace';
import { arrayMedianInPlace } from './arrayMedian';
import { baselineEstimate, type BaselineEstimateOptions } from './baselineEstimate';
import { GAUSSIAN_FWHM_PER_SIGMA, gaussianFit } from './gaussianFit';
import { noiseSigmaEstimate } from './noiseSigmaEstimate';
import { peakProminence } from './peakProminence';
import { traceCheck } from './traceCheck';

/** Options of {@link peaksFind}. */
export interface PeaksFindOptions {
  /** Smallest height above the local baseline, in units of the noise σ. @default 5 */
  minSnr?: number;
  /**
   * Subtract a smooth baseline first ({@link baselineEstimate}); `true` uses its defaults, an object
   * passes options. Heights are then above that baseline (refined locally).
   * @default false
   */
  baseline?: boolean | BaselineEstimateOptions;
  /** Known noise 1σ, absorbance units; overrides {@link noiseSigmaEstimate}. */
  noiseSigma?: number;
  /** Smallest prominence, absorbance units. @default minSnr · noise σ */
  minProminence?: number;
  /**
   * A peak wider than this multiple of the median FWHM of its ≤ 10 nearest neighbours is a blend
   * (raised for a noisy peak to 1 + 4 × its relative FWHM 1σ, so noise alone rarely flags one).
   * @default 1.3
   */
  blendWidthRatio?: number;
}

/** Columnar peak list, ascending wavenumber. */
export interface PeakList {
  count: number;
  /** Fitted centre, cm^-1. */
  wavenumberCm1: Float64Array;
  /** Fitted peak value above the local baseline, absorbance units. */
  height: Float64Array;
  /** Full width at half maximum, cm^-1 (from the fitted Gaussian; see peaksFind). */
  fwhmCm1: Float64Array;
  /** height / noise σ. Infinity when σ is 0. */
  snr: Float64Array;
  /** Prominence (SciPy definition, see peakProminence), absorbance units. */
  prominence: Float64Array;
  /** 1 when the peak is judged an overlap of two or more lines, else 0. */
  isBlend: Uint8Array;
  /**
   * Statistical 1σ of the centre, cm^-1, from the fit covariance σ²(JᵀJ)⁻¹ with the noise σ in use
   * (not the residuals: a fit to 3–10 points has too few degrees of freedom to estimate σ itself),
   * widened by √(χ²/dof)/σ when that exceeds 1 (line shape not Gaussian). Measured on seeded tests:
   * error/σ has rms 0.83–0.94 for Gaussian lines (slightly conservative) and ≈ 1.25 for Lorentzian
   * or Voigt lines. Excludes systematic errors (baseline, asymmetry, blending, axis calibration).
   */
  centreSigmaCm1: Float64Array;
  /** The noise σ used, absorbance units. */
  noiseSigma: number;
}

/**
 * Find the lines in a trace: position (sub-sample), height, FWHM, SNR, blend flag and centre 1σ.
 *
 * 1. Optional smooth baseline subtracted (asymmetric least squares). Noise σ from the options or
 *    {@link noiseSigmaEstimate}; an estimated σ is re-estimated once without the samples within
 *    2 FWHM of the lines found (steep flanks inflate it on coarse sampling) and the search repeated
 *    when it moved by more than 2 %.
 * 2. Candidates: local maxima with prominence ≥ minProminence ({@link peakProminence}). Consecutive
 *    candidates bound each other at the lowest sample between them (the dip).
 * 3. Local baseline per candidate: on each side, the median of the samples 2–4 rough FWHM from the
 *    maximum (not beyond the dip); a side whose dip is nearer than that gives the median of the
 *    3 samples at the dip instead. With two free sides the level is interpolated linearly to the
 *    centre; with one, that side's level; with none, the lower one. The rough FWHM is measured at
 *    half the prominence, then once more at half the height above this baseline.
 * 4. Centre, height, width: least-squares Gaussian (Levenberg–Marquardt) to the samples above half
 *    height, contiguous with the maximum, within the dips, at least the maximum and its neighbours.
 *    With exactly three samples this is the three-point Gaussian (log-parabola) estimator. If the fit
 *    fails (does not converge, or leaves the window) the log-parabola value is used, or the plain
 *    parabola if a sample is not above the baseline; its centre 1σ is then the common-practice
 *    FWHM / (SNR √N), N the samples above half height. For a Lorentzian or Voigt line the Gaussian
 *    through the top half has, to within a few per cent, the same FWHM, and the same centre by symmetry.
 * 5. Kept when height ≥ minSnr·σ. Two kept peaks closer than half the smaller FWHM are one line (the
 *    higher is kept).
 * 6. Blend flag: the dip between two neighbouring peaks stays above half the smaller height, or
 *    the FWHM exceeds max(blendWidthRatio, 1 + 4 σ_FWHM/FWHM) × the median FWHM of up to 10 nearest
 *    peaks (≥ 4 needed). Two equal Gaussians 0.6 / 0.7 / 0.8 FWHM apart look like one line 1.32 /
 *    1.46 / 1.62 times as wide (evaluated in the tests), so the default 1.3 catches equal pairs
 *    from ≈ 0.6 FWHM apart when the SNR allows; closer or unequal pairs can pass as single lines.
 *
 * Source: prominence as SciPy signal.peak_prominences (Virtanen et al., Nat. Methods 17, 261 (2020));
 * three-point Gaussian: Caruana, Searle & Shupe, Anal. Chem. 58, 1162 (1986) (from memory);
 * centre precision ≈ FWHM/(SNR√N): common practice (e.g. Landman, Roussel-Dupré & Tanigawa,
 * ApJ 261, 732 (1982), from memory); Levenberg–Marquardt as in gaussianFit.
 * @param trace ascending wavenumbers (cm^-1, any spacing) and absorbance
 * @param options see {@link PeaksFindOptions}
 * @returns peaks, ascending wavenumber
 */
export function peaksFind(trace: Trace, options: PeaksFindOptions = {}): PeakList {
  const x = trace?.wavenumberCm1;
  traceCheck('peaksFind', x, trace?.absorbance);
  const minSnr = options.minSnr ?? 5;
  const blendWidthRatio = options.blendWidthRatio ?? 1.3;
  if (!(Number.isFinite(minSnr) && minSnr >= 0)) throw new Error(`peaksFind: minSnr must be a finite number >= 0, got ${minSnr}`);
  if (options.noiseSigma !== undefined && !(Number.isFinite(options.noiseSigma) && options.noiseSigma >= 0)) {
    throw new Error(`peaksFind: noiseSigma must be a finite number >= 0, got ${options.noiseSigma}`);
  }
  if (options.minProminence !== undefined && !(Number.isFinite(options.minProminence) && options.minProminence >= 0)) {
    throw new Error(`peaksFind: minProminence must be a finite number >= 0, got ${options.minProminence}`);
  }
  if (!(blendWidthRatio > 1)) throw new Error(`peaksFind: blendWidthRatio must be > 1, got ${blendWidthRatio}`);
  const n = x.length;
  const y = Float64Array.from(trace.absorbance);
  if (options.baseline && n >= 3) {
    const z = baselineEstimate(trace, options.baseline === true ? {} : options.baseline);
    for (let i = 0; i < n; i++) y[i] -= z[i];
  }
  let sigma = options.noiseSigma ?? (n >= 3 ? noiseSigmaEstimate(x, y) : 0);
  let kept = peaksAtSigma(x, y, sigma, minSnr, options.minProminence);
  if (options.noiseSigma === undefined && kept.length > 0) {
    // Steep line flanks inflate the first estimate on coarsely sampled, line-rich traces: estimate
    // again without the samples within 2 FWHM of a found line, and search again if it moved.
    const exclude = new Uint8Array(n);
    for (const p of kept) {
      for (let i = p.apex; i >= 0 && x[p.apex] - x[i] <= 2 * p.fwhmCm1; i--) exclude[i] = 1;
      for (let i = p.apex; i < n && x[i] - x[p.apex] <= 2 * p.fwhmCm1; i++) exclude[i] = 1;
    }
    let free = 0;
    for (let i = 0; i < n; i++) free += 1 - exclude[i];
    if (free >= Math.max(30, 0.1 * n)) {
      const again = noiseSigmaEstimate(x, y, exclude);
      if (again > 0 && Math.abs(again - sigma) > 0.02 * sigma) {
        sigma = again;
        kept = peaksAtSigma(x, y, sigma, minSnr, options.minProminence);
      }
    }
  }

  const count = kept.length;
  const out: PeakList = {
    count,
    wavenumberCm1: new Float64Array(count),
    height: new Float64Array(count),
    fwhmCm1: new Float64Array(count),
    snr: new Float64Array(count),
    prominence: new Float64Array(count),
    isBlend: new Uint8Array(count),
    centreSigmaCm1: new Float64Array(count),
    noiseSigma: sigma,
  };
  for (let k = 0; k < count; k++) {
    const p = kept[k];
    out.wavenumberCm1[k] = p.centreCm1;
    out.height[k] = p.height;
    out.fwhmCm1[k] = p.fwhmCm1;
    out.snr[k] = sigma > 0 ? p.height / sigma : Infinity;
    out.prominence[k] = p.prominence;
    out.centreSigmaCm1[k] = p.centreSigmaCm1;
  }
  blendFlag(y, kept, blendWidthRatio, out.isBlend);
  return out;
}

/** Steps 2–5 of peaksFind at a given noise σ: the kept peaks in ascending centre order. */
function peaksAtSigma(
  x: Float64Array,
  y: Float64Array,
  sigma: number,
  minSnr: number,
  minProminenceOption: number | undefined,
): FoundPeak[] {
  const n = x.length;
  // With σ = 0 (noiseless, synthetic data) round-off wiggles must not count: a floor of 1e-12 of the
  // data range, far above double round-off (1e-16) and far below any real line.
  let yMin = Infinity;
  let yMax = -Infinity;
  for (let i = 0; i < n; i++) {
    yMin = Math.min(yMin, y[i]);
    yMax = Math.max(yMax, y[i]);
  }
  const minProminence = Math.max(minProminenceOption ?? minSnr * sigma, n > 0 ? 1e-12 * (yMax - yMin) : 0);

  const maxima = peakProminence(y);
  const cand: number[] = [];
  const candProminence: number[] = [];
  for (let k = 0; k < maxima.count; k++) {
    if (maxima.prominence[k] >= minProminence) {
      cand.push(maxima.index[k]);
      candProminence.push(maxima.prominence[k]);
    }
  }
  const m = cand.length;
  // dip[k]: lowest sample between candidates k−1 and k; dip[0] = 0 and dip[m] = n − 1 (trace ends).
  const dip = new Int32Array(m + 1);
  dip[m] = n - 1;
  for (let k = 1; k < m; k++) {
    let best = cand[k - 1] + 1;
    for (let i = best + 1; i < cand[k]; i++) if (y[i] < y[best]) best = i;
    dip[k] = best;
  }

  const found: FoundPeak[] = [];
  for (let k = 0; k < m; k++) {
    const peak = peakMeasure(x, y, cand[k], dip[k], dip[k + 1], candProminence[k], sigma);
    if (!peak) continue;
    if (sigma > 0 ? peak.height >= minSnr * sigma : peak.height > 0) found.push(peak);
  }
  found.sort((a, b) => a.centreCm1 - b.centreCm1);
  // One line fitted from two candidates (noise splitting a top): keep the higher.
  const kept: FoundPeak[] = [];
  for (const p of found) {
    const last = kept[kept.length - 1];
    if (last && p.centreCm1 - last.centreCm1 < 0.5 * Math.min(p.fwhmCm1, last.fwhmCm1)) {
      if (p.height > last.height) kept[kept.length - 1] = p;
      continue;
    }
    kept.push(p);
  }

  return kept;
}

interface FoundPeak {
  apex: number;
  centreCm1: number;
  height: number;
  fwhmCm1: number;
  centreSigmaCm1: number;
  /** Relative 1σ of the FWHM from the fit, NaN when the three-point fallback was used. */
  fwhmRelSigma: number;
  prominence: number;
  baseline: number;
}

/** Measure one candidate maximum at sample `a`, bounded by the dips lo < a < hi. */
function peakMeasure(
  x: Float64Array,
  y: Float64Array,
  a: number,
  lo: number,
  hi: number,
  prominence: number,
  sigma: number,
): FoundPeak | null {
  const top = y[a];
  // Rough width at half the prominence (SciPy peak_widths convention), then at half height.
  let width = halfWidthCm1(x, y, a, lo, hi, top - prominence / 2);
  let base = 0;
  for (let pass = 0; pass < 2; pass++) {
    base = localBaseline(x, y, a, lo, hi, width);
    const w = halfWidthCm1(x, y, a, lo, hi, base + (top - base) / 2);
    if (!(w > 0)) break;
    width = w;
  }
  const half = base + (top - base) / 2;
  if (!(top > base)) return null;
  let i0 = a - 1;
  let i1 = a + 1;
  while (i0 - 1 > lo && y[i0 - 1] >= half && a - i0 < 64) i0--;
  while (i1 + 1 < hi && y[i1 + 1] >= half && i1 - a < 64) i1++;
  const nAbove = i1 - i0 + 1;
  const d = new Float64Array(i1 - i0 + 1);
  for (let i = i0; i <= i1; i++) d[i - i0] = y[i] - base;
  const xs = x.subarray(i0, i1 + 1);
  const three = threePointEstimate(xs, d, a - i0);
  const startWidth = Number.isFinite(three.sigmaWidthCm1) ? three.sigmaWidthCm1 : width / GAUSSIAN_FWHM_PER_SIGMA;
  const fit = gaussianFit(
    xs,
    d,
    0,
    d.length - 1,
    { amplitude: top - base, centreCm1: three.centreCm1, sigmaWidthCm1: startWidth > 0 ? startWidth : x[a + 1] - x[a] },
    sigma,
  );
  const localStep = 0.5 * (x[Math.min(a + 1, x.length - 1)] - x[Math.max(a - 1, 0)]);
  const isFitGood =
    fit.isConverged &&
    fit.amplitude > 0 &&
    fit.centreCm1 >= x[i0] &&
    fit.centreCm1 <= x[i1] &&
    fit.sigmaWidthCm1 * GAUSSIAN_FWHM_PER_SIGMA <= 4 * (x[i1] - x[i0]) &&
    // A width below the sampling step is not resolved by the data (a 3-point fit can collapse so,
    // with a singular covariance); the three-point estimate is used instead.
    fit.sigmaWidthCm1 * GAUSSIAN_FWHM_PER_SIGMA >= localStep &&
    Number.isFinite(fit.centreSigmaCm1);
  let centre: number;
  let height: number;
  let fwhm: number;
  let centreSigma: number;
  let fwhmRelSigma = NaN;
  if (isFitGood) {
    centre = fit.centreCm1;
    height = fit.amplitude;
    fwhm = fit.sigmaWidthCm1 * GAUSSIAN_FWHM_PER_SIGMA;
    // A line shape the Gaussian does not match leaves residuals above the noise: widen σ by the
    // reduced χ² then (never narrow it; 3–10 points estimate χ² too poorly for that).
    const dof = d.length - 3;
    const inflate = dof > 0 && sigma > 0 ? Math.max(1, Math.sqrt(fit.residualSumSquares / dof) / sigma) : 1;
    centreSigma = sigma > 0 ? fit.centreSigmaCm1 * inflate : 0;
    fwhmRelSigma = sigma > 0 ? (fit.sigmaWidthSigmaCm1 * inflate) / fit.sigmaWidthCm1 : 0;
  } else {
    centre = three.centreCm1;
    height = three.height;
    fwhm = Number.isFinite(three.sigmaWidthCm1) ? three.sigmaWidthCm1 * GAUSSIAN_FWHM_PER_SIGMA : width;
    // Never narrower than the sampling can show.
    if (!(fwhm >= localStep)) fwhm = Math.max(width, localStep);
    // Common-practice estimate σ_ν ≈ FWHM / (SNR · sqrt(N)).
    centreSigma = sigma > 0 ? fwhm / ((height / sigma) * Math.sqrt(nAbove)) : 0;
  }
  if (!(height > 0 && fwhm > 0)) return null;
  return {
    apex: a,
    centreCm1: centre,
    height,
    fwhmCm1: fwhm,
    centreSigmaCm1: centreSigma,
    fwhmRelSigma,
    prominence,
    baseline: base,
  };
}

/**
 * Three-point estimate at sample j of (xs, d): log-parabola (Gaussian) when all three values are
 * positive, plain parabola otherwise. Source: Caruana et al., Anal. Chem. 58, 1162 (1986) (from memory).
 */
function threePointEstimate(
  xs: ArrayLike<number>,
  d: ArrayLike<number>,
  j: number,
): { centreCm1: number; height: number; sigmaWidthCm1: number } {
  const x0 = xs[j - 1];
  const x1 = xs[j];
  const x2 = xs[j + 1];
  const isLog = d[j - 1] > 0 && d[j] > 0 && d[j + 1] > 0;
  const f0 = isLog ? Math.log(d[j - 1]) : d[j - 1];
  const f1 = isLog ? Math.log(d[j]) : d[j];
  const f2 = isLog ? Math.log(d[j + 1]) : d[j + 1];
  const t0 = x0 - x1;
  const t2 = x2 - x1;
  const s0 = (f0 - f1) / t0;
  const s2 = (f2 - f1) / t2;
  const c = (s2 - s0) / (t2 - t0);
  if (!(c < 0)) return { centreCm1: x1, height: d[j], sigmaWidthCm1: NaN };
  const b = s0 - c * t0;
  const vertex = f1 - (b * b) / (4 * c);
  return {
    centreCm1: x1 - b / (2 * c),
    height: isLog ? Math.exp(vertex) : vertex,
    sigmaWidthCm1: isLog ? Math.sqrt(-1 / (2 * c)) : NaN,
  };
}

/** Full width (cm^-1) where y crosses `level` on both sides of a, by linear interpolation; one side doubled if the other is blocked by a dip; NaN if neither crosses. */
function halfWidthCm1(x: Float64Array, y: Float64Array, a: number, lo: number, hi: number, level: number): number {
  let left = NaN;
  for (let i = a - 1; i >= lo; i--) {
    if (y[i] < level) {
      left = x[a] - (x[i] + ((level - y[i]) / (y[i + 1] - y[i])) * (x[i + 1] - x[i]));
      break;
    }
  }
  let right = NaN;
  for (let i = a + 1; i <= hi; i++) {
    if (y[i] < level) {
      right = x[i - 1] + ((y[i - 1] - level) / (y[i - 1] - y[i])) * (x[i] - x[i - 1]) - x[a];
      break;
    }
  }
  if (Number.isFinite(left) && Number.isFinite(right)) return left + right;
  if (Number.isFinite(left)) return 2 * left;
  if (Number.isFinite(right)) return 2 * right;
  return NaN;
}

/** Local baseline level at sample a (absorbance), as described in peaksFind step 3. */
function localBaseline(x: Float64Array, y: Float64Array, a: number, lo: number, hi: number, widthCm1: number): number {
  const n = x.length;
  const w = widthCm1 > 0 ? widthCm1 : x[Math.min(n - 1, a + 1)] - x[Math.max(0, a - 1)];
  const left = flankLevel(x, y, a, lo, -1, w);
  const right = flankLevel(x, y, a, hi, +1, w);
  if (left.isFree && right.isFree) {
    const t = (x[a] - left.xCm1) / (right.xCm1 - left.xCm1);
    return left.level + t * (right.level - left.level);
  }
  if (left.isFree) return left.level;
  if (right.isFree) return right.level;
  if (Number.isNaN(left.level)) return right.level;
  if (Number.isNaN(right.level)) return left.level;
  return Math.min(left.level, right.level);
}

/** Median level of one flank (2–4 widths out, not past the dip `bound`); isFree false when the dip is nearer. */
function flankLevel(
  x: Float64Array,
  y: Float64Array,
  a: number,
  bound: number,
  dir: -1 | 1,
  widthCm1: number,
): { level: number; xCm1: number; isFree: boolean } {
  const near = 2 * widthCm1;
  const far = 4 * widthCm1;
  const values: number[] = [];
  let sumX = 0;
  let i = a + dir;
  while (dir < 0 ? i >= bound : i <= bound) {
    const dist = dir * (x[i] - x[a]);
    if (dist > far && values.length >= 3) break;
    if (dist >= near) {
      values.push(y[i]);
      sumX += x[i];
    }
    i += dir;
  }
  if (values.length >= 1) {
    return { level: arrayMedianInPlace(Float64Array.from(values)), xCm1: sumX / values.length, isFree: true };
  }
  // The dip (or the trace end) comes first: median of the dip and its two neighbours.
  const n = x.length;
  const j0 = Math.max(0, bound - 1);
  const j1 = Math.min(n - 1, bound + 1);
  if (bound === a) return { level: NaN, xCm1: x[a], isFree: false };
  const around = Float64Array.from(y.subarray(j0, j1 + 1));
  return { level: arrayMedianInPlace(around), xCm1: x[bound], isFree: false };
}

/** Set isBlend per peaksFind step 6. */
function blendFlag(y: Float64Array, peaks: FoundPeak[], ratio: number, isBlend: Uint8Array): void {
  const count = peaks.length;
  for (let k = 1; k < count; k++) {
    const p = peaks[k - 1];
    const q = peaks[k];
    let low = Infinity;
    for (let i = Math.min(p.apex, q.apex); i <= Math.max(p.apex, q.apex); i++) if (y[i] < low) low = y[i];
    const level = 0.5 * (p.baseline + q.baseline);
    if (low - level > 0.5 * Math.min(p.height, q.height)) {
      isBlend[k - 1] = 1;
      isBlend[k] = 1;
    }
  }
  const neighbours = new Float64Array(10);
  for (let k = 0; k < count; k++) {
    let used = 0;
    let l = k - 1;
    let r = k + 1;
    // The ≤ 10 nearest by wavenumber, taken alternately from the nearer side.
    while (used < 10 && (l >= 0 || r < count)) {
      const dl = l >= 0 ? peaks[k].centreCm1 - peaks[l].centreCm1 : Infinity;
      const dr = r < count ? peaks[r].centreCm1 - peaks[k].centreCm1 : Infinity;
      neighbours[used++] = dl <= dr ? peaks[l--].fwhmCm1 : peaks[r++].fwhmCm1;
    }
    if (used < 4) continue;
    const rel = peaks[k].fwhmRelSigma;
    const limit = Number.isFinite(rel) ? Math.max(ratio, 1 + 4 * rel) : ratio;
    if (peaks[k].fwhmCm1 > limit * arrayMedianInPlace(neighbours, used)) isBlend[k] = 1;
  }
}
