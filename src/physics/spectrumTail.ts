/**
 * Far Lorentzian wings for spectrumSynthesize: the binned line "sticks" convolved by FFT with the
 * truncated asymptotic Voigt tail, and lines far outside the grid summed through a Chebyshev
 * interpolant. See spectrumSynthesize for the overall method and error budget.
 */
import { spectrumFftReal, spectrumFftRealInverse, spectrumFftTwiddles } from './spectrumFft';

/**
 * Two-term asymptotic Voigt profile far from the centre, area-normalised:
 * A(d) = (γ/π)/r² + σ²γ(3d² − γ²)/(π r⁶), r² = d² + γ², σ² = α²/(2 ln 2) the Gaussian variance.
 * The first neglected term is smaller by ~15σ⁴/d⁴ (γ ≪ |d|).
 * Source: real part of (i/√π)(1/z + 1/(2z³)) with z = (d + iγ)/(σ√2), V = Re w(z)/(σ√(2π));
 * Abramowitz & Stegun (1964) eq. 7.1.23.
 * @param dCm1 offset from the line centre, cm^-1
 * @param gammaCm1 Lorentz HWHM γ, cm^-1
 * @param sigma2Cm2 Gaussian variance σ², cm^-2
 * @returns profile value, cm
 */
export function spectrumTailKernel(dCm1: number, gammaCm1: number, sigma2Cm2: number): number {
  const d2 = dCm1 * dCm1;
  const g2 = gammaCm1 * gammaCm1;
  const inv = 1 / (d2 + g2);
  return (gammaCm1 / Math.PI) * inv * (1 + sigma2Cm2 * (3 * d2 - g2) * inv * inv);
}

/**
 * Cubic Lagrange weights for spreading a unit stick at fractional position f ∈ [0, 1) between
 * nodes 0 and 1 onto nodes −1, 0, 1, 2 (they reproduce cubics exactly).
 * Source: Abramowitz & Stegun (1964) eq. 25.2.13 (four-point Lagrange interpolation; number from memory).
 * @param f fractional position
 * @param w output, length ≥ 4: weights of nodes −1, 0, 1, 2
 */
export function spectrumTailStickWeights(f: number, w: Float64Array): void {
  w[0] = (-f * (f - 1) * (f - 2)) / 6;
  w[1] = ((f + 1) * (f - 1) * (f - 2)) / 2;
  w[2] = (-(f + 1) * f * (f - 2)) / 2;
  w[3] = ((f + 1) * f * (f - 1)) / 6;
}

/** FFT layout of the tail convolution. */
export interface SpectrumTailPlan {
  /** Real FFT length (power of two). */
  fftLength: number;
  /** Margin in grid steps: sticks are binned at indices −margin … npoints + margin − 1. */
  margin: number;
}

/**
 * Choose the FFT length for a grid of npoints and a kernel cut of cut steps: the smallest power
 * of two P ≥ 2(npoints + margin) − 1 with margin ≥ minMargin, then the margin widened to fill P.
 * P ≥ 2(n + M) − 1 keeps every needed offset k − m ∈ (−(n+M), n+M) unaliased.
 * @param npoints grid points
 * @param minMargin smallest acceptable margin, grid steps
 * @returns plan
 */
export function spectrumTailPlan(npoints: number, minMargin: number): SpectrumTailPlan {
  let p = 2;
  while (p < 2 * (npoints + minMargin) - 1) p *= 2;
  return { fftLength: p, margin: (p >> 1) - npoints };
}

/**
 * Add conv(sticks, T) to out, where sticks[q] is the intensity binned at grid index q − margin and
 * T is the tail kernel sampled at integer offsets o with |o| > cut (0 for |o| ≤ cut).
 * Source: circular convolution theorem with zero padding; FFT as in spectrumFft.ts.
 * @param sticks binned intensities, length plan.fftLength (destroyed)
 * @param plan FFT layout
 * @param out spectrum to add to, length npoints
 * @param stepCm1 grid step, cm^-1
 * @param cut kernel cut in grid steps
 * @param gammaCm1 Lorentz HWHM, cm^-1
 * @param sigma2Cm2 Gaussian variance used in the kernel, cm^-2
 */
