import { seriesLabelAscii } from '../physics/lineLabel';
import type { TopShape } from '../physics/model';
import { assistantPeaksInRange, type AssistantPeakContext } from './assistantPeakContext';
import { assistantOverlapShift, assistantPairSigma, assistantRungOf, type AssistantCatalogue } from './assistantPredict';
import type { AssistantAmbiguity, AssistantCandidatePeak, AssistantOptionsResolved } from './assistantTypes';
import type { PeakList } from './peaksFind';

/** A neighbour pulling a line's maximum by more than this fraction of the FWHM sends the pair to review. */
const OVERLAP_REVIEW_FRACTION = 0.25;
/** A neighbour pulling a line's maximum by more than this fraction of the FWHM makes it a possible blend. */
const OVERLAP_BLEND_FRACTION = 0.05;

/** One rung matched to one peak without ambiguity. */
export interface AssistantMatch {
  /** Catalogue index of the rung. */
  rung: number;
  /** Peak index. */
  peak: number;
  /** |peak − predicted| / σ of the pair. */
  distanceSigma: number;
  /** σ of the pair, cm^-1. */
  sigmaCm1: number;
  /** The peak may hold another line (wide, flagged, or a weaker rung within tolerance). */
  isBlend: boolean;
  /** A weaker rung lies within tolerance of the peak (the position gets the full blend uncertainty). */
  hasPartnerWithin: boolean;
  /** Expected pull of the maximum by neighbouring predicted lines, cm^-1 (assistantOverlapShift). */
  overlapShiftCm1: number;
  /** Number of rungs assigned to this peak together (1, or the size of an unresolved K stack). */
  stack: number;
  /** Plain words. */
  reason: string;
}

/** Inputs of assistantMatch. */
export interface AssistantMatchInput {
  cat: AssistantCatalogue;
  peaks: PeakList;
  context: AssistantPeakContext;
  shape: TopShape;
  /** Catalogue indices of the rungs to try. */
  candidates: ArrayLike<number>;
  /** 1 for catalogue rungs already assigned (they explain their own peak and compete for no other). */
  isRungAssigned: Uint8Array;
  /** Label of the line on each peak, or '' for a free peak. */
  peakOwner: string[];
  /** "rungKey@peakIndex" pairs the user rejected. */
  forbidden: ReadonlySet<string>;
  /** Peak height per unit relative intensity (absorbance); NaN when not yet known. */
  heightScale: number;
  /**
   * Optional: 1 for rungs predicted well enough to compete for a peak (their window is narrow).
   * A rung whose position is still known only to many line widths lands on any one peak with a
   * small chance; it is neither a rival nor a blend partner until it is predicted better (the peak's
   * height and width are then what tell a blend). Absent: every rung competes.
   */
  isSharp?: Uint8Array;
  /**
   * Optional: the farthest a peak may lie from each rung's prediction, cm^-1 (the matching window
   * limit where the rung was offered); a poorly centred peak (large centre σ) then cannot widen
   * the pair's window beyond it.
   */
  maxDistanceCm1?: Float64Array;
  options: AssistantOptionsResolved;
}

/**
 * Match rungs to peaks where there is exactly one way: the rung has exactly one peak within
 * k·σ (σ of the pair: the rung's tolerance σ ⊕ the peak's centre σ), that peak is free, its
 * height agrees with the rung's predicted intensity within a factor intensityRatioMax (once the
 * scale is known), and no other unassigned rung at least 1/dominanceRatio as strong lies within
 * k·σ of the peak. The exception is an unresolved K stack: when every comparable rival has the
 * same ΔK, ΔJ and J'' (only K differs, as in the K structure of a parallel band) and each member's
 * only peak is this one, all members go to the peak together as a blend (nothing is chosen
 * between them). Everything else that comes close is listed as an ambiguity with all its
 * candidates and never chosen. Weaker rungs within tolerance (≥ blendPartnerFraction of the
 * candidate) and wide or flagged peaks mark the match as a possible blend.
 * Source: the one-to-one rule is common practice of assignment by prediction; the intensity
 * dominance factor is a rule of thumb (a line a quarter as strong cannot make the peak).
 * @returns the matches (at most one per rung and per peak) and the ambiguities
 */
