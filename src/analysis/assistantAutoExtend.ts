import { assignmentCheck } from '../fit/assignment';
import type { FitError, FitResult } from '../fit/fitTypes';
import { lineLabelAscii } from '../physics/lineLabel';
import type { BandModel } from '../physics/model';
import { transitionWavenumber } from '../physics/termValues';
import { assistantLabelCheck, type AssistantLabelCheck } from './assistantLabelCheck';
import { assistantLadderTest } from './assistantLadderTest';
import { assistantMatch } from './assistantMatch';
import { assistantMisassignments, assistantRobustScale } from './assistantMisassignment';
import { assistantOptionsResolve } from './assistantOptions';
import {
  assistantNearestPeak,
  assistantPeakContext,
  assistantPeaksCheck,
  assistantPeaksRepairWarning,
  assistantPeaksUsable,
  assistantPeakUncertainty,
  assistantPeaksInRange,
  assistantWindowLimitCm1,
  type AssistantPeakContext,
} from './assistantPeakContext';
import { assistantCatalogue, assistantQuantaKey, assistantRungOf, type AssistantCatalogue } from './assistantPredict';
import { assistantRefit } from './assistantRefit';
import { assistantPosteriorDetermined, assistantPosteriorFit, assistantPriorSigmas, type AssistantPosterior } from './assistantPosterior';
import { assistantShiftSearch } from './assistantShiftSearch';
import { assistantFitLines } from './assistantReview';
import type {
  AssistantAmbiguity,
  AssistantIteration,
  AssistantLine,
  AssistantOptions,
  AssistantOptionsResolved,
  AssistantRunAudit,
  AssistantRunResult,
} from './assistantTypes';
import type { PeakList } from './peaksFind';

/** Inputs of assistantAutoExtend. */
export interface AssistantRunInput {
  /** Start model; constants the fit does not float stay at these values (cm^-1, K). */
  model: BandModel;
  /** Keys ("upper.B", …) the fits may float, e.g. ModelFile.floated. */
  floatable: readonly string[];
  /** Peaks of the trace (peaksFind), ascending wavenumber. */
  peaks: PeakList;
  /** The current set: seeds, accepted and earlier proposals, rejected lines. */
  lines: readonly AssistantLine[];
  options?: AssistantOptions;
  /** Prefix of the ids of new lines (a number is appended; existing ids are never reused). @default 'auto' */
  idPrefix?: string;
  /**
   * Called once per round of the loop, after the round's proposals: the round (1-based), what it
   * did in words, and the lines added so far. For progress display only; it cannot change the run.
   */
  onProgress?: (round: number, stage: string, rowsSoFar: number) => void;
  /** Polled once at the start of each round: true stops the run with an AssistantCancelledError. */
  isCancelled?: () => boolean;
}

/**
 * Thrown when a run is cancelled through its isCancelled check. Its name is 'AbortError', the name
 * an aborted fetch or worker job carries, so callers treat both alike.
 */
export class AssistantCancelledError extends Error {
  constructor() {
    super('the assistant was cancelled');
    this.name = 'AbortError';
  }
}

/**
 * Index of a sub-band along the band: ΔK·K'' for a perpendicular band of a symmetric top
 * (… pK2 = −2, pK1 = −1, rK0 = 0, rK1 = 1 …, neighbours differ by 1), K'' for a parallel band,
 * 0 for a linear molecule.
 */
export function assistantSubBandIndex(model: Pick<BandModel, 'shape' | 'band'>, deltaK: number, kLower: number): number {
  if (model.shape === 'linear') return 0;
  return model.band === 'perpendicular' ? deltaK * kLower : kLower;
}

/** J'' span of the assigned lines per sub-band. */
type Reach = Map<number, { jMin: number; jMax: number; count: number }>;

function reachOf(model: BandModel, lines: readonly AssistantLine[]): Reach {
  const reach: Reach = new Map();
  for (const l of lines) {
    if (l.status === 'rejected') continue;
    const m = assistantSubBandIndex(model, l.kUpper - l.kLower, l.kLower);
    const r = reach.get(m);
    if (!r) reach.set(m, { jMin: l.jLower, jMax: l.jLower, count: 1 });
    else {
      r.jMin = Math.min(r.jMin, l.jLower);
      r.jMax = Math.max(r.jMax, l.jLower);
      r.count++;
    }
  }
  return reach;
}

/**
 * Whether a rung is within reach: within reachJStep of the J'' range of its sub-band, or, for a
 * sub-band with no line yet, at J'' ≤ K'' + 2·reachJStep next to a sub-band with ≥ 3 lines.
 */
function isReached(model: BandModel, reach: Reach, deltaK: number, kLower: number, jLower: number, step: number): boolean {
  const m = assistantSubBandIndex(model, deltaK, kLower);
  const r = reach.get(m);
  if (r) return jLower >= r.jMin - step && jLower <= r.jMax + step;
  const next = [reach.get(m - 1), reach.get(m + 1)].some((n) => n !== undefined && n.count >= 3);
  return next && jLower <= kLower + 2 * step;
}

/**
 * Peak height per unit relative intensity (absorbance): the median of height/intensity over the
 * assigned lines on single (not blended) peaks; NaN with fewer than 3.
 */
