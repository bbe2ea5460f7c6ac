/**
 * The assistant's whole run from its start, shared by the `assign` command and the page's worker
 * job: the seeds (the user's, joined by the model's when they leave the band open; or from the model
 * alone), the auto-extend loop, and for a model-only start every further attempt that decides the
 * labels (a relabelled repeat, the search's runner-up shift, the comb of a perpendicular top's
 * sub-bands and its relabellings, the Π–Σ Q-branch search, the staged start of a parallel top).
 * Both fronts then write (or offer as confident) only what `assistantRunReview` does not hold back.
 * Pure: plain data in, a run out; progress and cancellation through optional callbacks.
 */
import { assignmentCheck } from '../fit/assignment';
import { bandLines } from '../physics/bandLines';
import { lineLabelAscii } from '../physics/lineLabel';
import type { BandModel } from '../physics/model';
import { assistantAutoExtend, AssistantCancelledError } from './assistantAutoExtend';
import { assistantLabelShift, LABEL_DECISIVE_MARGIN, type AssistantLabelShift } from './assistantLabelCheck';
import { assistantParallelStart } from './assistantParallelStart';
import { assistantPeakContext } from './assistantPeakContext';
import { assistantPosteriorFit, assistantPosteriorSigmas, assistantPriorSigmas } from './assistantPosterior';
import { assistantQBranchSearch } from './assistantQBranchSearch';
import { assistantQHeadStart } from './assistantQHeadStart';
import { assistantSeedFromModel } from './assistantSeedFromModel';
import type { AssistantLine, AssistantOptions, AssistantRunResult, AssistantSuspect } from './assistantTypes';
import type { PeakList } from './peaksFind';

/** Inputs of assistantStartRun. */
export interface AssistantStartRunInput {
  /** The first guess (cm^-1, K); a model-only start shifts it before the loop. */
  model: BandModel;
  /** Keys the fits may float (e.g. ModelFile.floated). */
  floatable: readonly string[];
  /** Usable peaks of the trace (assistantPeaksUsable), ascending, at least one. */
  peaks: PeakList;
  /** The user's seed lines (never changed by the loop); none for a start from the model alone. */
  seeds: readonly AssistantLine[];
  /**
   * Lines carried unchanged into every run, repeat and relabelling and never relabelled themselves,
   * e.g. pairs rejected in an earlier review (status 'rejected': the loop never offers them again).
   * @default []
   */
  fixedLines?: readonly AssistantLine[];
  /** Options of every loop (e.g. toleranceSigma). */
  options?: AssistantOptions;
  /**
   * Progress: the round of the loop now running (1-based; 0 for a search between runs), the stage in
   * words (which attempt, then what the round did) and the lines that run has added so far.
   */
  onProgress?: (round: number, stage: string, rowsSoFar: number) => void;
  /** Polled between attempts and once per round of each loop; true stops with AssistantCancelledError. */
  isCancelled?: () => boolean;
}

/** Which lines of a finished run are written, flagged or held for review (ids of AssistantLine). */
export interface AssistantRunReview {
  /** Lines the misassignment hunt distrusts. */
  suspect: Set<string>;
  /** Suspects distrusted only for a small residual with no other rung on offer (isPulledOnly). */
  pulled: Set<string>;
  /** Machine-made lines held for review, never written: every one of a doubtful run, else the suspects not pulled-only. */
  held: Set<string>;
}

