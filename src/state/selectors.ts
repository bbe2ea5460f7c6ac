/**
 * Derived data, memoised on the identity of the store fields it reads (never stored, so it can
 * never disagree with the constants). Call as `useBench(selectLines)` or `selectLines(getState())`.
 */
import { peaksFind, type PeakList } from '../analysis/peaksFind';
import type { Assignment } from '../fit/assignment';
import { fitPredictLines, fitPredictSigmas } from '../fit/fitPredict';
import type { FitOutcome, FitResult } from '../fit/fitTypes';
import { bandLadders, type Ladder } from '../physics/bandLadders';
import { bandLines } from '../physics/bandLines';
import { lineLabelAscii, lineLabelHtml } from '../physics/lineLabel';
import type { BandModel, LineList, TopShape } from '../physics/model';
import { transitionWavenumber } from '../physics/termValues';
import { assignmentDeviation } from './assignLogic';
import { quantaKey } from './candidateRank';
import { listAlign, listKeysUpdate, memoLast, type ListKeys } from './memo';
import { simulationBuild, type SimulatedSpectrum } from './simulation';
import type { BenchState } from './store';
import { selectSystemPrediction, type SystemPrediction } from './systemPredict';
import { systemRowCalcCreate, type SystemRowCalc } from './systemRowCalc';

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

/**
 * Lines and ladders of one single-band model (not memoised; selectBand and the Loomis–Wood band
 * memoise it each on their own).
 */
export function predictedBandCompute(model: BandModel, minIntensity: number): PredictedBand {
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
}

const predictedBand = memoLast(predictedBandCompute);

/** Predicted lines and ladders of the current model. */
export function selectBand(s: BenchState): PredictedBand {
  return predictedBand(s.model, s.minIntensity);
}

const peaksOf = memoLast(
  (trace: BenchState['trace'], minSnr: number, baseline: boolean): { peaks: PeakList | null; error: string | null } => {
    if (!trace || trace.wavenumberCm1.length < 5) return { peaks: null, error: null };
    try {
      return { peaks: peaksFind(trace, { minSnr, baseline }), error: null };
    } catch (err) {
      return { peaks: null, error: (err as Error).message };
    }
  },
);

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

/** Inputs of the assignment rows (the store fields they are derived from). */
export interface AssignmentRowsInput {
  assignments: readonly Assignment[];
  model: BandModel;
  fitOutcome: FitOutcome | null;
  /** Assignment id of each line of the last fit (same order as its result lines). */
  fitLineIds: readonly string[];
  /** Far-from-prediction tolerance without a fit, cm^-1. */
  farToleranceCm1: number;
  /**
   * Several bands: each row's calculated position and shape from the system's own lines (the ones
   * the ladders draw, state/systemRowCalc), for the row's band (or the active band when it names
   * none). Absent: one band, `model`.
   */
  systemCalc?: SystemRowCalc | null;
}

/** A row with the prediction 1σ it was judged with (cm^-1, null without a fit). */
interface RowEntry {
  row: AssignmentRow;
  sigmaPredCm1: number | null;
}

/**
 * The rows of one set of inputs and what the next update may reuse: rows are kept per assignment
 * object (assignments are immutable, so the same object means the same values).
 */
export interface AssignmentRowsState {
  input: AssignmentRowsInput;
  rows: AssignmentRow[];
  /** The row of each assignment with the σ it was judged with, parallel to input.assignments. */
  entries: RowEntry[];
}

function rowsFitResult(outcome: FitOutcome | null): FitResult | null {
  return outcome?.ok && !outcome.result.isExactlyDetermined ? outcome.result : null;
}

function rowsOutlierIds(outcome: FitOutcome | null, fitLineIds: readonly string[]): Set<string> {
  const ids = new Set<string>();
  if (outcome?.ok) for (const i of outcome.result.outliers) ids.add(fitLineIds[i]);
  return ids;
}

function isSameQuanta(a: Assignment, b: Assignment): boolean {
  return (
    a.jUpper === b.jUpper &&
    a.kUpper === b.kUpper &&
    a.jLower === b.jLower &&
    a.kLower === b.kLower &&
    a.band === b.band &&
    a.species === b.species
  );
}

function isSameLevels(a: Assignment, b: Assignment): boolean {
  return a.tagUpper === b.tagUpper && a.tagLower === b.tagLower && a.lUpper === b.lUpper && a.lLower === b.lLower;
}

function isSameRow(x: AssignmentRow, y: AssignmentRow): boolean {
  return (
    x.a === y.a &&
    x.labelAscii === y.labelAscii &&
    x.labelHtml === y.labelHtml &&
    Object.is(x.calcCm1, y.calcCm1) &&
    Object.is(x.omcCm1, y.omcCm1) &&
    Object.is(x.omcSigma, y.omcSigma) &&
    x.isFar === y.isFar &&
    x.isOutlier === y.isOutlier
  );
}

