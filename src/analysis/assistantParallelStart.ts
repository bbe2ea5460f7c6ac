/**
 * A model-only start for a parallel band of a symmetric top (ΔK = 0), where the shared shift of
 * assistantSeedFromModel cannot work: the K components of each J cluster lie within a few line
 * widths, and a first-guess error of Δ(A − B) (or Δ(C − B)) and of DJK moves K = 1, 2, … by several
 * widths, each by its own amount (∝ K² and ∝ m K²), so no predicted line is alone in its window.
 *
 * The start fixes the ladder in stages, each a grid search (gridSearch) of an origin shift and up
 * to three constants, scored by the number of distinct peaks within τ/2 of a predicted line (τ the
 * median peak FWHM; each peak counts once, so piling K components onto one peak cannot win), and
 * accepted only when it beats chance by CHANCE_Z binomial σ:
 * 1. the P/R clusters next to the band gap (|m| ≤ GAP_MAX_M, every K ≤ J): origin, B′ + B″, B′ − B″
 *    and the upper unique constant (A′ or C′: a parallel band fixes only A′ − A″);
 * 2. the K'' ≤ COMB_MAX_K lines out to |m| = COMB_MAX_M (the J comb): B′ + B″, B′ − B″ and
 *    DJ′ = DJ″;
 * 3. the K'' > COMB_MAX_K lines there: the unique constant and DJK′ = DJK″ (−2 m K² per unit).
 * Stages 2 and 3 must also put MIN_MATCHED_FRACTION of their lines on a peak. The P/R ladder
 * relabelled by one rung is the same parabola with the gap moved, so positions next to the gap
 * hardly tell numberings a rung apart: every numbering (origin more than B from the best) that
 * beats chance in stage 1 goes through stages 2 and 3; the one with most lines on peaks there is
 * the start, a second within the margin (MARGIN_MIN, MARGIN_FRACTION) its runner-up, for the
 * caller to run as a rival hypothesis.
 * Seeds are then the strongest predicted P/R lines with |m| ≤ SEED_MAX_M, at most SEED_PER_K per
 * K'', that have exactly one peak within SEED_WINDOW_FWHM widths, that peak within τ/3, and no other
 * predicted line of ≥ SEED_ISOLATION of their intensity in that window.
 * Source: the J structure of a parallel band, ν = ν0 + (B′ + B″)m + (B′ − B″)m² + [Δ(A − B)]K² − …,
 * Herzberg II (1945) ch. IV §2; the search is the cross-correlation of a predicted stick spectrum
 * with the peaks (common practice), applied stage by stage.
 */
import { bandLines } from '../physics/bandLines';
import { lineLabelAscii } from '../physics/lineLabel';
import type { BandModel, LineList } from '../physics/model';
import { assistantOptionsResolve } from './assistantOptions';
import { assistantPeakContext, assistantPeaksInRange, assistantSeedOnPeak } from './assistantPeakContext';
import { assistantLineIsolated } from './assistantSeedFromModel';
import type { AssistantLine } from './assistantTypes';
import type { PeakList } from './peaksFind';

/** Clusters nearest the band gap used in stage 1 (|m| ≤ this). */
const GAP_MAX_M = 7;
/** Stage 2 and 3 use lines with |m| ≤ this. */
const COMB_MAX_M = 15;
/** Stage 2 uses lines with K'' ≤ this (their K² terms stay small). */
const COMB_MAX_K = 2;
/** Seeds are taken from lines with |m| ≤ this (where the stages placed the ladder). */
const SEED_MAX_M = 15;
/** Lines per stage (strongest first). */
const STAGE_LINES = 160;
/** Seeds: window half width, median FWHM. */
const SEED_WINDOW_FWHM = 1;
/** Seeds: other predicted lines of at least this fraction of the seed's intensity must not lie in its window. */
const SEED_ISOLATION = 0.3;
/** Most seeds, and most per K''. */
const SEED_COUNT = 16;
const SEED_PER_K = 2;
/**
 * A runner-up numbering is kept when its stages 2 and 3 put at least the best's count minus
 * max(MARGIN_MIN, MARGIN_FRACTION × that count) lines on peaks (the margin of
 * assistantSeedFromModel: rule of thumb).
 */
