/**
 * Seeded generator of rovibrational bands for the assignment-assistant benchmark: an invented
 * molecule (prolate, oblate or linear), its true line list, a measured-looking trace file and a
 * user's first guess with seeds.
 *
 * Everything here is written from the published formulas, independently of src/physics (no import
 * from the code under test), so a physics error there shows up as lost recall or precision:
 * term values from the headless contract (DEVELOPERS.md, "The model file and formulas"),
 * Hönl–London factors and intensities from Herzberg II (1945) ch. IV, the line shape as a
 * pseudo-Voigt summed over the whole trace (no window). Test code, not part of the product.
 */

/** c2 = hc/k, cm K. Source: CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021)). */
const C2_CM_K = 1.438776877;
/** Doppler HWHM / ν = sqrt(2 ln2 k T / (m c²)) = 3.5812e-7 sqrt(T/K / (m/amu)). Source: Hollas, High Resolution Spectroscopy (1998) eq. 2.15 (constant from CODATA 2018). */
export const BENCH_DOPPLER_HWHM_PER_NU = 3.581163e-7;
/** Half width, in FWHM, of the exact pseudo-Voigt around each line (its Lorentz wing there is 7e-7 of the peak). */
const NEAR_FWHM = 300;

/** mulberry32, uniform in [0, 1). Source: T. Ettinger, public-domain "mulberry32" (2017). */
export function benchRandom(seed: number): () => number {
  let a = (seed * 2654435761) >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal deviate (Box & Muller, Ann. Math. Stat. 29, 610 (1958)). */
function normal(rand: () => number): number {
  const u = 1 - rand();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rand());
}

const uniform = (rand: () => number, lo: number, hi: number) => lo + (hi - lo) * rand();
const pick = <T>(rand: () => number, xs: readonly T[]): T => xs[Math.floor(rand() * xs.length)];

/** Constants of one state by model-file name, cm^-1 (ζ dimensionless). Absent = 0. */
export type BenchState = Record<string, number>;

/** The true band. */
export interface BenchTruth {
  shape: 'prolate' | 'oblate' | 'linear';
  band: 'parallel' | 'perpendicular';
  lower: BenchState;
  upper: BenchState;
  temperatureK: number;
  spinWeights: number[];
  massAmu: number;
  lorentzHwhmCm1: number;
}

/** One true line. */
export interface BenchLine {
  jUpper: number;
  kUpper: number;
  jLower: number;
  kLower: number;
  /** Position, cm^-1. */
  nuCm1: number;
  /** Integrated absorbance (arbitrary scale before the band is scaled), cm^-1. */
  area: number;
  /** Peak absorbance of the line alone on the trace. */
  peakAbs: number;
  /** Peak SNR of the line alone (peak absorbance / absorbance noise at the line). */
  snr: number;
  /** No other line above 10 % of its intensity within 1.5 FWHM. */
  isResolvable: boolean;
}

/** A generated band: truth, files for the CLI and what scoring needs. */
export interface BenchBand {
  id: number;
  truth: BenchTruth;
  lines: BenchLine[];
  /** Voigt FWHM at the band centre, cm^-1. */
  fwhmCm1: number;
  /** Trace file name and text. */
  traceName: string;
  traceText: string;
  nPoints: number;
  /** First-guess model file (JSON text). */
  modelText: string;
  /** Seed line table (CSV) or null for a model-only start. */
  seedsText: string | null;
  /** Seeds given (0 when the band had too few clear lines for the drawn count). */
  nSeeds: number;
  /** One line describing the band. */
  summary: string;
}

/** Options of benchBand. */
export interface BenchBandOptions {
  /** Number of seeds (0, 3 or 10); drawn when absent. */
  seeds?: 0 | 3 | 10;
  /** Largest J'' of the truth (smaller bands for the unit-test subset). @default 100 */
  jLimit?: number;
  /** Largest K'' of the truth. @default 30 */
  kLimit?: number;
  /** Largest number of trace points (the range is kept, the points per FWHM drop if needed). @default 400000 */
  maxPoints?: number;
}

