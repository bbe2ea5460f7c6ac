/**
 * Symmetry species of rovibrational levels of symmetric tops in the molecular symmetry groups
 * C3v(M) (non-inverting C3v tops such as CH3X) and D3h(M) (planar D3h tops, and pyramidal XY3
 * with inversion tunnelling such as NH3), their products and the electric-dipole selection rule.
 *
 * Species labels are the point-group ones, with primes as ASCII ' (as in bandSymmetry.ts):
 * C3v: A1, A2, E; D3h: A1', A2', E', A1'', A2'', E''. Other groups are refused by name.
 *
 * Conventions (Bunker and Jensen, Molecular Symmetry and Spectroscopy, 2nd ed. (1998), ch. 12,
 * equivalent rotations; from memory): the equivalent rotation of C3 is R_z^{2π/3}, of σv (C3v) or of
 * σv = σh·C2 (D3h) is R_y^π, of C2 (D3h) is R_x^π and of σh (D3h) is R_z^π, with
 *   R_z^β |J,k⟩ = e^{ikβ} |J,k⟩,   R_x^π |J,k⟩ = (−1)^J |J,−k⟩,   R_y^π |J,k⟩ = (−1)^{J+k} |J,−k⟩.
 * For a doubly degenerate vibration the ℓ = ±1 functions (q_x ± i q_y) go into each other under σv
 * with phase +1, and under C3 a basis function |k, ℓ⟩ picks up a phase e^{2πi(k − ℓ)/3}, so only
 * k − ℓ (mod 3) matters for C3 (A species when k − ℓ ≡ 0, E otherwise).
 */

/** A molecular symmetry group supported here. */
export type RovibPointGroup = 'C3v' | 'D3h';

/** Supported groups, for messages. */
export const ROVIB_POINT_GROUPS: readonly RovibPointGroup[] = ['C3v', 'D3h'];

interface GroupTable {
  /** Class sizes (sum = order). */
  classSizes: readonly number[];
  /** Characters per species, in the class order. */
  characters: Readonly<Record<string, readonly number[]>>;
  /**
   * Species of a space-fixed dipole component (Γ*: +1 for permutations, −1 for permutation-inversions).
   * Source: Bunker and Jensen (1998) ch. 14 (electric-dipole selection rule Γ' ⊗ Γ'' ⊇ Γ*), from memory.
   */
  dipoleSpecies: string;
}

// Character tables: F. A. Cotton, Chemical Applications of Group Theory, 3rd ed. (1990), App. IIA.
// C3v classes: E, 2C3, 3σv.  D3h classes: E, 2C3, 3C2, σh, 2S3, 3σv.
const TABLES: Record<RovibPointGroup, GroupTable> = {
  C3v: {
    classSizes: [1, 2, 3],
    characters: { A1: [1, 1, 1], A2: [1, 1, -1], E: [2, -1, 0] },
    // σv of C3v(M) is a permutation-inversion (ij)*, so Γ* has χ(σv) = −1: A2.
    dipoleSpecies: 'A2',
  },
  D3h: {
    classSizes: [1, 2, 3, 1, 2, 3],
    characters: {
      "A1'": [1, 1, 1, 1, 1, 1],
      "A2'": [1, 1, -1, 1, 1, -1],
      "E'": [2, -1, 0, 2, -1, 0],
      "A1''": [1, 1, 1, -1, -1, -1],
      "A2''": [1, 1, -1, -1, -1, 1],
      "E''": [2, -1, 0, -2, 1, 0],
    },
    // In D3h(M) the permutation-inversions are σh (E*), S3 and σv: Γ* = A1''.
    dipoleSpecies: "A1''",
  },
};

/** Check a group name; throws a sentence naming the supported groups. */
export function rovibGroupCheck(group: string, where: string): RovibPointGroup {
  if ((ROVIB_POINT_GROUPS as readonly string[]).includes(group)) return group as RovibPointGroup;
  throw new Error(`${where}: point group ${JSON.stringify(group)} is not supported; supported: ${ROVIB_POINT_GROUPS.join(', ')}`);
}

