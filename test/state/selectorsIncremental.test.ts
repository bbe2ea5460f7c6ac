/**
 * The several-band selectors that update per new row (level labels, drawn line, symmetry text of
 * each assignment, the table rows and the candidate list's assigned marks) must equal a from-scratch computation after any sequence of
 * page actions: assigning (with blends), deleting, editing, undo/redo, switching bands off and on and
 * changing the active band. The from-scratch definitions are written out here by brute force over
 * the system's lines (no index, no cache), so an incremental path that went stale fails.
 * Invented C3v molecule (constants made up, as in systemRowCalc.test.ts): split K = 3 pairs (A1/A2),
 * an E state with l, a Coriolis pair and a hot band.
 */
import fc from 'fast-check';
import { beforeEach, describe, expect, it } from 'vitest';
import type { Assignment } from '../../src/fit/assignment';
import { systemFileFromJson } from '../../src/io/systemFile';
import { systemLines, type SystemLineList } from '../../src/physics/system/systemLines';
import { assignmentDelete, assignmentEdit, assignToPeak, selectCandidates } from '../../src/state/actionsAssign';
import { quantaKey, type Candidate } from '../../src/state/candidateRank';
import { benchUpdate, redo, undo } from '../../src/state/actionsCore';
import { bandActivate, bandToggle, systemLoad } from '../../src/state/actionsSystem';
import { peakIdAt } from '../../src/state/assignLogic';
import { assignmentRowsUpdate, selectAssignmentRows, type AssignmentRowsInput } from '../../src/state/selectors';
import {
  assignmentBandKey,
  selectAssignmentDrawnLines,
  selectAssignmentLevels,
  selectAssignmentSymmetryOf,
  selectDrawnBands,
  selectHasAssignmentSymmetry,
} from '../../src/state/selectorsSystem';
import { benchStore, type BenchState } from '../../src/state/store';
import { bandKeyOfLine, systemBandEntries } from '../../src/state/systemBands';
import { systemRowCalcCreate } from '../../src/state/systemRowCalc';
import { levelTagMatches, lineLevelLabel, transitionSymmetryText, type LineLevelLabel } from '../../src/state/systemLevelLabels';
import { selectSystemPrediction } from '../../src/state/systemPredict';
import { assignmentOfLine, INVENTED_C3V_SPECIES } from './fixtures';

const SYSTEM = {
  temperature: 200,
  jMax: 14,
  kMax: 5,
  species: [INVENTED_C3V_SPECIES],
};

const MIN_INTENSITY = 0.002;

function load(): SystemLineList {
  const file = systemFileFromJson(SYSTEM);
  benchStore.setState({ ...benchStore.getInitialState(), minIntensity: MIN_INTENSITY });
  expect(systemLoad({ system: file.model, name: 'lb3v' }, 'load')).toBe(true);
  return systemLines(file.model, { minIntensity: MIN_INTENSITY });
}

/** Lines of `list` the assignment names: its band (or the active one), J, K, and the l and tags it keeps. */
function namedLines(
  s: BenchState,
  a: Assignment,
  list: { count: number; jUpper: Int32Array; kUpper: Int32Array; jLower: Int32Array; kLower: Int32Array },
  bandKeyOf: (i: number) => string,
  labels: { lUpper: ArrayLike<number>; lLower: ArrayLike<number>; tagUpper: readonly string[]; tagLower: readonly string[] },
): number[] {
  const key = assignmentBandKey(s, a);
  const out: number[] = [];
  for (let i = 0; i < list.count; i++) {
    if (bandKeyOf(i) !== key) continue;
    if (list.jUpper[i] !== a.jUpper || list.kUpper[i] !== a.kUpper || list.jLower[i] !== a.jLower || list.kLower[i] !== a.kLower) continue;
    if (a.tagUpper !== undefined && !levelTagMatches(labels.tagUpper[i], a.tagUpper)) continue;
    if (a.tagLower !== undefined && !levelTagMatches(labels.tagLower[i], a.tagLower)) continue;
    if (a.lUpper !== undefined && labels.lUpper[i] !== a.lUpper) continue;
    if (a.lLower !== undefined && labels.lLower[i] !== a.lLower) continue;
    out.push(i);
  }
  return out;
}