/**
 * Term value F(J, K), cm^-1, of the headless contract:
 * F = B J(J+1) + (A−B) K² − DJ J²(J+1)² − DJK J(J+1) K² − DK K⁴ + HJ J³(J+1)³ + HJK J²(J+1)² K² + HKJ J(J+1) K⁴ + HK K⁶
 * (C for an oblate top; linear: unique constant 0). Source: DEVELOPERS.md "The model file and formulas";
 * Herzberg II (1945) eq. (I,31)–(I,33).
 */
export function benchTerm(s: BenchState, shape: BenchTruth['shape'], J: number, K: number): number {
  const x = J * (J + 1);
  const k2 = K * K;
  const u = shape === 'prolate' ? (s.A ?? 0) : shape === 'oblate' ? (s.C ?? 0) : 0;
  const g = (n: string) => s[n] ?? 0;
  return (
    g('B') * x +
    (u - g('B')) * k2 -
    g('DJ') * x * x -
    g('DJK') * x * k2 -
    g('DK') * k2 * k2 +
    g('HJ') * x * x * x +
    g('HJK') * x * x * k2 +
    g('HKJ') * x * k2 * k2 +
    g('HK') * k2 * k2 * k2
  );
}

/** Upper level E' (contract: origin + F' ∓ 2A'ζK', or ±q/2 J(J+1) for a linear Π state), cm^-1. */
function upperEnergy(t: BenchTruth, jUp: number, kUp: number, deltaK: number, deltaJ: number): number {
  let e = (t.upper.origin ?? 0) + benchTerm(t.upper, t.shape, jUp, kUp);
  if (t.band === 'perpendicular') {
    if (t.shape === 'linear') e += (deltaJ === 0 ? -0.5 : 0.5) * (t.upper.q ?? 0) * jUp * (jUp + 1);
    else {
      const u = t.shape === 'prolate' ? t.upper.A : t.upper.C;
      e += (deltaK > 0 ? -2 : 2) * u * (t.upper.zeta ?? 0) * kUp;
    }
  }
  return e;
}

/**
 * Hönl–London factor × number of ±k components for a line of unsigned K'' (Herzberg II (1945)
 * eqs. (IV,60)–(IV,62), (IV,72)): parallel R ((J+1)²−K²)/(J+1), Q (2J+1)K²/(J(J+1)), P (J²−K²)/J;
 * perpendicular (s = ΔK) R (J+2+sK)(J+1+sK)/(4(J+1)), Q (2J+1)(J+1+sK)(J−sK)/(4J(J+1)),
 * P (J−1−sK)(J−sK)/(4J); ×2 except a parallel K'' = 0 line.
 */
function honlLondon(band: BenchTruth['band'], J: number, K: number, dJ: number, dK: number): number {
  let f: number;
  if (band === 'parallel') {
    if (dJ === 1) f = ((J + 1) ** 2 - K * K) / (J + 1);
    else if (dJ === 0) f = J === 0 ? 0 : ((2 * J + 1) * K * K) / (J * (J + 1));
    else f = J === 0 ? 0 : (J * J - K * K) / J;
    return Math.max(f, 0) * (K === 0 ? 1 : 2);
  }
  const s = dK * K;
  if (dJ === 1) f = ((J + 2 + s) * (J + 1 + s)) / (4 * (J + 1));
  else if (dJ === 0) f = J === 0 ? 0 : ((2 * J + 1) * (J + 1 + s) * (J - s)) / (4 * J * (J + 1));
  else f = J === 0 ? 0 : ((J - 1 - s) * (J - s)) / (4 * J);
  return Math.max(f, 0) * 2;
}

