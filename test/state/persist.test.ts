import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { fitBand } from '../../src/fit/fitBand';
import { projectFileParse, projectFileSerialize, type ProjectSession } from '../../src/io/projectFile';
import { candidateAssign, peakClick } from '../../src/state/actionsAssign';
import { fitStart } from '../../src/state/actionsFit';
import { traceReplace } from '../../src/state/actionsImport';
import { persistRestore, persistSaveNow, persistSetStorage, persistStart, persistStop, type PersistStorage } from '../../src/state/persist';
import { sessionOf, stateFromSession } from '../../src/state/session';
import { benchReset, benchStore } from '../../src/state/store';
import { smallModel, smallTrace } from './fixtures';

const runFit = (input: Parameters<typeof fitBand>[0]) => Promise.resolve(fitBand(input));

/** An in-memory stand-in for IndexedDB: values are cloned on the way in and out, as IndexedDB does. */
function memoryStorage(initial: Record<string, unknown> = {}) {
  const map = new Map<string, unknown>(Object.entries(initial));
  const writes: string[][] = [];
  let failNext = false;
  const storage: PersistStorage = {
    getMany: async (keys) => keys.map((k) => structuredClone(map.get(k))),
    setMany: async (entries) => {
      if (failNext) {
        failNext = false;
        throw new Error('QuotaExceededError');
      }
      writes.push(entries.map(([k]) => k).sort());
      for (const [k, v] of entries) map.set(k, structuredClone(v));
    },
    delMany: async (keys) => keys.forEach((k) => map.delete(k)),
  };
  return { storage, map, writes, failOnce: () => (failNext = true) };
}

/** A session with a trace, two assignments, a fit and a changed view. */
async function workedSession(): Promise<void> {
  const model = smallModel();
  benchStore.setState({ model, minIntensity: 0.02, theme: 'dark', floated: ['upper.origin'] });
  traceReplace(smallTrace(model).trace, null, 'file');
  benchStore.setState({ xRange: [1000, 1002] });
  peakClick(2);
  candidateAssign(0);
  peakClick(5);
  candidateAssign(1);
  await fitStart(runFit);
  benchStore.setState({ tab: 'solve' });
}

/** What the code before the split restored from the same store state: one project-file record and the trace. */
function oldPathFields(s = benchStore.getState()) {
  const text = projectFileSerialize({ ...sessionOf(s), trace: null }, { appVersion: 'autosave', savedAt: '2024-01-01T00:00:00.000Z' });
  const r = projectFileParse(text);
  if (!r.ok) throw new Error(r.message);
  return sessionOf({ ...benchStore.getInitialState(), ...stateFromSession({ ...r.session, trace: s.trace }) } as never);
}

function withoutTrace(p: ProjectSession) {
  const { trace, ...rest } = p;
  return { rest, x: Array.from(trace?.wavenumberCm1 ?? []), y: Array.from(trace?.absorbance ?? []) };
}

beforeEach(() => {
  benchReset();
});
afterEach(() => {
  persistStop();
  persistSetStorage(null);
  vi.useRealTimers();
});