const MARGIN_MIN = 3;
const MARGIN_FRACTION = 0.15;
/** A stage's best count must lie at least this many binomial σ above what chance gives (the median count over the grid). */
const CHANCE_Z = 5;
/** Lines used must be predicted at least this many times the weakest peak's relative height. */
const VISIBLE_FACTOR = 3;
/**
 * Stages 2 and 3 must put at least this fraction of their lines on a peak (rule of thumb: out to
 * |m| = COMB_MAX_M a right ladder explains most of its visible lines; stage 1 is exempt, since the
 * unresolved clusters next to the gap give fewer peaks than lines).
 */
const MIN_MATCHED_FRACTION = 0.5;

/** Outcome of assistantParallelStart. */
export interface AssistantParallelStart {
  /** Seeds (status 'seed', source 'auto-seed'), empty when the start refuses. */
  lines: AssistantLine[];
  /** The first guess with every stage's change applied (start values for the loop). */
  model: BandModel;
  /** What each stage found, or why the start refused. */
  text: string;
  /**
   * A start a rung away that fits the clusters next to the band gap about as well (seeds and
   * model), to be run as a rival hypothesis; absent when the numbering was clear.
   */
  runnerUp?: { lines: AssistantLine[]; model: BandModel };
}

type Stage = { name: string; result: GridBest };

/** What a stage may change: the origin, B′ + B″, B′ − B″, the upper unique constant, DJ′ = DJ″, DJK′ = DJK″. */
type Dim = 'delta' | 'sum' | 'diff' | 'unique' | 'dj' | 'djk' | 'none';

/** ∂ν/∂x of line i for the constants the stages change (K′ = K″ = K). */
function derivatives(lines: LineList, i: number) {
  const jU = lines.jUpper[i];
  const jL = lines.jLower[i];
  const k2 = lines.kLower[i] * lines.kLower[i];
  const xU = jU * (jU + 1);
  const xL = jL * (jL + 1);
  return {
    /** B′ and B″ both up by s. */
    sum: xU - xL,
    /** B′ up by d/2, B″ down by d/2. */
    diff: 0.5 * (xU - k2 + xL - k2),
    /** The upper unique constant (A′ or C′) up by a. */
    unique: k2,
    /** DJ′ and DJ″ both up by c. */
    dj: -(xU * xU - xL * xL),
    /** DJK′ and DJK″ both up by b. */
    djk: -k2 * (xU - xL),
  };
}

function mOf(lines: LineList, i: number): number {
  return lines.deltaJ[i] > 0 ? lines.jLower[i] + 1 : lines.deltaJ[i] < 0 ? -lines.jLower[i] : 0;
}

/**
 * Model-only start of a parallel symmetric-top band (see the file comment).
 * @param model first guess (cm^-1); must be a parallel band of a prolate or oblate top
 * @param peaks the trace's peak list (ascending, cm^-1)
 * @param floatable keys the fit may float: upper.origin, upper.B, lower.B and the upper unique
 *   constant are needed; DJK is searched only when upper.DJK and lower.DJK may float
 * @returns seeds, the corrected model and what was found (or why nothing was)
 */
