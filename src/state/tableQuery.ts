/**
 * Sort and filter of the assignments table (pure).
 */
import type { AssignmentRow } from './selectors';
import type { TableQuery } from './viewSlice';

/** Sort key columns of a sort key: for each column, the value of a row (compared in order). */
const KEY_COLUMNS: Record<TableQuery['sortKey'], ((r: AssignmentRow) => number)[]> = {
  label: [(r) => -r.deltaK, (r) => r.a.kLower, (r) => r.deltaJ, (r) => r.a.jLower],
  jLower: [(r) => r.a.jLower, (r) => r.a.kLower],
  kLower: [(r) => r.a.kLower, (r) => r.a.jLower],
  obs: [(r) => r.a.observedCm1],
  calc: [(r) => r.calcCm1],
  omc: [(r) => r.omcCm1],
  absOmc: [(r) => Math.abs(r.omcCm1)],
};

function rowMatches(r: AssignmentRow, q: TableQuery): boolean {
  return (
    (q.branch === '' || 'PQR'[r.deltaJ + 1] === q.branch) &&
    (q.kLower === null || r.a.kLower === q.kLower) &&
    (q.jMin === null || r.a.jLower >= q.jMin) &&
    (q.jMax === null || r.a.jLower <= q.jMax) &&
    // A row with no calculated position (o − c NaN) stays in view unless an |o − c| bound is set.
    (q.minAbsOmcCm1 <= 0 || Math.abs(r.omcCm1) >= q.minAbsOmcCm1)
  );
}

/**
 * Rows matching the filter, in the chosen order. Label order is ΔK, K'', branch, J'' (the
 * ladders' order); ties keep the input order. The sort runs over row indices with the keys in
 * typed arrays (no per-row key objects).
 * @param rows assignment rows
 * @param q sort key/direction and filters (branch, K'', J'' range, smallest |o − c| in cm^-1)
 */
export function tableRowsQuery(rows: readonly AssignmentRow[], q: TableQuery): AssignmentRow[] {
  return queryFull(rows, q).out;
}

function queryFull(rows: readonly AssignmentRow[], q: TableQuery): { out: AssignmentRow[]; hasNaN: boolean } {
  const out: AssignmentRow[] = [];
  for (const r of rows) if (rowMatches(r, q)) out.push(r);
  const cols = KEY_COLUMNS[q.sortKey];
  const n = out.length;
  let hasNaN = false;
  const keys = cols.map((f) => {
    const k = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      k[i] = f(out[i]);
      if (k[i] !== k[i]) hasNaN = true;
    }
    return k;
  });
  const sign = q.sortDescending ? -1 : 1;
  // A plain array (not a typed one) so the sort, and so the order of NaN keys, is Array.prototype.sort's.
  const order: number[] = new Array(n);
  for (let i = 0; i < n; i++) order[i] = i;
  order.sort((a, b) => {
    for (const k of keys) if (k[a] !== k[b]) return sign * (k[a] - k[b]);
    return a - b;
  });
  return { out: order.map((i) => out[i]), hasNaN };
}

/**
 * A memoised tableRowsQuery for one table: the same rows and query give the same array; rows that
 * only grew at the end (a new assignment), possibly with a few rows replaced in place by rows that
 * sort the same (a blend flag set by the new row, an edited note), are placed into the previous
 * result by binary search instead of filtering and sorting every row again. Equal to tableRowsQuery
 * (checked in test/state/tableQuery.test.ts).
 * @returns the query function (keep one per table)
 */
export function tableRowsQueryMemo(): (rows: readonly AssignmentRow[], q: TableQuery) => AssignmentRow[] {
  let lastRows: readonly AssignmentRow[] | null = null;
  let lastQuery: TableQuery | null = null;
  let lastOut: AssignmentRow[] = [];
  // NaN keys compare inconsistently, so a result holding one is never extended by binary search.
  let lastHasNaN = false;
  return (rows, q) => {
    if (rows === lastRows && q === lastQuery) return lastOut;
    const out = lastRows && q === lastQuery && !lastHasNaN ? appended(lastRows, lastOut, rows, q) : null;
    if (out) lastOut = out;
    else ({ out: lastOut, hasNaN: lastHasNaN } = queryFull(rows, q));
    lastRows = rows;
    lastQuery = q;
    return lastOut;
  };
}

/** At most this many appended or replaced rows are placed one by one; more are sorted afresh. */
const APPEND_MAX = 16;

function sameKeys(cols: readonly ((r: AssignmentRow) => number)[], x: AssignmentRow, y: AssignmentRow): boolean {
  for (const f of cols) if (!Object.is(f(x), f(y))) return false;
  return true;
}

/**
 * The previous result with the rows appended since placed in it, or null when rows is not the
 * previous rows plus a few at the end, apart from a few rows replaced at their own index by rows
 * with the same filter result and sort keys (they take the old row's place: same keys, same input
 * index, so the same place in the order).
 */
function appended(
  prevRows: readonly AssignmentRow[],
  prevOut: readonly AssignmentRow[],
  rows: readonly AssignmentRow[],
  q: TableQuery,
): AssignmentRow[] | null {
  const n0 = prevRows.length;
  if (rows.length < n0 || rows.length - n0 > APPEND_MAX) return null;
  const cols = KEY_COLUMNS[q.sortKey];
  let out: AssignmentRow[] | null = null;
  let nReplaced = 0;
  for (let i = 0; i < n0; i++) {
    const was = prevRows[i];
    const r = rows[i];
    if (r === was) continue;
    if (++nReplaced > APPEND_MAX) return null;
    const isShown = rowMatches(was, q);
    if (isShown !== rowMatches(r, q)) return null;
    if (!isShown) continue;
    if (!sameKeys(cols, was, r)) return null;
    out ??= prevOut.slice();
    const at = out.indexOf(was);
    // The same row object twice (never from the store): which copy is which is not known.
    if (at < 0 || out.indexOf(was, at + 1) >= 0) return null;
    out[at] = r;
  }
  out ??= prevOut.slice();
  const sign = q.sortDescending ? -1 : 1;
  for (let i = n0; i < rows.length; i++) {
    const r = rows[i];
    if (!rowMatches(r, q)) continue;
    const key = cols.map((f) => f(r));
    // As above: a NaN key leaves the order to the full sort.
    if (key.some((v) => Number.isNaN(v))) return null;
    // The new row has the largest input index, so it goes after every row with an equal key:
    // the first position whose row sorts strictly after it.
    let lo = 0;
    let hi = out.length;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      let c = 0;
      for (let j = 0; j < cols.length && c === 0; j++) {
        const v = cols[j](out[mid]);
        if (v !== key[j]) c = sign * (v - key[j]);
      }
      if (c > 0) hi = mid;
      else lo = mid + 1;
    }
    out.splice(lo, 0, r);
  }
  return out;
}