/**
 * The previous entry of each new assignment: the one at the aligned position (the unchanged head
 * and tail of the list, or the same object or id at the same index between them; memo/listAlign),
 * else the one of the same object elsewhere in the old list's changed part, else the one of the same
 * id (an edited assignment, a new object), else undefined; rows past the old list's end are new. The
 * maps by object and by id are built only when an assignment is not where it was (rows shifted
 * between two deletions), so a click that appends or edits one row looks nothing up.
 */
function rowsPreviousEntries(prev: AssignmentRowsState | null, assignments: readonly Assignment[]): (i: number) => RowEntry | undefined {
  if (!prev) return () => undefined;
  const old = prev.input.assignments;
  const oldEntries = prev.entries;
  const n0 = old.length;
  const n = assignments.length;
  const { prefix, suffix } = listAlign(old, assignments);
  let byObject: Map<Assignment, RowEntry> | null = null;
  let byId: Map<string, RowEntry> | null = null;
  return (i) => {
    if (i < prefix) return oldEntries[i];
    if (i >= n - suffix) return oldEntries[i - n + n0];
    // Past the old list's changed part: a new row (an assignment is appended, never moved there).
    if (i >= n0 - suffix) return undefined;
    const a = assignments[i];
    // The same object, or the same id edited in place, at its old index.
    if (old[i] === a || old[i].id === a.id) return oldEntries[i];
    if (!byObject) {
      byObject = new Map();
      byId = new Map();
      for (let k = 0; k < n0; k++) {
        byObject.set(old[k], oldEntries[k]);
        byId.set(old[k].id, oldEntries[k]);
      }
    }
    return byObject.get(a) ?? byId!.get(a.id);
  };
}

/**
 * Assignment rows for new inputs, reusing what the previous inputs computed: with only the list
 * changed, unchanged assignments keep their row objects and only new ones are computed (one
 * prediction each); with a new fit, model or tolerance, labels and positions are carried over where
 * their inputs are unchanged, the prediction σ of every row comes from one batched pass
 * (fitPredictSigmas), and a row whose values come out the same keeps its old object. When every row
 * is unchanged the previous array itself is returned, so memoised consumers skip their work.
 * The previous rows are found by position first (memo/listAlign): appending a row to 10,000 costs
 * one pass of reference comparisons and copies, no map of the old rows.
 * The rows equal those of a fresh computation (checked in test/state/selectors.test.ts).
 * WARNING: relies on assignments never being mutated in place (the store replaces them).
 * @param prev the state returned by the previous call, or null
 * @param input the store fields the rows derive from
 */
export function assignmentRowsUpdate(prev: AssignmentRowsState | null, input: AssignmentRowsInput): AssignmentRowsState {
  const p = prev?.input;
  if (
    prev &&
    p &&
    p.assignments === input.assignments &&
    p.model === input.model &&
    p.fitOutcome === input.fitOutcome &&
    p.fitLineIds === input.fitLineIds &&
    p.farToleranceCm1 === input.farToleranceCm1 &&
    p.systemCalc === input.systemCalc
  ) {
    return prev;
  }
  const { assignments, model, fitOutcome, fitLineIds, farToleranceCm1 } = input;
  const systemCalc = input.systemCalc ?? null;
  const isSameModel = p?.model === model && p?.systemCalc === input.systemCalc;
  const isSameShape = p?.model.shape === model.shape && isSameModel;
  const isSameFit = p?.fitOutcome === fitOutcome && p?.fitLineIds === fitLineIds;
  const isSameContext = isSameModel && isSameFit && p?.farToleranceCm1 === farToleranceCm1;
  // The joint fit's keys are the system's, which the one-band prediction σ cannot read.
  const result = systemCalc ? null : rowsFitResult(fitOutcome);
  const outlierIds = rowsOutlierIds(fitOutcome, fitLineIds);
  const previousOf = rowsPreviousEntries(prev, assignments);
  const n = assignments.length;
  const entries: RowEntry[] = new Array(n);
  // The previous entry of each row not kept whole (looked up once).
  const olds: (RowEntry | undefined)[] = new Array(n);
  // Which rows need a new prediction σ (batched below).
  const needSigma: number[] = [];
  // The rows not kept whole.
  const todo: number[] = [];
  for (let i = 0; i < n; i++) {
    const a = assignments[i];
    const e = previousOf(i);
    if (e && e.row.a === a && isSameContext) {
      entries[i] = e;
      continue;
    }
    olds[i] = e;
    todo.push(i);
    if (!(e && e.row.a === a && isSameFit) && result) needSigma.push(i);
  }
  let sigmas: Float64Array | null = null;
  if (result && needSigma.length > 0)
    sigmas = fitPredictSigmas(
      result,
      needSigma.map((i) => assignments[i]),
    );
  // Several bands: the positions of the rows not kept whole, in one pass (rows whose line is under
  // the intensity cut share one level calculation).
  const systemCalcs = systemCalc && todo.length > 0 ? systemCalc.calcMany(todo.map((i) => assignments[i])) : null;
  let k = 0;
  todo.forEach((i, t) => {
    const a = assignments[i];
    const e = olds[i];
    const isSameObject = e !== undefined && e.row.a === a;
    const hasSameQuanta = e !== undefined && isSameQuanta(e.row.a, a);
    let sigmaPredCm1: number | null = null;
    if (result) sigmaPredCm1 = isSameObject && isSameFit ? e.sigmaPredCm1 : sigmas![k++];
    // A row of a system keeps its calc only for the same labels (its tags and l pick the line).
    const calcCm1 =
      e && hasSameQuanta && isSameModel && (!systemCalc || isSameLevels(e.row.a, a))
        ? e.row.calcCm1
        : systemCalcs
          ? systemCalcs[t]
          : transitionWavenumber(model, a.jUpper, a.kUpper, a.jLower, a.kLower);
    const shape = systemCalc ? systemCalc.shape(a) : model.shape;
    const deltaK = a.kUpper - a.kLower;
    const deltaJ = a.jUpper - a.jLower;
    const labelAscii = e && hasSameQuanta && isSameShape ? e.row.labelAscii : lineLabelAscii(deltaK, deltaJ, a.kLower, a.jLower, shape);
    const labelHtml = e && hasSameQuanta && isSameShape ? e.row.labelHtml : lineLabelHtml(deltaK, deltaJ, a.kLower, a.jLower, shape);
    const dev = assignmentDeviation(a.observedCm1, calcCm1, a.uncertaintyCm1, sigmaPredCm1, farToleranceCm1);
    const row: AssignmentRow = {
      a,
      labelAscii,
      labelHtml,
      deltaJ,
      deltaK,
      calcCm1,
      omcCm1: dev.omcCm1,
      omcSigma: dev.omcSigma,
      isFar: dev.isFar,
      isOutlier: outlierIds.has(a.id),
    };
    entries[i] = e && isSameRow(e.row, row) ? (e.sigmaPredCm1 === sigmaPredCm1 ? e : { row: e.row, sigmaPredCm1 }) : { row, sigmaPredCm1 };
  });
  const rows: AssignmentRow[] = new Array(n);
  let isAllSame = prev !== null && prev.rows.length === n;
  for (let i = 0; i < n; i++) {
    rows[i] = entries[i].row;
    if (isAllSame && prev!.rows[i] !== rows[i]) isAllSame = false;
  }
  return { input, rows: isAllSame ? prev!.rows : rows, entries };
}

