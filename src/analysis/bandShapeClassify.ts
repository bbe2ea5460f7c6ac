/**
 * Band-shape diagnosis of a trace region: P and R only, P, Q and R with one Q branch, or a series
 * of Q branches; what that implies for the band type; estimates of the origin, B and the Q-branch
 * spacing; and how sure the reading is.
 */
import { axisRegionIndices } from '../physics/axisRegion';
import { SECOND_RADIATION_CM_K } from '../physics/constants';
import { bandCentreTemplate } from './bandCentreTemplate';
import { bandEnvelopeFit, smoothBoxes } from './bandEnvelopeFit';
import { bandEnvelopeQSeriesFit, type BandEnvelopeQSeriesFitResult } from './bandEnvelopeQSeriesFit';
import { MAD_TO_SIGMA, noiseSigmaEstimate } from './noiseSigmaEstimate';
import { peakProminence } from './peakProminence';
import { qSeriesContourB, type QSeriesContourBResult } from './qSeriesContourB';
import type { ApodizationName } from '../physics/instrumentLineShape';

/** Profile of a band region. */
export type BandProfile = 'PR' | 'PQR' | 'Q-series';

/** Band type the profile points to. */
export type BandShapeType = 'linear-parallel' | 'linear-perpendicular' | 'symmetric-top-parallel' | 'symmetric-top-perpendicular';

/** Saturation κ of the two-lobe template from which a PR band's B comes from its unsaturated lobes. */
const SATURATION_SEEN = 0.5;

/** Options of bandShapeClassify. */
export interface BandShapeClassifyOptions {
  /** Rotational temperature, K, for B from the P–R separation. Absent: ASSUMED_TEMPERATURE_K, said so. */
  temperatureK?: number;
  /**
   * Also fit the envelope of a Q-branch series for B and A − B (bandEnvelopeQSeriesFit; about 1–4 s of CPU per
   * band), reported as `qSeriesEnvelope`. @default false
   */
  qSeriesEnvelope?: boolean;
  /**
   * Maximum optical path difference L of the spectrometer, cm. Given, a Q-branch series' B comes from a
   * contour fit of the band seen through the instrument (qSeriesContourB, after the envelope fit that
   * starts it; several seconds of CPU per band), reported as `qSeriesContour`. Absent: no contour fit.
   */
  opdCm?: number;
  /** Apodization of the spectrometer (with opdCm). @default 'boxcar' */
  apodization?: ApodizationName;
  /**
   * Nuclear-spin weights g(K″) = spinWeights[K″ mod length] for the Q-series envelope and contour fits,
   * when the molecule is known (its Q branches then alternate in height). @default [1]
   */
  spinWeights?: number[];
  /** Called after each run of the contour fit (with opdCm) with the runs done and about how many there will be. */
  onProgress?: (runsDone: number, runsPlanned: number) => void;
}

/** Result of bandShapeClassify. */
export interface BandShapeClassification {
  profile: BandProfile;
  type: BandShapeType;
  /** Band origin estimate, cm^-1. */
  origin: number;
  /** B estimate, cm^-1, or null when the trace does not show it. */
  B: number | null;
  /** Spacing of consecutive Q branches at the band centre, cm^-1 (Q-series only), ≈ 2[A′(1−ζ) − B′]. */
  qSpacing?: number;
  /** How sure the reading is. */
  confidence: 'high' | 'medium' | 'low';
  /** The other band type that would fit the profile, when there is one. */
  alternativeType?: BandShapeType;
  /** How B was obtained. */
  bMethod: 'line-spacing' | 'pr-separation' | 'envelope-fit' | 'none';
  /** Range B is good to, cm^-1 (when B is given). */
  bLow?: number;
  bHigh?: number;
  /**
   * Whether that range is narrow enough (within ±15 % of B; ±10 % from a Π–Σ or Q-series envelope) to call
   * B determined (when B is given); from a Q-series contour fit, as qSeriesContour.determined says.
   */
  bDetermined?: boolean;
  /**
   * What the envelope fit of a Q-branch series found (when it ran): the best shape and those that fit
   * about as well, U − B (U = A prolate, C oblate, cm^-1) with its range, ζ, and the range of B in
   * cm^-1 (also when B is not given because that range is too wide).
   */
  qSeriesEnvelope?: Pick<
    BandEnvelopeQSeriesFitResult,
    | 'shape'
    | 'shapesFitting'
    | 'uniqueMinusB'
    | 'uniqueMinusBLow'
    | 'uniqueMinusBHigh'
    | 'zeta'
    | 'B'
    | 'bLow'
    | 'bHigh'
    | 'rmsOverNoise'
    | 'origin'
  >;
  /**
   * What the contour fit of a Q-branch series found (when opdCm was given and it ran): B with σ and
   * B ± 2σ, whether determined and why not, rms over the noise, U′(1−ζ) − B′ with σ, U″ (cm^-1).
   */
  qSeriesContour?: Pick<
    QSeriesContourBResult,
    | 'B'
    | 'bSigma'
    | 'bLow'
    | 'bHigh'
    | 'otherMinimaB'
    | 'determined'
    | 'fitsBand'
    | 'whyNot'
    | 'rmsOverNoise'
    | 'residualLag1'
    | 'uniqueZetaMinusB'
    | 'uniqueZetaMinusBSigma'
    | 'unique'
    | 'shape'
    | 'status'
  >;
  /** Temperature used for B, K, and whether it was assumed. */
  temperatureK: number;
  temperatureAssumed: boolean;
  /** Plain-language reasons. */
  evidence: string;
  /** What the profile implies. */
  implication: string;
}

/** Smallest half-range of B given from a Π–Σ or Q-series envelope fit, relative (the rigid model's own error, chosen here). */
const ENVELOPE_B_FLOOR = 0.05;

/** A PR reading from resolved lines whose B is under this fraction of the spread's is rated low (see its use; chosen here). */
const PR_J_RATIO_LOW = 0.85;

/**
 * Range (multiples of B) given for a B from the envelope of a profile rated low: the 5th–95th and
 * 2nd–98th percentiles of truth/B were 0.42–1.58 and 0.24–1.79 on 251 such bands of bench:contour
 * classify (seeds 0–399 and 1000–1399); held-out seeds 1003 and 1017 (oblate perpendicular bands
 * read PQR) gave 1.84 and 1.92.
 */
const LOW_ENVELOPE_B_RANGE = [0.4, 2] as const;

/**
 * Values of (B′ − B″)/B″ the envelope fits of Σ–Σ bands and of symmetric tops' parallel bands try.
 * Real bands have −1.2 … +0.5 % (from memory: N2O ν3 −0.8 %, CH3I ν3 −0.6 %, CH3F ν3 −1.1 %, HCN ν2
 * +0.2 %), and a heavy molecule's envelope feels it: with B′ = B″ assumed, a CH3I-like parallel band
 * (−0.7 %, L = 1 cm) gave B −20 % (test/fixtures/independent_traces), with B′ = B″ generated −5 %.
 */
const ENVELOPE_DELTA_B_RELS = [-0.015, -0.0125, -0.01, -0.0075, -0.005, -0.0025, 0, 0.0025, 0.005];

/**
 * Range (multiples of B) given for a B from a comb read as J lines in a profile rated low. On seeds
 * 0–399 and 1000–1399 of bench:contour classify 36 of 37 such values were within 10 %; where the comb
 * was Q branches instead (fresh seeds 8044 and 2056 of classifySpecRandom, seed 19 of traceSpecRandom,
 * in the unit tests) truth/B was 2.47, 0.22 and 3.04.
 */
const LOW_COMB_B_RANGE = [0.2, 3.5] as const;

/** A Q-series envelope fit whose B range spans more than this factor gives no B (chosen here). */
const Q_SERIES_B_RATIO_GIVEN = 1.5;

/**
 * A Q-series envelope fit whose residual exceeds this multiple of what the noise alone leaves gives no
 * B: a model that does not fit to the noise can have its minimum anywhere (chosen here).
 */
const Q_SERIES_RMS_OVER_NOISE_GIVEN = 1.5;

/** A PQR band whose Π–Σ envelope leaves less than this fraction of a parallel band's rms is read as Π–Σ (measured, see bandShapeClassify). */
const PI_SIGMA_ENVELOPE_RMS_RATIO = 0.9;

/** Temperature assumed for B from the P–R separation when none is given, K (room temperature). */
export const ASSUMED_TEMPERATURE_K = 296;

/**
 * P–R maximum separation of an unresolved band, Δν = 2·√(2kTB/hc) = 2.358·√(B T) (B in cm^-1, T in K),
 * from the maxima of J″ ↦ (2J″+1)·exp(−B J″(J″+1) hc/kT) at J″ ≈ √(kT/2Bhc) − 1/2.
 * Source: G. Herzberg, Molecular Spectra and Molecular Structure II (1945), ch. IV (P–R separation of
 * unresolved bands; the coefficient 2.358 there); k/hc from CODATA 2018 via c2 = hc/k.
 * @param bCm1 rotational constant, cm^-1
 * @param temperatureK K
 * @returns separation, cm^-1
 */
export function bandPrSeparation(bCm1: number, temperatureK: number): number {
  return 2 * Math.sqrt((2 * temperatureK * bCm1) / SECOND_RADIATION_CM_K);
}

/** Inverse of bandPrSeparation: B = Δν² hc / (8 k T), cm^-1. Source: as bandPrSeparation. */
export function bandBFromPrSeparation(separationCm1: number, temperatureK: number): number {
  return (separationCm1 * separationCm1 * SECOND_RADIATION_CM_K) / (8 * temperatureK);
}

/**
 * B from the intensity-weighted mean distance of the P and R branches from the band centre: for
 * I(x) ∝ |x| exp(−x² hc/(4BkT)) (x = ν − ν0 ≈ ±2BJ, Hönl–London ≈ J for a Σ–Σ band) the mean of
 * |x| is √(π/2)·√(2BkT/hc), whose mode is half the P–R separation of bandPrSeparation. The mean does
 * not move under the instrument's symmetric smoothing, unlike the maxima.
 * Source: Herzberg II (1945) ch. IV for the intensity distribution; Rayleigh-distribution mean.
 * @returns B, cm^-1
 */
export function bandBFromBranchSpread(x: ArrayLike<number>, y: ArrayLike<number>, centreCm1: number, temperatureK: number): number {
  let w = 0;
  let wx = 0;
  for (let i = 1; i < x.length; i++) {
    const dx = x[i] - x[i - 1];
    w += y[i] * dx;
    wx += y[i] * Math.abs(x[i] - centreCm1) * dx;
  }
  const mean = wx / w / Math.sqrt(Math.PI / 2);
  return (mean * mean * SECOND_RADIATION_CM_K) / (2 * temperatureK);
}

export interface Peak {
  x: number;
  height: number;
  prominence: number;
  index: number;
}

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const n = s.length;
  return n === 0 ? NaN : n % 2 ? s[(n - 1) / 2] : 0.5 * (s[n / 2 - 1] + s[n / 2]);
}

function refinedPeaks(x: Float64Array, y: Float64Array, minProminence: number): Peak[] {
  const maxima = peakProminence(y);
  const peaks: Peak[] = [];
  for (let k = 0; k < maxima.count; k++) {
    if (maxima.prominence[k] < minProminence) continue;
    const i = maxima.index[k];
    // Three-point parabola through the top for a sub-sample position.
    const a = y[i - 1];
    const b = y[i];
    const c = y[i + 1];
    const den = a - 2 * b + c;
    const off = den < 0 ? Math.max(-0.5, Math.min(0.5, (0.5 * (a - c)) / den)) : 0;
    const h = 0.5 * (x[i + 1] - x[i - 1]);
    peaks.push({ x: x[i] + off * h, height: b, prominence: maxima.prominence[k], index: i });
  }
  return peaks;
}

/** Least-squares straight line y ≈ my + slope·(x − mx): the means, Σ(x − mx)² and the slope (0 when the x are all equal). */
function straightLine(xs: readonly number[], ys: readonly number[]): { mx: number; my: number; sxx: number; slope: number } {
  const n = xs.length;
  const mx = xs.reduce((a, v) => a + v, 0) / n;
  const my = ys.reduce((a, v) => a + v, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (xs[i] - mx) ** 2;
    sxy += (xs[i] - mx) * (ys[i] - my);
  }
  return { mx, my, sxx, slope: sxx > 0 ? sxy / sxx : 0 };
}

/**
 * The spacing of resolved J lines at the band origin, cm^-1: neighbouring peaks whose gap is within
 * 0.7–1.4 of the comb's spacing give local spacings at their midpoints; a straight line through them
 * (dν/dm = B′ + B″ + 2(B′ − B″)m is linear in m, so in ν − ν0 to first order; Herzberg II ch. IV) is
 * read at the origin, fitted to the pairs that lie near a robust line (Theil–Sen) through all of them. The uncertainty is twice the fit's standard error there, plus, when every pair
 * lies on one side, half the change carried from the nearest pair to the origin. Null with fewer
 * than four pairs.
 */
