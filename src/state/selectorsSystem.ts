/**
 * Derived data of a several-band session: every band's lines on one intensity scale
 * (physics/system/systemLines), each band's ladders, and the drawn set (the bands switched on)
 * as one line list for the ladder panel and the candidate list. In a single-band session the
 * drawn set is the one band of selectBand, unchanged.
 */
import { bandLadders, type Ladder } from '../physics/bandLadders';
import type { LineList } from '../physics/model';
import type { SystemModel } from '../physics/system/systemModel';
import { listAlign, listMapReuse, memoLast } from './memo';
import type { BandModel } from '../physics/model';
import type { Assignment } from '../fit/assignment';
import {
  levelTagMatches,
  lineLevelLabel,
  lineLevelLabelsSubset,
  transitionSymmetryText,
  type LineLevelLabel,
  type LineLevelLabels,
} from './systemLevelLabels';
import { predictedBandCompute, selectBand, type PredictedBand } from './selectors';
import { selectSystemPrediction, type SystemPrediction } from './systemPredict';
import { bandKeyOfLine, type SystemBandEntry } from './systemBands';
import type { BenchState } from './store';

/** The lines the ladder panel draws and the candidate list offers. */
export interface DrawnBands extends PredictedBand {
  /** Band (index into entries) of each line; null in a single-band session. */
  bandOfLine: Int32Array | null;
  entries: SystemBandEntry[] | null;
  /** First line of each band in `lines` and its count (bands switched off: count 0). */
  bandStart: Int32Array | null;
  bandCount: Int32Array | null;
  /** Each band's own ladders (indices into `lines`), by band index; [] for bands switched off. */
  bandLadders: Ladder[][] | null;
  /** Level labels of each line (l, tag, symmetry species); null in a single-band session. */
  levels: LineLevelLabels | null;
}

function lineListSubset(all: LineList, idx: Int32Array): LineList {
  const pick = <T extends Int32Array | Int8Array | Float64Array>(a: T): T => {
    const out = new (a.constructor as new (n: number) => T)(idx.length);
    for (let k = 0; k < idx.length; k++) out[k] = a[idx[k]];
    return out;
  };
  return {
    count: idx.length,
    jUpper: pick(all.jUpper),
    kUpper: pick(all.kUpper),
    jLower: pick(all.jLower),
    kLower: pick(all.kLower),
    deltaK: pick(all.deltaK),
    deltaJ: pick(all.deltaJ),
    wavenumberCm1: pick(all.wavenumberCm1),
    intensity: pick(all.intensity),
    eLowerCm1: pick(all.eLowerCm1),
    honlLondon: pick(all.honlLondon),
  };
}

const drawnOf = memoLast((pred: SystemPrediction, hiddenBands: readonly string[], system: SystemModel): DrawnBands => {
  const { all, entries } = pred;
  const nBands = entries.length;
  const empty = (error: string | null): DrawnBands => ({
    lines: lineListSubset(all ?? EMPTY_FOR_SUBSET, new Int32Array(0)),
    ladders: [],
    indexOf: new Map(),
    ladderByKey: new Map(),
    error,
    bandOfLine: new Int32Array(0),
    entries,
    bandStart: new Int32Array(nBands),
    bandCount: new Int32Array(nBands),
    bandLadders: entries.map(() => []),
    levels: null,
  });
  if (!all) return empty(pred.error);
  const hidden = new Set(hiddenBands);
  // Lines grouped by band (bands in order), switched-off bands left out.
  const counts = new Int32Array(nBands);
  for (let i = 0; i < all.count; i++) if (!hidden.has(entries[all.bandIndex[i]].key)) counts[all.bandIndex[i]]++;
  const bandStart = new Int32Array(nBands);
  let n = 0;
  for (let b = 0; b < nBands; b++) {
    bandStart[b] = n;
    n += counts[b];
  }
  const idx = new Int32Array(n);
  const fill = bandStart.slice();
  for (let i = 0; i < all.count; i++) {
    const b = all.bandIndex[i];
    if (!hidden.has(entries[b].key)) idx[fill[b]++] = i;
  }
  const lines = lineListSubset(all, idx);
  const bandOfLine = new Int32Array(n);
  const indexOf = new Map<string, number>();
  const ladders: Ladder[] = [];
  const perBand: Ladder[][] = [];
  for (let b = 0; b < nBands; b++) {
    const start = bandStart[b];
    const count = counts[b];
    if (count === 0) {
      perBand.push([]);
      continue;
    }
    const sub = lineListSubset(
      lines,
      Int32Array.from({ length: count }, (_, k) => start + k),
    );
    const own = bandLadders(sub, system.species[entries[b].speciesIndex].shape).map((l) => ({
      ...l,
      key: `${entries[b].key}|${l.key}`,
      lineIndex: l.lineIndex.map((k) => k + start),
    }));
    perBand.push(own);
    ladders.push(...own);
    for (let k = start; k < start + count; k++) {
      bandOfLine[k] = b;
      indexOf.set(`${entries[b].key}|${lines.jUpper[k]},${lines.kUpper[k]},${lines.jLower[k]},${lines.kLower[k]}`, k);
    }
  }
  return {
    lines,
    ladders,
    indexOf,
    ladderByKey: new Map(ladders.map((l) => [l.key, l])),
    error: pred.error,
    bandOfLine,
    entries,
    bandStart,
    bandCount: counts,
    bandLadders: perBand,
    levels: lineLevelLabelsSubset(all, idx),
  };
});

