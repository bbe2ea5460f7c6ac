/** Result of {@link gaussianFit}: G(x) = amplitude · exp(−(x − centre)² / (2 sigmaWidth²)). */
export interface GaussianFitResult {
  /** Peak value above the zero level of the data, absorbance units. */
  amplitude: number;
  /** Centre, cm^-1. */
  centreCm1: number;
  /** Gaussian standard width s, cm^-1 (FWHM = 2√(2 ln 2) s). */
  sigmaWidthCm1: number;
  /** 1σ of amplitude, centre and s from σ_noise² (JᵀJ)⁻¹ at the solution; NaN when σ_noise is 0 or the matrix is singular. */
  amplitudeSigma: number;
  centreSigmaCm1: number;
  sigmaWidthSigmaCm1: number;
  /** Sum of squared residuals at the solution, absorbance². */
  residualSumSquares: number;
  /** True when the damped Gauss–Newton iteration met its tolerance. */
  isConverged: boolean;
  iterations: number;
}

/** FWHM of a Gaussian in units of its standard width s: 2√(2 ln 2). */
export const GAUSSIAN_FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);

/**
 * Least-squares fit of a Gaussian (amplitude, centre, width; zero offset) to samples
 * x[i0..i1], d[i0..i1], by Levenberg–Marquardt with multiplicative damping of the diagonal.
 * Meant for the few samples at the top of one line, after the local baseline has been subtracted.
 * Source: Levenberg, Q. Appl. Math. 2, 164 (1944); Marquardt, J. SIAM 11, 431 (1963); covariance
 * σ²(JᵀJ)⁻¹ for known, equal noise σ, e.g. Press et al., Numerical Recipes 3rd ed. (2007), §15.5.
 * @param x abscissa, cm^-1
 * @param d data above the local baseline, absorbance units
 * @param i0 first sample used
 * @param i1 last sample used (≥ i0 + 2)
 * @param start starting amplitude (absorbance), centre (cm^-1), s (cm^-1), all finite, amplitude and s > 0
 * @param noiseSigma noise 1σ of each sample, absorbance units, for the covariance (0 gives NaN sigmas)
 * @returns fitted parameters and their 1σ
 */
export function gaussianFit(
  x: ArrayLike<number>,
  d: ArrayLike<number>,
  i0: number,
  i1: number,
  start: { amplitude: number; centreCm1: number; sigmaWidthCm1: number },
  noiseSigma: number,
): GaussianFitResult {
  let amp = start.amplitude;
  let mu = start.centreCm1;
  let s = start.sigmaWidthCm1;
  let damping = 1e-3;
  let chi2 = gaussianChi2(x, d, i0, i1, amp, mu, s);
  let isConverged = false;
  let iterations = 0;
  const jtj = new Float64Array(9);
  const jtr = new Float64Array(3);
  const damped = new Float64Array(9);
  const inverse = new Float64Array(9);
  const step = new Float64Array(3);
  for (; iterations < 40; iterations++) {
    gaussianNormalEquations(x, d, i0, i1, amp, mu, s, jtj, jtr);
    let improved = false;
    // Raise the damping until a step lowers χ² (at most a few tries per iteration).
    for (let tries = 0; tries < 12; tries++) {
      if (!solve3Damped(jtj, jtr, damping, damped, inverse, step)) {
        damping *= 10;
        continue;
      }
      const a2 = amp + step[0];
      const m2 = mu + step[1];
      const s2 = s + step[2];
      if (!(a2 > 0 && s2 > 0)) {
        damping *= 10;
        continue;
      }
      const c2 = gaussianChi2(x, d, i0, i1, a2, m2, s2);
      if (c2 <= chi2) {
        // Steps below 1e-9 of the width are far inside any centre σ a noisy trace allows.
        const small = Math.abs(step[0]) <= 1e-9 * Math.abs(a2) && Math.abs(step[1]) <= 1e-9 * s2 && Math.abs(step[2]) <= 1e-9 * s2;
        const flat = chi2 - c2 <= 1e-12 * chi2;
        amp = a2;
        mu = m2;
        s = s2;
        chi2 = c2;
        damping = Math.max(damping / 10, 1e-12);
        improved = true;
        if (small || flat) isConverged = true;
        break;
      }
      damping *= 10;
    }
    if (!improved) {
      // No downhill step at any damping: at a minimum to machine precision.
      isConverged = true;
      break;
    }
    if (isConverged) break;
  }
  gaussianNormalEquations(x, d, i0, i1, amp, mu, s, jtj, jtr);
  const cov = invert3(jtj, inverse) ? inverse : null;
  const v = noiseSigma * noiseSigma;
  const sd = (k: number) => (cov && noiseSigma > 0 && cov[k] >= 0 ? Math.sqrt(v * cov[k]) : NaN);
  return {
    amplitude: amp,
    centreCm1: mu,
    sigmaWidthCm1: s,
    amplitudeSigma: sd(0),
    centreSigmaCm1: sd(4),
    sigmaWidthSigmaCm1: sd(8),
    residualSumSquares: chi2,
    isConverged,
    iterations,
  };
}

