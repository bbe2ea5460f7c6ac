import { beforeEach, describe, expect, it } from 'vitest';
import { modelFileSerialize } from '../../src/io/modelFile';
import { candidateAssign, peakClick } from '../../src/state/actionsAssign';
import { redo, undo } from '../../src/state/actionsCore';
import { importSetParser, traceOpenAsking, traceReplace } from '../../src/state/actionsImport';
import { modelLoadText, modelSetSimulation } from '../../src/state/actionsModel';
import { confirmAnswer, confirmAsk, sessionNew } from '../../src/state/actionsSession';
import { benchStore } from '../../src/state/store';
import { importTrace } from '../../src/io/traceImport';
import { smallModel, smallTrace } from './fixtures';

beforeEach(() => {
  benchStore.setState(benchStore.getInitialState(), true);
});

function withAssignments(n: number): void {
  const model = smallModel();
  benchStore.setState({ model, modelName: 'band one' });
  traceReplace(smallTrace(model).trace, null, 'file');
  for (let i = 0; i < n; i++) {
    peakClick(2 + 3 * i);
    candidateAssign(0);
  }
}

/** Wait until the page asks its question (the prompt is in the store). */
async function asked(): Promise<string> {
  for (let i = 0; i < 50 && !benchStore.getState().confirm; i++) await new Promise((r) => setTimeout(r, 0));
  return benchStore.getState().confirm?.title ?? '';
}

describe('confirmAsk', () => {
  it('resolves with the answer chosen, and a newer question cancels an unanswered one', async () => {
    const first = confirmAsk({ title: 'one?', text: '', choices: [{ id: 'yes', label: 'Yes' }] });
    const second = confirmAsk({ title: 'two?', text: '', choices: [{ id: 'yes', label: 'Yes' }] });
    expect(await first).toBeNull();
    expect(benchStore.getState().confirm?.title).toBe('two?');
    confirmAnswer('yes');
    expect(await second).toBe('yes');
    expect(benchStore.getState().confirm).toBeNull();
  });
});

describe('sessionNew', () => {
  it('asks when there is work, clears trace, assignments and fit, and undo brings all of it back', async () => {
    withAssignments(2);
    const before = benchStore.getState();
    expect(before.assignments.length).toBe(2);
    const done = sessionNew();
    expect(await asked()).toBe('Start a new session?');
    confirmAnswer('new');
    expect(await done).toBe(true);
    const s = benchStore.getState();
    expect([s.trace, s.assignments.length, s.fitOutcome, s.modelName]).toEqual([null, 0, null, benchStore.getInitialState().modelName]);
    expect(s.model).toEqual(benchStore.getInitialState().model);
    expect(undo()).toBe('new session');
    const back = benchStore.getState();
    expect([back.trace, back.assignments, back.modelName]).toEqual([before.trace, before.assignments, 'band one']);
    expect(redo()).toBe('new session');
    expect(benchStore.getState().assignments).toEqual([]);
  });

  it('changes nothing when the question is cancelled', async () => {
    withAssignments(1);
    const before = benchStore.getState();
    const done = sessionNew();
    await asked();
    confirmAnswer(null);
    expect(await done).toBe(false);
    expect(benchStore.getState().assignments).toBe(before.assignments);
  });
});

describe('loading another trace while assignments exist', () => {
  const csv = 'wavenumber,absorbance\n1000,0.1\n1000.001,0.2\n1000.002,0.1\n1000.003,0.05\n1000.004,0.02\n1000.005,0.01\n';
  beforeEach(() => importSetParser(async (file, fileName, options) => importTrace(file as string, fileName, options)));

  it('keeps the assignments when asked to, and says so', async () => {
    withAssignments(2);
    const done = traceOpenAsking(csv, 'next.csv');
    expect(await asked()).toBe('Load the trace next.csv?');
    confirmAnswer('keep');
    expect(await done).toBe(true);
    expect(benchStore.getState().assignments.length).toBe(2);
    expect(benchStore.getState().messages.at(-1)!.text).toMatch(/^The 2 assignments of the previous trace were kept/);
  });

  it('clears them (one undo step) when asked to, and loads nothing when cancelled', async () => {
    withAssignments(2);
    const cancelled = traceOpenAsking(csv, 'next.csv');
    await asked();
    confirmAnswer(null);
    expect(await cancelled).toBe(false);
    expect(benchStore.getState().traceReport).toBeNull();
    const done = traceOpenAsking(csv, 'next.csv');
    await asked();
    confirmAnswer('clear');
    expect(await done).toBe(true);
    expect(benchStore.getState().assignments).toEqual([]);
    expect(benchStore.getState().traceReport?.fileName).toBe('next.csv');
    expect(undo()).toBe('clear 2 assignments');
    expect(benchStore.getState().assignments.length).toBe(2);
  });
});

describe('model files and the mass', () => {
  const file = (name: string, mass?: number) =>
    modelFileSerialize({ model: smallModel(), floated: ['upper.origin'], name, ...(mass !== undefined ? { massAmu: mass } : {}) });

  it('undoing a model load puts back the previous name and mass', () => {
    expect(modelLoadText(file('first', 64), 'a.json')).toBe(true);
    expect(modelLoadText(file('second'), 'b.json')).toBe(true);
    expect(benchStore.getState().modelName).toBe('second');
    undo();
    expect([benchStore.getState().modelName, benchStore.getState().massAmu]).toEqual(['first', 64]);
  });

  it('does not carry a mass from a previous file into a file without one; keeps a mass the user typed', () => {
    modelLoadText(file('first', 64), 'a.json');
    modelLoadText(file('second'), 'b.json');
    expect(benchStore.getState().massSource).toBe('default');
    expect(benchStore.getState().massAmu).toBe(benchStore.getInitialState().massAmu);
    modelSetSimulation('massAmu', 80);
    modelLoadText(file('third'), 'c.json');
    expect([benchStore.getState().massAmu, benchStore.getState().massSource]).toEqual([80, 'user']);
  });
});
