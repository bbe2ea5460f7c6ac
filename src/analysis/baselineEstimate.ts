import type { Trace } from '../io/trace';
import { traceCheck } from './traceCheck';

/** Working-grid points per baseline scale: λ = (200/2π)^4 ≈ 1e6 at most. */
const SAMPLES_PER_SCALE = 200;

/** Options of {@link baselineEstimate}. */
export interface BaselineEstimateOptions {
  /**
   * Shortest period the baseline may follow, cm^-1: structure narrower than this is treated as lines.
   * Converted to the smoothing weight λ = (scaleCm1 / (2π h))^4, h = mean spacing of the working grid,
   * which puts the smoother's half-power point at that period.
   * @default (x_max − x_min) / 20
   */
  scaleCm1?: number;
  /**
   * Asymmetry p: weight of points above the current baseline (1 − p below). Eilers & Boelens advise
   * 0.001–0.1 for positive peaks.
   * @default 0.01
   */
  asymmetry?: number;
  /** Reweighting rounds at most; stops earlier when no weight changes. @default 20 */
  maxIterations?: number;
  /**
   * Largest working grid. A longer trace is averaged in consecutive bins down to this many points
   * (and to no more than 200 points per `scaleCm1`), the baseline estimated there and linearly
   * interpolated back, so time and memory stay bounded (O(maxPoints) per round plus O(n)). Bins are
   * far narrower than `scaleCm1`, so a smooth baseline loses nothing; bins holding a line are raised,
   * and the asymmetric weights ignore them as they ignore the line itself.
   * @default 20000
   */
  maxPoints?: number;
}

/**
 * Smooth baseline under a trace by asymmetric least squares (ALS): minimise
 * Σ w_i (y_i − z_i)² + λ Σ (Δ² z_i)², with w_i = p where y_i > z_i and 1 − p elsewhere, re-solving
 * until the weights settle. Lines (upward, absorbance) end up above z and barely pull it.
 * Each solve is the banded system (W + λ DᵀD) z = W y, D the second-difference matrix, by a
 * pentadiagonal Cholesky factorisation (O(n)).
 * WARNING: the penalty is on second differences by index, so on a strongly uneven axis the
 * effective stiffness varies with the local spacing; it is exact for even spacing.
 * Source: Eilers & Boelens, "Baseline correction with asymmetric least squares smoothing",
 * Leiden University Medical Centre report (2005); the Whittaker smoother and its transfer function
 * 1/(1 + λ (2 sin(ω/2))^4): Eilers, Anal. Chem. 75, 3631 (2003), eqs. 4–6.
 * @param trace ascending wavenumbers (cm^-1) and absorbance
 * @param options see {@link BaselineEstimateOptions}
 * @returns the baseline at every trace point, absorbance units
 */
export function baselineEstimate(trace: Trace, options: BaselineEstimateOptions = {}): Float64Array {
  const x = trace?.wavenumberCm1;
  const y = trace?.absorbance;
  traceCheck('baselineEstimate', x, y);
  const n = y.length;
  const range = n > 1 ? x[n - 1] - x[0] : 0;
  const scaleCm1 = options.scaleCm1 ?? range / 20;
  const p = options.asymmetry ?? 0.01;
  const maxIterations = options.maxIterations ?? 20;
  const maxPoints = options.maxPoints ?? 20000;
  if (!(scaleCm1 > 0) && n > 1) throw new Error(`baselineEstimate: scaleCm1 must be > 0 cm^-1, got ${scaleCm1}`);
  if (!(p > 0 && p < 0.5)) throw new Error(`baselineEstimate: asymmetry must be in (0, 0.5), got ${p}`);
  if (!(Number.isInteger(maxIterations) && maxIterations >= 1)) {
    throw new Error(`baselineEstimate: maxIterations must be an integer >= 1, got ${maxIterations}`);
  }
  if (!(Number.isInteger(maxPoints) && maxPoints >= 3)) {
    throw new Error(`baselineEstimate: maxPoints must be an integer >= 3, got ${maxPoints}`);
  }
  if (n < 3) return Float64Array.from(y);

  // Working grid: bin means when the trace is long, and never finer than SAMPLES_PER_SCALE points
  // per scaleCm1, which bounds λ near 1e6 and keeps the factorisation well conditioned.
  const target = Math.max(3, Math.min(maxPoints, Math.ceil((SAMPLES_PER_SCALE * range) / scaleCm1) + 1));
  const bin = Math.ceil(n / target);
  let xw: Float64Array;
  let yw: Float64Array;
  if (bin > 1) {
    const nw = Math.ceil(n / bin);
    xw = new Float64Array(nw);
    yw = new Float64Array(nw);
    for (let k = 0; k < nw; k++) {
      const i0 = k * bin;
      const i1 = Math.min(n, i0 + bin);
      let sx = 0;
      let sy = 0;
      for (let i = i0; i < i1; i++) {
        sx += x[i];
        sy += y[i];
      }
      xw[k] = sx / (i1 - i0);
      yw[k] = sy / (i1 - i0);
    }
  } else {
    xw = x;
    yw = y;
  }
  const nw = yw.length;
  if (nw < 3) return Float64Array.from(y);
  const h = (xw[nw - 1] - xw[0]) / (nw - 1);
  const lambda = Math.pow(scaleCm1 / (2 * Math.PI * h), 4);
  const z = baselineAls(yw, lambda, p, maxIterations);
  if (bin === 1) return z;
  return interpolateLinear(xw, z, x);
}

