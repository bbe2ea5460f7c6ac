/**
 * B of a band that need not be resolved, from its envelope: synthetic rigid-rotor envelopes of the
 * classified band type (a few variants of the constants the profile does not give) are compared
 * with the trace, both smoothed alike, with a free scale and linear baseline, over a log grid of B
 * and then a finer one; the spread of B over the variants and widths that fit about as well is the
 * range B is given to.
 */
import { SECOND_RADIATION_CM_K } from '../physics/constants';
import { honlLondonFactor, lineDegeneracy } from '../physics/honlLondon';
import type { BandType, TopShape } from '../physics/model';

/** Band types the envelope fit knows (the same strings as bandShapeClassify's types). */
export type EnvelopeBandType = 'linear-parallel' | 'linear-perpendicular' | 'symmetric-top-parallel' | 'symmetric-top-perpendicular';

/**
 * Near-Gaussian smoothing with σ in samples: three passes of a moving average of radius r with
 * (2r+1)² = 4σ² + 1 (variance of three boxes = σ²); edges use the part of the window inside.
 * Source: W. M. Wells, IEEE Trans. PAMI 8, 234 (1986) (repeated box filters approach a Gaussian).
 */
export function smoothBoxes(y: Float64Array, sigmaSamples: number): Float64Array {
  const n = y.length;
  const r = Math.round((Math.sqrt(4 * sigmaSamples * sigmaSamples + 1) - 1) / 2);
  let cur = Float64Array.from(y);
  if (r < 1) return cur;
  const prefix = new Float64Array(n + 1);
  for (let pass = 0; pass < 3; pass++) {
    for (let i = 0; i < n; i++) prefix[i + 1] = prefix[i] + cur[i];
    const next = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const lo = Math.max(0, i - r);
      const hi = Math.min(n - 1, i + r);
      next[i] = (prefix[hi + 1] - prefix[lo]) / (hi - lo + 1);
    }
    cur = next;
  }
  return cur;
}

/** One set of the constants the profile leaves open. */
export interface EnvelopeVariant {
  type: EnvelopeBandType;
  shape: TopShape;
  band: BandType;
  /** Unique constant (A or C) for a given B, cm^-1; null for a linear molecule or when B rules the variant out. */
  unique: (B: number) => number | null;
  zeta: number;
  label: string;
  /** Upper minus lower (U − B) (U = A or C), cm^-1: curves a perpendicular band's Q-branch comb. @default 0 */
  deltaUniqueMinusB?: number;
  /**
   * (B′ − B″)/B″: spreads the P branch and crowds the R branch (or the reverse), line positions
   * ν0 + (B′ + B″)m + (B′ − B″)m² (Herzberg II ch. IV); the unique constant stays the same in both
   * states. @default 0
   */
  deltaBRel?: number;
}

function variantsFor(type: EnvelopeBandType, qSpacing: number | undefined): EnvelopeVariant[] {
  if (type === 'linear-parallel') return [{ type, shape: 'linear', band: 'parallel', unique: () => 0, zeta: 0, label: 'linear Σ–Σ' }];
  if (type === 'linear-perpendicular')
    return [{ type, shape: 'linear', band: 'perpendicular', unique: () => 0, zeta: 0, label: 'linear Π–Σ' }];
  if (type === 'symmetric-top-parallel') {
    // A′ = A″ and B′ = B″: the P and R lines of every K coincide, and A only sets how the Q
    // branch's intensity spreads over K; two ends of the range stand for the rest.
    return [
      ...[2.5, 5, 12].map((r) => ({
        type,
        shape: 'prolate' as const,
        band: 'parallel' as const,
        unique: (B: number) => r * B,
        zeta: 0,
        label: `prolate parallel, A = ${r}B`,
      })),
      ...[0.55, 0.8].map((r) => ({
        type,
        shape: 'oblate' as const,
        band: 'parallel' as const,
        unique: (B: number) => r * B,
        zeta: 0,
        label: `oblate parallel, C = ${r}B`,
      })),
    ];
  }
  const q = Math.abs(qSpacing ?? 0);
  const out: EnvelopeVariant[] = [];
  // Prolate: A(1 − ζ) − B = q/2 with A > B.
  for (const zeta of [-0.3, 0, 0.3, 0.6]) {
    out.push({
      type,
      shape: 'prolate',
      band: 'perpendicular',
      zeta,
      unique: (B) => {
        const a = (q / 2 + B) / (1 - zeta);
        return a > 1.1 * B ? a : null;
      },
      label: `prolate perpendicular, ζ = ${zeta}`,
    });
  }
  // Oblate: C(1 − ζ) − B = ∓q/2 with C < B (the sign of the spacing is not read from the trace).
  for (const [zeta, sign] of [
    [-0.6, -1],
    [-0.3, -1],
    [0, -1],
    [0.3, -1],
    [-0.7, 1],
    [-0.4, 1],
  ] as const) {
    out.push({
      type,
      shape: 'oblate',
      band: 'perpendicular',
      zeta,
      unique: (B) => {
        const c = (B + (sign * q) / 2) / (1 - zeta);
        return c > 0.05 * B && c < 0.95 * B ? c : null;
      },
      label: `oblate perpendicular, ζ = ${zeta}, C(1−ζ) − B = ${sign > 0 ? '+' : '−'}q/2`,
    });
  }
  return out;
}