/** Every allowed line with J'' ≤ jLimit, K'' ≤ kLimit and relative strength ≥ 1e-5; area ∝ ν g HL e^{−c2E''/T}(1 − e^{−c2ν/T}). */
export function benchLines(t: BenchTruth, jLimit: number, kLimit: number): Omit<BenchLine, 'peakAbs' | 'snr' | 'isResolvable'>[] {
  const out: Omit<BenchLine, 'peakAbs' | 'snr' | 'isResolvable'>[] = [];
  const kTop = t.shape === 'linear' ? 0 : kLimit;
  const dKs = t.band === 'parallel' ? [0] : [1, -1];
  for (const dK of dKs) {
    for (let K = 0; K <= kTop; K++) {
      if (dK === -1 && K === 0) continue;
      const kUp = t.shape === 'linear' ? (t.band === 'perpendicular' ? 1 : 0) : K + dK;
      const g = t.spinWeights[K % t.spinWeights.length];
      for (let J = K; J <= jLimit; J++) {
        const eLow = benchTerm(t.lower, t.shape, J, K);
        for (const dJ of [-1, 0, 1]) {
          const jUp = J + dJ;
          if (jUp < kUp || jUp < 0) continue;
          if (dJ === 0 && t.band === 'parallel') {
            if (t.shape === 'linear' || K === 0) continue;
          }
          const hlK = t.shape === 'linear' ? 0 : K;
          const hlDK = t.shape === 'linear' ? (t.band === 'perpendicular' ? 1 : 0) : dK;
          const hl = honlLondon(t.band, J, hlK, dJ, hlDK);
          if (!(hl > 0)) continue;
          const nu = upperEnergy(t, jUp, kUp, t.shape === 'linear' ? hlDK : dK, dJ) - eLow;
          const area = nu * g * hl * Math.exp((-C2_CM_K * eLow) / t.temperatureK) * (1 - Math.exp((-C2_CM_K * nu) / t.temperatureK));
          out.push({ jUpper: jUp, kUpper: kUp, jLower: J, kLower: K, nuCm1: nu, area });
        }
      }
    }
  }
  const max = Math.max(...out.map((l) => l.area));
  return out.filter((l) => l.area >= 1e-5 * max);
}

/**
 * Peak-normalised pseudo-Voigt of Thompson, Cox & Hastings, J. Appl. Cryst. 20, 79 (1987), eqs. 3–4
 * (coefficients from memory; ~1 % from the true Voigt, exact in the Gauss and Lorentz limits).
 * @returns FWHM (cm^-1), Lorentz fraction η and the area-normalised profile's peak value (cm)
 */
export function benchPseudoVoigt(gaussFwhm: number, lorentzFwhm: number): { fwhm: number; eta: number; peakPerArea: number } {
  const g = gaussFwhm;
  const l = lorentzFwhm;
  const f = (g ** 5 + 2.69269 * g ** 4 * l + 2.42843 * g ** 3 * l ** 2 + 4.47163 * g ** 2 * l ** 3 + 0.07842 * g * l ** 4 + l ** 5) ** 0.2;
  const r = l / f;
  const eta = 1.36603 * r - 0.47719 * r * r + 0.11116 * r * r * r;
  // Peak of an area-normalised Lorentzian of FWHM f: 2/(πf); of a Gaussian: 2 sqrt(ln2/π)/f.
  const peakPerArea = eta * (2 / (Math.PI * f)) + (1 - eta) * ((2 * Math.sqrt(Math.LN2 / Math.PI)) / f);
  return { fwhm: f, eta, peakPerArea };
}

