/**
 * Instrument line shape (ILS) of a Fourier-transform spectrometer with maximum optical path
 * difference L (cm) and an apodization (weighting) function A(u), u = |x|/L, of the interferogram.
 * The measured spectrum is the true one convolved with
 *   ILS(Δν) = ∫_{−L}^{L} A(|x|/L) cos(2π Δν x) dx          (cm, for Δν in cm^-1),
 * whose area is A(0) = 1 for every apodization here. In the interferogram domain the convolution
 * is a product: the Fourier transform of ILS at path difference x is A(|x|/L) for |x| ≤ L, 0 beyond.
 * Source: P. R. Griffiths and J. A. de Haseth, Fourier Transform Infrared Spectrometry, 2nd ed.
 * (Wiley, 2007), ch. 2 (truncation, apodization, sinc and sinc² line shapes); R. H. Norton and
 * R. Beer, J. Opt. Soc. Am. 66, 259 (1976) and erratum 67, 419 (1977) for their apodizations.
 */

/** Apodization functions known to the instrument line shape. */
export const APODIZATION_NAMES = [
  'boxcar',
  'triangular',
  'happ-genzel',
  'norton-beer-weak',
  'norton-beer-medium',
  'norton-beer-strong',
] as const;

/** An apodization name (boxcar = no apodization, the interferogram only truncated at ±L). */
export type ApodizationName = (typeof APODIZATION_NAMES)[number];

/**
 * Norton–Beer coefficients C_i of A(u) = Σ_i C_i (1 − u²)^i, i = 0…4, for the weak, medium and
 * strong functions (FWHM 1.2, 1.4 and 1.6 times that of boxcar by design).
 * Source: Norton & Beer, J. Opt. Soc. Am. 66, 259 (1976), Table; corrected values of the erratum,
 * J. Opt. Soc. Am. 67, 419 (1977). The digits are from memory; the tests check Σ C_i = 1 and the
 * FWHM ratios the paper designed them for.
 */
export const NORTON_BEER_COEFFICIENTS: Record<'weak' | 'medium' | 'strong', readonly number[]> = {
  weak: [0.384093, -0.087577, 0.703484, 0, 0],
  medium: [0.152442, -0.136176, 0.983734, 0, 0],
  strong: [0.045335, 0, 0.554883, 0, 0.399782],
};

/**
 * Happ–Genzel weights A(u) = 0.54 + 0.46 cos(π u).
 * Source: Griffiths & de Haseth (2007), ch. 2 (apodization functions); coefficients from memory.
 */
const HAPP_GENZEL = [0.54, 0.46] as const;

/** Check an apodization name, or throw naming the function and the value. */
export function apodizationCheck(fn: string, name: unknown): ApodizationName {
  if (typeof name !== 'string' || !(APODIZATION_NAMES as readonly string[]).includes(name)) {
    throw new RangeError(`${fn}: unknown apodization '${String(name)}'; known: ${APODIZATION_NAMES.join(', ')}`);
  }
  return name as ApodizationName;
}

/**
 * The apodization weight A(u) at u = |x|/L (dimensionless); 0 for u > 1.
 * Source: Griffiths & de Haseth (2007) ch. 2; Norton & Beer (1976, 1977) for the Norton–Beer family.
 * @param name apodization
 * @param u |x|/L, dimensionless (≥ 0)
 * @returns weight, A(0) = 1
 */
export function apodizationWeight(name: ApodizationName, u: number): number {
  const a = Math.abs(u);
  if (a > 1) return 0;
  switch (name) {
    case 'boxcar':
      return 1;
    case 'triangular':
      return 1 - a;
    case 'happ-genzel':
      return HAPP_GENZEL[0] + HAPP_GENZEL[1] * Math.cos(Math.PI * a);
    default: {
      const c = NORTON_BEER_COEFFICIENTS[name.slice('norton-beer-'.length) as 'weak' | 'medium' | 'strong'];
      const w = 1 - a * a;
      return c[0] + w * (c[1] + w * (c[2] + w * (c[3] + w * c[4])));
    }
  }
}

