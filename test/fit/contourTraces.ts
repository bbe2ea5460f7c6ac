/**
 * Seeded generator of low-resolution band traces for the contour-fit and classify tests and the
 * bench. Written apart from the code under test: the instrument is the closed-form line shape
 * summed line by line (boxcar 2L sinc(2πΔνL) or triangular L sinc²(πΔνL), Griffiths & de Haseth,
 * Fourier Transform Infrared Spectrometry, 2nd ed. (2007) ch. 2) in the weak-absorption limit
 * (absorbance = scale × Σ I_i ILS(x − ν_i); the Doppler width, < 2e-3 cm^-1, is neglected beside
 * 1/(2L) ≥ 0.125 cm^-1), no FFT and no internal grid. Only the line list (positions and relative
 * intensities) comes from the project's bandLines, itself tested against Herzberg's formulas.
 */
import { bandLines } from '../../src/physics/bandLines';
import { stateConstantsFrom, type BandModel, type BandType, type TopShape } from '../../src/physics/model';

/** Small seeded PRNG (mulberry32; T. Ettinger, public-domain snippet, from memory). */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal deviate by Box–Muller (Box & Muller, Ann. Math. Stat. 29, 610 (1958)). */
export function gaussian(rand: () => number): number {
  const u = Math.max(rand(), 1e-300);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rand());
}

/** What a generated case is made of. */
export interface TraceCase {
  name: string;
  model: BandModel;
  massAmu: number;
  opdCm: number;
  apodization: TraceApodization;
  /** Peak absorbance of the noise-free band (decadic) and the noise σ. */
  peakAbsorbance: number;
  noiseSigma: number;
  /** Region of the trace, cm^-1. */
  fromCm1: number;
  toCm1: number;
  x: Float64Array;
  /** Noise-free and noisy absorbance. */
  truth: Float64Array;
  noisy: Float64Array;
  /** Expected profile of the band. */
  profile: 'PR' | 'PQR' | 'Q-series';
}

/** Apodizations the generator knows (closed form for boxcar and triangular, quadrature for the rest). */
export type TraceApodization = 'boxcar' | 'triangular' | 'happ-genzel' | 'norton-beer-weak' | 'norton-beer-medium' | 'norton-beer-strong';

/**
 * Apodization weight at u = x/L ∈ [0, 1], written here apart from src/physics: Happ–Genzel
 * 0.54 + 0.46 cos(πu) (Happ & Genzel, Infrared Phys. 1, 39 (1961)); Norton–Beer Σ c_i (1 − u²)^i with
 * c = weak (0.384093, −0.087577, 0.703484), medium (0.152442, −0.136176, 0.983734), strong (0.045335,
 * 0, 0.554883, 0, 0.399782) (Norton & Beer, JOSA 66, 259 (1976), as corrected in 1977; from memory).
 */
function traceApodizationWeight(apodization: TraceApodization, u: number): number {
  const q = 1 - u * u;
  switch (apodization) {
    case 'boxcar':
      return 1;
    case 'triangular':
      return 1 - u;
    case 'happ-genzel':
      return 0.54 + 0.46 * Math.cos(Math.PI * u);
    case 'norton-beer-weak':
      return 0.384093 - 0.087577 * q + 0.703484 * q * q;
    case 'norton-beer-medium':
      return 0.152442 - 0.136176 * q + 0.983734 * q * q;
    case 'norton-beer-strong':
      return 0.045335 + 0.554883 * q * q + 0.399782 * q ** 4;
  }
}

/**
 * The instrument line shape 2∫₀ᴸ A(x/L) cos(2πΔν x) dx as a function of Δν (cm^-1), for any
 * apodization: boxcar and triangular in closed form, the others tabulated once by Simpson's rule
 * (800 panels over [0, L]) at steps of 1/(64L) and interpolated linearly (error < 1e-4 of the peak).
 */