/** Draw a band's truth. */
function drawTruth(rand: () => number): BenchTruth {
  const shape = pick(rand, ['prolate', 'prolate', 'oblate', 'oblate', 'linear'] as const);
  const band = rand() < 0.5 ? 'parallel' : 'perpendicular';
  const bLow = Math.exp(uniform(rand, Math.log(0.1), Math.log(1.5)));
  const lower: BenchState = { B: bLow };
  const upper: BenchState = { origin: uniform(rand, 700, 3200), B: bLow * (1 + uniform(rand, -0.012, 0.004)) };
  // Quartic constants of realistic size (DJ/B ~ 1e-6…1e-5, DJK and DK up to ~20 DJ, either sign).
  const dj = bLow * 10 ** uniform(rand, -6.3, -5.2);
  lower.DJ = dj;
  if (shape !== 'linear') {
    const unique = shape === 'prolate' ? 'A' : 'C';
    lower[unique] = shape === 'prolate' ? bLow * uniform(rand, 1.4, 8) : bLow * uniform(rand, 0.5, 0.9);
    upper[unique] = lower[unique] * (1 + uniform(rand, -0.015, 0.01));
    lower.DJK = dj * uniform(rand, 1, 15) * (rand() < 0.5 ? -1 : 1);
    lower.DK = dj * uniform(rand, 1, 20) * (rand() < 0.5 ? -1 : 1) * (shape === 'prolate' ? 1 : 0.5);
    if (band === 'perpendicular') upper.zeta = uniform(rand, -0.5, 0.9);
  } else if (band === 'perpendicular') upper.q = bLow * uniform(rand, -0.01, 0.01);
  for (const k of ['DJ', 'DJK', 'DK']) if (lower[k] !== undefined) upper[k] = lower[k] * (1 + uniform(rand, -0.06, 0.06));
  if (rand() < 0.3) {
    // Sextic constants of the size DJ²/B (common practice as an order of magnitude).
    const h = (dj * dj) / bLow;
    for (const k of shape === 'linear' ? ['HJ'] : ['HJ', 'HJK', 'HKJ']) {
      lower[k] = h * uniform(rand, 0.3, 5) * (rand() < 0.5 ? -1 : 1);
      upper[k] = lower[k] * (1 + uniform(rand, -0.1, 0.1));
    }
  }
  return {
    shape,
    band,
    lower,
    upper,
    temperatureK: uniform(rand, 100, 350),
    spinWeights: shape === 'linear' ? [1] : pick(rand, [[1], [4, 2, 2], [2, 1, 1, 2, 1, 1]]),
    massAmu: uniform(rand, 20, 150),
    lorentzHwhmCm1: Math.exp(uniform(rand, Math.log(0.0005), Math.log(0.005))),
  };
}

/** Write the trace in one of the formats a user brings. */
function traceFile(
  kind: number,
  x: Float64Array,
  y: Float64Array,
  isTransmittance: boolean,
  rand: () => number,
): { name: string; text: string } {
  const n = x.length;
  const yLabel = isTransmittance ? 'transmittance' : 'absorbance';
  const digits = 7;
  if (kind === 0) {
    const rows = [`wavenumber,${yLabel}`];
    for (let i = 0; i < n; i++) rows.push(`${x[i].toFixed(6)},${y[i].toFixed(digits)}`);
    return { name: 'trace.csv', text: rows.join('\n') + '\n' };
  }
  if (kind === 1) {
    const rows = [`wavenumber_cm-1\t${yLabel}`];
    // Descending, as many instruments write it.
    for (let i = n - 1; i >= 0; i--) rows.push(`${x[i].toFixed(6)}\t${y[i].toFixed(digits)}`);
    return { name: 'trace.tsv', text: rows.join('\n') + '\n' };
  }
  if (kind === 2) {
    // A comment line, then a label line the importer reads (a label only in a comment is not
    // recognised: such a transmittance file is read as absorbance, see the benchmark README note).
    const rows = [`# invented band`, `wavenumber   ${yLabel}`];
    for (let i = 0; i < n; i++) rows.push(`  ${x[i].toFixed(6)}   ${y[i].toExponential(6)}`);
    return { name: 'trace.txt', text: rows.join('\r\n') + '\r\n' };
  }
  // JCAMP-DX 4.24, XYDATA=(X++(Y..Y)) in AFFN (the project has no JCAMP writer; written here).
  // Source: McDonald & Wilks, Appl. Spectrosc. 42, 151 (1988).
  const yFactor = 1e-7;
  const dx = (x[n - 1] - x[0]) / (n - 1);
  const rows = [
    '##TITLE=invented band',
    '##JCAMP-DX=4.24',
    '##DATA TYPE=INFRARED SPECTRUM',
    '##XUNITS=1/CM',
    `##YUNITS=${isTransmittance ? 'TRANSMITTANCE' : 'ABSORBANCE'}`,
    '##XFACTOR=1',
    `##YFACTOR=${yFactor}`,
    `##FIRSTX=${x[0]}`,
    `##LASTX=${x[n - 1]}`,
    `##DELTAX=${dx}`,
    `##NPOINTS=${n}`,
    `##FIRSTY=${Math.round(y[0] / yFactor) * yFactor}`,
    '##XYDATA=(X++(Y..Y))',
  ];
  void rand;
  for (let i = 0; i < n; i += 8) {
    const vals: string[] = [];
    for (let k = i; k < Math.min(n, i + 8); k++) vals.push(String(Math.round(y[k] / yFactor)));
    rows.push(`${x[i].toFixed(6)} ${vals.join(' ')}`);
  }
  rows.push('##END=');
  return { name: 'trace.jdx', text: rows.join('\n') + '\n' };
}

