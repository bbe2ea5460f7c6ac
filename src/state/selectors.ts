/**
 * Derived data, memoised on the identity of the store fields it reads (never stored, so it can
 * never disagree with the constants). Call as `useBench(selectLines)` or `selectLines(getState())`.
 */
import { peaksFind, type PeakList } from '../analysis/peaksFind';
import type { Assignment } from '../fit/assignment';
import { fitPredict, fitPredictLines } from '../fit/fitPredict';
import type { FitOutcome, FitResult } from '../fit/fitTypes';
import { bandLadders, type Ladder } from '../physics/bandLadders';
import { bandLines } from '../physics/bandLines';
import { lineLabelAscii, lineLabelHtml } from '../physics/lineLabel';
import type { BandModel, LineList, TopShape } from '../physics/model';
import { transitionWavenumber } from '../physics/termValues';
import { assignmentDeviation } from './assignLogic';
import { quantaKey } from './candidateRank';
import { memoLast } from './memo';
import { simulationBuild, type SimulatedSpectrum } from './simulation';
import type { BenchState } from './store';

/** Predicted lines and their ladders, or the reason the model gives none. */
export interface PredictedBand {
  lines: LineList;
  ladders: Ladder[];
  /** Lookup quantaKey → index into lines. */
  indexOf: Map<string, number>;
  /** Lookup ladder key → ladder. */
  ladderByKey: Map<string, Ladder>;
  /** Why no lines could be computed (bad constants), else null. */
  error: string | null;
}

const EMPTY_LINES: LineList = {
  count: 0,
  jUpper: new Int32Array(0),
  kUpper: new Int32Array(0),
  jLower: new Int32Array(0),
  kLower: new Int32Array(0),
  deltaK: new Int8Array(0),
  deltaJ: new Int8Array(0),
  wavenumberCm1: new Float64Array(0),
  intensity: new Float64Array(0),
  eLowerCm1: new Float64Array(0),
  honlLondon: new Float64Array(0),
};

const predictedBand = memoLast((model: BandModel, minIntensity: number): PredictedBand => {
  let lines: LineList;
  try {
    lines = bandLines(model, { minIntensity });
  } catch (err) {
    return { lines: EMPTY_LINES, ladders: [], indexOf: new Map(), ladderByKey: new Map(), error: (err as Error).message };
  }
  const ladders = bandLadders(lines, model.shape);
  const indexOf = new Map<string, number>();
  for (let i = 0; i < lines.count; i++) {
    indexOf.set(`${lines.jUpper[i]},${lines.kUpper[i]},${lines.jLower[i]},${lines.kLower[i]}`, i);
  }
  return { lines, ladders, indexOf, ladderByKey: new Map(ladders.map((l) => [l.key, l])), error: null };
});

/** Predicted lines and ladders of the current model. */
export function selectBand(s: BenchState): PredictedBand {
  return predictedBand(s.model, s.minIntensity);
}

const peaksOf = memoLast((trace: BenchState['trace'], minSnr: number, baseline: boolean): { peaks: PeakList | null; error: string | null } => {
  if (!trace || trace.wavenumberCm1.length < 5) return { peaks: null, error: null };
  try {
    return { peaks: peaksFind(trace, { minSnr, baseline }), error: null };
  } catch (err) {
    return { peaks: null, error: (err as Error).message };
  }
});

const PEAKS_PENDING: { peaks: PeakList | null; error: string | null } = { peaks: null, error: null };

const peaksFromResult = memoLast((r: NonNullable<BenchState['peaksResult']>) => ({ peaks: r.peaks, error: r.error }));

/**
 * Peaks found in the current trace (null without a trace). With peak finding in the worker
 * (actionsPeaks), the peaks are null until the worker's result for this trace and these settings
 * has arrived; otherwise (Node, tests) they are computed here on first use.
 */
export function selectPeaks(s: BenchState): { peaks: PeakList | null; error: string | null } {
  if (!s.isPeaksInWorker) return peaksOf(s.trace, s.peakMinSnr, s.peakBaseline);
  const r = s.peaksResult;
  if (r && r.trace === s.trace && r.minSnr === s.peakMinSnr && r.baseline === s.peakBaseline) return peaksFromResult(r);
  return PEAKS_PENDING;
}