/** Outcome of assistantStartRun. */
export interface AssistantStartRunResult {
  /** The run chosen, or null when a model-only start found no seed line (`note` may say why). */
  run: AssistantRunResult | null;
  /** The model the chosen run started from (the first guess, shifted by a model-only start). */
  model: BandModel;
  /** The seeds the chosen run started from (relabelled or extended where an attempt was kept). */
  seeds: AssistantLine[];
  /** The seeds of the first run: the user's followed by any from the model, or the model-only start's. */
  startSeeds: AssistantLine[];
  /** With user seeds: how many seeds from the model alone joined them (0 otherwise). */
  nModelSeeds: number;
  /** Model-only start: the origin and B changes applied before the first run, cm^-1; null with user seeds. */
  shifts: { originShiftCm1: number; upperBShiftCm1: number; lowerBShiftCm1: number } | null;
  /** What the start said on the way (seed search warnings, the model's seeds joining the user's), in order. */
  notes: string[];
  /**
   * What the attempts after the start did, to follow the start's own description: '' or text
   * beginning with '; ', ', ' or ' (' (ASCII units, as the `assign` command prints it).
   */
  note: string;
  /** The run's classification (null without a run). */
  review: AssistantRunReview | null;
}

/** Everything each attempt shares. */
interface RunContext {
  floatable: readonly string[];
  peaks: PeakList;
  fixed: readonly AssistantLine[];
  options: AssistantOptions | undefined;
  onProgress: AssistantStartRunInput['onProgress'];
  isCancelled: AssistantStartRunInput['isCancelled'];
}

/** One attempt's outcome: its run, the seeds it started from, and what it did (appended to the start's text). */
interface Attempt {
  run: AssistantRunResult;
  seeds: AssistantLine[];
  note: string;
}

/**
 * Run the assistant from its start (see the file comment). With user seeds: seeds from the model
 * alone join them when they leave the band's strongest lines open (seedsFromModelToo), then one run
 * of the loop. From the model alone (no seeds): the shared shift of assistantSeedFromModel (or, for
 * a parallel top it cannot seed, the staged start of assistantParallelStart), the run repeated from
 * relabelled seeds when a rival labelling wins decisively, a perpendicular top's sub-band comb, a
 * Π–Σ band's Q-branch search, the search's runner-up shift run as a rival (kept only with
 * RIVAL_FACTOR times the lines, or when both reach the same labels; otherwise the run is doubtful),
 * and the staged start of a parallel top whose run writes nothing (kept only when decided).
 * @returns the run chosen and what was done; run null when no seed could be picked from the model
 * @throws AssistantCancelledError when isCancelled says so; Error for invalid lines or options (from the loop)
 */
