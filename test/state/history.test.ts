import { describe, expect, it } from 'vitest';
import { HISTORY_LIMIT, historyChanged, historyRecord, historyRedo, historyUndo, type HistoryTracked } from '../../src/state/history';
import { modelDefaultDemo } from '../../src/state/modelDefaults';

function tracked(): HistoryTracked {
  return { model: modelDefaultDemo(), floated: [], symmetry: null, minIntensity: 0, assignments: [] };
}

describe('history', () => {
  it('has nothing to undo or redo at first', () => {
    expect(historyUndo({ past: [], future: [] }, tracked())).toBeNull();
    expect(historyRedo({ past: [], future: [] }, tracked())).toBeNull();
  });

  it('tells changes by reference', () => {
    const a = tracked();
    expect(historyChanged(a, { ...a })).toBe(false);
    expect(historyChanged(a, { ...a, assignments: [] })).toBe(true);
  });

  it('undoes and redoes in order and drops the redo stack on a new change', () => {
    const s0 = tracked();
    const s1 = { ...s0, floated: ['upper.B'] };
    const s2 = { ...s1, floated: ['upper.B', 'lower.B'] };
    let h = historyRecord({ past: [], future: [] }, s0, 'float upper.B');
    h = historyRecord(h, s1, 'float lower.B');
    const u1 = historyUndo(h, s2)!;
    expect(u1.floated).toBe(s1.floated);
    expect(u1.label).toBe('float lower.B');
    const u2 = historyUndo(u1, u1)!;
    expect(u2.floated).toBe(s0.floated);
    const r1 = historyRedo(u2, u2)!;
    expect(r1.floated).toBe(s1.floated);
    const fresh = historyRecord(r1, r1, 'something else');
    expect(fresh.future).toEqual([]);
  });

  it('merges a run with the same label when asked to, and keeps at most HISTORY_LIMIT steps', () => {
    let h = historyRecord({ past: [], future: [] }, tracked(), 'edit lower.B', true);
    h = historyRecord(h, tracked(), 'edit lower.B', true);
    expect(h.past.length).toBe(1);
    for (let i = 0; i < HISTORY_LIMIT + 10; i++) h = historyRecord(h, tracked(), `step ${i}`);
    expect(h.past.length).toBe(HISTORY_LIMIT);
    expect(h.past.at(-1)!.label).toBe(`step ${HISTORY_LIMIT + 9}`);
  });
});