function heightScaleOf(lines: readonly AssistantLine[], cat: AssistantCatalogue, peaks: PeakList, context: AssistantPeakContext): number {
  const ratios: number[] = [];
  for (const l of lines) {
    if (l.status === 'rejected' || l.isExcluded || l.isBlended || l.peakIndex === null) continue;
    if (context.isPossibleBlend[l.peakIndex]) continue;
    const i = cat.indexOf.get(assistantQuantaKey(l));
    if (i === undefined || !(cat.lines.intensity[i] > 0)) continue;
    ratios.push(peaks.height[l.peakIndex] / cat.lines.intensity[i]);
  }
  if (ratios.length < 3) return NaN;
  ratios.sort((a, b) => a - b);
  const m = ratios.length >> 1;
  return ratios.length % 2 ? ratios[m] : 0.5 * (ratios[m - 1] + ratios[m]);
}

function checkLines(model: BandModel, lines: readonly AssistantLine[]): void {
  const ids = new Set<string>();
  lines.forEach((l, i) => {
    const where = `assistantAutoExtend: lines[${i}] (id '${l?.id}')`;
    if (!l || typeof l !== 'object') throw new Error(`${where}: must be an assistant line object`);
    const why = assignmentCheck(l, model);
    if (why) throw new Error(`${where}: ${why}`);
    if (!Number.isFinite(l.observedCm1))
      throw new Error(`${where}: observedCm1 must be a finite wavenumber in cm^-1, got ${l.observedCm1}`);
    if (!(l.uncertaintyCm1 > 0) || !Number.isFinite(l.uncertaintyCm1)) {
      throw new Error(`${where}: uncertaintyCm1 must be a finite number > 0 (cm^-1), got ${l.uncertaintyCm1}`);
    }
    if (ids.has(l.id)) throw new Error(`${where}: id '${l.id}' is used twice`);
    ids.add(l.id);
  });
}

/**
 * The bootstrap loop, headless and transparent: fit the current lines, predict every rung with
 * its σ, propose the rungs that match exactly one peak one-to-one, refit, widen, repeat until
 * nothing new matches.
 *
 * Each iteration:
 * 1. Fit the seeds, accepted and proposed lines with the constants they can determine
 *    (assistantRefit: origin and B first, more as the set grows; rank-deficient sets never throw).
 *    A proposal (or model-only seed) that is then more than excludeSigma × the robust σ_w off is
 *    excluded from the fit (kept, with the reason) and the fit repeated.
 * 2. Predict every line of the band (assistantCatalogue); the matching σ combines the prediction σ
 *    (Student-widened), the fit's residual scatter and a width floor, so early tolerances are wide
 *    and narrow as the fit improves.
 * 3. Offer the unassigned rungs within reach (a step s beyond the assigned J'' of their sub-band,
 *    or J'' ≤ K'' + 2s in a sub-band next to one with ≥ 3 lines; s = reachJStep while lines come
 *    in, doubled after an iteration that adds nothing, so a run of ambiguous rungs is jumped,
 *    until it spans the band) whose predicted SNR is at least minPredictedSnr and whose k·σ
 *    window is at most maxWindowFwhm local FWHMs (others wait for a better fit); match them (assistantMatch: one peak for the rung, one rung for the
 *    peak, intensity plausible). Possible blends are weighted down (assistantPeakUncertainty).
 * Every added line has status 'proposed', its reason and distance; ambiguities are listed, never
 * chosen. The members of an unresolved K stack on one peak are all proposed but kept out of the fit. Lines given by the user (source 'user') are never changed. The result's undo record
 * restores the set as it was (assistantUndo). Finally the misassignment hunt runs on the whole set.
 * Source: the assign–fit–predict loop of rovibrational analysis (common practice; e.g. Papoušek &
 * Aliev, Molecular Vibrational-Rotational Spectra (1982), ch. on assignment, from memory).
 * @returns the new set, what was added, ambiguities, suspects, the final fit and the undo record
 * @throws Error for an invalid peak list, option, or line (naming it); AssistantCancelledError when isCancelled says so
 */