export function assistantStartRun(input: AssistantStartRunInput): AssistantStartRunResult {
  const { floatable, peaks } = input;
  const ctx: RunContext = {
    floatable,
    peaks,
    fixed: input.fixedLines ?? [],
    options: input.options,
    onProgress: input.onProgress,
    isCancelled: input.isCancelled,
  };
  const notes: string[] = [];
  if (input.seeds.length > 0) {
    cancelCheck(ctx);
    ctx.onProgress?.(0, 'checking whether the lines given pin the band down', 0);
    const extra = seedsFromModelToo(input.model, floatable, peaks, assistantPeakContext(peaks).medianFwhmCm1, input.seeds);
    notes.push(...extra.notes);
    const seeds = [...input.seeds, ...extra.lines];
    const run = loop(ctx, '', input.model, seeds);
    return {
      run,
      model: input.model,
      seeds,
      startSeeds: seeds,
      nModelSeeds: extra.lines.length,
      shifts: null,
      notes,
      note: '',
      review: assistantRunReview(run),
    };
  }
  cancelCheck(ctx);
  ctx.onProgress?.(0, "searching for the shift of the model's ladder", 0);
  let seeded = assistantSeedFromModel(input.model, peaks, floatable);
  notes.push(...seeded.warnings);
  let rival: { model: BandModel; lines: AssistantLine[] } | null = null;
  let stagedNote = '';
  // A parallel band of a symmetric top the shared shift cannot seed: the staged start (assistantParallelStart).
  if (seeded.lines.length === 0 && isParallelTop(input.model)) {
    cancelCheck(ctx);
    ctx.onProgress?.(0, 'staged start of a parallel band', 0);
    const par = assistantParallelStart(input.model, peaks, floatable);
    stagedNote = `; ${par.text}`;
    if (par.lines.length)
      seeded = { ...seeded, lines: par.lines, model: par.model, isAmbiguous: false, ...shiftsOf(par.model, input.model) };
    if (par.runnerUp) rival = par.runnerUp;
  }
  const shifts = { originShiftCm1: seeded.originShiftCm1, upperBShiftCm1: seeded.upperBShiftCm1, lowerBShiftCm1: seeded.lowerBShiftCm1 };
  if (seeded.lines.length === 0)
    return { run: null, model: input.model, seeds: [], startSeeds: [], nModelSeeds: 0, shifts, notes, note: stagedNote, review: null };
  let model = seeded.model;
  const startSeeds = seeded.lines;
  if (seeded.isAmbiguous) {
    const runnerUp = assistantSeedFromModel(input.model, peaks, floatable, { useRunnerUp: true });
    if (runnerUp.lines.length) rival = { model: runnerUp.model, lines: runnerUp.lines };
  }
  let note = stagedNote;
  const first = runFromModel(ctx, 'first run', model, startSeeds);
  let run = first.run;
  let seeds = first.seeds;
  note += first.note;
  if (rival) {
    // Two shifts of the model's ladder match the peaks about equally well: run both and keep the
    // one the trace supports clearly better (more lines, no doubt), or either when both reach the
    // same labels; if neither, nothing is written as an assignment.
    const second = runFromModel(ctx, 'runner-up shift', rival.model, rival.lines);
    const other = second.run;
    const a = runSupport(run);
    const b = runSupport(other);
    const agreement = a > 0 && b > 0 ? runsAgreement(run, other) : null;
    if (agreement && agreement.conflicts === 0 && agreement.shared >= RUNS_SHARED_FRACTION * Math.min(a, b)) {
      if (b > a) {
        run = other;
        model = rival.model;
        seeds = second.seeds;
        note += second.note;
      }
      note += ` (the runner-up shift of the search leads to the same labels: ${agreement.shared} lines in common, none labelled otherwise; ${Math.max(a, b)} lines kept)`;
    } else if (b > RIVAL_FACTOR * a) {
      run = other;
      model = rival.model;
      seeds = second.seeds;
      note += `${second.note} (the runner-up shift of the search: the trace supports it with ${b} lines against ${a})`;
    } else if (!(a > RIVAL_FACTOR * b)) {
      run.doubt =
        `two shifts of the model's ladder fit the peaks about equally well and lead to ${a} and ${b} consistent lines` +
        (agreement ? ` (${agreement.conflicts} peak(s) or line(s) labelled differently)` : '') +
        `: the numbering is not decided by the trace; give seed lines`;
      run.warnings.push(run.doubt);
    } else {
      note += ` (preferred over the runner-up shift of the search: ${a} lines against ${b})`;
    }
  }
  // A parallel symmetric-top band whose shared-shift start led to a run that writes nothing: the
  // staged start (assistantParallelStart) and its run, kept only when decided.
  if (isParallelTop(model) && !stagedNote && runSupport(run) === 0) {
    const staged = parallelStartRun(ctx, input.model);
    note += staged.note;
    if (staged.kept) ({ run, model, seeds } = staged.kept);
  }
  return { run, model, seeds, startSeeds, nModelSeeds: 0, shifts, notes, note, review: assistantRunReview(run) };
}

/**
 * Which lines of a run are written, flagged 'pulled' or held for review. Only what the assistant is
 * sure of is written: proposals the misassignment hunt distrusts, and every machine-made line of a
 * run the consistency audit doubts, are held; a proposal distrusted only as pulled a little
 * (isPulledOnly) is written, flagged.
 */