/**
 * Generate band number `id` of the benchmark (same id, same band).
 * Seeds (when any): the true positions (plus a jitter of 2 % of the FWHM) of lines on sub-branches
 * drawn at random, at J'' anywhere up to the highest observed one (the top included).
 */
export function benchBand(id: number, options: BenchBandOptions = {}): BenchBand {
  const rand = benchRandom(1000 + id);
  const truth = drawTruth(rand);
  const jLimit = options.jLimit ?? 100;
  const kLimit = options.kLimit ?? 30;
  const maxPoints = options.maxPoints ?? 400_000;
  const raw = benchLines(truth, jLimit, kLimit);
  const nuMid = raw.reduce((s, l) => s + l.nuCm1 * l.area, 0) / raw.reduce((s, l) => s + l.area, 0);
  const gaussFwhm = 2 * BENCH_DOPPLER_HWHM_PER_NU * nuMid * Math.sqrt(truth.temperatureK / truth.massAmu);
  const shape = benchPseudoVoigt(gaussFwhm, 2 * truth.lorentzHwhmCm1);
  const fwhm = shape.fwhm;
  let lo = Infinity;
  let hi = -Infinity;
  const maxArea = Math.max(...raw.map((l) => l.area));
  for (const l of raw) {
    if (l.area < 1e-3 * maxArea) continue;
    lo = Math.min(lo, l.nuCm1);
    hi = Math.max(hi, l.nuCm1);
  }
  lo -= 2;
  hi += 2;
  let perFwhm = uniform(rand, 3, 6);
  let step = fwhm / perFwhm;
  if ((hi - lo) / step > maxPoints) {
    step = (hi - lo) / maxPoints;
    perFwhm = fwhm / step;
  }
  const { n, noiseAbsAt, areaScale, snrTop, isTransmittance, file } = benchTrace(raw, shape, lo, hi, step, rand);

  const lines: BenchLine[] = benchLineFacts(raw, shape, { n, noiseAbsAt, areaScale }, lo, step);

  // First guess, as a user makes it.
  const guess = firstGuess(truth, rand);
  const seen = lines.filter((l) => l.snr > 20);
  const jMaxSeen = Math.max(...seen.map((l) => l.jLower));
  const kMaxSeen = Math.max(...seen.map((l) => l.kLower));
  const modelJson = {
    shape: truth.shape,
    band: truth.band,
    lower: guess.lower,
    upper: guess.upper,
    temperature: Math.round(truth.temperatureK / 10) * 10,
    // A little beyond the last line seen, but not beyond the truth's own limits (no lines exist there).
    jMax: Math.min(jMaxSeen + 3, jLimit),
    kMax: truth.shape === 'linear' ? 0 : Math.min(kMaxSeen + 2, kLimit),
    spinWeights: truth.spinWeights,
    mass: Math.round(truth.massAmu),
  };
  let nSeeds: number = options.seeds ?? pick(rand, [0, 3, 10] as const);
  let seedsText: string | null = null;
  // A user picks seeds among clear lines: resolvable, SNR > 30 (> 20 when there are too few).
  let pool = seen.filter((l) => l.isResolvable && l.snr > 30);
  if (pool.length < 2 * nSeeds) pool = seen.filter((l) => l.isResolvable);
  if (nSeeds > 0 && pool.length >= nSeeds) {
    const table = benchSeedTable(pool, nSeeds, fwhm, rand);
    seedsText = table.text;
    nSeeds = table.count;
  } else nSeeds = 0;
  const summary =
    `${truth.shape} ${truth.band} B''=${truth.lower.B.toFixed(3)} ` +
    (truth.shape === 'prolate' ? `A''=${truth.lower.A.toFixed(3)} ` : truth.shape === 'oblate' ? `C''=${truth.lower.C.toFixed(3)} ` : '') +
    (truth.upper.zeta !== undefined ? `zeta=${truth.upper.zeta.toFixed(2)} ` : '') +
    `T=${truth.temperatureK.toFixed(0)}K FWHM=${fwhm.toExponential(2)} ${perFwhm.toFixed(1)}pt/FWHM SNR=${snrTop.toFixed(0)} ` +
    `${isTransmittance ? 'T' : 'A'} ${file.name} ${n}pts ${raw.length} lines ${nSeeds} seeds${truth.lower.HJ ? ' sextic' : ''}`;
  return {
    id,
    truth,
    lines,
    fwhmCm1: fwhm,
    traceName: file.name,
    traceText: file.text,
    nPoints: n,
    modelText: JSON.stringify(modelJson, null, 1),
    seedsText,
    nSeeds,
    summary,
  };
}