export function assistantAutoExtend(input: AssistantRunInput): AssistantRunResult {
  const usable = assistantPeaksUsable(input.peaks);
  const peaks = usable.peaks;
  const bad = assistantPeaksCheck('assistantAutoExtend', peaks);
  if (bad) throw new Error(bad);
  const { model } = input;
  const options = assistantOptionsResolve(model, input.options);
  checkLines(model, input.lines);
  const context = assistantPeakContext(peaks, options.widthNeighbours, options.blendWidthRatio);
  const previousLines = input.lines.map((l) => ({ ...l }));
  const lines: AssistantLine[] = input.lines.map((l) => ({ ...l }));
  const usedIds = new Set(lines.map((l) => l.id));
  const prefix = input.idPrefix ?? 'auto';
  let counter = 0;
  const newId = (): string => {
    let id: string;
    do id = `${prefix}${++counter}`;
    while (usedIds.has(id));
    usedIds.add(id);
    return id;
  };
  const addedIds: string[] = [];
  const iterations: AssistantIteration[] = [];
  const warnings: string[] = assistantPeaksRepairWarning(peaks, usable.repaired);
  // Held in one object because the refit closure updates it (TypeScript does not track closure writes).
  const state: {
    fit: FitResult | null;
    fitError: FitError | null;
    floated: string[];
    fitNotes: string[];
    posterior: AssistantPosterior | null;
  } = {
    fit: null,
    fitError: null,
    floated: [],
    fitNotes: [],
    posterior: null,
  };
  let priors = assistantPriorSigmas(model, input.floatable);
  // Centrifugal constants the model holds (absent or fixed) that the lines may yet demand.
  const heldCentrifugal = centrifugalKeys(model).filter((k) => !input.floatable.includes(k));
  let demanded: string[] = [];
  let ambiguous: AssistantAmbiguity[] = [];
  let heightScale = NaN;
  if (lines.filter((l) => l.status !== 'rejected').length === 0) {
    warnings.push('There are no lines to start from: give seed lines (or pick them with assistantSeedFromModel).');
  }

  // User lines the fit disagrees with are left out of the run's fits; the lines themselves stay as given.
  const heldOut = new Set<string>();
  const refit = (): void => {
    const fitLines = assistantFitLines(lines).filter((l) => !heldOut.has(l.id));
    state.posterior = assistantPosteriorFit(model, priors, fitLines, state.posterior?.model);
    if (demanded.length === 0 && heldCentrifugal.length > 0) {
      const extra = demandedConstants(model, priors, heldCentrifugal, fitLines, state.posterior);
      if (extra) {
        demanded = extra.keys;
        priors = extra.priors;
        state.posterior = extra.posterior;
        warnings.push(extra.text);
      }
    }
    // The reported fit floats what the lines determine (posterior σ well below the prior σ).
    const out = assistantRefit(model, input.floatable, fitLines, state.fit, assistantPosteriorDetermined(state.posterior, INFORMED_RATIO));
    state.fitNotes = out.notes;
    state.floated = out.floated;
    if (out.fit) {
      state.fit = out.fit;
      state.fitError = null;
    } else {
      state.fitError = out.error;
    }
  };

  let lastAdded = 0;
  let isFinished = false;
  let inconsistency: string | null = null;
  // Reach step in J'': reachJStep while lines come in; doubled when an iteration adds nothing (to
  // jump a run of ambiguous rungs), until it spans the whole band.
  let step = options.reachJStep;
  for (let iteration = 1; iteration <= options.maxIterations; iteration++) {
    if (input.isCancelled?.()) throw new AssistantCancelledError();
    refit();
    let nExcluded = 0;
    if (state.posterior && state.posterior.nLines <= DELETION_MAX_LINES) {
      const fitLines = assistantFitLines(lines).filter((l) => !heldOut.has(l.id));
      const bad = deletionOutliers(model, priors, fitLines, state.posterior);
      nExcluded += markOutliers(
        bad.map((b) => ({ l: b.line, z: b.z })),
        heldOut,
        warnings,
        iteration,
        model.shape,
      );
      if (bad.length) refit();
    }
    nExcluded += excludeOutliers(lines, state.posterior, options, iteration, heldOut, warnings, model.shape);
    if (nExcluded > 0) refit();
    const post = state.posterior;
    if (post && post.nLines >= SCATTER_MIN_LINES && post.scatterCm1 > SCATTER_MAX_FWHM * context.medianFwhmCm1) {
      // The assigned lines scatter about their best fit by a good part of a line width: some are
      // wrong (or the model cannot describe them). Adding more would build on them.
      inconsistency =
        `iteration ${iteration}: the ${post.nLines} lines in the fit scatter by ${post.scatterCm1.toPrecision(2)} cm^-1 about their best fit ` +
        `(${(post.scatterCm1 / context.medianFwhmCm1).toFixed(1)} line widths): the set is not consistent, so the run stops and its proposals are for review only`;
      isFinished = true;
      break;
    }
    const current = state.fit;
    const minIntensity =
      Number.isFinite(heightScale) && peaks.noiseSigma > 0 ? Math.min(1e-3, Math.max(1e-7, (0.5 * peaks.noiseSigma) / heightScale)) : 1e-4;
    const cat = assistantCatalogue({
      model: state.posterior ? state.posterior.model : current ? current.model : model,
      fit: current,
      posterior: state.posterior ?? undefined,
      peaks,
      context,
      minIntensity,
      widthFloorFraction: options.widthFloorFraction,
      fallbackSigmaCm1: options.fallbackSigmaCm1,
    });
    heightScale = heightScaleOf(lines, cat, peaks, context);

    const live = lines.filter((l) => l.status !== 'rejected');
    const reach = reachOf(model, live);
    const isRungAssigned = new Uint8Array(cat.lines.count);
    for (const l of live) {
      const i = cat.indexOf.get(assistantQuantaKey(l));
      if (i !== undefined) isRungAssigned[i] = 1;
    }
    const peakOwner: string[] = new Array(peaks.count).fill('');
    for (const l of live) if (l.peakIndex !== null && l.peakIndex < peaks.count) peakOwner[l.peakIndex] = labelOf(l, model);
    const forbidden = new Set<string>();
    for (const l of lines) if (l.status === 'rejected' && l.peakIndex !== null) forbidden.add(`${assistantQuantaKey(l)}@${l.peakIndex}`);

    // Sub-bands not yet pinned by the fit are opened only once their whole ladder lines up with
    // the peaks (the fit cannot yet tell how far the K structure of the model is off).
    const fitSubBands = new Set(assistantFitLines(lines).map((l) => assistantSubBandIndex(model, l.kUpper - l.kLower, l.kLower)));
    const needsAlignment = ALIGN_USED && model.shape !== 'linear' && fitSubBands.size < ALIGN_BELOW_SUB_BANDS;
    const minHeight = peaks.noiseSigma > 0 ? options.minPredictedSnr * peaks.noiseSigma : 0.5 * minOf(peaks.height, peaks.count);
    const offered: number[] = [];
    for (let i = 0; i < cat.lines.count; i++) {
      if (isRungAssigned[i]) continue;
      if (ISREACH_USED && !isReached(model, reach, cat.lines.deltaK[i], cat.lines.kLower[i], cat.lines.jLower[i], step)) continue;
      const strongEnough = Number.isFinite(heightScale)
        ? heightScale * cat.lines.intensity[i] >= minHeight
        : cat.lines.intensity[i] >= 0.02;
      if (strongEnough) offered.push(i);
    }
    const alignment = needsAlignment
      ? alignNewSubBands(model, cat, peaks, context, offered, reach)
      : new Map<number, SubBandAlignment | null>();
    const candidates: number[] = [];
    const tolerances: number[] = [];
    const tooWide: number[] = [];
    let nTooWide = 0;
    for (const i of offered) {
      const m = assistantSubBandIndex(model, cat.lines.deltaK[i], cat.lines.kLower[i]);
      if (alignment.has(m) && alignment.get(m) === null) continue;
      const limit = assistantWindowLimitCm1(peaks, context, cat.predictedCm1[i], options.maxWindowFwhm, CHANCE_PEAKS);
      if (options.toleranceSigma * cat.toleranceSigmaCm1[i] > limit) {
        nTooWide++;
        tooWide.push(i);
        continue;
      }
      candidates.push(i);
      tolerances.push(cat.toleranceSigmaCm1[i]);
    }
    // Rungs predicted to within the window: the only ones that compete for a peak.
    const isSharp = new Uint8Array(cat.lines.count);
    const maxDistanceCm1 = new Float64Array(cat.lines.count);
    for (let i = 0; i < cat.lines.count; i++) {
      const limit = assistantWindowLimitCm1(peaks, context, cat.predictedCm1[i], options.maxWindowFwhm, CHANCE_PEAKS);
      maxDistanceCm1[i] = limit;
      if (options.toleranceSigma * cat.toleranceSigmaCm1[i] <= SHARP_WINDOW_FACTOR * limit) isSharp[i] = 1;
    }
    const matched = assistantMatch({
      isSharp,
      maxDistanceCm1,
      cat,
      peaks,
      context,
      shape: model.shape,
      candidates,
      isRungAssigned,
      peakOwner,
      forbidden,
      heightScale,
      options,
    });
    ambiguous = matched.ambiguous;
    for (const m of matched.matches) {
      const p = m.peak;
      const i = m.rung;
      const line: AssistantLine = {
        id: newId(),
        jUpper: cat.lines.jUpper[i],
        kUpper: cat.lines.kUpper[i],
        jLower: cat.lines.jLower[i],
        kLower: cat.lines.kLower[i],
        observedCm1: peaks.wavenumberCm1[p],
        uncertaintyCm1: assistantPeakUncertainty(
          peaks,
          context,
          p,
          options.positionFloorFraction,
          options.blendUncertaintyFraction,
          m.hasPartnerWithin,
          m.overlapShiftCm1,
        ),
        isBlended: m.isBlend,
        isExcluded: false,
        note: '',
        status: 'proposed',
        source: 'auto-extend',
        peakIndex: p,
        predictedCm1: cat.predictedCm1[i],
        matchSigmaCm1: m.sigmaCm1,
        distanceSigma: m.distanceSigma,
        reason: `iteration ${iteration}: ${m.reason}${alignmentNote(alignment.get(assistantSubBandIndex(model, cat.lines.deltaK[i], cat.lines.kLower[i])))}`,
        iteration,
      };
      if (m.stack > 1) {
        // The peak is the sum of the K components: its position is none of theirs, and fitting each
        // component to it would pull the K constants towards an unresolved structure.
        line.isExcluded = true;
        line.reason += '; kept out of the fit (a blend of unresolved K components)';
      }
      line.note = line.reason;
      lines.push(line);
      addedIds.push(line.id);
    }
    let nLadder = 0;
    // Hypotheses need at least one line to stand on (from the first guess alone every rung is a guess).
    if (matched.matches.length === 0 && state.posterior && state.posterior.nLines > 0 && tooWide.length > 0) {
      const picks = assistantLadderTest({
        model,
        cat,
        post: state.posterior,
        peaks,
        context,
        options,
        isRungAssigned,
        isSharp,
        peakOwner,
        candidates: tooWide,
        heightScale,
        minHeight,
        chancePeaks: CHANCE_PEAKS,
      });
      for (const pick of picks) {
        const i = pick.rung;
        const p = pick.peak;
        const sigma = Math.hypot(cat.toleranceSigmaCm1[i], peaks.centreSigmaCm1[p]);
        const label = lineLabelAscii(cat.lines.deltaK[i], cat.lines.deltaJ[i], cat.lines.kLower[i], cat.lines.jLower[i], model.shape);
        const reason =
          `iteration ${iteration}: ${label} predicted at ${cat.predictedCm1[i].toFixed(4)} ± ${sigma.toPrecision(2)} cm^-1 (too uncertain for a direct match); ` +
          `of the ${pick.tried} ${pick.withRung >= 0 ? `peak pairs tried with the next rung ${lineLabelAscii(cat.lines.deltaK[pick.withRung], cat.lines.deltaJ[pick.withRung], cat.lines.kLower[pick.withRung], cat.lines.jLower[pick.withRung], model.shape)} of its series` : 'peaks in its window'}, only ${peaks.wavenumberCm1[p].toFixed(4)} makes the lines it pins down fall on peaks: ` +
          `${pick.confirmed} of ${pick.testable} on single peaks, ${pick.missing} strong ones on none (best rival peak scores ${pick.rivalScore})`;
        const line: AssistantLine = {
          id: newId(),
          jUpper: cat.lines.jUpper[i],
          kUpper: cat.lines.kUpper[i],
          jLower: cat.lines.jLower[i],
          kLower: cat.lines.kLower[i],
          observedCm1: peaks.wavenumberCm1[p],
          uncertaintyCm1: assistantPeakUncertainty(peaks, context, p, options.positionFloorFraction, options.blendUncertaintyFraction),
          isBlended: context.isPossibleBlend[p] === 1,
          isExcluded: false,
          note: reason,
          status: 'proposed',
          source: 'auto-extend',
          peakIndex: p,
          predictedCm1: cat.predictedCm1[i],
          matchSigmaCm1: sigma,
          distanceSigma: Math.abs(peaks.wavenumberCm1[p] - cat.predictedCm1[i]) / sigma,
          reason,
          iteration,
        };
        lines.push(line);
        addedIds.push(line.id);
        nLadder++;
      }
    }
    lastAdded = matched.matches.length + nLadder;
    input.onProgress?.(iteration, `round ${iteration}: ${lastAdded} proposed, ${nExcluded} excluded`, addedIds.length);
    iterations.push({
      iteration,
      nLinesInFit: current ? current.nLines : 0,
      floated: [...state.floated],
      rmsCm1: current ? current.rmsCm1 : NaN,
      medianToleranceCm1: median(tolerances),
      reachJStep: step,
      nWaiting: nTooWide,
      nProposed: matched.matches.length,
      nExcluded,
    });
    if (live.length === 0) {
      isFinished = true;
      break;
    }
    if (!ISREACH_USED && matched.matches.length === 0 && nLadder === 0 && nExcluded === 0) {
      isFinished = true;
      break;
    }
    if (matched.matches.length > 0) step = options.reachJStep;
    else if (step <= model.jMax) step *= 2;
    else {
      isFinished = true;
      break;
    }
  }
  if (!isFinished) {
    if (lastAdded > 0) {
      refit();
      if (excludeOutliers(lines, state.posterior, options, iterations.length, heldOut, warnings, model.shape) > 0) refit();
    }
    warnings.push(`Stopped after maxIterations = ${options.maxIterations} with lines still being added; run again to continue.`);
  }
  // The hunt judges the lines with the constants the predictions used (demanded ones included).
  const hunt = assistantMisassignments({
    model,
    floatable: [...input.floatable, ...demanded],
    lines,
    peaks,
    context,
    options: input.options,
    reportedFit: state.fit,
  });
  const audit = state.posterior ? auditMissing(model, state.posterior, peaks, context, options, heightScale) : null;
  let doubt: string | null = inconsistency;
  if (doubt) warnings.push(doubt);
  else if (audit && audit.strong >= AUDIT_MIN_STRONG && audit.missing > AUDIT_MAX_MISSING * audit.strong) {
    doubt =
      `${audit.missing} of the ${audit.strong} strong lines the final constants predict to within a line width lie on no peak ` +
      `(${audit.examples.join(', ')}): the assigned set is not consistent with the trace (a numbering or sub-band shift?), so its proposals are for review only`;
    warnings.push(doubt);
  }
  // A run from the model alone has nothing but the trace to fix its labels: the rival labellings
  // (one rung or one sub-band off) must fit clearly worse before its lines may be trusted.
  let labelCheck: AssistantLabelCheck | null = null;
  const isModelOnly = lines.every((l) => l.status === 'rejected' || (l.source !== 'user' && l.status !== 'accepted'));
  if (!doubt && isModelOnly && state.posterior) {
    labelCheck = assistantLabelCheck({
      model,
      priors,
      lines: assistantFitLines(lines).filter((l) => !heldOut.has(l.id)),
      auditOf: (post) => auditMissing(model, post, peaks, context, options, heightScale),
      peakHeights: peaks.height,
    });
    if (!labelCheck.isDecided) {
      doubt = `the labels are not decided by the trace: ${labelCheck.text}; the proposals are for review only (give seed lines to decide)`;
      warnings.push(doubt);
    }
  }
  const { fit, fitError, floated, fitNotes } = state;
  if (fitError && !fit) warnings.push(`No fit could be made: ${fitError.message}`);
  return {
    lines,
    addedIds,
    ambiguous,
    suspects: hunt.suspects,
    fit,
    fitError,
    floated,
    fitNotes,
    iterations,
    undo: { previousLines, addedIds: [...addedIds] },
    warnings,
    doubt,
    audit,
    labelCheck,
  };
}

