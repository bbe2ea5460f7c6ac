/**
 * B of a perpendicular band of a symmetric top whose Q-branch comb is resolved but whose J lines are
 * not: the comb fixes 2[A(1−ζ) − B] (C for an oblate top) and the positions of the Q branches; the
 * envelope of the whole band (the heights of the Q branches over K and the P and R wings of every
 * sub-band) is fitted for B and A − B together, ζ following from the spacing.
 */
import { SECOND_RADIATION_CM_K } from '../physics/constants';
import { honlLondonFactor } from '../physics/honlLondon';
import { envelopeMeasures, scaleBaselineFit } from './bandEnvelopeFit';

/** Input of bandEnvelopeQSeriesFit. */
export interface BandEnvelopeQSeriesFitInput {
  /** Uniform ascending axis of the region, cm^-1. */
  x: Float64Array;
  /** Absorbance of the region with a baseline removed (a residual linear baseline is refitted). */
  y: Float64Array;
  /** Rotational temperature, K. */
  temperatureK: number;
  /** Spacing of consecutive Q branches at the band centre, cm^-1 (its sign is not used: both are tried). */
  qSpacingCm1: number;
  /** Position of one Q-branch maximum near the band centre, cm^-1 (sets the comb's phase). */
  combAnchorCm1: number;
  /**
   * Curvature of the comb, cm^-1 per index² (the quadratic term of the Q-branch positions in their
   * index), taken as (A′ − B′) − (A″ − B″). @default 0
   */
  combCurvatureCm1?: number;
  /** White-noise σ of y, absorbance. */
  noiseSigma: number;
  /** Nuclear-spin weights g(K″) = spinWeights[K″ mod length], when the molecule is known. @default [1] */
  spinWeights?: number[];
}

/** Result of bandEnvelopeQSeriesFit. */
export interface BandEnvelopeQSeriesFitResult {
  /** Best B, cm^-1, and the range of B over every shape, A − B, sign and width that fits about as well. */
  B: number;
  bLow: number;
  bHigh: number;
  /** Whether that range reaches the end of the B values tried (then the true range is wider still). */
  bRangeOpen: boolean;
  /** Shape of the best envelope, and every shape among those that fit about as well. */
  shape: 'prolate' | 'oblate';
  shapesFitting: ('prolate' | 'oblate')[];
  /** A − B (prolate) or C − B (oblate) of the best envelope, cm^-1, and its range among those that fit about as well. */
  uniqueMinusB: number;
  uniqueMinusBLow: number;
  uniqueMinusBHigh: number;
  /** ζ of the best envelope (from the spacing, B and A or C). */
  zeta: number;
  /** Q-branch spacing of the best envelope (the comb's, refined by up to ±2.5 %), cm^-1. */
  qSpacing: number;
  /** Origin ν0 of the best envelope, cm^-1. */
  origin: number;
  /** rms residual of the best envelope against the lightly smoothed trace, absorbance. */
  rms: number;
  /** That rms over what the smoothed noise alone leaves (≈ 1 for a model that fits to the noise). */
  rmsOverNoise: number;
  /** Envelope evaluations made (for the bench). */
  evaluations: number;
}

/** (U − B)/B tried: U = A for a prolate top (A > B), C for an oblate one (B/2 ≤ C < B). */
const PROLATE_RATIOS = [0.12, 0.3, 0.7, 1.4, 2.6, 4.5, 8, 14, 25];
const OBLATE_RATIOS = [-0.05, -0.15, -0.25, -0.35, -0.45];

/** Relative rise of the residual sum of squares over its minimum counted as "fits about as well" (model error). */
const Q_SERIES_SS_TOLERANCE = 0.1;

interface Trial {
  /** Q-branch spacing used, cm^-1. */
  q: number;
  shape: 'prolate' | 'oblate';
  ratio: number;
  sign: 1 | -1;
  B: number;
  ss: number;
  origin: number;
  zeta: number;
}

/**
 * Near-Gaussian smoothing of exact σ (samples): three passes of an extended box (radius r plus end
 * taps of weight α, chosen so that each pass has variance σ²/3), unlike smoothBoxes whose whole-number
 * radius steps σ by √2 near one sample. Edges use the part of the window inside.
 * Source: P. Gwosdek, S. Grewenig, A. Bruhn and J. Weickert, "Theoretical foundations of Gaussian
 * convolution by extended box filtering", SSVM 2011 (from memory).
 */