/**
 * The instrument line shape ILS(Δν) = 2∫_0^L A(x/L) cos(2πΔνx) dx, area 1 over cm^-1.
 * Boxcar and triangular are evaluated in closed form (2L sinc(2πΔνL) and L sinc²(πΔνL));
 * the others by composite Simpson quadrature of the cosine integral with 2048 panels (their
 * A(u) are smooth, so the error is far below 1e-9 of the peak for |Δν| L < 50).
 * Source: Griffiths & de Haseth (2007) ch. 2, eqs. for the sinc and sinc² line shapes.
 * @param name apodization
 * @param opdCm maximum optical path difference L, cm (> 0)
 * @param dnuCm1 offset from the line centre, cm^-1
 * @returns ILS value, cm
 */
export function instrumentLineShape(name: ApodizationName, opdCm: number, dnuCm1: number): number {
  const fn = 'instrumentLineShape';
  apodizationCheck(fn, name);
  if (!(opdCm > 0) || !Number.isFinite(opdCm)) throw new RangeError(`${fn}: opdCm must be finite and > 0, got ${opdCm}`);
  if (!Number.isFinite(dnuCm1)) throw new RangeError(`${fn}: dnuCm1 must be finite, got ${dnuCm1}`);
  if (name === 'boxcar') {
    const z = 2 * Math.PI * dnuCm1 * opdCm;
    return 2 * opdCm * (z === 0 ? 1 : Math.sin(z) / z);
  }
  if (name === 'triangular') {
    const z = Math.PI * dnuCm1 * opdCm;
    const s = z === 0 ? 1 : Math.sin(z) / z;
    return opdCm * s * s;
  }
  const panels = 2048;
  const h = 1 / panels;
  let sum = 0;
  for (let i = 0; i <= panels; i++) {
    const u = i * h;
    const f = apodizationWeight(name, u) * Math.cos(2 * Math.PI * dnuCm1 * opdCm * u);
    sum += (i === 0 || i === panels ? 1 : i % 2 === 1 ? 4 : 2) * f;
  }
  return (2 * opdCm * (sum * h)) / 3;
}

/**
 * Full width at half maximum of the instrument line shape, found by bisection on the central lobe.
 * Source: definition; compare Griffiths & de Haseth (2007) ch. 2 (boxcar 1.207/(2L)).
 * @param name apodization
 * @param opdCm maximum optical path difference L, cm (> 0)
 * @returns FWHM, cm^-1
 */
export function instrumentLineShapeFwhm(name: ApodizationName, opdCm: number): number {
  const peak = instrumentLineShape(name, opdCm, 0);
  // Every ILS here falls below half its peak before Δν = 1/L (the first zero of sinc² is at 1/L).
  let lo = 0;
  let hi = 1 / opdCm;
  for (let i = 0; i < 60; i++) {
    const mid = 0.5 * (lo + hi);
    if (instrumentLineShape(name, opdCm, mid) > 0.5 * peak) lo = mid;
    else hi = mid;
  }
  return 2 * 0.5 * (lo + hi);
}

/**
 * Multiplier of the packed real FFT (spectrumFftReal layout) of a spectrum on a uniform grid
 * that convolves it with the ILS: bin k sits at path difference x_k = k/(N δ) cm and is
 * weighted by A(x_k/L) (0 beyond L).
 * Source: convolution theorem (Griffiths & de Haseth 2007, ch. 2).
 * @param packed packed half spectrum of length N (modified in place)
 * @param stepCm1 grid step δ, cm^-1
 * @param opdCm maximum optical path difference L, cm
 * @param name apodization
 */
export function instrumentApplyToPacked(packed: Float64Array, stepCm1: number, opdCm: number, name: ApodizationName): void {
  const n = packed.length;
  const dx = 1 / (n * stepCm1);
  packed[1] *= apodizationWeight(name, (0.5 * n * dx) / opdCm);
  const kMax = Math.min(n >> 1, Math.floor(opdCm / dx) + 1);
  for (let k = 1; k < n >> 1; k++) {
    if (k > kMax) {
      packed[2 * k] = 0;
      packed[2 * k + 1] = 0;
      continue;
    }
    const w = apodizationWeight(name, (k * dx) / opdCm);
    packed[2 * k] *= w;
    packed[2 * k + 1] *= w;
  }
}
