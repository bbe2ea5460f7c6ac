/**
 * Sort and filter of the assignments table (pure).
 */
import type { AssignmentRow } from './selectors';
import type { TableQuery } from './viewSlice';

/**
 * Rows matching the filter, in the chosen order. Label order is ΔK, K'', branch, J'' (the
 * ladders' order); ties keep the input order.
 * @param rows assignment rows
 * @param q sort key/direction and filters (branch, K'', J'' range, smallest |o − c| in cm^-1)
 */
export function tableRowsQuery(rows: readonly AssignmentRow[], q: TableQuery): AssignmentRow[] {
  const branchOf = (r: AssignmentRow) => 'PQR'[r.deltaJ + 1];
  const out = rows.filter(
    (r) =>
      (q.branch === '' || branchOf(r) === q.branch) &&
      (q.kLower === null || r.a.kLower === q.kLower) &&
      (q.jMin === null || r.a.jLower >= q.jMin) &&
      (q.jMax === null || r.a.jLower <= q.jMax) &&
      Math.abs(r.omcCm1) >= q.minAbsOmcCm1,
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
