import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { Assignment } from '../../src/fit/assignment';
import { fitBand } from '../../src/fit/fitBand';
import { fitPredict, fitPredictSigmas } from '../../src/fit/fitPredict';
import type { FitOutcome, FitResult } from '../../src/fit/fitTypes';
import { bandLines } from '../../src/physics/bandLines';
import { lineLabelAscii, lineLabelHtml } from '../../src/physics/lineLabel';
import type { BandModel } from '../../src/physics/model';
import { transitionWavenumber } from '../../src/physics/termValues';
import { assignmentDeviation } from '../../src/state/assignLogic';
import { assignmentRowsUpdate, type AssignmentRow, type AssignmentRowsInput, type AssignmentRowsState } from '../../src/state/selectors';
import { smallModel } from './fixtures';

/** The rows computed from scratch, row by row (the definition the incremental update must match). */
function rowsFresh(input: AssignmentRowsInput): AssignmentRow[] {
  const { assignments, model, fitOutcome: outcome, fitLineIds, farToleranceCm1 } = input;
  const result = outcome?.ok && !outcome.result.isExactlyDetermined ? outcome.result : null;
  const outlierIds = new Set<string>();
  if (outcome?.ok) for (const i of outcome.result.outliers) outlierIds.add(fitLineIds[i]);
  return assignments.map((a) => {
    const calcCm1 = transitionWavenumber(model, a.jUpper, a.kUpper, a.jLower, a.kLower);
    const sigmaPred = result ? fitPredict(result, a).sigmaCm1 : null;
    const dev = assignmentDeviation(a.observedCm1, calcCm1, a.uncertaintyCm1, sigmaPred, farToleranceCm1);
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
}

const model0 = smallModel();
const lines = bandLines(model0, { minIntensity: 0.02 });
/** A second model: other constants, same shape (positions change, labels do not). */
const model1: BandModel = { ...model0, upper: { ...model0.upper, B: model0.upper.B + 1e-4 } };
/** The same band read as an oblate top (labels and positions both change). */
const model2: BandModel = { ...model0, shape: 'oblate', upper: { ...model0.upper, C: 2.5 }, lower: { ...model0.lower, C: 2.51 } };
const models = [model0, model1, model2];

function assignmentOf(i: number, id: string, offsetCm1: number): Assignment {
  return {
    id,
    jUpper: lines.jUpper[i],
    kUpper: lines.kUpper[i],
    jLower: lines.jLower[i],
    kLower: lines.kLower[i],
    observedCm1: lines.wavenumberCm1[i] + offsetCm1,
    uncertaintyCm1: 0.001,
    isBlended: false,
    isExcluded: false,
    note: '',
  };
}

/** A real fit of 40 of the lines, plus variants with other outliers and with N = P. */
function outcomes(): { outcome: FitOutcome; ids: string[] }[] {
  const picked = Array.from({ length: 40 }, (_, n) => assignmentOf((n * 7) % lines.count, `f${n}`, ((n % 5) - 2) * 3e-4));
  const o = fitBand({
    model: model0,
    floated: ['upper.origin', 'upper.B', 'lower.B', 'upper.A', 'upper.zeta'],
    lines: picked.map((a) => ({ ...a, observedCm1: a.observedCm1, uncertaintyCm1: a.uncertaintyCm1, isExcluded: false })),
  });
  if (!o.ok) throw new Error(o.error.message);
  const r: FitResult = o.result;
  // The ids the rows are matched against are those of the assignments list (a0, a1, …), so a
  // fit's outliers may name rows that exist.
  const ids = picked.map((_, n) => `a${n}`);
  return [
    { outcome: o, ids },
    { outcome: { ok: true, result: { ...r, outliers: [0, 3, 5] } }, ids },
    { outcome: { ok: true, result: { ...r, isExactlyDetermined: true, covariance: [] } }, ids },
    { outcome: { ok: false, error: { kind: 'too-few-lines', message: 'x', parameters: [], suggestion: '', fixSuggested: [] } }, ids: [] },
  ];
}
const fits = outcomes();

type Op =
  | { kind: 'add'; line: number; offset: number }
  | { kind: 'remove'; at: number }
  | { kind: 'edit'; at: number; field: 'observed' | 'uncertainty' | 'exclude' | 'note'; value: number }
  | { kind: 'model'; m: number }
  | { kind: 'fit'; f: number | null }
  | { kind: 'tolerance'; value: number }
  | { kind: 'same' };

const opArb: fc.Arbitrary<Op> = fc.oneof(
  fc.record({
    kind: fc.constant('add' as const),
    line: fc.nat(lines.count - 1),
    offset: fc.double({ min: -0.05, max: 0.05, noNaN: true }),
  }),
  fc.record({ kind: fc.constant('remove' as const), at: fc.nat(200) }),
  fc.record({
    kind: fc.constant('edit' as const),
    at: fc.nat(200),
    field: fc.constantFrom('observed' as const, 'uncertainty' as const, 'exclude' as const, 'note' as const),
    value: fc.double({ min: 1e-4, max: 0.02, noNaN: true }),
  }),
  fc.record({ kind: fc.constant('model' as const), m: fc.nat(models.length - 1) }),
  fc.record({ kind: fc.constant('fit' as const), f: fc.option(fc.nat(fits.length - 1), { nil: null }) }),
  fc.record({ kind: fc.constant('tolerance' as const), value: fc.constantFrom(0.001, 0.01, 0.05) }),
  fc.constant({ kind: 'same' as const }),
);

function applyOp(input: AssignmentRowsInput, op: Op, next: { n: number }): AssignmentRowsInput {
  const list = input.assignments;
  switch (op.kind) {
    case 'add': {
      const a = assignmentOf(op.line, `a${next.n++}`, op.offset);
      // As assignmentsAdd: quanta already in the list are re-assigned in place (a new object).
      const at = list.findIndex((x) => x.jUpper === a.jUpper && x.kUpper === a.kUpper && x.jLower === a.jLower && x.kLower === a.kLower);
      if (at >= 0) return { ...input, assignments: list.map((x, i) => (i === at ? { ...x, observedCm1: a.observedCm1 } : x)) };
      return { ...input, assignments: [...list, a] };
    }
    case 'remove':
      return list.length ? { ...input, assignments: list.filter((_, i) => i !== op.at % list.length) } : input;
    case 'edit': {
      if (!list.length) return input;
      const at = op.at % list.length;
      const patch: Partial<Assignment> =
        op.field === 'observed'
          ? { observedCm1: list[at].observedCm1 + op.value }
          : op.field === 'uncertainty'
            ? { uncertaintyCm1: op.value }
            : op.field === 'exclude'
              ? { isExcluded: !list[at].isExcluded }
              : { note: String(op.value) };
      return { ...input, assignments: list.map((x, i) => (i === at ? { ...x, ...patch } : x)) };
    }
    case 'model':
      return { ...input, model: models[op.m] };
    case 'fit':
      return op.f === null
        ? { ...input, fitOutcome: null, fitLineIds: [] }
        : { ...input, fitOutcome: fits[op.f].outcome, fitLineIds: fits[op.f].ids };
    case 'tolerance':
      return { ...input, farToleranceCm1: op.value };
    case 'same':
      return { ...input };
  }
}

describe('fitPredictSigmas', () => {
  it('returns nothing for no lines', () => {
    expect(fitPredictSigmas((fits[0].outcome as { result: FitResult }).result, [])).toEqual(new Float64Array(0));
  });
  it('equals fitPredict line by line', () => {
    const r = (fits[0].outcome as { result: FitResult }).result;
    const qs = Array.from({ length: lines.count }, (_, i) => assignmentOf(i, `q${i}`, 0));
    const s = fitPredictSigmas(r, qs);
    qs.forEach((q, i) => expect(s[i]).toBe(fitPredict(r, q).sigmaCm1));
  });
});

describe('assignmentRowsUpdate', () => {
  const start: AssignmentRowsInput = { assignments: [], model: model0, fitOutcome: null, fitLineIds: [], farToleranceCm1: 0.01 };

  it('gives no rows for no assignments', () => {
    expect(assignmentRowsUpdate(null, start).rows).toEqual([]);
  });

  it('equals the row-by-row computation after any sequence of list, model, fit and tolerance changes', () => {
    fc.assert(
      fc.property(fc.array(opArb, { minLength: 1, maxLength: 40 }), (ops) => {
        let input = start;
        let state: AssignmentRowsState | null = null;
        const next = { n: 0 };
        for (const op of ops) {
          input = applyOp(input, op, next);
          state = assignmentRowsUpdate(state, input);
          expect(state.rows).toEqual(rowsFresh(input));
        }
      }),
      { numRuns: 150, seed: 20261202 },
    );
  });

  it('equals the row-by-row computation with undo and redo between the changes (earlier lists come back)', () => {
    const undoArb = fc.oneof(
      { weight: 3, arbitrary: opArb.map((op) => ({ op, back: 0 })) },
      fc.record({ op: fc.constant({ kind: 'same' as const }), back: fc.integer({ min: -2, max: 3 }).filter((b) => b !== 0) }),
    );
    fc.assert(
      fc.property(fc.array(undoArb, { minLength: 1, maxLength: 40 }), (steps) => {
        const versions: AssignmentRowsInput[] = [start];
        let at = 0;
        let state: AssignmentRowsState | null = null;
        const next = { n: 0 };
        for (const { op, back } of steps) {
          let input: AssignmentRowsInput;
          if (back !== 0) {
            // Undo (back > 0) or redo: an earlier or later version of the assignments, with the
            // model, fit and tolerance as they are now (undo restores the list, not the fit).
            at = Math.min(Math.max(at - back, 0), versions.length - 1);
            input = { ...versions[versions.length - 1], assignments: versions[at].assignments };
          } else {
            input = applyOp(versions[versions.length - 1], op, next);
            versions.splice(at + 1, versions.length, input);
            at = versions.length - 1;
          }
          state = assignmentRowsUpdate(state, input);
          expect(state.rows).toEqual(rowsFresh(input));
        }
      }),
      { numRuns: 150, seed: 20261203 },
    );
  });

  it('computes only the new row when one is appended to many (no prediction for the others)', () => {
    const list = Array.from({ length: 400 }, (_, i) => assignmentOf(i % lines.count, `a${i}`, 1e-5 * i));
    const s1 = assignmentRowsUpdate(null, { ...start, assignments: list });
    const added = [...list, assignmentOf(3, 'a400', 0)];
    const s2 = assignmentRowsUpdate(s1, { ...s1.input, assignments: added });
    for (let i = 0; i < 400; i++) expect(s2.entries[i]).toBe(s1.entries[i]);
    expect(s2.rows).toEqual(rowsFresh(s2.input));
    // Undo: the shorter list again keeps every row object.
    const s3 = assignmentRowsUpdate(s2, { ...s2.input, assignments: list });
    for (let i = 0; i < 400; i++) expect(s3.rows[i]).toBe(s1.rows[i]);
  });

  it('keeps the row objects of unchanged assignments when one is added, and the whole array when nothing changed', () => {
    const list = Array.from({ length: 30 }, (_, i) => assignmentOf(i, `a${i}`, 1e-4 * i));
    const fit = fits[0];
    const s1 = assignmentRowsUpdate(null, { ...start, assignments: list, fitOutcome: fit.outcome, fitLineIds: fit.ids });
    const added = [...list, assignmentOf(40, 'a40', 0)];
    const s2 = assignmentRowsUpdate(s1, { ...s1.input, assignments: added });
    expect(s2.rows.length).toBe(31);
    for (let i = 0; i < 30; i++) expect(s2.rows[i]).toBe(s1.rows[i]);
    // A new fit object with the same numbers: every row comes out equal, so the array is kept.
    const again: FitOutcome = { ok: true, result: { ...(fit.outcome as { result: FitResult }).result } };
    const s3 = assignmentRowsUpdate(s2, { ...s2.input, fitOutcome: again });
    expect(s3.rows).toBe(s2.rows);
    // An edit replaces only that row.
    const edited = added.map((a, i) => (i === 7 ? { ...a, observedCm1: a.observedCm1 + 0.01 } : a));
    const s4 = assignmentRowsUpdate(s3, { ...s3.input, assignments: edited });
    expect(s4.rows[7]).not.toBe(s3.rows[7]);
    expect(s4.rows.filter((r, i) => r !== s3.rows[i]).length).toBe(1);
  });
});