function assistantRunReview(run: AssistantRunResult): AssistantRunReview {
  const suspect = new Set(run.suspects.map((s) => s.id));
  const pulled = new Set(run.suspects.filter(isPulledOnly).map((s) => s.id));
  const isMachine = (l: AssistantLine) => l.status === 'proposed' || l.source === 'auto-seed';
  const held = new Set(
    run.lines
      .filter((l) => l.status !== 'rejected' && !l.isExcluded && isMachine(l))
      .filter((l) => run.doubt !== null || (suspect.has(l.id) && !(l.status === 'proposed' && pulled.has(l.id))))
      .map((l) => l.id),
  );
  return { suspect, pulled, held };
}

/** Stop with AssistantCancelledError when the caller's check says so. */
function cancelCheck(ctx: RunContext): void {
  if (ctx.isCancelled?.()) throw new AssistantCancelledError();
}

/**
 * One run of the loop from `lines` and the fixed lines, its progress said as `stage, round …`
 * (`stage` '' leaves the loop's own words).
 */
function loop(ctx: RunContext, stage: string, model: BandModel, lines: readonly AssistantLine[]): AssistantRunResult {
  cancelCheck(ctx);
  const report = ctx.onProgress;
  return assistantAutoExtend({
    model,
    floatable: ctx.floatable,
    peaks: ctx.peaks,
    lines: ctx.fixed.length ? [...lines, ...ctx.fixed] : lines,
    options: ctx.options,
    onProgress: report && ((round, what, rowsSoFar) => report(round, stage ? `${stage}, ${what}` : what, rowsSoFar)),
    isCancelled: ctx.isCancelled,
  });
}

/** Lines of a run that are neither rejected nor fixed lines (the set a repeat starts from; loop adds the fixed ones back). */
function liveLines(ctx: RunContext, run: AssistantRunResult): AssistantLine[] {
  const fixed = new Set(ctx.fixed.map((l) => l.id));
  return run.lines.filter((l) => l.status !== 'rejected' && !fixed.has(l.id));
}

/** A parallel band of a prolate or oblate top (the bands assistantParallelStart is for). */
function isParallelTop(model: BandModel): boolean {
  return model.band === 'parallel' && model.shape !== 'linear';
}

/** The origin and B changes from `from` to `to`, cm^-1, as assistantSeedFromModel reports them. */
function shiftsOf(to: BandModel, from: BandModel) {
  return {
    originShiftCm1: to.upper.origin - from.upper.origin,
    upperBShiftCm1: to.upper.B - from.upper.B,
    lowerBShiftCm1: to.lower.B - from.lower.B,
  };
}

/**
 * The staged start of a parallel symmetric-top band (assistantParallelStart) and the run from it,
 * for a model-only run from the shared shift that writes nothing. With a runner-up numbering both
 * are run, and one is kept only when it has RIVAL_FACTOR times the other's lines or both reach the
 * same labels (the rule for the search's runner-up shift); the run kept must be decided (no doubt).
 * `note` says what was done.
 */
function parallelStartRun(
  ctx: RunContext,
  model: BandModel,
): { note: string; kept: { run: AssistantRunResult; model: BandModel; seeds: AssistantLine[] } | null } {
  cancelCheck(ctx);
  ctx.onProgress?.(0, 'staged start of a parallel band (the first run writes nothing)', 0);
  const par = assistantParallelStart(model, ctx.peaks, ctx.floatable);
  const text = `; the run from the shared shift writes nothing, so the staged start for a parallel band was tried: ${par.text}`;
  if (par.lines.length === 0) return { note: text, kept: null };
  const first = { ...runFromModel(ctx, 'staged start', par.model, par.lines), model: par.model };
  let best: typeof first | null = first;
  if (par.runnerUp) {
    const second = {
      ...runFromModel(ctx, 'staged start, runner-up numbering', par.runnerUp.model, par.runnerUp.lines),
      model: par.runnerUp.model,
    };
    const a = runSupport(first.run);
    const b = runSupport(second.run);
    const agreement = a > 0 && b > 0 ? runsAgreement(first.run, second.run) : null;
    const isSame = agreement !== null && agreement.conflicts === 0 && agreement.shared >= RUNS_SHARED_FRACTION * Math.min(a, b);
    best = isSame ? (b > a ? second : first) : b > RIVAL_FACTOR * a ? second : a > RIVAL_FACTOR * b ? first : null;
    if (!best) return { note: `${text}; its two numberings lead to ${a} and ${b} lines: not decided, not kept`, kept: null };
  }
  if (best.run.doubt !== null || !best.run.fit) return { note: `${text}; its run is doubtful: not kept`, kept: null };
  return { note: `${text}${best.note} (kept)`, kept: { run: best.run, model: best.model, seeds: best.seeds } };
}