export function assistantParallelStart(model: BandModel, peaks: PeakList, floatable: readonly string[]): AssistantParallelStart {
  const refuse = (why: string): AssistantParallelStart => ({ lines: [], model, text: `parallel start refused: ${why}` });
  if (model.band !== 'parallel' || model.shape === 'linear') return refuse('not a parallel band of a symmetric top');
  const unique = model.shape === 'prolate' ? 'A' : 'C';
  const floats = new Set(floatable);
  for (const k of ['upper.origin', 'upper.B', 'lower.B', `upper.${unique}`])
    if (!floats.has(k)) return refuse(`${k} is held fixed; the start needs it free`);
  const hasDjk = floats.has('upper.DJK') && floats.has('lower.DJK');
  const hasDj = floats.has('upper.DJ') && floats.has('lower.DJ');
  if (peaks.count < 10) return refuse(`only ${peaks.count} peaks`);
  const context = assistantPeakContext(peaks);
  // Lines expected above the peak finder's threshold: the weakest peak found, relative to the
  // strongest (which the strongest predicted line, intensity 1, roughly is), times VISIBLE_FACTOR.
  let hMin = Infinity;
  let hMax = 0;
  for (let p = 0; p < peaks.count; p++) {
    hMin = Math.min(hMin, peaks.height[p]);
    hMax = Math.max(hMax, peaks.height[p]);
  }
  const visible = hMax > 0 ? (VISIBLE_FACTOR * hMin) / hMax : 0;
  const tau = context.medianFwhmCm1;
  const bRef = Math.abs(model.lower.B);
  const uRef = Math.max(Math.abs(model.lower[unique]), Math.abs(model.upper[unique]));
  // Windows: the first-guess errors a user makes (origin 0.4 cm^-1, B 0.5 %, A or C 1 % in both
  // states, which leaves their difference off by a few tenths of a per cent), with room to spare.
  const originWindow = 0.6;
  const sumWindow = 0.006 * bRef;
  const diffWindow = 0.003 * bRef;
  const uniqueWindow = 0.004 * uRef + 0.002 * bRef;
  const djkWindow = 1e-4 * bRef;
  const djWindow = 1e-5 * bRef;

  const apply = (m: BandModel, delta: number, dims: readonly Dim[], values: readonly number[]): BandModel => {
    const next: BandModel = { ...m, lower: { ...m.lower }, upper: { ...m.upper } };
    next.upper.origin += delta;
    dims.forEach((dim, k) => {
      const v = values[k];
      if (dim === 'sum') {
        next.upper.B += v;
        next.lower.B += v;
      } else if (dim === 'diff') {
        next.upper.B += v / 2;
        next.lower.B -= v / 2;
      } else if (dim === 'unique') next.upper[unique] += v;
      else if (dim === 'dj') {
        next.upper.DJ += v;
        next.lower.DJ += v;
      } else if (dim === 'djk') {
        next.upper.DJK += v;
        next.lower.DJK += v;
      }
    });
    return next;
  };
  /** One stage's grid search (gridSearch) on the lines `keep` selects, predicted by model `from`. */
  const search = (
    from: BandModel,
    name: string,
    keep: (lines: LineList, i: number) => boolean,
    dims: [Dim, Dim, Dim],
    windows: [number, number, number, number],
  ): { stage: Stage; best: BandModel; others: { model: BandModel; count: number }[] } | string => {
    const lines = bandLines(from, { minIntensity: 1e-4 });
    const idx: number[] = [];
    for (let i = 0; i < lines.count; i++) if (keep(lines, i)) idx.push(i);
    idx.sort((x, y) => lines.intensity[y] - lines.intensity[x]);
    const use = idx.slice(0, STAGE_LINES).filter((i) => lines.intensity[i] >= visible);
    if (use.length < 6) return `${name}: only ${use.length} predicted lines expected above the noise`;
    const at = new Map(use.map((i) => [i, derivatives(lines, i)]));
    const pick = (dim: Dim) => (i: number) => (dim === 'none' || dim === 'delta' ? 0 : at.get(i)![dim]);
    const derivs: [(i: number) => number, (i: number) => number, (i: number) => number] = [pick(dims[0]), pick(dims[1]), pick(dims[2])];
    const r = gridSearch(peaks, tau, use, lines.wavenumberCm1, derivs, windows, bRef);
    if (r.isCoarse) {
      // Refine around the best of the coarse pass (its rivals and chance level stand).
      const shifted = Float64Array.from(lines.wavenumberCm1, (v) => v + r.delta);
      const fine = gridSearch(peaks, tau, use, shifted, derivs, [2 * tau, 2 * r.steps[0], 2 * r.steps[1], 2 * r.steps[2]], bRef, r.values);
      if (fine.count >= r.count) Object.assign(r, { delta: r.delta + fine.delta, values: fine.values, count: fine.count });
    }
    const chanceCount = r.chance * r.n;
    if (r.count < chanceCount + CHANCE_Z * Math.sqrt(Math.max(chanceCount * (1 - r.chance), 1)))
      return `${name}: the best setting puts ${r.count} of ${r.n} lines on a peak, hardly more than chance (${(100 * r.chance).toFixed(0)} %)`;
    const passes = (count: number) => count >= chanceCount + CHANCE_Z * Math.sqrt(Math.max(chanceCount * (1 - r.chance), 1));
    return {
      stage: { name, result: r },
      best: apply(from, r.delta, dims, r.values),
      others: r.others.filter((o) => passes(o.count)).map((o) => ({ model: apply(from, o.delta, dims, o.values), count: o.count })),
    };
  };
  const describe = (stages: Stage[]) =>
    stages
      .map(
        (s) =>
          `${s.name}: ${s.result.count} of ${s.result.n} lines on a peak (chance ${(100 * s.result.chance).toFixed(0)} %, a rung away ${s.result.rival?.count ?? 0})`,
      )
      .join('; ');
  /** Stages 2 and 3 and the seeds from the model stage 1 left. */
  const finish = (from: BandModel, stages: Stage[]): { lines: AssistantLine[]; model: BandModel; text: string; score: number } => {
    let at = from;
    const steps: [string, (l: LineList, i: number) => boolean, [Dim, Dim, Dim], [number, number, number, number]][] = [
      [
        'the J comb',
        (l, i) => Math.abs(mOf(l, i)) <= COMB_MAX_M && l.deltaJ[i] !== 0 && l.kLower[i] <= COMB_MAX_K,
        ['sum', 'diff', hasDj ? 'dj' : 'none'],
        [2 * tau, sumWindow / 3, diffWindow / 3, hasDj ? djWindow : 0],
      ],
      [
        'the K structure',
        (l, i) => Math.abs(mOf(l, i)) <= COMB_MAX_M && l.kLower[i] > COMB_MAX_K,
        ['unique', hasDjk ? 'djk' : 'none', 'none'],
        [2 * tau, uniqueWindow / 4, hasDjk ? djkWindow : 0, 0],
      ],
    ];
    for (const [name, keep, dims, windows] of steps) {
      const r = search(at, name, keep, dims, windows);
      if (typeof r === 'string') return { lines: [], model: at, text: `parallel start refused: ${describe(stages)}; ${r}`, score: 0 };
      const { count, n } = r.stage.result;
      if (count < MIN_MATCHED_FRACTION * n) {
        const why = `${name}: the best setting puts only ${count} of ${n} lines expected above the noise on a peak`;
        return { lines: [], model: at, text: `parallel start refused: ${describe(stages)}; ${why}`, score: 0 };
      }
      stages.push(r.stage);
      at = r.best;
    }
    const options = assistantOptionsResolve(at);
    const seeds = pickSeeds(at, peaks, context, tau, options.positionFloorFraction, options.blendUncertaintyFraction);
    const score = stages.slice(1).reduce((sum, st) => sum + st.result.count, 0);
    if (seeds.length < 3)
      return { lines: [], model: at, text: `parallel start refused: ${describe(stages)}; only ${seeds.length} isolated lines`, score: 0 };
    return { lines: seeds, model: at, text: `parallel start: ${describe(stages)}; ${seeds.length} seeds`, score };
  };

  const gap = search(
    model,
    'clusters next to the band gap',
    (l, i) => Math.abs(mOf(l, i)) <= GAP_MAX_M && l.deltaJ[i] !== 0,
    ['sum', 'unique', 'diff'],
    [originWindow, sumWindow, uniqueWindow, diffWindow],
  );
  if (typeof gap === 'string') return refuse(gap);
  // The P/R ladder relabelled by one rung is the same parabola with the gap moved, so the clusters
  // next to the gap may fit other numberings nearly as well: each numbering that beats chance there
  // goes through stages 2 and 3, and the one whose J comb and K structure put the most lines on
  // peaks is the start; a second within the margin is its runner-up (run as a rival hypothesis).
  const chains = [gap.best, ...gap.others.map((o) => o.model)].map((m) => finish(m, [gap.stage]));
  const passed = chains.filter((c) => c.lines.length > 0).sort((x, y) => y.score - x.score);
  const tried = chains.length > 1 ? ` (${chains.length} numberings tried, ${passed.length} passed every stage)` : '';
  if (passed.length === 0) return { lines: [], model, text: chains[0].text + tried };
  const [main, second] = passed;
  const margin = Math.max(MARGIN_MIN, MARGIN_FRACTION * main.score);
  const isClose = second !== undefined && second.score > main.score - margin;
  return {
    lines: main.lines,
    model: main.model,
    text:
      main.text +
      tried +
      (isClose ? `; a numbering a rung away fits nearly as well (${second.score} against ${main.score} lines): both are run` : ''),
    runnerUp: isClose ? { lines: second.lines, model: second.model } : undefined,
  };
}

