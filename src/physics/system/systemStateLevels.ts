import type { TopShape } from '../model';
import type { LevelProvider } from './levelTypes';
import type { SystemState } from './systemModel';
import { termLevelProvider } from './termLevels';

/**
 * The level provider of a state: today always the closed-form term values (termLevels.ts).
 * WARNING: the provider reuses its output buffers; ask for a new one per concurrent use.
 * @param shape the species' rotor shape
 * @param state the state (its degeneracy chooses the level pattern)
 */
export function systemStateProvider(shape: TopShape, state: Pick<SystemState, 'isDegenerate'>): LevelProvider {
  return termLevelProvider(shape, state.isDegenerate);
}

/** The state's constants in the provider's parameterNames order (absent constants 0). */
export function systemStateValues(provider: LevelProvider, state: Pick<SystemState, 'constants'>): Float64Array {
  return Float64Array.from(provider.parameterNames, (n) => state.constants[n] ?? 0);
}
