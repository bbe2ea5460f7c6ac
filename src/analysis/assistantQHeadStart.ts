import { bandLines } from '../physics/bandLines';
import { lineLabelAscii } from '../physics/lineLabel';
import { shapeUniqueName, type BandModel } from '../physics/model';
import { assistantOptionsResolve } from './assistantOptions';
import { assistantPeakContext, assistantPeaksInRange, assistantSeedOnPeak } from './assistantPeakContext';
import type { AssistantLine } from './assistantTypes';
import type { PeakList } from './peaksFind';

/** Options of assistantQHeadStart; Q_HEAD_DEFAULTS holds the defaults. */
export interface AssistantQHeadOptions {
  /** Sub-bands with |ΔK·K″| up to this enter the comb. @default 3 */
  maxSignedK?: number;
  /** Lines per sub-band (strongest first, J″ ≤ 12). @default 40 */
  linesPerSubBand?: number;
  /** First-guess error of A (C), fraction. @default 0.01 */
  uniqueFraction?: number;
  /** First-guess error of ζ. @default 0.025 */
  zeta?: number;
  /** First-guess error of A′ − A″ (C′ − C″), fraction of A (C). @default 0.003 */
  uniqueDifferenceFraction?: number;
  /** First-guess error of B′ − B″, fraction of B″. @default 0.0025 */
  bDifferenceFraction?: number;
  /** Most seeds per sub-band of the comb. @default 4 */
  seedsPerSubBand?: number;
}

/** Defaults of AssistantQHeadOptions (the first-guess ranges). */
const Q_HEAD_DEFAULTS: Required<AssistantQHeadOptions> = {
  maxSignedK: 3,
  linesPerSubBand: 40,
  uniqueFraction: 0.01,
  zeta: 0.025,
  uniqueDifferenceFraction: 0.003,
  bDifferenceFraction: 0.0025,
  seedsPerSubBand: 4,
};

/** Windows are this much wider than the stated errors. */
const WINDOW_MARGIN = 1.15;
/** Lines with J″ above this are left out (centrifugal and B errors of a first guess grow with J). */
const COMB_MAX_J = 12;
/**
 * The best comb must match at least max(COMB_MARGIN_MIN, COMB_MARGIN_FRACTION × its excess over
 * chance) more lines than any comb that puts some sub-band more than 2 line widths elsewhere.
 */
const COMB_MARGIN_MIN = 4;
const COMB_MARGIN_FRACTION = 0.25;

/** Outcome of assistantQHeadStart. */
export interface AssistantQHeadResult {
  /** The model with the comb found (ν0, A′ or C′, ζ moved; A″, B′, B″ kept); null when refused. */
  model: BandModel | null;
  /** Changes of the comb found, cm^-1: δ0 (at the reference sub-band), spacing δ1, curvature δ2. */
  offsetCm1: number;
  spacingCm1: number;
  curvatureCm1: number;
  /** Lines of the comb's sub-bands within half a width of a peak: best, the median over the grid, the best rival. */
  matched: number;
  chance: number;
  rival: number;
  /** Lines used. */
  n: number;
  /**
   * Seeds on the comb's sub-bands (status 'seed', source 'auto-seed'): lines with exactly one peak
   * within τ/2 of their place on the comb, no other within τ, no comparable predicted line within τ,
   * on a peak not taken. Empty when refused.
   */
  lines: AssistantLine[];
  /** One sentence: what was found or why not. */
  text: string;
}

/** Comb of a model: sub-band origin ν_sub(m) = c0 + c1 m + c2 m², m = ΔK·K″, cm^-1. */
function combOf(model: BandModel, unique: 'A' | 'C'): [number, number, number] {
  const au = model.upper[unique];
  const bu = model.upper.B;
  const z = model.upper.zeta;
  return [model.upper.origin + au * (1 - 2 * z) - bu, 2 * (au * (1 - z) - bu), au - bu - (model.lower[unique] - model.lower.B)];
}