export function jLineSpacingAtOrigin(
  peaks: Peak[],
  spacing: number,
  origin: number,
): { spacing: number; uncertainty: number; pairs: number; bothSides: boolean } | null {
  const sorted = [...peaks].sort((a, b) => a.x - b.x);
  let mids: number[] = [];
  let gaps: number[] = [];
  for (let i = 1; i < sorted.length; i++) {
    const g = sorted[i].x - sorted[i - 1].x;
    const mid = 0.5 * (sorted[i].x + sorted[i - 1].x);
    // Not across the central gap (P(1)–R(0) spans 4B) nor a Q branch beside it.
    if (g < 0.7 * spacing || g > 1.4 * spacing || Math.abs(mid - origin) < 1.5 * spacing) continue;
    mids.push(mid - origin);
    gaps.push(g);
  }
  if (mids.length < 4) return null;
  // Pairs that are not neighbouring J lines of one branch (a J line beside a hot-band or K-split line,
  // a blend's shoulder) fall off the line. A line robust to them first (Theil–Sen: the median of the
  // pairwise slopes, the median intercept; Sen 1968), then the least-squares line through the pairs
  // within 3 robust σ of it (median absolute deviation, floored at 1 % of the spacing).
  const slopes: number[] = [];
  for (let i = 0; i < mids.length; i++)
    for (let j = i + 1; j < mids.length; j++) if (mids[j] !== mids[i]) slopes.push((gaps[j] - gaps[i]) / (mids[j] - mids[i]));
  const robustSlope = slopes.length ? median(slopes) : 0;
  const robustAt0 = median(gaps.map((g, i) => g - robustSlope * mids[i]));
  const res = gaps.map((g, i) => g - robustAt0 - robustSlope * mids[i]);
  const cut = 3 * Math.max(MAD_TO_SIGMA * median(res.map(Math.abs)), 0.01 * spacing);
  const inliers = res.map((_, i) => i).filter((i) => Math.abs(res[i]) <= cut);
  if (inliers.length >= 4) {
    mids = inliers.map((i) => mids[i]);
    gaps = inliers.map((i) => gaps[i]);
  }
  const m = mids.length;
  const { mx, my, sxx, slope } = straightLine(mids, gaps);
  const at0 = my - slope * mx;
  let rss = 0;
  for (let i = 0; i < m; i++) rss += (gaps[i] - (at0 + slope * mids[i])) ** 2;
  const s2 = m > 2 ? rss / (m - 2) : 0;
  const se = Math.sqrt(s2 * (1 / m + (sxx > 0 ? (mx * mx) / sxx : 0)));
  const bothSides = mids.some((v) => v < 0) && mids.some((v) => v > 0);
  const nearest = mids.reduce((a, v) => (Math.abs(v) < Math.abs(a) ? v : a));
  const carried = bothSides ? 0 : 0.5 * Math.abs(slope * nearest);
  if (!(at0 > 0.5 * spacing && at0 < 1.5 * spacing)) return null;
  return { spacing: at0, uncertainty: 2 * se + carried, pairs: m, bothSides };
}

/**
 * Regular comb among the peaks: spacing d (the median gap), the peaks on it and its regularity (the
 * share of consecutive gaps that are whole multiples, 1–3 for a missing member, of d within 15 %), or
 * null below 60 %. A comb less regular than that still counts when its gaps drift along a straight
 * line: the J lines of a band whose B changes drift by 2ΔB per line (R(J+1) − R(J) = 2B′ + 2(J+1)(B′ −
 * B″), Herzberg II ch. IV), tens of per cent over a real linear molecule's band (an N2O ν3-like band,
 * B′ − B″ = −0.8 %, test/fixtures/independent_traces: gaps from 1.1 to 0.5 cm^-1, 54 % of them within
 * 15 % of the median). It counts when the single gaps (within ±35 % of the median, at least 12) lie
 * within 3 % rms of a line through them and ≥ 80 % of all gaps are whole multiples of that local
 * spacing (that band: 45 gaps, 0.9 %, 98 %; real PH3 ν4, a perpendicular band's Q branches and lines
 * at L = 0.9 cm, test/fixtures/real: 12, 7.1 %, 69 %, not a comb). `regularity` stays the fixed-spacing
 * share, which later tests read as the mark of a Q-branch series (on PH3 ν2 the drifting spacing
 * raised it from 70 to 90 % and turned the band's J lines into a Q-series).
 */
function combOf(peaks: Peak[]): { spacing: number; members: Peak[]; regularity: number } | null {
  if (peaks.length < 5) return null;
  const diffs: number[] = [];
  const mids: number[] = [];
  for (let i = 1; i < peaks.length; i++) {
    diffs.push(peaks[i].x - peaks[i - 1].x);
    mids.push(0.5 * (peaks[i].x + peaks[i - 1].x));
  }
  const d = median(diffs);
  const onGridShare = (localAt: (i: number) => number): number => {
    let onGrid = 0;
    for (let i = 0; i < diffs.length; i++) {
      const loc = localAt(i);
      const k = Math.round(diffs[i] / loc);
      if (k >= 1 && k <= 3 && Math.abs(diffs[i] - k * loc) < 0.15 * loc) onGrid++;
    }
    return onGrid / diffs.length;
  };
  const regularity = onGridShare(() => d);
  if (regularity >= 0.6) return { spacing: d, members: peaks, regularity };
  const single = diffs.map((_, i) => i).filter((i) => Math.abs(diffs[i] - d) < 0.35 * d);
  if (single.length < 12) return null;
  const { mx, my, slope } = straightLine(
    single.map((i) => mids[i]),
    single.map((i) => diffs[i]),
  );
  let rss = 0;
  for (const i of single) rss += (diffs[i] - my - slope * (mids[i] - mx)) ** 2;
  if (!(Math.sqrt(rss / single.length) <= 0.03 * d)) return null;
  // The local spacing stays within 0.4–1.6× the median over the comb (a drift, not a second comb).
  const localAt = (i: number) => Math.min(1.6 * d, Math.max(0.4 * d, my + slope * (mids[i] - mx)));
  return onGridShare(localAt) >= 0.8 ? { spacing: d, members: peaks, regularity } : null;
}

/**
 * Classify the shape of a band in a trace region and estimate its origin, B and Q-branch spacing.
 *
 * Method (thresholds are common practice, chosen here): a linear baseline through the region's
 * ends is removed; maxima with prominence ≥ max(6σ_noise, 12 % of the largest prominence) are the
 * "strong" peaks. A regular comb of them (≥ 60 % of consecutive gaps whole multiples of the median
 * gap, or of a local spacing that drifts linearly along the band) with a single-lobed envelope of peak heights and no dominant central member is a series of
 * Q branches (perpendicular band of a symmetric top; spacing ≈ 2[A′(1−ζ) − B′], Herzberg II ch. IV);
 * a comb with a two-lobed envelope is resolved rotational structure (spacing ≈ 2B), PR when a gap
 * of ≈ 2 spacings splits it at the centre, PQR when a dominant peak sits there. Without a comb the
 * smoothed envelope decides: two lobes (P and R) with or without a sharp central Q. B then comes
 * from the P–R maximum separation, Δν = 2.358√(BT) (Herzberg II ch. IV), which needs T.
 * PQR is read as a Π–Σ band of a linear molecule when the Q branch holds ≥ 40 % of the band's area
 * (Hönl–London: ≈ 1/2 for Π–Σ) and as a parallel band of a symmetric top below; between 30 and 50 %
 * the reading is marked low-confidence, with the other type named.
 * Second looks at a reading (each said in the evidence): a PR read from an envelope whose highest
 * maximum sits at the band's centroid (where a Σ–Σ band has its dip) is PQR, rated low; a comb read as
 * J lines that runs through the band centre with no gap, dip or Q branch and disagrees with the
 * envelope's P–R maxima is a Q-branch series, rated low; a PQR whose central feature ripples regularly
 * with a period finer than J lines of the band can be (maxima of the trace, or of the feature less its
 * smooth outline) is a cluster of Q branches (Q-series).
 * Source: Herzberg, Molecular Spectra and Molecular Structure II (1945), ch. IV (band envelopes of
 * linear and symmetric-top molecules, P–R separation).
 * @param wavenumberCm1 ascending axis, cm^-1
 * @param absorbance ordinate, absorbance
 * @param fromCm1 region start, cm^-1
 * @param toCm1 region end, cm^-1
 * @param options temperature (K)
 * @throws Error naming the problem for a region with too few points or no band above the noise
 */
