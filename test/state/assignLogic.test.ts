import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { Assignment } from '../../src/fit/assignment';
import {
  assignmentDeviation,
  assignmentsAdd,
  assignmentsMarkBlends,
  assignmentsRemove,
  assignmentsSplitAllowed,
  assignmentsUpdate,
  peakIdAt,
} from '../../src/state/assignLogic';

const q1 = { jUpper: 5, kUpper: 2, jLower: 4, kLower: 1 };
const q2 = { jUpper: 6, kUpper: 2, jLower: 5, kLower: 1 };

describe('assignmentsAdd', () => {
  it('adds a new assignment with the default σ of 0.001 cm^-1 (headless contract)', () => {
    const { list, id } = assignmentsAdd([], { ...q1, observedCm1: 1000.1 }, 'a1');
    expect(id).toBe('a1');
    expect(list).toEqual([{ id: 'a1', ...q1, observedCm1: 1000.1, uncertaintyCm1: 0.001, isBlended: false, isExcluded: false, note: '' }]);
  });

  it('refuses a non-finite position', () => {
    expect(() => assignmentsAdd([], { ...q1, observedCm1: NaN }, 'a1')).toThrow(/observedCm1/);
  });

  it('re-assigns the same quanta instead of duplicating them, keeping id and note', () => {
    let { list } = assignmentsAdd([], { ...q1, observedCm1: 1000.1, peakId: 'p1' }, 'a1');
    list = assignmentsUpdate(list, 'a1', { note: 'strong' });
    const r = assignmentsAdd(list, { ...q1, observedCm1: 1000.2, peakId: 'p2' }, 'a2');
    expect(r.id).toBe('a1');
    expect(r.list.length).toBe(1);
    expect(r.list[0]).toMatchObject({ id: 'a1', observedCm1: 1000.2, peakId: 'p2', note: 'strong' });
  });

  it('flags both transitions of one peak as blended, and un-flags when one moves away', () => {
    let { list } = assignmentsAdd([], { ...q1, observedCm1: 1000.1, peakId: 'p1' }, 'a1');
    ({ list } = assignmentsAdd(list, { ...q2, observedCm1: 1000.1, peakId: 'p1' }, 'a2'));
    expect(list.map((a) => a.isBlended)).toEqual([true, true]);
    ({ list } = assignmentsAdd(list, { ...q2, observedCm1: 1000.7, peakId: 'p9' }, 'a3'));
    expect(list.map((a) => a.isBlended)).toEqual([false, false]);
  });

  it('never changes the input list', () => {
    const { list } = assignmentsAdd([], { ...q1, observedCm1: 1000.1 }, 'a1');
    const frozen = Object.freeze([...list]);
    assignmentsAdd(frozen, { ...q2, observedCm1: 1000.2 }, 'a2');
    expect(frozen.length).toBe(1);
  });
});

describe('assignmentsAdd on a long session (blend flags kept per peak between adds)', () => {
  type Draft = Parameters<typeof assignmentsAdd>[1];
  /** The definition: find the same quanta, replace or append, then flag every shared peak (one full pass). */
  function addReference(list: readonly Assignment[], draft: Draft, id: string): { list: Assignment[]; id: string } {
    const existing = list.find(
      (a) => a.jUpper === draft.jUpper && a.kUpper === draft.kUpper && a.jLower === draft.jLower && a.kLower === draft.kLower,
    );
    if (existing) {
      const out = list.map((a) =>
        a === existing
          ? {
              ...a,
              observedCm1: draft.observedCm1,
              peakId: draft.peakId,
              isBlended: false,
              uncertaintyCm1: draft.uncertaintyCm1 ?? a.uncertaintyCm1,
            }
          : a,
      );
      return { list: assignmentsMarkBlends(out, existing.peakId), id: existing.id };
    }
    const added: Assignment = {
      id,
      jUpper: draft.jUpper,
      kUpper: draft.kUpper,
      jLower: draft.jLower,
      kLower: draft.kLower,
      observedCm1: draft.observedCm1,
      uncertaintyCm1: draft.uncertaintyCm1 ?? 0.001,
      isBlended: false,
      isExcluded: false,
      note: '',
      ...(draft.peakId !== undefined ? { peakId: draft.peakId } : {}),
    };
    return { list: assignmentsMarkBlends([...list, added]), id };
  }

  type Op =
    | { kind: 'add'; j: number; peak: number | null }
    | { kind: 'untick'; at: number }
    | { kind: 'remove'; at: number }
    | { kind: 'undo'; back: number };
  const opArb: fc.Arbitrary<Op> = fc.oneof(
    // Few quanta and peaks: re-assignments and shared peaks are common.
    { weight: 6, arbitrary: fc.record({ kind: fc.constant('add' as const), j: fc.nat(25), peak: fc.option(fc.nat(8), { nil: null }) }) },
    // The user unticks "blend" on a shared peak: the next add flags it again, as a full pass does.
    fc.record({ kind: fc.constant('untick' as const), at: fc.nat(100) }),
    fc.record({ kind: fc.constant('remove' as const), at: fc.nat(100) }),
    fc.record({ kind: fc.constant('undo' as const), back: fc.integer({ min: -2, max: 3 }) }),
  );

  it('equals the full pass after any sequence of adds, re-assigns, unticked blends, removals and undo/redo', () => {
    let nBlended = 0;
    fc.assert(
      fc.property(fc.array(opArb, { minLength: 1, maxLength: 40 }), (ops) => {
        const versions: Assignment[][] = [[]];
        let at = 0;
        let next = 0;
        for (const op of ops) {
          let list = versions[at];
          if (op.kind === 'add') {
            const draft: Draft = {
              jUpper: op.j + 1,
              kUpper: 1,
              jLower: op.j,
              kLower: 1,
              observedCm1: 1000 + op.j,
              ...(op.peak !== null ? { peakId: `p${op.peak}` } : {}),
            };
            const r = assignmentsAdd(list, draft, `a${next}`);
            expect(r).toEqual(addReference(list, draft, `a${next++}`));
            list = r.list;
            nBlended += list.filter((a) => a.isBlended).length;
          } else if (op.kind === 'untick' && list.length) {
            const a = list[op.at % list.length];
            if (a.isBlended) list = assignmentsUpdate(list, a.id, { isBlended: false });
          } else if (op.kind === 'remove' && list.length) list = assignmentsRemove(list, [list[op.at % list.length].id]);
          if (op.kind === 'undo') at = Math.min(Math.max(at - op.back, 0), versions.length - 1);
          else {
            versions.splice(at + 1, versions.length, list);
            at = versions.length - 1;
          }
        }
      }),
      { numRuns: 300, seed: 20261203 },
    );
    // The sequences did make blends.
    expect(nBlended).toBeGreaterThan(500);
  });
});