/** The run stops, doubtful, when ≥ SCATTER_MIN_LINES fitted lines scatter by more than SCATTER_MAX_FWHM median FWHM (robust). */
const SCATTER_MIN_LINES = 8;
const SCATTER_MAX_FWHM = 0.5;
/** The consistency audit needs at least this many strong, sharply predicted lines… */
const AUDIT_MIN_STRONG = 10;
/** …and doubts the run when more than this fraction of them lie on no peak. */
const AUDIT_MAX_MISSING = 0.25;

/**
 * Consistency audit of a finished run: the lines the final constants predict sharply (window within
 * the matching limit) and strongly (≥ 5× the offer threshold) must show peaks. A set assigned with a
 * wrong J numbering or sub-band shift fits itself but predicts strong lines where the trace is empty.
 * Source: common practice (a correct assignment also explains the lines it did not use).
 */
function auditMissing(
  model: BandModel,
  post: AssistantPosterior,
  peaks: PeakList,
  context: AssistantPeakContext,
  options: AssistantOptionsResolved,
  heightScale: number,
): AssistantRunAudit | null {
  if (!Number.isFinite(heightScale) || !(peaks.noiseSigma > 0)) return null;
  const cat = assistantCatalogue({
    model: post.model,
    fit: null,
    posterior: post,
    peaks,
    context,
    minIntensity: Math.min(1e-3, Math.max(1e-7, (0.5 * peaks.noiseSigma) / heightScale)),
    widthFloorFraction: options.widthFloorFraction,
    fallbackSigmaCm1: options.fallbackSigmaCm1,
  });
  const strongHeight = 5 * options.minPredictedSnr * peaks.noiseSigma;
  let strong = 0;
  let missing = 0;
  const examples: string[] = [];
  for (let i = 0; i < cat.lines.count; i++) {
    if (heightScale * cat.lines.intensity[i] < strongHeight) continue;
    const x = cat.predictedCm1[i];
    const limit = assistantWindowLimitCm1(peaks, context, x, options.maxWindowFwhm, CHANCE_PEAKS);
    const half = options.toleranceSigma * cat.toleranceSigmaCm1[i];
    if (half > limit) continue;
    if (x < peaks.wavenumberCm1[0] || x > peaks.wavenumberCm1[peaks.count - 1]) continue;
    strong++;
    const [a, b] = assistantPeaksInRange(peaks, x - Math.max(half, 0.5 * limit), x + Math.max(half, 0.5 * limit));
    if (b < a) {
      missing++;
      if (examples.length < 3) examples.push(`${assistantRungOf(cat, i, model.shape).label} at ${x.toFixed(4)}`);
    }
  }
  return { strong, missing, examples };
}