let assignmentRowsLast: AssignmentRowsState | null = null;

const systemCalcOf = memoLast(
  (system: NonNullable<BenchState['system']>, pred: SystemPrediction, activeBandKey: string | null): SystemRowCalc =>
    systemRowCalcCreate(system, pred.all, pred.entries, activeBandKey),
);

/** The several-band rows' calculator (null in a single-band session). */
function selectSystemRowCalc(s: BenchState): SystemRowCalc | null {
  const pred = selectSystemPrediction(s);
  return s.system && pred ? systemCalcOf(s.system, pred, s.activeBandKey) : null;
}

/** Assignments with labels, calculated positions and flags (incremental; see assignmentRowsUpdate). */
export function selectAssignmentRows(s: BenchState): AssignmentRow[] {
  assignmentRowsLast = assignmentRowsUpdate(assignmentRowsLast, {
    assignments: s.assignments,
    model: s.model,
    fitOutcome: s.fitOutcome,
    fitLineIds: s.fitLineIds,
    farToleranceCm1: s.farToleranceCm1,
    systemCalc: selectSystemRowCalc(s),
  });
  return assignmentRowsLast.rows;
}

let assignedKeysLast: ListKeys<Assignment> | null = null;

/** Quanta keys of every assigned line (a key → count map), updated per new row (memo/listKeysUpdate). */
export function selectAssignedKeys(s: BenchState): ReadonlyMap<string, number> {
  assignedKeysLast = listKeysUpdate(assignedKeysLast, s.assignments, quantaKey);
  return assignedKeysLast.counts;
}

const simulated = memoLast(
  (
    lines: LineList,
    trace: BenchState['trace'],
    temperatureK: number,
    massAmu: number,
    lorentzHwhmCm1: number,
  ): { sim: SimulatedSpectrum | null; error: string | null } => {
    try {
      return { sim: simulationBuild(lines, trace, { temperatureK, massAmu, lorentzHwhmCm1 }), error: null };
    } catch (err) {
      return { sim: null, error: (err as Error).message };
    }
  },
);

/** Simulated spectrum of the current model (computed only when asked for). */
export function selectSimulated(s: BenchState): { sim: SimulatedSpectrum | null; error: string | null } {
  // Several bands: the sum of every band (switched-off ones too: the switch hides ladders, not molecules).
  const pred = selectSystemPrediction(s);
  if (pred)
    return pred.all ? simulated(pred.all, s.trace, s.model.temperatureK, s.massAmu, s.lorentzHwhmCm1) : { sim: null, error: pred.error };
  return simulated(selectBand(s).lines, s.trace, s.model.temperatureK, s.massAmu, s.lorentzHwhmCm1);
}

/** Label of a line of the current model by quanta (ASCII). */
export function quantaLabel(q: { jUpper: number; kUpper: number; jLower: number; kLower: number }, shape: TopShape): string {
  return lineLabelAscii(q.kUpper - q.kLower, q.jUpper - q.jLower, q.kLower, q.jLower, shape);
}
