/**
 * Seeded synthetic traces for the analysis tests: Gaussian and Lorentzian lines of known centre,
 * white Gaussian noise from a seeded generator. Test helper, not part of the product.
 */

/**
 * mulberry32 pseudo-random generator, uniform in [0, 1).
 * Source: T. Ettinger, public-domain "mulberry32" (2017), common practice for seeded test data.
 */
export function randomSeeded(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal deviate by Box–Muller. Source: Box & Muller, Ann. Math. Stat. 29, 610 (1958). */
export function randomNormal(rand: () => number): number {
  const u = 1 - rand();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rand());
}

/** One synthetic line: centre and FWHM in cm^-1, peak height in absorbance. */
export interface SyntheticLine {
  centreCm1: number;
  heightAbs: number;
  fwhmCm1: number;
  shape: 'gaussian' | 'lorentzian';
}

/** Peak-normalised profile value at offset dx (cm^-1) for a line of the given FWHM (cm^-1). */
export function lineProfile(shape: SyntheticLine['shape'], dx: number, fwhmCm1: number): number {
  if (shape === 'gaussian') return Math.exp(-4 * Math.LN2 * (dx / fwhmCm1) ** 2);
  const u = (2 * dx) / fwhmCm1;
  return 1 / (1 + u * u);
}

/** Sum of lines on the given axis, plus `sigma` white noise from `seed` (no noise if sigma = 0). */
export function syntheticAbsorbance(
  axisCm1: Float64Array,
  lines: SyntheticLine[],
  sigma: number,
  seed: number,
  baseline?: (xCm1: number) => number,
): Float64Array {
  const y = new Float64Array(axisCm1.length);
  for (let i = 0; i < axisCm1.length; i++) {
    let v = baseline ? baseline(axisCm1[i]) : 0;
    for (const l of lines) v += l.heightAbs * lineProfile(l.shape, axisCm1[i] - l.centreCm1, l.fwhmCm1);
    y[i] = v;
  }
  if (sigma > 0) {
    const rand = randomSeeded(seed);
    for (let i = 0; i < y.length; i++) y[i] += sigma * randomNormal(rand);
  }
  return y;
}

/** Evenly spaced axis from x0 to x1 inclusive, cm^-1. */
export function axisUniform(x0: number, x1: number, n: number): Float64Array {
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = x0 + ((x1 - x0) * i) / (n - 1);
  return x;
}