/** The reported fit floats the constants whose posterior σ the lines bring below this fraction of the prior σ. */
const INFORMED_RATIO = 0.9;
/** Expected number of unrelated peaks a matching window may hold where peaks are sparse (Poisson). */
export const CHANCE_PEAKS = 0.2;
/** A rung competes for peaks while its window is within this multiple of the offer limit (maxWindowFwhm). */
const SHARP_WINDOW_FACTOR = 3;
/** Whether new sub-bands are opened by aligning their whole ladder (else by their predictions' σ alone). */
const ALIGN_USED = false;
/** Whether rungs are offered only within a J'' step of the assigned ones (else by their σ alone). */
const ISREACH_USED = false;
/** Fewer sub-bands than this in the fit: new sub-bands are opened only by aligning their ladder. */
const ALIGN_BELOW_SUB_BANDS = 3;
/** A ladder needs at least this many offered rungs to be aligned. */
const ALIGN_MIN_RUNGS = 4;

/** How a new sub-band's ladder was lined up with the peaks. */
interface SubBandAlignment {
  /** Offset added to the sub-band's predictions, cm^-1. */
  offsetCm1: number;
  /** Robust spread of the rungs about the aligned ladder, cm^-1 (added to their tolerance). */
  spreadCm1: number;
  matched: number;
  offered: number;
}