/**
 * The model whose comb is (c0, c1, c2): A″, B′ and B″ kept, A′ (C′) from c2, ζ from c1, ν0 from c0.
 * Exact for the rigid-rotor part of every line (the K structure enters a line only through c0, c1, c2).
 */
function modelWithComb(model: BandModel, unique: 'A' | 'C', c: [number, number, number]): BandModel {
  const upper = { ...model.upper };
  const aUp = c[2] + upper.B + model.lower[unique] - model.lower.B;
  const aZeta = aUp - upper.B - c[1] / 2;
  upper[unique] = aUp;
  upper.zeta = aZeta / aUp;
  upper.origin = c[0] - aUp + 2 * aZeta + upper.B;
  return { ...model, upper };
}

/**
 * Place the comb of sub-band origins (the ^pQ_K / ^rQ_K heads) of a perpendicular band of a symmetric
 * top, for a model-only start whose band origin and B are already fitted to one sub-band (the
 * reference: assistantSeedFromModel's strongest sub-band) but whose other sub-bands, moved by the
 * first guess's errors of A, ζ and A′ − A″, lie too far off to be seeded one by one.
 *
 * The sub-band origins lie on ν_sub(m) = c0 + c1 m + c2 m², m = ΔK·K″, with c0 = ν0 + A′(1 − 2ζ) − B′,
 * c1 = 2[A′(1 − ζ) − B′] (the spacing of the Q heads), c2 = (A′ − B′) − (A″ − B″) (C for an oblate top).
 * Every line of sub-band m moves with its origin, so the comb is placed jointly: the lines (J″ ≤ 12,
 * the strongest linesPerSubBand) of all sub-bands with |m| ≤ maxSignedK other than the reference are
 * moved by δ0 + δ1 (m − m_ref) + δ2 (m² − m_ref²), δ1 and δ2 within the first guess's errors, δ0
 * within ± one line width τ (the reference is placed to that), and the (δ0, δ1, δ2) that puts the most
 * lines within τ/2 of a peak wins. Each sub-band's count is tabulated once along its own shift (a
 * histogram, each line counted once per bin), so a grid cell costs one look-up per sub-band.
 * Accepted only when the best comb beats every comb that puts some sub-band more than 2τ elsewhere
 * by max(4, 25 % of its excess over the grid's median), the shift search's rule of thumb made
 * stricter: a comb with its K numbering off by one puts each sub-band on a neighbour's lines, whose
 * pattern in J is nearly the same, so it is refused unless the counts decide (first lines missing
 * below J = K, the reference held fixed).
 * Source: sub-band structure of a perpendicular band, Herzberg II (1945) ch. IV (from memory);
 * histogram voting as in assistantShiftSearch.
 * Limits: needs upper.origin, the upper unique constant and upper.zeta floatable; the comb's higher
 * orders (DK, DJK differences) are not searched, hence the small |m|.
 * The reference may itself be one sub-band off (its lines fit any sub-band's pattern in J; the
 * spacing window covers that case): the comb is then right relative to it and every label one off,
 * which the caller must settle (the assign command runs the relabellings and keeps one only when it
 * alone is decided).
 * @param model constants fitted to the reference sub-band's lines (cm^-1): B′ and B″ must be good to
 *   a fraction of a line width at J″ = 12, which a start's shifted B is not
 * @param peaks peaks of the trace (ascending, cm^-1)
 * @param floatable keys the fit may float
 * @param tauCm1 matching width τ: the median peak FWHM, cm^-1
 * @param reference the reference sub-band (ΔK, K″)
 * @param taken peaks already assigned (no seed is put on them)
 */
