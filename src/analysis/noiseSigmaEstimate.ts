import { arrayMedianInPlace } from './arrayMedian';
import { traceCheck } from './traceCheck';

/** Normal-consistency factor of the median absolute deviation, 1/Φ⁻¹(3/4). Source: Hampel, JASA 69, 383 (1974). */
export const MAD_TO_SIGMA = 1.482602218505602;

/**
 * Robust estimate of the white-noise standard deviation of a trace, in absorbance units.
 *
 * Each interior point gives a pseudo-residual e_i = a_i y_{i-1} + b_i y_{i+1} − y_i with
 * a_i = (x_{i+1} − x_i)/(x_{i+1} − x_{i-1}), b_i = 1 − a_i (the misfit of y_i to the chord through its
 * neighbours, exact for any spacing). For white noise Var(e_i) = σ²(a_i² + b_i² + 1), i.e. 3σ²/2 on an
 * even grid (the second difference has σ·√6). Smooth signal cancels to second order, lines and
 * baseline drift hardly leak in, and the median of |e_i|/√(a_i²+b_i²+1) times 1.4826 ignores the
 * minority of points that sit on steep line flanks.
 * Fallback: if more than half the pseudo-residuals are exactly 0 (quantised or synthetic data) the
 * median is 0 and the root-mean-square of the normalised pseudo-residuals is returned instead.
 *
 * Source: Gasser, Sroka & Jennen-Steinmetz, Biometrika 73, 625 (1986), eqs. 2–3 (pseudo-residuals);
 * the same idea with the MAD as DER_SNR in Stoehr et al., ASP Conf. Ser. 394, 505 (2008) (from memory);
 * MAD factor Hampel (1974).
 * @param wavenumberCm1 ascending abscissa, cm^-1 (any spacing)
 * @param absorbance ordinate, absorbance units
 * @param exclude optional mask, 1 = leave this sample out (e.g. on a known line); a pseudo-residual is
 *   used only when its three samples are all included
 * @returns σ in absorbance units; 0 for fewer than 3 usable points or a noiseless straight line
 */
export function noiseSigmaEstimate(wavenumberCm1: ArrayLike<number>, absorbance: ArrayLike<number>, exclude?: Uint8Array): number {
  traceCheck('noiseSigmaEstimate', wavenumberCm1, absorbance);
  const n = absorbance.length;
  if (exclude && exclude.length !== n) {
    throw new Error(`noiseSigmaEstimate: exclude has ${exclude.length} entries but the trace has ${n}`);
  }
  if (n < 3) return 0;
  const e = new Float64Array(n - 2);
  let sumSq = 0;
  let used = 0;
  for (let i = 1; i < n - 1; i++) {
    if (exclude && exclude[i - 1] | exclude[i] | exclude[i + 1]) continue;
    const span = wavenumberCm1[i + 1] - wavenumberCm1[i - 1];
    const a = (wavenumberCm1[i + 1] - wavenumberCm1[i]) / span;
    const b = 1 - a;
    // Written as differences so a flat stretch gives exactly 0.
    const yi = absorbance[i];
    const r = (a * (absorbance[i - 1] - yi) + b * (absorbance[i + 1] - yi)) / Math.sqrt(a * a + b * b + 1);
    e[used++] = Math.abs(r);
    sumSq += r * r;
  }
  if (used === 0) return 0;
  const med = arrayMedianInPlace(e, used);
  if (med > 0) return MAD_TO_SIGMA * med;
  return Math.sqrt(sumSq / used);
}