describe('assignmentsUpdate and assignmentsRemove', () => {
  it('refuses σ <= 0 and unknown ids, naming the field', () => {
    const { list } = assignmentsAdd([], { ...q1, observedCm1: 1000.1 }, 'a1');
    expect(() => assignmentsUpdate(list, 'a1', { uncertaintyCm1: 0 })).toThrow(/uncertainty/);
    expect(() => assignmentsUpdate(list, 'zz', { note: 'x' })).toThrow(/zz/);
    expect(assignmentsUpdate(list, 'a1', { isExcluded: true })[0].isExcluded).toBe(true);
  });
  it('removing one of a blend un-flags the other', () => {
    let { list } = assignmentsAdd([], { ...q1, observedCm1: 1000.1, peakId: 'p1' }, 'a1');
    ({ list } = assignmentsAdd(list, { ...q2, observedCm1: 1000.1, peakId: 'p1' }, 'a2'));
    const after = assignmentsRemove(list, ['a2']);
    expect(after).toHaveLength(1);
    expect(after[0].isBlended).toBe(false);
  });
});

describe('assignmentDeviation', () => {
  it('uses the tolerance without a fit', () => {
    expect(assignmentDeviation(1000.03, 1000, 0.001, null, 0.02)).toMatchObject({ isFar: true, omcSigma: null });
    expect(assignmentDeviation(1000.01, 1000, 0.001, null, 0.02).isFar).toBe(false);
  });
  it('uses 3σ with σ = √(σ_obs² + σ_pred²) once a fit exists (3σ rule, common practice)', () => {
    // σ = √(0.003² + 0.004²) = 0.005; 0.0149 is 2.98 σ, 0.0151 is 3.02 σ.
    expect(assignmentDeviation(1000.0149, 1000, 0.003, 0.004, 1e-9).isFar).toBe(false);
    const far = assignmentDeviation(1000.0151, 1000, 0.003, 0.004, 1);
    expect(far.isFar).toBe(true);
    expect(far.omcSigma).toBeCloseTo(3.02, 10);
  });
});

describe('peakIdAt', () => {
  it('identifies a peak by its centre to 1e-5 cm^-1', () => {
    expect(peakIdAt(1000.123456)).toBe('pk1000.12346');
    expect(peakIdAt(1000.123456)).toBe(peakIdAt(1000.1234561));
  });
});

describe('assignmentsSplitAllowed', () => {
  // Selection rules of a perpendicular band of a symmetric top: ΔK = ±1, ΔJ = 0, ±1
  // (Herzberg II (1945) ch. IV; Hollas (1998) sec. 6.2.4, from memory). ΔK = 2 and 4 cannot occur.
  const perpendicular = { band: 'perpendicular' as const, shape: 'prolate' as const };
  it('keeps allowed rows and refuses ΔK = 2 and ΔK = 4 rows, naming their file lines', () => {
    const rows = [
      { jUpper: 11, kUpper: 2, jLower: 12, kLower: 1 }, // rP1(12), ΔK = +1, allowed
      { jUpper: 10, kUpper: 3, jLower: 11, kLower: 1 }, // ΔK = +2
      { jUpper: 5, kUpper: 0, jLower: 4, kLower: 4 }, // ΔK = −4
      { jUpper: 5, kUpper: 0, jLower: 4, kLower: 1 }, // ΔK = −1, allowed
    ];
    const { kept, refused } = assignmentsSplitAllowed(rows, [2, 3, 4, 5], perpendicular);
    expect(kept).toEqual([rows[0], rows[3]]);
    expect(refused.map((r) => r.lineNumber)).toEqual([3, 4]);
    expect(refused[0].reason).toMatch(/ΔK = 2 is not allowed in a perpendicular band/);
    expect(refused[1].reason).toMatch(/ΔK = -4 is not allowed/);
  });

  it('refuses K > J and keeps everything in an all-valid table', () => {
    const { kept, refused } = assignmentsSplitAllowed([{ jUpper: 3, kUpper: 5, jLower: 4, kLower: 4 }], [7], perpendicular);
    expect(kept).toEqual([]);
    expect(refused).toEqual([{ lineNumber: 7, reason: expect.stringMatching(/K_up=5 exceeds J_up=3/) }]);
    expect(assignmentsSplitAllowed([{ jUpper: 3, kUpper: 1, jLower: 3, kLower: 0 }], [2], perpendicular).refused).toEqual([]);
  });
});