export function traceIls(apodization: TraceApodization, opdCm: number): (d: number) => number {
  if (apodization === 'boxcar' || apodization === 'triangular') return (d) => ilsClosedForm(apodization, opdCm, d);
  const reach = 41 / opdCm;
  const h = 1 / (64 * opdCm);
  const m = Math.ceil(reach / h) + 2;
  const table = new Float64Array(m);
  const panels = 800;
  for (let k = 0; k < m; k++) {
    const d = k * h;
    let s = 0;
    for (let j = 0; j <= panels; j++) {
      const u = j / panels;
      const w = j === 0 || j === panels ? 1 : j % 2 ? 4 : 2;
      s += w * traceApodizationWeight(apodization, u) * Math.cos(2 * Math.PI * d * u * opdCm);
    }
    table[k] = (2 * opdCm * s) / (3 * panels);
  }
  return (d) => {
    const t = Math.abs(d) / h;
    const k = Math.floor(t);
    if (k >= m - 1) return 0;
    return table[k] + (t - k) * (table[k + 1] - table[k]);
  };
}

/** The closed-form instrument line shapes (see the module comment). */
export function ilsClosedForm(apodization: 'boxcar' | 'triangular', opdCm: number, d: number): number {
  if (apodization === 'boxcar') {
    const z = 2 * Math.PI * d * opdCm;
    return 2 * opdCm * (z === 0 ? 1 : Math.sin(z) / z);
  }
  const z = Math.PI * d * opdCm;
  const s = z === 0 ? 1 : Math.sin(z) / z;
  return opdCm * s * s;
}

/**
 * Adds to raw[k] the instrument line shape of every line farther than `reach` from x[k] (the wings
 * the line-by-line sum leaves out). With d = x − ν, a = 2πLx, c_i = cos 2πLν_i, s_i = sin 2πLν_i:
 * boxcar 2L sinc(2πdL) = sin(2πLd)/(πd) = (sin a·c_i − cos a·s_i)/(πd); triangular L sinc²(πdL) =
 * (1 − cos 2πLd)/(2π²Ld²) = (1 − cos a·c_i − sin a·s_i)/(2π²Ld²) (angle-difference identities), so
 * each pair costs a few multiplications.
 */
function ilsWingsAdd(
  raw: Float64Array,
  x: Float64Array,
  nu: Float64Array,
  intensity: Float64Array,
  apodization: 'boxcar' | 'triangular',
  opdCm: number,
  reach: number,
): void {
  const w = 2 * Math.PI * opdCm;
  const cosNu = nu.map((v) => Math.cos(w * v));
  const sinNu = nu.map((v) => Math.sin(w * v));
  for (let k = 0; k < x.length; k++) {
    const ca = Math.cos(w * x[k]);
    const sa = Math.sin(w * x[k]);
    let s = 0;
    for (let i = 0; i < nu.length; i++) {
      const d = x[k] - nu[i];
      if (Math.abs(d) <= reach) continue;
      s +=
        apodization === 'boxcar'
          ? (intensity[i] * (sa * cosNu[i] - ca * sinNu[i])) / (Math.PI * d)
          : (intensity[i] * (1 - ca * cosNu[i] - sa * sinNu[i])) / (2 * Math.PI * Math.PI * opdCm * d * d);
    }
    raw[k] += s;
  }
}