export function bandShapeClassify(
  wavenumberCm1: Float64Array,
  absorbance: Float64Array,
  fromCm1: number,
  toCm1: number,
  options: BandShapeClassifyOptions = {},
): BandShapeClassification {
  const fn = 'bandShapeClassify';
  if (!(toCm1 > fromCm1)) throw new Error(`${fn}: the region must have to > from, got ${fromCm1} … ${toCm1}`);
  const temperatureAssumed = options.temperatureK === undefined;
  const T = options.temperatureK ?? ASSUMED_TEMPERATURE_K;
  if (!(T > 0) || !Number.isFinite(T)) throw new Error(`${fn}: temperature must be > 0 K, got ${T}`);
  if (options.opdCm !== undefined && !(options.opdCm > 0 && Number.isFinite(options.opdCm)))
    throw new Error(`${fn}: opd must be > 0 cm, got ${options.opdCm}`);
  const [i0, i1] = axisRegionIndices(wavenumberCm1, fromCm1, toCm1);
  const n = i1 - i0;
  if (n < 20) throw new Error(`${fn}: the region ${fromCm1} … ${toCm1} cm^-1 holds ${n} trace points; at least 20 are needed`);
  const x = wavenumberCm1.slice(i0, i1);
  const raw = absorbance.slice(i0, i1);
  for (let i = 0; i < n; i++) if (!Number.isFinite(raw[i])) throw new Error(`${fn}: non-finite absorbance at ${x[i]} cm^-1`);
  const step = (x[n - 1] - x[0]) / (n - 1);

  // Baseline through the medians of the first and last 4 % of the region.
  const edge = Math.max(3, Math.floor(0.04 * n));
  const leftLevel = median(Array.from(raw.subarray(0, edge)));
  const rightLevel = median(Array.from(raw.subarray(n - edge)));
  // Each level belongs at its window's median wavenumber (for an even window, halfway between the two
  // middle points): half a sample off, a steep baseline tilts the line by half a sample's rise at each
  // end, which swamped a weak band on a sloping one (bench:contour targets seed 31: a band of 2e-6 on a
  // baseline rising 9e-6 per sample, read as a Q-series rated high).
  const xl = median(Array.from(x.subarray(0, edge)));
  const xr = median(Array.from(x.subarray(n - edge)));
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) y[i] = raw[i] - (leftLevel + ((rightLevel - leftLevel) * (x[i] - xl)) / (xr - xl));
  // The noise from second differences over the whole region, or over its two edge windows when they
  // say less than half as much: where resolved lines a few samples apart fill most of the region, their
  // curvature passes for noise (a real Σ–Σ band at L = 4 cm, HC3N ν4 from test/fixtures/real, gave 19×
  // the noise put in and was called "no band"). The edges are taken as band-free already, for the
  // baseline; with few points their estimate scatters (0.5–1.6× the noise on bench:contour's seeded
  // bands), so it is used only where the whole region's is clearly inflated.
  const sigmaAll = noiseSigmaEstimate(x, y);
  const sigmaEdges =
    edge >= 8
      ? Math.sqrt(
          0.5 *
            (noiseSigmaEstimate(x.subarray(0, edge), y.subarray(0, edge)) ** 2 +
              noiseSigmaEstimate(x.subarray(n - edge), y.subarray(n - edge)) ** 2),
        )
      : Infinity;
  const sigma = sigmaEdges < 0.5 * sigmaAll ? sigmaEdges : sigmaAll;
  let yMax = 0;
  let area = 0;
  let moment = 0;
  for (let i = 0; i < n; i++) {
    yMax = Math.max(yMax, y[i]);
    if (y[i] > 0) {
      area += y[i] * step;
      moment += y[i] * x[i] * step;
    }
  }
  if (!(yMax > 8 * sigma)) {
    throw new Error(
      `${fn}: no band stands out of the noise in ${fromCm1} … ${toCm1} cm^-1 (peak ${yMax.toPrecision(3)}, noise σ ${sigma.toPrecision(3)})`,
    );
  }
  const centroid = moment / area;
  const evidence: string[] = [];
  const tNote = temperatureAssumed ? `T = ${T} K assumed (none given)` : `T = ${T} K as given`;

  // Peaks on a lightly smoothed trace (about one sample of smoothing).
  const light = smoothBoxes(y, 1);
  const allPeaks = refinedPeaks(x, light, 6 * sigma);
  const maxProm = allPeaks.reduce((m, p) => Math.max(m, p.prominence), 0);
  // A comb among the strongest peaks first (Q branches stand above resolved J lines), then weaker ones,
  // down to 4 % of the most prominent: a linear molecule's Π–Σ band puts about half its intensity into
  // one Q branch, which can stand 10–25× above its resolved J lines (seed 7009 of bench:contour classify:
  // B 0.98 cm^-1 at L = 3.8 cm, then read from the envelope, −18 %; from the lines −1.4 %). On the 800
  // seeded bands of seeds 0–9079 this level changed no profile and put 6 more B's within 10 %.
  let comb: ReturnType<typeof combOf> = null;
  for (const level of [0.5, 0.3, 0.12, 0.04]) {
    comb = combOf(allPeaks.filter((p) => p.prominence >= level * maxProm));
    // A "comb" finer than three samples is noise or ripple, not structure.
    if (comb && comb.spacing < 3 * step) comb = null;
    if (comb) break;
  }

  let w10 = x[0];
  let w90 = x[n - 1];
  {
    let acc = 0;
    let got10 = false;
    for (let i = 0; i < n; i++) {
      if (y[i] > 0) acc += y[i] * step;
      if (!got10 && acc >= 0.05 * area) {
        w10 = x[i];
        got10 = true;
      }
      if (acc <= 0.95 * area) w90 = x[i];
    }
  }
  const width = Math.max(w90 - w10, 10 * step);
  let combFromPeriod = false;
  if (!comb) {
    // No comb among the picked peaks: look for one in the periodicity of the high-pass residual
    // (trace minus its envelope) over the band's central 90 %, then pick the maxima of a trace
    // smoothed to a sixth of that period, where Q branches too close for the peak test may show.
    const env = smoothBoxes(y, Math.max(2, width / 12 / step));
    const iLo = Math.max(0, Math.round((w10 - x[0]) / step));
    const iHi = Math.min(n - 1, Math.round((w90 - x[0]) / step));
    const hp = new Float64Array(iHi - iLo + 1);
    for (let i = iLo; i <= iHi; i++) hp[i - iLo] = light[i] - env[i];
    const period = residualPeriod(hp, 3, Math.floor(hp.length / 6));
    if (period && period.strength >= 0.25) {
      const d = period.lag * step;
      const fine = smoothBoxes(y, Math.max(0.5, period.lag / 6));
      const picked = refinedPeaks(x, fine, 3 * sigma).filter((p) => p.x >= w10 && p.x <= w90);
      const found = combOf(picked);
      if (found && Math.abs(found.spacing / d - 1) < 0.15) {
        comb = found;
        combFromPeriod = true;
      }
    }
  }

  // A Q branch: the most prominent peak in the central part of the band, standing ≥ 2.5× above the
  // median prominence of its neighbours.
  const local = comb ? 3 * comb.spacing : width / 6;
  const central = allPeaks.filter((p) => Math.abs(p.x - centroid) < 0.3 * width);
  let centralSpike: Peak | null = null as Peak | null;
  const envPlain = smoothBoxes(y, Math.max(2, (comb ? 1.2 * comb.spacing : width / 40) / step));
  const plainMax = Math.max(...envPlain);
  const plainLobes = refinedPeaks(x, envPlain, 0.05 * plainMax).filter((p) => p.height > 0.3 * plainMax);
  // With P and R lobes on both sides, a Q branch lies between them, not on one of their maxima.
  const onOuterLobe = (p: Peak): boolean => {
    const below = plainLobes.filter((l) => l.x < p.x - 0.5 * local);
    const above = plainLobes.filter((l) => l.x > p.x + 0.5 * local);
    return plainLobes.length >= 2 && (below.length === 0 || above.length === 0);
  };
  const mostProminent = (list: Peak[]) => list.reduce<Peak | null>((best, p) => (!best || p.prominence > best.prominence ? p : best), null);
  // J-line ripple of partly resolved P and R branches rises only part of its height above its
  // neighbouring minima; a Q branch stands on the dip between P and R.
  const standsOut = (candidate: Peak): boolean => {
    const others = allPeaks.filter((p) => p !== candidate && Math.abs(p.x - candidate.x) < local).map((p) => p.prominence);
    const ref = others.length ? median(others) : 0;
    return candidate.prominence >= 2.5 * ref && candidate.prominence >= 0.5 * candidate.height && candidate.height >= 0.15 * yMax;
  };
  // A peak three times taller than any other maximum of the band (beyond its own neighbourhood) is a Q
  // branch even where it makes an envelope lobe of its own: no J line towers so over its branch (a
  // real parallel band, PH3 ν2 from test/fixtures/real, whose Q branch dwarfs its weak P branch so that
  // the envelope showed only the Q and R lobes, was read PR at medium).
  const towers = (p: Peak): boolean => allPeaks.every((q) => Math.abs(q.x - p.x) <= local || p.height >= 3 * q.height);
  const candidate = mostProminent(central.filter((p) => !onOuterLobe(p) || towers(p)));
  if (candidate && standsOut(candidate)) centralSpike = candidate;
  // The envelope's highest maximum at the band's centroid, standing out as a Q branch would, with
  // another maximum of the envelope beside it (for the PR second look below; not over a comb).
  const topLobe = plainLobes.reduce<Peak | null>((b, l) => (!b || l.height > b.height ? l : b), null);
  const centroidCandidate =
    !comb && !centralSpike && plainLobes.length >= 2 && topLobe && Math.abs(topLobe.x - centroid) < 0.1 * width
      ? mostProminent(central.filter((p) => Math.abs(p.x - topLobe.x) < 0.5 * local))
      : null;
  const centroidSpike = centroidCandidate && standsOut(centroidCandidate) ? centroidCandidate : null;

  // Envelope (with the Q branch cut out and bridged by a chord) for the P and R maxima.
  const bridged = Float64Array.from(y);
  if (centralSpike) {
    const base = centralSpike.height - centralSpike.prominence;
    let lo = centralSpike.index;
    while (lo > 0 && y[lo] > base + 0.1 * centralSpike.prominence) lo--;
    let hi = centralSpike.index;
    while (hi < n - 1 && y[hi] > base + 0.1 * centralSpike.prominence) hi++;
    for (let i = lo; i <= hi; i++) bridged[i] = y[lo] + ((y[hi] - y[lo]) * (x[i] - x[lo])) / Math.max(x[hi] - x[lo], 1e-12);
  }
  const envSigma = Math.max(2, (comb ? 1.2 * comb.spacing : width / 40) / step);
  const env = smoothBoxes(bridged, envSigma);
  const envMax = Math.max(...env);
  const lobes = refinedPeaks(x, env, 0.05 * envMax).filter((p) => p.height > 0.3 * envMax);
  const tallest = centralSpike;

  let profile: BandProfile;
  let confidence: 'high' | 'medium' | 'low' = 'high' as 'high' | 'medium' | 'low';
  let origin = centroid;
  let B: number | null = null;
  let bMethod: BandShapeClassification['bMethod'] = 'none';
  let qSpacing: number | undefined;
  // A Q-branch maximum near the centre and the comb's curvature (cm^-1 per index²), for B from the envelope.
  let qAnchor: number | undefined;
  // Set when resolved "J lines" disagree with the envelope's P–R maxima: the reading stays low.
  let combDoubt = false;
  // Half the uncertainty of the J-line spacing carried to the origin, cm^-1 (widens B's range).
  let jLineSpread = 0;
  // A PR reading from resolved lines with an empty gap of 4B at the centre.
  let emptyCentralGap = false;
  let qCurvature = 0;

  const centre0 = tallest ? tallest.x : centroid;
  const twoLobes = lobes.some((l) => l.x < centre0) && lobes.some((l) => l.x > centre0);
  // Heights of the comb members near the centre: a series of Q branches peaks there; resolved P and
  // R lines dip there (low J), with a Q branch standing out of the dip in a PQR band.
  let combDip = false;
  let combCentralPeak: Peak | null = null;
  if (comb) {
    const hMax = Math.max(...comb.members.map((p) => p.height));
    const near = comb.members.filter((p) => Math.abs(p.x - centroid) <= 2.5 * comb.spacing);
    const tallestNear = near.reduce<Peak | null>((b, p) => (!b || p.height > b.height ? p : b), null);
    const rest = near.filter((p) => p !== tallestNear);
    const restMean = rest.length ? rest.reduce((a, p) => a + p.height, 0) / rest.length : 0;
    if (tallestNear && rest.length >= 2 && tallestNear.height >= 2 * restMean && Math.abs(tallestNear.x - centroid) <= 1.5 * comb.spacing) {
      combCentralPeak = tallestNear;
    }
    const nearMean = near.length ? near.reduce((a, p) => a + p.height, 0) / near.length : 0;
    combDip = near.length === 0 || (combCentralPeak ? restMean : nearMean) < 0.5 * hMax;
  }
  if (comb && !centralSpike && combCentralPeak) centralSpike = combCentralPeak;
  // Is the comb the J lines of a band with one sub-band origin (spacing 2B)? Then B = spacing/2
  // agrees with the B that the spread of the whole band gives at T (measured on the seeded bands of
  // bench:contour classify: ratio 1.0–1.2 for linear and parallel bands with resolved lines, 1.75–3
  // for Q-branch series of prolate tops, below 0.75 for oblate ones, whose Q-branch spacing is under 2B).
  // With T assumed the ratio scales by T_assumed/T (150–350 K: ×0.85–2), so the window widens.
  const bSpreadAll = bandBFromBranchSpread(x, y, centroid, T);
  const jRatio = comb ? comb.spacing / 2 / bSpreadAll : NaN;
  const [jLow, jHigh] = temperatureAssumed ? [0.4, 3.5] : [0.6, 1.6];
  const combNotJLines = comb !== null && Number.isFinite(jRatio) && (jRatio > jHigh || jRatio < jLow);
  // The strongest central feature of a Q-series is itself one of its Q branches, on the comb and not
  // far above its neighbours; a parallel band's Q branch towers over the J lines.
  const spikeOnComb = (() => {
    if (!comb || !centralSpike) return true;
    const spike = centralSpike;
    const nearest = [...comb.members].sort((a, b) => Math.abs(a.x - spike.x) - Math.abs(b.x - spike.x));
    if (Math.abs(nearest[0].x - spike.x) > 0.25 * comb.spacing) return false;
    const neighbours = nearest.slice(1, 5).map((p) => p.prominence);
    return spike.prominence < 5 * median(neighbours);
  })();
  // A comb too coarse for J lines (B = spacing/2 above what the band's spread allows; a symmetric
  // top's K structure only widens the spread, so it never lowers that bound) is Q branches even when
  // the central ones tower over the rest (the K = 0 and 1 sub-bands of a prolate top's band).
  // A Q-dominated band (an oblate top's parallel band) has a small spread about its centre, so this
  // bound only holds while no central Q branch holds more than a tenth of the band.
  const spikeShare = centralSpike ? qBranchShare(x, y, centralSpike, area, comb?.spacing ?? width / 20) : 0;
  const combTooCoarse = comb !== null && jRatio > jHigh && spikeShare < 0.1;
  // A comb too fine for J lines (B = spacing/2 under jLow× what the band's spread gives; J-line combs
  // gave 1.0–1.2) with no dominant central member is a cluster of Q branches (an oblate top's
  // perpendicular band, Q spacing under 2B) even when less regular than the 85 % asked above.
  const combTooFine =
    comb !== null && jRatio < jLow && comb.regularity >= 0.75 && comb.members.length >= 8 && !combCentralPeak && spikeOnComb;
  const combIsQSeriesBySpacing =
    combNotJLines &&
    comb!.members.length >= 5 &&
    ((comb!.regularity >= 0.85 && (combTooCoarse || (!combCentralPeak && spikeOnComb))) || combTooFine);
  const combIsQSeries = (comb !== null && !twoLobes && !combDip && !combCentralPeak && !centralSpike) || combIsQSeriesBySpacing;
  if (comb && combIsQSeries) {
    profile = 'Q-series';
    // Every third Q branch stronger (nuclear-spin weights): the comb found among the strongest maxima
    // is then three times the true spacing, and the weaker Q branches sit at its thirds.
    const thirds = combThirds(x, y, comb.members, comb.spacing);
    const thirdsShown = (b: number, e: number) => b >= COMB_THIRDS_BUMP && b >= COMB_THIRDS_SIGNIFICANCE * e;
    const thirdsSeen = [0, 1].filter((t) => thirdsShown(thirds.bumps[t], thirds.errors[t])).length;
    const subdivided = thirds.gaps >= 3 && thirdsSeen === 2;
    const thirdsWords = `the trace folded over ${thirds.gaps} of the comb's gaps rises at a third and two thirds by ${thirds.bumps.map((b) => Math.round(100 * b)).join(' and ')} % of the strong maxima (± ${thirds.errors.map((e) => Math.round(100 * e)).join(' and ')} %) over the troughs beside them`;
    const fit = qSeriesFit(subdivided ? thirds.members : comb.members, centroid);
    qSpacing = fit.spacing;
    if (combTooFine && !(comb.regularity >= 0.85)) {
      // A less regular comb (J lines among the Q branches) pulls the quadratic's linear term: the
      // median gap is the spacing given (seeded band 7 of bench:contour classify: −4.9 % → −1.7 %).
      qSpacing = Math.sign(fit.spacing || 1) * comb.spacing;
    }
    qAnchor = comb.members.reduce((a, p) => (Math.abs(p.x - centroid) < Math.abs(a.x - centroid) ? p : a)).x;
    qCurvature = fit.curvature;
    origin = centroid;
    evidence.push(
      `${comb.members.length} sharp maxima on a regular comb (${Math.round(comb.regularity * 100)} % of gaps whole multiples of ${comb.spacing.toPrecision(4)} cm^-1) under one envelope, no dominant central peak: a series of Q branches`,
      `Q-branch spacing at the band centre ${fit.spacing.toPrecision(4)} cm^-1 from a quadratic in the branch index (curvature ${fit.curvature.toPrecision(3)} cm^-1 per index²)`,
      'the origin is the band centroid (which Q branch is K = 0 needs the model or the intensity pattern)',
      'B is not read from a Q-branch series (the spacing gives A′(1−ζ) − B′, not B)',
    );
    if (qSpacing !== fit.spacing)
      evidence.push(
        `the comb is less regular than 85 % (J lines among the Q branches pull the quadratic), so its median gap ${comb.spacing.toPrecision(4)} cm^-1 is given as the spacing`,
      );
    if (subdivided)
      evidence.push(
        `${thirdsWords}: weaker Q branches sit there, every third one stronger (nuclear-spin weights, as a C3v top's K = 3n sub-bands are twice as strong), so the spacing is a third of the strong comb's ${comb.spacing.toPrecision(4)} cm^-1`,
      );
    else if (thirds.gaps < 3) {
      // Too few samples per gap to fold: Q branches at the thirds could not be seen even if there.
      if (confidence === 'high') confidence = 'medium';
      evidence.push(
        `the comb's gaps are too short to look for weaker Q branches at their thirds: if every third Q branch is stronger (nuclear-spin weights, as in a C3v top) and the others are not resolved, the Q-branch spacing is a third of ${comb.spacing.toPrecision(4)} cm^-1`,
      );
    } else if (thirdsSeen === 1) {
      confidence = 'low';
      evidence.push(
        `but ${thirdsWords}: one third shows a weaker maximum, so every third Q branch may be stronger (nuclear-spin weights), and the spacing then a third of ${comb.spacing.toPrecision(4)} cm^-1`,
      );
    }
    if (combFromPeriod) evidence.push('the comb was found from the periodicity of the trace minus its envelope');
    if (combNotJLines)
      evidence.push(
        `read as J lines the comb would give B = ${(comb.spacing / 2).toPrecision(3)} cm^-1, ${jRatio.toFixed(2)}× the B the band's spread gives at ${T} K (resolved J lines of one band give 1.0–1.2): the maxima are not J lines`,
      );
    if (comb.regularity < 0.9 || comb.members.length < 8 || combFromPeriod || temperatureAssumed) confidence = 'medium';
    // A perpendicular band's Q branches run through the centre without holes and none towers over its
    // neighbours. A short comb with a hole of three or more spacings, or whose central member stands
    // 4× above the others' median, may be a parallel band's Q branch with a few J lines on the comb
    // (fresh seed 2001 of bench:contour classify: an oblate top's Q branch and four R lines at 2B read
    // as a Q series at medium): rated low.
    if (comb.members.length < 8) {
      const xs = comb.members.map((p) => p.x).sort((a, b) => a - b);
      let hole = 0;
      for (let i = 1; i < xs.length; i++) hole = Math.max(hole, (xs[i] - xs[i - 1]) / comb.spacing);
      const central = comb.members.reduce((a, p) => (Math.abs(p.x - centroid) < Math.abs(a.x - centroid) ? p : a));
      const others = median(comb.members.filter((p) => p !== central).map((p) => p.prominence));
      const towering = central.prominence >= 4 * others;
      if (hole >= 3 || towering) {
        confidence = 'low';
        evidence.push(
          `but the comb is short (${comb.members.length} maxima)${hole >= 3 ? ` with a hole of ${hole.toFixed(1)} spacings` : ''}${towering ? `${hole >= 3 ? ' and' : ''} its central maximum ${(central.prominence / others).toFixed(1)}× the others` : ''}: it may be one Q branch with a few J lines of a parallel band`,
        );
      }
    }
    // Resolved J lines of a parallel band also make a regular comb (spacing 2B). If two envelope
    // maxima sit where P and R maxima of B = spacing/2 would (2.358√(BT), within 25 %), say so.
    const below = plainLobes.filter((l) => l.x < centroid);
    const above = plainLobes.filter((l) => l.x > centroid);
    if (below.length && above.length) {
      const sep = Math.max(...above.map((l) => l.x)) - Math.min(...below.map((l) => l.x));
      const expected = bandPrSeparation(comb.spacing / 2, T);
      if (Math.abs(sep / expected - 1) < 0.25) {
        confidence = 'low';
        evidence.push(
          `but two envelope maxima ${sep.toPrecision(3)} cm^-1 apart fit P and R branches of lines ${comb.spacing.toPrecision(3)} cm^-1 apart (B ≈ ${(comb.spacing / 2).toPrecision(3)} cm^-1 at ${T} K): the comb may be resolved rotational lines of a parallel band`,
        );
      }
    } else if (temperatureAssumed) {
      evidence.push(`(T = ${T} K assumed only for this check)`);
    }
  } else if (comb) {
    // Resolved rotational lines, spacing ≈ 2B.
    B = comb.spacing / 2;
    bMethod = 'line-spacing';
    const gap = centralGap(allPeaks, comb.spacing, centroid, x, light);
    // The Q branch may sit in the central gap or bound it (a Q branch shaded to one side, with the
    // weak low-J lines beside it lost in the noise).
    // A "spike" with lines of at least 60 % of its height about one spacing away on both sides (within
    // ±30 %, as the spacing changes along a branch) is a J line standing a little above its
    // neighbours, not a Q branch: the lines next to a Q branch are P(1) and R(0), the weakest of the
    // band. (The tallest line's prominence reaches down to the P–R dip: a real Σ–Σ band, HC3N ν1 at
    // L = 4 cm through an apodized instrument, test/fixtures/real, had its tallest R line read as a Q
    // branch at medium.) The neighbours are looked for on the trace itself, since lines that close are
    // often too shallow for the peak test. Not when the comb is too coarse or fine for J lines of this
    // band, or holds a finer comb between its members: then it may be Q branches, each as tall as the next.
    const jLineSpike =
      centralSpike !== null &&
      !combNotJLines &&
      !finerCombBetween(comb, allPeaks, step) &&
      [-1, 1].every((side) => lineNear(x, light, centralSpike!.x + side * comb!.spacing, 0.3 * comb!.spacing, 0.6 * centralSpike!.height));
    if (jLineSpike)
      evidence.push(
        `the tallest maximum near the centre, at ${centralSpike!.x.toFixed(3)} cm^-1, has lines of similar height one spacing away on both sides: a J line, not a Q branch`,
      );
    if (centralSpike && !jLineSpike && (!gap || Math.abs(centralSpike.x - gap.mid) <= 0.5 * gap.width + 0.25 * comb.spacing)) {
      profile = 'PQR';
      origin = centralSpike.x;
      evidence.push(
        `resolved lines with spacing ${comb.spacing.toPrecision(4)} cm^-1 (B ≈ spacing/2) and a dominant central peak at ${centralSpike.x.toFixed(3)} cm^-1: P, Q and R branches`,
      );
    } else if (gap && allPeaks.some((q) => Math.abs(q.x - gap.mid) < 0.5 * gap.width - 0.3 * comb!.spacing)) {
      // Something stands in the central gap: a weak or spread Q branch (a symmetric top's parallel band).
      profile = 'PQR';
      origin = gap.centre;
      confidence = 'medium';
      evidence.push(
        `resolved lines with spacing ${comb.spacing.toPrecision(4)} cm^-1 (B ≈ spacing/2) and a weak feature in the central gap at ${gap.centre.toFixed(3)} cm^-1: a weak Q branch`,
      );
    } else {
      profile = 'PR';
      // Without a gap of 2–4 spacings, the weak low-J lines beside the origin fell below the peak test:
      // the widest empty stretch near the centroid (5–24 spacings) is centred on the origin (a real
      // Σ–Σ band, HC3N ν2 from test/fixtures/real, whose centroid lies 1.4 cm^-1 off its origin).
      const hole = gap ? null : widestHole(allPeaks, comb.spacing, centroid, Math.min(8 * comb.spacing, 0.1 * width));
      origin = gap ? gap.centre : hole ? hole.centre : centroid;
      if (hole)
        evidence.push(
          `origin at the centre of the ${hole.width.toPrecision(3)} cm^-1 stretch without lines at ${hole.centre.toFixed(3)} cm^-1, where the weak low-J lines are lost in the noise`,
        );
      emptyCentralGap = gap !== null;
      evidence.push(
        `resolved lines with spacing ${comb.spacing.toPrecision(4)} cm^-1 (B ≈ spacing/2) in two branches` +
          (gap
            ? ` split by a gap of ${gap.width.toPrecision(3)} cm^-1 (≈ ${2 * (2 + gap.missing)}B${gap.missing ? `: P(1)${gap.missing > 1 ? ' and R(0)' : ' or R(0)'} below the peak test` : ''}) with the origin at ${gap.centre.toFixed(3)} cm^-1, no Q branch`
            : ', no central Q branch'),
      );
      if (!gap) confidence = 'medium';
    }
    // The spacing of J lines changes along a branch (dν/dm = B′ + B″ + 2(B′ − B″)m, Herzberg II ch. IV),
    // and the comb's median gap comes from whichever wing holds more of its members: a real Σ–Σ band
    // (HC3N ν2, test/fixtures/real) gave its P wing 0.347 cm^-1 apart against 2B = 0.303 at the origin.
    // B comes from the spacing carried to the origin (median |B error| on bench:contour classify's four
    // seed sets 2.5, 2.0, 1.7, 2.0 % → 0.9, 0.5, 0.5, 0.7 % with the other rules of the same pass).
    // (A comb found from the trace's periodicity has its maxima picked on a finer trace: those count too.)
    const atOrigin = jLineSpacingAtOrigin(combFromPeriod ? comb.members : allPeaks, comb.spacing, origin);
    if (atOrigin) {
      B = atOrigin.spacing / 2;
      jLineSpread = atOrigin.uncertainty / 2;
      if (Math.abs(atOrigin.spacing / comb.spacing - 1) > 0.02)
        evidence.push(
          `the line spacing changes along the branches (${atOrigin.pairs} neighbouring pairs${atOrigin.bothSides ? ' on both sides of the origin' : ', all on one side of the origin'}); carried to the origin it is ${atOrigin.spacing.toPrecision(4)} cm^-1 (the comb's median gap ${comb.spacing.toPrecision(4)})`,
        );
    }
    if (combNotJLines && confidence !== 'low') {
      // B = spacing/2 far from what the band's spread gives at T (J-line combs gave 1.0–1.2): the comb
      // is not this band's J lines, whatever stands at the centre (targets seed 19 of bench:contour: an
      // oblate top's Q branches 0.75 cm^-1 apart, under 2B, read as J lines with B −64 % at medium).
      confidence = 'low';
      evidence.push(
        `but read as J lines the comb gives B ${jRatio.toFixed(2)}× what the band's spread gives at ${Math.round(T)} K (${jLow}–${jHigh} accepted): the maxima may be Q branches, not J lines`,
      );
    }
    if (!twoLobes && !combDip) {
      // One band's J lines make two lobes, or at least weak low-J lines beside the centre. A regular
      // comb with neither, read as J lines around a central peak, may be a series of Q branches whose
      // central member stands out (fresh seed 2056 of bench:contour classify: a heavy prolate top's Q
      // branches 0.33 cm^-1 apart read as J lines, B 3.6× too large at medium): rated low, so its B is only a rough value.
      if (profile === 'PQR' && confidence !== 'low') {
        confidence = 'low';
        evidence.push(
          "but the envelope shows no separate P and R maxima and the comb no dip in its heights beside the centre, as one band's J lines would: the comb may be a series of Q branches with one standing out",
        );
      } else confidence = confidence === 'high' ? 'medium' : 'low';
    }
    // J lines of spacing 2B put the P and R envelope maxima 2.358√(BT) apart (Herzberg II ch. IV;
    // a symmetric top's K structure only widens them): maxima much farther apart mean the comb is not
    // this band's J lines (e.g. Q branches of an oblate top's perpendicular band, spacing near B).
    if (twoLobes && profile !== 'PQR') {
      const [pLobe, rLobe] = outerLobes(lobes, centre0);
      const ratio = (rLobe.x - pLobe.x) / bandPrSeparation(comb.spacing / 2, T);
      if (ratio > 1.3 || ratio < 0.75) {
        confidence = 'low';
        combDoubt = true;
        evidence.push(
          `but the envelope's P and R maxima lie ${(rLobe.x - pLobe.x).toPrecision(3)} cm^-1 apart, ${ratio.toFixed(2)}× what lines ${comb.spacing.toPrecision(3)} cm^-1 apart give at ${Math.round(T)} K (0.75–1.3 expected): the comb may not be this band's J lines`,
        );
      }
    }
    // J lines of one band leave a gap of 4B (two spacings) between P(1) and R(0), or a Q branch there,
    // and its low-J lines next to the centre are weak ((2J+1)·exp(−BJ(J+1)hc/kT), Herzberg II ch. IV).
    // A comb that runs through the centre with no gap, no Q branch and no dip in its heights, whose
    // envelope maxima also disagree with its spacing, is not J lines: a perpendicular band's sub-band
    // Q branches run evenly through the origin (ΔK = +1 on one side, −1 on the other). Only one seeded
    // band of bench:contour classify (tuning seed 9) showed this, so the reading is rated low.
    // A central spike with lines as tall one spacing away on both sides (jLineSpike) is a member of the
    // comb, not a Q branch standing out: it does not count against the comb running evenly through the
    // centre (seeds 104, 117 and 1312 of bench:contour classify, prolate perpendicular bands whose Q
    // branches were read as J lines with P and R maxima 2.8× too far apart, then PQR).
    if (profile === 'PR' && combDoubt && !gap && !combDip && (!centralSpike || jLineSpike) && !combCentralPeak) {
      const fit = qSeriesFit(comb.members, centroid);
      profile = 'Q-series';
      // The median gap, not the quadratic's linear term: where the heights sag near the centre the J
      // lines among the Q branches pull the quadratic (tuning seed 9: −8.0 % against −2.7 %).
      qSpacing = Math.sign(fit.spacing || 1) * comb.spacing;
      qAnchor = comb.members.reduce((a, p) => (Math.abs(p.x - centroid) < Math.abs(a.x - centroid) ? p : a)).x;
      qCurvature = fit.curvature;
      origin = centroid;
      B = null;
      bMethod = 'none';
      evidence.push(
        `and the comb runs through the band centre with no gap of two spacings, no Q branch and no dip in its heights, which one band's J lines cannot do (P(1) and R(0) lie 4B apart, and the low-J lines are weak): read as a series of Q branches ${comb.spacing.toPrecision(4)} cm^-1 apart (the comb's median gap), rated low (a regular comb whose intensity pattern and envelope merely disagree with J lines is weaker evidence than a comb too fine or too coarse for them)`,
      );
    }
  } else if (twoLobes) {
    const [p, r] = outerLobes(lobes, centre0);
    const separation = r.x - p.x;
    const centre = centralSpike && centralSpike.x > p.x && centralSpike.x < r.x ? centralSpike.x : 0.5 * (p.x + r.x);
    B = bandBFromBranchSpread(x, bridged, centre, T);
    bMethod = 'pr-separation';
    const fromMaxima = bandBFromPrSeparation(separation, T);
    if (!(B / fromMaxima > 0.7 && B / fromMaxima < 1.4)) {
      evidence.push(
        `B from the branch spread (${B.toPrecision(3)} cm^-1) and from the maxima (${fromMaxima.toPrecision(3)} cm^-1) disagree, so none is given`,
      );
      B = null;
      bMethod = 'none';
      confidence = 'low';
    }
    if (centralSpike && centralSpike.x > p.x && centralSpike.x < r.x) {
      profile = 'PQR';
      origin = centralSpike.x;
      evidence.push(
        `two envelope maxima (P and R) ${separation.toPrecision(4)} cm^-1 apart with a sharp Q branch between them at ${centralSpike.x.toFixed(3)} cm^-1`,
      );
    } else {
      profile = 'PR';
      origin = 0.5 * (p.x + r.x);
      evidence.push(`two envelope maxima (P and R) ${separation.toPrecision(4)} cm^-1 apart with a minimum and no Q branch between them`);
    }
    if (B !== null)
      evidence.push(
        `B from the spread of the P and R branches about the centre (mean |ν − ν0| = 1.2533·√(2BkT/hc), the mean of the same distribution whose maxima give Δν = 2.358√(BT)) with ${tNote}; the maxima alone give ${bandBFromPrSeparation(separation, T).toPrecision(3)} cm^-1`,
      );
    if (temperatureAssumed && confidence === 'high') confidence = 'medium';
  } else if (centralSpike) {
    profile = 'PQR';
    origin = centralSpike.x;
    evidence.push(
      'one envelope with a dominant sharp Q branch and no separate P and R maxima: the P and R wings are too weak or too blurred to place',
    );
    confidence = 'low';
  } else {
    profile = 'PR';
    evidence.push('one broad envelope without a Q branch or a comb: the profile cannot be read reliably at this resolution and noise');
    confidence = 'low';
  }

  // Second look at a PR reading: the envelope's highest maximum with a lower maximum (a P or R lobe)
  // beyond a dip on each side is a Q branch between P and R, whatever the peak tests above said
  // (a weak P or R lobe beside a strong Q branch fails their height cuts).
  if (profile === 'PR') {
    const q = envelopeCentralMaximum(x, y, Math.max(2, Math.max(width / 60, comb ? 1.2 * comb.spacing : 0) / step), area);
    if (q) {
      profile = 'PQR';
      origin = q.x;
      confidence = 'medium';
      evidence.push(
        `but the band's envelope has its highest maximum at ${q.x.toFixed(3)} cm^-1 with a lower maximum beyond a dip on each side (P at ${q.left.toFixed(2)}, R at ${q.right.toFixed(2)} cm^-1): a Q branch between P and R, so PQR`,
      );
    }
  }
  // Second look at a PQR reading: a central feature made of several maxima on a regular comb with
  // no curvature to speak of is a cluster of Q branches (a perpendicular band whose Q-branch spacing
  // 2[C′(1−ζ) − B′] is small, as an oblate top's often is), not one Q branch: a parallel band's
  // Q-branch structure (ΔB·J(J+1), Δ(A−B)·K²) grows quadratically from the origin.
  // A PR reading from a minimum between two maxima or a central gap in a comb cannot tell a true
  // Σ–Σ band from a weak or instrument-smeared Q branch (a symmetric top's parallel band, or unresolved
  // Q branches of a perpendicular one) filling the centre. Compare the envelope against a blurred
  // two-lobe template with and without a central Q component. On the seeded bands of bench:contour
  // classify (seeds 0–79 and 1000–4079, 400 bands; 104 reached this test) true Σ–Σ bands gave a Q
  // share ≤ 0.027 but one (0.053), symmetric-top bands with a Q branch 0.033–0.32. Q share ≥ 0.04
  // with improvement ≥ 0.09 was a PQR band 12 times in 13 (11 of them read PR before): read PQR, rated
  // low. Resolved lines with an empty central gap of ≈ 4B and a Q share under 0.15 were Σ–Σ bands 3
  // times in 4 (the template sees a Q component where the blurred lines fill the gap): read PR, rated low.
  let templateQShare = NaN;
  // The two-lobe template's saturation κ and the B its unsaturated lobes give (PR readings).
  let templateSaturation = 0;
  let templateLobeB = NaN;
  // Set when the only doubt is whether a weak Q branch is there (PR or PQR), which leaves B alone.
  let lowOnlyForWeakQ = false;
  if (profile === 'PR') {
    const sGuess = twoLobes ? 0.5 * (outerLobes(lobes, centre0)[1].x - outerLobes(lobes, centre0)[0].x) : width / 4.3;
    const t = bandCentreTemplate(x, env, origin, sGuess);
    templateSaturation = t.prSaturation;
    // Lobes |u|·e^{−u²/2s²} are the Σ–Σ distribution |x|·e^{−x²hc/(4BkT)} (x ≈ 2Bm): s² = 2BkT/hc.
    templateLobeB = bandBFromPrSeparation(2 * t.prLobeS, T);
    const share = `a central Q component takes up ${Math.round(100 * t.improvement)} % of a blurred two-lobe P/R template's misfit and holds ${Math.round(100 * t.qShare)} % of the band`;
    const isClearQ = t.improvement >= 0.3 && t.qShare >= 0.03;
    const isLikelyQ = !emptyCentralGap && t.improvement >= 0.09 && t.qShare >= 0.04;
    if (isClearQ && emptyCentralGap && t.qShare < 0.15) {
      if (confidence !== 'low') lowOnlyForWeakQ = true;
      confidence = 'low';
      evidence.push(
        `${share}, but the resolved lines leave the central gap empty, as a band without a Q branch does (on the seeded bands such readings were Σ–Σ bands 3 times in 4): PR, but PQR is not ruled out`,
      );
    } else if (isClearQ || isLikelyQ) {
      profile = 'PQR';
      origin = t.origin;
      templateQShare = t.qShare;
      const lowBefore = confidence === 'low';
      confidence = isClearQ && t.improvement >= 0.5 && t.qShare >= 0.1 && !emptyCentralGap ? 'medium' : 'low';
      evidence.push(
        isClearQ
          ? `but ${share}: the centre is filled by a weak or smeared Q branch, so PQR`
          : `${share}: short of a clear Q branch, but well above what Σ–Σ bands leave (a Q share ≤ 0.03 on all but one of the seeded ones; bands with this much were PQR 12 times in 13), so PQR, rated low`,
      );
      // Resolved lines with an empty gap of 4B at the centre are what a Σ–Σ band shows; the blurred
      // template only disagrees (fresh seed 3018 of bench:contour classify: a linear molecule's band,
      // B 1.96 cm^-1, read PQR at medium). Rated low; B from the lines holds either way.
      if (emptyCentralGap) {
        if (!lowBefore) lowOnlyForWeakQ = true;
        evidence.push('but the resolved lines leave the central gap empty, as a band without a Q branch does: PR or PQR is undecided');
      }
    } else if (t.improvement >= 0.1 && t.qShare >= 0.02) {
      // Between what true Σ–Σ bands gave and the PQR thresholds: undecided, read PR.
      // B does not depend on it (J lines or the P/R wings are the same either way), so it is kept.
      if (confidence !== 'low') lowOnlyForWeakQ = true;
      confidence = 'low';
      evidence.push(`${share}: short of a clear Q branch, but more than most Σ–Σ bands leave, so PR or PQR is undecided`);
    } else {
      evidence.push(
        `a blurred two-lobe P/R template leaves no room for a central Q branch (a Q component takes up ${Math.round(100 * t.improvement)} % of its misfit, ${Math.round(100 * t.qShare)} % of the band)`,
      );
    }
  }
  // A Q branch at the centre narrows the band's spread, so J lines with a Q branch give B = spacing/2
  // at least what the spread gives (jRatio 0.85–2.7 on the PQR readings from resolved lines of seeds
  // 0–79, 1000–4079 and 8000–8079 of bench:contour classify). Under 0.8 the band is wider than J lines
  // of that spacing make: the comb may be Q branches (seed 8044: an oblate top's perpendicular band, its
  // Q branches 0.94 cm^-1 apart read as J lines with B −60 % at medium, jRatio 0.68). Rated low.
  if (profile === 'PQR' && bMethod === 'line-spacing' && confidence !== 'low' && jRatio < 0.8) {
    confidence = 'low';
    lowOnlyForWeakQ = false;
    evidence.push(
      `but read as J lines the comb gives B only ${jRatio.toFixed(2)}× what the band's spread gives at ${Math.round(T)} K, though a Q branch at the centre narrows that spread (J lines with a Q branch gave 0.85 or more): the maxima may be Q branches, not J lines`,
    );
  }
  // The same for a PR reading from resolved lines: on the 800 seeded bands of bench:contour classify
  // (seeds 0–399, 1000–1399) every right one gave jRatio 0.95 or more, the two below (0.80, 0.94) were
  // perpendicular bands' Q branches (B −48 %). A published band, PH3 ν2 recorded with lines 30 times
  // optically thick at L = 0.9 cm (test/fixtures/real), gave 0.62: a comb of K-split lines at 0.65× the
  // spacing, B −31 % called determined. Saturation widens the spread and so lowers jRatio for right
  // readings (the Σ–Σ bands of HC3N at τ = 30), so this holds only where the template saw none.
  if (
    profile === 'PR' &&
    bMethod === 'line-spacing' &&
    confidence !== 'low' &&
    jRatio < PR_J_RATIO_LOW &&
    templateSaturation < SATURATION_SEEN
  ) {
    confidence = 'low';
    lowOnlyForWeakQ = false;
    evidence.push(
      `but read as J lines the comb gives B only ${jRatio.toFixed(2)}× what the band's spread gives at ${Math.round(T)} K (J lines of a band without a Q branch gave 0.95 or more): the maxima may not be this band's J lines`,
    );
  }
  // Second look at a PR reading without resolved lines: the envelope's highest maximum at the band's
  // centroid is no P or R maximum, whatever the lobe list says. A Σ–Σ band's maxima lie ≈ 0.23 of its
  // 5–95 % width from its centre (I ∝ |x| exp(−x²/a), a = 4BkT/hc: mode 0.71√a, 5–95 % width 3.03√a;
  // Herzberg II ch. IV) and its centre is the dip between them. An unresolved perpendicular band's
  // merged Q branches make such a central maximum, one of its P and R maxima often only a shoulder on
  // the hump's wing that the lobe list misses, so the hump and the other lobe were taken for P and R
  // (tuning seeds 22 and 61 of bench:contour classify). Rated low: one of the P and R maxima is unseen.
  if (profile === 'PR' && centroidSpike) {
    profile = 'PQR';
    origin = centroidSpike.x;
    centralSpike = centroidSpike;
    confidence = 'low';
    lowOnlyForWeakQ = false;
    evidence.push(
      `but the envelope's highest maximum, at ${centroidSpike.x.toFixed(3)} cm^-1, sits at the band's centroid (${centroid.toFixed(3)} cm^-1), where a P and R band has the dip between its maxima: a central Q branch (perhaps the merged Q branches of an unresolved perpendicular band) with one of P and R only a shoulder, so PQR, rated low`,
    );
  }
  // Second look at a PQR reading on a regular comb of strong maxima: when the weaker maxima between
  // them make a finer comb of their own, the fine one is the J lines (spacing ≈ 2B) and the strong
  // one a series of Q branches (a light top's perpendicular band with resolved lines).
  if (profile === 'PQR' && comb && comb.members.length >= 5 && comb.regularity >= 0.85 && !combFromPeriod) {
    const strong = comb.members;
    const fine = finerCombBetween(comb, allPeaks, step);
    if (fine) {
      const fit = qSeriesFit(strong, centroid);
      profile = 'Q-series';
      qSpacing = fit.spacing;
      origin = centroid;
      B = fine.spacing / 2;
      bMethod = 'line-spacing';
      confidence = 'medium';
      evidence.push(
        `but between the ${strong.length} strong maxima (${comb.spacing.toPrecision(4)} cm^-1 apart) the weaker ones make a finer comb ${fine.spacing.toPrecision(4)} cm^-1 apart: the fine comb is J lines (B ≈ ${B.toPrecision(3)} cm^-1) and the strong maxima a series of Q branches ${fit.spacing.toPrecision(4)} cm^-1 apart`,
      );
    }
  }
  const qPeak =
    centralSpike ??
    allPeaks.filter((p) => Math.abs(p.x - origin) < width / 10).reduce<Peak | null>((b, p) => (!b || p.height > b.height ? p : b), null);
  if (profile === 'PQR' && qPeak) {
    const cluster = centralQCluster(x, light, qPeak, sigma, step);
    // Q branches too shallow to stand out as maxima of the trace may still ripple the central feature.
    const ripple = cluster ? null : centralQRipple(x, light, qPeak, step, 2 * jLow * bSpreadAll);
    // The central feature read as a cluster of Q branches: the comb's spacing and curvature, anchored on it.
    const asCentralQSeries = (comb: { spacing: number; curvature: number }) => {
      profile = 'Q-series';
      qSpacing = comb.spacing;
      qAnchor = qPeak.x;
      qCurvature = comb.curvature;
      origin = qPeak.x;
      B = null;
      bMethod = 'none';
    };
    if (ripple) {
      asCentralQSeries(ripple);
      confidence = ripple.members >= 7 && ripple.strength >= 0.5 ? 'medium' : 'low';
      evidence.push(
        `but the central feature, less its own smooth outline, ripples with a period of ${ripple.spacing.toPrecision(4)} cm^-1 (${ripple.members} maxima on a regular comb, autocorrelation ${ripple.strength.toFixed(2)}), finer than J lines of this band can be (2B would be at least ${(2 * jLow * bSpreadAll).toPrecision(3)} cm^-1 from the band's spread at ${Math.round(T)} K): a cluster of Q branches with a small spacing, so a series of Q branches` +
          (confidence === 'low' ? ' (rated low: the ripple has few maxima or is weak)' : ''),
      );
    }
    if (cluster) {
      asCentralQSeries(cluster);
      confidence = cluster.members >= 7 ? 'medium' : 'low';
      evidence.push(
        `but the central feature holds ${cluster.members} maxima on a regular comb ${cluster.spacing.toPrecision(4)} cm^-1 apart (curvature ${cluster.curvature.toPrecision(2)} cm^-1 per index²): a cluster of Q branches with a small spacing, so a series of Q branches`,
      );
    }
  }
  if (combDoubt) confidence = 'low';
  let type: BandShapeType;
  let alternativeType: BandShapeType | undefined;
  let implication: string;
  // The Π–Σ envelope fit with the Q branch held at a spike (its core left out), made once: the
  // Π–Σ-or-parallel second opinion reads its rms, the Π–Σ B its B and two-sigma range.
  let piEnvelopeMemo: { spike: Peak; fit: ReturnType<typeof bandEnvelopeFit>['byType'][number] | undefined } | null = null;
  const piEnvelope = (spike: Peak) => {
    if (piEnvelopeMemo?.spike !== spike) {
      const fit = bandEnvelopeFit({
        x,
        y,
        temperatureK: T,
        types: ['linear-perpendicular'],
        noiseSigma: sigma,
        qBranchCm1: spike.x,
        maskHalfWidthCm1: qBranchCore(x, y, spike, step),
        rangeRule: 'two-sigma',
      }).byType[0];
      piEnvelopeMemo = { spike, fit };
    }
    return piEnvelopeMemo.fit;
  };
  if (profile === 'PR') {
    type = 'linear-parallel';
    // PR implies a linear molecule; a symmetric top's weak, spread Q branch can hide in noise.
    if (confidence === 'high') {
      confidence = 'medium';
      evidence.push('a weak Q branch (parallel band of a symmetric top) could hide in the noise, so PR is not certain');
    }
    alternativeType = 'symmetric-top-parallel';
    implication =
      'P and R without Q: a Σ–Σ (parallel) band of a linear molecule; a symmetric top would show a Q branch in a parallel band.';
  } else if (profile === 'Q-series') {
    type = 'symmetric-top-perpendicular';
    if (confidence === 'low') alternativeType = 'symmetric-top-parallel';
    implication = 'A series of Q branches: a perpendicular (ΔK = ±1) band of a symmetric top; their spacing is ≈ 2[A′(1−ζ) − B′].';
  } else {
    const qShare = centralSpike ? qBranchShare(x, y, centralSpike, area, comb?.spacing ?? width / 20) : templateQShare;
    const share = Number.isFinite(qShare) ? `${Math.round(qShare * 100)} %` : 'unknown';
    if (qShare >= 0.4) {
      type = 'linear-perpendicular';
      alternativeType = 'symmetric-top-parallel';
    } else {
      type = 'symmetric-top-parallel';
      alternativeType = 'linear-perpendicular';
    }
    if (!(qShare > 0.5 || qShare < 0.3)) confidence = 'low';
    evidence.push(
      `the Q branch holds ${share} of the band's area (a Π–Σ band of a linear molecule puts ≈ 1/2 there, a parallel band of a prolate top much less)`,
    );
    // Second opinion from the envelopes outside the Q branch: a Π–Σ band's P and R wings (its Q lines
    // at ν0 − B, Hönl–London (J−1)/2, (J+2)/2) against a symmetric top's parallel band held at the Q
    // branch. On the seeded bands of bench:contour classify (tuning seeds 0–79) the Π–Σ envelope left
    // 0.80–0.93 of the parallel one's rms on 4 of 7 Π–Σ bands (0.99–1.06 on the rest) and ≥ 1.00 on
    // every parallel band: below 0.9 the band is read as Π–Σ.
    if (centralSpike && qShare >= 0.2 && !(confidence === 'medium' && type === 'linear-perpendicular')) {
      const core = qBranchCore(x, y, centralSpike, step);
      const pi = piEnvelope(centralSpike);
      const par = bandEnvelopeFit({
        x,
        y,
        temperatureK: T,
        types: ['symmetric-top-parallel'],
        noiseSigma: sigma,
        originCm1: centralSpike.x,
        maskHalfWidthCm1: core,
      }).byType[0];
      if (pi && par && pi.rms < PI_SIGMA_ENVELOPE_RMS_RATIO * par.rms) {
        type = 'linear-perpendicular';
        alternativeType = 'symmetric-top-parallel';
        if (confidence === 'low') confidence = 'medium';
        evidence.push(
          `but outside the Q branch a Π–Σ band's envelope fits with ${(pi.rms / par.rms).toFixed(2)}× the residual of a symmetric top's parallel band (below ${PI_SIGMA_ENVELOPE_RMS_RATIO} on the seeded Π–Σ bands only): read as Π–Σ`,
        );
      } else if (pi && par) {
        evidence.push(
          `outside the Q branch a Π–Σ band's envelope leaves ${(pi.rms / par.rms).toFixed(2)}× the residual of a symmetric top's parallel band`,
        );
      }
    }
    implication =
      'P, Q and R with one Q branch: a parallel band of a symmetric top or a Π–Σ (perpendicular) band of a linear molecule; ' +
      `the Q-branch share points to ${type === 'linear-perpendicular' ? 'the linear Π–Σ case' : 'the symmetric top'}` +
      (confidence === 'low' ? ', but not decisively' : '') +
      '.';
  }
  if (bMethod === 'pr-separation' && type !== 'linear-parallel' && type !== 'linear-perpendicular') {
    // Measured (bench:contour classify): from the spread of unresolved parallel bands of symmetric
    // tops B came out 3–85 % too large, and with a strong Q branch at the centre far too small, so
    // it is not offered as B.
    evidence.push(
      `B is withheld: the linear molecule's branch relation would give ${B!.toPrecision(3)} cm^-1, but a symmetric top's K structure widens the branches and its Q branch narrows their spread, so that is not B to 10 %`,
    );
    B = null;
    bMethod = 'none';
    if (confidence === 'high') confidence = 'medium';
  }
  // B from the band's whole envelope (bandEnvelopeFit) where no resolved lines gave it. Σ–Σ bands:
  // the whole envelope, within 3 % on the seeded bands of bench:contour classify read right.
  // Parallel bands of symmetric tops: held at the Q branch, the central 24 % of the band (the Q
  // branch, whose shape rests on ΔB and A, C that the profile does not give) left out, five values of
  // A/B or C/B competing; on the tuning seeds within 10 % on 19 of 23, the truth inside the range on
  // 23 of 23. Π–Σ bands and Q-branch series have their own fits below (the Σ–Σ route's free origin
  // pulled a Π–Σ band's B off by 10–99 %; one ζ per variant left a Q-series' B open by tens of per cent).
  let envelopeRange: [number, number] | null = null;
  let envelopeHeld = false;
  const envelopeType = type === 'linear-parallel' || (type === 'symmetric-top-parallel' && profile === 'PQR');
  if (envelopeType && bMethod !== 'line-spacing') {
    const held = type === 'symmetric-top-parallel';
    const fit = bandEnvelopeFit({
      x,
      y,
      temperatureK: T,
      types: [type],
      noiseSigma: sigma,
      deltaBRels: ENVELOPE_DELTA_B_RELS,
      ...(held ? { originCm1: origin, maskHalfWidthCm1: 0.12 * width } : {}),
    }).byType[0];
    if (fit) {
      if (B !== null) evidence.push(`the branch spread gave B = ${B.toPrecision(3)} cm^-1`);
      B = fit.B;
      bMethod = 'envelope-fit';
      envelopeRange = [fit.bLow, fit.bHigh];
      envelopeHeld = held;
      evidence.push(
        `B = ${fit.B.toPrecision(4)} cm^-1 from fitting the band's envelope${held ? ' outside the Q branch' : ''} (best: ${fit.variant}; ${tNote}); B from ${fit.bLow.toPrecision(3)} to ${fit.bHigh.toPrecision(3)} cm^-1 fits about as well` +
          (held ? '; if the band is an unresolved perpendicular one instead, this is not its B' : ''),
      );
    }
  }
  // Π–Σ bands of linear molecules: the whole envelope with the Q branch in the model (its lines at
  // ν0 − B), the origin held so that the Q branch sits on the trace's, the Q branch's own core (where
  // ΔB shades it, which the rigid model leaves out) left out of the comparison. On generated Π–Σ
  // bands (test/analysis/bandEnvelopeFit.test.ts, B 0.03–2.5 cm^-1, T 120–296 K, L 1–3 cm) within
  // 10 %; on the seeded bands of bench:contour classify most Π–Σ readings are rated low (Q share
  // between 30 and 50 %), so B is a rough value there (below).
  // Perpendicular bands of symmetric tops with a resolved Q-branch comb (option qSeriesEnvelope): B and
  // A − B (C − B) fitted together to the whole envelope with the comb's spacing, phase and curvature
  // held (bandEnvelopeQSeriesFit). Within 5 % on rigid generated bands; on the seeded bands (B′ =
  // 0.997 B″, A′ = 0.996 A″, which the rigid model lacks) the fit often leaves several times the
  // noise and its B is then off by tens of per cent, so B is given only when the fit leaves at most
  // 1.5× the noise and its range spans at most a factor 1.5 (bench:contour classify --q-envelope:
  // 2 of 25 tuning and 1 of 9 held-out Q-series, each with the truth inside the range).
  let newRange: { low: number; high: number; open: boolean } | null = null;
  // B ± 2σ of a Q-series' contour fit, and whether the fit calls it determined.
  let contourRange: { low: number; high: number; determined: boolean } | null = null;
  if (type === 'linear-perpendicular' && profile === 'PQR' && centralSpike && bMethod !== 'line-spacing') {
    const spike = centralSpike;
    const core = qBranchCore(x, y, spike, step);
    const fit = piEnvelope(spike);
    if (fit) {
      if (B !== null) evidence.push(`the branch spread gave B = ${B.toPrecision(3)} cm^-1`);
      B = fit.B;
      bMethod = 'envelope-fit';
      origin = fit.origin;
      newRange = { low: fit.bLow, high: fit.bHigh, open: fit.bRangeOpen };
      evidence.push(
        `B = ${fit.B.toPrecision(4)} cm^-1 from fitting the Π–Σ band's envelope with its Q branch at ${spike.x.toFixed(3)} cm^-1 (the origin ν0 = Q + B, ${tNote}; the Q branch's core, ±${core.toPrecision(2)} cm^-1, left out); B from ${fit.bLow.toPrecision(3)} to ${fit.bHigh.toPrecision(3)} cm^-1 fits about as well${fit.bRangeOpen ? ' (and perhaps beyond: the range reaches the end of the values tried)' : ''}`,
      );
    }
  }
  let qSeriesEnvelope: BandShapeClassification['qSeriesEnvelope'];
  let qSeriesContour: BandShapeClassification['qSeriesContour'];
  if (
    (options.qSeriesEnvelope || options.opdCm !== undefined) &&
    profile === 'Q-series' &&
    bMethod === 'none' &&
    qSpacing !== undefined &&
    qAnchor !== undefined &&
    confidence !== 'low'
  ) {
    const fit = bandEnvelopeQSeriesFit({
      x,
      y,
      temperatureK: T,
      qSpacingCm1: qSpacing,
      combAnchorCm1: qAnchor,
      combCurvatureCm1: qCurvature,
      noiseSigma: sigma,
      spinWeights: options.spinWeights,
    });
    if (fit) {
      const wide = fit.bHigh / fit.bLow > Q_SERIES_B_RATIO_GIVEN;
      const poor = fit.rmsOverNoise > Q_SERIES_RMS_OVER_NOISE_GIVEN;
      qSeriesEnvelope = {
        shape: fit.shape,
        shapesFitting: fit.shapesFitting,
        uniqueMinusB: fit.uniqueMinusB,
        uniqueMinusBLow: fit.uniqueMinusBLow,
        uniqueMinusBHigh: fit.uniqueMinusBHigh,
        zeta: fit.zeta,
        B: fit.B,
        bLow: fit.bLow,
        bHigh: fit.bHigh,
        rmsOverNoise: fit.rmsOverNoise,
        origin: fit.origin,
      };
      const u = fit.shape === 'prolate' ? 'A' : 'C';
      const contour =
        options.opdCm !== undefined
          ? qSeriesContourB({
              x,
              y: raw,
              temperatureK: T,
              opdCm: options.opdCm,
              apodization: options.apodization ?? 'boxcar',
              noiseSigma: sigma,
              start: fit,
              spinWeights: options.spinWeights,
              onProgress: options.onProgress,
            })
          : null;
      if (contour) {
        qSeriesContour = {
          B: contour.B,
          bSigma: contour.bSigma,
          bLow: contour.bLow,
          bHigh: contour.bHigh,
          otherMinimaB: contour.otherMinimaB,
          determined: contour.determined,
          fitsBand: contour.fitsBand,
          whyNot: contour.whyNot,
          rmsOverNoise: contour.rmsOverNoise,
          residualLag1: contour.residualLag1,
          uniqueZetaMinusB: contour.uniqueZetaMinusB,
          uniqueZetaMinusBSigma: contour.uniqueZetaMinusBSigma,
          unique: contour.unique,
          shape: contour.shape,
          status: contour.status,
        };
      }
      const words = `the envelope of the whole band with the comb held (${Math.abs(qSpacing).toPrecision(4)} cm^-1 apart, curvature ${qCurvature.toPrecision(2)} cm^-1 per index²), B and ${u} − B fitted together (${tNote}): best B = ${fit.B.toPrecision(3)} cm^-1, ${fit.shape} with ${u} − B = ${fit.uniqueMinusB.toPrecision(3)} cm^-1 and ζ = ${fit.zeta.toFixed(2)}; B from ${fit.bLow.toPrecision(3)} to ${fit.bHigh.toPrecision(3)} cm^-1${fit.bRangeOpen ? ' or beyond' : ''} and ${fit.shapesFitting.join(' or ')} shapes fit about as well`;
      if (contour && contour.determined) {
        B = contour.B;
        bMethod = 'envelope-fit';
        contourRange = { low: contour.bLow, high: contour.bHigh, determined: true };
        evidence.push(
          `${words}; then a contour fit of the band through the instrument (L = ${options.opdCm} cm, ${options.apodization ?? 'boxcar'}; B′, B″, ${u}′, ${u}″, ζ and the origin floated from there, weak-absorption limit): B = ${contour.B.toPrecision(4)} ± ${contour.bSigma.toPrecision(2)} cm^-1, residual ${contour.rmsOverNoise.toFixed(2)}× the noise${contour.otherMinimaB.length ? `; other minima about as deep at B = ${contour.otherMinimaB.map((v) => v.toPrecision(4)).join(', ')} cm^-1, so B is given as the range that spans them` : ''}`,
        );
      } else if (contour && contour.fitsBand) {
        // Converged to the noise but B ± 2σ wider than ±10 %: given with that range, not determined.
        B = contour.B;
        bMethod = 'envelope-fit';
        contourRange = { low: contour.bLow, high: contour.bHigh, determined: false };
        evidence.push(
          `${words}; then a contour fit of the band through the instrument (L = ${options.opdCm} cm): B = ${contour.B.toPrecision(4)} ± ${contour.bSigma.toPrecision(2)} cm^-1, but B is not determined: ${contour.whyNot}`,
        );
      } else if (options.opdCm !== undefined && !contour) {
        evidence.push(`${words}; the contour fit through the instrument failed, so B is not given from it`);
      } else if (contour) {
        evidence.push(`${words}; the contour fit through the instrument gives no B: ${contour.whyNot}`);
      } else if (poor) {
        evidence.push(
          `${words}; but the best envelope leaves a residual ${fit.rmsOverNoise.toFixed(1)}× what the noise alone would (the rigid model does not describe this band well enough), so B is not given`,
        );
      } else if (wide) {
        evidence.push(`${words}; that range is wider than a factor ${Q_SERIES_B_RATIO_GIVEN}, so B is not given`);
      } else {
        B = fit.B;
        bMethod = 'envelope-fit';
        newRange = { low: fit.bLow, high: fit.bHigh, open: fit.bRangeOpen };
        evidence.push(words);
      }
    }
  }
  // Lines optically thick at their own width flatten and widen the P and R maxima and spread the
  // band (the instrument acts on the transmittance): the branch spread and a Σ–Σ envelope then give
  // B too large (HC3N ν1–ν4 through an instrument, test/fit/realBandTraces.ts: +14 % at τ = 3, +60 %
  // at τ = 30 for the strongest line). The two-lobe template fitted with saturation κ (bandCentreTemplate)
  // gives B from its unsaturated lobes instead: within 4 % at τ ≤ 3 (κ ≤ 1.7), 11–19 % high at τ = 30
  // (κ ≈ 5), so its range widens with κ.
  if (
    profile === 'PR' &&
    bMethod !== 'line-spacing' &&
    B !== null &&
    templateSaturation >= SATURATION_SEEN &&
    Number.isFinite(templateLobeB)
  ) {
    const rel = 0.1 + 0.02 * templateSaturation;
    evidence.push(
      `the P and R maxima are flattened as lines optically thick at their own width make them (saturation κ = ${templateSaturation.toFixed(1)} in the two-lobe template): B = ${templateLobeB.toPrecision(4)} cm^-1 from the template's unsaturated lobes instead of ${B.toPrecision(4)} cm^-1, good to about ±${Math.round(100 * rel)} %`,
    );
    B = templateLobeB;
    bMethod = 'envelope-fit';
    envelopeRange = [B * (1 - rel), B * (1 + rel)];
  }
  // The range B is good to: from resolved J lines within 5 % on the seeded bands (±8 % given), from
  // a linear molecule's P–R spread within 6 % (±10 %), a Π–Σ band's within ~10 % (±15 %); from the
  // finer comb under a Q-branch series one check gave +15 % (sub-band combs interleave), ±25 % given.
  let bLow: number | undefined;
  let bHigh: number | undefined;
  let bDetermined: boolean | undefined;
  // A B read off a profile rated low is given only as a rough value, never determined, with a range
  // wide enough for the other readings (measured on seeds 0–399 and 1000–1399 of bench:contour
  // classify; before, every such B was withheld). From a Q-branch series (a finer comb under it) it is
  // still withheld: within 10 % on 2 of 14. From resolved J lines: 36 of 37 within 10 %, but where the
  // comb was Q branches B is off by 2–3× (LOW_COMB_B_RANGE). From an envelope fitted as the type read
  // (held symmetric-top parallel, Σ–Σ or Π–Σ): 112 of 251 within 10 % (the type may be another: an
  // oblate top's parallel band read as Π–Σ gives about 2× its B, an unresolved perpendicular band read
  // as parallel 1.3–7×; LOW_ENVELOPE_B_RANGE).
  // The range of such a rough value, in multiples of B (null: B is not a rough value).
  let roughRange: readonly [number, number] | null = null;
  if (B !== null && confidence === 'low' && !lowOnlyForWeakQ) {
    if (profile === 'Q-series') {
      evidence.push(`B is withheld: ${B.toPrecision(3)} cm^-1 would rest on a Q-branch series read with low confidence`);
      B = null;
      bMethod = 'none';
    } else if (bMethod === 'line-spacing') {
      roughRange = LOW_COMB_B_RANGE;
      evidence.push(
        `B = ${B.toPrecision(4)} cm^-1 holds if the comb is this band's J lines, which the profile rated low puts in doubt (were they Q branches, B could lie anywhere from ${LOW_COMB_B_RANGE[0]} to ${LOW_COMB_B_RANGE[1]}× that), so B is given as a rough value with that range and is not determined`,
      );
    } else {
      roughRange = LOW_ENVELOPE_B_RANGE;
      evidence.push(
        `B = ${B.toPrecision(3)} cm^-1 rests on the envelope of a profile read with low confidence: if the band is of another type its B may lie anywhere from ${LOW_ENVELOPE_B_RANGE[0]} to ${LOW_ENVELOPE_B_RANGE[1]}× that, so B is given as a rough value with that range and is not determined`,
      );
    }
  }
  if (B !== null) {
    const rel =
      bMethod === 'line-spacing'
        ? profile === 'Q-series'
          ? 0.25
          : 0.08
        : bMethod === 'envelope-fit'
          ? 0.1
          : type === 'linear-parallel'
            ? 0.1
            : 0.15;
    bLow = Math.min(B * (1 - rel), envelopeRange?.[0] ?? Infinity, B - jLineSpread, B * (roughRange?.[0] ?? 1));
    bHigh = Math.max(B * (1 + rel), envelopeRange?.[1] ?? 0, B + jLineSpread, B * (roughRange?.[1] ?? 1));
    // A symmetric top's PQR envelope may as well be an unresolved perpendicular band, whose P/R
    // wings give another B (bench:contour classify: −35 % with a narrow range on tuning seed 59), so
    // B from it is never called determined.
    // The same holds for a PR envelope read without resolved lines: an oblate top's unresolved
    // perpendicular band, whose Q branches spread over the whole band instead of piling at its centre,
    // shows P and R maxima with no central Q branch, and its envelope fitted as a Σ–Σ band's gives
    // another B (bench:contour classify: −49 % with a ±12 % range on held-out seed 1017). So B from a PR
    // envelope is given with its range but not called determined.
    const envelopePr = bMethod === 'envelope-fit' && profile === 'PR';
    // A B kept although the profile is rated low (only PR against PQR in doubt) is given with its range
    // but not called determined: the doubt may be about the lines themselves (a real perpendicular band
    // with resolved lines, PH3 ν4 from test/fixtures/real, read as J lines of a PR/PQR band: +21 %).
    bDetermined = bLow >= 0.85 * B && bHigh <= 1.15 * B && !envelopeHeld && !envelopePr && confidence !== 'low';
    if (contourRange) {
      // A Q-series' contour fit through the instrument: B ± 2σ, determined as qSeriesContourB says.
      bLow = contourRange.low;
      bHigh = contourRange.high;
      bDetermined = contourRange.determined;
    } else if (newRange) {
      // Π–Σ and Q-series envelopes: the range that fits, at least ±ENVELOPE_B_FLOOR (the rigid model's
      // own error), determined only within ±10 % and not reaching the end of the values tried.
      bLow = Math.min(B * (1 - ENVELOPE_B_FLOOR), newRange.low, B * (roughRange?.[0] ?? 1));
      bHigh = Math.max(B * (1 + ENVELOPE_B_FLOOR), newRange.high, B * (roughRange?.[1] ?? 1));
      bDetermined = bLow >= 0.9 * B && bHigh <= 1.1 * B && !newRange.open && !roughRange;
      if (newRange.open) evidence.push('B is not determined: the values that fit reach the end of those tried');
      else if (!bDetermined) evidence.push('B is not determined: the range that fits is wider than ±10 %');
    } else if (envelopeHeld) evidence.push('B is not determined: the profile does not rule out an unresolved perpendicular band');
    else if (envelopePr)
      evidence.push(
        "B is not determined: without resolved lines a PR envelope does not rule out an oblate top's unresolved perpendicular band, whose envelope gives another B",
      );
    else if (!bDetermined) evidence.push('B is not determined: the range is wider than ±15 %');
    evidence.push(
      contourRange
        ? `B between ${bLow.toPrecision(3)} and ${bHigh.toPrecision(3)} cm^-1 (±2σ of the contour fit, over every minimum about as deep)`
        : roughRange === LOW_ENVELOPE_B_RANGE
          ? `B between ${bLow.toPrecision(3)} and ${bHigh.toPrecision(3)} cm^-1 (at least ${LOW_ENVELOPE_B_RANGE[0]}–${LOW_ENVELOPE_B_RANGE[1]}× B, measured on seeded bands whose envelope was read with low confidence)`
          : `B between ${bLow.toPrecision(3)} and ${bHigh.toPrecision(3)} cm^-1 (at least ±${Math.round((newRange ? ENVELOPE_B_FLOOR : rel) * 100)} %, measured on seeded bands)`,
    );
  } else {
    evidence.push('B is not given: this profile does not show it to 10 %');
  }
  if (profile === 'PR' && bMethod !== 'line-spacing' && confidence !== 'low') {
    // Without resolved lines "no Q branch" only means none above what the template test above can see
    // (a few per cent of the band): a symmetric top's parallel band whose K structure puts little in
    // its Q branch, or an oblate top's unresolved perpendicular band (Q branches spread over the whole
    // band), shows the same two lobes. On the seeded bands of bench:contour classify every PR call
    // that was wrong came from such an envelope (tuning seeds 22 and 61, both already low, since read
    // PQR by the centroid test above), so an envelope-only PR is rated low; B, when given, is a Σ–Σ
    // band's and is not called determined.
    confidence = 'low';
    evidence.push(
      "PR is rated low: without resolved lines the envelope cannot rule out a weak or smeared Q branch (a symmetric top's parallel band with little intensity in its Q branch, or an oblate top's unresolved perpendicular band)" +
        (B !== null ? `; B = ${B.toPrecision(3)} cm^-1 holds if the band is a Σ–Σ band` : ''),
    );
  }
  if (confidence === 'high' && profile !== 'Q-series') {
    // Measured on 120 seeded bands of every shape, type and apodization (bench:contour classify),
    // PR calls were right about half the time and PQR calls about 85 %: neither is rated high (a wrong
    // answer given with confidence is the worst outcome). Q-series calls on a regular comb of ≥ 8
    // maxima with T given were all right, and stay high.
    confidence = 'medium';
    evidence.push(
      `a ${profile} call is never rated high: on seeded test bands of every shape and type such calls were wrong too often (see bench:contour classify)`,
    );
  }
  evidence.push(`confidence ${confidence}`);
  return {
    profile,
    type,
    origin,
    B,
    ...(qSpacing !== undefined ? { qSpacing } : {}),
    confidence,
    ...(alternativeType ? { alternativeType } : {}),
    bMethod,
    ...(bLow !== undefined ? { bLow } : {}),
    ...(bHigh !== undefined ? { bHigh } : {}),
    ...(bDetermined !== undefined ? { bDetermined } : {}),
    ...(qSeriesEnvelope ? { qSeriesEnvelope } : {}),
    ...(qSeriesContour ? { qSeriesContour } : {}),
    temperatureK: T,
    temperatureAssumed: bMethod === 'pr-separation' || bMethod === 'envelope-fit' ? temperatureAssumed : false,
    evidence: evidence.join('; ') + '.',
    implication,
  };
}

