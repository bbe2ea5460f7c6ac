/**
 * Are the labels of a model-only assignment decided by the trace? A ladder laid on the peaks one
 * rung or one sub-band off can fit its own lines as well as the right one (an origin shift absorbs
 * the offset), so before a run started from the model alone may write rows, every rival labelling a
 * practitioner would worry about is fitted in its place and must lose clearly.
 *
 * Rivals: the J numbering of the P and R branches one rung up or down (m → m ± 1, Q lines kept), every
 * J'' one up or down, and (symmetric tops) every line one sub-band up or down (K'' → K'' ± 1 in a
 * parallel band, ΔK·K'' → ΔK·K'' ± 1 in a perpendicular band). Each is scored on the same footing as
 * the labels found:
 * - χ² of the relabelled lines in the prior-regularised fit (assistantPosteriorFit), divided by the
 *   labels' own σ_w² (so stated uncertainties that are too small do not inflate the difference), plus
 *   the prior's χ² (how far the constants must move from the first guess to make it fit: this is
 *   what catches a sub-band shift the origin alone would absorb);
 * - LINE_PENALTY for every line the rival cannot label at all (J < K: the first lines of a branch,
 *   or the missing lines around the band gap, decide the numbering) and for every strong, sharply
 *   predicted line of its fitted constants that lies on no peak (the same audit as the run's).
 * - when the peak heights are given, the intensity pattern: ln(height) of the lines on unblended
 *   peaks against ln(predicted intensity) of their labels (first-guess model: Hönl–London factors,
 *   Boltzmann factors and spin weights), a scale and a slope in E'' free (a wrong temperature only
 *   tilts it); the likelihood ratio n·ln(RSS_rival / RSS) of the two labellings over the lines both
 *   can label (Gaussian scatter of unknown σ; residuals clipped at 3 robust σ of the labels found,
 *   so a blend the peak finder missed counts as one outlier, not as proof). This is what tells a
 *   numbering one rung off (the first lines of a branch, P(1) against P(2)) and a sub-band shift
 *   (the spin-weight alternation along K) apart where the positions alone cannot.
 * The labels are decided when every rival scores at least DECISIVE_MARGIN worse.
 * Source: combination differences and the first lines of the branches decide J and K numbering in
 * rovibrational assignment (Herzberg II (1945) ch. IV; common practice); comparing the fits of the
 * rival labellings is the same test done by least squares.
 */
import { assignmentCheck } from '../fit/assignment';
import { bandLines } from '../physics/bandLines';
import type { BandModel, TransitionQuanta } from '../physics/model';
import { assistantPosteriorFit, type AssistantPosterior } from './assistantPosterior';
import type { AssistantLine, AssistantRunAudit } from './assistantTypes';

/** Score added for each line a rival cannot label and each strong predicted line it puts on no peak (χ² units). */
const LABEL_LINE_PENALTY = 16;
/** Every rival must score at least this much worse (χ² units: a likelihood ratio of e^12.5) for the labels to count as decided. */
export const LABEL_DECISIVE_MARGIN = 25;

/** One rival labelling and its score. */
export interface AssistantLabelRival {
  /** What the rival changes, in words. */
  what: string;
  /** The same as data (assistantLabelShift relabels a line). */
  shift: AssistantLabelShift;
  /** Lines it labels (relabelled quanta allowed by the selection rules). */
  nKept: number;
  /** Lines it cannot label (relabelled quanta impossible). */
  nDropped: number;
  /** Strong, sharply predicted lines of its fitted constants on no peak (0 when unknown). */
  missing: number;
  /** χ²/σ_w² of its lines in the prior-regularised fit. */
  chi2: number;
  /** The prior's χ² at its optimum. */
  priorChi2: number;
  /** Intensity evidence against it: n·ln(RSS_rival / RSS) of ln(height) (0 without heights; negative when its intensities fit better). */
  intensity: number;
  /** Total score (lower is better). */
  score: number;
}

