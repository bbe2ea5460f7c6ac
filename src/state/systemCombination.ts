/**
 * Combination differences in a several-band session: one state of the active band (its lower or
 * upper state), differenced from every band of the same species that reaches that state
 * (fit/systemCombinationDifferences), each pair naming its band.
 */
import type { SystemFitLine } from '../fit/systemFitTypes';
import { systemCombinationDifferences, type SystemCombDiffOutcome } from '../fit/systemCombinationDifferences';
import { systemLineResolve } from '../fit/systemLineResolve';
import type { BenchState } from './store';
import { assignmentResolveQuery } from './systemFitInput';
import { systemEntriesOf } from './systemSync';
import { systemParameters } from './systemBands';

/** What the combination-differences panel shows in a several-band session. */
export interface SystemCombination {
  species: string;
  /** The state differenced (the active band's lower or upper state). */
  state: string;
  /** Bands of the species that reach the state (with lines or not). */
  bands: string[];
  outcome: SystemCombDiffOutcome;
  /** Assignment id of each line index the outcome's pairs refer to. */
  assignmentIds: string[];
  /** Rows of the species' bands left out because they name no single line of their band. */
  skipped: number;
}

/**
 * The combination differences of the active band's lower or upper state from every band of its
 * species that shares that state, or null in a single-band session (or without an active band).
 * Rows of other species never enter; a row that names no single line is left out and counted.
 * @param side which state of the active band
 */
export function systemCombinationOf(
  s: Pick<BenchState, 'system' | 'systemFloated' | 'systemTies' | 'assignments' | 'activeBandKey'>,
  side: 'lower' | 'upper',
): SystemCombination | null {
  const system = s.system;
  if (!system) return null;
  const entries = systemEntriesOf(system);
  const active = entries.find((e) => e.key === s.activeBandKey);
  if (!active) return null;
  const state = side === 'lower' ? active.lower : active.upper;
  const byKey = new Map(entries.filter((e) => e.speciesIndex === active.speciesIndex).map((e) => [e.key, e]));
  const lines: SystemFitLine[] = [];
  const assignmentIds: string[] = [];
  let skipped = 0;
  for (const a of s.assignments) {
    const key = a.band !== undefined && a.species !== undefined ? `${a.species}/${a.band}` : s.activeBandKey;
    const e = key ? byKey.get(key) : undefined;
    if (!e || (e.upper !== state && e.lower !== state)) continue;
    const r = systemLineResolve(system, assignmentResolveQuery(a, e, false));
    if (!r.ok) {
      skipped++;
      continue;
    }
    lines.push({ ...r.line, observedCm1: a.observedCm1, uncertaintyCm1: a.uncertaintyCm1, isExcluded: a.isExcluded });
    assignmentIds.push(a.id);
  }
  const parameters = systemParameters(system, s.systemFloated, s.systemTies);
  return {
    species: active.species,
    state,
    bands: [...byKey.values()].filter((e) => e.upper === state || e.lower === state).map((e) => e.band),
    outcome: systemCombinationDifferences(system, parameters, lines, active.speciesIndex, state),
    assignmentIds,
    skipped,
  };
}
