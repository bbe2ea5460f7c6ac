import { assistantAutoExtend } from '../analysis/assistantAutoExtend';
import { assistantPeakContext, assistantPeaksUsable } from '../analysis/assistantPeakContext';
import { assistantLinesFromAssignments } from '../analysis/assistantReview';
import { assistantSeedFromModel } from '../analysis/assistantSeedFromModel';
import { assistantParallelStart } from '../analysis/assistantParallelStart';
import { assistantLabelShift, LABEL_DECISIVE_MARGIN, type AssistantLabelShift } from '../analysis/assistantLabelCheck';
import { assistantQBranchSearch } from '../analysis/assistantQBranchSearch';
import { assistantQHeadStart } from '../analysis/assistantQHeadStart';
import type { AssistantLine, AssistantRunResult, AssistantSuspect } from '../analysis/assistantTypes';
import { assistantPosteriorFit, assistantPosteriorSigmas, assistantPriorSigmas } from '../analysis/assistantPosterior';
import { peaksFind, type PeakList } from '../analysis/peaksFind';
import { bandLines } from '../physics/bandLines';
import { assignmentCheck } from '../fit/assignment';
import type { FitResult } from '../fit/fitTypes';
import { lineLabelAscii } from '../physics/lineLabel';
import type { BandModel } from '../physics/model';
import { transitionWavenumber } from '../physics/termValues';
import { cliLoadModelOrSystem } from './cliModel';
import { assignSystem } from './assignSystem';
import { CliError, cliNumber, cliParseArgs, cliRequire, type CliCommand, type CliIo } from './cliIo';
import { cliLoadLines } from './fitCommand';
import { cliPrintTraceWarnings, cliReadTrace } from './cliTrace';

/**
 * Smallest peak SNR used by the assign command: the peak finder's own default (5σ keeps noise
 * spikes rare even on 10^5-point traces; the assistant offers only rungs predicted at ≥ 10σ).
 */
export const ASSIGN_MIN_SNR = 5;

/** Allowed range of --tolerance (k of the k·σ matching window). */
export const ASSIGN_TOLERANCE_RANGE: readonly [number, number] = [0.5, 20];

/** Columns of the CSV the assign command writes (the first six are the line-table contract). */
export const ASSIGN_COLUMNS = [
  'J_up',
  'K_up',
  'J_lo',
  'K_lo',
  'wavenumber',
  'uncertainty',
  'status',
  'label',
  'calc',
  'obs_minus_calc',
  'distance_sigma',
  'flags',
  'note',
] as const;