/** The last successful fit result, or null. */
export function selectFitResult(s: BenchState): FitResult | null {
  return s.fitOutcome?.ok ? s.fitOutcome.result : null;
}

const predictionSigmas = memoLast((lines: LineList, outcome: FitOutcome | null): Float64Array | null => {
  if (!outcome?.ok || outcome.result.isExactlyDetermined) return null;
  return fitPredictLines(outcome.result, lines).sigmaCm1;
});

/** 1σ of each predicted line's position from the last fit's covariance (cm^-1), or null. */
export function selectPredictionSigmas(s: BenchState): Float64Array | null {
  return predictionSigmas(selectBand(s).lines, s.fitOutcome);
}

/** One row of the assignments table. */
export interface AssignmentRow {
  a: Assignment;
  labelAscii: string;
  labelHtml: string;
  deltaJ: number;
  deltaK: number;
  /** Position from the current model, cm^-1. */
  calcCm1: number;
  omcCm1: number;
  /** |o − c| in σ (with a fit), else null. */
  omcSigma: number | null;
  isFar: boolean;
  /** Flagged an outlier by the last fit. */
  isOutlier: boolean;
}

const assignmentRows = memoLast(
  (assignments: Assignment[], model: BandModel, outcome: FitOutcome | null, fitIds: string[], toleranceCm1: number): AssignmentRow[] => {
    const result = outcome?.ok && !outcome.result.isExactlyDetermined ? outcome.result : null;
    const outlierIds = new Set<string>();
    if (outcome?.ok) for (const i of outcome.result.outliers) outlierIds.add(fitIds[i]);
    return assignments.map((a) => {
      const calcCm1 = transitionWavenumber(model, a.jUpper, a.kUpper, a.jLower, a.kLower);
      const sigmaPred = result ? fitPredict(result, a).sigmaCm1 : null;
      const dev = assignmentDeviation(a.observedCm1, calcCm1, a.uncertaintyCm1, sigmaPred, toleranceCm1);
      const deltaK = a.kUpper - a.kLower;
      const deltaJ = a.jUpper - a.jLower;
      return {
        a,
        labelAscii: lineLabelAscii(deltaK, deltaJ, a.kLower, a.jLower, model.shape),
        labelHtml: lineLabelHtml(deltaK, deltaJ, a.kLower, a.jLower, model.shape),
        deltaJ,
        deltaK,
        calcCm1,
        omcCm1: dev.omcCm1,
        omcSigma: dev.omcSigma,
        isFar: dev.isFar,
        isOutlier: outlierIds.has(a.id),
      };
    });
  },
);

/** Assignments with labels, calculated positions and flags. */
export function selectAssignmentRows(s: BenchState): AssignmentRow[] {
  return assignmentRows(s.assignments, s.model, s.fitOutcome, s.fitLineIds, s.farToleranceCm1);
}

const assignedKeys = memoLast((assignments: Assignment[]): Set<string> => new Set(assignments.map(quantaKey)));

/** Quanta keys of every assigned line. */
export function selectAssignedKeys(s: BenchState): Set<string> {
  return assignedKeys(s.assignments);
}

const simulated = memoLast(
  (lines: LineList, trace: BenchState['trace'], temperatureK: number, massAmu: number, lorentzHwhmCm1: number): { sim: SimulatedSpectrum | null; error: string | null } => {
    try {
      return { sim: simulationBuild(lines, trace, { temperatureK, massAmu, lorentzHwhmCm1 }), error: null };
    } catch (err) {
      return { sim: null, error: (err as Error).message };
    }
  },
);

/** Simulated spectrum of the current model (computed only when asked for). */
export function selectSimulated(s: BenchState): { sim: SimulatedSpectrum | null; error: string | null } {
  return simulated(selectBand(s).lines, s.trace, s.model.temperatureK, s.massAmu, s.lorentzHwhmCm1);
}

/** Label of a line of the current model by quanta (ASCII). */
export function quantaLabel(q: { jUpper: number; kUpper: number; jLower: number; kLower: number }, shape: TopShape): string {
  return lineLabelAscii(q.kUpper - q.kLower, q.jUpper - q.jLower, q.kLower, q.jLower, shape);
}
