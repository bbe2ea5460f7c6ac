/**
 * Where is a state perturbed? Scans the observed − calculated term values of a state's levels
 * (fit/levelTermValues.ts) the way a spectroscopist reads a reduced term-value plot:
 * - along J within each K stack, a level or a run of levels that leaves the smooth course of its
 *   neighbours (a local level crossing: the shifts grow towards the crossing and change sign
 *   across it);
 * - across K, a jump of a whole stack's offset between neighbouring K (a crossing in K: the fit's
 *   smooth K-dependence cannot follow it);
 * - a stack whose o − c drifts with J(J+1) unlike the others (a near-crossing that J tunes).
 * Every finding carries its size against the noise, so a reader can weigh it; nothing is claimed
 * from a single line where a blend is as likely (that is said in words).
 * Source: the procedure follows common practice in perturbation analysis of rovibrational bands
 * (e.g. G. Herzberg, Molecular Spectra and Molecular Structure II (1945), ch. IV on perturbations;
 * H. Lefebvre-Brion and R. W. Field, The Spectra and Dynamics of Diatomic Molecules (2004), ch. 6 —
 * from memory); thresholds are common practice, stated at each use.
 */
import { fitBand } from '../fit/fitBand';
import { levelTermValues, type LevelState, type LevelTermValue } from '../fit/levelTermValues';
import type { FitError, FitInput } from '../fit/fitTypes';
import { arrayMedianInPlace } from './arrayMedian';

/** Median of a fresh copy (the input is left as it was). */
function arrayMedian(values: Float64Array): number {
  return arrayMedianInPlace(values.slice());
}

/** Kinds of finding. */
export type PerturbationKind = 'local' | 'stack-jump' | 'stack-drift';

/** One place where a state looks perturbed. */
export interface PerturbationFinding {
  kind: PerturbationKind;
  state: LevelState;
  /** K of the stack (for a stack-jump, the upper K of the pair; kFrom is the other). */
  k: number;
  /** For a stack-jump: the K the jump starts from; otherwise equal to k. */
  kFrom: number;
  /** Level component (see LevelTermValue.component). */
  component: number;
  /** J range of the levels involved. */
  jFrom: number;
  jTo: number;
  /** J of the largest deviation (local), or of the middle of the stack. */
  jPeak: number;
  /** Size of the deviation, cm^-1 (local: excursion at jPeak; stack-jump: offset change; stack-drift: change over the J range). */
  sizeCm1: number;
  /** sizeCm1 over the noise level used for the decision (dimensionless). */
  significance: number;
  /** Plain words, e.g. "K' = 8: levels J' = 20–24 shifted by up to +0.031 cm⁻¹ …". */
  description: string;
}

/** Options of perturbationScan. */
export interface PerturbationScanOptions {
  /** A deviation counts when it exceeds this many noise levels. @default 5 (common practice: well above 3σ, since hundreds of levels are scanned) */
  thresholdSigma?: number;
  /** Half-width of the running median that stands for a stack's smooth course, in levels. @default 3 */
  halfWindow?: number;
}

/** Result of perturbationScan. */
export interface PerturbationScanResult {
  /** Findings, most significant first. */
  findings: PerturbationFinding[];
  /** Noise level of a level's o − c used for the decisions, cm^-1. */
  noiseCm1: number;
  /** Levels and stacks looked at. */
  nLevels: number;
  nStacks: number;
}

const MAD_TO_SIGMA = 1.4826;

function mad(values: number[]): number {
  if (values.length === 0) return 0;
  const m = arrayMedian(Float64Array.from(values));
  return arrayMedian(Float64Array.from(values, (v) => Math.abs(v - m)));
}

function fmt(x: number): string {
  return (x >= 0 ? '+' : '−') + Math.abs(x).toPrecision(2);
}

/**
 * Scan a state's levels for perturbations.
 * @param levels levels of ONE state (levelTermValues output), energies in cm^-1
 * @returns findings (most significant first) and the noise level used, cm^-1
 */