/** A rival run is preferred only when the trace supports it with this many times the lines. */
const RIVAL_FACTOR = 3;

/**
 * A proposal off the clean fit by at most this many line widths is on its line: two lines closer
 * than about half a width are not resolved (the hunt's own criterion, OFF_LINE_FWHM 0.5), and a
 * quarter width leaves the other half of that margin for the fit's own error.
 */
const PULLED_MAX_FWHM = 0.25;

/**
 * A suspect the hunt distrusts only for its residual against its own σ (no combination difference,
 * off-line or leverage test failed), no more than PULLED_MAX_FWHM line widths from where the clean
 * fit puts it and with no other rung predicted within the matching tolerance of its peak: its peak's
 * centre is pulled a little (an unresolved weak neighbour, noise), but no other label is on offer.
 * Such proposals are written, flagged 'pulled', instead of held for review.
 */
function isPulledOnly(s: AssistantSuspect): boolean {
  return (
    s.isResidualOnly &&
    s.lineWidthCm1 > 0 &&
    Math.abs(s.obsMinusCalcCm1) <= PULLED_MAX_FWHM * s.lineWidthCm1 &&
    s.alternativeRungs.length === 0
  );
}

/** Lines a run would write (machine-made lines not distrusted), 0 for a doubtful run. */
function runSupport(run: AssistantRunResult): number {
  if (run.doubt) return 0;
  const suspect = new Set(run.suspects.map((x) => x.id));
  return run.lines.filter((l) => !l.isExcluded && l.status !== 'rejected' && !suspect.has(l.id)).length;
}

/**
 * Two runs reach the same labels when they share at least this fraction of the smaller run's lines
 * (and label no shared peak or line differently): then the two shifts of the search were two
 * starts to one answer, not two answers.
 */
const RUNS_SHARED_FRACTION = 0.5;

/**
 * How far two runs' written lines agree: lines on the same peak with the same quanta (shared), and
 * conflicts (a peak both label differently, or one line both put on different peaks).
 */
function runsAgreement(a: AssistantRunResult, b: AssistantRunResult): { shared: number; conflicts: number } {
  const written = (run: AssistantRunResult) => {
    const suspect = new Set(run.suspects.map((x) => x.id));
    return run.lines.filter((l) => !l.isExcluded && l.status !== 'rejected' && !suspect.has(l.id) && l.peakIndex !== null);
  };
  const key = (l: AssistantLine) => `${l.jUpper},${l.kUpper},${l.jLower},${l.kLower}`;
  const byPeak = new Map<number, string>();
  const byLine = new Map<string, number>();
  for (const l of written(a)) {
    byPeak.set(l.peakIndex!, key(l));
    byLine.set(key(l), l.peakIndex!);
  }
  let shared = 0;
  let conflicts = 0;
  for (const l of written(b)) {
    const onPeak = byPeak.get(l.peakIndex!);
    const peakOf = byLine.get(key(l));
    if (onPeak === key(l)) shared++;
    else if (onPeak !== undefined || peakOf !== undefined) conflicts++;
  }
  return { shared, conflicts };
}

/**
 * Run the loop from model-only seeds. When its rival-labelling check finds a rival labelling that
 * the trace favours decisively (by at least LABEL_DECISIVE_MARGIN), the run is repeated once from
 * the seeds relabelled that way (the start had the ladder one rung or sub-band off), and the
 * repeat is kept only when its own check decides its labels (it then beats the first labelling
 * too, which is one of its rivals); otherwise the first run stands, doubtful as it is. Then the
 * sub-band comb (perpendicular tops) and the Q-branch search (Π–Σ bands).
 */