/**
 * A user's first guess: origin off by up to 0.4 cm^-1, B'' by up to 0.5 % (B' by the same plus up to
 * 0.2 % more, within 0.5 %), A or C by up to 1 % (A' likewise with 0.3 %), ζ by up to 0.025; quartic
 * constants 0 or borrowed from a related molecule (× 0.3…2) and floated; sextic constants 0, held
 * fixed or floated.
 */
function firstGuess(t: BenchTruth, rand: () => number): { lower: Record<string, unknown>; upper: Record<string, unknown> } {
  const lower: Record<string, unknown> = {};
  const upper: Record<string, unknown> = {};
  const eB = uniform(rand, -0.005, 0.005);
  const eBu = Math.max(-0.005, Math.min(0.005, eB + uniform(rand, -0.002, 0.002)));
  lower.B = t.lower.B * (1 + eB);
  upper.B = t.upper.B * (1 + eBu);
  upper.origin = t.upper.origin + uniform(rand, -0.4, 0.4);
  if (t.shape !== 'linear') {
    const u = t.shape === 'prolate' ? 'A' : 'C';
    const eA = uniform(rand, -0.01, 0.01);
    lower[u] = t.lower[u] * (1 + eA);
    upper[u] = t.upper[u] * (1 + Math.max(-0.01, Math.min(0.01, eA + uniform(rand, -0.003, 0.003))));
    if (t.band === 'perpendicular') upper.zeta = t.upper.zeta + uniform(rand, -0.025, 0.025);
  } else if (t.band === 'perpendicular') upper.q = 0;
  const borrowed = rand() < 0.5;
  for (const k of t.shape === 'linear' ? ['DJ'] : ['DJ', 'DJK', 'DK']) {
    const f = uniform(rand, 0.3, 2);
    lower[k] = borrowed ? t.lower[k] * f : 0;
    upper[k] = borrowed ? t.upper[k] * f : 0;
  }
  if (t.lower.HJ !== undefined && rand() < 0.5) {
    for (const k of t.shape === 'linear' ? ['HJ'] : ['HJ', 'HJK', 'HKJ']) {
      lower[k] = 0;
      upper[k] = 0;
    }
  }
  return { lower, upper };
}

/** Seeds on 3–4 random sub-branches, J'' anywhere in each (its top end among them), as a line table. */
export function benchSeedTable(pool: BenchLine[], count: number, fwhm: number, rand: () => number): { text: string; count: number } {
  const bySeries = new Map<string, BenchLine[]>();
  for (const l of pool) {
    const key = `${l.kUpper - l.kLower}:${l.kLower}:${l.jUpper - l.jLower}`;
    if (!bySeries.has(key)) bySeries.set(key, []);
    bySeries.get(key)!.push(l);
  }
  let series = [...bySeries.values()].filter((s) => s.length >= 2);
  if (series.length === 0) series = [...bySeries.values()];
  const chosen: BenchLine[] = [];
  const nSeries = Math.min(series.length, count === 3 ? 3 : 3 + Math.floor(rand() * 2));
  const order = series.map((s) => ({ s, r: rand() })).sort((a, b) => a.r - b.r);
  for (let k = 0; chosen.length < count && k < 50; k++) {
    const s = order[k % Math.max(nSeries, 1)]?.s;
    if (!s) break;
    const free = s.filter((l) => !chosen.includes(l));
    if (free.length === 0) continue;
    // The first seed of a series is its highest observed J'' half the time.
    const top = free.reduce((a, b) => (b.jLower > a.jLower ? b : a));
    const l = k < nSeries && rand() < 0.5 ? top : pick(rand, free);
    chosen.push(l);
  }
  const rows = ['J_up,K_up,J_lo,K_lo,wavenumber,uncertainty'];
  for (const l of chosen) {
    const obs = l.nuCm1 + 0.02 * fwhm * normal(rand);
    rows.push(`${l.jUpper},${l.kUpper},${l.jLower},${l.kLower},${obs.toFixed(6)},${Math.max(1e-4, fwhm / 20).toPrecision(3)}`);
  }
  return { text: rows.join('\n') + '\n', count: chosen.length };
}

