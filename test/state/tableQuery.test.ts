import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { AssignmentRow } from '../../src/state/selectors';
import { tableRowsQuery, tableRowsQueryMemo } from '../../src/state/tableQuery';
import { viewSliceInitial, type TableQuery } from '../../src/state/viewSlice';

function row(id: string, dk: number, dj: number, k: number, j: number, omc: number): AssignmentRow {
  return {
    a: {
      id,
      jUpper: j + dj,
      kUpper: k + dk,
      jLower: j,
      kLower: k,
      observedCm1: 1000 + j,
      uncertaintyCm1: 0.001,
      isBlended: false,
      isExcluded: false,
      note: '',
    },
    labelAscii: '',
    labelHtml: '',
    deltaJ: dj,
    deltaK: dk,
    calcCm1: 1000 + j - omc,
    omcCm1: omc,
    omcSigma: null,
    isFar: false,
    isOutlier: false,
  };
}

const rows = [row('a', 1, 1, 2, 5, 0.01), row('b', -1, -1, 1, 3, -0.03), row('c', 1, 0, 2, 7, 0.002), row('d', 1, 1, 0, 9, -0.001)];
const base = viewSliceInitial().tableQuery;

describe('tableRowsQuery', () => {
  it('returns nothing for no rows', () => {
    expect(tableRowsQuery([], base)).toEqual([]);
  });
  it('orders by label like the ladders: ΔK +1 first, then K″, branch, J″', () => {
    expect(tableRowsQuery(rows, base).map((r) => r.a.id)).toEqual(['d', 'c', 'a', 'b']);
  });
  it('sorts by |o − c| descending and by J″', () => {
    expect(tableRowsQuery(rows, { ...base, sortKey: 'absOmc', sortDescending: true }).map((r) => r.a.id)).toEqual(['b', 'a', 'c', 'd']);
    expect(tableRowsQuery(rows, { ...base, sortKey: 'jLower' }).map((r) => r.a.id)).toEqual(['b', 'a', 'c', 'd']);
  });
  it('filters by branch, K″, J″ range and smallest |o − c|', () => {
    expect(tableRowsQuery(rows, { ...base, branch: 'R' }).map((r) => r.a.id)).toEqual(['d', 'a']);
    expect(tableRowsQuery(rows, { ...base, kLower: 2 }).map((r) => r.a.id)).toEqual(['c', 'a']);
    expect(tableRowsQuery(rows, { ...base, jMin: 4, jMax: 7 }).map((r) => r.a.id)).toEqual(['c', 'a']);
    expect(tableRowsQuery(rows, { ...base, minAbsOmcCm1: 0.005 }).map((r) => r.a.id)).toEqual(['a', 'b']);
  });
  it('keeps a row without a calculated position (o − c NaN) in view unless an |o − c| bound is set', () => {
    const noCalc = rows.map((r) => (r.a.id === 'c' ? { ...r, calcCm1: NaN, omcCm1: NaN } : r));
    expect(tableRowsQuery(noCalc, base).map((r) => r.a.id)).toContain('c');
    expect(tableRowsQuery(noCalc, { ...base, minAbsOmcCm1: 0.005 }).map((r) => r.a.id)).not.toContain('c');
  });
});

/** The query as first written (per-row key arrays, sort of row objects): the definition to match. */
function queryReference(rs: readonly AssignmentRow[], q: TableQuery): AssignmentRow[] {
  const out = rs.filter(
    (r) =>
      (q.branch === '' || 'PQR'[r.deltaJ + 1] === q.branch) &&
      (q.kLower === null || r.a.kLower === q.kLower) &&
      (q.jMin === null || r.a.jLower >= q.jMin) &&
      (q.jMax === null || r.a.jLower <= q.jMax) &&
      (q.minAbsOmcCm1 <= 0 || Math.abs(r.omcCm1) >= q.minAbsOmcCm1),
  );
  const key: Record<TableQuery['sortKey'], (r: AssignmentRow) => number[]> = {
    label: (r) => [-r.deltaK, r.a.kLower, r.deltaJ, r.a.jLower],
    jLower: (r) => [r.a.jLower, r.a.kLower],
    kLower: (r) => [r.a.kLower, r.a.jLower],
    obs: (r) => [r.a.observedCm1],
    calc: (r) => [r.calcCm1],
    omc: (r) => [r.omcCm1],
    absOmc: (r) => [Math.abs(r.omcCm1)],
  };
  const f = key[q.sortKey];
  const sign = q.sortDescending ? -1 : 1;
  const indexed = out.map((r, i) => ({ r, i, k: f(r) }));
  indexed.sort((a, b) => {
    for (let j = 0; j < a.k.length; j++) if (a.k[j] !== b.k[j]) return sign * (a.k[j] - b.k[j]);
    return a.i - b.i;
  });
  return indexed.map((x) => x.r);
}