function runFromModel(ctx: RunContext, stage: string, model: BandModel, seeds: AssistantLine[]): Attempt {
  const first = relabelledRun(ctx, stage, model, seeds);
  return withQBranch(ctx, stage, model, withSubBandComb(ctx, stage, first));
}

/** A Π–Σ run with at most this many Q lines has not placed its Q branch. */
const Q_LINES_FEW = 2;

/**
 * A decided run of a Π–Σ band that reached no Q line (q unknown: the Q ladder lies tens of line
 * widths from its guess) is extended by the Q-branch search (assistantQBranchSearch) and run again
 * with its lines and the Q seeds; the repeat is kept only when it is decided too and writes more lines.
 */
function withQBranch(ctx: RunContext, stage: string, model: BandModel, first: Attempt): Attempt {
  const { run } = first;
  const { floatable, peaks } = ctx;
  if (model.shape !== 'linear' || model.band !== 'perpendicular' || !floatable.includes('upper.q') || run.doubt !== null || !run.fit)
    return first;
  const live = liveLines(ctx, run);
  // A few Q lines at the pile-up near the origin do not fix q; the search decides whether the ladder is placed.
  if (live.filter((l) => l.jUpper === l.jLower && !l.isExcluded).length > Q_LINES_FEW) return first;
  cancelCheck(ctx);
  ctx.onProgress?.(0, `${stage}: searching for the Q branch`, 0);
  const taken = new Set(live.flatMap((l) => (l.peakIndex === null ? [] : [l.peakIndex])));
  const qSigma = assistantPriorSigmas(model, floatable)['upper.q'];
  const found = assistantQBranchSearch(run.fit.model, qSigma, peaks, taken);
  if (found.lines.length === 0) return { ...first, note: `${first.note}; ${found.text}` };
  const ids = new Set(live.map((l) => l.id));
  const qSeeds = found.lines.filter((l) => !ids.has(l.id));
  const again = loop(ctx, `${stage}: with the Q branch`, model, [...live, ...qSeeds]);
  if (again.doubt !== null || runSupport(again) <= runSupport(run))
    return { ...first, note: `${first.note}; ${found.text}, but the run with them was not kept` };
  return { run: again, seeds: [...first.seeds, ...qSeeds], note: `${first.note}; ${found.text}` };
}

/**
 * A run of a perpendicular top's band that reached only one sub-band (the one the model-only search
 * placed; the first guess's errors of A, ζ and A′ − A″ leave the others too far off to seed) places
 * the comb of the other sub-bands against its fitted constants (assistantQHeadStart) and is run
 * again with its lines and the comb's seeds; the repeat is kept only when it is decided and keeps
 * at least as many lines.
 */