/** Parameters of one case. */
export interface TraceSpec {
  name?: string;
  shape: TopShape;
  band: BandType;
  /** Lower-state B, cm^-1. */
  B: number;
  /** Lower-state unique constant (A for prolate, C for oblate), cm^-1. */
  unique?: number;
  zeta?: number;
  temperatureK: number;
  opdCm: number;
  apodization: TraceApodization;
  origin: number;
  /** Relative change of B and of the unique constant in the upper state. */
  deltaBRel?: number;
  deltaURel?: number;
  peakAbsorbance?: number;
  /** Noise σ relative to the peak absorbance. */
  noiseRel: number;
  seed: number;
  /** Points per 1/(2L). @default 2 */
  pointsPerResolution?: number;
  /** Quadratic baseline term at the region's ends, absorbance (0 when absent). */
  baselineCurvature?: number;
  /** Nuclear-spin weights g(K) = spinWeights[K mod length]. @default [1] */
  spinWeights?: number[];
  /**
   * 'truncated' sums each line's instrument line shape only within 40/L of it; 'full' (boxcar and
   * triangular only) adds the wings beyond, summed over every line. A boxcar wing falls as 1/Δν, and
   * a resolved comb whose spacing is close to a multiple of 1/(2L) adds the wings of many lines in
   * phase: cut at 40/L they leave up to ~1 % of the peak (a linear Σ–Σ band, B = 0.28 cm^-1, at
   * L = 3.54 cm: 1.57× a noise of 0.4 % of the peak; 0.21× with the wings).
   * @default 'truncated' (the traces the band-shape tests were set on)
   */
  ilsWings?: 'truncated' | 'full';
  /**
   * Optical depth at the centre of the line deepest there. Given, the trace is made as a spectrometer
   * records lines that may be optically thick at their own width: τ(ν) from Doppler profiles (mass
   * `massAmu`, the spec's T) on a fine grid, the instrument line shape applied to the transmittance,
   * A = −log10 T; peakAbsorbance is then what comes out, not a setting. Absent: the weak-absorption
   * trace (the instrument line shape applied to the lines' intensities, scaled to peakAbsorbance).
   */
  peakTau?: number;
  /** Molecular mass for the Doppler widths with peakTau, amu. @default 50 */
  massAmu?: number;
}

const C2 = 1.438776877; // second radiation constant hc/k, cm K (CODATA 2018)

/** Build the band model of a spec (thermally sensible jMax and kMax). */
export function traceModel(spec: TraceSpec): BandModel {
  const { shape, band, B, temperatureK: T } = spec;
  const u = spec.unique ?? 0;
  // An oblate top's lowest level of each J is K = J, F ≈ CJ(J + 1) (Herzberg II (1945) ch. I): its
  // levels reach higher J than B alone says, and every K ≤ J is populated.
  const oblate = shape === 'oblate' && u < B;
  const jT = Math.sqrt(T / (C2 * (oblate ? u : B)));
  const jMax = Math.min(400, Math.ceil(3.2 * jT + 5));
  const kT = shape === 'linear' ? 0 : Math.sqrt(T / (C2 * Math.max(Math.abs(u - B), 0.02)));
  const kMax = shape === 'linear' ? 0 : oblate ? jMax : Math.min(jMax, Math.ceil(3.2 * kT + 3));
  const dB = (spec.deltaBRel ?? -0.003) * B;
  const dU = (spec.deltaURel ?? -0.004) * u;
  const lower = stateConstantsFrom(shape === 'linear' ? { B } : shape === 'prolate' ? { B, A: u } : { B, C: u });
  const upperBase = shape === 'linear' ? { B: B + dB } : shape === 'prolate' ? { B: B + dB, A: u + dU } : { B: B + dB, C: u + dU };
  const upper = stateConstantsFrom({
    ...upperBase,
    origin: spec.origin,
    zeta: shape !== 'linear' && band === 'perpendicular' ? (spec.zeta ?? 0) : 0,
  });
  return { shape, band, lower, upper, temperatureK: T, jMax, kMax, spinWeights: spec.spinWeights ?? [1] };
}

/** What traceThickAbsorbance needs besides the lines: the instrument, the gas and the deepest line's depth. */
export interface TraceThickOptions {
  opdCm: number;
  apodization: TraceApodization;
  temperatureK: number;
  massAmu: number;
  /** Optical depth at the centre of the line deepest there (strength over Doppler width largest). */
  peakTau: number;
  /** How far the instrument line shape is applied from each point, cm^-1. */
  reachCm1: number;
}