// Few distinct values, so that ties (kept in input order) are common; NaN now and then.
const rowArb = fc
  .record({
    dk: fc.integer({ min: -1, max: 1 }),
    dj: fc.integer({ min: -1, max: 1 }),
    k: fc.nat(3),
    j: fc.nat(6),
    omc: fc.oneof(
      { weight: 20, arbitrary: fc.constantFrom(-0.02, -0.001, 0, 0.001, 0.004, 0.02) },
      { weight: 1, arbitrary: fc.constant(Number.NaN) },
    ),
  })
  .map(({ dk, dj, k, j, omc }) => row(`r${j}`, dk, dj, k, j, omc));

const queryArb: fc.Arbitrary<TableQuery> = fc.record({
  sortKey: fc.constantFrom<TableQuery['sortKey']>('label', 'jLower', 'kLower', 'obs', 'calc', 'omc', 'absOmc'),
  sortDescending: fc.boolean(),
  branch: fc.constantFrom<TableQuery['branch']>('', 'P', 'Q', 'R'),
  kLower: fc.option(fc.nat(3), { nil: null }),
  jMin: fc.option(fc.nat(6), { nil: null }),
  jMax: fc.option(fc.nat(6), { nil: null }),
  minAbsOmcCm1: fc.constantFrom(0, 0, 0.001, 0.005),
});

type TableOp =
  | { kind: 'append'; rows: AssignmentRow[] }
  | { kind: 'replace'; at: number; r: AssignmentRow }
  | { kind: 'remove'; at: number }
  | { kind: 'touch'; at: number[]; rows: AssignmentRow[] }
  | { kind: 'query'; q: TableQuery }
  | { kind: 'same' };

const tableOpArb: fc.Arbitrary<TableOp> = fc.oneof(
  { weight: 4, arbitrary: fc.record({ kind: fc.constant('append' as const), rows: fc.array(rowArb, { minLength: 1, maxLength: 20 }) }) },
  fc.record({ kind: fc.constant('replace' as const), at: fc.nat(100), r: rowArb }),
  fc.record({ kind: fc.constant('remove' as const), at: fc.nat(100) }),
  // Rows replaced in place by copies that sort the same (as a new row sets the blend flag of the
  // rows on its peak), with rows appended in the same step.
  {
    weight: 2,
    arbitrary: fc.record({
      kind: fc.constant('touch' as const),
      at: fc.array(fc.nat(100), { minLength: 1, maxLength: 3 }),
      rows: fc.array(rowArb, { maxLength: 2 }),
    }),
  },
  fc.record({ kind: fc.constant('query' as const), q: queryArb }),
  fc.constant({ kind: 'same' as const }),
);

describe('tableRowsQuery (typed-array sort)', () => {
  it('equals the per-row-key sort on any rows and query', () => {
    fc.assert(
      fc.property(fc.array(rowArb, { maxLength: 60 }), queryArb, (rs, q) => {
        expect(tableRowsQuery(rs, q)).toEqual(queryReference(rs, q));
      }),
      { numRuns: 400, seed: 7 },
    );
  });
});

describe('tableRowsQueryMemo', () => {
  it('returns the same array for the same rows and query', () => {
    const query = tableRowsQueryMemo();
    const first = query(rows, base);
    expect(query(rows, base)).toBe(first);
  });

  it('equals tableRowsQuery after any sequence of appends, replacements (with other sort keys or the same), removals and query changes', () => {
    fc.assert(
      fc.property(queryArb, fc.array(tableOpArb, { minLength: 1, maxLength: 30 }), (q0, ops) => {
        const query = tableRowsQueryMemo();
        let rs: AssignmentRow[] = [];
        let q = q0;
        for (const op of ops) {
          if (op.kind === 'append') rs = [...rs, ...op.rows];
          else if (op.kind === 'replace' && rs.length) rs = rs.map((r, i) => (i === op.at % rs.length ? op.r : r));
          else if (op.kind === 'remove' && rs.length) rs = rs.filter((_, i) => i !== op.at % rs.length);
          else if (op.kind === 'touch' && rs.length) {
            const at = new Set(op.at.map((k) => k % rs.length));
            rs = [...rs.map((r, i) => (at.has(i) ? { ...r, a: { ...r.a, isBlended: !r.a.isBlended }, isFar: !r.isFar } : r)), ...op.rows];
          } else if (op.kind === 'query') q = op.q;
          else rs = [...rs];
          expect(query(rs, q)).toEqual(queryReference(rs, q));
        }
      }),
      { numRuns: 300, seed: 11 },
    );
  });
});