export function smoothExtendedBoxes(y: Float64Array, sigmaSamples: number): Float64Array {
  const n = y.length;
  const v = (sigmaSamples * sigmaSamples) / 3;
  // Largest r with a plain box's variance r(r+1)/3 ≤ v, then α for the rest.
  const r = Math.max(0, Math.floor((Math.sqrt(1 + 12 * v) - 1) / 2));
  const alpha = ((2 * r + 1) * (v - (r * (r + 1)) / 3)) / (2 * ((r + 1) * (r + 1) - v));
  let cur = Float64Array.from(y);
  if (!(sigmaSamples > 0)) return cur;
  const prefix = new Float64Array(n + 1);
  for (let pass = 0; pass < 3; pass++) {
    for (let i = 0; i < n; i++) prefix[i + 1] = prefix[i] + cur[i];
    const next = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const lo = Math.max(0, i - r);
      const hi = Math.min(n - 1, i + r);
      let s = prefix[hi + 1] - prefix[lo];
      let w = hi - lo + 1;
      if (i - r - 1 >= 0) {
        s += alpha * cur[i - r - 1];
        w += alpha;
      }
      if (i + r + 1 < n) {
        s += alpha * cur[i + r + 1];
        w += alpha;
      }
      next[i] = s / w;
    }
    cur = next;
  }
  return cur;
}

/** J structure of one sub-band (K″, ΔK) of a rigid band on the grid, relative to the sub-band origin. */
interface SubBandProfile {
  /** Sample offset of data[0] from the sub-band origin. */
  first: number;
  data: Float64Array;
  /** Sum of the weights and their first moment about the sub-band origin, cm^-1. */
  sum: number;
  moment: number;
}

/**
 * Sub-band (K″, ΔK = ±1) of a rigid band (B′ = B″): R lines at +2B(J+1), Q at 0, P at −2BJ from the
 * sub-band origin, weights 2·HL·exp(−c2 B J(J+1)/T) (the factor exp(−c2 (U−B) K²/T) is applied when
 * placed), deposited on a grid of `step` (linear split). Herzberg II (1945) ch. IV.
 */
function subBandProfile(B: number, c2T: number, K: number, deltaK: 1 | -1, jMax: number, step: number): SubBandProfile {
  const reach = Math.ceil((2 * B * (jMax + 1)) / step) + 2;
  const data = new Float64Array(2 * reach + 2);
  let sum = 0;
  let moment = 0;
  const kUp = K + deltaK;
  for (let dJ = -1; dJ <= 1; dJ++) {
    for (let J = Math.max(K, kUp - dJ); J <= jMax; J++) {
      const hl = honlLondonFactor(J, K, dJ, deltaK);
      if (hl <= 0) continue;
      const w = 2 * hl * Math.exp(-c2T * B * J * (J + 1));
      const off = dJ === 1 ? 2 * B * (J + 1) : dJ === -1 ? -2 * B * J : 0;
      sum += w;
      moment += w * off;
      const pos = off / step + reach;
      const i = Math.floor(pos);
      const f = pos - i;
      data[i] += w * (1 - f);
      data[i + 1] += w * f;
    }
  }
  return { first: -reach, data, sum, moment };
}

/**
 * Fit the envelope of a perpendicular symmetric-top band with a resolved Q-branch comb for B.
 *
 * Model: rigid-rotor sticks (A′ = A″, B′ = B″; term values and Hönl–London factors as bandLines,
 * Herzberg II (1945) ch. IV) with the sub-band Q branches at ν0 − Aζ + q(m + ½), q = ±|spacing| =
 * 2[A(1−ζ) − B], so ζ = 1 − (q/2 + B)/A (|ζ| ≤ 1 required); the origin is put so that a Q branch
 * falls on the anchor, the comb index chosen from the first moments (and its neighbours tried). The
 * trace and the sticks are smoothed alike (a tenth of the spacing), the sticks by one of four extra
 * widths (the instrument's, 0.05–0.35 of the spacing); a free scale and linear baseline. Grid: B on a
 * log grid (12 per decade, up to what the band's width allows), (U − B)/B over PROLATE_RATIOS and
 * OBLATE_RATIOS, both signs of q; then around the best five a finer grid (B ±20 % in 2 % steps, the
 * ratio ×0.8–1.25). "Fits about as well": residual sum of squares within 10 % (model error) plus
 * 4σ² (Δχ² = 4 on the smoothing's effective independent points) of the minimum.
 * Source: envelope comparison with a free scale and baseline, common practice; sub-band positions
 * Herzberg II (1945) ch. IV.
 * @returns the fit, or null when no trial fits (e.g. no physical ζ for the spacing)
 */
