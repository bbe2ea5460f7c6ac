import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { fitStart } from '../../src/state/actionsFit';
import { importSetParser, traceImport } from '../../src/state/actionsImport';
import { benchReset, benchStore } from '../../src/state/store';
import { parseTraceInWorker } from '../../src/workers/parseClient';

// A worker that dies (an uncaught error inside it, or the browser killing it) rejects the client's
// promise. The session must survive that: the trace, the assignments and the model stay as they
// were, and the page says what happened.
describe('a crashed worker leaves the session intact', () => {
  const trace = { wavenumberCm1: Float64Array.from([1000, 1000.5, 1001]), absorbance: Float64Array.from([0.1, 0.5, 0.1]) };
  const assignment = {
    id: 'a1',
    jUpper: 3,
    kUpper: 1,
    jLower: 2,
    kLower: 0,
    observedCm1: 1000.5,
    uncertaintyCm1: 0.001,
    isBlended: false,
    isExcluded: false,
    note: 'mine',
  };

  beforeEach(() => {
    benchReset();
    benchStore.setState({ trace, assignments: [assignment] });
  });
  afterEach(() => importSetParser(parseTraceInWorker));

  it('keeps trace and assignments when the parse worker crashes', async () => {
    importSetParser(async () => {
      throw new Error('parse worker: the worker stopped unexpectedly');
    });
    expect(await traceImport('1,2\n3,4\n', 'next.csv')).toBe(false);
    const s = benchStore.getState();
    expect(s.trace).toBe(trace);
    expect(s.assignments).toEqual([assignment]);
    expect(s.traceImport).toBeNull();
    expect(s.messages.map((m) => m.text).join('\n')).toMatch(/Could not read next\.csv: .*unchanged/);
  });

  it('keeps assignments and model when the solver worker crashes, and ends the running state', async () => {
    const model = benchStore.getState().model;
    await fitStart(async () => {
      throw new Error('solver worker: the worker stopped unexpectedly');
    });
    const s = benchStore.getState();
    expect(s.isFitRunning).toBe(false);
    expect(s.assignments).toEqual([assignment]);
    expect(s.model).toBe(model);
    expect(s.messages.map((m) => m.text).join('\n')).toMatch(/The fit could not run: solver worker/);
  });
});
