import { assistantPeakContext, assistantPeaksUsable } from '../analysis/assistantPeakContext';
import { assistantLinesFromAssignments } from '../analysis/assistantReview';
import { assistantStartRun, type AssistantStartRunResult } from '../analysis/assistantStartRun';
import type { AssistantLine, AssistantRunResult } from '../analysis/assistantTypes';
import { peaksFind } from '../analysis/peaksFind';
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
 * decided. These steps are said on the first stderr line; they are assistantStartRun's, which the
 * page's assistant runs too.
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
  let userSeeds: AssistantLine[] = [];
  const linesPath = typeof opts.lines === 'string' ? opts.lines : null;
  if (linesPath !== null) {
    const table = cliLoadLines(linesPath, io);
    table.assignments.forEach((a, i) => {
      const why = assignmentCheck(a, file.model);
      if (why) throw new CliError(`${linesPath}: line ${table.lineNumbers[i]}: ${why}`);
    });
    if (table.assignments.length === 0) throw new CliError(`${linesPath}: no lines (only a header); give at least one seed line`);
    userSeeds = assistantLinesFromAssignments(table.assignments, file.model, peaks, context);
  }
  let started: AssistantStartRunResult;
  try {
    started = assistantStartRun({ model: file.model, floatable, peaks, seeds: userSeeds, options: { toleranceSigma: tolerance } });
  } catch (err) {
    throw new CliError(err instanceof Error ? err.message : String(err));
  }
  for (const w of started.notes) io.stderr(`assign: ${w}\n`);
  const { run, model, review: classes } = started;
  let seedText: string;
  if (linesPath !== null) {
    const seeds = started.startSeeds;
    seedText = `${userSeeds.length} seed line(s) from ${linesPath}`;
    if (started.nModelSeeds) seedText += ` and ${started.nModelSeeds} from the model`;
    const offPeak = seeds.filter((l) => l.peakIndex === null).length;
    if (offPeak > 0) {
      io.stderr(
        `assign: ${offPeak} of the ${seeds.length} seed lines lie on no peak of the trace (within half a FWHM); is it the right trace?\n`,
      );
    }
  } else {
    if (!run || !started.shifts) {
      // No seed line from the model alone: what the staged start of a parallel band said, if tried.
      if (started.note) io.stderr(`assign: ${started.note.slice(2)}\n`);
      throw new CliError(`no seed lines could be picked from the model alone; give --lines SEED.csv`);
    }
    const { originShiftCm1, upperBShiftCm1, lowerBShiftCm1 } = started.shifts;
    seedText =
      `${started.startSeeds.length} seed line(s) from the model alone (origin ${signed(originShiftCm1, 4)}, ` +
      `B' ${signed(upperBShiftCm1, 6)}, B'' ${signed(lowerBShiftCm1, 6)} cm^-1 applied first)`;
  }
  seedText += started.note;
  if (!run || !classes) throw new CliError(`no run could be made from the seed lines`);
  if (!run.fit) throw new CliError(`no fit could be made from the lines: ${run.fitError?.message ?? 'unknown reason'}`);
  const fit = run.fit;
  const { suspect, pulled, held } = classes;
  const rows = run.lines.filter((l) => l.status !== 'rejected' && !l.isExcluded);
  // Only what the assistant is sure of becomes a row (assistantStartRun's review): the held lines
  // go to the review list (stderr).
  const review = rows.filter((l) => held.has(l.id));
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
