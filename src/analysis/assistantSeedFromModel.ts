import { bandLines } from '../physics/bandLines';
import { lineLabelAscii } from '../physics/lineLabel';
import type { BandModel } from '../physics/model';
import {
  assistantPeakContext,
  assistantPeaksCheck,
  assistantPeaksInRange,
  assistantPeaksUsable,
  assistantSeedOnPeak,
} from './assistantPeakContext';
import { assistantOptionsResolve } from './assistantOptions';
import type { AssistantLine, AssistantOptions } from './assistantTypes';
import type { PeakList } from './peaksFind';
import { assistantShiftSearch as shiftSearch } from './assistantShiftSearch';

/** Options of assistantSeedFromModel; ASSISTANT_SEED_DEFAULTS holds the defaults. */
export interface AssistantSeedOptions {
  /** The band origin is searched within ± this of the model's, cm^-1. @default 1 */
  originWindowCm1?: number;
  /**
   * B′ + B″ is searched within ± this fraction of B″ each, B′ − B″ within ± twice it (so each
   * B may be off by about this fraction independently). @default 0.015
   */
  bScaleWindow?: number;
  /** Strongest predicted lines used in the search. @default 80 */
  searchLines?: number;
  /** Most seeds to pick. @default 12 */
  count?: number;
  /** Most seeds per series (ΔK, K'', ΔJ). @default 2 */
  perSeries?: number;
  /**
   * Half width of the window in which a seed must have exactly one peak, as a multiple of the
   * median FWHM. @default 3
   */
  windowFwhm?: number;
  /** Other predicted lines at least this fraction of the seed's intensity must not lie in its window. @default 0.1 */
  isolationFraction?: number;
  /** Prefix of the seed ids. @default 'seed' */
  idPrefix?: string;
  /**
   * Seed from the runner-up shift of the search (the best one more than 2 FWHM from the best),
   * to test it as a rival hypothesis when the two match about as many lines. @default false
   */
  useRunnerUp?: boolean;
  /** Passed on to the uncertainty model of the seeds (positionFloorFraction, blend options). */
  assistant?: AssistantOptions;
}

/** Only lines with K'' and J'' up to these enter the search and become seeds (K-terms and centrifugal errors of a first guess grow with K and J). */
const SEARCH_MAX_K = 2;
const SEARCH_MAX_J = 25;
/** The coarse search uses lines up to this J'' (smaller B derivatives, fewer grid steps). */
const COARSE_MAX_J = 12;
/** The coarse search uses at most this many lines. */
const COARSE_LINES = 40;
/**
 * The best shift must match at least max(SHIFT_MARGIN_MIN, SHIFT_MARGIN_FRACTION × its count) more
 * lines than any shift more than 2 FWHM away (rule of thumb: a few lines and 15 %).
 */
const SHIFT_MARGIN_MIN = 3;
const SHIFT_MARGIN_FRACTION = 0.15;
/** Each sub-band's own shift is searched within ± this, cm^-1. */
const SUB_BAND_WINDOW_CM1 = 0.5;

function signed(v: number): string {
  return `${v >= 0 ? '+' : ''}${v.toPrecision(3)}`;
}

/** Defaults of AssistantSeedOptions. */
export const ASSISTANT_SEED_DEFAULTS: Required<Omit<AssistantSeedOptions, 'assistant'>> = {
  originWindowCm1: 1,
  bScaleWindow: 0.015,
  searchLines: 80,
  count: 12,
  perSeries: 2,
  windowFwhm: 3,
  isolationFraction: 0.1,
  idPrefix: 'seed',
  useRunnerUp: false,
};

