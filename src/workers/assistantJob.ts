/**
 * The assistant's jobs for the page, as plain functions (the worker only unpacks, calls
 * assistantJobRun and posts back; tests call it directly). A run starts from the assignment table
 * as seeds, or from the model alone when the table is empty, through the same assistantStartRun as
 * the `assign` command (every attempt it makes); its machine-made lines come back as proposals with
 * a verdict, never as assignments: 'confident' exactly for the lines the command writes as rows.
 */
import { assistantMisassignments } from '../analysis/assistantMisassignment';
import { assistantNearestPeak, assistantPeakContext, assistantPeaksUsable } from '../analysis/assistantPeakContext';
import { assistantLinesFromAssignments } from '../analysis/assistantReview';
import { assistantSeriesExtend } from '../analysis/assistantSeriesExtend';
import { assistantStartRun } from '../analysis/assistantStartRun';
import type { AssistantLine } from '../analysis/assistantTypes';
import type { PeakList } from '../analysis/peaksFind';
import { assignmentCheck, type Assignment } from '../fit/assignment';
import type { FitResult } from '../fit/fitTypes';
import { lineLabelAscii } from '../physics/lineLabel';
import type { BandModel } from '../physics/model';
import { transitionWavenumber } from '../physics/termValues';
import type {
  AssistantExtendJob,
  AssistantHuntJob,
  AssistantHuntOutput,
  AssistantJob,
  AssistantJobOutput,
  AssistantProposal,
  AssistantProposalsOutput,
  AssistantRejectedPair,
  AssistantRunJob,
} from './assistantProtocol';

/** Progress of a run: loop round (1-based), what it did, lines added so far. */
export type AssistantJobProgress = (round: number, stage: string, rowsSoFar: number) => void;

/**
 * Run one assistant job.
 * @param job the job and its inputs (model, peaks, assignment table)
 * @param onProgress called once per round of each run of the auto-extend loop (its stage says which
 *   attempt: first run, runner-up shift, sub-band comb, …) and once before each search between runs (round 0)
 * @param isCancelled polled between attempts and once per round; true stops a run with an
 *   AssistantCancelledError (name 'AbortError'), and nothing is returned
 * @returns proposals for review (run, extend) or suspects (hunt)
 * @throws Error in plain words when there are no peaks, nothing to start from, or an input is invalid
 */
export function assistantJobRun(job: AssistantJob, onProgress?: AssistantJobProgress, isCancelled?: () => boolean): AssistantJobOutput {
  if (job.kind === 'run') return jobRun(job, onProgress, isCancelled);
  if (job.kind === 'hunt') return jobHunt(job);
  return jobExtend(job);
}

/** Usable peaks, or an error saying there are none. */
function usablePeaks(peaks: PeakList): PeakList {
  const usable = assistantPeaksUsable(peaks).peaks;
  if (usable.count === 0) throw new Error('there are no peaks to work with (load a trace, or lower the peak-finding SNR threshold)');
  return usable;
}

/** The table's rows the band allows, and a warning for the others (they are left alone). */
function allowedRows(model: BandModel, rows: readonly Assignment[]): { rows: Assignment[]; warnings: string[] } {
  const ok: Assignment[] = [];
  const bad: string[] = [];
  for (const a of rows) {
    if (assignmentCheck(a, model)) bad.push(label(a, model));
    else ok.push(a);
  }
  const warnings = bad.length
    ? [
        `${bad.length} row(s) of the table are not lines of this band and were left out: ${bad.slice(0, 5).join(', ')}${bad.length > 5 ? ', …' : ''}`,
      ]
    : [];
  return { rows: ok, warnings };
}

function label(q: { jUpper: number; kUpper: number; jLower: number; kLower: number }, model: Pick<BandModel, 'shape'>): string {
  return lineLabelAscii(q.kUpper - q.kLower, q.jUpper - q.jLower, q.kLower, q.jLower, model.shape);
}

