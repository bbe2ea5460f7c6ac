/**
 * The Q branch of a linear molecule's Π–Σ band, found from the P and R branches' fit.
 *
 * The P and R lines reach the Π state's levels of one parity, the Q lines those of the other: they
 * fix the origin, B'' and B' + q/2 but say nothing about q, so the Q lines' positions
 * ν_Q(J) = ν₀ − B' + (B' − q/2) J(J+1) − B'' J(J+1) (+ centrifugal terms) carry the whole prior
 * uncertainty of q, which at J = 20 is tens of line widths. A spectroscopist slides the Q ladder
 * along q until its lines fall on peaks; this does the same as a one-dimensional search over q
 * (∂ν_Q/∂q = −J(J+1)/2), accepted only when its best count stands clearly above chance and above
 * every q far from it (same rule of thumb as the model-only shift search: a margin of 3 lines
 * and 15 %). Where the Q branch fills its own stretch of the trace with peaks, a far q can land
 * nearly as many lines within half a width of some peak; the P and R fit predicts the Q lines at
 * the right q to a small fraction of a width, a far q only at random within the window, so the
 * same counts are then taken again with a tight window (TIGHT_FRACTION of a width) and the tight
 * count decides, with the same margin, and only when most of the loose matches at the best q are
 * tight ones.
 * Source: the Π–Σ band structure (Herzberg I (1950) ch. V, l-type doubling; Q lines reach the
 * other Λ component, from memory); a discrete cross-correlation of the predicted Q ladder with the
 * observed peaks (common practice).
 */
import { bandLines } from '../physics/bandLines';
import { lineLabelAscii } from '../physics/lineLabel';
import type { BandModel } from '../physics/model';
import { assistantOptionsResolve } from './assistantOptions';
import { assistantPeakContext, assistantPeaksInRange, assistantSeedOnPeak } from './assistantPeakContext';
import type { AssistantLine } from './assistantTypes';
import type { PeakList } from './peaksFind';

/** Strongest Q lines the search slides (those that q moves by more than two line widths within its range). */
const Q_SEARCH_LINES = 40;
/** q is searched over ± this many prior σ around its fitted value. */
const Q_RANGE_SIGMA = 3;
/** Fewest matched lines for an answer. */
const Q_MIN_MATCHED = 6;
/** The best q must match max(Q_MARGIN_MIN, Q_MARGIN_FRACTION × its count) more lines than any far q (rule of thumb). */
const Q_MARGIN_MIN = 3;
const Q_MARGIN_FRACTION = 0.15;
/** Half-width of the tight window, as a fraction of the median FWHM (rule of thumb: a peak at SNR > 20 is placed to a few hundredths of its width). */
const TIGHT_FRACTION = 0.15;
/** Least share of the best q's loose matches that must also be tight ones. */
const TIGHT_SHARE_MIN = 0.6;
/** Most Q lines returned as seeds. */
const Q_SEEDS = 8;

/** Outcome of assistantQBranchSearch. */
export interface AssistantQBranchSearch {
  /** Seed lines of the Q branch at the best q (status 'seed', source 'auto-seed'); empty when not decided. */
  lines: AssistantLine[];
  /** What was found or why nothing, in words. */
  text: string;
}

/**
 * Slide the Q ladder of a Π–Σ band along q and return the Q lines that then sit alone on free peaks.
 * @param fitted the model after the P and R branches' fit (cm^-1)
 * @param qSigma prior 1σ of q, cm^-1 (> 0)
 * @param peaks peak list (ascending, cm^-1)
 * @param taken peaks that already carry a line (by index)
 * @param idPrefix prefix of the seed ids
 */