/** A measured-looking trace of the lines (see benchTrace). */
export interface BenchTrace {
  n: number;
  /** Absorbance noise (1σ) at point i. */
  noiseAbsAt: (i: number) => number;
  /** Peak absorbance of a line = area × areaScale × peakPerArea. */
  areaScale: number;
  /** Peak SNR of the strongest line. */
  snrTop: number;
  isTransmittance: boolean;
  /** The trace file (name and text). */
  file: { name: string; text: string };
}

/**
 * The trace of `raw` lines on the grid lo + i·step (cm^-1): pseudo-Voigt lines of the given shape summed
 * over the whole trace, the strongest line scaled to a peak absorbance of 0.3…1.5, a baseline with
 * slope, curvature and fringes, noise for a peak SNR of 50…1000, absorbance or transmittance, written
 * in one of four file formats (all drawn from `rand`).
 */
export function benchTrace(
  raw: readonly Pick<BenchLine, 'nuCm1' | 'area'>[],
  shape: ReturnType<typeof benchPseudoVoigt>,
  lo: number,
  hi: number,
  step: number,
  rand: () => number,
): BenchTrace {
  const fwhm = shape.fwhm;
  const maxArea = Math.max(...raw.map((l) => l.area));
  const n = Math.floor((hi - lo) / step) + 1;
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = lo + i * step;
  // Strongest line's peak absorbance 0.3…1.5.
  const peakTop = uniform(rand, 0.3, 1.5);
  const areaScale = peakTop / (maxArea * shape.peakPerArea);
  const absorb = new Float64Array(n);
  // Every line over the whole trace (no truncation): the pseudo-Voigt exactly within ±NEAR_FWHM of
  // the line; beyond it the (Lorentzian) far wings of all lines are summed exactly on a coarse grid
  // and interpolated (they are smooth there: curvature scale ≥ NEAR_FWHM FWHM).
  const hwhm = fwhm / 2;
  const gaussK = (4 * Math.LN2) / (fwhm * fwhm);
  const lorPeak = 2 / (Math.PI * fwhm);
  const gauPeak = (2 * Math.sqrt(Math.LN2 / Math.PI)) / fwhm;
  const near = NEAR_FWHM * fwhm;
  const gaussReach = 6 * fwhm; // the Gauss part is below 1e-43 of its peak beyond this
  const coarseStep = 10 * fwhm;
  const nc = Math.ceil((hi - lo) / coarseStep) + 1;
  const far = new Float64Array(nc);
  for (const l of raw) {
    const a = l.area * areaScale;
    const aL = a * shape.eta * lorPeak;
    const aG = a * (1 - shape.eta) * gauPeak;
    const i0 = Math.max(0, Math.ceil((l.nuCm1 - near - lo) / step));
    const i1 = Math.min(n - 1, Math.floor((l.nuCm1 + near - lo) / step));
    for (let i = i0; i <= i1; i++) {
      const d = x[i] - l.nuCm1;
      const u = d / hwhm;
      absorb[i] += aL / (1 + u * u);
      if (d > -gaussReach && d < gaussReach) absorb[i] += aG * Math.exp(-gaussK * d * d);
    }
    for (let c = 0; c < nc; c++) {
      const d = lo + c * coarseStep - l.nuCm1;
      if (Math.abs(d) <= near) continue;
      const u = d / hwhm;
      far[c] += aL / (1 + u * u);
    }
  }
  for (let i = 0; i < n; i++) {
    const t = (x[i] - lo) / coarseStep;
    const c = Math.min(nc - 2, Math.floor(t));
    absorb[i] += far[c] + (t - c) * (far[c + 1] - far[c]);
  }
  // Baseline: offset, slope, curvature and fringes (absorbance units, relative to the top line).
  const span = hi - lo;
  const base = new Float64Array(n);
  const slope = uniform(rand, -0.08, 0.08) * peakTop;
  const curve = uniform(rand, -0.06, 0.06) * peakTop;
  const fringeAmp = uniform(rand, 0, 0.02) * peakTop;
  const fringePeriod = uniform(rand, 0.3, 3);
  const fringePhase = uniform(rand, 0, 2 * Math.PI);
  for (let i = 0; i < n; i++) {
    const s = (x[i] - lo) / span - 0.5;
    base[i] = 0.02 * peakTop + slope * s + curve * s * s + fringeAmp * Math.sin((2 * Math.PI * (x[i] - lo)) / fringePeriod + fringePhase);
  }
  const snrTop = Math.exp(uniform(rand, Math.log(50), Math.log(1000)));
  const isTransmittance = rand() < 0.4;
  const y = new Float64Array(n);
  let noiseAbsAt: (i: number) => number;
  if (isTransmittance) {
    // Detector noise on the transmittance; its size is set so the top line has the drawn SNR in absorbance.
    const tTop = 10 ** -(peakTop + 0.02 * peakTop);
    const sigmaT = (peakTop * Math.LN10 * tTop) / snrTop;
    for (let i = 0; i < n; i++) y[i] = 10 ** -(absorb[i] + base[i]) + sigmaT * normal(rand);
    noiseAbsAt = (i) => sigmaT / (Math.LN10 * 10 ** -(absorb[i] + base[i]));
  } else {
    const sigmaA = peakTop / snrTop;
    for (let i = 0; i < n; i++) y[i] = absorb[i] + base[i] + sigmaA * normal(rand);
    noiseAbsAt = () => sigmaA;
  }
  const file = traceFile(Math.floor(rand() * 4), x, y, isTransmittance, rand);
  return { n, noiseAbsAt, areaScale, snrTop, isTransmittance, file };
}