/** Sticks of a rigid band at origin 0: positions (cm^-1), weights and the weighted mean position (cm^-1). */
interface EnvelopeStickList {
  nu: Float64Array;
  w: Float64Array;
  count: number;
  mean: number;
}

/**
 * Sticks of a rigid band (B′ = B″, unique constant the same in both states) at origin 0, J and K
 * sampled with strides that keep the sampled lines closer than a quarter of `blurCm1` (each sampled
 * line weighted by its stride). Intensity g(K) · HL · exp(−c2 F″/T) (the ν and stimulated-emission
 * factors, nearly constant over a band, are left out). Term values and selection rules as bandLines
 * (Herzberg II (1945) ch. IV).
 */
export function envelopeStickList(v: EnvelopeVariant, B: number, unique: number, temperatureK: number, blurCm1: number): EnvelopeStickList {
  const c2T = SECOND_RADIATION_CM_K / temperatureK;
  const linear = v.shape === 'linear';
  const uMinusB = unique - B;
  // Upper state's B; A′ = A″ (C′ = C″), so A′ − B′ takes up the change of B.
  const bUp = B * (1 + (v.deltaBRel ?? 0));
  const uMinusBUp = uMinusB + B - bUp;
  // Up to where F″ reaches 10 kT/hc on the lowest level of each J: K = 0 for a prolate top, K = J for
  // an oblate one (F = BJ(J+1) + (C − B)K² ≈ CJ(J+1)), whose levels are populated to higher J and K.
  const jMax = Math.ceil(Math.sqrt(10 / (c2T * (linear ? B : Math.min(B, unique))))) + 2;
  const kMax = linear ? 0 : uMinusB < 0 ? jMax : Math.min(jMax, Math.ceil(Math.sqrt(10 / (c2T * Math.max(uMinusB, 0.02 * B)))) + 2);
  const sJ = Math.max(1, Math.floor((0.25 * blurCm1) / (2 * B)));
  const qAbs = linear || v.band === 'parallel' ? Infinity : Math.abs(2 * (unique * (1 - v.zeta) - B));
  const sK = Math.max(1, Math.floor((0.25 * blurCm1) / Math.max(qAbs === Infinity ? 2 * Math.abs(uMinusB) + 1e-9 : qAbs, 1e-9)));
  const deltaKs = v.band === 'parallel' ? [0] : [1, -1];
  const kList: [number, number][] = [[0, 1]];
  for (let k = 1; k <= kMax; k += sK) kList.push([Math.min(kMax, k + Math.floor((sK - 1) / 2)), Math.min(sK, kMax - k + 1)]);
  const cap = deltaKs.length * kList.length * 3 * (Math.floor(jMax / sJ) + 2);
  const nu = new Float64Array(cap);
  const wt = new Float64Array(cap);
  let m = 0;
  let wSum = 0;
  let wx = 0;
  for (const deltaK of deltaKs) {
    for (const [K, kWeight] of kList) {
      if (deltaK === -1 && K === 0) continue;
      const kUp = linear ? (v.band === 'perpendicular' ? 1 : 0) : K + deltaK;
      const fK = linear ? 0 : uMinusB * K * K;
      const fKUp = linear
        ? 0
        : (uMinusBUp + (v.deltaUniqueMinusB ?? 0)) * kUp * kUp - (v.band === 'perpendicular' ? 2 * unique * v.zeta * kUp * deltaK : 0);
      const lPerp = linear && v.band === 'perpendicular';
      const pre = lineDegeneracy(v.band, K) * kWeight * sJ;
      for (let dJ = -1; dJ <= 1; dJ++) {
        const j0 = Math.max(K, kUp - dJ);
        for (let J = j0; J <= jMax; J += sJ) {
          const hl = honlLondonFactor(J, lPerp ? 0 : K, dJ, lPerp ? 1 : deltaK);
          if (hl <= 0) continue;
          const jUp = J + dJ;
          const eLow = B * J * (J + 1) + fK;
          const x = bUp * (jUp * (jUp + 1) - (lPerp ? 1 : 0)) + fKUp - eLow;
          const w = pre * hl * Math.exp(-c2T * eLow);
          wSum += w;
          wx += w * x;
          nu[m] = x;
          wt[m] = w;
          m++;
        }
      }
    }
  }
  return { nu, w: wt, count: m, mean: wSum > 0 ? wx / wSum : 0 };
}