/** Rejected pairs as 'rejected' lines tied to their peak, so the loop never offers them again. */
function rejectedLines(model: BandModel, pairs: readonly AssistantRejectedPair[], peaks: PeakList): AssistantLine[] {
  const out: AssistantLine[] = [];
  pairs.forEach((p, i) => {
    if (assignmentCheck(p, model)) return;
    const k = assistantNearestPeak(peaks, p.observedCm1);
    if (k < 0 || Math.abs(peaks.wavenumberCm1[k] - p.observedCm1) > REJECTED_MATCH_CM1) return;
    out.push({
      id: `rejected#${i + 1}`,
      jUpper: p.jUpper,
      kUpper: p.kUpper,
      jLower: p.jLower,
      kLower: p.kLower,
      observedCm1: p.observedCm1,
      uncertaintyCm1: 1,
      isBlended: false,
      isExcluded: true,
      note: '',
      status: 'rejected',
      source: 'auto-extend',
      peakIndex: k,
      predictedCm1: NaN,
      matchSigmaCm1: NaN,
      distanceSigma: NaN,
      reason: 'rejected in an earlier review',
      iteration: 0,
    });
  });
  return out;
}

/** A rejected pair names its peak by position; peak ids carry 1e-5 cm^-1, so this is generous. */
const REJECTED_MATCH_CM1 = 1e-4;

function fitLine(fit: FitResult): string {
  const sw = fit.sigmaW === null ? 'exactly determined' : `σ_w ${fit.sigmaW.toFixed(2)}`;
  return `${fit.nLines} lines, ${fit.nParameters} constants, rms ${fit.rmsCm1.toExponential(2)} cm⁻¹, ${sw}`;
}

function jobRun(job: AssistantRunJob, onProgress?: AssistantJobProgress, isCancelled?: () => boolean): AssistantProposalsOutput {
  const peaks = usablePeaks(job.peaks);
  const context = assistantPeakContext(peaks);
  const { rows, warnings } = allowedRows(job.model, job.assignments);
  let seeds: AssistantLine[] = [];
  if (rows.length > 0) {
    seeds = assistantLinesFromAssignments(rows, job.model, peaks, context, 'seed', 'user');
    const offPeak = seeds.filter((l) => l.peakIndex === null).length;
    if (offPeak > 0) warnings.push(`${offPeak} of the ${rows.length} table lines lie on no found peak (within half a line width)`);
  }
  // The same start and attempts as the assign command; rejected pairs ride along in every run.
  const started = assistantStartRun({
    model: job.model,
    floatable: job.floatable,
    peaks,
    seeds,
    fixedLines: rejectedLines(job.model, job.rejected, peaks),
    options: job.options,
    onProgress,
    isCancelled,
  });
  warnings.push(...started.notes.map(unicodeUnits));
  const { run, review } = started;
  if (!run || !review) {
    const why = started.note ? ` (${unicodeUnits(started.note.slice(2))})` : '';
    throw new Error(`no seed lines could be picked from the model alone${why}; assign a few lines by hand first, then run again`);
  }
  let start: string;
  if (started.shifts) {
    const { originShiftCm1, upperBShiftCm1, lowerBShiftCm1 } = started.shifts;
    start =
      `from the model alone: ${started.startSeeds.length} seed(s) after shifting the origin by ${signed(originShiftCm1, 4)} cm⁻¹, ` +
      `B′ by ${signed(upperBShiftCm1, 6)}, B″ by ${signed(lowerBShiftCm1, 6)} cm⁻¹`;
  } else {
    start = `from the ${rows.length} line(s) of the table`;
    if (started.nModelSeeds > 0) start += ` and ${started.nModelSeeds} seed(s) from the model alone`;
  }
  start += unicodeUnits(started.note);
  const suspects = new Map(run.suspects.map((s) => [s.id, s]));
  const fit = run.fit;
  const proposals: AssistantProposal[] = [];
  for (const l of run.lines) {
    if (l.source === 'user' || l.status === 'rejected') continue;
    const s = suspects.get(l.id);
    let verdict: AssistantProposal['verdict'] = 'confident';
    let doubt = '';
    let note = '';
    if (l.isExcluded) {
      verdict = 'excluded';
      doubt = excludedWhy(l.reason);
    } else if (review.held.has(l.id)) {
      // What the assign command holds for review (not a row): the whole run in doubt, or a suspect.
      verdict = 'doubtful';
      if (run.doubt) doubt = `the run as a whole is in doubt: ${run.doubt}`;
      else if (s) {
        const alt = s.alternativeRungs.slice(0, 3).map((x) => x.label);
        doubt = `${s.reasons.join('; ')}${alt.length ? `; the peak would also fit ${alt.join(', ')}` : ''}`;
      }
    } else if (s && review.pulled.has(l.id)) {
      // Written by the assign command, flagged 'pulled': its label is the only one on offer.
      note = `; its peak is pulled a little off the fit (${s.reasons.join('; ')}), but no other rung is on offer`;
    }
    const calc = fit ? transitionWavenumber(fit.model, l.jUpper, l.kUpper, l.jLower, l.kLower) : NaN;
    const proposal = proposalOf(l, calc, verdict, doubt);
    proposals.push(note ? { ...proposal, reason: proposal.reason + note } : proposal);
  }
  proposals.sort((x, y) => x.observedCm1 - y.observedCm1);
  const nConfident = proposals.filter((p) => p.verdict === 'confident').length;
  return {
    kind: 'run',
    proposals,
    summary: `Run ${start}: ${run.iterations.length} round(s), ${proposals.length} proposal(s), ${nConfident} confident.`,
    doubt: run.doubt,
    warnings: [...warnings, ...run.warnings.filter((w) => w !== run.doubt), ...run.fitNotes],
    ambiguous: run.ambiguous.map((a) => a.reason),
    fitSummary: fit ? fitLine(fit) : run.fitError ? `no fit: ${run.fitError.message}` : null,
  };
}