export function spectrumTailConvolve(
  sticks: Float64Array,
  plan: SpectrumTailPlan,
  out: Float64Array,
  stepCm1: number,
  cut: number,
  gammaCm1: number,
  sigma2Cm2: number,
): void {
  const P = plan.fftLength;
  const half = P >> 1;
  const kernel = new Float64Array(P);
  for (let o = cut + 1; o <= half; o++) {
    const v = spectrumTailKernel(o * stepCm1, gammaCm1, sigma2Cm2);
    kernel[o] = v;
    kernel[P - o] = v;
  }
  const tw = spectrumFftTwiddles(P);
  spectrumFftReal(kernel, tw);
  spectrumFftReal(sticks, tw);
  // The kernel is real and even, so its spectrum is real: scale both parts of each stick bin.
  sticks[0] *= kernel[0];
  sticks[1] *= kernel[1];
  for (let k = 2; k < P; k += 2) {
    const s = kernel[k];
    sticks[k] *= s;
    sticks[k + 1] *= s;
  }
  spectrumFftRealInverse(sticks, tw);
  const n = out.length;
  const m = plan.margin;
  for (let k = 0; k < n; k++) out[k] += sticks[k + m];
}

/** Chebyshev degree for the far-line interpolant (see spectrumTailFarLines). */
const CHEBYSHEV_NODES = 64;

/**
 * Add Σ_i I_i A_i(x_k − ν_i) for lines far from the grid, A_i the two-term asymptotic profile
 * with the line's own σ_i². For more than 2 × 64 points the sum is evaluated at 64 Chebyshev
 * nodes (first kind) on [x_0, x_{n−1}] and interpolated. spectrumSynthesize calls it only for
 * centres at least 1/8 of the grid span beyond its ends, so the nearest singularities (ν ± iγ)
 * lie outside the Bernstein ellipse ρ = 2 and the error bound 4Mρ'^(−64)/(ρ' − 1) with ρ' = 1.8
 * is ~1e-14 of the far-line sum (M ≈ 12× the sum at the nearer end of the grid).
 * Source: L. N. Trefethen, Approximation Theory and Approximation Practice (SIAM 2013), Thm 8.2
 * (from memory); coefficients and Clenshaw sum as in Press et al., Numerical Recipes 3rd ed.
 * (2007) §5.8 (section from memory).
 * @param out spectrum to add to
 * @param fromCm1 grid origin, cm^-1
 * @param stepCm1 grid step, cm^-1
 * @param nu far line centres, cm^-1
 * @param intensity their intensities
 * @param sigma2 their Gaussian variances, cm^-2
 * @param count number of far lines
 * @param gammaCm1 Lorentz HWHM, cm^-1
 */
export function spectrumTailFarLines(
  out: Float64Array,
  fromCm1: number,
  stepCm1: number,
  nu: Float64Array,
  intensity: Float64Array,
  sigma2: Float64Array,
  count: number,
  gammaCm1: number,
): void {
  const n = out.length;
  const sumAt = (x: number): number => {
    let s = 0;
    for (let i = 0; i < count; i++) s += intensity[i] * spectrumTailKernel(x - nu[i], gammaCm1, sigma2[i]);
    return s;
  };
  if (n <= 2 * CHEBYSHEV_NODES) {
    for (let k = 0; k < n; k++) out[k] += sumAt(fromCm1 + k * stepCm1);
    return;
  }
  const nc = CHEBYSHEV_NODES;
  const halfSpan = ((n - 1) * stepCm1) / 2;
  const mid = fromCm1 + halfSpan;
  const values = new Float64Array(nc);
  for (let j = 0; j < nc; j++) values[j] = sumAt(mid + halfSpan * Math.cos((Math.PI * (j + 0.5)) / nc));
  const c = new Float64Array(nc);
  for (let k = 0; k < nc; k++) {
    let s = 0;
    for (let j = 0; j < nc; j++) s += values[j] * Math.cos((Math.PI * k * (j + 0.5)) / nc);
    c[k] = (2 / nc) * s;
  }
  for (let k = 0; k < n; k++) {
    const t = (k * stepCm1 - halfSpan) / halfSpan;
    const t2 = 2 * t;
    let b1 = 0;
    let b2 = 0;
    for (let i = nc - 1; i >= 1; i--) {
      const b0 = c[i] + t2 * b1 - b2;
      b2 = b1;
      b1 = b0;
    }
    out[k] += 0.5 * c[0] + t * b1 - b2;
  }
}