function withSubBandComb(ctx: RunContext, stage: string, first: Attempt): Attempt {
  const { run } = first;
  const { floatable, peaks } = ctx;
  if (!run.fit || run.fit.model.shape === 'linear' || run.fit.model.band !== 'perpendicular') return first;
  const live = liveLines(ctx, run);
  const subBands = new Set(live.filter((l) => !l.isExcluded).map((l) => `${l.kUpper - l.kLower}:${l.kLower}`));
  if (subBands.size !== 1) return first;
  cancelCheck(ctx);
  ctx.onProgress?.(0, `${stage}: placing the comb of the other sub-bands`, 0);
  const [deltaK, kLower] = [...subBands][0].split(':').map(Number);
  const taken = new Set(live.flatMap((l) => (l.peakIndex === null ? [] : [l.peakIndex])));
  const tau = assistantPeakContext(peaks).medianFwhmCm1;
  const comb = assistantQHeadStart(run.fit.model, peaks, floatable, tau, { deltaK, kLower }, taken);
  if (!comb.model || comb.lines.length === 0) return { ...first, note: `${first.note}; ${comb.text}` };
  const seeds = [...live, ...comb.lines];
  const nFirst = live.filter((l) => !l.isExcluded).length;
  const isKept = (r: AssistantRunResult) => r.doubt === null && runSupport(r) >= nFirst;
  const again = relabelledRun(ctx, `${stage}: sub-band comb`, comb.model, seeds);
  if (isKept(again.run))
    return { run: again.run, seeds: [...first.seeds, ...comb.lines], note: `${first.note}; ${comb.text}${again.note}` };
  // The comb is placed relative to the one sub-band the start found; if that sub-band (or its J
  // numbering) was itself one off, so is every line: each relabelling of the whole set is run, and
  // one is kept only when it alone is decided.
  const decided: { run: AssistantRunResult; seeds: AssistantLine[]; what: string }[] = [];
  for (const shift of COMB_RELABELLINGS) {
    const what = `${shift.kind === 'subBand' ? 'sub-band' : shift.kind === 'rung' ? 'P/R rung' : "J''"} ${shift.step > 0 ? '+1' : '−1'}`;
    const relabelled: AssistantLine[] = [];
    for (const l of seeds.filter((x) => !x.isExcluded)) {
      const q = assistantLabelShift(comb.model, shift, l);
      if (q.jLower < 0 || q.kLower < 0 || assignmentCheck(q, comb.model) !== null) continue;
      const reason = `${l.reason}; relabelled (${what}): the run with the sub-band comb in the first labels was doubtful`;
      relabelled.push({ ...l, ...q, reason, note: reason });
    }
    const run = loop(ctx, `${stage}: sub-band comb relabelled (${what})`, comb.model, relabelled);
    if (isKept(run)) decided.push({ run, seeds: relabelled, what });
  }
  if (decided.length === 1)
    return {
      run: decided[0].run,
      seeds: decided[0].seeds,
      note: `${first.note}; ${comb.text}, every line relabelled (${decided[0].what}: the only labelling the trace decides)`,
    };
  const why =
    decided.length > 1
      ? `${decided.length} relabellings are decided`
      : (again.run.doubt ?? `${runSupport(again.run)} lines against ${nFirst}`);
  return { ...first, note: `${first.note}; ${comb.text}, but the run with them was not kept (${why})` };
}

/** The relabellings of a whole run tried when the run with the sub-band comb is doubtful. */
const COMB_RELABELLINGS: AssistantLabelShift[] = [
  { kind: 'subBand', step: 1 },
  { kind: 'subBand', step: -1 },
  { kind: 'rung', step: 1 },
  { kind: 'rung', step: -1 },
  { kind: 'j', step: 1 },
  { kind: 'j', step: -1 },
];

/** The loop from the seeds, repeated once from them relabelled when a rival labelling wins decisively (see runFromModel). */
function relabelledRun(ctx: RunContext, stage: string, model: BandModel, seeds: AssistantLine[]): Attempt {
  const run = loop(ctx, stage, model, seeds);
  const check = run.labelCheck;
  if (!check?.closest || !(check.margin <= -LABEL_DECISIVE_MARGIN)) return { run, seeds, note: '' };
  const rival = check.closest;
  const relabelled: AssistantLine[] = [];
  for (const l of seeds) {
    const q = assistantLabelShift(model, rival.shift, l);
    if (q.jLower < 0 || q.kLower < 0 || assignmentCheck(q, model) !== null) continue;
    const reason = `${l.reason}; relabelled as ${lineLabelAscii(q.kUpper - q.kLower, q.jUpper - q.jLower, q.kLower, q.jLower, model.shape)}: the run from the first labels fitted better with ${rival.what} (by ${(-check.margin).toFixed(1)})`;
    relabelled.push({ ...l, ...q, reason, note: reason });
  }
  if (relabelled.length < 2) return { run, seeds, note: '' };
  const again = loop(ctx, `${stage}: relabelled (${rival.what})`, model, relabelled);
  // The relabelled run must explain at least as many lines as the first, with no more strong lines
  // on no peak (a labelling that is right accounts for more of the trace, not less).
  const nFirst = run.lines.filter((l) => !l.isExcluded && l.status !== 'rejected').length;
  const missingShare = (r: AssistantRunResult) => (r.audit && r.audit.strong > 0 ? r.audit.missing / r.audit.strong : 0);
  if (again.doubt !== null || runSupport(again) < nFirst || missingShare(again) > missingShare(run)) return { run, seeds, note: '' };
  return {
    run: again,
    seeds: relabelled,
    note: `, relabelled (${rival.what}: the first run fitted better so by ${(-check.margin).toFixed(1)})`,
  };
}

