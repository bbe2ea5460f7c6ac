/**
 * Open the several-band demo (public/demo/system.json and system-trace.csv, made by
 * src/cli/makeDemo.ts): two isotopologues of the invented LB-7 and a hot band.
 */
import { benchUpdate, messagePost } from './actionsCore';
import { traceImport } from './actionsImport';
import { modelLoadText } from './actionsModel';
import { confirmAsk } from './actionsSession';
import { benchStore } from './store';

/**
 * Replace the session's model and trace with the several-band demo (asks first when there are
 * assignments; they are cleared with the fit, and Undo brings them back).
 * @returns true when the demo was opened
 */
export async function demoSystemOpen(): Promise<boolean> {
  const n = benchStore.getState().assignments.length;
  if (n > 0) {
    const choice = await confirmAsk({
      title: 'Open the two-isotopologue demo?',
      text: `Its model and trace replace the current ones, and the ${n} assignment${n === 1 ? '' : 's'} and the fit are cleared. Undo (Ctrl+Z) brings them back.`,
      choices: [{ id: 'open', label: 'Open the demo' }],
    });
    if (choice !== 'open') return false;
    benchUpdate(
      `clear ${n} assignments`,
      () => ({ assignments: [], selectedAssignmentId: null, cursor: null, fitOutcome: null, fitLineIds: [], fitFinishedAt: null }),
      { history: true, extraKeys: ['fitOutcome', 'fitLineIds', 'fitFinishedAt'] },
    );
  }
  const base = import.meta.env?.BASE_URL ?? '/';
  const get = async (path: string) => {
    const r = await fetch(`${base}${path}`);
    if (!r.ok) throw new Error(`${path}: ${r.status} ${r.statusText}`);
    return r;
  };
  let modelText: string;
  let trace: Blob;
  try {
    [modelText, trace] = await Promise.all([
      get('demo/system.json').then((r) => r.text()),
      get('demo/system-trace.csv').then((r) => r.blob()),
    ]);
  } catch (err) {
    messagePost('error', `The two-isotopologue demo could not be fetched (${(err as Error).message}); nothing was changed.`);
    return false;
  }
  if (!modelLoadText(modelText, 'demo/system.json')) return false;
  const ok = await traceImport(trace, 'demo/system-trace.csv', {}, 'demo');
  const kMax = benchStore.getState().model.kMax;
  const hidden: string[] = [];
  // Three bands of many K″ rows each: start with the lowest rows (all can be shown from the ladder list).
  for (let k = 5; k <= kMax; k++) hidden.push(`r:${k}`, `p:${k}`, `q:${k}`);
  benchUpdate('ladder rows', () => ({ hiddenRows: hidden, xRange: [1125, 1165] }), { history: false });
  return ok;
}