/** The level labels of every assignment, from scratch (the line it alone names among all lines, else null). */
function levelsFresh(s: BenchState): (LineLevelLabel | null)[] {
  const all = selectSystemPrediction(s)?.all;
  if (!all) return s.assignments.map(() => null);
  const keyOf = (i: number) => {
    const ref = all.bandRefs[all.bandIndex[i]];
    return `${ref.species}/${ref.band}`;
  };
  return s.assignments.map((a) => {
    const hit = namedLines(s, a, all, keyOf, all);
    return hit.length === 1 ? lineLevelLabel(all, hit[0]) : null;
  });
}

/** The drawn line of every assignment, from scratch (of the lines it names, the one nearest its observation). */
function drawnLinesFresh(s: BenchState): number[] {
  const drawn = selectDrawnBands(s);
  const { lines, levels, entries, bandOfLine } = drawn;
  return s.assignments.map((a) => {
    const hit = namedLines(s, a, lines, (i) => entries![bandOfLine![i]].key, levels!);
    let best = -1;
    for (const i of hit)
      if (best < 0 || Math.abs(lines.wavenumberCm1[i] - a.observedCm1) < Math.abs(lines.wavenumberCm1[best] - a.observedCm1)) best = i;
    return best;
  });
}

type PageOp =
  | { kind: 'assign'; line: number; peak: number; untagged: boolean }
  | { kind: 'assignNoBand'; line: number }
  | { kind: 'delete'; at: number }
  | { kind: 'edit'; at: number; offsetCm1: number }
  | { kind: 'undo' }
  | { kind: 'redo' }
  | { kind: 'toggle'; band: number }
  | { kind: 'activate'; band: number };

const opArb: fc.Arbitrary<PageOp> = fc.oneof(
  {
    weight: 6,
    arbitrary: fc.record({
      kind: fc.constant('assign' as const),
      line: fc.nat(100_000),
      // Few peaks, so rows share them (blends) now and then.
      peak: fc.nat(40),
      untagged: fc.boolean(),
    }),
  },
  fc.record({ kind: fc.constant('assignNoBand' as const), line: fc.nat(100_000) }),
  fc.record({ kind: fc.constant('delete' as const), at: fc.nat(1000) }),
  fc.record({ kind: fc.constant('edit' as const), at: fc.nat(1000), offsetCm1: fc.constantFrom(-0.3, -0.001, 0.002, 0.4) }),
  { weight: 2, arbitrary: fc.constant({ kind: 'undo' as const }) },
  fc.constant({ kind: 'redo' as const }),
  fc.record({ kind: fc.constant('toggle' as const), band: fc.nat(2) }),
  fc.record({ kind: fc.constant('activate' as const), band: fc.nat(2) }),
);

function apply(op: PageOp, lines: SystemLineList): void {
  const s = benchStore.getState();
  const keys = systemBandEntries(s.system!).map((e) => e.key);
  const list = s.assignments;
  switch (op.kind) {
    case 'assign': {
      const i = op.line % lines.count;
      const ref = lines.bandRefs[lines.bandIndex[i]];
      const tags = op.untagged ? {} : { tagUpper: lines.tagUpper[i], tagLower: lines.tagLower[i] };
      const peakCm1 = lines.wavenumberCm1[(op.peak * 37) % lines.count];
      assignToPeak(
        {
          jUpper: lines.jUpper[i],
          kUpper: lines.kUpper[i],
          jLower: lines.jLower[i],
          kLower: lines.kLower[i],
          band: ref.band,
          species: ref.species,
          lUpper: lines.lUpper[i] as -1 | 0 | 1,
          lLower: lines.lLower[i] as -1 | 0 | 1,
          ...tags,
        },
        { peakCm1, peakId: peakIdAt(peakCm1), peakSigmaCm1: 0.001 },
      );
      return;
    }
    case 'assignNoBand': {
      // A row that names no band (as from a one-band line table): it belongs to the active band.
      const i = op.line % lines.count;
      const a: Assignment = assignmentOfLine(lines, i, `nb${s.nextAssignmentNumber}`);
      benchUpdate('add', (st) => ({ assignments: [...st.assignments, a], nextAssignmentNumber: st.nextAssignmentNumber + 1 }), {
        history: true,
      });
      return;
    }
    case 'delete':
      if (list.length) assignmentDelete([list[op.at % list.length].id]);
      return;
    case 'edit':
      if (list.length) {
        const a = list[op.at % list.length];
        expect(assignmentEdit(a.id, { observedCm1: a.observedCm1 + op.offsetCm1 })).toBeNull();
      }
      return;
    case 'undo':
      undo();
      return;
    case 'redo':
      redo();
      return;
    case 'toggle':
      bandToggle(keys[op.band % keys.length]);
      return;
    case 'activate':
      // The hot band has no single-band view and is refused: the active band stays.
      bandActivate(keys[op.band % keys.length]);
      return;
  }
}