/** ALS rounds on an even-index grid; returns z. */
function baselineAls(y: Float64Array, lambda: number, p: number, maxIterations: number): Float64Array {
  const n = y.length;
  const w = new Float64Array(n).fill(1);
  const z = new Float64Array(n);
  for (let iter = 0; iter < maxIterations; iter++) {
    whittakerSolve(y, w, lambda, z);
    let changed = 0;
    for (let i = 0; i < n; i++) {
      const wi = y[i] > z[i] ? p : 1 - p;
      if (wi !== w[i]) {
        w[i] = wi;
        changed++;
      }
    }
    if (changed === 0) break;
  }
  return z;
}

/**
 * Solve (W + λ DᵀD) z = W y for the second-difference D by banded Cholesky (bandwidth 2).
 * Source: Eilers, Anal. Chem. 75, 3631 (2003), eq. 6; banded Cholesky e.g. Golub & Van Loan,
 * Matrix Computations 4th ed. (2013), Alg. 4.3.5 (from memory).
 * Exported for the test that checks it against a dense solve.
 * @param y data, length n ≥ 3
 * @param w weights ≥ 0 (not all zero)
 * @param lambda smoothing weight ≥ 0
 * @param out result z, length n
 */
export function whittakerSolve(y: Float64Array, w: Float64Array, lambda: number, out: Float64Array): Float64Array {
  const n = y.length;
  // Bands of the symmetric matrix: d0 diagonal, d1 first and d2 second superdiagonal.
  const d0 = new Float64Array(n);
  const d1 = new Float64Array(n);
  const d2 = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    // DᵀD diagonal is 1,5,6,…,6,5,1 and its first off-diagonal −2,−4,…,−4,−2, second off-diagonal 1.
    const diag = i === 0 || i === n - 1 ? 1 : i === 1 || i === n - 2 ? 5 : 6;
    d0[i] = w[i] + lambda * diag;
    if (i < n - 1) d1[i] = lambda * (i === 0 || i === n - 2 ? -2 : -4);
    if (i < n - 2) d2[i] = lambda;
  }
  // In-place factorisation A = L Lᵀ: l0 diagonal, l1, l2 sub-diagonals (stored over d0, d1, d2).
  for (let i = 0; i < n; i++) {
    let a = d0[i];
    if (i >= 1) a -= d1[i - 1] * d1[i - 1];
    if (i >= 2) a -= d2[i - 2] * d2[i - 2];
    if (!(a > 0)) throw new Error(`baselineEstimate: smoothing system not positive definite at row ${i} (λ = ${lambda})`);
    const l = Math.sqrt(a);
    d0[i] = l;
    if (i < n - 1) {
      let b = d1[i];
      if (i >= 1) b -= d2[i - 1] * d1[i - 1];
      d1[i] = b / l;
    }
    if (i < n - 2) d2[i] = d2[i] / l;
  }
  // Forward then back substitution.
  for (let i = 0; i < n; i++) {
    let s = w[i] * y[i];
    if (i >= 1) s -= d1[i - 1] * out[i - 1];
    if (i >= 2) s -= d2[i - 2] * out[i - 2];
    out[i] = s / d0[i];
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = out[i];
    if (i < n - 1) s -= d1[i] * out[i + 1];
    if (i < n - 2) s -= d2[i] * out[i + 2];
    out[i] = s / d0[i];
  }
  return out;
}

/** Linear interpolation of (xs, ys) at ascending xq, held constant beyond the ends. */
function interpolateLinear(xs: Float64Array, ys: Float64Array, xq: ArrayLike<number>): Float64Array {
  const out = new Float64Array(xq.length);
  const m = xs.length;
  let k = 0;
  for (let i = 0; i < xq.length; i++) {
    const v = xq[i];
    if (v <= xs[0]) {
      out[i] = ys[0];
      continue;
    }
    if (v >= xs[m - 1]) {
      out[i] = ys[m - 1];
      continue;
    }
    while (xs[k + 1] < v) k++;
    const t = (v - xs[k]) / (xs[k + 1] - xs[k]);
    out[i] = ys[k] + t * (ys[k + 1] - ys[k]);
  }
  return out;
}