export function assistantQHeadStart(
  model: BandModel,
  peaks: PeakList,
  floatable: readonly string[],
  tauCm1: number,
  reference: { deltaK: number; kLower: number },
  taken: ReadonlySet<number> = new Set(),
  options: AssistantQHeadOptions = {},
): AssistantQHeadResult {
  const o = {
    ...Q_HEAD_DEFAULTS,
    ...Object.fromEntries(Object.entries(options).filter(([, v]) => v !== undefined)),
  } as Required<AssistantQHeadOptions>;
  const result = (text: string, extra: Partial<AssistantQHeadResult> = {}): AssistantQHeadResult => ({
    model: null,
    offsetCm1: 0,
    spacingCm1: 0,
    curvatureCm1: 0,
    matched: 0,
    chance: 0,
    rival: 0,
    n: 0,
    lines: [],
    ...extra,
    text: `sub-band comb: ${text}`,
  });
  const unique = shapeUniqueName(model.shape);
  if (model.band !== 'perpendicular' || unique === null) return result('only for perpendicular bands of symmetric tops');
  for (const k of ['upper.origin', `upper.${unique}`, 'upper.zeta'])
    if (!floatable.includes(k)) return result(`${k} is held fixed, so the sub-bands cannot be moved against each other`);
  if (!(tauCm1 > 0) || !Number.isFinite(tauCm1)) return result(`the line width must be a number > 0, got ${tauCm1}`);
  if (peaks.count < 10) return result(`only ${peaks.count} peaks`);
  const mRef = reference.deltaK * reference.kLower;
  const au = Math.abs(model.upper[unique]);
  const bu = Math.abs(model.upper.B);
  const bl = Math.abs(model.lower.B) || bu;
  const z = model.upper.zeta;
  const half2 = WINDOW_MARGIN * (o.uniqueDifferenceFraction * au + o.bDifferenceFraction * bl);
  // The reference may itself be one sub-band off (its lines fit any sub-band's pattern in J): the
  // others then sit at c(m ± 1) − c(m_ref ± 1), a spacing 2·c2 different, which the window covers.
  const c2Guess = Math.abs(combOf(model, unique)[2]);
  const half1 = WINDOW_MARGIN * 2 * (o.uniqueFraction * au * Math.abs(1 - z) + o.zeta * au + 0.005 * bu) + 2 * (c2Guess + half2);
  const half0 = tauCm1;

  // Lines of each sub-band (m ≠ m_ref, |m| ≤ maxSignedK), strongest first.
  const lines = bandLines(model, { minIntensity: 1e-3 });
  const bySub = new Map<number, number[]>();
  for (let i = 0; i < lines.count; i++) {
    const m = lines.deltaK[i] * lines.kLower[i];
    if (m === mRef || Math.abs(m) > o.maxSignedK || lines.jLower[i] > COMB_MAX_J) continue;
    if (!bySub.has(m)) bySub.set(m, []);
    bySub.get(m)!.push(i);
  }
  const subs = [...bySub.entries()]
    .map(([m, idx]) => ({
      m,
      idx: idx.sort((x, y) => lines.intensity[y] - lines.intensity[x]).slice(0, o.linesPerSubBand),
      u1: m - mRef,
      u2: m * m - mRef * mRef,
    }))
    .filter((s) => s.idx.length >= 3);
  if (subs.length < 2) return result(`only ${subs.length} sub-band(s) besides the reference have lines to place`);
  const n = subs.reduce((sum, s) => sum + s.idx.length, 0);

  // Per sub-band: how many of its lines have a peak within τ/2, along its shift (bins of τ/4).
  const bin = tauCm1 / 4;
  const tables = subs.map((s) => {
    const reach = half0 + half1 * Math.abs(s.u1) + half2 * Math.abs(s.u2) + 2 * tauCm1;
    const nb = Math.ceil(reach / bin);
    const count = new Int32Array(2 * nb + 1);
    const stamp = new Int32Array(2 * nb + 1).fill(-1);
    for (const i of s.idx) {
      const x = lines.wavenumberCm1[i];
      const [first, last] = assistantPeaksInRange(peaks, x - reach - tauCm1, x + reach + tauCm1);
      for (let p = first; p <= last; p++) {
        const shift = peaks.wavenumberCm1[p] - x;
        const lo = Math.max(0, Math.ceil((shift - tauCm1 / 2) / bin) + nb);
        const hi = Math.min(2 * nb, Math.floor((shift + tauCm1 / 2) / bin) + nb);
        for (let b = lo; b <= hi; b++) {
          if (stamp[b] === i) continue;
          stamp[b] = i;
          count[b]++;
        }
      }
    }
    return { count, nb };
  });

  // Grid: δ0 in steps of τ/4, δ1 and δ2 in steps that move the farthest sub-band by τ/4.
  const span1 = Math.max(...subs.map((s) => Math.abs(s.u1)));
  const span2 = Math.max(1, ...subs.map((s) => Math.abs(s.u2)));
  const step1 = bin / span1;
  const step2 = bin / span2;
  const n0 = Math.round(half0 / bin);
  const n1 = Math.round(half1 / step1);
  const n2 = Math.round(half2 / step2);
  const scoreAt = (k0: number, k1: number, k2: number): number => {
    let s = 0;
    for (let t = 0; t < subs.length; t++) {
      const b = Math.round((k0 * bin + k1 * step1 * subs[t].u1 + k2 * step2 * subs[t].u2) / bin) + tables[t].nb;
      s += tables[t].count[b];
    }
    return s;
  };
  const histogram = new Float64Array(n + 1);
  let best = { score: -1, k0: 0, k1: 0, k2: 0, cost: Infinity };
  for (let k1 = -n1; k1 <= n1; k1++) {
    for (let k2 = -n2; k2 <= n2; k2++) {
      for (let k0 = -n0; k0 <= n0; k0++) {
        const s = scoreAt(k0, k1, k2);
        histogram[s]++;
        if (s < best.score) continue;
        const cost = Math.abs(k0) / Math.max(1, n0) + Math.abs(k1) / Math.max(1, n1) + Math.abs(k2) / Math.max(1, n2);
        if (s > best.score || cost < best.cost) best = { score: s, k0, k1, k2, cost };
      }
    }
  }
  let cells = 0;
  for (const h of histogram) cells += h;
  let seen = 0;
  let chance = 0;
  for (let v = 0; v <= n; v++) {
    seen += histogram[v];
    if (seen >= cells / 2) {
      chance = v;
      break;
    }
  }
  // The best rival: a comb that puts some sub-band more than 2τ from where the best puts it.
  const shiftOf = (k0: number, k1: number, k2: number, t: number) => k0 * bin + k1 * step1 * subs[t].u1 + k2 * step2 * subs[t].u2;
  let rival = { score: 0, k0: 0, k1: 0, k2: 0 };
  for (let k1 = -n1; k1 <= n1; k1++) {
    for (let k2 = -n2; k2 <= n2; k2++) {
      for (let k0 = -n0; k0 <= n0; k0++) {
        let isFar = false;
        for (let t = 0; t < subs.length && !isFar; t++)
          isFar = Math.abs(shiftOf(k0, k1, k2, t) - shiftOf(best.k0, best.k1, best.k2, t)) > 2 * tauCm1;
        if (!isFar) continue;
        const s = scoreAt(k0, k1, k2);
        if (s > rival.score) rival = { score: s, k0, k1, k2 };
      }
    }
  }
  const d0 = best.k0 * bin;
  const d1 = best.k1 * step1;
  const d2 = best.k2 * step2;
  const figures = {
    offsetCm1: d0,
    spacingCm1: d1,
    curvatureCm1: d2,
    matched: best.score,
    chance,
    rival: rival.score,
    n,
  };
  const found =
    `spacing ${signed(d1, 5)}, curvature ${signed(d2, 6)}, offset ${signed(d0, 4)} cm^-1 puts ${best.score} of ${n} lines of ` +
    `${subs.length} sub-bands on a peak (chance ${chance}, best rival ${rival.score})`;
  const margin = Math.max(COMB_MARGIN_MIN, COMB_MARGIN_FRACTION * (best.score - chance));
  if (best.score - rival.score < margin)
    return result(
      `${found}: not clear enough (a margin of ${margin.toFixed(0)} lines is needed); the sub-bands are left where the first guess puts them`,
      figures,
    );
  const [c0, c1, c2] = combOf(model, unique);
  const corrected = modelWithComb(model, unique, [c0 + d0 - d1 * mRef - d2 * mRef * mRef, c1 + d1, c2 + d2]);
  const seeds = combSeeds(corrected, peaks, tauCm1, new Set(subs.map((x) => x.m)), taken, o.seedsPerSubBand, found);
  return { model: corrected, ...figures, lines: seeds, text: `sub-band comb: ${found}; ${seeds.length} seed(s) on its sub-bands` };
}

