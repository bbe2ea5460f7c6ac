/**
 * The band model: molecule shape, band type and the constants of both vibrational states.
 * Every energy-like number is in cm^-1; temperatures are in K.
 *
 * Naming follows the model file of the headless contract, so a fit parameter key is simply
 * `lower.<name>` or `upper.<name>`.
 */

/** Shape of the rotor: prolate (unique constant A) or oblate (unique constant C) symmetric top, or linear. */
export type TopShape = 'prolate' | 'oblate' | 'linear';

/** Band type: parallel (ΔK = 0, Σ–Σ for a linear molecule) or perpendicular (ΔK = ±1, Π–Σ for linear). */
export type BandType = 'parallel' | 'perpendicular';

/** Every constant a state may carry, by model-file name. */
export const PARAMETER_NAMES = ['origin', 'B', 'A', 'C', 'DJ', 'DJK', 'DK', 'HJ', 'HJK', 'HKJ', 'HK', 'zeta', 'q'] as const;

/** A constant's model-file name. */
export type ParameterName = (typeof PARAMETER_NAMES)[number];

/**
 * Constants of one vibrational state, all in cm^-1 except the dimensionless Coriolis ζ.
 * An absent constant is 0. `A` is used for prolate tops and `C` for oblate tops; `origin`,
 * `zeta` and `q` (l-type doubling of a linear Π state) belong to the upper state only.
 */
export type StateConstants = Record<ParameterName, number>;

/** The full band model (plain data, serialisable). */
export interface BandModel {
  shape: TopShape;
  band: BandType;
  lower: StateConstants;
  upper: StateConstants;
  /** Rotational temperature, K. */
  temperatureK: number;
  /** Largest lower-state J'' enumerated. */
  jMax: number;
  /** Largest lower-state K'' enumerated (0 is used for a linear molecule). */
  kMax: number;
  /** Nuclear-spin statistical weights: g(K'') = spinWeights[K'' mod spinWeights.length]. */
  spinWeights: number[];
}

/** A state with every constant 0. */
export function stateConstantsZero(): StateConstants {
  const s = {} as StateConstants;
  for (const name of PARAMETER_NAMES) s[name] = 0;
  return s;
}

/** Fill absent constants with 0. */
export function stateConstantsFrom(partial: Partial<StateConstants>): StateConstants {
  return { ...stateConstantsZero(), ...partial };
}

/**
 * The unique-axis rotational constant of a state: A for a prolate top, C for an oblate top,
 * 0 for a linear molecule (cm^-1).
 */
export function stateUniqueConstant(state: StateConstants, shape: TopShape): number {
  if (shape === 'prolate') return state.A;
  if (shape === 'oblate') return state.C;
  return 0;
}

/** Model-file name of the unique-axis constant for a shape ('A', 'C', or null for linear). */
export function shapeUniqueName(shape: TopShape): 'A' | 'C' | null {
  return shape === 'prolate' ? 'A' : shape === 'oblate' ? 'C' : null;
}

/**
 * Columnar list of transitions (one entry per distinct line), so the buffers can be transferred
 * to a worker without copying. Entry i is the line J''(K'') → J'(K').
 */
export interface LineList {
  count: number;
  /** J' of the upper level. */
  jUpper: Int32Array;
  /** K' of the upper level (unsigned; for a linear Π state this is |l| = 1). */
  kUpper: Int32Array;
  /** J'' of the lower level. */
  jLower: Int32Array;
  /** K'' of the lower level (unsigned). */
  kLower: Int32Array;
  /** K' − K'': −1, 0 or +1. */
  deltaK: Int8Array;
  /** J' − J'': −1 (P), 0 (Q) or +1 (R). */
  deltaJ: Int8Array;
  /** Line position, cm^-1. */
  wavenumberCm1: Float64Array;
  /** Relative intensity, strongest line of the band = 1. */
  intensity: Float64Array;
  /** Lower-state term value F''(J'', K''), cm^-1. */
  eLowerCm1: Float64Array;
  /** Hönl–London factor of the line (dimensionless). */
  honlLondon: Float64Array;
}

/** Quantum numbers of one transition, as assignments and line tables carry them. */
export interface TransitionQuanta {
  jUpper: number;
  kUpper: number;
  jLower: number;
  kLower: number;
}
