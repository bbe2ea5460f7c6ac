import type { PeakList } from './peaksFind';
import type { AssistantLine } from './assistantTypes';
import { arrayMedianInPlace } from './arrayMedian';

/** What the assistant derives once from a peak list: local line width and possible blends. */
export interface AssistantPeakContext {
  /** Running median FWHM around each peak (itself and up to n neighbours on each side), cm^-1. */
  localFwhmCm1: Float64Array;
  /** 1 when the peak may hold more than one line (wide, or flagged by peaksFind). */
  isPossibleBlend: Uint8Array;
  /** Why a peak is a possible blend ('' when it is not). */
  blendReason: string[];
  /** Median FWHM of all peaks, cm^-1 (NaN for an empty list). */
  medianFwhmCm1: number;
}

/**
 * Check that a peak list is usable by the assistant: consistent column lengths, finite ascending
 * centres, positive widths, finite non-negative centre σ.
 * @returns a sentence naming the field and index at fault, or null
 */
export function assistantPeaksCheck(fn: string, peaks: PeakList): string | null {
  if (!peaks || typeof peaks !== 'object') return `${fn}: peaks must be a peak list (from peaksFind), got ${String(peaks)}`;
  const n = peaks.count;
  if (!Number.isInteger(n) || n < 0) return `${fn}: peaks.count must be a whole number >= 0, got ${String(n)}`;
  for (const name of ['wavenumberCm1', 'height', 'fwhmCm1', 'snr', 'centreSigmaCm1'] as const) {
    const col = peaks[name];
    if (!col || col.length < n) return `${fn}: peaks.${name} must have at least count (${n}) entries`;
  }
  if (!peaks.isBlend || peaks.isBlend.length < n) return `${fn}: peaks.isBlend must have at least count (${n}) entries`;
  for (let k = 0; k < n; k++) {
    const x = peaks.wavenumberCm1[k];
    if (!Number.isFinite(x)) return `${fn}: peaks.wavenumberCm1[${k}] must be finite, got ${x}`;
    if (k > 0 && !(x > peaks.wavenumberCm1[k - 1])) {
      return `${fn}: peaks must be in ascending wavenumber, but [${k}] = ${x} follows ${peaks.wavenumberCm1[k - 1]}`;
    }
    const w = peaks.fwhmCm1[k];
    if (!(w > 0) || !Number.isFinite(w)) return `${fn}: peaks.fwhmCm1[${k}] must be a finite width > 0 cm^-1, got ${w}`;
    const s = peaks.centreSigmaCm1[k];
    if (!(s >= 0) || !Number.isFinite(s)) return `${fn}: peaks.centreSigmaCm1[${k}] must be finite and >= 0 cm^-1, got ${s}`;
    if (!Number.isFinite(peaks.height[k])) return `${fn}: peaks.height[${k}] must be finite, got ${peaks.height[k]}`;
  }
  return null;
}

/**
 * The peak list with any centre σ that is not a finite number ≥ 0 replaced by a quarter of the
 * peak's FWHM (a deliberately large, safe value), so one odd peak does not stop a whole run.
 * @returns the same list when nothing needed repair, else a copy; and the repaired indices
 */
export function assistantPeaksUsable(peaks: PeakList): { peaks: PeakList; repaired: number[] } {
  const repaired: number[] = [];
  const n = peaks?.count;
  if (!Number.isInteger(n) || !peaks.centreSigmaCm1 || !peaks.fwhmCm1) return { peaks, repaired };
  for (let k = 0; k < Math.min(n, peaks.centreSigmaCm1.length); k++) {
    const s = peaks.centreSigmaCm1[k];
    if (!(s >= 0) || !Number.isFinite(s)) repaired.push(k);
  }
  if (repaired.length === 0) return { peaks, repaired };
  const centreSigmaCm1 = Float64Array.from(peaks.centreSigmaCm1);
  for (const k of repaired) centreSigmaCm1[k] = 0.25 * peaks.fwhmCm1[k];
  return { peaks: { ...peaks, centreSigmaCm1 }, repaired };
}

/** The warning for repaired peaks (empty when none). */
export function assistantPeaksRepairWarning(peaks: PeakList, repaired: number[]): string[] {
  if (repaired.length === 0) return [];
  const where = repaired
    .slice(0, 5)
    .map((k) => peaks.wavenumberCm1[k].toFixed(4))
    .join(', ');
  return [
    `${repaired.length} peak(s) had no usable centre σ (at ${where}${repaired.length > 5 ? ', …' : ''} cm^-1); a quarter of their FWHM is used instead`,
  ];
}

