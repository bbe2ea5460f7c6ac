import { describe, expect, it } from 'vitest';
import type { AssignmentRow } from '../../src/state/selectors';
import { tableRowsQuery } from '../../src/state/tableQuery';
import { viewSliceInitial } from '../../src/state/viewSlice';

function row(id: string, dk: number, dj: number, k: number, j: number, omc: number): AssignmentRow {
  return {
    a: { id, jUpper: j + dj, kUpper: k + dk, jLower: j, kLower: k, observedCm1: 1000 + j, uncertaintyCm1: 0.001, isBlended: false, isExcluded: false, note: '' },
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
});