function gaussianChi2(x: ArrayLike<number>, d: ArrayLike<number>, i0: number, i1: number, amp: number, mu: number, s: number): number {
  let sum = 0;
  const inv = 1 / (2 * s * s);
  for (let i = i0; i <= i1; i++) {
    const t = x[i] - mu;
    const r = d[i] - amp * Math.exp(-t * t * inv);
    sum += r * r;
  }
  return sum;
}

function gaussianNormalEquations(
  x: ArrayLike<number>,
  d: ArrayLike<number>,
  i0: number,
  i1: number,
  amp: number,
  mu: number,
  s: number,
  jtj: Float64Array,
  jtr: Float64Array,
): void {
  jtj.fill(0);
  jtr.fill(0);
  const inv = 1 / (2 * s * s);
  for (let i = i0; i <= i1; i++) {
    const t = x[i] - mu;
    const e = Math.exp(-t * t * inv);
    const g0 = e;
    const g1 = (amp * e * t) / (s * s);
    const g2 = (amp * e * t * t) / (s * s * s);
    const r = d[i] - amp * e;
    jtj[0] += g0 * g0;
    jtj[1] += g0 * g1;
    jtj[2] += g0 * g2;
    jtj[4] += g1 * g1;
    jtj[5] += g1 * g2;
    jtj[8] += g2 * g2;
    jtr[0] += g0 * r;
    jtr[1] += g1 * r;
    jtr[2] += g2 * r;
  }
  jtj[3] = jtj[1];
  jtj[6] = jtj[2];
  jtj[7] = jtj[5];
}

/** Solve (JᵀJ + damping·diag(JᵀJ)) δ = Jᵀr into `step` (scratch a, inv); false if singular. */
function solve3Damped(
  jtj: Float64Array,
  jtr: Float64Array,
  damping: number,
  a: Float64Array,
  inv: Float64Array,
  step: Float64Array,
): boolean {
  a.set(jtj);
  a[0] *= 1 + damping;
  a[4] *= 1 + damping;
  a[8] *= 1 + damping;
  if (!invert3(a, inv)) return false;
  step[0] = inv[0] * jtr[0] + inv[1] * jtr[1] + inv[2] * jtr[2];
  step[1] = inv[3] * jtr[0] + inv[4] * jtr[1] + inv[5] * jtr[2];
  step[2] = inv[6] * jtr[0] + inv[7] * jtr[1] + inv[8] * jtr[2];
  return true;
}

/** Inverse of a 3×3 matrix (row-major) by cofactors into `out`; false when singular to working precision. */
function invert3(m: Float64Array, out: Float64Array): boolean {
  const c00 = m[4] * m[8] - m[5] * m[7];
  const c01 = m[5] * m[6] - m[3] * m[8];
  const c02 = m[3] * m[7] - m[4] * m[6];
  const det = m[0] * c00 + m[1] * c01 + m[2] * c02;
  const scale = Math.abs(m[0] * m[4] * m[8]) + Math.abs(m[1] * m[5] * m[6]) + Math.abs(m[2] * m[3] * m[7]);
  if (!(Math.abs(det) > 1e-14 * scale) || !Number.isFinite(det)) return false;
  const r = 1 / det;
  const o1 = (m[2] * m[7] - m[1] * m[8]) * r;
  const o2 = (m[1] * m[5] - m[2] * m[4]) * r;
  const o4 = (m[0] * m[8] - m[2] * m[6]) * r;
  const o5 = (m[2] * m[3] - m[0] * m[5]) * r;
  const o7 = (m[1] * m[6] - m[0] * m[7]) * r;
  const o8 = (m[0] * m[4] - m[1] * m[3]) * r;
  out[0] = c00 * r;
  out[1] = o1;
  out[2] = o2;
  out[3] = c01 * r;
  out[4] = o4;
  out[5] = o5;
  out[6] = c02 * r;
  out[7] = o7;
  out[8] = o8;
  return true;
}
