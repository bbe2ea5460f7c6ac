import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { projectFileParse } from '../../src/io/projectFile';
import { candidateAssign, peakClick } from '../../src/state/actionsAssign';
import { droppedKind, traceReplace } from '../../src/state/actionsImport';
import {
  projectExportText,
  projectExportTextAsync,
  projectImport,
  projectImportText,
  projectReadHere,
  projectSetIo,
} from '../../src/state/actionsProject';
import { redo, undo } from '../../src/state/actionsCore';
import { sessionOf, stateFromSession } from '../../src/state/session';
import { benchStore } from '../../src/state/store';
import { smallModel, smallTrace } from './fixtures';

beforeEach(() => {
  benchStore.setState(benchStore.getInitialState(), true);
});

describe('project export and import through the store', () => {
  it('imports back to exactly the same session', () => {
    const model = smallModel();
    benchStore.setState({ model, minIntensity: 0.02, theme: 'dark', xRange: [1000, 1002] });
    traceReplace(smallTrace(model).trace, null, 'file');
    benchStore.setState({ xRange: [1000, 1002] });
    peakClick(2);
    candidateAssign(0);
    peakClick(5);
    candidateAssign(1);
    const before = sessionOf(benchStore.getState());
    const text = projectExportText('0.1.0', '2024-01-01T00:00:00Z');
    benchStore.setState(benchStore.getInitialState(), true);
    expect(projectImportText(text, 'p.json')).toBe(true);
    const after = sessionOf(benchStore.getState());
    const { trace: t1, ...r1 } = after;
    const { trace: t0, ...r0 } = before;
    expect(r1).toEqual(r0);
    expect(Array.from(t1!.absorbance)).toEqual(Array.from(t0!.absorbance));
    // Opening is one undo step.
    expect(benchStore.getState().past.map((p) => p.label)).toEqual(['open project p.json']);
  });

  it('undoes a project open back to the whole previous session, trace and names included, and redoes it', () => {
    const model = smallModel();
    benchStore.setState({ model, theme: 'dark', modelName: 'first band' });
    traceReplace(smallTrace(model).trace, null, 'file');
    peakClick(2);
    candidateAssign(0);
    const text = projectExportText('0.1.0', '2024-01-01T00:00:00Z');
    const other = JSON.parse(text);
    other.session.modelName = 'second band';
    other.session.assignments = [];
    other.session.trace = null;
    const before = benchStore.getState();
    expect(projectImportText(JSON.stringify(other), 'q.json')).toBe(true);
    expect(benchStore.getState().assignments).toEqual([]);
    expect(benchStore.getState().trace).toBeNull();
    expect(undo()).toBe('open project q.json');
    const back = benchStore.getState();
    expect([back.modelName, back.trace, back.assignments, back.model]).toEqual([
      before.modelName,
      before.trace,
      before.assignments,
      before.model,
    ]);
    // The undo steps of the first session are still there behind it.
    expect(back.past.length).toBe(before.past.length);
    expect(redo()).toBe('open project q.json');
    expect(benchStore.getState().modelName).toBe('second band');
  });

  it('keeps the current session when the file cannot be read', () => {
    const model = smallModel();
    benchStore.setState({ model });
    const s = benchStore.getState();
    expect(projectImportText('{"format":"ladder-bench-project","version":99}', 'new.json')).toBe(false);
    expect(benchStore.getState().model).toBe(s.model);
    expect(benchStore.getState().messages.at(-1)!.text).toMatch(/newer Ladder Bench/);
  });

  it('fills fields a file leaves out with the initial values', () => {
    const doc = JSON.parse(projectExportText('0.1.0'));
    delete doc.session.view;
    const r = projectFileParse(JSON.stringify(doc));
    if (!r.ok) throw new Error(r.message);
    const fields = stateFromSession(r.session);
    expect(fields.theme).toBe(benchStore.getInitialState().theme);
    expect(fields.tableQuery).toEqual(benchStore.getInitialState().tableQuery);
  });
});

describe('project open off the page thread (projectImport)', () => {
  afterEach(() => projectSetIo(null));

  function worked(): string {
    const model = smallModel();
    benchStore.setState({ model, theme: 'dark' });
    traceReplace(smallTrace(model).trace, null, 'file');
    peakClick(2);
    candidateAssign(0);
    return projectExportText('0.1.0', '2024-01-01T00:00:00Z');
  }

  it('reads a file here when there is no Worker, to the same session as projectImportText', async () => {
    const text = worked();
    benchStore.setState(benchStore.getInitialState(), true);
    projectImportText(text, 'p.json');
    const sync = sessionOf(benchStore.getState());
    benchStore.setState(benchStore.getInitialState(), true);
    expect(await projectImport(new Blob([text]), 'p.json')).toBe(true);
    const { trace: t1, ...r1 } = sessionOf(benchStore.getState());
    const { trace: t0, ...r0 } = sync;
    expect(r1).toEqual(r0);
    expect(Array.from(t1!.wavenumberCm1)).toEqual(Array.from(t0!.wavenumberCm1));
    expect(await projectExportTextAsync('0.1.0', '2024-01-01T00:00:00Z')).toBe(projectExportText('0.1.0', '2024-01-01T00:00:00Z'));
  });

  it('keeps the session and says why when the reader fails (a crashed worker)', async () => {
    worked();
    const before = benchStore.getState();
    projectSetIo(async () => {
      throw new Error('parse worker failed for p.json: out of memory');
    });
    expect(await projectImport('{}', 'p.json')).toBe(false);
    const s = benchStore.getState();
    expect([s.model, s.trace, s.assignments]).toEqual([before.model, before.trace, before.assignments]);
    expect(s.messages.at(-1)!.text).toBe(
      'Could not open p.json: parse worker failed for p.json: out of memory. The current session is unchanged.',
    );
  });

  it('applies only the project opened last when an earlier one is read more slowly', async () => {
    const text = worked();
    const other = JSON.parse(text);
    other.session.modelName = 'second';
    let releaseFirst: () => void = () => undefined;
    projectSetIo(async (file, name, parts) => {
      if (name === 'first.json') await new Promise<void>((r) => (releaseFirst = r));
      return projectReadHere(file, name, parts);
    });
    const first = projectImport(text, 'first.json');
    expect(await projectImport(JSON.stringify(other), 'second.json')).toBe(true);
    releaseFirst();
    expect(await first).toBe(false);
    expect(benchStore.getState().modelName).toBe('second');
  });
});

describe('droppedKind', () => {
  it('tells project, model, line table and trace apart by content', () => {
    expect(droppedKind('{"format": "ladder-bench-project", "version": 2}', 'x.txt')).toBe('project');
    expect(droppedKind('\uFEFF  {"shape":"prolate"}', 'x.dat')).toBe('model');
    expect(droppedKind('J_up,K_up,J_lo,K_lo,wavenumber\n1,0,0,0,1000', 'a.csv')).toBe('line-table');
    expect(droppedKind('wavenumber_cm-1,transmittance\n1000,0.9', 'a.csv')).toBe('trace');
    expect(droppedKind('##TITLE=x', 'a.jdx')).toBe('trace');
  });
});