/**
 * The absorbance a spectrometer records of lines that may be optically thick at their own width:
 * −log10 of the instrument line shape applied to exp(−τ). τ(ν) is the sum of Doppler profiles (HWHM
 * ν·√(2 ln2 kT/(m c²)) = ν·3.5811e-7·√(T/m), Herzberg II (1945) ch. I) on a grid of a quarter of the
 * narrowest HWHM, each line's area proportional to its strength and the deepest line's centre at
 * peakTau; 1 − exp(−τ) is shared between bins of 1/(16L) (the instrument line shape changes little
 * across one) and the bins are convolved with it out to reachCm1, its kernel summed to 1.
 * @param x ascending trace axis, cm^-1 (its step a multiple of 1/(16L) puts each point on a bin centre)
 * @param nu line positions, ascending, cm^-1
 * @param intensity relative line strengths (integrated)
 * @returns decadic absorbance at x
 */
export function traceThickAbsorbance(
  x: Float64Array,
  nu: ArrayLike<number>,
  intensity: ArrayLike<number>,
  o: TraceThickOptions,
): Float64Array {
  const L = o.opdCm;
  const dopplerPerCm1 = 3.5811e-7 * Math.sqrt(o.temperatureK / o.massAmu);
  const fine = (dopplerPerCm1 * nu[0]) / 4;
  const bin = 1 / (16 * L);
  const rBins = Math.ceil(o.reachCm1 / bin);
  // Bin t is centred at x[0] + (t − rBins)·bin: a trace point (a whole number of bins from x[0] when
  // its step is a multiple of the bin, as at 2 points per 1/(2L)) sits on a bin centre.
  const x0 = x[0] - (rBins + 0.5) * bin;
  const nBins = Math.ceil((x[x.length - 1] - x[0]) / bin) + 2 * rBins + 2;
  const absorbed = new Float64Array(nBins);
  // Each line's area is its strength; its peak is the area over its width, and the Doppler width grows
  // with ν, so the line deepest at its centre sets the scale (not the strongest: across a band ±1 %
  // wide that would skew the areas by ±1 %, which a contour fit reads as biased constants).
  let sMax = 0;
  for (let l = 0; l < intensity.length; l++) sMax = Math.max(sMax, intensity[l] / nu[l]);
  // τ on the fine grid, one stretch of lines at a time (lines closer than 12 HWHM share a stretch).
  let i = 0;
  while (i < nu.length) {
    let j = i;
    while (j + 1 < nu.length && nu[j + 1] - nu[j] < 12 * dopplerPerCm1 * nu[j]) j++;
    const a = nu[i] - 6 * dopplerPerCm1 * nu[i];
    const b = nu[j] + 6 * dopplerPerCm1 * nu[j];
    const m = Math.ceil((b - a) / fine) + 1;
    const tau = new Float64Array(m);
    for (let l = i; l <= j; l++) {
      const hw = dopplerPerCm1 * nu[l];
      const c = Math.round((nu[l] - a) / fine);
      const r = Math.ceil((6 * hw) / fine);
      const amp = (o.peakTau * intensity[l]) / nu[l] / sMax;
      for (let k = Math.max(0, c - r); k <= Math.min(m - 1, c + r); k++) {
        const d = (a + k * fine - nu[l]) / hw;
        tau[k] += amp * Math.exp(-Math.LN2 * d * d);
      }
    }
    for (let k = 0; k < m; k++) {
      // Shared between the two nearest bin centres (x0 + (q + 0.5)·bin) in proportion, so that a line
      // narrower than a bin keeps its position.
      const u = (a + k * fine - x0) / bin - 0.5;
      const q = Math.floor(u);
      const f = u - q;
      const area = (1 - Math.exp(-tau[k])) * fine;
      if (q >= 0 && q < nBins) absorbed[q] += (1 - f) * area;
      if (q + 1 >= 0 && q + 1 < nBins) absorbed[q + 1] += f * area;
    }
    i = j + 1;
  }
  const ils = traceIls(o.apodization, L);
  const kernel = new Float64Array(2 * rBins + 1);
  let kSum = 0;
  for (let q = -rBins; q <= rBins; q++) kSum += kernel[q + rBins] = ils(q * bin);
  for (let q = 0; q < kernel.length; q++) kernel[q] /= kSum * bin;
  const out = new Float64Array(x.length);
  for (let k = 0; k < x.length; k++) {
    const c = Math.round((x[k] - x[0]) / bin) + rBins;
    let s = 0;
    for (let q = -rBins; q <= rBins; q++) {
      const t = c + q;
      if (t >= 0 && t < nBins && absorbed[t] !== 0) s += kernel[q + rBins] * absorbed[t];
    }
    out[k] = -Math.log10(Math.max(1e-12, 1 - s));
  }
  return out;
}