/** Outcome of assistantSeedFromModel. */
export interface AssistantSeedResult {
  /** The seeds (status 'seed', source 'auto-seed'), strongest first. */
  lines: AssistantLine[];
  /** The model with the best origin shift and B scale applied (start values for the loop). */
  model: BandModel;
  /** Origin shift found, cm^-1. */
  originShiftCm1: number;
  /** Change of B′ found (applied when upper.B may float), cm^-1. */
  upperBShiftCm1: number;
  /** Change of B″ found, cm^-1. */
  lowerBShiftCm1: number;
  /** Search lines with a peak within the matching width at the best shift / of those used. */
  matchedFraction: number;
  /** The same fraction at a typical (median) grid point: what chance coincidences give. */
  chanceFraction: number;
  /**
   * A shift more than 2 FWHM from the best matches nearly as many lines (the ladder can be laid on
   * the peaks one rung or one sub-band apart): the seeds are one of two hypotheses; run the
   * runner-up too (useRunnerUp) and keep the one the data support.
   */
  isAmbiguous?: boolean;
  warnings: string[];
}

function checkSeedOptions(o: Required<Omit<AssistantSeedOptions, 'assistant'>>): void {
  const positive: (keyof typeof o)[] = ['originWindowCm1', 'windowFwhm'];
  for (const k of positive) {
    const v = o[k] as number;
    if (!(v > 0) || !Number.isFinite(v)) throw new Error(`assistantSeedFromModel: ${k} must be a finite number > 0, got ${v}`);
  }
  if (!(o.bScaleWindow >= 0 && o.bScaleWindow < 0.5))
    throw new Error(`assistantSeedFromModel: bScaleWindow must be in [0, 0.5), got ${o.bScaleWindow}`);
  for (const k of ['searchLines', 'count', 'perSeries'] as const) {
    if (!Number.isInteger(o[k]) || o[k] < 1) throw new Error(`assistantSeedFromModel: ${k} must be a whole number >= 1, got ${o[k]}`);
  }
  if (!(o.isolationFraction >= 0 && o.isolationFraction <= 1)) {
    throw new Error(`assistantSeedFromModel: isolationFraction must be in [0, 1], got ${o.isolationFraction}`);
  }
}

/**
 * Pick seed assignments from the model alone, for a start without hand-made lines.
 *
 * 1. Shift search: the strongest predicted lines with K'' ≤ 2 and J'' ≤ 25 (searchLines) are moved
 *    together by an origin shift δ, a change s of both B′ and B″ and a change d of B′ − B″:
 *    ν_i + δ + s ∂ν_i/∂s + d ∂ν_i/∂d with ∂ν/∂s = F′_B − F″_B, ∂ν/∂d = (F′_B + F″_B)/2,
 *    F_B = J(J+1) − K². On a grid of s and d (steps that move the farthest line by the matching
 *    width τ = median peak FWHM) the δ that puts the most lines within τ/2 of a peak is found by a
 *    histogram in steps of τ (each line counted once per bin); the best (δ, s, d) wins, the
 *    smallest change among equals.
 * 2. Seeds: with δ, s, d applied, the strongest predicted lines (K'' ≤ 2, J'' ≤ 25), at most perSeries per series,
 *    whose window ±windowFwhm × median FWHM holds exactly one peak and no other
 *    predicted line of ≥ isolationFraction of their intensity; that peak is the seed's position.
 * The seeds are marked source 'auto-seed' (the loop may exclude one the fit rejects). If the best
 * shift matches hardly more lines than chance does, a warning says the seeds are unreliable.
 * Limits: the constants other than origin and B (A, C, ζ, D) must already be close (their errors
 * grow with K and J, hence the low-K, low-J search); δ is applied only if upper.origin may float,
 * s and d only to the B's that may.
 * Source: cross-correlation of a predicted stick spectrum with the observed peaks, common practice
 * for a first assignment (e.g. the "shift and compare" start of Loomis–Wood analyses).
 * @param model first-guess model (cm^-1)
 * @param peaks peak list of the trace (cm^-1)
 * @param floatable keys the fit may float (see Limits)
 * @returns seeds, the shifted model and the search figures
 */
