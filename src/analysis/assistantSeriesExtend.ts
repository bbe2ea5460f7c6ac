import type { FitResult } from '../fit/fitTypes';
import { bandLines } from '../physics/bandLines';
import { seriesLabelAscii } from '../physics/lineLabel';
import type { BandModel, LineList } from '../physics/model';
import { transitionWavenumber } from '../physics/termValues';
import { assistantMatch } from './assistantMatch';
import { assistantOptionsResolve } from './assistantOptions';
import {
  assistantNearestPeak,
  assistantPeakContext,
  assistantPeaksCheck,
  assistantPeaksInRange,
  assistantPeaksUsable,
  assistantPeakUncertainty,
} from './assistantPeakContext';
import {
  assistantCatalogue,
  assistantPairSigma,
  assistantQuantaKey,
  assistantRungOf,
  assistantStudentFactor,
  type AssistantCatalogue,
} from './assistantPredict';
import type { AssistantAmbiguityKind, AssistantCandidatePeak, AssistantLine, AssistantOptions, AssistantRung } from './assistantTypes';
import type { PeakList } from './peaksFind';

/** A sub-branch series: all lines of one (ΔK, K'', ΔJ). */
export interface AssistantSeries {
  /** K' − K'' (−1, 0, +1). */
  deltaK: number;
  kLower: number;
  /** J' − J'' (−1 P, 0 Q, +1 R). */
  deltaJ: number;
}

/** Inputs of assistantSeriesExtend. */
export interface AssistantSeriesInput {
  model: BandModel;
  series: AssistantSeries;
  /** The current set; the series' rungs are those of its lines that are not rejected or excluded. */
  lines: readonly AssistantLine[];
  peaks: PeakList;
  /** A fit of the current set; without one the prediction is the model plus a polynomial learned from the rungs. */
  fit?: FitResult | null;
  /** Rungs predicted beyond each end of the assigned ones. @default 3 */
  rungs?: number;
  options?: AssistantOptions;
  /** Prefix of the ids of proposals. @default 'series' */
  idPrefix?: string;
}

/** One predicted rung of the series with the peaks it could be. */
export interface AssistantSeriesRung extends AssistantRung {
  /** Below the lowest assigned J'', above the highest, or in a gap between them. */
  direction: 'down' | 'up' | 'gap';
  /** Peaks within k·σ of the prediction, nearest first. */
  candidates: AssistantCandidatePeak[];
  /** 'match' when exactly one free peak fits and nothing competes for it; else why not. */
  status: 'match' | 'none' | AssistantAmbiguityKind;
  /** The proposal (status 'proposed', source 'series-extend') for a match, else null. */
  proposal: AssistantLine | null;
  /** Plain words. */
  reason: string;
}

/** Outcome of assistantSeriesExtend. */
export interface AssistantSeriesResult {
  /** ASCII series label, e.g. "rQ3". */
  label: string;
  /** 'fit': predictions from the fit; 'series-polynomial': model + polynomial of obs − model in J''. */
  method: 'fit' | 'series-polynomial';
  /** Coefficients c0, c1, c2 of obs − model = Σ c_n (J'' − J̄)^n (cm^-1), for 'series-polynomial'. */
  polynomial: { degree: number; centreJ: number; coefficientsCm1: number[] } | null;
  /** J'' of the assigned rungs used. */
  assignedJ: number[];
  rungs: AssistantSeriesRung[];
  warnings: string[];
}

/** Least rungs a series needs before it is extended. */
export const ASSISTANT_SERIES_MIN_RUNGS = 3;