function alignmentNote(a: SubBandAlignment | null | undefined): string {
  if (!a) return '';
  return `; sub-band opened by lining up its ladder: offset ${a.offsetCm1 >= 0 ? '+' : ''}${a.offsetCm1.toPrecision(3)} cm^-1 (${a.matched} of ${a.offered} rungs on peaks)`;
}

/**
 * For every sub-band with offered rungs but no line yet: search the one offset (within ±0.8 B'',
 * less than half a rung spacing so a shift by one rung cannot alias) that puts most of its rungs
 * within half a FWHM of a peak. Accepted when at least half the rungs (≥ 3) match, clearly more
 * than chance, and either the unshifted ladder does within 10 % as well (the model's positions are
 * kept) or no offset 2 FWHM or more away does nearly as well (≤ 60 %); a shift is then refined to
 * the median residual and the sub-band's predictions (and tolerances, by the robust spread) are
 * changed in the catalogue. A sub-band that fails maps to null (not opened this iteration).
 * Source: aligning a predicted sub-band ladder with the spectrum as a whole is the usual way to
 * assign a new K sub-band (e.g. in a Loomis–Wood diagram); common practice.
 */
function alignNewSubBands(
  model: BandModel,
  cat: AssistantCatalogue,
  peaks: PeakList,
  context: AssistantPeakContext,
  offered: readonly number[],
  reach: Reach,
): Map<number, SubBandAlignment | null> {
  const bySub = new Map<number, number[]>();
  for (const i of offered) {
    const m = assistantSubBandIndex(model, cat.lines.deltaK[i], cat.lines.kLower[i]);
    if (reach.has(m)) continue;
    if (!bySub.has(m)) bySub.set(m, []);
    bySub.get(m)!.push(i);
  }
  const out = new Map<number, SubBandAlignment | null>();
  const tau = context.medianFwhmCm1;
  const window = Math.max(3 * tau, 0.8 * Math.abs(model.lower.B));
  for (const [m, idx] of bySub) {
    if (idx.length < ALIGN_MIN_RUNGS || !(tau > 0)) {
      out.set(m, null);
      continue;
    }
    const r = assistantShiftSearch(
      peaks,
      tau,
      idx,
      cat.predictedCm1,
      () => 0,
      () => 0,
      {
        deltaCentre: 0,
        deltaWindow: window,
        sumCentre: 0,
        sumWindow: 0,
        diffCentre: 0,
        diffWindow: 0,
      },
    );
    const isEnough = r.count >= Math.max(3, 0.5 * r.n) && r.count / r.n >= 2 * r.chance + 0.1;
    // The model's own positions are kept when they do nearly as well as the best shift (a band
    // whose sub-bands nearly coincide aligns equally well with its neighbours' ladders).
    const isModelGood = isEnough && r.centreCount >= 0.9 * r.count;
    const isClear = isEnough && r.secondCount <= 0.6 * r.count;
    if (!isModelGood && !isClear) {
      out.set(m, null);
      continue;
    }
    const shift = isModelGood ? 0 : r.delta;
    const residuals: number[] = [];
    for (const i of idx) {
      const x = cat.predictedCm1[i] + shift;
      const k = assistantNearestPeak(peaks, x);
      if (k >= 0 && Math.abs(peaks.wavenumberCm1[k] - x) <= 0.5 * tau) residuals.push(peaks.wavenumberCm1[k] - x);
    }
    const mid = median(residuals);
    const spread = 1.4826 * median(residuals.map((v) => Math.abs(v - mid)));
    const offsetCm1 = isModelGood ? 0 : shift + (Number.isFinite(mid) ? mid : 0);
    out.set(m, {
      offsetCm1,
      spreadCm1: isModelGood ? 0 : Number.isFinite(spread) ? spread : 0.5 * tau,
      matched: isModelGood ? r.centreCount : r.count,
      offered: r.n,
    });
  }
  // Move the aligned sub-bands' predictions (every line of them, so competitor checks see them too).
  let moved = false;
  for (let i = 0; i < cat.lines.count; i++) {
    const a = out.get(assistantSubBandIndex(model, cat.lines.deltaK[i], cat.lines.kLower[i]));
    if (!a) continue;
    cat.predictedCm1[i] += a.offsetCm1;
    cat.toleranceSigmaCm1[i] = Math.hypot(cat.toleranceSigmaCm1[i], a.spreadCm1);
    moved = true;
  }
  if (moved) cat.order.sort((a, b) => cat.predictedCm1[a] - cat.predictedCm1[b]);
  return out;
}

