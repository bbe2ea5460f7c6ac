import { SECOND_RADIATION_CM_K } from './constants';
import type { StateConstants, TopShape } from './model';
import { levelEnergy } from './termValues';

/** Options of partitionFunction. */
export interface PartitionFunctionOptions {
  /** Nuclear-spin weights by K mod n. @default [1] */
  spinWeights?: number[];
  /** Stop when a whole J shell adds less than this fraction of the sum. @default 1e-12 */
  tolerance?: number;
  /** Hard limit on J. @default 2000 */
  jLimit?: number;
}

/**
 * Rotational partition function of a symmetric-top or linear state by direct summation,
 * dimensionless:  Q = Σ_J Σ_K g(K) (2J+1) n_K exp(−c2 F(J,K)/T),  n_0 = 1, n_K>0 = 2.
 * For a linear molecule only K = 0 enters. Summation runs in J until a shell adds less than the
 * tolerance (it is not cut at the model's jMax). Levels whose energy turns over (distortion
 * constants dominating at very high J) end the sum.
 * Source: Herzberg II (1945) ch. V, eq. (V,14) (symmetric-top rotational partition function).
 * @param state constants in cm^-1
 * @param temperatureK temperature in K
 */
export function partitionFunction(
  state: StateConstants,
  shape: TopShape,
  temperatureK: number,
  options: PartitionFunctionOptions = {},
): number {
  if (!(temperatureK > 0)) throw new Error(`partitionFunction: temperatureK must be > 0, got ${temperatureK}`);
  const weights = options.spinWeights ?? [1];
  const tol = options.tolerance ?? 1e-12;
  const jLimit = options.jLimit ?? 2000;
  const c2OverT = SECOND_RADIATION_CM_K / temperatureK;
  let q = 0;
  let previousShellEnergy = -Infinity;
  for (let J = 0; J <= jLimit; J++) {
    let shell = 0;
    const kTop = shape === 'linear' ? 0 : J;
    for (let K = 0; K <= kTop; K++) {
      const e = levelEnergy(state, shape, J, K);
      shell += weights[K % weights.length] * (K === 0 ? 1 : 2) * Math.exp(-c2OverT * e);
    }
    shell *= 2 * J + 1;
    const e0 = levelEnergy(state, shape, J, 0);
    if (e0 < previousShellEnergy) break;
    previousShellEnergy = e0;
    q += shell;
    if (J > 10 && shell < tol * q) break;
  }
  return q;
}