/** Seeds leave the band open when its strongest lines are predicted no better than this many line widths (1σ). */
const SEEDS_OPEN_FWHM = 3;

/**
 * Seeds that leave the band's strongest lines undetermined (median posterior σ, prior included, of
 * the 20 strongest predicted lines above SEEDS_OPEN_FWHM median line widths: e.g. a few weak lines
 * far out in J or K) are joined by seeds from the model alone (assistantSeedFromModel), but only
 * when that search is unambiguous (no second shift nearly as good) and both sets fit together
 * (σ_w ≤ 2 in the prior-regularised fit); otherwise the user's seeds stand alone.
 */
function seedsFromModelToo(
  model: BandModel,
  floatable: readonly string[],
  peaks: PeakList,
  fwhmCm1: number,
  seeds: readonly AssistantLine[],
): { lines: AssistantLine[]; notes: string[] } {
  const priors = assistantPriorSigmas(model, floatable);
  const post = assistantPosteriorFit(model, priors, seeds);
  const all = bandLines(model, { minIntensity: 0.05 });
  const strongest = Array.from({ length: all.count }, (_, i) => i)
    .sort((a, b) => all.intensity[b] - all.intensity[a])
    .slice(0, 20)
    .map((i) => ({ jUpper: all.jUpper[i], kUpper: all.kUpper[i], jLower: all.jLower[i], kLower: all.kLower[i] }));
  const sigmas = assistantPosteriorSigmas(post, strongest).sort((a, b) => a - b);
  const typical = sigmas.length ? sigmas[sigmas.length >> 1] : 0;
  if (!(typical > SEEDS_OPEN_FWHM * fwhmCm1)) return { lines: [], notes: [] };
  const open = `the seed lines leave the strongest lines of the band open (typical σ ${typical.toPrecision(2)} cm^-1)`;
  const seeded = assistantSeedFromModel(model, peaks, floatable, { idPrefix: 'model-seed' });
  if (seeded.isAmbiguous)
    return { lines: [], notes: [`${open}, and the model alone cannot place the ladder unambiguously: no seeds added`] };
  const taken = new Set(seeds.map((l) => `${l.jUpper},${l.kUpper},${l.jLower},${l.kLower}`));
  const onPeak = new Set(seeds.map((l) => l.peakIndex));
  const lines = seeded.lines.filter((l) => !taken.has(`${l.jUpper},${l.kUpper},${l.jLower},${l.kLower}`) && !onPeak.has(l.peakIndex));
  if (lines.length === 0) return { lines: [], notes: seeded.warnings.map((w) => `seeds from the model as well: ${w}`) };
  const joint = assistantPosteriorFit(model, priors, [...seeds, ...lines]);
  if (joint.scale2 > 4) {
    return {
      lines: [],
      notes: [
        `${open}, but the ${lines.length} seeds the model alone suggests disagree with them (σ_w ${Math.sqrt(joint.scale2).toFixed(1)}): not used`,
      ],
    };
  }
  return { lines, notes: [`${open}: ${lines.length} seeds from the model alone added (they agree with the given ones)`] };
}
