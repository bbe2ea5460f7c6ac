/**
 * Memoise a function on the identity of its arguments (last call only). Store data is immutable,
 * so "same reference" means "same value" and derived data is recomputed only after a real change.
 * @param fn a pure function
 */
export function memoLast<A extends unknown[], R>(fn: (...args: A) => R): (...args: A) => R {
  let lastArgs: A | null = null;
  let lastResult: R;
  return (...args: A): R => {
    if (lastArgs && lastArgs.length === args.length && lastArgs.every((v, i) => Object.is(v, args[i]))) return lastResult;
    lastResult = fn(...args);
    lastArgs = args;
    return lastResult;
  };
}

/** How a list lines up with its previous version (see listAlign). */
export interface ListAlignment {
  /** Leading items that are the same objects at the same positions. */
  prefix: number;
  /** Trailing items that are the same objects at the same distance from the end (not overlapping the prefix in either list). */
  suffix: number;
}

/**
 * The common head and tail of two versions of a list, compared by identity: an append leaves the
 * whole old list as the head, an edit of one item splits it into a head and a tail, a deletion
 * likewise. Derived per-item data can then be copied for the head and tail and computed only for the
 * items between them. O(n) comparisons of references, no lookups.
 * @param prev the previous version
 * @param next the current version
 */
export function listAlign<T>(prev: readonly T[], next: readonly T[]): ListAlignment {
  const n0 = prev.length;
  const n = next.length;
  const m = Math.min(n0, n);
  let prefix = 0;
  while (prefix < m && prev[prefix] === next[prefix]) prefix++;
  let suffix = 0;
  while (suffix < m - prefix && prev[n0 - 1 - suffix] === next[n - 1 - suffix]) suffix++;
  return { prefix, suffix };
}

/**
 * Per-item results of `next` reusing those of `prev` (parallel to it) where the same object sits in
 * the aligned head or tail, or at the same position in between (an edit that also appended);
 * `compute` is called for the others. Returns `prevOut` itself when nothing changed.
 * WARNING: only for results that depend on the item alone (plus what the caller keeps fixed).
 * @param prev the previous items, or null (everything is computed)
 * @param prevOut the previous results, parallel to prev
 * @param next the current items
 * @param compute the result of one item
 */
export function listMapReuse<T, R>(
  prev: readonly T[] | null,
  prevOut: readonly R[] | null,
  next: readonly T[],
  compute: (item: T) => R,
): R[] {
  if (prev && prevOut && prev === next) return prevOut as R[];
  const n = next.length;
  const out: R[] = new Array(n);
  if (!prev || !prevOut) {
    for (let i = 0; i < n; i++) out[i] = compute(next[i]);
    return out;
  }
  const n0 = prev.length;
  const { prefix, suffix } = listAlign(prev, next);
  for (let i = 0; i < prefix; i++) out[i] = prevOut[i];
  for (let i = prefix; i < n - suffix; i++) out[i] = i < n0 - suffix && prev[i] === next[i] ? prevOut[i] : compute(next[i]);
  for (let k = 1; k <= suffix; k++) out[n - k] = prevOut[n0 - k];
  if (n === n0 && prefix === n) return prevOut as R[];
  return out;
}
