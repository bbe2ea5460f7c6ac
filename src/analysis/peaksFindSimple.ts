import { peakProminence } from './peakProminence';
import { traceCheck } from './traceCheck';

/** Columnar result of {@link peaksFindSimple}. */
export interface SimplePeakList {
  count: number;
  /** Parabola-vertex position of each peak, cm^-1, ascending. */
  positionCm1: Float64Array;
  /** Parabola-vertex value of each peak (not corrected for any baseline), absorbance units. */
  height: Float64Array;
}

/**
 * Fast peak list: every interior local maximum whose prominence is at least
 * `prominenceSigma · noiseSigma`, centred by the vertex of the parabola through the maximum and its
 * two neighbours. This is exactly the benchmark definition (workload W3); {@link peaksFind} is the
 * careful version (line-shape fit, widths, blends).
 *
 * A local maximum is y[i−1] < y[i] ≥ y[i+1]; a flat top (run of equal samples) counts once, at its
 * middle sample, when it is followed by a drop. End points are never maxima. Prominence as in
 * {@link peakProminence} (O(n)).
 * Parabola through (x_{i−1}, y_{i−1}), (x_i, y_i), (x_{i+1}, y_{i+1}) written as y_i + b t + c t²,
 * t = x − x_i: vertex t* = −b/(2c), value y_i − b²/(4c); general in the spacing, so uneven axes are
 * fine. On an even grid this is the familiar x_i + h (y_{i−1} − y_{i+1}) / (2 (y_{i−1} − 2y_i + y_{i+1})).
 * Source: three-point parabolic interpolation, e.g. Press et al., Numerical Recipes 3rd ed. (2007),
 * eq. 10.3.1 (parabola through three points, from memory); prominence per SciPy peak_prominences.
 * @param x ascending wavenumbers, cm^-1
 * @param y absorbance
 * @param noiseSigma known noise standard deviation, absorbance units (≥ 0)
 * @param prominenceSigma threshold in units of noiseSigma (≥ 0)
 * @returns positions (cm^-1) and heights (absorbance), ascending position
 */
export function peaksFindSimple(x: Float64Array, y: Float64Array, noiseSigma: number, prominenceSigma: number): SimplePeakList {
  traceCheck('peaksFindSimple', x, y);
  if (!(noiseSigma >= 0) || !Number.isFinite(noiseSigma)) {
    throw new Error(`peaksFindSimple: noiseSigma must be a finite number >= 0, got ${noiseSigma}`);
  }
  if (!(prominenceSigma >= 0) || !Number.isFinite(prominenceSigma)) {
    throw new Error(`peaksFindSimple: prominenceSigma must be a finite number >= 0, got ${prominenceSigma}`);
  }
  const threshold = noiseSigma * prominenceSigma;
  const maxima = peakProminence(y);
  let kept = 0;
  for (let q = 0; q < maxima.count; q++) if (maxima.prominence[q] >= threshold) kept++;
  const positionCm1 = new Float64Array(kept);
  const height = new Float64Array(kept);
  let k = 0;
  for (let q = 0; q < maxima.count; q++) {
    if (maxima.prominence[q] < threshold) continue;
    const i = maxima.index[q];
    const x1 = x[i];
    const y1 = y[i];
    const d0 = x[i - 1] - x1;
    const d2 = x[i + 1] - x1;
    const s0 = (y[i - 1] - y1) / d0;
    const s2 = (y[i + 1] - y1) / d2;
    const c = (s2 - s0) / (d2 - d0);
    if (c < 0) {
      const b = s0 - c * d0;
      positionCm1[k] = x1 - b / (2 * c);
      height[k] = y1 - (b * b) / (4 * c);
    } else {
      // Flat top (c = 0): the middle sample is the best estimate.
      positionCm1[k] = x1;
      height[k] = y1;
    }
    k++;
  }
  return { count: kept, positionCm1, height };
}