/**
 * How far thick traces apply the instrument line shape, cm^-1: the boxcar and triangular wings over the
 * whole region (as ilsWings 'full' does for the weak-absorption route), the tabulated shapes to 40/L,
 * where they have died away.
 */
export function traceThickReach(apodization: TraceApodization, opdCm: number, regionCm1: number): number {
  return apodization === 'boxcar' || apodization === 'triangular' ? regionCm1 + 40 / opdCm : 40 / opdCm;
}

/** Generate one case (deterministic for its seed). */
export function traceGenerate(spec: TraceSpec): TraceCase {
  const model = traceModel(spec);
  const lines = bandLines(model, { minIntensity: 1e-4 });
  // Region: where the lines hold all but 0.2 % of the intensity, plus 8/L.
  const order = Array.from({ length: lines.count }, (_, i) => i).sort((a, b) => lines.wavenumberCm1[a] - lines.wavenumberCm1[b]);
  let total = 0;
  for (let i = 0; i < lines.count; i++) total += lines.intensity[i];
  let acc = 0;
  let lo = lines.wavenumberCm1[order[0]];
  let hi = lines.wavenumberCm1[order[order.length - 1]];
  for (const i of order) {
    acc += lines.intensity[i];
    if (acc < 0.001 * total) lo = lines.wavenumberCm1[i];
    if (acc <= 0.999 * total) hi = lines.wavenumberCm1[i];
  }
  const L = spec.opdCm;
  const fromCm1 = lo - 8 / L;
  const toCm1 = hi + 8 / L;
  const step = 1 / (2 * L) / (spec.pointsPerResolution ?? 2);
  const n = Math.floor((toCm1 - fromCm1) / step) + 1;
  const x = Float64Array.from({ length: n }, (_, i) => fromCm1 + i * step);
  const raw = new Float64Array(n);
  const sortedNu = Float64Array.from(order.map((i) => lines.wavenumberCm1[i]));
  const sortedI = Float64Array.from(order.map((i) => lines.intensity[i]));
  const reach = 40 / L;
  if (spec.peakTau !== undefined) {
    raw.set(
      traceThickAbsorbance(x, sortedNu, sortedI, {
        opdCm: L,
        apodization: spec.apodization,
        temperatureK: spec.temperatureK,
        massAmu: spec.massAmu ?? 50,
        peakTau: spec.peakTau,
        reachCm1: traceThickReach(spec.apodization, L, toCm1 - fromCm1),
      }),
    );
  } else {
    // The weak-absorption trace: each line's instrument line shape, summed out to 40/L.
    const ils = traceIls(spec.apodization, L);
    let first = 0;
    for (let k = 0; k < n; k++) {
      while (first < sortedNu.length && sortedNu[first] < x[k] - reach) first++;
      let s = 0;
      for (let i = first; i < sortedNu.length && sortedNu[i] <= x[k] + reach; i++) s += sortedI[i] * ils(x[k] - sortedNu[i]);
      raw[k] = s;
    }
  }
  if (spec.ilsWings === 'full') {
    if (spec.peakTau !== undefined) throw new Error('traceGenerate: peakTau traces keep their wings already');
    if (spec.apodization !== 'boxcar' && spec.apodization !== 'triangular') {
      throw new Error(`traceGenerate: full wings are written for boxcar and triangular only, got ${spec.apodization}`);
    }
    ilsWingsAdd(raw, x, sortedNu, sortedI, spec.apodization, L, reach);
  }
  let peak = 0;
  for (let k = 0; k < n; k++) peak = Math.max(peak, raw[k]);
  const peakAbsorbance = spec.peakTau !== undefined ? peak : (spec.peakAbsorbance ?? 0.5);
  const rand = seededRandom(spec.seed);
  const noiseSigma = spec.noiseRel * peakAbsorbance;
  const truth = new Float64Array(n);
  const noisy = new Float64Array(n);
  // The baseline's terms are set for a band of peak absorbance 0.5; a peakTau band's own peak scales them.
  const baseScale = spec.peakTau !== undefined ? peakAbsorbance / 0.5 : 1;
  const base0 = (0.02 + 0.02 * rand()) * baseScale;
  const slope = 0.01 * (rand() - 0.5) * baseScale;
  const curvature = (spec.baselineCurvature ?? 0) * baseScale;
  for (let k = 0; k < n; k++) {
    const tt = (2 * x[k] - fromCm1 - toCm1) / (toCm1 - fromCm1);
    truth[k] = (raw[k] / peak) * peakAbsorbance + base0 + slope * tt + curvature * tt * tt;
    noisy[k] = truth[k] + noiseSigma * gaussian(rand);
  }
  const profile = spec.shape === 'linear' ? (spec.band === 'parallel' ? 'PR' : 'PQR') : spec.band === 'parallel' ? 'PQR' : 'Q-series';
  return {
    name: spec.name ?? `${spec.shape}-${spec.band}-B${spec.B}-L${L}`,
    model,
    massAmu: spec.massAmu ?? 50,
    opdCm: L,
    apodization: spec.apodization,
    peakAbsorbance,
    noiseSigma,
    fromCm1,
    toCm1,
    x,
    truth,
    noisy,
    profile,
  };
}

