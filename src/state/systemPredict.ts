/**
 * Every line of every band of the session's system, on one intensity scale (memoised on the
 * system and the intensity cut); shared by the drawn-bands selectors and the simulated sum.
 */
import { systemLines, type SystemLineList } from '../physics/system/systemLines';
import type { SystemModel } from '../physics/system/systemModel';
import { memoLast } from './memo';
import type { SystemBandEntry } from './systemBands';
import type { BenchState } from './store';
import { systemEntriesOf } from './systemSync';

/** Every line of the system and its bands. */
export interface SystemPrediction {
  all: SystemLineList | null;
  entries: SystemBandEntry[];
  /** Why no lines could be computed, else null. */
  error: string | null;
}

const systemPrediction = memoLast((system: SystemModel, minIntensity: number): SystemPrediction => {
  const entries = systemEntriesOf(system);
  try {
    return { all: systemLines(system, { minIntensity }), entries, error: null };
  } catch (err) {
    return { all: null, entries, error: (err as Error).message };
  }
});

/** The system's lines (null in a single-band session). */
export function selectSystemPrediction(s: BenchState): SystemPrediction | null {
  return s.system ? systemPrediction(s.system, s.minIntensity) : null;
}