/**
 * Exclude from the fit the machine-made lines (proposals and model-only seeds) more than
 * excludeSigma × the robust σ_w from the fit; they stay in the set with the reason. The user's
 * own lines (source 'user', or accepted) that far off are not changed but left out of the run's
 * fits (heldOut), with a warning naming them. At most a third of the fitted lines go per call.
 * @returns how many were excluded or held out
 */
function excludeOutliers(
  lines: AssistantLine[],
  post: AssistantPosterior | null,
  options: AssistantOptionsResolved,
  iteration: number,
  heldOut: Set<string>,
  warnings: string[],
  shape: BandModel['shape'],
): number {
  if (!post || post.nLines < 10 || post.nLines - post.pEffective < 3) return 0;
  const calc = (l: AssistantLine) => transitionWavenumber(post.model, l.jUpper, l.kUpper, l.jLower, l.kLower);
  const fitted = lines.filter((l) => !l.isExcluded && l.status !== 'rejected' && !heldOut.has(l.id));
  const scale = assistantRobustScale(fitted.map((l) => (l.observedCm1 - calc(l)) / l.uncertaintyCm1));
  const off = fitted
    .map((l) => ({ l, z: (l.observedCm1 - calc(l)) / l.uncertaintyCm1 / scale }))
    .filter((o) => Math.abs(o.z) > options.excludeSigma)
    .sort((a, b) => Math.abs(b.z) - Math.abs(a.z))
    .slice(0, Math.floor(post.nLines / 3));
  return markOutliers(off, heldOut, warnings, iteration, shape);
}

/** Exclude machine-made outliers (with the reason) and hold out the user's (with a warning). */
function markOutliers(
  off: { l: AssistantLine; z: number }[],
  heldOut: Set<string>,
  warnings: string[],
  iteration: number,
  shape: BandModel['shape'],
): number {
  for (const { l, z } of off) {
    const what = Number.isFinite(z) ? `${z.toFixed(1)}σ` : 'far';
    if (l.source === 'user' || l.status === 'accepted') {
      heldOut.add(l.id);
      warnings.push(
        `${lineLabelAscii(l.kUpper - l.kLower, l.jUpper - l.jLower, l.kLower, l.jLower, shape)} (id '${l.id}', ${l.observedCm1} cm^-1) is ${what} from the fit of the other lines in iteration ${iteration}: left out of this run's fits (the line itself is unchanged; check it)`,
      );
      continue;
    }
    l.isExcluded = true;
    l.reason += `; excluded in iteration ${iteration}: obs − calc is ${what} from the fit of the other lines (blend, perturbation or misassignment?)`;
    l.note = l.reason;
  }
  return off.length;
}