function pickSeeds(
  model: BandModel,
  peaks: PeakList,
  context: ReturnType<typeof assistantPeakContext>,
  tau: number,
  floor: number,
  blend: number,
): AssistantLine[] {
  const lines = bandLines(model, { minIntensity: 1e-3 });
  const order = Int32Array.from({ length: lines.count }, (_, i) => i).sort((a, b) => lines.wavenumberCm1[a] - lines.wavenumberCm1[b]);
  const sortedNu = Float64Array.from(order, (i) => lines.wavenumberCm1[i]);
  const half = SEED_WINDOW_FWHM * tau;
  const byIntensity = Array.from({ length: lines.count }, (_, i) => i)
    .filter((i) => lines.deltaJ[i] !== 0 && Math.abs(mOf(lines, i)) <= SEED_MAX_M)
    .sort((a, b) => lines.intensity[b] - lines.intensity[a]);
  const perK = new Map<number, number>();
  const used = new Set<number>();
  const seeds: AssistantLine[] = [];
  for (const i of byIntensity) {
    if (seeds.length >= SEED_COUNT) break;
    const k = lines.kLower[i];
    if ((perK.get(k) ?? 0) >= SEED_PER_K) continue;
    const x = lines.wavenumberCm1[i];
    const [first, last] = assistantPeaksInRange(peaks, x - half, x + half);
    if (last !== first || used.has(first)) continue;
    if (Math.abs(peaks.wavenumberCm1[first] - x) > tau / 3) continue;
    if (!assistantLineIsolated(lines, order, sortedNu, i, half, SEED_ISOLATION)) continue;
    used.add(first);
    perK.set(k, (perK.get(k) ?? 0) + 1);
    const label = lineLabelAscii(0, lines.deltaJ[i], k, lines.jLower[i], model.shape);
    const reason = `model-only seed (parallel start): the only peak within ±${half.toPrecision(2)} cm^-1 of ${label} predicted at ${x.toFixed(4)} cm^-1, no comparable line predicted nearby`;
    const quanta = { jUpper: lines.jUpper[i], kUpper: lines.kUpper[i], jLower: lines.jLower[i], kLower: k };
    const place = { id: `pseed${seeds.length + 1}`, quanta, peak: first, predictedCm1: x, matchSigmaCm1: half / 3, reason };
    seeds.push(assistantSeedOnPeak(peaks, context, place, floor, blend));
  }
  return seeds;
}

