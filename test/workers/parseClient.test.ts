/**
 * The parse worker's plumbing, in Node: the real worker module (parse.worker.ts) runs behind a
 * stand-in Worker that passes messages by structured clone with their transfer lists, as a browser
 * does. The results must equal the same io functions called directly.
 */
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';
import { projectFileParse, projectFileSerialize } from '../../src/io/projectFile';
import { projectApply, projectImport, projectSetIo } from '../../src/state/actionsProject';
import { traceReplace } from '../../src/state/actionsImport';
import { sessionOf } from '../../src/state/session';
import { benchReset, benchStore } from '../../src/state/store';
import { smallModel, smallTrace } from '../state/fixtures';

type Listener = ((event: { data: unknown }) => void) | null;

/** Transfer lists the worker posted with, in order. */
const posted: { type: string; transfer: Transferable[] }[] = [];
const byId = new Map<number, FakeWorker>();
const scope = {
  onmessage: null as Listener,
  postMessage(message: { id: number; type: string }, transfer: Transferable[]) {
    posted.push({ type: message.type, transfer });
    const copy = structuredClone(message, { transfer });
    const target = byId.get(message.id);
    setTimeout(() => target?.onmessage?.({ data: copy }), 0);
  },
};

class FakeWorker {
  onmessage: Listener = null;
  onerror: ((e: { message: string }) => void) | null = null;
  onmessageerror: (() => void) | null = null;
  isTerminated = false;
  static count = 0;
  constructor(url: URL) {
    expect(String(url)).toMatch(/parse\.worker\.ts$/);
    FakeWorker.count++;
  }
  postMessage(message: { id: number }, transfer: Transferable[] = []) {
    byId.set(message.id, this);
    const copy = structuredClone(message, { transfer });
    setTimeout(() => scope.onmessage?.({ data: copy }), 0);
  }
  terminate() {
    this.isTerminated = true;
  }
}

let client: typeof import('../../src/workers/parseClient');

beforeAll(async () => {
  vi.stubGlobal('self', scope);
  vi.stubGlobal('Worker', FakeWorker);
  await import('../../src/workers/parse.worker');
  client = await import('../../src/workers/parseClient');
});
afterAll(() => {
  projectSetIo(null);
  vi.unstubAllGlobals();
});
beforeEach(() => {
  posted.length = 0;
  benchReset();
});

/** A worked session's project-file text (trace, two assignments, changed view). */
function projectText(): string {
  const model = smallModel();
  benchStore.setState({ model, theme: 'dark', xRange: [1000, 1001] });
  traceReplace(smallTrace(model).trace, null, 'file');
  benchStore.setState({
    assignments: [
      {
        id: 'a1',
        jUpper: 3,
        kUpper: 1,
        jLower: 2,
        kLower: 0,
        observedCm1: 1000.5,
        uncertaintyCm1: 0.001,
        isBlended: false,
        isExcluded: false,
        note: '',
      },
      {
        id: 'a2',
        jUpper: 4,
        kUpper: 1,
        jLower: 3,
        kLower: 0,
        observedCm1: 1001.1,
        uncertaintyCm1: 0.001,
        isBlended: false,
        isExcluded: false,
        note: 'x',
      },
    ],
  });
  return projectFileSerialize(sessionOf(benchStore.getState()), { appVersion: '0.1.0', savedAt: '2024-01-01T00:00:00.000Z' });
}

describe('project files through the parse worker', () => {
  it('reads a project to the same outcome as projectFileParse, transferring the trace buffers', async () => {
    const text = projectText();
    const direct = projectFileParse(text);
    const viaWorker = await client.projectReadInWorker(new Blob([text]), 'p.json');
    expect(viaWorker).toEqual(direct);
    const reply = posted.find((p) => p.type === 'project-read-result')!;
    expect(reply.transfer).toHaveLength(2);
    // Transferred, not copied: the worker's buffers are detached once posted.
    expect(reply.transfer.every((b) => (b as ArrayBuffer).byteLength === 0)).toBe(true);
    if (viaWorker.ok) expect(viaWorker.session.trace!.wavenumberCm1.length).toBe(smallTrace(smallModel()).trace.wavenumberCm1.length);
  });

  it('gives the same refusal and the same dropped-row messages as the main-thread reader', async () => {
    for (const text of ['{not json', '{"format":"ladder-bench-project","version":99}']) {
      const r = await client.projectReadInWorker(text, 'bad.json');
      expect(r).toEqual(projectFileParse(text));
      expect(r.ok).toBe(false);
    }
    const doc = JSON.parse(projectText());
    doc.session.assignments[0].jUpper = -1;
    const text = JSON.stringify(doc);
    const r = await client.projectReadInWorker(text, 'rows.json');
    expect(r).toEqual(projectFileParse(text));
    expect(r.ok && r.messages.join('\n')).toMatch(/1 of 2 assignments were not loaded: session.assignments\[0\] \(jUpper/);
  });

  it('writes the same text as projectFileSerialize', async () => {
    projectText();
    const session = sessionOf(benchStore.getState());
    const header = { appVersion: '0.1.0', savedAt: '2024-01-02T00:00:00.000Z' };
    expect(await client.projectWriteInWorker(session, header)).toBe(projectFileSerialize(session, header));
  });

  it('opens a project with the worker reader to the same state as the main-thread path', async () => {
    const text = projectText();
    benchReset();
    projectApply(projectFileParse(text), 'p.json');
    const here = sessionOf(benchStore.getState());
    benchReset();
    projectSetIo(client.projectReadInWorker);
    try {
      expect(await projectImport(new Blob([text]), 'p.json')).toBe(true);
    } finally {
      projectSetIo(null);
    }
    const there = sessionOf(benchStore.getState());
    const { trace: t1, ...r1 } = there;
    const { trace: t0, ...r0 } = here;
    expect(r1).toEqual(r0);
    expect(Array.from(t1!.absorbance)).toEqual(Array.from(t0!.absorbance));
    expect(benchStore.getState().messages.at(-1)?.text).toBe(
      'Project p.json opened (2 assignments). Undo brings the previous session back.',
    );
  });

  it('rejects storage requests with the worker error when the store cannot be opened (no IndexedDB here)', async () => {
    await expect(client.storeGetInWorker({ db: 'x', store: 'y' }, ['session'])).rejects.toThrow(/^storage worker: /);
    const before = FakeWorker.count;
    await expect(client.storeSetInWorker({ db: 'x', store: 'y' }, [['session', 'text']])).rejects.toThrow(/^storage worker: /);
    // One long-lived worker serves the storage requests.
    expect(FakeWorker.count).toBe(before);
  });
});