/** Other predicted lines at least this fraction of a seed's intensity must not lie within τ of it. */
const SEED_ISOLATION_FRACTION = 0.1;

/** Seeds on the comb's sub-bands (see AssistantQHeadResult.lines), strongest first. */
function combSeeds(
  model: BandModel,
  peaks: PeakList,
  tau: number,
  subBands: ReadonlySet<number>,
  taken: ReadonlySet<number>,
  perSubBand: number,
  why: string,
): AssistantLine[] {
  const assistant = assistantOptionsResolve(model);
  const context = assistantPeakContext(peaks, assistant.widthNeighbours, assistant.blendWidthRatio);
  const lines = bandLines(model, { minIntensity: 1e-3 });
  const order = Int32Array.from({ length: lines.count }, (_, i) => i).sort((a, b) => lines.wavenumberCm1[a] - lines.wavenumberCm1[b]);
  const sortedNu = Float64Array.from(order, (i) => lines.wavenumberCm1[i]);
  const isIsolated = (i: number) => {
    const x = lines.wavenumberCm1[i];
    let lo = 0;
    let hi = sortedNu.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (sortedNu[mid] < x - tau) lo = mid + 1;
      else hi = mid;
    }
    for (let s = lo; s < sortedNu.length && sortedNu[s] <= x + tau; s++) {
      const j = order[s];
      if (j !== i && lines.intensity[j] >= SEED_ISOLATION_FRACTION * lines.intensity[i]) return false;
    }
    return true;
  };
  const candidates = Array.from({ length: lines.count }, (_, i) => i)
    .filter((i) => subBands.has(lines.deltaK[i] * lines.kLower[i]) && lines.jLower[i] <= COMB_MAX_J)
    .sort((a, b) => lines.intensity[b] - lines.intensity[a]);
  const perSub = new Map<number, number>();
  const used = new Set<number>();
  const seeds: AssistantLine[] = [];
  for (const i of candidates) {
    const m = lines.deltaK[i] * lines.kLower[i];
    if ((perSub.get(m) ?? 0) >= perSubBand) continue;
    const x = lines.wavenumberCm1[i];
    const [first, last] = assistantPeaksInRange(peaks, x - tau, x + tau);
    if (last !== first || Math.abs(peaks.wavenumberCm1[first] - x) > tau / 2) continue;
    if (taken.has(first) || used.has(first) || !isIsolated(i)) continue;
    used.add(first);
    perSub.set(m, (perSub.get(m) ?? 0) + 1);
    const label = lineLabelAscii(lines.deltaK[i], lines.deltaJ[i], lines.kLower[i], lines.jLower[i], model.shape);
    const reason = `model-only seed from the sub-band comb: the only peak within ±${tau.toPrecision(2)} cm^-1 of ${label} predicted at ${x.toFixed(4)} cm^-1 (${why})`;
    const quanta = { jUpper: lines.jUpper[i], kUpper: lines.kUpper[i], jLower: lines.jLower[i], kLower: lines.kLower[i] };
    const place = { id: `comb-seed${seeds.length + 1}`, quanta, peak: first, predictedCm1: x, matchSigmaCm1: tau / 3, reason };
    seeds.push(assistantSeedOnPeak(peaks, context, place, assistant.positionFloorFraction, assistant.blendUncertaintyFraction));
  }
  return seeds;
}

function signed(v: number, digits: number): string {
  return `${v >= 0 ? '+' : ''}${v.toFixed(digits)}`;
}