/**
 * Predict the next rungs of one sub-branch series in both directions (and any gaps) and offer
 * the peaks that match.
 *
 * With a fit, each rung is predicted from it (fitPredict σ × Student factor ⊕ residual scatter ⊕
 * width floor, as in the auto-extend loop) and checked one-to-one against every other line of
 * the band (assistantMatch). Without one, the offset obs − model of the assigned rungs is fitted
 * by weighted least squares with a polynomial in J'' (degree 1 for 3 rungs, 2 for more; rungs on
 * possibly blended peaks weighted down as in the loop) and added
 * to the model; its σ is propagated from the polynomial's covariance (scaled by the reduced χ²
 * when that exceeds 1, and widened by the Student factor); other series are then not checked
 * (only peaks already carrying a line are refused).
 * Source: per-series smoothing of obs − calc by a low-order polynomial in J is common practice of
 * extending a sub-band; weighted least squares as in Bevington & Robinson (2003) ch. 7.
 * @returns the rungs with candidates, status and proposals (not added to any set: the caller
 *   decides), and the polynomial when one was used
 * @throws Error when the series has fewer than 3 assigned rungs, is not a series of the band, or
 *   an input is invalid (naming it)
 */
export function assistantSeriesExtend(input: AssistantSeriesInput): AssistantSeriesResult {
  const fn = 'assistantSeriesExtend';
  const peaks = assistantPeaksUsable(input.peaks).peaks;
  const bad = assistantPeaksCheck(fn, peaks);
  if (bad) throw new Error(bad);
  const { model, series } = input;
  const options = assistantOptionsResolve(model, input.options);
  const rungsBeyond = input.rungs ?? 3;
  if (!Number.isInteger(rungsBeyond) || rungsBeyond < 1) throw new Error(`${fn}: rungs must be a whole number >= 1, got ${rungsBeyond}`);
  const label = seriesLabelAscii(series.deltaK, series.deltaJ, series.kLower, model.shape);
  const context = assistantPeakContext(peaks, options.widthNeighbours, options.blendWidthRatio);
  const all = bandLines(model, { minIntensity: 0 });
  const inSeries: number[] = [];
  for (let i = 0; i < all.count; i++) {
    if (all.deltaK[i] === series.deltaK && all.deltaJ[i] === series.deltaJ && all.kLower[i] === series.kLower) inSeries.push(i);
  }
  if (inSeries.length === 0)
    throw new Error(`${fn}: the band has no series ${label} (ΔK ${series.deltaK}, K'' ${series.kLower}, ΔJ ${series.deltaJ})`);
  const live = input.lines.filter((l) => l.status !== 'rejected' && !l.isExcluded);
  const assigned = live.filter(
    (l) => l.kUpper - l.kLower === series.deltaK && l.jUpper - l.jLower === series.deltaJ && l.kLower === series.kLower,
  );
  if (assigned.length < ASSISTANT_SERIES_MIN_RUNGS) {
    throw new Error(`${fn}: series ${label} has ${assigned.length} assigned rung(s); at least ${ASSISTANT_SERIES_MIN_RUNGS} are needed`);
  }
  const assignedJ = [...new Set(assigned.map((l) => l.jLower))].sort((a, b) => a - b);
  const jLow = assignedJ[0];
  const jHigh = assignedJ[assignedJ.length - 1];
  const wanted = inSeries.filter((i) => {
    const j = all.jLower[i];
    return j >= jLow - rungsBeyond && j <= jHigh + rungsBeyond && !assignedJ.includes(j);
  });
  const warnings: string[] = [];

  let cat: AssistantCatalogue;
  let candidates: number[];
  let polynomial: AssistantSeriesResult['polynomial'] = null;
  if (input.fit) {
    cat = assistantCatalogue({
      model: input.fit.model,
      fit: input.fit,
      peaks,
      context,
      minIntensity: 0,
      widthFloorFraction: options.widthFloorFraction,
      fallbackSigmaCm1: options.fallbackSigmaCm1,
    });
    candidates = wanted.map((i) => cat.indexOf.get(keyOf(all, i))!).filter((i) => i !== undefined);
  } else {
    // Rungs on possibly blended peaks are weighted down here as in the loop (their given σ is kept
    // when larger).
    const weighted = assigned.map((l) =>
      l.peakIndex === null
        ? l
        : {
            ...l,
            uncertaintyCm1: Math.max(
              l.uncertaintyCm1,
              assistantPeakUncertainty(peaks, context, l.peakIndex, options.positionFloorFraction, options.blendUncertaintyFraction),
            ),
          },
    );
    const poly = seriesPolynomial(weighted, model);
    polynomial = { degree: poly.degree, centreJ: poly.centre, coefficientsCm1: poly.coefficients };
    const sub = lineListSubset(all, wanted);
    const predictedCm1 = new Float64Array(sub.count);
    const predictionSigmaCm1 = new Float64Array(sub.count);
    const toleranceSigmaCm1 = new Float64Array(sub.count);
    for (let s = 0; s < sub.count; s++) {
      const p = poly.predict(sub.jLower[s]);
      predictedCm1[s] = sub.wavenumberCm1[s] + p.valueCm1;
      predictionSigmaCm1[s] = p.sigmaCm1;
      const k = assistantNearestPeak(peaks, predictedCm1[s]);
      const floor = options.widthFloorFraction * (k >= 0 ? context.localFwhmCm1[k] : context.medianFwhmCm1 || 0);
      toleranceSigmaCm1[s] = Math.hypot(p.sigmaCm1, floor);
    }
    const order = Int32Array.from({ length: sub.count }, (_, s) => s).sort((a, b) => predictedCm1[a] - predictedCm1[b]);
    const indexOf = new Map<string, number>();
    for (let s = 0; s < sub.count; s++) indexOf.set(keyOf(sub, s), s);
    cat = { lines: sub, predictedCm1, predictionSigmaCm1, toleranceSigmaCm1, order, indexOf };
    candidates = Array.from({ length: sub.count }, (_, s) => s);
    warnings.push(
      `No fit: ${label} predicted from the model plus a degree-${poly.degree} polynomial of obs − model in J''; other series were not checked for competing rungs.`,
    );
  }

  const isRungAssigned = new Uint8Array(cat.lines.count);
  for (const l of live) {
    const i = cat.indexOf.get(assistantQuantaKey(l));
    if (i !== undefined) isRungAssigned[i] = 1;
  }
  const peakOwner: string[] = new Array(peaks.count).fill('');
  for (const l of live)
    if (l.peakIndex !== null && l.peakIndex < peaks.count)
      peakOwner[l.peakIndex] = seriesLabelAscii(l.kUpper - l.kLower, l.jUpper - l.jLower, l.kLower, model.shape) + `(${l.jLower})`;
  const forbidden = new Set<string>();
  for (const l of input.lines)
    if (l.status === 'rejected' && l.peakIndex !== null) forbidden.add(`${assistantQuantaKey(l)}@${l.peakIndex}`);
  const matched = assistantMatch({
    cat,
    peaks,
    context,
    shape: model.shape,
    candidates,
    isRungAssigned,
    peakOwner,
    forbidden,
    heightScale: NaN,
    options,
  });

  const usedIds = new Set(input.lines.map((l) => l.id));
  let counter = 0;
  const prefix = input.idPrefix ?? 'series';
  const k = options.toleranceSigma;
  const rungs: AssistantSeriesRung[] = candidates.map((i) => {
    const rung = assistantRungOf(cat, i, model.shape);
    const half = k * Math.hypot(cat.toleranceSigmaCm1[i], maxOf(peaks.centreSigmaCm1, peaks.count));
    const [first, last] = assistantPeaksInRange(peaks, rung.predictedCm1 - half, rung.predictedCm1 + half);
    const found: AssistantCandidatePeak[] = [];
    for (let p = first; p <= last; p++) {
      const sigma = assistantPairSigma(cat.toleranceSigmaCm1[i], peaks.centreSigmaCm1[p]);
      const d = Math.abs(peaks.wavenumberCm1[p] - rung.predictedCm1);
      if (d <= k * sigma) found.push({ peakIndex: p, wavenumberCm1: peaks.wavenumberCm1[p], distanceSigma: d / sigma, sigmaCm1: sigma });
    }
    found.sort((a, b) => a.distanceSigma - b.distanceSigma);
    const direction = rung.jLower < jLow ? 'down' : rung.jLower > jHigh ? 'up' : 'gap';
    const m = matched.matches.find((x) => x.rung === i);
    if (m) {
      let id: string;
      do id = `${prefix}${++counter}`;
      while (usedIds.has(id));
      usedIds.add(id);
      const proposal: AssistantLine = {
        id,
        jUpper: rung.jUpper,
        kUpper: rung.kUpper,
        jLower: rung.jLower,
        kLower: rung.kLower,
        observedCm1: peaks.wavenumberCm1[m.peak],
        uncertaintyCm1: assistantPeakUncertainty(
          peaks,
          context,
          m.peak,
          options.positionFloorFraction,
          options.blendUncertaintyFraction,
          m.hasPartnerWithin,
          m.overlapShiftCm1,
        ),
        isBlended: m.isBlend,
        isExcluded: false,
        note: m.reason,
        status: 'proposed',
        source: 'series-extend',
        peakIndex: m.peak,
        predictedCm1: rung.predictedCm1,
        matchSigmaCm1: m.sigmaCm1,
        distanceSigma: m.distanceSigma,
        reason: `series extension of ${label}: ${m.reason}`,
        iteration: 0,
      };
      return { ...rung, direction, candidates: found, status: 'match', proposal, reason: proposal.reason };
    }
    const amb = matched.ambiguous.find((a) => a.rungs.some((r) => r.label === rung.label));
    if (amb) return { ...rung, direction, candidates: found, status: amb.kind, proposal: null, reason: amb.reason };
    return {
      ...rung,
      direction,
      candidates: found,
      status: 'none',
      proposal: null,
      reason: `${rung.label}: no peak within ${k}σ of ${rung.predictedCm1.toFixed(4)} ± ${rung.toleranceSigmaCm1.toPrecision(2)} cm^-1`,
    };
  });
  rungs.sort((a, b) => a.jLower - b.jLower);
  return { label, method: input.fit ? 'fit' : 'series-polynomial', polynomial, assignedJ, rungs, warnings };
}

