/**
 * The diagonal symmetric-top term value as a sum of constants times known functions of J and k:
 *
 *   F(J,k) = B J(J+1) + (A−B) k² − DJ J²(J+1)² − DJK J(J+1) k² − DK k⁴
 *            + HJ J³(J+1)³ + HJK J²(J+1)² k² + HKJ J(J+1) k⁴ + HK k⁶
 *            + LJ J⁴(J+1)⁴ + LJJK J³(J+1)³ k² + LJK J²(J+1)² k⁴ + LKKJ J(J+1) k⁶ + LK k⁸
 *
 * (C in place of A for an oblate top). Up to the sextic terms this is the project's contract
 * (DEVELOPERS.md, termValues.ts); the octic L terms follow the same pattern with a + sign.
 * Source: Herzberg II (1945) eq. (I,31)–(I,33) for the quartic terms; the sextic and octic
 * expansions in J(J+1) and K² as in D. Papoušek and M. R. Aliev, Molecular Vibrational–Rotational
 * Spectra (1982), ch. 8 (power-series form of the symmetric-top term values), from memory.
 */

/** Names of the polynomial constants (the unique constant is 'A' here; see rotorUniqueName). */
export const ROTOR_POLYNOMIAL_NAMES = ['B', 'A', 'DJ', 'DJK', 'DK', 'HJ', 'HJK', 'HKJ', 'HK', 'LJ', 'LJJK', 'LJK', 'LKKJ', 'LK'] as const;

/** Shape of a symmetric top. */
export type RotorShape = 'prolate' | 'oblate';

/** 'A' for a prolate top, 'C' for an oblate top. */
export function rotorUniqueName(shape: RotorShape): 'A' | 'C' {
  return shape === 'prolate' ? 'A' : 'C';
}

/** The polynomial names for a shape (A or C as the unique constant). */
export function rotorPolynomialNames(shape: RotorShape): string[] {
  const unique = rotorUniqueName(shape);
  return ROTOR_POLYNOMIAL_NAMES.map((n) => (n === 'A' ? unique : n));
}

/**
 * ∂F/∂p for each polynomial constant at (J, k), in the order of ROTOR_POLYNOMIAL_NAMES.
 * @param out array of length >= 14 to fill (dimensionless powers of J(J+1) and k)
 */
export function rotorPolynomialBasis(J: number, k: number, out: Float64Array | number[]): void {
  const x = J * (J + 1);
  const k2 = k * k;
  const x2 = x * x;
  const k4 = k2 * k2;
  out[0] = x - k2;
  out[1] = k2;
  out[2] = -x2;
  out[3] = -x * k2;
  out[4] = -k4;
  out[5] = x2 * x;
  out[6] = x2 * k2;
  out[7] = x * k4;
  out[8] = k4 * k2;
  out[9] = x2 * x2;
  out[10] = x2 * x * k2;
  out[11] = x2 * k4;
  out[12] = x * k4 * k2;
  out[13] = k4 * k4;
}
