/**
 * Hönl–London factor of a symmetric-top transition, dimensionless, for one signed ±k component.
 *
 * With J = J'' and K = K'' (unsigned) and s = sign(ΔK):
 *   ΔK = 0:  R (J+1)²−K² / (J+1);   Q (2J+1)K² / (J(J+1));   P (J²−K²) / J
 *   ΔK = ±1: R (J+2+sK)(J+1+sK) / (4(J+1));   Q (2J+1)(J+1+sK)(J−sK) / (4J(J+1));
 *            P (J−1−sK)(J−sK) / (4J)
 * For each signed lower level the factors over all allowed branches sum to 2J''+1 (the ΔK = ±1
 * factors of both signs together). Multiply by the number of degenerate ±k components
 * (lineDegeneracy) for the line of unsigned K.
 * Source: G. Herzberg, Molecular Spectra and Molecular Structure II (1945), ch. IV, eqs. (IV,60)–(IV,62)
 * and (IV,72); the same factors in P. R. Bunker and P. Jensen, Molecular Symmetry and Spectroscopy (1998).
 * @param jLower J''
 * @param kLower K'' (unsigned)
 * @param deltaJ J' − J''
 * @param deltaK K' − K''
 * @returns the factor; 0 for a forbidden combination (including K'' > J'')
 */
export function honlLondonFactor(jLower: number, kLower: number, deltaJ: number, deltaK: number): number {
  const J = jLower;
  const K = kLower;
  // K'' > J'' is no level at all; without this guard the P factor of a parallel band goes negative.
  if (K > J || K < 0) return 0;
  if (deltaK === 0) {
    if (deltaJ === 1) return ((J + 1) * (J + 1) - K * K) / (J + 1);
    if (deltaJ === 0) return J === 0 ? 0 : ((2 * J + 1) * K * K) / (J * (J + 1));
    if (deltaJ === -1) return J === 0 ? 0 : (J * J - K * K) / J;
    return 0;
  }
  if (deltaK !== 1 && deltaK !== -1) return 0;
  const sK = deltaK * K;
  let f: number;
  if (deltaJ === 1) f = ((J + 2 + sK) * (J + 1 + sK)) / (4 * (J + 1));
  else if (deltaJ === 0) f = J === 0 ? 0 : ((2 * J + 1) * (J + 1 + sK) * (J - sK)) / (4 * J * (J + 1));
  else if (deltaJ === -1) f = J === 0 ? 0 : ((J - 1 - sK) * (J - sK)) / (4 * J);
  else return 0;
  return f > 0 ? f : 0;
}

/**
 * Number of signed ±k components that make up one line of unsigned K'' (dimensionless).
 * Parallel band: 1 for K'' = 0, 2 otherwise. Perpendicular band: always 2 — for K'' > 0 the
 * +K'' and −K'' components each give the line, and from K'' = 0 both Δk = +1 and Δk = −1 end on
 * the same |K'| = 1 level.
 * Source: Herzberg II (1945) ch. IV, discussion of the K = 0 sub-band intensities.
 */
export function lineDegeneracy(band: 'parallel' | 'perpendicular', kLower: number): number {
  return band === 'parallel' && kLower === 0 ? 1 : 2;
}