/** Deposit sticks (shifted by originCm1) on a uniform grid x0 + i·step, i < n, each split between its two nearest points. */
function envelopeSticksDeposit(list: EnvelopeStickList, originCm1: number, x0: number, step: number, n: number): Float64Array {
  const hist = new Float64Array(n);
  for (let k = 0; k < list.count; k++) {
    const pos = (list.nu[k] + originCm1 - x0) / step;
    const i = Math.floor(pos);
    if (i < 0 || i >= n - 1) continue;
    const f = pos - i;
    hist[i] += list.w[k] * (1 - f);
    hist[i + 1] += list.w[k] * f;
  }
  return hist;
}

/**
 * Stick envelope of a rigid band deposited on a uniform grid (envelopeStickList, envelopeSticksDeposit).
 * @returns the deposited envelope and the sticks' intensity-weighted mean position, cm^-1
 */
function envelopeSticks(
  v: EnvelopeVariant,
  B: number,
  unique: number,
  origin: number,
  temperatureK: number,
  x0: number,
  step: number,
  n: number,
  blurCm1: number,
): { hist: Float64Array; mean: number } {
  const list = envelopeStickList(v, B, unique, temperatureK, blurCm1);
  return { hist: envelopeSticksDeposit(list, origin, x0, step, n), mean: list.mean + origin };
}

/** Least squares of y ≈ a·s + b + c·t: the residual sum of squares and a (3×3 normal equations). */
export function scaleBaselineFit(s: Float64Array, y: Float64Array, t: Float64Array, keep: Uint8Array): { ss: number; a: number } {
  const n = y.length;
  const m = [0, 0, 0, 0, 0, 0, 0, 0, 0];
  const r = [0, 0, 0];
  for (let i = 0; i < n; i++) {
    if (!keep[i]) continue;
    const c = [s[i], 1, t[i]];
    for (let p = 0; p < 3; p++) {
      r[p] += c[p] * y[i];
      for (let q = 0; q < 3; q++) m[3 * p + q] += c[p] * c[q];
    }
  }
  // Gauss–Jordan on the 3×3 system.
  const a = [
    [m[0], m[1], m[2], r[0]],
    [m[3], m[4], m[5], r[1]],
    [m[6], m[7], m[8], r[2]],
  ];
  for (let p = 0; p < 3; p++) {
    if (!(Math.abs(a[p][p]) > 0)) return { ss: Infinity, a: 0 };
    for (let q = 0; q < 3; q++) {
      if (q === p) continue;
      const f = a[q][p] / a[p][p];
      for (let c = p; c < 4; c++) a[q][c] -= f * a[p][c];
    }
  }
  const sol = [a[0][3] / a[0][0], a[1][3] / a[1][1], a[2][3] / a[2][2]];
  if (!(sol[0] > 0)) return { ss: Infinity, a: sol[0] };
  let ss = 0;
  for (let i = 0; i < n; i++) {
    if (!keep[i]) continue;
    const d = y[i] - sol[0] * s[i] - sol[1] - sol[2] * t[i];
    ss += d * d;
  }
  return { ss, a: sol[0] };
}

