import { rovibGroupCheck, rovibSpeciesDimension, rovibSpeciesList, type RovibPointGroup } from './rovibSymmetry';

/**
 * Nuclear-spin statistical weights of rovibrational levels, given either the old way (by K mod n,
 * the model file's `spinWeights`) or by symmetry species of a point group.
 *
 * Convention: a weight is per rotational component function. A nondegenerate (A) level counts
 * g(A); a doubly degenerate (E) level, which stands for the two functions k = ±K, counts 2·g(E).
 * This is the convention of the model file's `spinWeights` ([4, 2, 2] for CH3X: g(K) per k
 * function, the ±K pair counted twice) and of the example {"A1": 4, "A2": 4, "E": 2}.
 * WARNING: Bunker and Jensen (1998) tabulate the weight of a degenerate species per level (the
 * number of allowed complete states the whole E level gives); divide such a value by 2 before
 * putting it here (e.g. ¹⁴NH3: their E' = E'' = 6 becomes 3 here, from memory).
 */
export type SpinStatistics =
  | { kind: 'kMod'; weights: readonly number[] }
  | { kind: 'species'; pointGroup: RovibPointGroup; weights: Readonly<Record<string, number>> };

/** The per-level information spin weights need. */
export interface SpinWeightLevel {
  /** |k|. */
  K: number;
  /** Symmetry species in the group of the statistics (ignored for kMod). */
  species: string;
  /**
   * kMod only: how many k functions the level stands for (1 for K = 0 or one member of an A1/A2
   * pair, 2 for an E level or an unsplit ±K pair). @default K > 0 ? 2 : 1
   */
  degeneracy?: number;
}

/**
 * Check a species-weight table and fill it to every species of the group. A key without primes in
 * D3h (e.g. "A1") stands for both its primed and double-primed species. Every species must end up
 * with a finite weight >= 0; an unknown key is refused.
 * @returns a complete table (species → weight per component function)
 */
export function spinStatisticsSpeciesTable(group: string, weights: Readonly<Record<string, number>>): Record<string, number> {
  const g = rovibGroupCheck(group, 'spinStatistics');
  const all = rovibSpeciesList(g);
  const out: Record<string, number> = {};
  for (const [key, w] of Object.entries(weights)) {
    if (!Number.isFinite(w) || w < 0) throw new Error(`spinStatistics: weight of ${key} must be a finite number >= 0, got ${w}`);
    const targets = all.includes(key) ? [key] : g === 'D3h' && ['A1', 'A2', 'E'].includes(key) ? [`${key}'`, `${key}''`] : [];
    if (targets.length === 0) throw new Error(`spinStatistics: ${JSON.stringify(key)} is not a species of ${g} (${all.join(', ')})`);
    for (const t of targets) out[t] = w;
  }
  const missing = all.filter((s) => out[s] === undefined);
  if (missing.length > 0)
    throw new Error(`spinStatistics: no weight for ${missing.join(', ')} of ${g} (give 0 for species that do not occur)`);
  return out;
}

/**
 * Statistical weight of one level, summed over its component functions (dimensionless).
 * kMod: weights[K mod n] per function, times 2 for K > 0 (the ±K pair, one level).
 * species: g(species) × dimension(species); a level split into A1 and A2 is two levels of one
 * function each.
 * Source: Herzberg II (1945) ch. I sec. 3 (weights by K for C3v tops); Bunker and Jensen (1998)
 * ch. 8 and 12 (weights by species); both from memory.
 * @param stats statistics of the molecule
 * @param level the level's K, species and (kMod) number of k functions
 */
export function levelSpinWeight(stats: SpinStatistics, level: SpinWeightLevel): number {
  if (stats.kind === 'kMod') {
    const n = stats.weights.length;
    if (n === 0) throw new Error('levelSpinWeight: spinWeights is empty');
    return stats.weights[level.K % n] * (level.degeneracy ?? (level.K > 0 ? 2 : 1));
  }
  const w = stats.weights[level.species];
  if (w === undefined) throw new Error(`levelSpinWeight: no weight for species ${level.species} in ${stats.pointGroup}`);
  return w * rovibSpeciesDimension(stats.pointGroup, level.species);
}