/**
 * Local line width and blend flags of a peak list.
 *
 * The running median FWHM uses the peak and up to `neighbours` peaks on each side (by index);
 * a peak is a possible blend when peaksFind flagged it (isBlend) or when its FWHM exceeds
 * blendWidthRatio × that running median (an unresolved pair is wider than a single line).
 * Source: blend-by-width test as in common practice for crowded spectra (a single Voigt line has
 * the band's common width); ratio 1.5 as in peaksFind.
 * @param peaks peak list, ascending wavenumber (cm^-1)
 * @param neighbours peaks on each side in the running median
 * @param blendWidthRatio width ratio above which a peak is a possible blend (> 1)
 * @returns per-peak local FWHM (cm^-1), blend flag and reason, and the overall median FWHM
 */
export function assistantPeakContext(peaks: PeakList, neighbours = 10, blendWidthRatio = 1.5): AssistantPeakContext {
  // The centre σ is not used here, so a list with odd ones is still accepted (see assistantPeaksUsable).
  const bad = assistantPeaksCheck('assistantPeakContext', assistantPeaksUsable(peaks).peaks);
  if (bad) throw new Error(bad);
  if (!Number.isInteger(neighbours) || neighbours < 1) {
    throw new Error(`assistantPeakContext: neighbours must be a whole number >= 1, got ${neighbours}`);
  }
  if (!(blendWidthRatio > 1)) throw new Error(`assistantPeakContext: blendWidthRatio must be > 1, got ${blendWidthRatio}`);
  const n = peaks.count;
  const localFwhmCm1 = new Float64Array(n);
  const isPossibleBlend = new Uint8Array(n);
  const blendReason: string[] = new Array(n).fill('');
  const scratch = new Float64Array(2 * neighbours + 1);
  for (let k = 0; k < n; k++) {
    const lo = Math.max(0, k - neighbours);
    const hi = Math.min(n - 1, k + neighbours);
    let m = 0;
    for (let j = lo; j <= hi; j++) scratch[m++] = peaks.fwhmCm1[j];
    localFwhmCm1[k] = arrayMedianInPlace(scratch, m);
  }
  for (let k = 0; k < n; k++) {
    const ratio = peaks.fwhmCm1[k] / localFwhmCm1[k];
    const wide = n >= 5 && ratio > blendWidthRatio;
    if (wide || peaks.isBlend[k]) {
      isPossibleBlend[k] = 1;
      const parts: string[] = [];
      if (wide) parts.push(`FWHM ${peaks.fwhmCm1[k].toPrecision(3)} cm^-1 is ${ratio.toFixed(2)}× the local median`);
      if (peaks.isBlend[k]) parts.push('flagged as an overlap by the peak finder');
      blendReason[k] = `possible blend (${parts.join('; ')})`;
    }
  }
  const all = Float64Array.from(peaks.fwhmCm1.subarray(0, n));
  return { localFwhmCm1, isPossibleBlend, blendReason, medianFwhmCm1: arrayMedianInPlace(all) };
}

/**
 * Index range [first, last] of the peaks with centre in [lowCm1, highCm1] (binary search on the
 * ascending centres); first > last when there is none.
 */
export function assistantPeaksInRange(peaks: PeakList, lowCm1: number, highCm1: number): [number, number] {
  const x = peaks.wavenumberCm1;
  let lo = 0;
  let hi = peaks.count;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (x[mid] < lowCm1) lo = mid + 1;
    else hi = mid;
  }
  const first = lo;
  hi = peaks.count;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (x[mid] <= highCm1) lo = mid + 1;
    else hi = mid;
  }
  return [first, lo - 1];
}

/** Index of the peak nearest to a position (cm^-1), or −1 for an empty list. */
export function assistantNearestPeak(peaks: PeakList, positionCm1: number): number {
  const n = peaks.count;
  if (n === 0) return -1;
  const [first] = assistantPeaksInRange(peaks, positionCm1, Infinity);
  if (first >= n) return n - 1;
  if (first === 0) return 0;
  return positionCm1 - peaks.wavenumberCm1[first - 1] <= peaks.wavenumberCm1[first] - positionCm1 ? first - 1 : first;
}

