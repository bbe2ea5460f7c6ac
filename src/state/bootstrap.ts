/**
 * Start-up: restore the autosaved session when there is one, else load the demo; then autosave.
 */
import { messagePost } from './actionsCore';
import { demoFetch, demoLoad } from './actionsImport';
import { peaksWorkerStart } from './actionsPeaks';
import { persistRestore, persistStart } from './persist';
import { benchStore } from './store';

/** Bring the page to life (called once from main.tsx). */
export async function bootstrap(): Promise<void> {
  // Peaks are found off the main thread, so the trace is drawn as soon as it is parsed.
  peaksWorkerStart();
  // Fetched while the autosaved session is looked up (dropped when one is restored).
  const demo = demoFetch();
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
    await demoLoad(demo);
    // The demo is the starting point, not something to undo back out of.
    benchStore.setState({ past: [], future: [] });
  }
  persistStart();
}