export function perturbationScan(levels: readonly LevelTermValue[], options: PerturbationScanOptions = {}): PerturbationScanResult {
  const threshold = options.thresholdSigma ?? 5;
  const halfWindow = options.halfWindow ?? 3;
  if (!(threshold > 0)) throw new Error(`perturbationScan: thresholdSigma must be > 0, got ${threshold}`);
  if (!Number.isInteger(halfWindow) || halfWindow < 1)
    throw new Error(`perturbationScan: halfWindow must be an integer >= 1, got ${halfWindow}`);
  for (const l of levels) {
    if (!Number.isFinite(l.obsMinusCalcCm1) || !(l.sigmaCm1 > 0)) {
      throw new Error(
        `perturbationScan: level J=${l.j} K=${l.k} has o − c ${l.obsMinusCalcCm1} and σ ${l.sigmaCm1}; both must be finite, σ > 0`,
      );
    }
  }
  // Stacks: one per (component, K), levels by J.
  const stacks = new Map<string, LevelTermValue[]>();
  for (const l of levels) {
    const key = `${l.component},${l.k}`;
    let s = stacks.get(key);
    if (!s) stacks.set(key, (s = []));
    s.push(l);
  }
  for (const s of stacks.values()) s.sort((a, b) => a.j - b.j);
  const state = levels[0]?.state ?? 'upper';

  // Noise of a level's o − c: the scatter of differences between neighbouring J (a smooth course
  // cancels in them), never below the levels' own σ.
  const diffs: number[] = [];
  for (const s of stacks.values()) {
    for (let i = 1; i < s.length; i++) if (s[i].j - s[i - 1].j === 1) diffs.push(s[i].obsMinusCalcCm1 - s[i - 1].obsMinusCalcCm1);
  }
  const sigmas = levels.map((l) => l.sigmaCm1);
  const sigmaMedian = sigmas.length ? arrayMedian(Float64Array.from(sigmas)) : 0;
  const noise = Math.max(sigmaMedian, diffs.length >= 5 ? (MAD_TO_SIGMA * mad(diffs)) / Math.SQRT2 : 0);
  const findings: PerturbationFinding[] = [];
  if (levels.length === 0 || !(noise > 0)) return { findings, noiseCm1: noise, nLevels: levels.length, nStacks: stacks.size };

  const kLabel = state === 'upper' ? 'K′' : 'K″';
  const jLabel = state === 'upper' ? 'J′' : 'J″';
  const compLabel = (c: number) => (c > 0 ? ' (+ component)' : c < 0 ? ' (− component)' : '');

  // 1. Local excursions from the running median of each stack. Flagged levels are kept out of the
  // stack summaries below, so one shifted level does not make its whole stack look drifted.
  const locallyFlagged = new Set<LevelTermValue>();
  for (const s of stacks.values()) {
    if (s.length < 2 * halfWindow + 1) continue;
    const excursion = s.map((l, i) => {
      const lo = Math.max(0, i - halfWindow);
      const hi = Math.min(s.length, i + halfWindow + 1);
      const around = s.slice(lo, hi).map((x) => x.obsMinusCalcCm1);
      return l.obsMinusCalcCm1 - arrayMedian(Float64Array.from(around));
    });
    const flagged = excursion.map((e, i) => Math.abs(e) > threshold * Math.max(noise, s[i].sigmaCm1));
    s.forEach((l, i) => flagged[i] && locallyFlagged.add(l));
    for (let i = 0; i < s.length;) {
      if (!flagged[i]) {
        i++;
        continue;
      }
      let end = i;
      while (end + 1 < s.length && flagged[end + 1] && s[end + 1].j - s[end].j <= 2) end++;
      let peak = i;
      for (let m = i; m <= end; m++) if (Math.abs(excursion[m]) > Math.abs(excursion[peak])) peak = m;
      let signChange = false;
      for (let m = i; m < end; m++) if (Math.sign(excursion[m]) !== Math.sign(excursion[m + 1])) signChange = true;
      const lv = s[peak];
      const nLines = s.slice(i, end + 1).reduce((a, l) => a + l.nLines, 0);
      const single = end === i && lv.nLines === 1;
      const range = end === i ? `${jLabel} = ${lv.j}` : `${jLabel} = ${s[i].j}–${s[end].j}`;
      findings.push({
        kind: 'local',
        state,
        k: lv.k,
        kFrom: lv.k,
        component: lv.component,
        jFrom: s[i].j,
        jTo: s[end].j,
        jPeak: lv.j,
        sizeCm1: excursion[peak],
        significance: Math.abs(excursion[peak]) / noise,
        description:
          `${kLabel} = ${lv.k}${compLabel(lv.component)}: ${range} off the stack's course by up to ${fmt(excursion[peak])} cm⁻¹ ` +
          `(${(Math.abs(excursion[peak]) / noise).toFixed(0)}× the noise) at ${jLabel} = ${lv.j}` +
          (signChange ? '; the shift changes sign across the range, as at a level crossing' : '') +
          (single ? '; seen in one line only, so a blend or a misassignment is as likely as a perturbation' : `; ${nLines} lines agree`),
      });
      i = end + 1;
    }
  }

  // 2 and 3. Stack offsets and drifts, compared between neighbouring K of the same component.
  interface StackSummary {
    k: number;
    component: number;
    offset: number;
    drift: number;
    jFrom: number;
    jTo: number;
    n: number;
  }
  const summaries: StackSummary[] = [];
  for (const all of stacks.values()) {
    const s = all.filter((l) => !locallyFlagged.has(l));
    if (s.length < 3) continue;
    const offset = arrayMedian(Float64Array.from(s, (l) => l.obsMinusCalcCm1));
    // Weighted straight line of o − c against J(J+1); drift = change over the stack's J range.
    let sw = 0;
    let sx = 0;
    let sy = 0;
    let sxx = 0;
    let sxy = 0;
    for (const l of s) {
      const w = 1 / (l.sigmaCm1 * l.sigmaCm1);
      const x = l.j * (l.j + 1);
      sw += w;
      sx += w * x;
      sy += w * l.obsMinusCalcCm1;
      sxx += w * x * x;
      sxy += w * x * l.obsMinusCalcCm1;
    }
    const det = sw * sxx - sx * sx;
    const slope = det > 0 ? (sw * sxy - sx * sy) / det : 0;
    const x0 = s[0].j * (s[0].j + 1);
    const x1 = s[s.length - 1].j * (s[s.length - 1].j + 1);
    summaries.push({
      k: s[0].k,
      component: s[0].component,
      offset,
      drift: slope * (x1 - x0),
      jFrom: s[0].j,
      jTo: s[s.length - 1].j,
      n: s.length,
    });
  }
  summaries.sort((a, b) => a.component - b.component || a.k - b.k);
  const jumps: { from: StackSummary; to: StackSummary; size: number }[] = [];
  for (let i = 1; i < summaries.length; i++) {
    const a = summaries[i - 1];
    const b = summaries[i];
    if (a.component === b.component && b.k - a.k === 1) jumps.push({ from: a, to: b, size: b.offset - a.offset });
  }
  if (jumps.length >= 4) {
    // The fit's smooth K-dependence leaves small, slowly varying steps between stacks; a crossing in
    // K stands out from their robust scatter (and from the noise of a stack median).
    const scale = Math.max(MAD_TO_SIGMA * mad(jumps.map((j) => j.size)), noise);
    const centre = arrayMedian(Float64Array.from(jumps, (j) => j.size));
    for (const j of jumps) {
      const sig = Math.abs(j.size - centre) / scale;
      if (sig <= threshold * 0.8) continue; // 4 robust σ of the step scatter (common practice)
      findings.push({
        kind: 'stack-jump',
        state,
        k: j.to.k,
        kFrom: j.from.k,
        component: j.to.component,
        jFrom: Math.min(j.from.jFrom, j.to.jFrom),
        jTo: Math.max(j.from.jTo, j.to.jTo),
        jPeak: Math.round((j.to.jFrom + j.to.jTo) / 2),
        sizeCm1: j.size,
        significance: sig,
        description:
          `${kLabel} = ${j.from.k} → ${j.to.k}${compLabel(j.to.component)}: the whole stack's o − c jumps by ${fmt(j.size)} cm⁻¹ ` +
          `(${fmt(j.from.offset)} → ${fmt(j.to.offset)}; ${sig.toFixed(0)}× the scatter of the other steps): ` +
          'a perturbation localised in K, which the smooth K-dependence of the model cannot follow',
      });
    }
  }
  if (summaries.length >= 4) {
    const drifts = summaries.map((s) => s.drift);
    const centre = arrayMedian(Float64Array.from(drifts));
    const scale = Math.max(MAD_TO_SIGMA * mad(drifts), noise);
    for (const s of summaries) {
      const sig = Math.abs(s.drift - centre) / scale;
      if (sig <= threshold || s.n < 5) continue;
      findings.push({
        kind: 'stack-drift',
        state,
        k: s.k,
        kFrom: s.k,
        component: s.component,
        jFrom: s.jFrom,
        jTo: s.jTo,
        jPeak: Math.round((s.jFrom + s.jTo) / 2),
        sizeCm1: s.drift,
        significance: sig,
        description:
          `${kLabel} = ${s.k}${compLabel(s.component)}: o − c drifts by ${fmt(s.drift)} cm⁻¹ from ${jLabel} = ${s.jFrom} to ${s.jTo}, ` +
          `unlike the other stacks (${sig.toFixed(0)}× their scatter): a near-crossing whose distance changes with J`,
      });
    }
  }
  findings.sort((a, b) => b.significance - a.significance);
  return { findings, noiseCm1: noise, nLevels: levels.length, nStacks: stacks.size };
}