function keyOf(l: LineList, i: number): string {
  return `${l.jUpper[i]},${l.kUpper[i]},${l.jLower[i]},${l.kLower[i]}`;
}

function maxOf(a: Float64Array, n: number): number {
  let m = 0;
  for (let i = 0; i < n; i++) if (a[i] > m) m = a[i];
  return m;
}

/** The entries idx of a line list as a new (compact) line list. */
function lineListSubset(l: LineList, idx: readonly number[]): LineList {
  const pick = <T extends Int32Array | Int8Array | Float64Array>(col: T, make: (n: number) => T): T => {
    const out = make(idx.length);
    idx.forEach((i, s) => (out[s] = col[i]));
    return out;
  };
  const i32 = (n: number) => new Int32Array(n);
  const i8 = (n: number) => new Int8Array(n);
  const f64 = (n: number) => new Float64Array(n);
  return {
    count: idx.length,
    jUpper: pick(l.jUpper, i32),
    kUpper: pick(l.kUpper, i32),
    jLower: pick(l.jLower, i32),
    kLower: pick(l.kLower, i32),
    deltaK: pick(l.deltaK, i8),
    deltaJ: pick(l.deltaJ, i8),
    wavenumberCm1: pick(l.wavenumberCm1, f64),
    intensity: pick(l.intensity, f64),
    eLowerCm1: pick(l.eLowerCm1, f64),
    honlLondon: pick(l.honlLondon, f64),
  };
}