beforeEach(() => benchStore.setState(benchStore.getInitialState()));

describe('incremental several-band selectors', () => {
  it('equal a from-scratch computation after any sequence of assigns, deletes, edits, undo/redo, band switches and band changes', () => {
    const lines = load();
    // History starts after the load (undo never takes the system away here).
    const start = { ...benchStore.getState(), past: [], future: [] };
    let nChecked = 0;
    let nSymmetry = 0;
    let nAssignedCandidates = 0;
    fc.assert(
      fc.property(fc.array(opArb, { minLength: 1, maxLength: 30 }), (ops) => {
        benchStore.setState(start, true);
        for (const op of ops) {
          apply(op, lines);
          const s = benchStore.getState();
          const levels = levelsFresh(s);
          expect(selectAssignmentLevels(s)).toEqual(levels);
          expect(Array.from(selectAssignmentDrawnLines(s)!)).toEqual(drawnLinesFresh(s));
          const texts = s.assignments.map((a, i) => transitionSymmetryText({ ...levels[i], tagUpper: a.tagUpper, tagLower: a.tagLower }));
          const symmetryOf = selectAssignmentSymmetryOf(s);
          expect(s.assignments.map(symmetryOf)).toEqual(texts);
          expect(selectHasAssignmentSymmetry(s)).toBe(texts.some((t) => t !== ''));
          // The candidate list of a peak marks the lines already assigned (kept per change of the table).
          const at = lines.wavenumberCm1[(nChecked * 131) % lines.count];
          benchStore.setState({ candidateTarget: { peakCm1: at, peakId: peakIdAt(at), peakSigmaCm1: 0.001 } });
          const candidates = selectCandidates(benchStore.getState());
          const keyOf = (q: Assignment | Candidate) =>
            `${bandKeyOfLine(q) ?? s.activeBandKey}|${quantaKey(q)}|${q.tagUpper ?? ''}|${q.tagLower ?? ''}`;
          const assignedKeys = new Set(s.assignments.map(keyOf));
          expect(candidates.map((c) => c.isAssigned)).toEqual(candidates.map((c) => assignedKeys.has(keyOf(c))));
          nAssignedCandidates += candidates.filter((c) => c.isAssigned).length;
          benchStore.setState({ candidateTarget: null });
          const rows = selectAssignmentRows(s);
          expect(rows).toEqual(assignmentRowsUpdate(null, rowsInputOf(s)).rows);
          nChecked++;
          nSymmetry += texts.filter((t) => t !== '').length;
        }
      }),
      { numRuns: 100, seed: 20261203 },
    );
    // The sequences did reach rows with and without symmetry.
    expect(nChecked).toBeGreaterThan(400);
    expect(nSymmetry).toBeGreaterThan(100);
    expect(nAssignedCandidates).toBeGreaterThan(20);
  });
});

/** The inputs of selectAssignmentRows, with a new calculator (no cached positions). */
function rowsInputOf(s: BenchState): AssignmentRowsInput {
  const pred = selectSystemPrediction(s)!;
  return {
    assignments: s.assignments,
    model: s.model,
    fitOutcome: s.fitOutcome,
    fitLineIds: s.fitLineIds,
    farToleranceCm1: s.farToleranceCm1,
    systemCalc: systemRowCalcCreate(s.system!, pred.all, pred.entries, s.activeBandKey),
  };
}