/**
 * Scoring facts of each line on a trace of all of them (benchTrace), sorted by wavenumber: its peak
 * absorbance alone, its peak SNR, and whether it is resolvable (no other line above 10 % of its
 * intensity within 1.5 FWHM).
 */
export function benchLineFacts<T extends Pick<BenchLine, 'nuCm1' | 'area'>>(
  raw: readonly T[],
  shape: ReturnType<typeof benchPseudoVoigt>,
  trace: Pick<BenchTrace, 'n' | 'noiseAbsAt' | 'areaScale'>,
  lo: number,
  step: number,
): (T & Pick<BenchLine, 'peakAbs' | 'snr' | 'isResolvable'>)[] {
  const fwhm = shape.fwhm;
  const { n, noiseAbsAt, areaScale } = trace;
  const sorted = [...raw].sort((a, b) => a.nuCm1 - b.nuCm1);
  return sorted.map((l, idx) => {
    const peakAbs = l.area * areaScale * shape.peakPerArea;
    const i = Math.min(n - 1, Math.max(0, Math.round((l.nuCm1 - lo) / step)));
    let isResolvable = true;
    for (let k = idx - 1; k >= 0 && l.nuCm1 - sorted[k].nuCm1 <= 1.5 * fwhm; k--) if (sorted[k].area > 0.1 * l.area) isResolvable = false;
    for (let k = idx + 1; k < sorted.length && sorted[k].nuCm1 - l.nuCm1 <= 1.5 * fwhm; k++)
      if (sorted[k].area > 0.1 * l.area) isResolvable = false;
    return { ...l, peakAbs, snr: peakAbs / noiseAbsAt(i), isResolvable };
  });
}