/**
 * Strongest repeat of a residual: the lag (samples, parabola-refined) of the highest local maximum of
 * its normalised autocorrelation beyond the first zero crossing or first minimum (the features' own width), and that
 * maximum (1 = a perfect repeat). Source: autocorrelation period estimate, common practice.
 */
function residualPeriod(r: Float64Array, minLag: number, maxLag: number): { lag: number; strength: number } | null {
  const m = r.length;
  let r0 = 0;
  for (let i = 0; i < m; i++) r0 += r[i] * r[i];
  if (!(r0 > 0) || maxLag <= minLag + 2) return null;
  const ac = new Float64Array(maxLag + 2);
  for (let k = 0; k <= maxLag + 1; k++) {
    let s = 0;
    for (let i = 0; i + k < m; i++) s += r[i] * r[i + k];
    ac[k] = (s / r0) * (m / (m - k));
  }
  // Beyond the first zero crossing, or the first local minimum when a slow residual keeps it positive.
  let k0 = 1;
  while (k0 <= maxLag && ac[k0] > 0 && !(ac[k0] < ac[k0 - 1] && ac[k0] <= ac[k0 + 1])) k0++;
  let best = -1;
  for (let k = Math.max(k0, minLag); k <= maxLag; k++)
    if (ac[k] > ac[k - 1] && ac[k] >= ac[k + 1] && (best < 0 || ac[k] > ac[best])) best = k;
  if (best < 0) return null;
  const den = ac[best - 1] - 2 * ac[best] + ac[best + 1];
  const off = den < 0 ? (0.5 * (ac[best - 1] - ac[best + 1])) / den : 0;
  return { lag: best + off, strength: ac[best] };
}