/** Residuals demand held constants only from fits of at least this many lines… */
const DEMAND_MIN_LINES = 30;
/** …scattering by σ_w > 2 about the fit… */
const DEMAND_MIN_SCALE2 = 4;
/** …and only when freeing them takes away at least half of χ². */
const DEMAND_CHI2_SHARE = 0.5;

/** The model's centrifugal constants (quartic and sextic) of both states, as fit keys. */
function centrifugalKeys(model: BandModel): string[] {
  const names = model.shape === 'linear' ? ['DJ', 'HJ'] : ['DJ', 'DJK', 'DK', 'HJ', 'HJK', 'HKJ', 'HK'];
  return names.flatMap((n) => [`upper.${n}`, `lower.${n}`]);
}

/**
 * Whether the residuals demand centrifugal constants the model holds: when a fit of many lines
 * scatters well beyond the stated uncertainties (σ_w > 2), the held constants are given priors
 * (assistantPriorSigmas, centred on the held values) and kept when that removes at least half of
 * χ². The reported fit still floats only what the model file floats; the assistant's predictions
 * use the demanded constants, and a warning names them so the user can add them to the model.
 * Source: common practice (add a higher-order constant when the residuals show a systematic trend
 * the lower-order model cannot follow; the χ² drop is the F-test's numerator).
 * @returns the demanded keys, the extended priors, the new posterior and the warning, or null
 */
function demandedConstants(
  model: BandModel,
  priors: Record<string, number>,
  held: readonly string[],
  fitLines: readonly AssistantLine[],
  post: AssistantPosterior,
): { keys: string[]; priors: Record<string, number>; posterior: AssistantPosterior; text: string } | null {
  if (post.nLines < DEMAND_MIN_LINES || !(post.scale2 > DEMAND_MIN_SCALE2)) return null;
  const extended = { ...priors, ...assistantPriorSigmas(model, held) };
  const trial = assistantPosteriorFit(model, extended, fitLines, post.model);
  if (!(trial.chi2 < (1 - DEMAND_CHI2_SHARE) * post.chi2)) return null;
  const keys = held.filter((k) => extended[k] > 0);
  const text =
    `the ${post.nLines} lines scatter by σ_w ${Math.sqrt(post.scale2).toFixed(1)} with the constants the model floats; letting the held ` +
    `centrifugal constants (${keys.join(', ')}) follow the lines lowers χ² from ${post.chi2.toPrecision(3)} to ${trial.chi2.toPrecision(3)}: ` +
    `the assistant predicts with them (the reported fit does not float them; add them to the model to fit them)`;
  return { keys, priors: extended, posterior: trial, text };
}

/** Deletion diagnostics run only on fits this small (cost: one refit per line per round). */
const DELETION_MAX_LINES = 40;
/** A line is deleted when leaving it out removes at least this fraction of χ². */
const DELETION_CHI2_SHARE = 0.5;

/**
 * Gross outliers of a small set that a fit absorbs (two swapped lines among ten spoil every
 * residual, so no single residual stands out): repeatedly refit without each line in turn and
 * drop the line whose removal lowers χ² the most, while that removal takes away at least half
 * of χ² and σ_w is still above 3 (so lines with merely understated uncertainties are kept);
 * at most a third of the lines.
 * Source: deletion (leave-one-out) diagnostics, Cook & Weisberg, Residuals and Influence in
 * Regression (1982), ch. 3 (from memory).
 */
function deletionOutliers(
  model: BandModel,
  priors: Record<string, number>,
  fitLines: AssistantLine[],
  post: AssistantPosterior,
): { line: AssistantLine; z: number }[] {
  const out: { line: AssistantLine; z: number }[] = [];
  let current = fitLines;
  let chi2 = post.chi2;
  let sigmaW = Math.sqrt(post.scale2);
  while (out.length < Math.floor(fitLines.length / 3) && sigmaW > 3 && current.length > 3) {
    let best = -1;
    let bestChi2 = Infinity;
    let bestSigmaW = 0;
    for (let j = 0; j < current.length; j++) {
      const rest = current.filter((_, i) => i !== j);
      const r = assistantPosteriorFit(model, priors, rest, post.model);
      if (r.chi2 >= bestChi2) continue;
      best = j;
      bestChi2 = r.chi2;
      bestSigmaW = Math.sqrt(r.scale2);
    }
    if (best < 0 || chi2 - bestChi2 < DELETION_CHI2_SHARE * chi2) break;
    const line = current[best];
    out.push({ line, z: Math.sqrt(Math.max(chi2 - bestChi2, 0)) / Math.max(bestSigmaW, 1) });
    current = current.filter((_, i) => i !== best);
    chi2 = bestChi2;
    sigmaW = bestSigmaW;
  }
  return out;
}

function labelOf(l: AssistantLine, model: BandModel): string {
  return lineLabelAscii(l.kUpper - l.kLower, l.jUpper - l.jLower, l.kLower, l.jLower, model.shape);
}

function median(values: number[]): number {
  if (values.length === 0) return NaN;
  const a = [...values].sort((x, y) => x - y);
  const m = a.length >> 1;
  return a.length % 2 ? a[m] : 0.5 * (a[m - 1] + a[m]);
}

function minOf(a: Float64Array, n: number): number {
  let m = Infinity;
  for (let i = 0; i < n; i++) if (a[i] < m) m = a[i];
  return Number.isFinite(m) ? m : 0;
}