/**
 * A seeded spec drawn across the target space: shape, band type, B 0.05–2 cm^-1 (log-uniform), A/C,
 * ζ, T 150–400 K, L 0.9–4 cm, apodization, noise 0.3–2 % of the peak.
 */
export function traceSpecRandom(seed: number): TraceSpec {
  const r = seededRandom(seed * 7919 + 13);
  const shapes: TopShape[] = ['prolate', 'oblate', 'linear'];
  const shape = shapes[Math.floor(r() * 3)];
  const band: BandType = r() < 0.5 ? 'parallel' : 'perpendicular';
  const B = Math.exp(Math.log(0.05) + r() * Math.log(2 / 0.05));
  const unique = shape === 'prolate' ? B * (3 + 12 * r()) : shape === 'oblate' ? B * (0.5 + 0.3 * r()) : undefined;
  return {
    name: `random-${seed}`,
    shape,
    band,
    B,
    unique,
    zeta: shape === 'prolate' ? -0.3 + 0.9 * r() : shape === 'oblate' ? -0.6 + 0.8 * r() : 0,
    temperatureK: 150 + 250 * r(),
    opdCm: 0.9 + 3.1 * r(),
    apodization: r() < 0.5 ? 'boxcar' : 'triangular',
    origin: 700 + 2000 * r(),
    noiseRel: 0.003 + 0.017 * r(),
    seed: seed + 1,
  };
}

/** Apodizations drawn by classifySpecRandom. */
const TRACE_APODIZATIONS: TraceApodization[] = [
  'boxcar',
  'triangular',
  'happ-genzel',
  'norton-beer-weak',
  'norton-beer-medium',
  'norton-beer-strong',
];

/**
 * A seeded spec for the band-shape diagnosis across the target space: prolate, oblate and linear;
 * parallel (Σ–Σ) and perpendicular (Π–Σ); heavy (B 0.02–0.3 cm^-1) or light (B 0.3–3 cm^-1),
 * log-uniform; A/B 2–20 (prolate), C/B 0.5–0.9 (oblate); ζ −0.4…0.7 (prolate), −0.7…0.3 (oblate);
 * T 100–400 K; L 0.9–4 cm; every apodization; noise 0.2–3 % of the peak; a linear and a curved
 * baseline.
 */