/** Half-width of a Q branch's core, cm^-1: where the trace falls to its base + 10 % of its prominence (at least 3 samples). */
function qBranchCore(x: Float64Array, y: Float64Array, spike: Peak, step: number): number {
  const floor = spike.height - 0.9 * spike.prominence;
  let lo = spike.index;
  while (lo > 0 && y[lo] > floor) lo--;
  let hi = spike.index;
  while (hi < y.length - 1 && y[hi] > floor) hi++;
  return Math.max(spike.x - x[lo], x[hi] - spike.x, 3 * step);
}

/** The two lobes farthest apart on either side of the centroid (P below, R above). */
function outerLobes(lobes: Peak[], centroid: number): [Peak, Peak] {
  const below = lobes.filter((l) => l.x <= centroid);
  const above = lobes.filter((l) => l.x > centroid);
  const pick = (list: Peak[]) => list.reduce((best, l) => (l.height > best.height ? l : best));
  if (below.length && above.length) return [pick(below), pick(above)];
  const sorted = [...lobes].sort((a, b) => b.height - a.height).slice(0, 2);
  sorted.sort((a, b) => a.x - b.x);
  return [sorted[0], sorted[1]];
}

/**
 * The gap of 1.5–4.5 spacings between neighbouring peaks nearest the centroid, if any: its midpoint
 * (`mid`), width, how many of P(1) and R(0) it lacks and the origin it puts (`centre`), cm^-1.
 */