/** Outcome of assistantLabelCheck. */
export interface AssistantLabelCheck {
  /** Score of the labels found (lower is better), on the rivals' footing. */
  score: number;
  /** Missing strong lines of the labels found (0 when unknown). */
  missing: number;
  rivals: AssistantLabelRival[];
  /** The rival with the lowest score, or null when there is none. */
  closest: AssistantLabelRival | null;
  /** closest.score − score (Infinity without a rival). */
  margin: number;
  /** Every rival scores at least LABEL_DECISIVE_MARGIN worse. */
  isDecided: boolean;
  /** Plain-language verdict. */
  text: string;
}

/** Inputs of assistantLabelCheck. */
export interface AssistantLabelCheckInput {
  /** The first guess (the prior's centre), cm^-1. */
  model: BandModel;
  /** Prior 1σ per floatable key (assistantPriorSigmas). */
  priors: Record<string, number>;
  /** The lines of the final fit (excluded ones are skipped). */
  lines: readonly AssistantLine[];
  /** Audit of fitted constants: strong, sharply predicted lines on no peak (null when unknown). */
  auditOf: (post: AssistantPosterior) => AssistantRunAudit | null;
  /** Peak heights of the trace's peak list (indexed by the lines' peakIndex); without them intensities are not used. */
  peakHeights?: Float64Array;
}

type Relabel = (q: TransitionQuanta) => TransitionQuanta;

/** Which numbering a rival changes: the P/R rung m, every J'', or the sub-band index; by one up (+1) or down (−1). */
export interface AssistantLabelShift {
  kind: 'rung' | 'j' | 'subBand';
  step: 1 | -1;
}

/**
 * The quanta of a line under a rival labelling (see AssistantLabelShift). The result may be
 * impossible (J < K, negative J): check it with assignmentCheck before use.
 */
export function assistantLabelShift(
  model: Pick<BandModel, 'shape' | 'band'>,
  shift: AssistantLabelShift,
  q: TransitionQuanta,
): TransitionQuanta {
  const t = shift.step;
  const quanta = { jUpper: q.jUpper, kUpper: q.kUpper, jLower: q.jLower, kLower: q.kLower };
  if (shift.kind === 'rung') {
    const dJ = q.jUpper - q.jLower;
    const jLower = q.jLower + t * dJ;
    return { ...quanta, jLower, jUpper: jLower + dJ };
  }
  if (shift.kind === 'j') return { ...quanta, jLower: q.jLower + t, jUpper: q.jUpper + t };
  if (model.band === 'perpendicular') {
    const index = (q.kUpper - q.kLower) * q.kLower + t;
    const deltaK = index >= 0 ? 1 : -1;
    const kLower = Math.abs(index);
    return { ...quanta, kLower, kUpper: kLower + deltaK };
  }
  return { ...quanta, kLower: q.kLower + t, kUpper: q.kUpper + t };
}

function rivalsOf(model: Pick<BandModel, 'shape' | 'band'>): { what: string; shift: AssistantLabelShift; relabel: Relabel }[] {
  const out: { what: string; shift: AssistantLabelShift; relabel: Relabel }[] = [];
  const add = (what: string, shift: AssistantLabelShift) =>
    out.push({ what, shift, relabel: (q) => ({ ...q, ...assistantLabelShift(model, shift, q) }) });
  for (const t of [1, -1] as const) {
    const word = t > 0 ? 'one rung up' : 'one rung down';
    add(`the P and R branches numbered ${word} (m → m ${t > 0 ? '+' : '−'} 1)`, { kind: 'rung', step: t });
    add(`every J'' ${word}`, { kind: 'j', step: t });
    if (model.shape === 'linear') continue;
    const sub = t > 0 ? 'one sub-band up' : 'one sub-band down';
    if (model.band === 'perpendicular') add(`every line ${sub} (ΔK·K'' → ΔK·K'' ${t > 0 ? '+' : '−'} 1)`, { kind: 'subBand', step: t });
    else add(`every line ${sub} (K'' → K'' ${t > 0 ? '+' : '−'} 1)`, { kind: 'subBand', step: t });
  }
  return out;
}