/** One setting of gridSearch: origin shift (cm^-1), the three constants' changes (cm^-1), distinct peaks matched. */
interface GridSetting {
  delta: number;
  values: [number, number, number];
  count: number;
}

/** Most (δ bin, peak) cells gridSearch keeps track of (an Int32Array of this length: 20 MB). */
const STAMP_MAX = 5_000_000;

/** Other numberings gridSearch reports. */
const GRID_OTHERS = 4;

/** Best setting of gridSearch. */
interface GridBest {
  /** Origin shift, cm^-1. */
  delta: number;
  /** Changes of the three constants searched (cm^-1). */
  values: [number, number, number];
  /** Distinct peaks within τ/2 of a line at the best setting. */
  count: number;
  /** Lines used. */
  n: number;
  /** Median count over the grid / n (what chance coincidences give). */
  chance: number;
  /** The best setting whose origin shift differs from the best by more than B (another numbering), or null. */
  rival: GridSetting | null;
  /** Grid steps of the three constants (cm^-1; 0 where not searched). */
  steps: [number, number, number];
  /** The steps are coarser than τ at the farthest line (GRID_MAX_POINTS): refine around the best. */
  isCoarse: boolean;
  /** The best settings of other numberings (origin shifts more than B from the best and from each other), best first, at most GRID_OTHERS. */
  others: GridSetting[];
}