/** Result of perturbationSearch. */
export interface PerturbationSearchResult {
  /** Findings of the last round, most significant first, against the fit without the perturbed levels. */
  scan: PerturbationScanResult;
  /** Level term values of the scanned state against that fit (every line, excluded ones included). */
  levels: LevelTermValue[];
  /** Input indices of the lines set aside as perturbed before the last fit. */
  setAside: number[];
  /** Rounds of fit and scan run (1–maxRounds). */
  rounds: number;
  /** rms of the first fit (all lines) and of the last (perturbed levels set aside), cm^-1. */
  rmsFirstCm1: number;
  rmsLastCm1: number;
}

/**
 * Fit, scan, set the lines of the perturbed levels aside, fit again and scan all levels against
 * that fit — a perturbation pulls the constants towards itself, so the second look shows it
 * larger and the unperturbed stacks smaller. Findings from one line only are not set aside.
 * @param input the fit input (model start values cm^-1, floated keys, lines)
 * @param state which state's levels to scan
 * @returns the last round's findings, or the fit's refusal
 */
export function perturbationSearch(
  input: FitInput,
  state: LevelState,
  options: PerturbationScanOptions & { maxRounds?: number } = {},
): { ok: true; result: PerturbationSearchResult } | { ok: false; error: FitError } {
  const maxRounds = options.maxRounds ?? 3;
  const first = fitBand(input);
  if (!first.ok) return first;
  let fit = first.result;
  let lines = input.lines.map((l) => ({ ...l }));
  const setAside = new Set<number>();
  let scan = perturbationScan(levelTermValues(fit, state), options);
  let rounds = 1;
  while (rounds < maxRounds) {
    const before = setAside.size;
    for (const f of scan.findings) {
      const single = f.kind === 'local' && f.jFrom === f.jTo && f.description.includes('one line only');
      if (single) continue;
      lines.forEach((l, i) => {
        const j = state === 'upper' ? l.jUpper : l.jLower;
        const k = state === 'upper' ? l.kUpper : l.kLower;
        const inK = f.kind === 'stack-jump' ? k === f.k || k === f.kFrom : k === f.k;
        if (inK && j >= f.jFrom && j <= f.jTo && !l.isExcluded) setAside.add(i);
      });
    }
    if (setAside.size === before) break;
    lines = input.lines.map((l, i) => ({ ...l, isExcluded: l.isExcluded || setAside.has(i) }));
    const next = fitBand({ ...input, model: fit.model, lines });
    if (!next.ok) break;
    fit = next.result;
    rounds++;
    // Scan every level (set-aside ones included) against the fit of the unperturbed ones.
    const all = { ...fit, lines: fit.lines.map((l) => ({ ...l, isExcluded: false })) };
    scan = perturbationScan(levelTermValues(all, state), options);
  }
  const all = { ...fit, lines: fit.lines.map((l) => ({ ...l, isExcluded: false })) };
  return {
    ok: true,
    result: {
      scan,
      levels: levelTermValues(all, state),
      setAside: [...setAside].sort((a, b) => a - b),
      rounds,
      rmsFirstCm1: first.result.rmsCm1,
      rmsLastCm1: fit.rmsCm1,
    },
  };
}