function centralGap(
  members: Peak[],
  spacing: number,
  centroid: number,
  x: Float64Array,
  y: Float64Array,
): { centre: number; mid: number; width: number; missing: number } | null {
  let best: { centre: number; mid: number; width: number; missing: number } | null = null;
  for (let i = 1; i < members.length; i++) {
    const g = members[i].x - members[i - 1].x;
    const c = 0.5 * (members[i].x + members[i - 1].x);
    // The lines bounding a band's central gap, P(1) and R(0), each continue into their branch one
    // spacing further out; a gap with a lone peak on one side lies among blurred lines, not at the
    // centre (a real parallel band, CH3CN ν4 at L = 2.5 cm with a Norton–Beer instrument,
    // test/fixtures/real: a gap inside the P branch beat the Q branch 3.4 cm^-1 away).
    const continues = (at: number) => members.some((p) => Math.abs(p.x - at) < 0.25 * spacing);
    if (!continues(members[i - 1].x - spacing) || !continues(members[i].x + spacing)) continue;
    if (g >= 1.5 * spacing && g <= 4.5 * spacing && Math.abs(c - centroid) < 8 * spacing) {
      // P(1) and R(0), the weakest lines of the band, can fall below the peak test: a gap of 3
      // spacings lacks one of them (the origin is then one spacing inside from the line that bounds the
      // gap on the other side; the side whose expected position holds more of the trace lacks the
      // line), a gap of 4 lacks both and is centred on the origin as one of 2 is.
      const missing = Math.max(0, Math.round(g / spacing) - 2);
      let centre = c;
      if (missing === 1) {
        const at = (v: number) => {
          let k = 0;
          while (k < x.length - 1 && x[k] < v) k++;
          return y[k];
        };
        const lackP1 = at(members[i - 1].x + spacing) >= at(members[i].x - spacing);
        centre = lackP1 ? members[i].x - spacing : members[i - 1].x + spacing;
      }
      if (!best || Math.abs(centre - centroid) < Math.abs(best.centre - centroid)) best = { centre, mid: c, width: g, missing };
    }
  }
  return best;
}