/** Most grid steps on each side per constant. */
const GRID_MAX_STEPS = 120;
/** Most grid points of the three constants in one pass (bounds the time: a pass costs points × lines × peaks in the δ window). */
const GRID_MAX_POINTS = 20_000;

/**
 * Grid search of an origin shift δ and three constants (a, b, c) for the setting that puts the most
 * distinct peaks within τ/2 of a line at ν_i + δ + a·∂ν_i/∂a + b·∂ν_i/∂b + c·∂ν_i/∂c. Each peak counts
 * once (lines predicted on top of each other cannot all claim one peak: otherwise a setting that piles
 * every K component onto one peak would win). δ by a histogram in steps of τ/2 within ±windows[0];
 * a, b, c in steps that move their farthest line by τ (at most GRID_MAX_STEPS per side). Ties go
 * to the smallest change.
 * Source: discrete cross-correlation of predicted line positions with the observed peaks (common
 * practice), with one-to-one matching.
 */
function gridSearch(
  peaks: PeakList,
  tau: number,
  idx: readonly number[],
  position: Float64Array,
  derivs: [(i: number) => number, (i: number) => number, (i: number) => number],
  windows: [number, number, number, number],
  rungCm1: number,
  centres: [number, number, number] = [0, 0, 0],
): GridBest {
  const n = idx.length;
  const nu = Float64Array.from(idx, (i) => position[i]);
  const d = derivs.map((f) => Float64Array.from(idx, f));
  const wanted = d.map((col, k) => {
    let max = 0;
    for (const v of col) max = Math.max(max, Math.abs(v));
    const w = windows[k + 1];
    return !(max > 0) || !(w > 0) ? 0 : Math.min(GRID_MAX_STEPS, Math.ceil((w * max) / tau));
  });
  // Too many grid points: fewer, coarser steps (the caller refines around the best).
  const points = wanted.reduce((p, c) => p * (2 * c + 1), 1);
  const shrink = points > GRID_MAX_POINTS ? (points / GRID_MAX_POINTS) ** (1 / wanted.filter((c) => c > 0).length) : 1;
  const counts = wanted.map((c) => (c > 0 ? Math.max(1, Math.floor(c / shrink)) : 0));
  const steps = counts.map((c, k) => (c > 0 ? windows[k + 1] / c : 0)) as [number, number, number];
  const grid = counts.map((c, k) => Array.from({ length: 2 * c + 1 }, (_, s) => centres[k] + (s - c) * steps[k]));
  // Bins of τ/2, wider when bins × peaks would exceed STAMP_MAX (memory of the stamp array).
  const binWidth = Math.max(tau / 2, (2 * windows[0] * peaks.count) / STAMP_MAX);
  const nDelta = Math.max(1, Math.ceil(windows[0] / binWidth));
  // A line matches a bin when its peak lies within τ/2 of the bin's shift (half a bin where bins are wider).
  const reach = Math.max(tau, binWidth) / 2;
  const bins = 2 * nDelta + 1;
  const score = new Int32Array(bins);
  // stamp[b * peaks.count + p] === generation: peak p already counted in bin b at this grid point.
  const stamp = new Int32Array(bins * peaks.count);
  let generation = 0;
  const histogram = new Float64Array(n + 1);
  const bestPerBin = new Int32Array(bins);
  const valuesPerBin: [number, number, number][] = Array.from({ length: bins }, () => [0, 0, 0]);
  let best: GridBest = { delta: 0, values: [...centres], count: -1, n, chance: 0, rival: null, others: [], steps, isCoarse: shrink > 1 };
  let bestCost = Infinity;
  for (const a of grid[0]) {
    for (const b of grid[1]) {
      for (const c of grid[2]) {
        generation++;
        score.fill(0);
        for (let k = 0; k < n; k++) {
          const x = nu[k] + a * d[0][k] + b * d[1][k] + c * d[2][k];
          const [first, last] = assistantPeaksInRange(peaks, x - (nDelta + 1) * binWidth, x + (nDelta + 1) * binWidth);
          for (let p = first; p <= last; p++) {
            const shift = peaks.wavenumberCm1[p] - x;
            // Bins whose centre lies within τ/2 of the shift.
            const lo = Math.max(0, Math.ceil((shift - reach) / binWidth + nDelta));
            const hi = Math.min(bins - 1, Math.floor((shift + reach) / binWidth + nDelta));
            for (let bin = lo; bin <= hi; bin++) {
              const at = bin * peaks.count + p;
              if (stamp[at] === generation) continue;
              stamp[at] = generation;
              score[bin]++;
            }
          }
        }
        for (let bin = 0; bin < bins; bin++) {
          const v = Math.min(n, score[bin]);
          histogram[v]++;
          if (v > bestPerBin[bin]) {
            bestPerBin[bin] = v;
            valuesPerBin[bin] = [a, b, c];
          }
          if (v < best.count) continue;
          const cost =
            Math.abs(bin - nDelta) / nDelta +
            grid.reduce((sum, g, k) => sum + (counts[k] > 0 ? Math.abs([a, b, c][k] - centres[k]) / windows[k + 1] : 0), 0);
          if (v > best.count || cost < bestCost) {
            best = { ...best, delta: (bin - nDelta) * binWidth, values: [a, b, c], count: v };
            bestCost = cost;
          }
        }
      }
    }
  }
  let cells = 0;
  for (const h of histogram) cells += h;
  let seen = 0;
  for (let v = 0; v <= n; v++) {
    seen += histogram[v];
    if (seen >= cells / 2) {
      best.chance = n > 0 ? v / n : 0;
      break;
    }
  }
  const order = Array.from({ length: bins }, (_, bin) => bin).sort((x, y) => bestPerBin[y] - bestPerBin[x]);
  for (const bin of order) {
    if (best.others.length >= GRID_OTHERS) break;
    const delta = (bin - nDelta) * binWidth;
    if ([best, ...best.others].some((o) => Math.abs(delta - o.delta) <= rungCm1)) continue;
    best.others.push({ delta, values: valuesPerBin[bin], count: bestPerBin[bin] });
  }
  best.rival = best.others[0] ?? null;
  if (best.count < 0) best.count = 0;
  return best;
}
