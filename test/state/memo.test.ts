/**
 * The list alignment behind the incremental selectors: per-item results reused by identity must
 * equal a fresh map of the list after any sequence of edits (definition: Array.prototype.map).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { listAlign, listKeysUpdate, listMapReuse, type ListKeys } from '../../src/state/memo';

interface Item {
  id: number;
  value: number;
}

type ListOp =
  | { kind: 'append'; values: number[] }
  | { kind: 'remove'; at: number; count: number }
  | { kind: 'edit'; at: number[]; value: number }
  | { kind: 'undo'; back: number }
  | { kind: 'reverse' }
  | { kind: 'copy' };

const listOpArb: fc.Arbitrary<ListOp> = fc.oneof(
  {
    weight: 4,
    arbitrary: fc.record({ kind: fc.constant('append' as const), values: fc.array(fc.integer(), { minLength: 1, maxLength: 3 }) }),
  },
  fc.record({ kind: fc.constant('remove' as const), at: fc.nat(60), count: fc.integer({ min: 1, max: 3 }) }),
  fc.record({ kind: fc.constant('edit' as const), at: fc.array(fc.nat(60), { minLength: 1, maxLength: 3 }), value: fc.integer() }),
  // Back to an earlier version (undo), or forward again (a later one kept in the history).
  fc.record({ kind: fc.constant('undo' as const), back: fc.integer({ min: -3, max: 3 }) }),
  fc.constant({ kind: 'reverse' as const }),
  // The same items in a new array (nothing changed).
  fc.constant({ kind: 'copy' as const }),
);

/** Apply the ops, calling `step` with each version; versions are kept for undo. */
function run(ops: ListOp[], step: (list: Item[]) => void): void {
  const versions: Item[][] = [[]];
  let at = 0;
  let list: Item[] = [];
  let next = 0;
  for (const op of ops) {
    if (op.kind === 'append') list = [...list, ...op.values.map((value) => ({ id: next++, value }))];
    else if (op.kind === 'remove' && list.length) {
      const from = op.at % list.length;
      list = [...list.slice(0, from), ...list.slice(from + op.count)];
    } else if (op.kind === 'edit' && list.length) {
      const hit = new Set(op.at.map((k) => k % list.length));
      list = list.map((x, i) => (hit.has(i) ? { ...x, value: op.value } : x));
    } else if (op.kind === 'undo') {
      at = Math.min(Math.max(at - op.back, 0), versions.length - 1);
      list = versions[at];
      step(list);
      continue;
    } else if (op.kind === 'reverse') list = [...list].reverse();
    else list = [...list];
    versions.splice(at + 1, versions.length, list);
    at = versions.length - 1;
    step(list);
  }
}

describe('listAlign', () => {
  it('finds the unchanged head and tail of an append, an edit and a deletion', () => {
    const [a, b, c, d] = [{}, {}, {}, {}];
    expect(listAlign([a, b, c], [a, b, c, d])).toEqual({ prefix: 3, suffix: 0 });
    expect(listAlign([a, b, c], [a, d, c])).toEqual({ prefix: 1, suffix: 1 });
    expect(listAlign([a, b, c], [a, c])).toEqual({ prefix: 1, suffix: 1 });
    expect(listAlign([a, b, c], [b, c])).toEqual({ prefix: 0, suffix: 2 });
    expect(listAlign([a, b, c], [])).toEqual({ prefix: 0, suffix: 0 });
    // Head and tail never overlap (a repeated item).
    expect(listAlign([a, a], [a, a, a])).toEqual({ prefix: 2, suffix: 0 });
  });

  it('gives a head and tail that are the same items in both lists, never overlapping', () => {
    fc.assert(
      fc.property(fc.array(listOpArb, { minLength: 1, maxLength: 30 }), (ops) => {
        let prev: Item[] = [];
        run(ops, (list) => {
          const { prefix, suffix } = listAlign(prev, list);
          expect(prefix + suffix).toBeLessThanOrEqual(Math.min(prev.length, list.length));
          for (let i = 0; i < prefix; i++) expect(list[i]).toBe(prev[i]);
          for (let k = 1; k <= suffix; k++) expect(list[list.length - k]).toBe(prev[prev.length - k]);
          prev = list;
        });
      }),
      { numRuns: 300, seed: 20261203 },
    );
  });
});

describe('listMapReuse', () => {
  it('equals a fresh map after any sequence of appends, deletions, edits, undo/redo and reorders, computing only what is new', () => {
    fc.assert(
      fc.property(fc.array(listOpArb, { minLength: 1, maxLength: 30 }), (ops) => {
        let prev: Item[] | null = null;
        let prevOut: string[] | null = null;
        run(ops, (list) => {
          const computed: Item[] = [];
          const out = listMapReuse(prev, prevOut, list, (x) => (computed.push(x), `${x.id}:${x.value}`));
          expect(out).toEqual(list.map((x) => `${x.id}:${x.value}`));
          // Items at their old place (head, tail) were not computed again.
          const { prefix, suffix } = prev ? listAlign(prev, list) : { prefix: 0, suffix: 0 };
          expect(computed.length).toBeLessThanOrEqual(list.length - prefix - suffix);
          prev = list;
          prevOut = out;
        });
      }),
      { numRuns: 300, seed: 20261204 },
    );
  });

  it('computes only the appended item, and returns the old results for an unchanged list', () => {
    const list = Array.from({ length: 1000 }, (_, id) => ({ id, value: id }));
    const out = listMapReuse(null, null, list, (x) => x.value * 2);
    let calls = 0;
    const more = [...list, { id: 1000, value: 7 }];
    const out2 = listMapReuse(list, out, more, (x) => (calls++, x.value * 2));
    expect(calls).toBe(1);
    expect(out2[1000]).toBe(14);
    expect(listMapReuse(more, out2, [...more], () => NaN)).toBe(out2);
  });
});

describe('listKeysUpdate', () => {
  const keyOf = (x: Item) => `k${x.value % 5}`;
  const fresh = (list: readonly Item[]) => {
    const m = new Map<string, number>();
    for (const x of list) m.set(keyOf(x), (m.get(keyOf(x)) ?? 0) + 1);
    return m;
  };

  it('equals a fresh count after any sequence of appends, deletions, edits, undo/redo and reorders', () => {
    fc.assert(
      fc.property(fc.array(listOpArb, { minLength: 1, maxLength: 40 }), (ops) => {
        let state: ListKeys<Item> | null = null;
        run(ops, (list) => {
          state = listKeysUpdate(state, list, keyOf);
          expect(new Map(state.counts)).toEqual(fresh(list));
          // Membership: a key no item carries is absent (never kept with a count of 0).
          for (const c of state.counts.values()) expect(c).toBeGreaterThan(0);
        });
      }),
      { numRuns: 300, seed: 20261205 },
    );
  });

  it('counts afresh from a state already handed on, and for another key function', () => {
    const list = Array.from({ length: 40 }, (_, id) => ({ id, value: id }));
    const s1 = listKeysUpdate(null, list, keyOf);
    const more = [...list, { id: 40, value: 3 }];
    const s2 = listKeysUpdate(s1, more, keyOf);
    expect(s2.counts.get('k3')).toBe(9);
    // s1's counts now describe `more`; an update from s1 must not trust them.
    const other = [...list, { id: 41, value: 4 }];
    expect(new Map(listKeysUpdate(s1, other, keyOf).counts)).toEqual(fresh(other));
    const byId = (x: Item) => `id${x.id}`;
    expect(listKeysUpdate(s2, more, byId).counts.size).toBe(41);
  });
});