/** A comb finer than 0.7 of the strong comb's spacing (and over three samples) among the weaker peaks between its members, or null. */
function finerCombBetween(comb: { spacing: number; members: Peak[] }, peaks: Peak[], step: number): ReturnType<typeof combOf> {
  const rest = peaks.filter((p) => comb.members.every((q) => Math.abs(q.x - p.x) > 0.2 * comb.spacing));
  const restMax = rest.reduce((m, p) => Math.max(m, p.prominence), 0);
  for (const level of [0.5, 0.3, 0.15]) {
    const picked = rest.filter((p) => p.prominence >= level * restMax);
    const fine = picked.length >= 8 ? combOf(picked) : null;
    if (fine) return fine.spacing < 0.7 * comb.spacing && fine.spacing > 3 * step ? fine : null;
  }
  return null;
}

/** Whether the trace has a maximum of at least minHeight within ±halfWindow of atCm1 (not at the window's edge). */
function lineNear(x: Float64Array, y: Float64Array, atCm1: number, halfWindow: number, minHeight: number): boolean {
  let best = -1;
  for (let i = 0; i < x.length; i++) if (Math.abs(x[i] - atCm1) <= halfWindow && (best < 0 || y[i] > y[best])) best = i;
  if (best <= 0 || best >= x.length - 1) return false;
  return y[best] >= minHeight && y[best] >= y[best - 1] && y[best] >= y[best + 1];
}