/** Species labels of a group, in table order. */
export function rovibSpeciesList(group: RovibPointGroup): string[] {
  return Object.keys(TABLES[group].characters);
}

/** Dimension (1 or 2) of a species. */
export function rovibSpeciesDimension(group: RovibPointGroup, species: string): number {
  return speciesCharacters(group, species)[0];
}

function speciesCharacters(group: RovibPointGroup, species: string): readonly number[] {
  const chi = TABLES[group].characters[species];
  if (!chi)
    throw new Error(`rovibSymmetry: ${JSON.stringify(species)} is not a species of ${group} (${rovibSpeciesList(group).join(', ')})`);
  return chi;
}

/**
 * Decompose the direct product Γa ⊗ Γb into species (with repetition).
 * Source: the reduction formula n_i = (1/h) Σ_c g_c χ_i(c) χ(c) (Cotton 1990, eq. 4.3-11).
 * @returns species labels, each repeated by its multiplicity
 */
export function rovibSpeciesProduct(group: RovibPointGroup, a: string, b: string): string[] {
  const ca = speciesCharacters(group, a);
  const cb = speciesCharacters(group, b);
  return reduceCharacters(
    group,
    ca.map((x, i) => x * cb[i]),
  );
}

function reduceCharacters(group: RovibPointGroup, chi: readonly number[]): string[] {
  const t = TABLES[group];
  const order = t.classSizes.reduce((s, g) => s + g, 0);
  const out: string[] = [];
  for (const [label, ci] of Object.entries(t.characters)) {
    let n = 0;
    for (let c = 0; c < chi.length; c++) n += t.classSizes[c] * ci[c] * chi[c];
    n = Math.round(n / order);
    for (let r = 0; r < n; r++) out.push(label);
  }
  return out;
}

/** Species of a space-fixed dipole component in the group (C3v(M): A2; D3h(M): A1''). */
export function rovibDipoleSpecies(group: RovibPointGroup): string {
  return TABLES[group].dipoleSpecies;
}

/**
 * Whether an electric-dipole transition between levels of species Γ' and Γ'' is allowed by symmetry:
 * Γ' ⊗ Γ'' must contain Γ*.
 * Source: Bunker and Jensen (1998) ch. 14 (the vanishing-integral rule with Γ(μ_Z) = Γ*), from memory.
 */
export function rovibDipoleAllowed(group: RovibPointGroup, speciesUpper: string, speciesLower: string): boolean {
  return rovibSpeciesProduct(group, speciesUpper, speciesLower).includes(rovibDipoleSpecies(group));
}

/**
 * The species of a one-dimensional function from its characters under σv and (D3h only) σh.
 * @param sigmaV character under σv (±1)
 * @param sigmaH character under σh (±1; ignored for C3v)
 */
export function rovibSpeciesNondegenerate(group: RovibPointGroup, sigmaV: number, sigmaH = 1): string {
  if (group === 'C3v') return sigmaV > 0 ? 'A1' : 'A2';
  // D3h: χ(C2) = χ(σv)·χ(σh); A1 has χ(C2) = +1.
  const c2 = sigmaV * sigmaH;
  return (c2 > 0 ? 'A1' : 'A2') + (sigmaH > 0 ? "'" : "''");
}

/** The species of a doubly degenerate function pair with σh character sigmaH (D3h) — E, E' or E''. */
export function rovibSpeciesDegenerate(group: RovibPointGroup, sigmaH = 1): string {
  if (group === 'C3v') return 'E';
  return sigmaH > 0 ? "E'" : "E''";
}