/** The start's words as the page writes units (cm⁻¹ for the command line's cm^-1). */
function unicodeUnits(text: string): string {
  return text.replace(/cm\^-1/g, 'cm⁻¹');
}

/** The part of a loop reason that says why the line was kept out of the fit. */
function excludedWhy(reason: string): string {
  const i = reason.search(/; (excluded|kept out)/);
  return i >= 0 ? reason.slice(i + 2) : 'kept out of the fit';
}

function proposalOf(l: AssistantLine, calcCm1: number, verdict: AssistantProposal['verdict'], doubt: string): AssistantProposal {
  return {
    id: l.id,
    jUpper: l.jUpper,
    kUpper: l.kUpper,
    jLower: l.jLower,
    kLower: l.kLower,
    observedCm1: l.observedCm1,
    uncertaintyCm1: l.uncertaintyCm1,
    predictedCm1: l.predictedCm1,
    calcCm1,
    distanceSigma: l.distanceSigma,
    isBlended: l.isBlended,
    verdict,
    reason: l.source === 'auto-seed' ? `seed from the model alone: ${l.reason}` : l.reason,
    doubt,
  };
}

function jobHunt(job: AssistantHuntJob): AssistantHuntOutput {
  const peaks = usablePeaks(job.peaks);
  const context = assistantPeakContext(peaks);
  const { rows, warnings } = allowedRows(job.model, job.assignments);
  if (rows.length === 0) throw new Error('the table has no lines of this band to check');
  const lines = assistantLinesFromAssignments(rows, job.model, peaks, context, 'accepted', 'user');
  const r = assistantMisassignments({ model: job.model, floatable: job.floatable, lines, peaks, context, options: job.options });
  return {
    kind: 'hunt',
    suspects: r.suspects,
    notes: [...warnings, ...r.notes],
    fitSummary: r.fit ? `clean fit: ${fitLine(r.fit)}` : `no fit: ${r.fitError?.message ?? 'unknown reason'}`,
  };
}

function jobExtend(job: AssistantExtendJob): AssistantProposalsOutput {
  const peaks = usablePeaks(job.peaks);
  const context = assistantPeakContext(peaks);
  const { rows, warnings } = allowedRows(job.model, job.assignments);
  const lines = assistantLinesFromAssignments(rows, job.model, peaks, context, 'accepted', 'user');
  const r = assistantSeriesExtend({
    model: job.model,
    series: job.series,
    lines,
    peaks,
    fit: job.fit,
    rungs: job.rungs,
    options: job.options,
    idPrefix: 'series',
  });
  const proposals: AssistantProposal[] = [];
  const ambiguous: string[] = [];
  for (const rung of r.rungs) {
    if (rung.proposal) proposals.push(proposalOf(rung.proposal, rung.predictedCm1, 'confident', ''));
    else ambiguous.push(`${rung.label}: ${rung.reason}`);
  }
  proposals.sort((x, y) => x.observedCm1 - y.observedCm1);
  const basis = r.method === 'fit' ? 'predicted from the last fit' : 'predicted from the model plus a polynomial of its own obs − model';
  return {
    kind: 'extend',
    proposals,
    summary: `Series ${r.label} (${r.assignedJ.length} rungs assigned), ${basis}: ${proposals.length} rung(s) matched of ${r.rungs.length} tried.`,
    doubt: null,
    warnings: [...warnings, ...r.warnings],
    ambiguous,
    fitSummary: null,
  };
}

function signed(v: number, digits: number): string {
  return `${v >= 0 ? '+' : '−'}${Math.abs(v).toFixed(digits)}`;
}
