/**
 * The two demos: the several-band one (public/demo/system.json and system-trace.csv, made by
 * src/cli/makeDemo.ts: two isotopologues of the invented LB-7 and a hot band), which the page
 * starts on, and the single-band one (demo/model.json, demo/trace.csv), both reachable from the
 * model panel.
 */
import { benchUpdate, messagePost } from './actionsCore';
import { demoLoad, traceImport } from './actionsImport';
import { modelLoadText } from './actionsModel';
import { confirmAsk } from './actionsSession';
import { benchStore } from './store';

/** Which demo the page starts on (`?demo=single` on the address picks the single-band one). */
export type DemoKind = 'bands' | 'single';

/** The several-band demo files being fetched (null when one could not be fetched, with the reason). */
export interface DemoSystemFetch {
  files: Promise<{ modelText: string; trace: Blob } | { error: string }>;
}

/** Start fetching the several-band demo's model and trace at once. */
export function demoSystemFetch(): DemoSystemFetch {
  const base = import.meta.env?.BASE_URL ?? '/';
  const get = async (path: string) => {
    const r = await fetch(`${base}${path}`);
    if (!r.ok) throw new Error(`${path}: ${r.status} ${r.statusText}`);
    return r;
  };
  return {
    files: Promise.all([get('demo/system.json').then((r) => r.text()), get('demo/system-trace.csv').then((r) => r.blob())]).then(
      ([modelText, trace]) => ({ modelText, trace }),
      (err: unknown) => ({ error: (err as Error).message }),
    ),
  };
}

/**
 * Load the several-band demo without asking (start-up, or after the user agreed).
 * @param fetched files already being fetched, else fetched here
 * @returns true when its model and trace were loaded; on failure a message says why and nothing changed
 */
export async function demoSystemLoad(fetched: DemoSystemFetch = demoSystemFetch()): Promise<boolean> {
  const files = await fetched.files;
  if ('error' in files) {
    messagePost('error', `The two-isotopologue demo could not be fetched (${files.error}); nothing was changed.`);
    return false;
  }
  if (!modelLoadText(files.modelText, 'demo/system.json')) return false;
  const ok = await traceImport(files.trace, 'demo/system-trace.csv', {}, 'demo');
  const kMax = benchStore.getState().model.kMax;
  const hidden: string[] = [];
  // Three bands of many K″ rows each: start with the lowest rows (all can be shown from the ladder list).
  for (let k = 5; k <= kMax; k++) hidden.push(`r:${k}`, `p:${k}`, `q:${k}`);
  benchUpdate('ladder rows', () => ({ hiddenRows: hidden, xRange: [1125, 1165] }), { history: false });
  return ok;
}

/**
 * Before a demo replaces the session: ask when there are assignments, and clear them (one undo
 * step) when the user agrees.
 * @returns false when the user declined
 */
async function demoClearAsking(title: string): Promise<boolean> {
  const n = benchStore.getState().assignments.length;
  if (n === 0) return true;
  const choice = await confirmAsk({
    title,
    text: `Its model and trace replace the current ones, and the ${n} assignment${n === 1 ? '' : 's'} and the fit are cleared. Undo (Ctrl+Z) brings them back.`,
    choices: [{ id: 'open', label: 'Open the demo' }],
  });
  if (choice !== 'open') return false;
  benchUpdate(
    `clear ${n} assignments`,
    () => ({ assignments: [], selectedAssignmentId: null, cursor: null, fitOutcome: null, fitLineIds: [], fitFinishedAt: null }),
    { history: true, extraKeys: ['fitOutcome', 'fitLineIds', 'fitFinishedAt'] },
  );
  return true;
}

/**
 * Replace the session's model and trace with the several-band demo (asks first when there are
 * assignments; they are cleared with the fit, and Undo brings them back).
 * @returns true when the demo was opened
 */
export async function demoSystemOpen(): Promise<boolean> {
  if (!(await demoClearAsking('Open the two-isotopologue demo?'))) return false;
  return demoSystemLoad();
}

/**
 * Replace the session's model and trace with the single-band demo (LB-7 ν4 alone; asks first
 * when there are assignments, as demoSystemOpen does).
 * @returns true when the demo was opened
 */
export async function demoSingleOpen(): Promise<boolean> {
  if (!(await demoClearAsking('Open the single-band demo?'))) return false;
  await demoLoad();
  messagePost('info', 'Single-band demo loaded (LB-7 ν4).');
  return true;
}