export function assistantQBranchSearch(
  fitted: BandModel,
  qSigma: number,
  peaks: PeakList,
  taken: ReadonlySet<number>,
  idPrefix = 'q-seed',
): AssistantQBranchSearch {
  const none = (text: string): AssistantQBranchSearch => ({ lines: [], text });
  if (fitted.shape !== 'linear' || fitted.band !== 'perpendicular') return none('not a Π–Σ band of a linear molecule');
  if (!(qSigma > 0) || peaks.count === 0) return none('no q range or no peaks to search');
  const context = assistantPeakContext(peaks);
  const tau = context.medianFwhmCm1;
  const lines = bandLines(fitted, { minIntensity: 1e-3 });
  const slope = (j: number) => 0.5 * j * (j + 1);
  const range = Q_RANGE_SIGMA * qSigma;
  const use = Array.from({ length: lines.count }, (_, i) => i)
    .filter((i) => lines.deltaJ[i] === 0 && range * slope(lines.jLower[i]) >= 2 * tau)
    .sort((a, b) => lines.intensity[b] - lines.intensity[a])
    .slice(0, Q_SEARCH_LINES);
  if (use.length < Q_MIN_MATCHED) return none(`only ${use.length} Q lines that q moves by more than two line widths`);
  const maxSlope = Math.max(...use.map((i) => slope(lines.jLower[i])));
  const counts: number[] = [];
  const free = (p: number) => !taken.has(p);
  const onPeak = (x: number, halfWidth: number): number => {
    const [first, last] = assistantPeaksInRange(peaks, x - halfWidth, x + halfWidth);
    for (let p = first; p <= last; p++) if (free(p)) return p;
    return -1;
  };
  // Moving q by dq moves line i by −dq·J(J+1)/2; the grid is fine enough for the tight window.
  const tight = TIGHT_FRACTION * tau;
  const step = tight / maxSlope;
  const nSteps = Math.min(12000, Math.ceil(range / step));
  const tightCounts: number[] = [];
  for (let s = -nSteps; s <= nSteps; s++) {
    const dq = (s * range) / nSteps;
    let c = 0;
    let t = 0;
    for (const i of use) {
      const x = lines.wavenumberCm1[i] - dq * slope(lines.jLower[i]);
      if (onPeak(x, 0.5 * tau) >= 0) {
        c++;
        if (onPeak(x, tight) >= 0) t++;
      }
    }
    counts.push(c);
    tightCounts.push(t);
  }
  const dqOf = (s: number) => ((s - nSteps) * range) / nSteps;
  const medianSlope = [...use.map((i) => slope(lines.jLower[i]))].sort((a, b) => a - b)[use.length >> 1];
  const n = use.length;
  const fmtQ = (s: number) => `${fitted.upper.q + dqOf(s) >= 0 ? '+' : ''}${(fitted.upper.q + dqOf(s)).toExponential(3)}`;
  /** Best grid point of `c`, the most any q far from it reaches (a far q moves the median line by more than a line width: it cannot reuse the same peaks), and the median. */
  const rank = (c: number[]) => {
    let best = 0;
    for (let s = 1; s < c.length; s++) if (c[s] > c[best]) best = s;
    let second = 0;
    for (let s = 0; s < c.length; s++) if (Math.abs(dqOf(s) - dqOf(best)) * medianSlope > tau) second = Math.max(second, c[s]);
    return { best, count: c[best], second, median: [...c].sort((a, b) => a - b)[c.length >> 1] };
  };
  const stands = (r: ReturnType<typeof rank>) =>
    r.count >= Q_MIN_MATCHED &&
    r.count / n >= (2 * r.median) / n + 0.1 &&
    r.count - r.second >= Math.max(Q_MARGIN_MIN, Q_MARGIN_FRACTION * r.count);
  const loose = rank(counts);
  let figures = `${loose.count} of ${n} Q lines on free peaks at q ${fmtQ(loose.best)} cm^-1, at most ${loose.second} at any q far from it, ${loose.median} typically`;
  let best = loose.best;
  if (!stands(loose)) {
    // The loose window cannot tell: the tight one may (see the header).
    const close = rank(tightCounts);
    const looseThere = counts[close.best];
    figures +=
      `; within ${TIGHT_FRACTION} of a line width: ${close.count} at q ${fmtQ(close.best)} cm^-1 (of its ${looseThere} loose matches), ` +
      `at most ${close.second} at any q far from it, ${close.median} typically`;
    if (!stands(close) || close.count < TIGHT_SHARE_MIN * looseThere) return none(`the Q branch is not placed: ${figures}`);
    best = close.best;
  }
  const dq = dqOf(best);
  const options = assistantOptionsResolve(fitted);
  const out: AssistantLine[] = [];
  const used = new Set<number>();
  for (const i of use) {
    if (out.length >= Q_SEEDS) break;
    const x = lines.wavenumberCm1[i] - dq * slope(lines.jLower[i]);
    const [first, last] = assistantPeaksInRange(peaks, x - tau, x + tau);
    // Exactly one peak within a line width, free, and the line within half a width of it.
    if (first !== last || !free(first) || used.has(first) || Math.abs(peaks.wavenumberCm1[first] - x) > 0.5 * tau) continue;
    used.add(first);
    const label = lineLabelAscii(lines.deltaK[i], 0, lines.kLower[i], lines.jLower[i], fitted.shape);
    const reason = `Q-branch search: ${label} predicted at ${x.toFixed(4)} cm^-1 with the q the Q ladder fits best (${figures}); the only peak within a line width`;
    const quanta = { jUpper: lines.jUpper[i], kUpper: lines.kUpper[i], jLower: lines.jLower[i], kLower: lines.kLower[i] };
    const place = { id: `${idPrefix}${out.length + 1}`, quanta, peak: first, predictedCm1: x, matchSigmaCm1: tau / 2, reason };
    out.push(assistantSeedOnPeak(peaks, context, place, options.positionFloorFraction, options.blendUncertaintyFraction));
  }
  if (out.length < 3) return none(`the Q branch is placed (${figures}) but only ${out.length} of its lines sit alone on a peak`);
  return { lines: out, text: `the Q branch placed by q: ${figures}; ${out.length} of its lines seeded` };
}
