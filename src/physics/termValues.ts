import { stateUniqueConstant, type BandModel, type StateConstants, type TopShape } from './model';

/**
 * Rotational term value F(J, K) of a symmetric-top (or linear) state, cm^-1, relative to J = K = 0.
 *
 *   F = B J(J+1) + (A−B) K² − DJ J²(J+1)² − DJK J(J+1) K² − DK K⁴
 *       + HJ J³(J+1)³ + HJK J²(J+1)² K² + HKJ J(J+1) K⁴ + HK K⁶
 *
 * with A replaced by C for an oblate top. For a linear molecule the unique constant is 0, so a Π
 * state (K = |l| = 1) gets B[J(J+1) − 1], the usual linear-molecule form.
 * Source: G. Herzberg, Molecular Spectra and Molecular Structure II (1945), ch. I, eqs. (I,31)–(I,33);
 * sign conventions as in the project's headless contract.
 * @param state constants in cm^-1
 * @param shape rotor shape (selects A, C or none)
 * @param J rotational quantum number J >= 0
 * @param K projection quantum number 0 <= K <= J (unsigned)
 * @returns F(J, K) in cm^-1
 */
export function levelEnergy(state: StateConstants, shape: TopShape, J: number, K: number): number {
  const x = J * (J + 1);
  const k2 = K * K;
  const unique = stateUniqueConstant(state, shape);
  return (
    state.B * x +
    (unique - state.B) * k2 -
    state.DJ * x * x -
    state.DJK * x * k2 -
    state.DK * k2 * k2 +
    state.HJ * x * x * x +
    state.HJK * x * x * k2 +
    state.HKJ * x * k2 * k2 +
    state.HK * k2 * k2 * k2
  );
}

/**
 * Energy of an upper level above the lower state's J = K = 0 level, cm^-1.
 *
 * Parallel band: origin + F'(J', K').
 * Perpendicular band (degenerate upper state, first-order Coriolis coupling):
 *   origin + F'(J', K') − 2 A' ζ K'  for levels reached with ΔK = +1,
 *   origin + F'(J', K') + 2 A' ζ K'  for levels reached with ΔK = −1  (C' for an oblate top).
 * Linear Π state (perpendicular band of a linear molecule): the l-type doubling puts the levels
 * reached by P and R lines (e parity) at +q/2·J(J+1) and those reached by Q lines (f parity)
 * at −q/2·J(J+1).
 * Source: Herzberg II (1945) ch. IV, eq. (IV,45) for the Coriolis term; for l-type doubling
 * J. M. Hollas, High Resolution Spectroscopy, 2nd ed. (1998), sec. 6.2.
 * @param model band model (constants in cm^-1)
 * @param jUpper J'
 * @param kUpper K' (unsigned)
 * @param deltaK K' − K'' (−1, 0, +1)
 * @param deltaJ J' − J'' (−1, 0, +1)
 * @returns upper-level energy in cm^-1
 */
export function upperLevelEnergy(model: BandModel, jUpper: number, kUpper: number, deltaK: number, deltaJ: number): number {
  const up = model.upper;
  let e = up.origin + levelEnergy(up, model.shape, jUpper, kUpper);
  if (model.band === 'perpendicular') {
    if (model.shape === 'linear') {
      const halfQ = 0.5 * up.q * jUpper * (jUpper + 1);
      e += deltaJ === 0 ? -halfQ : halfQ;
    } else {
      const coriolis = 2 * stateUniqueConstant(up, model.shape) * up.zeta * kUpper;
      e += deltaK > 0 ? -coriolis : coriolis;
    }
  }
  return e;
}

/**
 * Wavenumber of the transition J''(K'') → J'(K'), cm^-1: E'(J', K') − F''(J'', K'').
 * The ΔK sign that picks the Coriolis component is K' − K''.
 * @returns line position in cm^-1 (no validity check; see transitionCheck)
 */
export function transitionWavenumber(model: BandModel, jUpper: number, kUpper: number, jLower: number, kLower: number): number {
  return upperLevelEnergy(model, jUpper, kUpper, kUpper - kLower, jUpper - jLower) - levelEnergy(model.lower, model.shape, jLower, kLower);
}