export function classifySpecRandom(seed: number): TraceSpec {
  const r = seededRandom(seed * 104729 + 71);
  const shapes: TopShape[] = ['prolate', 'oblate', 'linear'];
  const shape = shapes[Math.floor(r() * 3)];
  const band: BandType = r() < 0.5 ? 'parallel' : 'perpendicular';
  const heavy = r() < 0.5;
  const [bLo, bHi] = heavy ? [0.02, 0.3] : [0.3, 3];
  const B = Math.exp(Math.log(bLo) + r() * Math.log(bHi / bLo));
  const unique = shape === 'prolate' ? B * (2 + 18 * r()) : shape === 'oblate' ? B * (0.5 + 0.4 * r()) : undefined;
  return {
    name: `classify-${seed}`,
    shape,
    band,
    B,
    unique,
    zeta: shape === 'prolate' ? -0.4 + 1.1 * r() : shape === 'oblate' ? -0.7 + 1.0 * r() : 0,
    temperatureK: 100 + 300 * r(),
    opdCm: 0.9 + 3.1 * r(),
    apodization: TRACE_APODIZATIONS[Math.floor(r() * TRACE_APODIZATIONS.length)],
    origin: 700 + 2000 * r(),
    noiseRel: 0.002 + 0.028 * r(),
    baselineCurvature: 0.03 * (r() - 0.5),
    seed: seed + 1,
  };
}

/**
 * How well the instrument passes a comb of period d (cm^-1): a comb's fundamental lives at optical
 * path difference 1/d in the interferogram, which the instrument records only up to L and weights by
 * its apodization A(x/L); the comb's modulation in the spectrum is scaled by A(1/(d·L)), and is 0 when
 * 1/d > L (the Fourier pair of the instrument line shape, Griffiths & de Haseth (2007) ch. 2).
 */
export function traceCombTransfer(apodization: TraceApodization, opdCm: number, periodCm1: number): number {
  const u = 1 / (Math.abs(periodCm1) * opdCm);
  return u >= 1 ? 0 : traceApodizationWeight(apodization, u);
}

/** Comb transfer above which a series of Q branches counts as shown, and below which as merged. */
export const TRACE_Q_SHOWN_TRANSFER = 0.3;
export const TRACE_Q_MERGED_TRANSFER = 0.1;

/**
 * The profile a case shows: its band's own (PR, PQR, Q-series), except that a perpendicular band of
 * a symmetric top whose Q-branch comb the instrument passes with a modulation transfer below
 * TRACE_Q_MERGED_TRANSFER (traceCombTransfer) shows its Q branches merged into one central maximum, a
 * P, Q, R contour. Between TRACE_Q_MERGED_TRANSFER and TRACE_Q_SHOWN_TRANSFER the series is faint
 * and either reading is accepted (`ambiguous`), as long as it is not rated high.
 * Thresholds: rule of thumb (common practice: a modulation of a few tenths of the comb's mean stands out
 * of a few per cent noise; one of a few hundredths does not).
 */
export function traceVisibleProfile(c: TraceCase): {
  profile: TraceCase['profile'];
  qSpacing: number;
  qResolved: boolean;
  ambiguous: boolean;
  transfer: number;
} {
  const m = c.model;
  const u = m.shape === 'prolate' ? m.upper.A : m.upper.C;
  const qSpacing = 2 * (u * (1 - m.upper.zeta) - m.upper.B);
  const transfer = c.profile === 'Q-series' ? traceCombTransfer(c.apodization, c.opdCm, qSpacing) : 1;
  const qResolved = transfer >= TRACE_Q_MERGED_TRANSFER;
  const ambiguous = c.profile === 'Q-series' && transfer >= TRACE_Q_MERGED_TRANSFER && transfer < TRACE_Q_SHOWN_TRANSFER;
  if (c.profile === 'Q-series' && !qResolved) return { profile: 'PQR', qSpacing, qResolved, ambiguous, transfer };
  return { profile: c.profile, qSpacing, qResolved, ambiguous, transfer };
}
