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

/** The keys of a list's items with how many items carry each, kept per version of the list (listKeysUpdate). */
export interface ListKeys<T> {
  items: readonly T[];
  keyOf: (item: T) => string;
  /** Key → number of items with it; keys no item carries are absent, so `has` tells membership. */
  counts: ReadonlyMap<string, number>;
}

/** Counts handed on to a later version (see listKeysUpdate), so an old state is never read again. */
const keysSpent = new WeakSet<object>();

/**
 * The key counts of `items`, from those of the previous version where the lists differ in a few
 * items (memo/listAlign: the items between the unchanged head and tail are taken out and put in):
 * the previous counts are updated in place and handed on, so an append costs one key. The previous
 * state must not be used again (a second update from it counts afresh).
 * @param prev the previous state, or null
 * @param items the list
 * @param keyOf an item's key (a new function counts afresh)
 */
export function listKeysUpdate<T>(prev: ListKeys<T> | null, items: readonly T[], keyOf: (item: T) => string): ListKeys<T> {
  if (prev && prev.items === items && prev.keyOf === keyOf && !keysSpent.has(prev)) return prev;
  const n = items.length;
  if (prev && prev.keyOf === keyOf && !keysSpent.has(prev)) {
    const old = prev.items;
    const n0 = old.length;
    const { prefix, suffix } = listAlign(old, items);
    const changed = n0 - prefix - suffix + (n - prefix - suffix);
    if (changed <= Math.max(16, n >> 3)) {
      const counts = prev.counts as Map<string, number>;
      for (let i = prefix; i < n0 - suffix; i++) {
        const key = keyOf(old[i]);
        const c = (counts.get(key) ?? 0) - 1;
        if (c > 0) counts.set(key, c);
        else counts.delete(key);
      }
      for (let i = prefix; i < n - suffix; i++) {
        const key = keyOf(items[i]);
        counts.set(key, (counts.get(key) ?? 0) + 1);
      }
      keysSpent.add(prev);
      return { items, keyOf, counts };
    }
  }
  const counts = new Map<string, number>();
  for (const item of items) {
    const key = keyOf(item);
    counts.set(key, (counts.get(key) ?? 0) + 1);
  }
  return { items, keyOf, counts };
}
