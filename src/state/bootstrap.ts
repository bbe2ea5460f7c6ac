/**
 * Start-up: restore the autosaved session when there is one, else load a demo (the several-band
 * one unless the address asks for the single-band one); then autosave.
 */
import { messagePost } from './actionsCore';
import { demoSystemFetch, demoSystemLoad, type DemoKind } from './actionsDemoSystem';
import { demoFetch, demoLoad } from './actionsImport';
import { peaksWorkerStart } from './actionsPeaks';
import { persistRestore, persistStart } from './persist';
import { benchStore } from './store';

/**
 * Bring the page to life (called once from main.tsx).
 * @param demoKind the demo shown when there is no autosaved session
 */
export async function bootstrap(demoKind: DemoKind = 'bands'): Promise<void> {
  // Peaks are found off the main thread, so the trace is drawn as soon as it is parsed.
  peaksWorkerStart();
  // Fetched while the autosaved session is looked up (dropped when one is restored).
  const demo = demoKind === 'single' ? demoFetch() : null;
  const demoBands = demoKind === 'bands' ? demoSystemFetch() : null;
  let restored = false;
  try {
    restored = await persistRestore();
  } catch (err) {
    messagePost('warning', `The autosaved session could not be read (${(err as Error).message}).`);
  }
  if (restored) {
    const s = benchStore.getState();
    messagePost(
      'info',
      `Restored your last session (${s.assignments.length} assignments). Changes are saved automatically in this browser.`,
    );
  } else {
    // The single-band demo is the fallback: it has a built-in model and a simulated trace.
    if (!demoBands || !(await demoSystemLoad(demoBands))) await demoLoad(demo ?? undefined);
    // The demo is the starting point, not something to undo back out of.
    benchStore.setState({ past: [], future: [] });
  }
  persistStart();
}