export function assistantSeedFromModel(
  model: BandModel,
  peaksInput: PeakList,
  floatable: readonly string[],
  options: AssistantSeedOptions = {},
): AssistantSeedResult {
  const peaks = assistantPeaksUsable(peaksInput).peaks;
  const bad = assistantPeaksCheck('assistantSeedFromModel', peaks);
  if (bad) throw new Error(bad);
  const o = { ...ASSISTANT_SEED_DEFAULTS, ...Object.fromEntries(Object.entries(options).filter(([, v]) => v !== undefined)) } as Required<
    Omit<AssistantSeedOptions, 'assistant'>
  >;
  checkSeedOptions(o);
  const assistant = assistantOptionsResolve(model, options.assistant);
  const context = assistantPeakContext(peaks, assistant.widthNeighbours, assistant.blendWidthRatio);
  const warnings: string[] = [];
  const empty = (why: string): AssistantSeedResult => ({
    lines: [],
    model,
    originShiftCm1: 0,
    upperBShiftCm1: 0,
    lowerBShiftCm1: 0,
    matchedFraction: 0,
    chanceFraction: 0,
    warnings: [...warnings, why],
  });
  if (peaks.count === 0) return empty('There are no peaks to seed from.');
  const lines = bandLines(model, { minIntensity: 1e-3 });
  if (lines.count === 0) return empty('The model predicts no lines.');
  const tau = context.medianFwhmCm1;

  // 1. Shift search on the strongest sub-band (all branches: where its Q lines pile up is a strong
  //    check against a shift by one rung). Parallel and linear bands: all lines with K'' ≤ 2,
  //    whose sub-bands nearly coincide.
  const isPerpendicularTop = model.band === 'perpendicular' && model.shape !== 'linear';
  const subKey = (i: number) => (isPerpendicularTop ? `${lines.deltaK[i]}:${lines.kLower[i]}` : 'all');
  const subBands = new Map<string, number[]>();
  for (let i = 0; i < lines.count; i++) {
    if (lines.kLower[i] > SEARCH_MAX_K || lines.jLower[i] > SEARCH_MAX_J) continue;
    const key = subKey(i);
    if (!subBands.has(key)) subBands.set(key, []);
    subBands.get(key)!.push(i);
  }
  const total = (idx: number[]) => idx.reduce((sum, i) => sum + lines.intensity[i], 0);
  const ranked = [...subBands.entries()].sort((x, y) => total(y[1]) - total(x[1]));
  if (ranked.length === 0) return empty('The model predicts no lines at low J and K to seed from.');
  const strongestOf = (idx: number[], jMax: number) =>
    idx
      .filter((i) => lines.jLower[i] <= jMax)
      .sort((x, y) => lines.intensity[y] - lines.intensity[x])
      .slice(0, o.searchLines);
  const termB = (j: number, k: number) => j * (j + 1) - k * k;
  const dSumOf = (i: number) => termB(lines.jUpper[i], lines.kUpper[i]) - termB(lines.jLower[i], lines.kLower[i]);
  const dDiffOf = (i: number) => 0.5 * (termB(lines.jUpper[i], lines.kUpper[i]) + termB(lines.jLower[i], lines.kLower[i]));
  const bRef = Math.abs(model.lower.B) > 0 ? Math.abs(model.lower.B) : Math.abs(model.upper.B);
  const [mainKey, mainLines] = ranked[0];
  // Coarse: low-J lines over the whole window; fine: all search lines near the coarse optimum.
  const coarse = shiftSearch(
    peaks,
    tau,
    strongestOf(mainLines, COARSE_MAX_J).slice(0, COARSE_LINES),
    lines.wavenumberCm1,
    dSumOf,
    dDiffOf,
    {
      deltaCentre: 0,
      deltaWindow: o.originWindowCm1,
      sumCentre: 0,
      sumWindow: o.bScaleWindow * bRef,
      diffCentre: 0,
      diffWindow: 2 * o.bScaleWindow * bRef,
    },
  );
  const fine = shiftSearch(peaks, tau, strongestOf(mainLines, SEARCH_MAX_J), lines.wavenumberCm1, dSumOf, dDiffOf, {
    deltaCentre: coarse.delta,
    deltaWindow: 3 * tau,
    sumCentre: coarse.sum,
    sumWindow: 2 * coarse.sumStep,
    diffCentre: coarse.diff,
    diffWindow: 2 * coarse.diffStep,
  });
  const best = { ...(fine.count >= coarse.count ? fine : coarse) };
  const matchedFraction = best.count / best.n;
  const chance = best.chance;
  const shiftText = `origin ${best.delta >= 0 ? '+' : ''}${best.delta.toFixed(4)} cm^-1, B′ ${signed(best.sum + best.diff / 2)}, B″ ${signed(best.sum - best.diff / 2)} cm^-1`;
  // A second shift (more than 2 FWHM away) that matches nearly as many lines means the ladder can
  // be laid on the peaks in two ways (one rung or one sub-band apart): seeding would be a guess.
  const margin = Math.max(SHIFT_MARGIN_MIN, SHIFT_MARGIN_FRACTION * coarse.count);
  const isAmbiguous = coarse.secondCount > coarse.count - margin;
  if (isAmbiguous && !coarse.second) {
    return empty(
      `The model's strongest lines fit the peaks about as well at two shifts more than 2 line widths apart ` +
        `(${coarse.count} and ${coarse.secondCount} of ${coarse.n} lines on peaks): the numbering or sub-band is ambiguous from the model alone; give seed lines.`,
    );
  }
  if (o.useRunnerUp) {
    if (!coarse.second) return empty('There is no runner-up shift to seed from.');
    Object.assign(best, coarse.second, { count: coarse.secondCount });
  }
  if (matchedFraction < 2 * chance + 0.1) {
    warnings.push(
      `The best shift (${shiftText}) puts ${(100 * matchedFraction).toFixed(0)} % of the strongest lines of sub-band ${mainKey} on a peak, chance alone ${(100 * chance).toFixed(0)} %: the model may be too far off to seed from it; give seed lines.`,
    );
  }

  // Apply what may float.
  const floats = new Set(floatable);
  const corrected: BandModel = { ...model, lower: { ...model.lower }, upper: { ...model.upper } };
  if (floats.has('upper.origin')) corrected.upper.origin += best.delta;
  if (floats.has('upper.B')) corrected.upper.B += best.sum + best.diff / 2;
  if (floats.has('lower.B')) corrected.lower.B += best.sum - best.diff / 2;

  // Every sub-band gets its own origin shift on top (first-guess errors of A, C and ζ move the
  // sub-bands against each other); one that matches no better than chance gives no seeds.
  const predicted = bandLines(corrected, { minIntensity: 1e-3 });
  const subShift = new Map<string, number>();
  const bySub = new Map<string, number[]>();
  const predictedKey = (i: number) => (isPerpendicularTop ? `${predicted.deltaK[i]}:${predicted.kLower[i]}` : 'all');
  for (let i = 0; i < predicted.count; i++) {
    if (predicted.kLower[i] > SEARCH_MAX_K || predicted.jLower[i] > SEARCH_MAX_J) continue;
    const key = predictedKey(i);
    if (!bySub.has(key)) bySub.set(key, []);
    bySub.get(key)!.push(i);
  }
  for (const [key, idx] of bySub) {
    const use = idx.sort((x, y) => predicted.intensity[y] - predicted.intensity[x]).slice(0, o.searchLines);
    const r = shiftSearch(
      peaks,
      tau,
      use,
      predicted.wavenumberCm1,
      () => 0,
      () => 0,
      {
        deltaCentre: 0,
        deltaWindow: key === mainKey ? 3 * tau : SUB_BAND_WINDOW_CM1,
        sumCentre: 0,
        sumWindow: 0,
        diffCentre: 0,
        diffWindow: 0,
      },
    );
    // The main sub-band's window is a few bins around the shift already found, so the median
    // over it measures the peak's own shoulders, not chance: its chance level is the search's.
    const chanceLevel = key === mainKey ? Math.min(r.chance, chance) : r.chance;
    if (r.n >= 3 && r.count / r.n >= 2 * chanceLevel + 0.1) subShift.set(key, r.delta);
  }

  // 2. Seeds: strongest isolated lines with exactly one peak in their window.
  const order = Int32Array.from({ length: predicted.count }, (_, i) => i).sort(
    (a, b) => predicted.wavenumberCm1[a] - predicted.wavenumberCm1[b],
  );
  const sortedNu = Float64Array.from(order, (i) => predicted.wavenumberCm1[i]);
  const half = o.windowFwhm * tau;
  const byIntensity = Int32Array.from({ length: predicted.count }, (_, i) => i)
    .filter((i) => subShift.has(predictedKey(i)) && predicted.kLower[i] <= SEARCH_MAX_K && predicted.jLower[i] <= SEARCH_MAX_J)
    .sort((a, b) => predicted.intensity[b] - predicted.intensity[a]);
  const perSeries = new Map<string, number>();
  const usedPeaks = new Set<number>();
  const seeds: AssistantLine[] = [];
  for (const i of byIntensity) {
    if (seeds.length >= o.count) break;
    const series = `${predicted.deltaK[i]}:${predicted.kLower[i]}:${predicted.deltaJ[i]}`;
    if ((perSeries.get(series) ?? 0) >= o.perSeries) continue;
    const subDelta = subShift.get(predictedKey(i))!;
    const x = predicted.wavenumberCm1[i] + subDelta;
    const [first, last] = assistantPeaksInRange(peaks, x - half, x + half);
    if (last !== first) continue;
    if (usedPeaks.has(first)) continue;
    if (!assistantLineIsolated(predicted, order, sortedNu, i, half + Math.abs(subDelta), o.isolationFraction)) continue;
    const p = first;
    usedPeaks.add(p);
    perSeries.set(series, (perSeries.get(series) ?? 0) + 1);
    const label = lineLabelAscii(predicted.deltaK[i], predicted.deltaJ[i], predicted.kLower[i], predicted.jLower[i], model.shape);
    const reason = `model-only seed: the only peak within ±${half.toPrecision(2)} cm^-1 of ${label} predicted at ${x.toFixed(4)} cm^-1 (after the shift ${shiftText} and ${subDelta >= 0 ? '+' : ''}${subDelta.toFixed(4)} cm^-1 for its sub-band), no comparable line predicted nearby`;
    const quanta = { jUpper: predicted.jUpper[i], kUpper: predicted.kUpper[i], jLower: predicted.jLower[i], kLower: predicted.kLower[i] };
    const place = { id: `${o.idPrefix}${seeds.length + 1}`, quanta, peak: p, predictedCm1: x, matchSigmaCm1: half / 3, reason };
    seeds.push(assistantSeedOnPeak(peaks, context, place, assistant.positionFloorFraction, assistant.blendUncertaintyFraction));
  }
  if (seeds.length < 3)
    warnings.push(`Only ${seeds.length} line(s) of the model have exactly one peak in their window; the loop may not get far.`);
  return {
    isAmbiguous,
    lines: seeds,
    model: corrected,
    originShiftCm1: best.delta,
    upperBShiftCm1: corrected.upper.B - model.upper.B,
    lowerBShiftCm1: corrected.lower.B - model.lower.B,
    matchedFraction,
    chanceFraction: chance,
    warnings,
  };
}

/**
 * No other predicted line of ≥ fraction × line i's intensity within ±half (cm^-1) of it.
 * @param order line indices sorted by wavenumber; sortedNu their wavenumbers (cm^-1)
 */
export function assistantLineIsolated(
  lines: ReturnType<typeof bandLines>,
  order: Int32Array,
  sortedNu: Float64Array,
  i: number,
  half: number,
  fraction: number,
): boolean {
  const x = lines.wavenumberCm1[i];
  let lo = 0;
  let hi = sortedNu.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (sortedNu[mid] < x - half) lo = mid + 1;
    else hi = mid;
  }
  for (let s = lo; s < sortedNu.length && sortedNu[s] <= x + half; s++) {
    const j = order[s];
    if (j !== i && lines.intensity[j] >= fraction * lines.intensity[i]) return false;
  }
  return true;
}