/**
 * Species of the symmetric-top rotational functions |J, ±K⟩ (a nondegenerate, totally symmetric
 * vibronic state): K = 0 gives one species (A1 for even J, A2 for odd J; in D3h A1' / A2'),
 * K = 3n > 0 gives the pair A1 + A2 (D3h: primed for even K, double-primed for odd K), every other K
 * gives E (D3h: E' for even K, E'' for odd K).
 * Source: Bunker and Jensen (1998) ch. 12 (rotational symmetry of the symmetric top from its
 * equivalent rotations); the pattern is the one of Herzberg II (1945) ch. I, sec. 3 (from memory).
 * @param J rotational quantum number
 * @param K |k|, 0 <= K <= J
 * @returns one or two species labels
 */
export function rovibRotationalSpecies(group: RovibPointGroup, J: number, K: number): string[] {
  const sigmaH = K % 2 === 0 ? 1 : -1;
  if (K === 0) return [rovibSpeciesNondegenerate(group, J % 2 === 0 ? 1 : -1, 1)];
  if (K % 3 === 0) return [rovibSpeciesNondegenerate(group, 1, sigmaH), rovibSpeciesNondegenerate(group, -1, sigmaH)];
  return [rovibSpeciesDegenerate(group, sigmaH)];
}

/**
 * Species of the rovibrational levels of a nondegenerate vibrational state of species Γv:
 * every species in Γv ⊗ Γrot(J, K), one per level.
 * @param vibSpecies species of the vibrational (vibronic) state, one-dimensional
 */
export function rovibLevelSpecies(group: RovibPointGroup, vibSpecies: string, J: number, K: number): readonly string[] {
  // The answer depends on J and K only through the six cases of levelSpeciesCase: read from a table.
  const known = LEVEL_SPECIES.get(`${group}|${vibSpecies}|${levelSpeciesCase(J, K)}`);
  if (known) return known;
  if (rovibSpeciesDimension(group, vibSpecies) !== 1) {
    throw new Error(`rovibLevelSpecies: ${vibSpecies} is degenerate; use the degenerate-state levels for it`);
  }
  return levelSpeciesCompute(group, vibSpecies, J, K);
}

function levelSpeciesCompute(group: RovibPointGroup, vibSpecies: string, J: number, K: number): string[] {
  return rovibRotationalSpecies(group, J, K).flatMap((rot) => rovibSpeciesProduct(group, vibSpecies, rot));
}

/** 0/1: K = 0 with J even/odd; 2/3: K = 3n > 0 even/odd; 4/5: other K even/odd (all rovibRotationalSpecies uses). */
function levelSpeciesCase(J: number, K: number): number {
  if (K === 0) return J % 2;
  return (K % 3 === 0 ? 2 : 4) + (K % 2);
}

/** rovibLevelSpecies for every group, one-dimensional vibrational species and case, computed once at load. */
const LEVEL_SPECIES: ReadonlyMap<string, readonly string[]> = new Map(
  ROVIB_POINT_GROUPS.flatMap((g) =>
    rovibSpeciesList(g)
      .filter((v) => rovibSpeciesDimension(g, v) === 1)
      .flatMap((v) =>
        // Representative (J, K) of each case, in case order.
        [
          [0, 0],
          [1, 0],
          [6, 6],
          [3, 3],
          [2, 2],
          [1, 1],
        ].map(([J, K], c) => [`${g}|${v}|${c}`, levelSpeciesCompute(g, v, J, K)] as const),
      ),
  ),
);

/**
 * The D3h(M) species of the inversion components of a pyramidal XY3 vibrational state whose
 * C3v species is Γ: the symmetric component s is Γ' and the antisymmetric one a is Γ' ⊗ A2''
 * (A1 → A1' / A2'', A2 → A2' / A1'', E → E' / E'').
 * Source: Bunker and Jensen (1998) ch. 15 (ammonia, correlation of C3v(M) with D3h(M)), from memory;
 * checked against the symmetry labels of the empirical ¹⁴NH3 levels in the tests.
 */
export function inversionVibSpecies(c3vSpecies: string, inversion: 's' | 'a'): string {
  const primed = `${c3vSpecies}'`;
  speciesCharacters('D3h', primed);
  if (inversion === 's') return primed;
  return rovibSpeciesProduct('D3h', primed, "A2''")[0];
}