/**
 * Weighted least-squares polynomial of obs − model against x = J'' − J̄ (degree 1 for 3 rungs,
 * 2 for more), with the covariance of its prediction.
 * Source: normal equations of weighted linear least squares, Bevington & Robinson (2003) ch. 7;
 * σ² scaled by max(1, χ²/ν) and widened by the Student factor for ν = N − (degree + 1).
 */
export function seriesPolynomial(
  rungs: readonly AssistantLine[],
  model: BandModel,
): { degree: number; centre: number; coefficients: number[]; predict: (jLower: number) => { valueCm1: number; sigmaCm1: number } } {
  const n = rungs.length;
  const degree = n >= 4 ? 2 : 1;
  const m = degree + 1;
  const centre = rungs.reduce((s, l) => s + l.jLower, 0) / n;
  const ata = Array.from({ length: m }, () => new Float64Array(m));
  const atb = new Float64Array(m);
  const rows = rungs.map((l) => {
    const x = l.jLower - centre;
    const basis = Array.from({ length: m }, (_, p) => x ** p);
    const offset = l.observedCm1 - transitionWavenumber(model, l.jUpper, l.kUpper, l.jLower, l.kLower);
    return { basis, offset, w: 1 / (l.uncertaintyCm1 * l.uncertaintyCm1) };
  });
  for (const r of rows) {
    for (let a = 0; a < m; a++) {
      atb[a] += r.w * r.basis[a] * r.offset;
      for (let b = 0; b < m; b++) ata[a][b] += r.w * r.basis[a] * r.basis[b];
    }
  }
  const cov = invertSymmetric(ata);
  const coefficients = Array.from({ length: m }, (_, a) => cov[a].reduce((s, v, b) => s + v * atb[b], 0));
  let chi2 = 0;
  for (const r of rows) {
    const fitted = r.basis.reduce((s, v, p) => s + v * coefficients[p], 0);
    chi2 += r.w * (r.offset - fitted) ** 2;
  }
  const dof = n - m;
  const scale = dof > 0 ? Math.max(1, chi2 / dof) : 1;
  const factor = dof > 0 ? assistantStudentFactor(dof) : assistantStudentFactor(1);
  return {
    degree,
    centre,
    coefficients,
    predict: (jLower: number) => {
      const x = jLower - centre;
      const basis = Array.from({ length: m }, (_, p) => x ** p);
      const value = basis.reduce((s, v, p) => s + v * coefficients[p], 0);
      let variance = 0;
      for (let a = 0; a < m; a++) for (let b = 0; b < m; b++) variance += basis[a] * cov[a][b] * basis[b];
      return { valueCm1: value, sigmaCm1: factor * Math.sqrt(Math.max(variance, 0) * scale) };
    },
  };
}

/** Inverse of a small symmetric positive-definite matrix by Gauss–Jordan elimination with partial pivoting. */
function invertSymmetric(a: Float64Array[]): Float64Array[] {
  const m = a.length;
  const w = a.map((row, i) => {
    const r = new Float64Array(2 * m);
    r.set(row);
    r[m + i] = 1;
    return r;
  });
  for (let c = 0; c < m; c++) {
    let p = c;
    for (let r = c + 1; r < m; r++) if (Math.abs(w[r][c]) > Math.abs(w[p][c])) p = r;
    [w[c], w[p]] = [w[p], w[c]];
    const d = w[c][c];
    if (!(Math.abs(d) > 0)) throw new Error('assistantSeriesExtend: the rungs do not determine the polynomial (repeated J)');
    for (let k = 0; k < 2 * m; k++) w[c][k] /= d;
    for (let r = 0; r < m; r++) {
      if (r === c) continue;
      const f = w[r][c];
      if (f !== 0) for (let k = 0; k < 2 * m; k++) w[r][k] -= f * w[c][k];
    }
  }
  return w.map((r) => r.slice(m));
}