const EMPTY_FOR_SUBSET: LineList = {
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

const singleDrawn = memoLast((band: PredictedBand): DrawnBands => ({
  ...band,
  bandOfLine: null,
  entries: null,
  bandStart: null,
  bandCount: null,
  bandLadders: null,
  levels: null,
}));

/** The drawn lines: every band switched on (several-band session) or the one band. */
export function selectDrawnBands(s: BenchState): DrawnBands {
  const pred = selectSystemPrediction(s);
  if (!pred || !s.system) return singleDrawn(selectBand(s));
  return drawnOf(pred, s.hiddenBands, s.system);
}

/** The band key an assignment belongs to in the current session (its own, or the active band's when it names none). */
export function assignmentBandKey(s: Pick<BenchState, 'activeBandKey'>, a: { band?: string; species?: string }): string | null {
  return bandKeyOfLine(a) ?? s.activeBandKey;
}

const activeAssignments = memoLast((assignments: BenchState['assignments'], activeBandKey: string | null) =>
  assignments.filter((a) => assignmentBandKey({ activeBandKey }, a) === activeBandKey),
);

/**
 * The assignments of the active band (all of them in a single-band session): what the one-band
 * panels (combination differences) work on, so lines of two bands are never differenced together.
 */
export function selectActiveBandAssignments(s: BenchState): BenchState['assignments'] {
  return s.system ? activeAssignments(s.assignments, s.activeBandKey) : s.assignments;
}

/** The band the Loomis–Wood view shows. */
export interface LoomisBand {
  /** Its lines and ladders (empty with `whyNot` when the band has no single-band view). */
  band: PredictedBand;
  /** "species/band" in a several-band session, else null. */
  key: string | null;
  /** Band and species an assignment made from the view carries (null: the session's one band). */
  ref: { band: string; species: string } | null;
  /** The view follows the panels' band (no band chosen, or the chosen one is gone). */
  isFollowing: boolean;
  whyNot: string | null;
}

const loomisBandOf = memoLast((view: BandModel, minIntensity: number) => predictedBandCompute(view, minIntensity));

/**
 * The band of the Loomis–Wood view: the one chosen (`loomisBandKey`, any band of the system with a
 * single-band view), else the panels' band; a single-band session's one band.
 */
export function selectLoomisBand(s: BenchState): LoomisBand {
  // Memoised on its inputs: components select it with useBench, which needs the same object back.
  return loomisBandSelect(s.system ? selectSystemPrediction(s) : null, selectBand(s), s.loomisBandKey, s.activeBandKey, s.minIntensity);
}

const loomisBandSelect = memoLast(
  (
    pred: SystemPrediction | null,
    activeBand: PredictedBand,
    chosenKey: string | null,
    activeKey: string | null,
    minIntensity: number,
  ): LoomisBand => {
    if (!pred) return { band: activeBand, key: null, ref: null, isFollowing: true, whyNot: null };
    const entries = pred.entries;
    const chosen = chosenKey !== null ? entries.find((e) => e.key === chosenKey) : undefined;
    const active = entries.find((e) => e.key === activeKey);
    if (!chosen || chosen.key === activeKey) {
      return {
        band: activeBand,
        key: active?.key ?? null,
        ref: active ? { band: active.band, species: active.species } : null,
        isFollowing: !chosen,
        whyNot: active ? active.viewWhyNot : 'no band is on the panels',
      };
    }
    const ref = { band: chosen.band, species: chosen.species };
    if (!chosen.view)
      return {
        band: { ...activeBand, ladders: [], ladderByKey: new Map() },
        key: chosen.key,
        ref,
        isFollowing: false,
        whyNot: chosen.viewWhyNot,
      };
    return { band: loomisBandOf(chosen.view, minIntensity), key: chosen.key, ref, isFollowing: false, whyNot: null };
  },
);

/**
 * The level labels of an assignment's system line, found once per assignment object: the system
 * lines by band key and quanta are indexed once per prediction and active band, so a new row costs
 * one lookup, not a pass over every line (assignments are immutable, so an object keeps its answer).
 */
const assignmentLevelIndex = memoLast((pred: SystemPrediction | null, activeBandKey: string | null) => {
  const all = pred?.all;
  const byKey = new Map<string, number[]>();
  if (all)
    for (let i = 0; i < all.count; i++) {
      const ref = all.bandRefs[all.bandIndex[i]];
      const key = `${ref.species}/${ref.band}|${all.jUpper[i]},${all.kUpper[i]},${all.jLower[i]},${all.kLower[i]}`;
      const list = byKey.get(key);
      if (list) list.push(i);
      else byKey.set(key, [i]);
    }
  const done = new WeakMap<Assignment, LineLevelLabel | null>();
  const symmetryDone = new WeakMap<Assignment, string>();
  const rowLevel = (a: Assignment): LineLevelLabel | null => {
    if (!all) return null;
    const list = byKey.get(`${assignmentBandKey({ activeBandKey }, a)}|${a.jUpper},${a.kUpper},${a.jLower},${a.kLower}`);
    if (!list) return null;
    const fits = list.filter(
      (i) =>
        (a.tagUpper === undefined || levelTagMatches(all.tagUpper[i], a.tagUpper)) &&
        (a.tagLower === undefined || levelTagMatches(all.tagLower[i], a.tagLower)) &&
        (a.lUpper === undefined || all.lUpper[i] === a.lUpper) &&
        (a.lLower === undefined || all.lLower[i] === a.lLower),
    );
    // Only a line the row names alone: a row J and K leave open (an untagged row of a split pair) shows no symmetry.
    return fits.length === 1 ? lineLevelLabel(all, fits[0]) : null;
  };
  const levelOf = (a: Assignment): LineLevelLabel | null => {
    const known = done.get(a);
    if (known !== undefined) return known;
    const found = rowLevel(a);
    done.set(a, found);
    return found;
  };
  // Tags the row was assigned with (A1/A2, s/a), else the species of the one line it names.
  const symmetryOf = (a: Assignment): string => {
    const known = symmetryDone.get(a);
    if (known !== undefined) return known;
    const text = transitionSymmetryText({ ...levelOf(a), tagUpper: a.tagUpper, tagLower: a.tagLower });
    symmetryDone.set(a, text);
    return text;
  };
  return { levelOf, symmetryOf };
});

/** A per-assignment list kept with the inputs it was made from (see listMapReuse). */
interface PerAssignment<C, R> {
  assignments: BenchState['assignments'];
  context: C;
  out: R;
}

let levelsLast: PerAssignment<ReturnType<typeof assignmentLevelIndex>, (LineLevelLabel | null)[]> | null = null;

/**
 * The level labels (tags, symmetry species) of the system line each assignment names (the line
 * its calc comes from, state/systemRowCalc), parallel to the assignments; null where the line is
 * not among the lines at the intensity cut, J and K leave a choice the row does not settle, and in
 * a single-band session. A band switched off keeps its rows' labels. Incremental: with the same
 * prediction and active band, only the assignments not where they were are looked up (memo/listMapReuse).
 */
export function selectAssignmentLevels(s: BenchState): (LineLevelLabel | null)[] {
  const index = assignmentLevelIndex(selectSystemPrediction(s), s.activeBandKey);
  const last = levelsLast;
  if (last && last.assignments === s.assignments && last.context === index) return last.out;
  const out = listMapReuse(last?.context === index ? last.assignments : null, last?.out ?? null, s.assignments, index.levelOf);
  levelsLast = { assignments: s.assignments, context: index, out };
  return out;
}

/**
 * The symmetry text of an assignment's row ("A2 ← A1": the tags it was assigned with, else the
 * species of the one line it names; '' when none), by assignment object. The function stays the
 * same while the prediction and active band do, so a table can call it for its visible rows only.
 */
export function selectAssignmentSymmetryOf(s: BenchState): (a: Assignment) => string {
  return assignmentLevelIndex(selectSystemPrediction(s), s.activeBandKey).symmetryOf;
}

let symmetryLast: PerAssignment<(a: Assignment) => string, number> | null = null;

/**
 * Some assignment has a symmetry text (the table then shows the column). Kept as the number of rows
 * with one, updated over the rows between the unchanged head and tail of the list (memo/listAlign):
 * a new row costs one look-up and no per-row array (zustand calls this on every change of the store).
 */
export function selectHasAssignmentSymmetry(s: BenchState): boolean {
  const symmetryOf = selectAssignmentSymmetryOf(s);
  const last = symmetryLast;
  const next = s.assignments;
  if (last && last.assignments === next && last.context === symmetryOf) return last.out > 0;
  const has = (a: Assignment) => (symmetryOf(a) !== '' ? 1 : 0);
  let count = 0;
  const old = last && last.context === symmetryOf ? last.assignments : null;
  const { prefix, suffix } = old ? listAlign(old, next) : { prefix: 0, suffix: 0 };
  if (old && last && old.length - prefix - suffix + (next.length - prefix - suffix) <= Math.max(16, next.length >> 3)) {
    count = last.out;
    for (let i = prefix; i < old.length - suffix; i++) count -= has(old[i]);
    for (let i = prefix; i < next.length - suffix; i++) count += has(next[i]);
  } else for (const a of next) count += has(a);
  symmetryLast = { assignments: next, context: symmetryOf, out: count };
  return count > 0;
}

/** The drawn lines by band key and quanta, and the drawn line of an assignment once found (by object). */
const assignmentDrawnIndex = memoLast((drawn: DrawnBands, activeBandKey: string | null) => {
  const { entries, bandOfLine, lines, levels } = drawn;
  const byKey = new Map<string, number[]>();
  if (entries && bandOfLine)
    for (let i = 0; i < lines.count; i++) {
      const key = `${entries[bandOfLine[i]].key}|${lines.jUpper[i]},${lines.kUpper[i]},${lines.jLower[i]},${lines.kLower[i]}`;
      const list = byKey.get(key);
      if (list) list.push(i);
      else byKey.set(key, [i]);
    }
  const done = new WeakMap<Assignment, number>();
  const rowLine = (a: Assignment): number => {
    if (!levels) return -1;
    const list = byKey.get(`${assignmentBandKey({ activeBandKey }, a)}|${a.jUpper},${a.kUpper},${a.jLower},${a.kLower}`);
    let best = -1;
    for (const i of list ?? []) {
      if (a.tagUpper !== undefined && !levelTagMatches(levels.tagUpper[i], a.tagUpper)) continue;
      if (a.tagLower !== undefined && !levelTagMatches(levels.tagLower[i], a.tagLower)) continue;
      if (a.lUpper !== undefined && levels.lUpper[i] !== a.lUpper) continue;
      if (a.lLower !== undefined && levels.lLower[i] !== a.lLower) continue;
      // Of lines the row leaves open (an untagged row of a split pair), the one nearest its observation.
      if (best < 0 || Math.abs(lines.wavenumberCm1[i] - a.observedCm1) < Math.abs(lines.wavenumberCm1[best] - a.observedCm1)) best = i;
    }
    return best;
  };
  return (a: Assignment): number => {
    const known = done.get(a);
    if (known !== undefined) return known;
    const found = rowLine(a);
    done.set(a, found);
    return found;
  };
});

let drawnLinesLast: PerAssignment<(a: Assignment) => number, number[]> | null = null;
let drawnLinesOut: Int32Array | null = null;

/**
 * The drawn line each assignment names (index into selectDrawnBands' lines, −1 where its band is
 * switched off or its line is not drawn), parallel to the assignments; null in a single-band
 * session. Picks the same line as the row's calc (state/systemRowCalc): band, J, K, then the l and
 * tags it keeps, so each member of a split pair gets its own rung. Incremental as selectAssignmentLevels.
 */
export function selectAssignmentDrawnLines(s: BenchState): Int32Array | null {
  const drawn = selectDrawnBands(s);
  if (!drawn.levels || !drawn.entries || !drawn.bandOfLine) return null;
  const lineOf = assignmentDrawnIndex(drawn, s.activeBandKey);
  const last = drawnLinesLast;
  if (last && drawnLinesOut && last.assignments === s.assignments && last.context === lineOf) return drawnLinesOut;
  const out = listMapReuse(last?.context === lineOf ? last.assignments : null, last?.out ?? null, s.assignments, lineOf);
  if (!(last && out === last.out && drawnLinesOut)) drawnLinesOut = Int32Array.from(out);
  drawnLinesLast = { assignments: s.assignments, context: lineOf, out };
  return drawnLinesOut;
}
