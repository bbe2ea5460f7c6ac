/**
 * The level as the unit of the multi-band engine: what a vibrational state hands to the band,
 * fit and simulation code, whoever computes it (closed-form term values today, a Hamiltonian
 * diagonalised per J later).
 *
 * A level of one vibrational state is named by a LevelLabel:
 * - J, the total angular momentum;
 * - K = |k|, the unsigned projection on the figure axis (K = |ℓ| = 1 for a linear Π state);
 * - l, the vibrational angular momentum relative to k, l = sign(kℓ): 0 in a nondegenerate state,
 *   +1 for the (+l) levels (kℓ > 0) and −1 for the (−l) levels (kℓ < 0) of a degenerate ℓ = ±1
 *   state, and 0 for its K = 0 levels (kℓ = 0; the pair (k, ℓ) = (0, +1), (0, −1));
 * - tag, a short string that tells apart levels still equal in (J, K, l): 'e'/'f' parity of a
 *   linear molecule ('e' for every level of a Σ+ state), '' when nothing is left to tell apart.
 *   The Hamiltonian providers (states of a species with a point group) use the species of the
 *   member of an A1/A2 pair ('A1', "A2''") and 's' / 'a' for inversion components, with ':' and
 *   the species appended for a member of a pair ("a:A2''").
 *
 * Convention for l: K = 0 of a degenerate state is l = 0 (kℓ = 0) everywhere — in these labels,
 * in physics/hamiltonian and in the line table's l_up/l_lo columns.
 *
 * A LevelProvider gives, for one state and one J, every level with its energy and its
 * derivative with respect to each constant of that state. A closed-form provider differentiates
 * its formula; a diagonalising provider gives the Hellmann–Feynman derivatives ⟨ψ|∂H/∂p|ψ⟩ of each
 * eigenvector, and must keep a level's label stable while the constants move a little in a fit.
 * Source: labels as in G. Herzberg, Molecular Spectra and Molecular Structure II (1945), ch. IV
 * (the (+l)/(−l) levels of degenerate vibrational states, e/f for linear molecules as in
 * J. M. Brown et al., J. Mol. Spectrosc. 55, 500 (1975)).
 */

/** Name of one level of a vibrational state (see the file comment). */
export interface LevelLabel {
  J: number;
  /** |k|, unsigned. */
  K: number;
  /** sign(kℓ): −1, 0 or +1. */
  l: -1 | 0 | 1;
  /** '' or a short distinguishing tag such as 'e' or 'f'. */
  tag: string;
}

/**
 * Every level of one state at one J, as columns. Level i has label (J, K[i], l[i], tag[i]).
 * WARNING: the arrays may be reused by the provider on its next call; copy what you keep.
 */
export interface LevelSet {
  J: number;
  count: number;
  K: Int32Array;
  l: Int8Array;
  tag: string[];
  /** Energy above the species' lowest level (J = 0 of its lowest vibrational state), cm^-1. */
  energyCm1: Float64Array;
  /**
   * ∂E/∂p for each constant of the state, row-major: gradient[i * nParameters + j] is the
   * derivative of level i with respect to parameterNames[j] (cm^-1 per unit of the constant).
   */
  gradient: Float64Array;
  /**
   * Number of signed basis components (k, ℓ) the level stands for: its statistical weight apart
   * from 2J + 1 and the nuclear-spin weight (2 for K > 0 of a nondegenerate state, 1 for K = 0;
   * 2 for every (K, l) of a degenerate state; 1 for each e or f level of a linear molecule).
   */
  componentCount: Uint8Array;
  /**
   * Symmetry species of each level in the species' point group ('A1', "E''", …), when the state's
   * levels come from a Hamiltonian provider; absent for closed-form levels.
   */
  species?: string[];
}

/** Computes the levels of one vibrational state. Plain functions, no hidden state between calls. */
export interface LevelProvider {
  /** The state's constants this provider reads, in the order of LevelSet.gradient. */
  readonly parameterNames: readonly string[];
  /** True when the state is degenerate (ℓ = ±1). */
  readonly isDegenerate: boolean;
  /**
   * Every level of J with K <= kTop (and K <= J), energies in cm^-1 including the state's
   * vibrational term value.
   * @param J total angular momentum >= 0
   * @param values the constants in parameterNames order (cm^-1; ζ dimensionless)
   * @param kTop largest K wanted
   * @param withGradient fill `gradient` (a diagonalising provider may skip that work) @default true
   */
  levels(J: number, values: Float64Array, kTop: number, withGradient?: boolean): LevelSet;
  /**
   * Optional, for sums over every level of J (the partition function): energies (cm^-1), component
   * counts and symmetry species of all levels, unlabelled and in no particular order. A provider
   * that can skip eigenvectors and labels for this offers it; others are summed through levels().
   */
  levelEnergies?(J: number, values: Float64Array): LevelEnergies;
}

/** Unlabelled levels of one J (LevelProvider.levelEnergies). */
export interface LevelEnergies {
  count: number;
  /** cm^-1, including the state's vibrational term value. */
  energyCm1: ArrayLike<number>;
  componentCount: ArrayLike<number>;
  species: readonly string[];
}

/** Text form of a label, e.g. "J=3 K=2 l=+1 f" (for messages). */
export function levelLabelText(label: LevelLabel): string {
  const l = label.l > 0 ? '+1' : label.l < 0 ? '-1' : '0';
  return `J=${label.J} K=${label.K} l=${l}${label.tag ? ' ' + label.tag : ''}`;
}

/**
 * |k − ℓ| of a level, the index of its nuclear-spin weight (spinWeights[|k − ℓ| mod n]): K in a
 * nondegenerate state, K − 1 for (+l) levels, K + 1 for (−l) levels, 1 for K = 0 of a
 * degenerate state (0 for a linear Π state, where k = ℓ).
 * Source: Herzberg II (1945) ch. IV (for a degenerate vibrational level the rotational
 * species, and so the spin statistics, follow k − ℓ); common practice for C3v tops.
 */
export function levelSpinIndex(K: number, l: number, isDegenerate: boolean): number {
  if (!isDegenerate) return K;
  if (l === 0) return 1;
  return Math.abs(K - l);
}