/** Input of bandEnvelopeFit. */
export interface BandEnvelopeFitInput {
  /** Uniform ascending axis of the region, cm^-1. */
  x: Float64Array;
  /** Absorbance of the region with a baseline removed (a residual linear baseline is refitted). */
  y: Float64Array;
  /** Rotational temperature, K. */
  temperatureK: number;
  /** Band types tried (their variants compete on the residual). */
  types: EnvelopeBandType[];
  /** Q-branch spacing for a perpendicular symmetric-top band, cm^-1 (its sign is not used). */
  qSpacing?: number;
  /** White-noise σ of y, absorbance. */
  noiseSigma: number;
  /** Band origin, cm^-1: held there. Absent: the synthetic's first moment is put on the trace's. */
  originCm1?: number;
  /** Half-width about the origin left out of the comparison (a Q branch), cm^-1; needs originCm1 or qBranchCm1. */
  maskHalfWidthCm1?: number;
  /**
   * Position of a Π–Σ band's unresolved Q branch, cm^-1: the origin is held at qBranchCm1 + B for
   * each B tried (the Q lines of a rigid Π–Σ band lie at ν0 − B), and the mask is centred here.
   */
  qBranchCm1?: number;
  /**
   * Which residual rise counts as "fits about as well": `wide` adds 2·n·σ²/ν (ν the smoothing's
   * effective sample count) to the 10 % tolerance, `two-sigma` adds 4σ² (Δχ² = 4 on the smoothing's
   * effective independent points). @default 'wide'
   */
  rangeRule?: 'wide' | 'two-sigma';
  /**
   * Values of (B′ − B″)/B″ also tried in the fine pass, each with every variant of the shape that
   * fitted best rigid (not an oblate top); they compete on the residual like the variants, and B is
   * B″. @default none (rigid bands only)
   */
  deltaBRels?: number[];
}

/** What bandEnvelopeFit found for one band type. */
export interface BandEnvelopeTypeResult {
  type: EnvelopeBandType;
  /** Best B, cm^-1, and the range over the variants and widths that fit about as well. */
  B: number;
  bLow: number;
  bHigh: number;
  /** Origin of the best envelope (first moments matched), cm^-1. */
  origin: number;
  /** rms residual of the best envelope against the lightly smoothed trace, absorbance. */
  rms: number;
  /** Which variant fitted best, in words. */
  variant: string;
  /** Whether the range reaches the end of the B values tried (then the true range may be wider). */
  bRangeOpen: boolean;
}

/** Result of bandEnvelopeFit: per type, best first. */
export interface BandEnvelopeFitResult {
  byType: BandEnvelopeTypeResult[];
  /** Envelope evaluations made (for the bench). */
  evaluations: number;
}

/**
 * The trace's axis mapped to −1…1 (t, for the baseline), its first moment (cm^-1) and the band's width:
 * the span of the central 90 % of its positive area (cm^-1), at least 20 samples.
 * @param step sample spacing, cm^-1
 */
export function envelopeMeasures(x: Float64Array, y: Float64Array, step: number): { t: Float64Array; centroid: number; width: number } {
  const n = x.length;
  const t = new Float64Array(n);
  for (let i = 0; i < n; i++) t[i] = (2 * (x[i] - x[0])) / (x[n - 1] - x[0]) - 1;
  let area = 0;
  let mom = 0;
  for (let i = 0; i < n; i++) {
    const v = Math.max(0, y[i]);
    area += v;
    mom += v * x[i];
  }
  let acc = 0;
  let w5 = x[0];
  let w95 = x[n - 1];
  let got = false;
  for (let i = 0; i < n; i++) {
    acc += Math.max(0, y[i]);
    if (!got && acc >= 0.05 * area) {
      w5 = x[i];
      got = true;
    }
    if (acc <= 0.95 * area) w95 = x[i];
  }
  return { t, centroid: mom / area, width: Math.max(w95 - w5, 20 * step) };
}