export function bandEnvelopeQSeriesFit(input: BandEnvelopeQSeriesFitInput): BandEnvelopeQSeriesFitResult | null {
  const T = input.temperatureK;
  const q0 = Math.abs(input.qSpacingCm1);
  // The spacing used by the trials (refined around q0 in the fine stage).
  let q = q0;
  const n0 = input.x.length;
  if (!(q0 > 0) || n0 < 20) return null;
  const step0 = (input.x[n0 - 1] - input.x[0]) / (n0 - 1);
  // Blocks of D samples averaged (D ≤ 4 % of the spacing): the comparison below smooths to a tenth of it anyway.
  const D = Math.max(1, Math.floor((0.04 * q) / step0));
  const n = Math.floor(n0 / D);
  if (n < 20) return null;
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let sx = 0;
    let sy = 0;
    for (let k = 0; k < D; k++) {
      sx += input.x[i * D + k];
      sy += input.y[i * D + k];
    }
    x[i] = sx / D;
    y[i] = sy / D;
  }
  const noiseSigma = input.noiseSigma / Math.sqrt(D);
  const step = (x[n - 1] - x[0]) / (n - 1);
  const { t, centroid, width } = envelopeMeasures(x, y, step);
  const sTrace = Math.max(1, (0.2 * q) / step);
  const ySmooth = smoothExtendedBoxes(y, sTrace);
  const widths = Array.from({ length: 16 }, (_, k) => Math.hypot(sTrace, (0.03 * k * q) / step));
  const coarseWidths = [widths[3], widths[7], widths[11]];
  const keep = new Uint8Array(n).fill(1);
  let evaluations = 0;

  const c2T = SECOND_RADIATION_CM_K / T;
  const spin = input.spinWeights?.length ? input.spinWeights : [1];
  const dU = input.combCurvatureCm1 ?? 0;
  // Sub-band profiles per B (shared by every shape, ratio, sign and origin tried with that B).
  const profileCache = new Map<number, Map<number, SubBandProfile>>();
  const profileOf = (B: number, K: number, deltaK: 1 | -1): SubBandProfile => {
    let byK = profileCache.get(B);
    if (!byK) {
      byK = new Map();
      profileCache.set(B, byK);
    }
    const key = 2 * K + (deltaK > 0 ? 1 : 0);
    let p = byK.get(key);
    if (!p) {
      p = subBandProfile(B, c2T, K, deltaK, Math.ceil(Math.sqrt(10 / (c2T * B))) + 2, step);
      byK.set(key, p);
    }
    return p;
  };
  const span = x[n - 1] - x[0];
  const nuFactor = new Float64Array(n);
  for (let i = 0; i < n; i++) nuFactor[i] = x[i] * -Math.expm1(-c2T * x[i]);

  const trial = (shape: 'prolate' | 'oblate', ratio: number, sign: 1 | -1, B: number, fine: boolean): Trial | null => {
    const unique = B * (1 + ratio);
    const zeta = 1 - ((sign * q) / 2 + B) / unique;
    if (!(Math.abs(zeta) <= 1)) return null;
    evaluations++;
    const uMinusB = unique - B;
    const jMax = Math.ceil(Math.sqrt(10 / (c2T * B))) + 2;
    const kBoltz = Math.ceil(Math.sqrt(10 / (c2T * Math.max(Math.abs(uMinusB), 0.02 * B)))) + 2;
    // Sub-bands whose origins fall beyond the region by more than their own reach add nothing.
    const kRegion = Math.ceil((span + 4 * B * (jMax + 1)) / q) + 2;
    const kMax = Math.min(jMax, kBoltz, kRegion);
    // Sub-band origins (origin 0) and their weights exp(−c2 (U−B) K²/T).
    const subs: { nu: number; a: number; p: SubBandProfile }[] = [];
    let wSum = 0;
    let wx = 0;
    for (const deltaK of [1, -1] as const) {
      for (let K = deltaK === 1 ? 0 : 1; K <= kMax; K++) {
        const kUp = K + deltaK;
        const nu = (uMinusB + dU) * kUp * kUp - 2 * unique * zeta * kUp * deltaK - uMinusB * K * K;
        const a = spin[K % spin.length] * Math.exp(-c2T * uMinusB * K * K);
        if (!(a > 1e-12)) continue;
        const p = profileOf(B, K, deltaK);
        subs.push({ nu, a, p });
        wSum += a * p.sum;
        wx += a * (p.sum * nu + p.moment);
      }
    }
    if (!(wSum > 0)) return null;
    const mean = wx / wSum;
    // Q branches at ν0 − Aζ + q(m + ½): put one on the anchor, the index nearest the first moments.
    const phase = input.combAnchorCm1 + unique * zeta - (sign * q) / 2;
    const j0 = Math.round((centroid - mean - phase) / q);
    let best: Trial | null = null;
    for (const j of fine ? [j0 - 1, j0, j0 + 1] : [j0]) {
      const origin = phase + j * q;
      const sticks = new Float64Array(n);
      for (const sb of subs) {
        const pos = (origin + sb.nu - x[0]) / step + sb.p.first;
        const i0 = Math.floor(pos);
        const f = pos - i0;
        const d = sb.p.data;
        const kLo = Math.max(0, -i0);
        const kHi = Math.min(d.length, n - 1 - i0);
        for (let k = kLo; k < kHi; k++) {
          const v = sb.a * d[k];
          sticks[i0 + k] += v * (1 - f);
          sticks[i0 + k + 1] += v * f;
        }
      }
      // The ν(1 − exp(−c2ν/T)) factor of the line strengths (±several per cent across a wide band).
      for (let i = 0; i < n; i++) sticks[i] *= nuFactor[i];
      let ss = Infinity;
      for (const w of fine ? widths : coarseWidths)
        ss = Math.min(ss, scaleBaselineFit(smoothExtendedBoxes(sticks, w), ySmooth, t, keep).ss);
      if (!best || ss < best.ss) best = { q, shape, ratio, sign, B, ss, origin, zeta };
    }
    return best;
  };

  // B above this puts the P and R maxima of one sub-band (2.358√(BT) apart) beyond the band's width.
  const bMax = Math.min(10, ((1.2 * width) / 2.358) ** 2 / T);
  const coarse: Trial[] = [];
  for (const [shape, ratios] of [
    ['prolate', PROLATE_RATIOS],
    ['oblate', OBLATE_RATIOS],
  ] as const) {
    for (const ratio of ratios) {
      for (const sign of [1, -1] as const) {
        for (let e = Math.log10(0.005); e <= Math.log10(bMax) + 1e-9; e += 1 / 8) {
          const r = trial(shape, ratio, sign, 10 ** e, false);
          if (r && Number.isFinite(r.ss)) coarse.push(r);
        }
      }
    }
  }
  if (!coarse.length) return null;
  coarse.sort((a, b) => a.ss - b.ss);
  const seeds: Trial[] = [];
  for (const c of coarse) {
    if (seeds.some((s) => s.shape === c.shape && s.ratio === c.ratio && s.sign === c.sign)) continue;
    seeds.push(c);
    if (seeds.length >= 4) break;
  }
  const fine: Trial[] = [];
  for (const s of seeds) {
    // The comb's spacing from its maxima is good to a few per cent, which over ten Q branches moves
    // the outer ones by a large part of a spacing: refine it first (±2.5 % in 0.5 % steps).
    let bestQ = { q: q0, ss: Infinity };
    for (let k = -5; k <= 5; k++) {
      q = q0 * (1 + 0.005 * k);
      const r = trial(s.shape, s.ratio, s.sign, s.B, true);
      if (r && r.ss < bestQ.ss) bestQ = { q, ss: r.ss };
    }
    q = bestQ.q;
    for (const f of [0.75, 0.87, 1, 1.15, 1.33]) {
      const ratio = s.ratio * f;
      if (s.shape === 'oblate' && !(ratio > -0.5 && ratio < 0)) continue;
      for (let g = 0.75; g <= 1.34; g *= 1.03) {
        const r = trial(s.shape, ratio, s.sign, s.B * g, true);
        if (r && Number.isFinite(r.ss)) fine.push(r);
      }
    }
  }
  if (!fine.length) return null;
  const best = fine.reduce((a, r) => (r.ss < a.ss ? r : a));
  const cut = best.ss * (1 + Q_SERIES_SS_TOLERANCE) + 4 * noiseSigma ** 2;
  const inside = fine.filter((r) => r.ss <= cut);
  // Coarse trials of the other shapes, ratios and signs that reach the cut widen the range too.
  for (const c of coarse) if (c.ss <= cut) inside.push(c);
  const bs = inside.map((r) => r.B);
  const bLow = Math.min(...bs);
  const bHigh = Math.max(...bs);
  const triedLow = Math.min(...fine.map((r) => r.B));
  const triedHigh = Math.max(...fine.map((r) => r.B));
  const um = inside.map((r) => r.B * r.ratio);
  // The smoothing leaves white noise of σ²/(2√π s) per point.
  const rmsOverNoise = Math.sqrt(best.ss / n) / (noiseSigma / Math.sqrt(2 * Math.sqrt(Math.PI) * sTrace));
  return {
    B: best.B,
    bLow,
    bHigh,
    bRangeOpen: bLow <= triedLow * 1.0001 || bHigh >= triedHigh * 0.9999,
    shape: best.shape,
    shapesFitting: [...new Set(inside.map((r) => r.shape))],
    uniqueMinusB: best.B * best.ratio,
    uniqueMinusBLow: Math.min(...um),
    uniqueMinusBHigh: Math.max(...um),
    zeta: best.zeta,
    qSpacing: best.q,
    origin: best.origin,
    rms: Math.sqrt(best.ss / n),
    rmsOverNoise,
    evaluations,
  };
}