/**
 * 1σ of a peak's position as a line in the fit, cm^-1: the peak finder's centre σ combined in
 * quadrature with a systematic floor (positionFloorFraction × FWHM), the expected pull of
 * neighbouring lines (overlapCm1, see assistantOverlapShift) and, for a possible blend,
 * blendUncertaintyFraction × FWHM (an unseen partner can pull the centre by a fraction of the width).
 * Source: common practice (weights of blended lines reduced in rovibrational fits).
 */
export function assistantPeakUncertainty(
  peaks: PeakList,
  context: AssistantPeakContext,
  k: number,
  positionFloorFraction: number,
  blendUncertaintyFraction: number,
  isBlendExtra = false,
  overlapCm1 = 0,
): number {
  const fwhm = peaks.fwhmCm1[k];
  const base = Math.hypot(peaks.centreSigmaCm1[k], positionFloorFraction * fwhm, overlapCm1);
  return context.isPossibleBlend[k] || isBlendExtra ? Math.hypot(base, blendUncertaintyFraction * fwhm) : base;
}

/** Peaks on each side counted for the local peak density. */
const DENSITY_NEIGHBOURS = 5;

/**
 * Local density of peaks around a position, peaks per cm^-1: 2n over the span from the n-th peak
 * below to the n-th peak above the nearest one (n = 5; fewer at the ends of the list).
 * @returns peaks per cm^-1 (0 for a list of fewer than 2 peaks)
 */
export function assistantPeakDensity(peaks: PeakList, positionCm1: number): number {
  const q = assistantNearestPeak(peaks, positionCm1);
  if (q < 0) return 0;
  const lo = Math.max(0, q - DENSITY_NEIGHBOURS);
  const hi = Math.min(peaks.count - 1, q + DENSITY_NEIGHBOURS);
  const span = peaks.wavenumberCm1[hi] - peaks.wavenumberCm1[lo];
  return hi > lo && span > 0 ? (hi - lo) / span : 0;
}

/**
 * Largest half window (cm^-1) in which a rung may be matched to a peak at a position: maxWindowFwhm
 * local FWHMs, or wider where peaks are sparse, as long as the window is expected to hold at most
 * `chancePeaks` peaks by chance (2·half·density ≤ chancePeaks).
 * Source: Poisson count of unrelated peaks in a window (common practice for judging coincidences).
 */
export function assistantWindowLimitCm1(
  peaks: PeakList,
  context: AssistantPeakContext,
  positionCm1: number,
  maxWindowFwhm: number,
  chancePeaks: number,
): number {
  const q = assistantNearestPeak(peaks, positionCm1);
  const width = q >= 0 ? context.localFwhmCm1[q] : context.medianFwhmCm1;
  const density = assistantPeakDensity(peaks, positionCm1);
  const sparse = density > 0 ? chancePeaks / (2 * density) : 0;
  return Math.max(maxWindowFwhm * width, sparse);
}

/** Where a machine-made seed sits: the predicted line's quanta, its peak and the matching window. */
export interface AssistantSeedPlace {
  id: string;
  quanta: { jUpper: number; kUpper: number; jLower: number; kLower: number };
  /** Index of the peak the seed takes. */
  peak: number;
  /** Predicted position, cm^-1. */
  predictedCm1: number;
  /** 1σ of the match, cm^-1 (the distance is counted in it). */
  matchSigmaCm1: number;
  /** Why the line is a seed, in words (also its note). */
  reason: string;
}

/**
 * A seed line made from the model (status 'seed', source 'auto-seed', iteration 0) on its peak, with
 * the peak's uncertainty (assistantPeakUncertainty) and blend flag.
 * @param positionFloorFraction, blendUncertaintyFraction as assistantPeakUncertainty
 */
export function assistantSeedOnPeak(
  peaks: PeakList,
  context: AssistantPeakContext,
  place: AssistantSeedPlace,
  positionFloorFraction: number,
  blendUncertaintyFraction: number,
): AssistantLine {
  const { peak, predictedCm1, matchSigmaCm1, reason } = place;
  return {
    id: place.id,
    ...place.quanta,
    observedCm1: peaks.wavenumberCm1[peak],
    uncertaintyCm1: assistantPeakUncertainty(peaks, context, peak, positionFloorFraction, blendUncertaintyFraction),
    isBlended: context.isPossibleBlend[peak] === 1,
    isExcluded: false,
    note: reason,
    status: 'seed',
    source: 'auto-seed',
    peakIndex: peak,
    predictedCm1,
    matchSigmaCm1,
    distanceSigma: Math.abs(peaks.wavenumberCm1[peak] - predictedCm1) / matchSigmaCm1,
    reason,
    iteration: 0,
  };
}