/** Relative rise of the residual sum of squares (over its minimum) still counted as "fits about as well". */
export const ENVELOPE_SS_TOLERANCE = 0.1;

/**
 * Fit the band's envelope for B: for each type and variant, B on a log grid (10 per decade,
 * 0.005–10 cm^-1) against the trace smoothed to a 30th of its width (the instrument's line shape
 * and J structure washed out alike), then around each variant's best a finer grid (±25 %, 2 % steps)
 * against the trace smoothed to an 80th of its width (at least 2.5 samples), the synthetic smoothed
 * with that width combined with one of four extra widths (0–5 samples: the instrument's unknown
 * width). The origin is the one given, or else follows from matching the first moments; points
 * within maskHalfWidthCm1 of a given origin are left out. The range is every B whose residual sum of
 * squares lies within ENVELOPE_SS_TOLERANCE (relative) plus 2·n·σ²/ν of the minimum across variants
 * and widths (ν the smoothing's effective sample count, 2√π σ_s).
 * Source: envelope comparison with a free scale and baseline, common practice; term values and
 * Hönl–London factors as bandLines (Herzberg II (1945) ch. IV).
 * @param input region, temperature, types, Q spacing and noise
 * @returns per type, best (lowest residual) first
 */
export function bandEnvelopeFit(input: BandEnvelopeFitInput): BandEnvelopeFitResult {
  const { x, y, temperatureK: T } = input;
  const n = x.length;
  const step = (x[n - 1] - x[0]) / (n - 1);
  const { t, centroid, width } = envelopeMeasures(x, y, step);
  let evaluations = 0;
  const variants = input.types.flatMap((ty) => variantsFor(ty, input.qSpacing));

  const model = (v: EnvelopeVariant, B: number, blurCm1: number): { sticks: Float64Array; origin: number } | null => {
    const u = v.unique(B);
    if (u === null) return null;
    evaluations++;
    // Origin 0 put the band's first moment at first.mean; move it onto the trace's (unless given).
    const origin =
      input.qBranchCm1 !== undefined
        ? input.qBranchCm1 + (v.shape === 'linear' && v.band === 'perpendicular' ? B : 0)
        : (input.originCm1 ?? centroid - envelopeSticks(v, B, u, 0, T, x[0] - centroid, step, n, blurCm1).mean);
    const shifted = envelopeSticks(v, B, u, origin, T, x[0], step, n, blurCm1);
    return { sticks: shifted.hist, origin };
  };

  // Points compared: all but those within maskHalfWidthCm1 (plus the smoothing's reach) of the origin.
  const keepFor = (sigmaSamples: number): Uint8Array => {
    const keep = new Uint8Array(n).fill(1);
    const half = input.maskHalfWidthCm1;
    const maskCentre = input.qBranchCm1 ?? input.originCm1;
    if (half && maskCentre !== undefined) {
      const reach = half + 1.5 * sigmaSamples * step;
      for (let i = 0; i < n; i++) if (Math.abs(x[i] - maskCentre) < reach) keep[i] = 0;
    }
    return keep;
  };
  // Pass 1: heavy smoothing.
  const sHeavy = Math.max(2, width / 30 / step);
  const keepHeavy = keepFor(sHeavy);
  const yHeavy = smoothBoxes(y, sHeavy);
  const coarse: { v: EnvelopeVariant; B: number; ss: number }[] = [];
  for (const v of variants) {
    for (let e = Math.log10(0.005); e <= 1 + 1e-9; e += 0.1) {
      const B = 10 ** e;
      const mdl = model(v, B, sHeavy * step * 2.355);
      if (!mdl) continue;
      const fit = scaleBaselineFit(smoothBoxes(mdl.sticks, sHeavy), yHeavy, t, keepHeavy);
      coarse.push({ v, B, ss: fit.ss });
    }
  }
  // Pass 2: lighter smoothing, the synthetic's width chosen, ±25 % around the best coarse B of each variant.
  const sLight = Math.max(2.5, width / 80 / step);
  const yLight = smoothBoxes(y, sLight);
  const keepLight = keepFor(sLight);
  const widths = [0, 1.5, 3, 5].map((w) => Math.hypot(sLight, w));
  const fine: { v: EnvelopeVariant; B: number; ss: number; origin: number }[] = [];
  const coarseBest = (v0: EnvelopeVariant) => {
    const mine = coarse.filter((c) => c.v === v0 && Number.isFinite(c.ss));
    return mine.length ? mine.reduce((a, c) => (c.ss < a.ss ? c : a)) : null;
  };
  const finePass = (v: EnvelopeVariant, bCentre: number) => {
    for (let f = 0.75; f <= 1.25 + 1e-9; f *= 1.02) {
      const B = bCentre * f;
      const mdl = model(v, B, sLight * step * 2.355);
      if (!mdl) continue;
      let bestSs = Infinity;
      for (const w of widths) bestSs = Math.min(bestSs, scaleBaselineFit(smoothBoxes(mdl.sticks, w), yLight, t, keepLight).ss);
      fine.push({ v, B, ss: bestSs, origin: mdl.origin });
    }
  };
  for (const v0 of variants) {
    const best = coarseBest(v0);
    if (best) finePass(v0, best.B);
  }
  // Then (B′ − B″)/B″ ≠ 0 for the variants of the shape that fitted best rigid, when that is not an
  // oblate top: an oblate top's parallel band spreads its sub-bands by Δ(C − B)K² with K up to J, so
  // its (B′ − B″) would bring C′ − C″ as a second constant; and tried on every variant, a prolate
  // variant with B′ ≠ B″ passed for an oblate band with B 20–60 % too large (seeded and independent
  // traces: oblate parallel bands within 10 % 14 → 6 of 21).
  const deltaBRels = (input.deltaBRels ?? []).filter((d) => d !== 0);
  for (const type of deltaBRels.length ? input.types : []) {
    const rigid = fine.filter((r) => r.v.type === type && Number.isFinite(r.ss));
    if (!rigid.length) continue;
    const shape = rigid.reduce((a, r) => (r.ss < a.ss ? r : a)).v.shape;
    if (shape === 'oblate') continue;
    for (const v0 of variants.filter((v) => v.type === type && v.shape === shape)) {
      const best = coarseBest(v0);
      if (!best) continue;
      for (const dB of deltaBRels)
        finePass({ ...v0, deltaBRel: dB, label: `${v0.label}, (B′ − B″)/B″ = ${(100 * dB).toFixed(2)} %` }, best.B);
    }
  }
  // Noise allowance: the light smoothing averages ~ 2√π σ samples, leaving σ²/(2√π σ_s) per point.
  const noiseSs =
    input.rangeRule === 'two-sigma' ? 4 * input.noiseSigma ** 2 : (2 * n * input.noiseSigma ** 2) / (2 * Math.sqrt(Math.PI) * sLight);
  const byType: BandEnvelopeTypeResult[] = [];
  for (const type of input.types) {
    const rows = fine.filter((r) => r.v.type === type && Number.isFinite(r.ss));
    if (!rows.length) continue;
    const best = rows.reduce((a, r) => (r.ss < a.ss ? r : a));
    const cut = best.ss * (1 + ENVELOPE_SS_TOLERANCE) + noiseSs;
    const inside = rows.filter((r) => r.ss <= cut).map((r) => r.B);
    const tried = rows.map((r) => r.B);
    byType.push({
      type,
      B: best.B,
      bLow: Math.min(...inside),
      bHigh: Math.max(...inside),
      origin: best.origin,
      rms: Math.sqrt(best.ss / n),
      variant: best.v.label,
      bRangeOpen: Math.min(...inside) <= Math.min(...tried) * 1.0001 || Math.max(...inside) >= Math.max(...tried) * 0.9999,
    });
  }
  byType.sort((a, b) => a.rms - b.rms);
  return { byType, evaluations };
}