export function assistantMatch(input: AssistantMatchInput): { matches: AssistantMatch[]; ambiguous: AssistantAmbiguity[] } {
  const { cat, peaks, context, options, shape } = input;
  const k = options.toleranceSigma;
  const n = cat.lines.count;
  let maxCentreSigma = 0;
  for (let p = 0; p < peaks.count; p++) maxCentreSigma = Math.max(maxCentreSigma, peaks.centreSigmaCm1[p]);
  let maxTol = 0;
  for (let i = 0; i < n; i++) maxTol = Math.max(maxTol, cat.toleranceSigmaCm1[i]);
  const sortedPred = Float64Array.from(cat.order, (i) => cat.predictedCm1[i]);

  const rungKey = (i: number) => `${cat.lines.jUpper[i]},${cat.lines.kUpper[i]},${cat.lines.jLower[i]},${cat.lines.kLower[i]}`;
  const pairPasses = (i: number, p: number): AssistantCandidatePeak | null => {
    const sigma = assistantPairSigma(cat.toleranceSigmaCm1[i], peaks.centreSigmaCm1[p]);
    const d = Math.abs(peaks.wavenumberCm1[p] - cat.predictedCm1[i]);
    const cap = input.maxDistanceCm1 ? input.maxDistanceCm1[i] : Infinity;
    return d <= k * sigma && d <= cap
      ? { peakIndex: p, wavenumberCm1: peaks.wavenumberCm1[p], distanceSigma: d / sigma, sigmaCm1: sigma }
      : null;
  };
  /** Unassigned rungs j ≠ i whose pair with peak p passes. */
  const rungsAtPeak = (p: number, except: number, nearCm1 = 0): number[] => {
    const x = peaks.wavenumberCm1[p];
    const half = k * Math.hypot(maxTol, peaks.centreSigmaCm1[p]);
    let lo = 0;
    let hi = sortedPred.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (sortedPred[mid] < x - half) lo = mid + 1;
      else hi = mid;
    }
    const out: number[] = [];
    for (let s = lo; s < sortedPred.length && sortedPred[s] <= x + half; s++) {
      const j = cat.order[s];
      if (j === except || input.isRungAssigned[j]) continue;
      // A loosely predicted rung competes only when its prediction itself falls within the window.
      if (input.isSharp && !input.isSharp[j] && !(Math.abs(sortedPred[s] - x) <= nearCm1)) continue;
      if (pairPasses(j, p)) out.push(j);
    }
    return out;
  };

  const matches: AssistantMatch[] = [];
  const matchedRungs = new Set<number>();
  const ambiguous: AssistantAmbiguity[] = [];
  const severalRungsAt = new Map<number, AssistantAmbiguity>();
  for (let c = 0; c < input.candidates.length; c++) {
    const i = input.candidates[c];
    const half = k * Math.hypot(cat.toleranceSigmaCm1[i], maxCentreSigma);
    const [first, last] = assistantPeaksInRange(peaks, cat.predictedCm1[i] - half, cat.predictedCm1[i] + half);
    const found: AssistantCandidatePeak[] = [];
    const key = rungKey(i);
    for (let p = first; p <= last; p++) {
      if (input.forbidden.has(`${key}@${p}`)) continue;
      const hit = pairPasses(i, p);
      if (hit) found.push(hit);
    }
    if (found.length === 0) continue;
    const rung = assistantRungOf(cat, i, shape);
    if (found.length > 1) {
      found.sort((a, b) => a.distanceSigma - b.distanceSigma);
      ambiguous.push({
        kind: 'several-peaks',
        rungs: [rung],
        peaks: found,
        reason: `${rung.label}: ${found.length} peaks lie within ${k}σ of the prediction ${rung.predictedCm1.toFixed(4)} cm^-1 (${found.map((f) => `${f.wavenumberCm1.toFixed(4)} at ${f.distanceSigma.toFixed(1)}σ`).join(', ')})`,
      });
      continue;
    }
    const hit = found[0];
    const p = hit.peakIndex;
    if (input.peakOwner[p] !== '') {
      ambiguous.push({
        kind: 'peak-taken',
        rungs: [rung],
        peaks: found,
        reason: `${rung.label}: the only peak within ${k}σ (${hit.wavenumberCm1.toFixed(4)} cm^-1) already carries ${input.peakOwner[p]} (possible blend)`,
      });
      continue;
    }
    if (matchedRungs.has(i)) continue;
    const intensity = cat.lines.intensity[i];
    const others = rungsAtPeak(p, i, k * hit.sigmaCm1);
    const competitors = others.filter((j) => cat.lines.intensity[j] * options.dominanceRatio >= intensity);
    // An unresolved K stack (same ΔK, ΔJ and J'', only K differs; the K structure of a parallel
    // band) is not a choice between candidates: all its members go to the peak, as a blend.
    const sameStack = (j: number) =>
      cat.lines.deltaK[j] === cat.lines.deltaK[i] &&
      cat.lines.deltaJ[j] === cat.lines.deltaJ[i] &&
      cat.lines.jLower[j] === cat.lines.jLower[i];
    let stack: number[] = [];
    if (competitors.length > 0 && competitors.every(sameStack)) {
      const strongest = Math.max(intensity, ...competitors.map((j) => cat.lines.intensity[j]));
      const members = [i, ...others.filter((j) => sameStack(j) && cat.lines.intensity[j] >= options.blendPartnerFraction * strongest)];
      const onlyThisPeak = members.every((j) => {
        const w = k * Math.hypot(cat.toleranceSigmaCm1[j], maxCentreSigma);
        const [a, b] = assistantPeaksInRange(peaks, cat.predictedCm1[j] - w, cat.predictedCm1[j] + w);
        for (let q = a; q <= b; q++) if (q !== p && pairPasses(j, q)) return false;
        return !input.forbidden.has(`${rungKey(j)}@${p}`);
      });
      if (onlyThisPeak) stack = members;
    }
    const contributing = stack.length ? stack : [i, ...others];
    if (Number.isFinite(input.heightScale) && input.heightScale > 0) {
      // Too strong: against this rung alone (or the whole stack); too weak: against all lines that
      // would contribute to the peak.
      const ratio = peaks.height[p] / (input.heightScale * contributing.reduce((sum, j) => sum + cat.lines.intensity[j], 0));
      const ownRatio = stack.length ? ratio : peaks.height[p] / (input.heightScale * intensity);
      if (!(ownRatio <= options.intensityRatioMax && ratio >= 1 / options.intensityRatioMax)) {
        ambiguous.push({
          kind: 'intensity-mismatch',
          rungs: [rung],
          peaks: found,
          reason: `${rung.label}: the only peak within ${k}σ (${hit.wavenumberCm1.toFixed(4)} cm^-1) is ${(ratio < 1 / options.intensityRatioMax ? ratio : ownRatio).toPrecision(2)}× the predicted height (allowed 1/${options.intensityRatioMax}…${options.intensityRatioMax})`,
        });
        continue;
      }
    }
    if (stack.length) {
      const label = seriesLabelAscii(cat.lines.deltaK[i], cat.lines.deltaJ[i], 0, shape).replace(/0$/, '');
      const ks = stack.map((j) => cat.lines.kLower[j]).sort((a, b) => a - b);
      for (const j of stack) {
        const r = assistantRungOf(cat, j, shape);
        const sigma = assistantPairSigma(cat.toleranceSigmaCm1[j], peaks.centreSigmaCm1[p]);
        const d = Math.abs(peaks.wavenumberCm1[p] - cat.predictedCm1[j]);
        const overlap = assistantOverlapShift(cat, j, context.localFwhmCm1[p]);
        matchedRungs.add(j);
        matches.push({
          rung: j,
          peak: p,
          distanceSigma: d / sigma,
          sigmaCm1: sigma,
          isBlend: true,
          hasPartnerWithin: true,
          overlapShiftCm1: overlap.shiftCm1,
          stack: stack.length,
          reason:
            `${r.label}: the unresolved K components K'' = ${ks.join(', ')} of ${label}(${cat.lines.jLower[i]}) share the only peak within ${k}σ ` +
            `(${hit.wavenumberCm1.toFixed(4)} cm^-1; this one ${(d / sigma).toFixed(2)}σ from ${r.predictedCm1.toFixed(4)}): all assigned to it as a blend, weighted down`,
        });
      }
      continue;
    }
    if (competitors.length > 0) {
      let entry = severalRungsAt.get(p);
      if (!entry) {
        entry = { kind: 'several-rungs', rungs: [], peaks: [hit], reason: '' };
        severalRungsAt.set(p, entry);
        ambiguous.push(entry);
      }
      for (const j of [i, ...competitors]) {
        if (!entry.rungs.some((r) => r.label === assistantRungOf(cat, j, shape).label)) entry.rungs.push(assistantRungOf(cat, j, shape));
      }
      entry.reason = `peak ${hit.wavenumberCm1.toFixed(4)} cm^-1: ${entry.rungs.length} comparably strong rungs predicted within ${k}σ (${entry.rungs.map((r) => `${r.label} at ${r.predictedCm1.toFixed(4)}`).join(', ')})`;
      continue;
    }
    const partners = others.filter((j) => cat.lines.intensity[j] >= options.blendPartnerFraction * intensity);
    if (partners.length === 0 && peaks.fwhmCm1[p] > options.blendWidthRatio * context.localFwhmCm1[p]) {
      // Wider than a single line, and no sharply predicted line explains the extra width: the peak
      // is a blend with a line not yet predicted well, and its maximum is nobody's position.
      ambiguous.push({
        kind: 'shape-mismatch',
        rungs: [rung],
        peaks: found,
        reason: `${rung.label}: the only peak within ${k}σ (${hit.wavenumberCm1.toFixed(4)} cm^-1) is a ${context.blendReason[p]} that no predicted line explains`,
      });
      continue;
    }
    const why: string[] = [];
    if (context.isPossibleBlend[p]) why.push(context.blendReason[p]);
    if (partners.length) {
      why.push(
        `possible blend with weaker ${partners.map((j) => `${assistantRungOf(cat, j, shape).label} (${(cat.lines.intensity[j] / intensity).toFixed(2)}×)`).join(', ')}`,
      );
    }
    const width = context.localFwhmCm1[p];
    const overlap = assistantOverlapShift(cat, i, width);
    if (Math.abs(overlap.shiftCm1) > OVERLAP_REVIEW_FRACTION * width && overlap.neighbour >= 0) {
      // The neighbours pull the maximum by a good part of a line width: the peak's centre is not
      // this line's position, so the pair goes to review rather than into the table.
      ambiguous.push({
        kind: 'shape-mismatch',
        rungs: [rung],
        peaks: found,
        reason: `${rung.label}: the only peak within ${k}σ (${hit.wavenumberCm1.toFixed(4)} cm^-1) is expected to be pulled by ${overlap.shiftCm1.toPrecision(2)} cm^-1 (${(Math.abs(overlap.shiftCm1) / width).toFixed(2)} line widths) by ${assistantRungOf(cat, overlap.neighbour, shape).label}`,
      });
      continue;
    }
    if (Math.abs(overlap.shiftCm1) > OVERLAP_BLEND_FRACTION * width && overlap.neighbour >= 0) {
      why.push(
        `on the wing of ${assistantRungOf(cat, overlap.neighbour, shape).label} (expected pull ${overlap.shiftCm1 >= 0 ? '+' : ''}${overlap.shiftCm1.toPrecision(2)} cm^-1)`,
      );
    }
    matchedRungs.add(i);
    matches.push({
      rung: i,
      peak: p,
      distanceSigma: hit.distanceSigma,
      sigmaCm1: hit.sigmaCm1,
      isBlend: why.length > 0,
      hasPartnerWithin: partners.length > 0,
      overlapShiftCm1: overlap.shiftCm1,
      stack: 1,
      reason:
        `${rung.label}: only peak within ${k}σ of ${rung.predictedCm1.toFixed(4)} ± ${hit.sigmaCm1.toPrecision(2)} cm^-1 ` +
        `(${hit.distanceSigma.toFixed(2)}σ) and the only rung for that peak` +
        (why.length ? `; ${why.join('; ')}: weighted down` : ''),
    });
  }
  // Guard: one peak never goes to two rungs in one pass unless they are one K stack (cannot happen
  // otherwise with the symmetric test above, but a wrong catalogue must not create a silent double
  // assignment).
  const byPeak = new Map<number, number>();
  for (const m of matches) byPeak.set(m.peak, (byPeak.get(m.peak) ?? 0) + 1);
  return { matches: matches.filter((m) => byPeak.get(m.peak) === m.stack), ambiguous };
}