describe('autosave records and restore', () => {
  it('restores exactly the session it saved, equal to what the one-record layout restored', async () => {
    const mem = memoryStorage();
    persistSetStorage(mem.storage);
    await workedSession();
    expect(benchStore.getState().fitOutcome?.ok).toBe(true);
    const before = sessionOf(benchStore.getState());
    const old = oldPathFields();
    await persistSaveNow();
    expect(mem.writes).toEqual([['assignments', 'fit', 'session', 'trace']]);
    benchReset();
    expect(await persistRestore()).toBe(true);
    const after = sessionOf(benchStore.getState());
    expect(withoutTrace(after)).toEqual(withoutTrace(before));
    expect(withoutTrace(after)).toEqual(withoutTrace(old));
    expect(benchStore.getState().past).toEqual([]);
  });

  it('writes only the small session record after a view-only change (zoom, tab, theme)', async () => {
    const mem = memoryStorage();
    persistSetStorage(mem.storage);
    await workedSession();
    await persistSaveNow();
    const partsBefore = [mem.map.get('assignments'), mem.map.get('fit')];
    benchStore.setState({ xRange: [1000.5, 1001] });
    await persistSaveNow();
    benchStore.setState({ tab: 'export', theme: 'light' });
    await persistSaveNow();
    expect(mem.writes.slice(1)).toEqual([['session'], ['session']]);
    expect((mem.map.get('session') as string).length).toBeLessThan(20_000);
    expect([mem.map.get('assignments'), mem.map.get('fit')]).toEqual(partsBefore);
    benchReset();
    expect(await persistRestore()).toBe(true);
    const s = benchStore.getState();
    expect([s.xRange, s.tab, s.theme, s.assignments.length, s.fitOutcome?.ok]).toEqual([[1000.5, 1001], 'export', 'light', 2, true]);
  });

  it('writes the assignments record after an assignment and the fit record after a fit, the trace only when it changes', async () => {
    const mem = memoryStorage();
    persistSetStorage(mem.storage);
    await workedSession();
    await persistSaveNow();
    peakClick(8);
    candidateAssign(0);
    await persistSaveNow();
    await fitStart(runFit);
    await persistSaveNow();
    traceReplace(smallTrace(smallModel()).trace, null, 'file');
    await persistSaveNow();
    expect(mem.writes.slice(1)).toEqual([
      ['assignments', 'session'],
      ['fit', 'session'],
      ['session', 'trace'],
    ]);
    const n = benchStore.getState().assignments.length;
    benchReset();
    await persistRestore();
    expect(benchStore.getState().assignments.length).toBe(n);
  });

  it('restores a session saved in the one-record layout as before, and completes the split on the next save', async () => {
    await workedSession();
    const s = benchStore.getState();
    const expected = oldPathFields(s);
    const oneRecord = projectFileSerialize(
      { ...sessionOf(s), trace: null },
      { appVersion: 'autosave', savedAt: '2024-01-01T00:00:00.000Z' },
    );
    // A stale assignments record beside it must not win over the assignments inside the record.
    const mem = memoryStorage({
      session: oneRecord,
      trace: { wavenumberCm1: s.trace!.wavenumberCm1, absorbance: s.trace!.absorbance },
      assignments: '[]',
    });
    persistSetStorage(mem.storage);
    benchReset();
    expect(await persistRestore()).toBe(true);
    expect(withoutTrace(sessionOf(benchStore.getState()))).toEqual(withoutTrace(expected));
    benchStore.setState({ xRange: [1001, 1001.5] });
    await persistSaveNow();
    expect(mem.writes).toEqual([['assignments', 'fit', 'session']]);
    benchReset();
    expect(await persistRestore()).toBe(true);
    const again = sessionOf(benchStore.getState());
    expect(withoutTrace(again)).toEqual(withoutTrace({ ...expected, view: { ...expected.view, xRange: [1001, 1001.5] } }));
  });

  it('reports nothing to restore when nothing was saved, and warns when the record cannot be read', async () => {
    persistSetStorage(memoryStorage().storage);
    expect(await persistRestore()).toBe(false);
    persistSetStorage(memoryStorage({ session: '{"format":"ladder-bench-project","version":99}' }).storage);
    expect(await persistRestore()).toBe(false);
    expect(benchStore.getState().messages.at(-1)?.text).toMatch(/autosaved session could not be restored \(project file: version 99/);
  });

  it('writes the parts again after a failed save', async () => {
    const mem = memoryStorage();
    persistSetStorage(mem.storage);
    await workedSession();
    mem.failOnce();
    await persistSaveNow();
    expect(benchStore.getState().messages.at(-1)?.text).toMatch(/Autosave is not available in this browser \(QuotaExceededError\)/);
    benchStore.setState({ xRange: [1000.2, 1000.4] });
    await persistSaveNow();
    expect(mem.writes).toEqual([['assignments', 'fit', 'session', 'trace']]);
  });

  it('saves once, 300 ms after a burst of changes', async () => {
    vi.useFakeTimers();
    const mem = memoryStorage();
    persistSetStorage(mem.storage);
    persistStart();
    benchStore.setState({ xRange: [1, 2] });
    await vi.advanceTimersByTimeAsync(200);
    benchStore.setState({ xRange: [1, 3] });
    await vi.advanceTimersByTimeAsync(200);
    expect(mem.writes).toEqual([]);
    await vi.advanceTimersByTimeAsync(200);
    expect(mem.writes.length).toBe(1);
    benchReset();
    await persistRestore();
    expect(benchStore.getState().xRange).toEqual([1, 3]);
  });
});