/**
 * Fit every rival labelling of the lines and say whether the labels found win clearly (see the
 * file comment for the rivals and the score).
 * @returns the scores, the closest rival and a verdict in words
 */
export function assistantLabelCheck(input: AssistantLabelCheckInput): AssistantLabelCheck {
  const { model, priors, auditOf } = input;
  const used = input.lines.filter((l) => !l.isExcluded && l.status !== 'rejected');
  const current = assistantPosteriorFit(model, priors, used);
  const scale2 = Math.max(1, current.scale2);
  const currentAudit = auditOf(current);
  const missing = currentAudit?.missing ?? 0;
  const score = current.chi2 / scale2 + current.priorChi2 + LABEL_LINE_PENALTY * missing;
  const rivals: AssistantLabelRival[] = [];
  const intensityOf = input.peakHeights ? predictedIntensities(model) : null;
  for (const { what, shift, relabel } of rivalsOf(model)) {
    const kept: AssistantLine[] = [];
    let nDropped = 0;
    for (const l of used) {
      const q = relabel(l);
      if (q.jLower < 0 || q.jUpper < 0 || q.kLower < 0 || assignmentCheck(q, model) !== null) nDropped++;
      else kept.push({ ...l, ...q });
    }
    if (kept.length === 0) continue;
    const post = assistantPosteriorFit(model, priors, kept);
    const rivalMissing = auditOf(post)?.missing ?? 0;
    const chi2 = post.chi2 / scale2;
    const intensity = intensityOf && input.peakHeights ? intensityEvidence(used, relabel, intensityOf, input.peakHeights) : 0;
    rivals.push({
      what,
      shift,
      nKept: kept.length,
      nDropped,
      missing: rivalMissing,
      chi2,
      priorChi2: post.priorChi2,
      intensity,
      score: chi2 + post.priorChi2 + LABEL_LINE_PENALTY * (nDropped + rivalMissing) + intensity,
    });
  }
  const closest = rivals.length ? rivals.reduce((a, b) => (b.score < a.score ? b : a)) : null;
  const margin = closest ? closest.score - score : Infinity;
  const isDecided = margin >= LABEL_DECISIVE_MARGIN;
  const figures = (s: number, chi2: number, prior: number, dropped: number, miss: number, inten?: number) =>
    `score ${s.toFixed(1)} (χ²/σ_w² ${chi2.toFixed(1)}, prior ${prior.toFixed(1)}, ${dropped} line(s) it cannot label, ${miss} strong line(s) on no peak` +
    (inten === undefined ? ')' : `, intensities ${inten >= 0 ? '+' : ''}${inten.toFixed(1)} against it)`);
  const mine = figures(score, current.chi2 / scale2, current.priorChi2, 0, missing);
  const text = !closest
    ? `no rival labelling of the ${used.length} lines can be formed`
    : isDecided
      ? `the labels of the ${used.length} lines beat every rival by ≥ ${LABEL_DECISIVE_MARGIN} (closest: ${closest.what}, ${margin.toFixed(1)} worse)`
      : margin < 0
        ? `the ${used.length} lines fit better with ${closest.what}: ${figures(closest.score, closest.chi2, closest.priorChi2, closest.nDropped, closest.missing, closest.intensity)} against ${mine}`
        : `the ${used.length} lines fit almost as well with ${closest.what}: ${figures(closest.score, closest.chi2, closest.priorChi2, closest.nDropped, closest.missing, closest.intensity)} against ${mine}; the difference ${margin.toFixed(1)} is below ${LABEL_DECISIVE_MARGIN}`;
  return { score, missing, rivals, closest, margin, isDecided, text };
}