/** A CSV cell: quoted when it holds a comma, quote or line break. */
function csvCell(text: string): string {
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** Read and import the trace, or a one-line CliError naming the file and the line or field at fault. */
function loadTrace(path: string, io: CliIo) {
  const outcome = cliReadTrace(path, io);
  if (!outcome.ok) {
    const { message, line, field } = outcome.error;
    const where: string[] = [];
    if (line !== undefined && !new RegExp(`\\bline ${line}\\b`).test(message)) where.push(`line ${line}`);
    if (field !== undefined && !message.includes(field)) where.push(`field ${field}`);
    throw new CliError(`cannot read trace '${path}': ${message}${where.length ? ` (${where.join(', ')})` : ''}`);
  }
  cliPrintTraceWarnings(outcome.report, io);
  return outcome.trace;
}

/**
 * `assign --model M.json --trace FILE [--lines SEED.csv] [--tolerance K]`: run the assistant's
 * whole auto-extend loop headless and print the assigned lines.
 *
 * Peaks: peaksFind on the imported trace (any format importTrace reads) with minSnr 5.
 * Seeds: with --lines, the user's lines (wavenumber = observed position, cm^-1; uncertainty
 * default 0.001 cm^-1), never changed by the loop. Without --lines, from the model alone
 * (assistantSeedFromModel): the origin and both B are first shifted to put the strongest
 * low-K, low-J lines on peaks, then the strongest predicted lines with exactly one peak within
 * ±3 median FWHM and no comparable predicted line there become seeds (status 'seed'). A model-only
 * run whose labels a rival labelling (one rung, J'' or sub-band off) beats decisively is repeated
 * once from its seeds relabelled that way, and the repeat kept only when it decides its own labels
 * and explains at least as many lines; a Π–Σ band's Q branch, which its P and R lines leave at the
 * guessed q, is placed by sliding the Q ladder along q (assistantQBranchSearch) and the run repeated
 * with those seeds. A perpendicular top's run that reached only the one sub-band the start placed
 * places the comb of the other sub-bands (assistantQHeadStart) against its fitted constants and is
 * run again with the comb's seeds; when that run is doubtful, each relabelling of the whole set
 * (sub-band, P/R rung or J'' one up or down) is run and one kept only when it alone is decided.
 * A parallel band of a symmetric top that the shared shift gives no seeds, or a run that writes
 * nothing, is started again by the staged search of assistantParallelStart (the J numbering next
 * to the band gap, the J comb, the K structure), whose run replaces the first only when it is
 * decided. These steps are said on the first stderr line.
 * The fits float the model file's floated constants (plain numbers) that the lines can determine;
 * the model's jMax and kMax bound the lines sought. --tolerance is k of the k·σ window (default 3).
 *
 * stdout: CSV with header J_up,K_up,J_lo,K_lo,wavenumber,uncertainty,status,label,calc,
 * obs_minus_calc,distance_sigma,flags,note — one row per confident line: status 'seed' or
 * 'proposed' (lines the loop excluded as outliers and ambiguous cases are not rows; they are
 * counted on stderr). Proposals the misassignment hunt distrusts, and every machine-made line of a
 * run the consistency checks doubt, are not rows either: they are listed on stderr as "review:"
 * lines with their status and reason, except proposals distrusted only for a residual of at most
 * a quarter line width with no other rung on offer (see isPulledOnly): those are rows flagged
 * 'pulled'. flags: 'blended' (weighted down), 'suspect' (a seed line the misassignment hunt
 * distrusts), 'pulled' (see above). calc from the final fit, cm^-1. stderr: the final fit's
 * summary, the consistency audit ("assign: consistency: …") and the review list.
 * Exit 0 on success; bad inputs give one stderr line naming the file, line and field, exit 1.
 * A system file (JSON with a "species" field) goes to assignSystem (cli/assignSystem.ts); a
 * single-band model file runs exactly as before.
 */
export const assignCommand: CliCommand = (args, io) => {
  const opts = cliParseArgs(args, ['model', 'trace', 'lines', 'tolerance']);
  const modelPath = cliRequire(opts, 'model');
  const tracePath = cliRequire(opts, 'trace');
  const tolerance = cliNumber(opts, 'tolerance', 3);
  const [tMin, tMax] = ASSIGN_TOLERANCE_RANGE;
  if (!(tolerance >= tMin && tolerance <= tMax))
    throw new CliError(`option --tolerance must be a number from ${tMin} to ${tMax} (σ), got ${tolerance}`);
  const loaded = cliLoadModelOrSystem(modelPath, io);
  if (loaded.kind === 'system') {
    const trace = loadTrace(tracePath, io);
    const linesPath = typeof opts.lines === 'string' ? opts.lines : undefined;
    return assignSystem(
      { system: loaded.file, modelPath, tracePath, trace, linesPath, tolerance, minSnr: ASSIGN_MIN_SNR, columns: ASSIGN_COLUMNS },
      io,
    );
  }
  const file = loaded.file;
  const trace = loadTrace(tracePath, io);
  const found = peaksFind(trace, { minSnr: ASSIGN_MIN_SNR });
  const usable = assistantPeaksUsable(found);
  const peaks = usable.peaks;
  if (peaks.count === 0) throw new CliError(`${tracePath}: no peaks found at SNR >= ${ASSIGN_MIN_SNR}`);
  const context = assistantPeakContext(peaks);
  const floatable = file.floated;
  let model: BandModel = file.model;
  let seeds: AssistantLine[];
  let seedText: string;
  let rival: { model: BandModel; lines: AssistantLine[] } | null = null;
  let stagedNote = '';
  if (typeof opts.lines === 'string') {
    const linesPath = opts.lines;
    const table = cliLoadLines(linesPath, io);
    table.assignments.forEach((a, i) => {
      const why = assignmentCheck(a, model);
      if (why) throw new CliError(`${linesPath}: line ${table.lineNumbers[i]}: ${why}`);
    });
    if (table.assignments.length === 0) throw new CliError(`${linesPath}: no lines (only a header); give at least one seed line`);
    seeds = assistantLinesFromAssignments(table.assignments, model, peaks, context);
    const extra = seedsFromModelToo(model, floatable, peaks, context.medianFwhmCm1, seeds);
    for (const w of extra.notes) io.stderr(`assign: ${w}\n`);
    seedText = `${seeds.length} seed line(s) from ${linesPath}`;
    if (extra.lines.length) {
      seeds = [...seeds, ...extra.lines];
      seedText += ` and ${extra.lines.length} from the model`;
    }
    const offPeak = seeds.filter((l) => l.peakIndex === null).length;
    if (offPeak > 0) {
      io.stderr(
        `assign: ${offPeak} of the ${seeds.length} seed lines lie on no peak of the trace (within half a FWHM); is it the right trace?\n`,
      );
    }
  } else {
    let seeded = assistantSeedFromModel(model, peaks, floatable);
    for (const w of seeded.warnings) io.stderr(`assign: ${w}\n`);
    // A parallel band of a symmetric top the shared shift cannot seed: the staged start (assistantParallelStart).
    if (seeded.lines.length === 0 && isParallelTop(model)) {
      const par = assistantParallelStart(model, peaks, floatable);
      stagedNote = `; ${par.text}`;
      if (par.lines.length) seeded = { ...seeded, lines: par.lines, model: par.model, isAmbiguous: false, ...shiftsOf(par.model, model) };
      if (par.runnerUp) rival = par.runnerUp;
    }
    if (seeded.lines.length === 0) {
      if (stagedNote) io.stderr(`assign: ${stagedNote.slice(2)}\n`);
      throw new CliError(`no seed lines could be picked from the model alone; give --lines SEED.csv`);
    }
    model = seeded.model;
    seeds = seeded.lines;
    if (seeded.isAmbiguous) {
      const runnerUp = assistantSeedFromModel(file.model, peaks, floatable, { useRunnerUp: true });
      if (runnerUp.lines.length) rival = { model: runnerUp.model, lines: runnerUp.lines };
    }
    seedText =
      `${seeds.length} seed line(s) from the model alone (origin ${signed(seeded.originShiftCm1, 4)}, ` +
      `B' ${signed(seeded.upperBShiftCm1, 6)}, B'' ${signed(seeded.lowerBShiftCm1, 6)} cm^-1 applied first)${stagedNote}`;
  }
  let run: AssistantRunResult;
  try {
    const isModelOnly = typeof opts.lines !== 'string';
    const first = isModelOnly
      ? runFromModel(model, floatable, peaks, seeds, tolerance)
      : { run: assistantAutoExtend({ model, floatable, peaks, lines: seeds, options: { toleranceSigma: tolerance } }), seeds, note: '' };
    run = first.run;
    seeds = first.seeds;
    seedText += first.note;
    if (rival) {
      // Two shifts of the model's ladder match the peaks about equally well: run both and keep the
      // one the trace supports clearly better (more lines, no doubt), or either when both reach the
      // same labels; if neither, nothing is written as an assignment.
      const second = runFromModel(rival.model, floatable, peaks, rival.lines, tolerance);
      const other = second.run;
      const a = runSupport(run);
      const b = runSupport(other);
      const agreement = a > 0 && b > 0 ? runsAgreement(run, other) : null;
      if (agreement && agreement.conflicts === 0 && agreement.shared >= RUNS_SHARED_FRACTION * Math.min(a, b)) {
        if (b > a) {
          run = other;
          model = rival.model;
          seeds = second.seeds;
          seedText += second.note;
        }
        seedText += ` (the runner-up shift of the search leads to the same labels: ${agreement.shared} lines in common, none labelled otherwise; ${Math.max(a, b)} lines kept)`;
      } else if (b > RIVAL_FACTOR * a) {
        run = other;
        model = rival.model;
        seeds = second.seeds;
        seedText += `${second.note} (the runner-up shift of the search: the trace supports it with ${b} lines against ${a})`;
      } else if (!(a > RIVAL_FACTOR * b)) {
        run.doubt =
          `two shifts of the model's ladder fit the peaks about equally well and lead to ${a} and ${b} consistent lines` +
          (agreement ? ` (${agreement.conflicts} peak(s) or line(s) labelled differently)` : '') +
          `: the numbering is not decided by the trace; give seed lines`;
        run.warnings.push(run.doubt);
      } else {
        seedText += ` (preferred over the runner-up shift of the search: ${a} lines against ${b})`;
      }
    }
  } catch (err) {
    throw new CliError(err instanceof Error ? err.message : String(err));
  }
  // A parallel symmetric-top band whose shared-shift start led to a run that writes nothing: the
  // staged start (assistantParallelStart) and its run, kept only when decided.
  if (typeof opts.lines !== 'string' && isParallelTop(model) && !stagedNote && runSupport(run) === 0) {
    const staged = parallelStartRun(file.model, floatable, peaks, tolerance);
    seedText += staged.note;
    if (staged.kept) ({ run, model } = staged.kept);
  }
  if (!run.fit) throw new CliError(`no fit could be made from the lines: ${run.fitError?.message ?? 'unknown reason'}`);
  const fit = run.fit;
  const suspect = new Set(run.suspects.map((s) => s.id));
  const pulled = new Set(run.suspects.filter(isPulledOnly).map((s) => s.id));
  const rows = run.lines.filter((l) => l.status !== 'rejected' && !l.isExcluded);
  // Only what the assistant is sure of becomes a row: proposals the misassignment hunt distrusts,
  // and every machine-made line of a run the consistency audit doubts, go to the review list (stderr).
  const isMachine = (l: AssistantLine) => l.status === 'proposed' || l.source === 'auto-seed';
  const review = rows.filter(
    (l) => isMachine(l) && (run.doubt !== null || (suspect.has(l.id) && !(l.status === 'proposed' && pulled.has(l.id)))),
  );
  const held = new Set(review.map((l) => l.id));
  const seedRows = rows.filter((l) => (l.status === 'seed' || l.status === 'accepted') && !held.has(l.id));
  const proposed = rows.filter((l) => l.status === 'proposed' && !held.has(l.id)).sort((a, b) => a.observedCm1 - b.observedCm1);
  const shape = model.shape;
  const out: string[] = [ASSIGN_COLUMNS.join(',')];
  for (const l of [...seedRows, ...proposed]) {
    const calc = transitionWavenumber(fit.model, l.jUpper, l.kUpper, l.jLower, l.kLower);
    const isPulled = l.status === 'proposed' && pulled.has(l.id);
    const flags = [l.isBlended && 'blended', suspect.has(l.id) && !isPulled && 'suspect', isPulled && 'pulled'].filter(Boolean).join(';');
    out.push(
      [
        l.jUpper,
        l.kUpper,
        l.jLower,
        l.kLower,
        l.observedCm1.toFixed(6),
        l.uncertaintyCm1.toPrecision(3),
        l.status === 'accepted' ? 'seed' : l.status,
        lineLabelAscii(l.kUpper - l.kLower, l.jUpper - l.jLower, l.kLower, l.jLower, shape),
        calc.toFixed(6),
        (l.observedCm1 - calc).toExponential(3),
        Number.isFinite(l.distanceSigma) ? l.distanceSigma.toFixed(2) : '',
        flags,
        csvCell(l.reason),
      ].join(','),
    );
  }
  io.stdout(out.join('\n') + '\n');
  io.stderr(
    summary(run, fit, {
      tracePath,
      nPeaks: peaks.count,
      repaired: usable.repaired.length,
      seedText,
      nSeeds: seedRows.length,
      nProposed: proposed.length,
      shape,
      review,
    }),
  );
  return 0;
};

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
 * `note` says what was done, for the first stderr line.
 */
function parallelStartRun(
  model: BandModel,
  floatable: readonly string[],
  peaks: PeakList,
  tolerance: number,
): { note: string; kept: { run: AssistantRunResult; model: BandModel } | null } {
  const par = assistantParallelStart(model, peaks, floatable);
  const text = `; the run from the shared shift writes nothing, so the staged start for a parallel band was tried: ${par.text}`;
  if (par.lines.length === 0) return { note: text, kept: null };
  const first = { ...runFromModel(par.model, floatable, peaks, par.lines, tolerance), model: par.model };
  let best: typeof first | null = first;
  if (par.runnerUp) {
    const second = { ...runFromModel(par.runnerUp.model, floatable, peaks, par.runnerUp.lines, tolerance), model: par.runnerUp.model };
    const a = runSupport(first.run);
    const b = runSupport(second.run);
    const agreement = a > 0 && b > 0 ? runsAgreement(first.run, second.run) : null;
    const isSame = agreement !== null && agreement.conflicts === 0 && agreement.shared >= RUNS_SHARED_FRACTION * Math.min(a, b);
    best = isSame ? (b > a ? second : first) : b > RIVAL_FACTOR * a ? second : a > RIVAL_FACTOR * b ? first : null;
    if (!best) return { note: `${text}; its two numberings lead to ${a} and ${b} lines: not decided, not kept`, kept: null };
  }
  if (best.run.doubt !== null || !best.run.fit) return { note: `${text}; its run is doubtful: not kept`, kept: null };
  return { note: `${text}${best.note} (kept)`, kept: { run: best.run, model: best.model } };
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
 * too, which is one of its rivals); otherwise the first run stands, doubtful as it is.
 */
function runFromModel(
  model: BandModel,
  floatable: readonly string[],
  peaks: PeakList,
  seeds: AssistantLine[],
  tolerance: number,
): { run: AssistantRunResult; seeds: AssistantLine[]; note: string } {
  const options = { toleranceSigma: tolerance };
  const first = relabelledRun(model, floatable, peaks, seeds, tolerance);
  return withQBranch(model, floatable, peaks, withSubBandComb(floatable, peaks, first, tolerance), options);
}

/** A Π–Σ run with at most this many Q lines has not placed its Q branch. */
const Q_LINES_FEW = 2;

/**
 * A decided run of a Π–Σ band that reached no Q line (q unknown: the Q ladder lies tens of line
 * widths from its guess) is extended by the Q-branch search (assistantQBranchSearch) and run again
 * with its lines and the Q seeds; the repeat is kept only when it is decided too and writes more lines.
 */
function withQBranch(
  model: BandModel,
  floatable: readonly string[],
  peaks: PeakList,
  first: { run: AssistantRunResult; seeds: AssistantLine[]; note: string },
  options: { toleranceSigma: number },
): { run: AssistantRunResult; seeds: AssistantLine[]; note: string } {
  const { run } = first;
  if (model.shape !== 'linear' || model.band !== 'perpendicular' || !floatable.includes('upper.q') || run.doubt !== null || !run.fit)
    return first;
  const live = run.lines.filter((l) => l.status !== 'rejected');
  // A few Q lines at the pile-up near the origin do not fix q; the search decides whether the ladder is placed.
  if (live.filter((l) => l.jUpper === l.jLower && !l.isExcluded).length > Q_LINES_FEW) return first;
  const taken = new Set(live.flatMap((l) => (l.peakIndex === null ? [] : [l.peakIndex])));
  const qSigma = assistantPriorSigmas(model, floatable)['upper.q'];
  const found = assistantQBranchSearch(run.fit.model, qSigma, peaks, taken);
  if (found.lines.length === 0) return { ...first, note: `${first.note}; ${found.text}` };
  const ids = new Set(live.map((l) => l.id));
  const qSeeds = found.lines.filter((l) => !ids.has(l.id));
  const again = assistantAutoExtend({ model, floatable, peaks, lines: [...live, ...qSeeds], options });
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
function withSubBandComb(
  floatable: readonly string[],
  peaks: PeakList,
  first: { run: AssistantRunResult; seeds: AssistantLine[]; note: string },
  tolerance: number,
): { run: AssistantRunResult; seeds: AssistantLine[]; note: string } {
  const { run } = first;
  if (!run.fit || run.fit.model.shape === 'linear' || run.fit.model.band !== 'perpendicular') return first;
  const live = run.lines.filter((l) => l.status !== 'rejected');
  const subBands = new Set(live.filter((l) => !l.isExcluded).map((l) => `${l.kUpper - l.kLower}:${l.kLower}`));
  if (subBands.size !== 1) return first;
  const [deltaK, kLower] = [...subBands][0].split(':').map(Number);
  const taken = new Set(live.flatMap((l) => (l.peakIndex === null ? [] : [l.peakIndex])));
  const tau = assistantPeakContext(peaks).medianFwhmCm1;
  const comb = assistantQHeadStart(run.fit.model, peaks, floatable, tau, { deltaK, kLower }, taken);
  if (!comb.model || comb.lines.length === 0) return { ...first, note: `${first.note}; ${comb.text}` };
  const seeds = [...live, ...comb.lines];
  const nFirst = live.filter((l) => !l.isExcluded).length;
  const isKept = (r: AssistantRunResult) => r.doubt === null && runSupport(r) >= nFirst;
  const again = relabelledRun(comb.model, floatable, peaks, seeds, tolerance);
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
    const run = assistantAutoExtend({ model: comb.model, floatable, peaks, lines: relabelled, options: { toleranceSigma: tolerance } });
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
function relabelledRun(
  model: BandModel,
  floatable: readonly string[],
  peaks: PeakList,
  seeds: AssistantLine[],
  tolerance: number,
): { run: AssistantRunResult; seeds: AssistantLine[]; note: string } {
  const options = { toleranceSigma: tolerance };
  const run = assistantAutoExtend({ model, floatable, peaks, lines: seeds, options });
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
  const again = assistantAutoExtend({ model, floatable, peaks, lines: relabelled, options });
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
  seeds: AssistantLine[],
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

function signed(v: number, digits: number): string {
  return `${v >= 0 ? '+' : ''}${v.toFixed(digits)}`;
}

/** The stderr summary: counts, the final fit's constants, the ambiguities and suspects (first few). */
function summary(
  run: AssistantRunResult,
  fit: FitResult,
  info: {
    tracePath: string;
    nPeaks: number;
    repaired: number;
    seedText: string;
    nSeeds: number;
    nProposed: number;
    shape: BandModel['shape'];
    review: AssistantLine[];
  },
): string {
  const lines: string[] = [];
  lines.push(
    `assign: ${info.tracePath}: ${info.nPeaks} peaks at SNR >= ${ASSIGN_MIN_SNR}${info.repaired ? ` (${info.repaired} without a usable centre σ)` : ''}; ${info.seedText}`,
  );
  const excluded = run.lines.filter((l) => l.isExcluded && l.status !== 'rejected').length;
  lines.push(
    `assign: ${run.iterations.length} iterations; ${info.nSeeds} seed(s) and ${info.nProposed} proposed line(s) written; ` +
      `${excluded} excluded as outliers, ${run.ambiguous.length} ambiguous case(s) left undecided, ${run.suspects.length} suspect(s)`,
  );
  lines.push(
    `assign: final fit: ${fit.nLines} lines, ${fit.nParameters} constants, rms ${fit.rmsCm1.toExponential(3)} cm^-1, ` +
      `sigmaW ${fit.sigmaW === null ? 'n/a (exactly determined)' : fit.sigmaW.toFixed(3)}; ${fit.convergenceMessage}`,
  );
  for (const key of fit.floated) {
    const p = fit.parameters[key];
    const unit = key.endsWith('.zeta') ? '' : ' cm^-1';
    lines.push(`  ${key} = ${p.value.toPrecision(12)} ± ${p.sigma === null ? 'n/a' : p.sigma.toExponential(2)}${unit}`);
  }
  for (const note of run.fitNotes) lines.push(`  note: ${note}`);
  for (const w of [...fit.warnings, ...run.warnings]) lines.push(`  warning: ${w}`);
  if (run.audit) {
    lines.push(
      `assign: consistency: ${run.audit.missing} of ${run.audit.strong} strong lines predicted to within a line width lie on no peak`,
    );
  }
  if (info.review.length) {
    lines.push(
      `assign: ${info.review.length} line(s) held for review, not written: ` +
        (run.doubt ? 'the run as a whole is doubtful (see the warning above)' : 'the misassignment hunt distrusts them'),
    );
    for (const l of info.review.slice(0, 10)) {
      const label = lineLabelAscii(l.kUpper - l.kLower, l.jUpper - l.jLower, l.kLower, l.jLower, info.shape);
      lines.push(`  review: ${label} at ${l.observedCm1.toFixed(4)} (${l.status}): ${l.reason}`);
    }
    if (info.review.length > 10) lines.push(`  review: … and ${info.review.length - 10} more`);
  }
  for (const a of run.ambiguous.slice(0, 10)) lines.push(`  ambiguous: ${a.reason}`);
  if (run.ambiguous.length > 10) lines.push(`  ambiguous: … and ${run.ambiguous.length - 10} more`);
  for (const s of run.suspects.slice(0, 10)) {
    const alt = s.alternativeRungs.slice(0, 3).map((a) => `${a.label}${a.isAssignedElsewhere ? ' (assigned elsewhere)' : ''}`);
    lines.push(
      `  suspect: ${s.label} at ${s.observedCm1.toFixed(4)}: ${s.reasons.join('; ')}${alt.length ? `; would fit: ${alt.join(', ')}` : ''}`,
    );
  }
  if (run.suspects.length > 10) lines.push(`  suspect: … and ${run.suspects.length - 10} more`);
  return lines.map((l) => l.replace(/\s*\n\s*/g, ' ')).join('\n') + '\n';
}
