/**
 * Plumbing of the assistant worker: a request becomes per-round progress messages and one result;
 * bad input becomes one error message in plain words. The job's numbers are tested in
 * test/state/actionsAssistant.test.ts (same function).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { peaksFind, type PeakList } from '../../src/analysis/peaksFind';
import { assistantHandle } from '../../src/workers/assistant.worker';
import type { AssistantWorkerRequest, AssistantWorkerResponse } from '../../src/workers/assistantProtocol';
import { assistantBandGuess, assistantBandStrongest, assistantBandTrace } from '../state/assistantBand';

let peaks: PeakList;
let band: ReturnType<typeof assistantBandTrace>;
beforeAll(() => {
  band = assistantBandTrace();
  peaks = peaksFind(band.trace, { minSnr: 5 });
});

const FLOATED = ['upper.origin', 'upper.B', 'upper.A', 'upper.zeta', 'lower.B', 'upper.DJ', 'lower.DJ'];

function seedRows(n: number) {
  const l = band.lines;
  return assistantBandStrongest(l, n).map((i, k) => ({
    id: `s${k}`,
    jUpper: l.jUpper[i],
    kUpper: l.kUpper[i],
    jLower: l.jLower[i],
    kLower: l.kLower[i],
    observedCm1: l.wavenumberCm1[i],
    uncertaintyCm1: 0.0005,
    isBlended: false,
    isExcluded: false,
    note: '',
  }));
}

function handle(request: AssistantWorkerRequest): AssistantWorkerResponse[] {
  const out: AssistantWorkerResponse[] = [];
  assistantHandle(request, (m) => out.push(m));
  return out;
}

describe('assistant worker plumbing', () => {
  it('refuses a request it does not know, naming its type', () => {
    const out = handle({ type: 'nonsense', id: 4 } as unknown as AssistantWorkerRequest);
    expect(out).toEqual([{ type: 'error', id: 4, message: "assistant.worker: unknown request type 'nonsense'" }]);
  });

  it('a run posts what it is checking (round 0), then one progress message per round (rounds 1, 2, …; lines so far never fall), then one result', () => {
    const out = handle({
      type: 'job',
      id: 7,
      job: { kind: 'run', model: assistantBandGuess(), floatable: FLOATED, peaks, assignments: seedRows(6), rejected: [] },
    });
    const all = out.filter((m) => m.type === 'progress');
    all.forEach((m) => expect(m.id).toBe(7));
    // Before the loop: the check whether the table's lines pin the band down (a search, no round yet).
    expect(all[0]).toMatchObject({ round: 0, stage: 'checking whether the lines given pin the band down', rowsSoFar: 0 });
    const progress = all.filter((m) => m.type === 'progress' && m.round > 0);
    expect(progress.length).toBeGreaterThan(1);
    expect(all.length).toBe(progress.length + 1);
    progress.forEach((m, i) => {
      if (m.type === 'progress') {
        expect(m.round).toBe(i + 1);
        expect(m.stage).toMatch(/^round \d+: \d+ proposed, \d+ excluded$/);
      }
    });
    const counts = progress.map((m) => (m.type === 'progress' ? m.rowsSoFar : 0));
    for (let i = 1; i < counts.length; i++) expect(counts[i]).toBeGreaterThanOrEqual(counts[i - 1]);
    const last = out[out.length - 1];
    expect(last.type).toBe('result');
    if (last.type === 'result' && last.output.kind === 'run') expect(last.output.proposals.length).toBe(counts[counts.length - 1]);
  });

  it('an empty peak list is refused in words', () => {
    const empty: PeakList = { ...peaks, count: 0 };
    const out = handle({
      type: 'job',
      id: 1,
      job: { kind: 'run', model: assistantBandGuess(), floatable: FLOATED, peaks: empty, assignments: [], rejected: [] },
    });
    expect(out).toHaveLength(1);
    expect(out[0]).toMatchObject({ type: 'error', id: 1 });
    if (out[0].type === 'error') expect(out[0].message).toMatch(/there are no peaks to work with/);
  });

  it('the hunt on an empty table is refused in words', () => {
    const out = handle({
      type: 'job',
      id: 2,
      job: { kind: 'hunt', model: assistantBandGuess(), floatable: FLOATED, peaks, assignments: [] },
    });
    expect(out[0]).toMatchObject({ type: 'error', id: 2, message: 'the table has no lines of this band to check' });
  });

  it('table rows the band does not allow are left out with a note, not a crash', () => {
    const rows = [...seedRows(6), { ...seedRows(1)[0], id: 'bad', kUpper: 3, kLower: 0 }];
    const out = handle({
      type: 'job',
      id: 3,
      job: { kind: 'run', model: assistantBandGuess(), floatable: FLOATED, peaks, assignments: rows, rejected: [] },
    });
    const last = out[out.length - 1];
    expect(last.type).toBe('result');
    if (last.type === 'result' && last.output.kind === 'run')
      expect(last.output.warnings.join('\n')).toMatch(/1 row\(s\) of the table are not lines of this band/);
  });
});