/**
 * The widest stretch of 5–24 comb spacings without peaks (more than a missing line or two) whose centre
 * lies within maxOffset of the centroid, cm^-1, or null.
 */
function widestHole(peaks: Peak[], spacing: number, centroid: number, maxOffset: number): { centre: number; width: number } | null {
  const xs = peaks.map((p) => p.x).sort((a, b) => a - b);
  let best: { centre: number; width: number } | null = null;
  for (let i = 1; i < xs.length; i++) {
    const g = xs[i] - xs[i - 1];
    const c = 0.5 * (xs[i] + xs[i - 1]);
    if (g >= 5 * spacing && g <= 24 * spacing && Math.abs(c - centroid) < maxOffset && (!best || g > best.width))
      best = { centre: c, width: g };
  }
  return best;
}

/**
 * Quadratic ν = a + b m + c m² through the comb members, m their whole-number index from the one
 * nearest the centroid (gaps of two or three spacings count as missing members).
 * Source: sub-band Q-branch positions quadratic in K, Herzberg II (1945) ch. IV.
 */
/** Folded height at each third, over the troughs beside it, as a share of the strong maxima's, above which the comb is subdivided (chosen here). */
const COMB_THIRDS_BUMP = 0.12;

/** Significance of each third's bump, in standard errors over the comb's gaps (chosen here). */
const COMB_THIRDS_SIGNIFICANCE = 4;

/**
 * Weaker Q branches at a third and two thirds of each gap of a comb. Nuclear-spin weights make every
 * third Q branch of a perpendicular band stronger (a C3v top with three equivalent protons: weights
 * 4, 2, 2 for K ≡ 0, 1, 2 mod 3, Herzberg II (1945) ch. I, from memory), so the comb of the strongest
 * maxima is three times the true spacing. The trace is folded over the comb's single gaps (phase 0 at
 * one member, 1 at the next, so a curved comb folds too), each gap taken about its own mean and
 * scaled by its members' height above it; a bump at phase 1/3 and at 2/3 over the troughs at 1/6, 1/2
 * and 5/6, large and significant over the gaps, subdivides the comb.
 * @returns the comb with the thirds added (at their folded positions), the two bumps (shares of the strong maxima), their standard errors and the number of gaps folded
 */
function combThirds(
  x: Float64Array,
  y: Float64Array,
  members: Peak[],
  spacing: number,
): { members: Peak[]; bumps: [number, number]; errors: [number, number]; gaps: number } {
  const sorted = [...members].sort((a, b) => a.x - b.x);
  const bins = 12;
  // Per gap, the mean scaled height in each bin.
  const rows: number[][] = [];
  const added: Peak[] = [];
  for (let i = 1; i < sorted.length; i++) {
    const a = sorted[i - 1];
    const b = sorted[i];
    const g = b.x - a.x;
    if (Math.abs(g / spacing - 1) > 0.25 || b.index - a.index < bins) continue;
    let mean = 0;
    for (let k = a.index; k <= b.index; k++) mean += y[k];
    mean /= b.index - a.index + 1;
    const amplitude = 0.5 * (y[a.index] + y[b.index]) - mean;
    if (!(amplitude > 0)) continue;
    const sum = new Float64Array(bins + 1);
    const count = new Float64Array(bins + 1);
    for (let k = a.index; k <= b.index; k++) {
      const bin = Math.round(((x[k] - a.x) / g) * bins);
      if (bin < 0 || bin > bins) continue;
      sum[bin] += (y[k] - mean) / amplitude;
      count[bin]++;
    }
    if (!(count[2] && count[4] && count[6] && count[8] && count[10])) continue;
    rows.push(Array.from(sum, (v, k) => v / count[k]));
    added.push(
      { x: a.x + g / 3, height: 0, prominence: 0, index: a.index + Math.round((b.index - a.index) / 3) },
      { x: a.x + (2 * g) / 3, height: 0, prominence: 0, index: a.index + Math.round((2 * (b.index - a.index)) / 3) },
    );
  }
  const gaps = rows.length;
  const bumpOf = (r: number[], c: number) => r[c] - 0.5 * (r[c - 2] + r[c + 2]);
  const stats = (c: number): [number, number] => {
    if (gaps < 2) return [0, Infinity];
    const v = rows.map((r) => bumpOf(r, c));
    const m = v.reduce((p, q) => p + q, 0) / gaps;
    const sd = Math.sqrt(v.reduce((p, q) => p + (q - m) ** 2, 0) / (gaps - 1));
    return [m, sd / Math.sqrt(gaps)];
  };
  const [b1, e1] = stats(4);
  const [b2, e2] = stats(8);
  return { members: [...sorted, ...added].sort((p, q) => p.x - q.x), bumps: [b1, b2], errors: [e1, e2], gaps };
}

function qSeriesFit(members: Peak[], centroid: number): { spacing: number; curvature: number } {
  let centre = 0;
  for (let i = 1; i < members.length; i++) if (Math.abs(members[i].x - centroid) < Math.abs(members[centre].x - centroid)) centre = i;
  const diffs: number[] = [];
  for (let i = 1; i < members.length; i++) diffs.push(members[i].x - members[i - 1].x);
  const d = median(diffs);
  const m: number[] = new Array(members.length).fill(0);
  for (let i = centre + 1; i < members.length; i++) m[i] = m[i - 1] + Math.max(1, Math.round((members[i].x - members[i - 1].x) / d));
  for (let i = centre - 1; i >= 0; i--) m[i] = m[i + 1] - Math.max(1, Math.round((members[i + 1].x - members[i].x) / d));
  // Normal equations of the 3-parameter fit.
  const s = new Float64Array(5);
  const r = new Float64Array(3);
  members.forEach((p, i) => {
    const k = m[i];
    for (let e = 0; e < 5; e++) s[e] += k ** e;
    for (let e = 0; e < 3; e++) r[e] += p.x * k ** e;
  });
  const a = [
    [s[0], s[1], s[2], r[0]],
    [s[1], s[2], s[3], r[1]],
    [s[2], s[3], s[4], r[2]],
  ];
  if (members.length < 4) return { spacing: d, curvature: 0 };
  for (let p = 0; p < 3; p++) {
    for (let q = 0; q < 3; q++) {
      if (q === p) continue;
      const f = a[q][p] / a[p][p];
      for (let c = p; c < 4; c++) a[q][c] -= f * a[p][c];
    }
  }
  return { spacing: a[1][3] / a[1][1], curvature: a[2][3] / a[2][2] };
}

/** Share of the band's area in the Q branch: area within ±1.5 spacing of the spike above the chord there. */
function qBranchShare(x: Float64Array, y: Float64Array, spike: Peak, area: number, halfWidthGuess: number): number {
  const half = Math.max(halfWidthGuess, 3 * (x[1] - x[0]));
  let lo = spike.index;
  while (lo > 0 && x[lo] > spike.x - half) lo--;
  let hi = spike.index;
  while (hi < x.length - 1 && x[hi] < spike.x + half) hi++;
  let a = 0;
  for (let i = lo; i <= hi; i++) {
    const chord = y[lo] + ((y[hi] - y[lo]) * (x[i] - x[lo])) / (x[hi] - x[lo]);
    a += Math.max(0, y[i] - chord) * (i > 0 ? x[i] - x[i - 1] : 0);
  }
  return a / area;
}

/**
 * The envelope's highest maximum when it lies between two lower maxima (each beyond a dip to ≤ 85 %
 * of the lower of the two heights, ≥ 8 % of the highest, with ≥ 10 % of the band's area outside it):
 * a Q branch between P and R. Thresholds: common practice, chosen here.
 */
function envelopeCentralMaximum(
  x: Float64Array,
  y: Float64Array,
  sigmaSamples: number,
  area: number,
): { x: number; left: number; right: number } | null {
  const env = smoothBoxes(y, sigmaSamples);
  const n = env.length;
  let im = 0;
  for (let i = 1; i < n; i++) if (env[i] > env[im]) im = i;
  const top = env[im];
  const side = (dir: 1 | -1): { x: number; h: number } | null => {
    let lowest = top;
    let best: { x: number; h: number } | null = null;
    for (let i = im + dir; i > 0 && i < n - 1; i += dir) {
      lowest = Math.min(lowest, env[i]);
      if (env[i] >= env[i - 1] && env[i] >= env[i + 1] && env[i] >= 0.08 * top && lowest <= 0.85 * env[i]) {
        if (!best || env[i] > best.h) best = { x: x[i], h: env[i] };
      }
    }
    return best;
  };
  const l = side(-1);
  const r = side(1);
  if (!l || !r || l.h >= top || r.h >= top) return null;
  // Each side must hold a real branch, not a ripple in the wing.
  let aLeft = 0;
  let aRight = 0;
  for (let i = 1; i < n; i++) {
    const a = Math.max(0, y[i]) * (x[i] - x[i - 1]);
    if (x[i] < l.x) aLeft += a;
    else if (x[i] > r.x) aRight += a;
  }
  if (aLeft < 0.1 * area || aRight < 0.1 * area) return null;
  return { x: x[im], left: l.x, right: r.x };
}

/**
 * Regular comb of maxima inside the central feature around the spike (where the trace stays above
 * 30 % of the spike's height): ≥ 5 maxima ≥ 3σ prominent and ≥ 10 % of the spike, ≥ 80 % of gaps
 * whole multiples of the median gap, spacing ≥ 3 samples, and a quadratic in the index whose
 * curvature moves the outermost member by < 25 % of a spacing. Thresholds: chosen here.
 */
/** Sample indices where the central feature around the spike falls to 30 % of the spike's height. */
function centralFeatureExtent(light: Float64Array, spike: Peak): [number, number] {
  const floor = 0.3 * spike.height;
  let lo = spike.index;
  while (lo > 0 && light[lo] > floor) lo--;
  let hi = spike.index;
  while (hi < light.length - 1 && light[hi] > floor) hi++;
  return [lo, hi];
}

function centralQCluster(
  x: Float64Array,
  light: Float64Array,
  spike: Peak,
  sigma: number,
  step: number,
): { spacing: number; members: number; curvature: number } | null {
  const [lo, hi] = centralFeatureExtent(light, spike);
  const inside = refinedPeaks(x, light, 3 * sigma).filter((p) => p.index > lo && p.index < hi && p.height >= 0.1 * spike.height);
  if (inside.length < 5) return null;
  const comb = combOf(inside);
  if (!comb || comb.regularity < 0.8 || comb.spacing < 3 * step) return null;
  const fit = qSeriesFit(inside, spike.x);
  const half = (inside[inside.length - 1].x - inside[0].x) / Math.abs(fit.spacing) / 2;
  if (!(Math.abs(fit.curvature) * half * half < 0.25 * Math.abs(fit.spacing))) return null;
  return { spacing: fit.spacing, members: inside.length, curvature: fit.curvature };
}

/**
 * A regular ripple on the central feature around the spike (where the trace stays above 30 % of the
 * spike's height), for Q branches too shallow to stand out as maxima of the trace itself: the feature
 * less its smooth outline (smoothed to a tenth of its width) has an autocorrelation maximum ≥ 0.3 at
 * a period of ≥ 3 samples and under `maxPeriodCm1`; ≥ 5 maxima of that residual (≥ 25 % of the largest
 * one's prominence) lie on a regular comb (≥ 80 % of gaps whole multiples of its median gap, within
 * 15 % of the period), and a quadratic in the index whose curvature moves the outermost member by
 * < 25 % of a spacing. The spacing returned is the autocorrelation's period, cm^-1.
 * Thresholds: chosen here (an autocorrelation of noise alone over n samples is of order 1/√n, ≈ 0.1
 * over the ~100 samples of such a feature).
 * @param maxPeriodCm1 the finest spacing J lines of the band could have, cm^-1 (a ripple this coarse
 *   may be J lines)
 */
function centralQRipple(
  x: Float64Array,
  light: Float64Array,
  spike: Peak,
  step: number,
  maxPeriodCm1: number,
): { spacing: number; members: number; curvature: number; strength: number } | null {
  const [lo, hi] = centralFeatureExtent(light, spike);
  const m = hi - lo + 1;
  if (m < 30) return null;
  const part = light.slice(lo, hi + 1);
  const outline = smoothBoxes(part, m / 10);
  const hp = new Float64Array(m);
  for (let i = 0; i < m; i++) hp[i] = part[i] - outline[i];
  const period = residualPeriod(hp, 3, Math.floor(m / 4));
  if (!period || period.strength < 0.3) return null;
  const d = period.lag * step;
  if (!(d < maxPeriodCm1)) return null;
  const xs = x.slice(lo, hi + 1);
  const found = refinedPeaks(xs, hp, 0);
  const top = found.reduce((a, p) => Math.max(a, p.prominence), 0);
  const picked = found.filter((p) => p.prominence >= 0.25 * top);
  if (picked.length < 5) return null;
  const comb = combOf(picked);
  if (!comb || comb.regularity < 0.8 || Math.abs(comb.spacing / d - 1) > 0.15) return null;
  const fit = qSeriesFit(picked, spike.x);
  const half = (picked[picked.length - 1].x - picked[0].x) / Math.abs(fit.spacing) / 2;
  if (!(Math.abs(fit.curvature) * half * half < 0.25 * Math.abs(fit.spacing))) return null;
  // The spacing given is the autocorrelation's period: the residual's maxima on the feature's flanks
  // are pulled by what is left of its slope and by J lines among them, which a line through them
  // follows (seeded band 8 of bench:contour classify: +3.1 % from the maxima, +1.4 % from the period).
  return { spacing: d, members: picked.length, curvature: fit.curvature, strength: period.strength };
}