/** Predicted intensity and E'' (cm^-1) of every line of the model, by quanta. */
type IntensityTable = Map<string, { intensity: number; eLowerCm1: number }>;

const quantaKey = (q: TransitionQuanta) => `${q.jUpper}:${q.kUpper}:${q.jLower}:${q.kLower}`;

function predictedIntensities(model: BandModel): IntensityTable {
  const lines = bandLines(model, { minIntensity: 1e-6 });
  const out: IntensityTable = new Map();
  for (let i = 0; i < lines.count; i++) {
    const key = quantaKey({ jUpper: lines.jUpper[i], kUpper: lines.kUpper[i], jLower: lines.jLower[i], kLower: lines.kLower[i] });
    // Two lines with the same quanta (a degenerate ±l pair) add.
    const prev = out.get(key);
    out.set(key, { intensity: (prev?.intensity ?? 0) + lines.intensity[i], eLowerCm1: lines.eLowerCm1[i] });
  }
  return out;
}

/** Fewest lines (on unblended peaks, labelled by both) for the intensity comparison. */
const INTENSITY_MIN_LINES = 8;
/** Residuals are clipped at this many robust σ of the labels found. */
const INTENSITY_CLIP_SIGMA = 3;
/** Floor of the robust σ of ln(height), so near-perfect heights do not make tiny ratios decisive. */
const INTENSITY_SIGMA_FLOOR = 0.05;

/** Residual sum of squares of y = a + b·x (least squares), or the residuals when asked. */
function lineResiduals(x: number[], y: number[]): number[] {
  const n = x.length;
  let sx = 0;
  let sy = 0;
  for (let i = 0; i < n; i++) {
    sx += x[i];
    sy += y[i];
  }
  const mx = sx / n;
  const my = sy / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (x[i] - mx) ** 2;
    sxy += (x[i] - mx) * (y[i] - my);
  }
  const b = sxx > 0 ? sxy / sxx : 0;
  return y.map((v, i) => v - my - b * (x[i] - mx));
}

function robustSigma(r: number[]): number {
  const a = r.map(Math.abs).sort((u, v) => u - v);
  return Math.max(INTENSITY_SIGMA_FLOOR, 1.4826 * a[Math.floor(a.length / 2)]);
}

/**
 * n·ln(RSS_rival / RSS) of ln(peak height) against ln(predicted intensity) + a + b·E'' over the
 * lines on unblended peaks that both labellings can label (0 when fewer than INTENSITY_MIN_LINES).
 */
function intensityEvidence(used: readonly AssistantLine[], relabel: Relabel, table: IntensityTable, heights: Float64Array): number {
  const mine: { y: number; e: number }[] = [];
  const theirs: { y: number; e: number }[] = [];
  for (const l of used) {
    if (l.isBlended || l.peakIndex === null) continue;
    const h = heights[l.peakIndex];
    if (!(h > 0)) continue;
    const a = table.get(quantaKey(l));
    const b = table.get(quantaKey(relabel(l)));
    if (!a || !b || !(a.intensity > 0) || !(b.intensity > 0)) continue;
    mine.push({ y: Math.log(h) - Math.log(a.intensity), e: a.eLowerCm1 });
    theirs.push({ y: Math.log(h) - Math.log(b.intensity), e: b.eLowerCm1 });
  }
  const n = mine.length;
  if (n < INTENSITY_MIN_LINES) return 0;
  const rMine = lineResiduals(
    mine.map((p) => p.e),
    mine.map((p) => p.y),
  );
  const rTheirs = lineResiduals(
    theirs.map((p) => p.e),
    theirs.map((p) => p.y),
  );
  const clip = INTENSITY_CLIP_SIGMA * robustSigma(rMine);
  const rss = (r: number[]) => r.reduce((s, v) => s + Math.min(v * v, clip * clip), 0) + n * INTENSITY_SIGMA_FLOOR ** 2;
  return n * Math.log(rss(rTheirs) / rss(rMine));
}
