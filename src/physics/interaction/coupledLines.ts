/**
 * Lines into the levels of a coupled group, with intensity borrowing: a level that is a mixture of
 * several states' basis functions takes its transition amplitude from each of them,
 *
 *   a(k'' → level) = Σ_i u_i · μ_{s_i, q_i} · sgn⟨J'' k'' 1 q_i | J' k_i⟩ · √HL(J'', k'', ΔJ, q_i),
 *
 * summed over the level's basis components i (state s_i, k_i, ℓ_i) that the dipole reaches from the
 * lower component k'' (q_i = k_i − k'' = ℓ_i for a degenerate state, 0 for a nondegenerate one), and
 * the line strength is Σ_k'' |a|² over the lower level's components (× 2 for an E level, which
 * stands also for its σv mirror image). HL is the project's Hönl–London factor (bandRules.ts), so a
 * pure level gives exactly the uncoupled line; its sign is that of the Clebsch–Gordan coefficient
 * (clebschOneSign). μ_s = momentSign·√(band strength) of the band from the lower state to s
 * (0 when the species has no such band); μ_{s,−1} = −μ_{s,+1}, which the σv phases of the basis
 * require (the spherical components of a transverse dipole). So a line forbidden in both bands
 * appears where the mixing carries an allowed component (ΔK = ±2, ±3, … lines of a dyad).
 * Source: intensity borrowing as in Papoušek and Aliev (1982), chapter on intensities of perturbed
 * bands (from memory); Clebsch–Gordan coefficients for j2 = 1, E. U. Condon and G. H. Shortley,
 * The Theory of Atomic Spectra (1935), Table 2³ (from memory; checked in the tests against the
 * Racah formula).
 */
import { honlLondonSigned, levelComponents } from '../system/bandRules';
import type { LevelSet } from '../system/levelTypes';
import type { SystemSpecies } from '../system/systemModel';
import type { CoupledLevels } from './coupledLevels';
import type { StateLevelSource } from './speciesLevelSources';

/**
 * Sign of the Clebsch–Gordan coefficient ⟨J'' k'' 1 q | J' k''+q⟩ (+1, −1, or 0 where it vanishes
 * by sign alone: q = 0, k'' = 0, J' = J'').
 * @param jLower J''
 * @param kLower signed k''
 * @param q −1, 0 or +1
 * @param jUpper J' (J'' − 1 … J'' + 1)
 */
export function clebschOneSign(jLower: number, kLower: number, q: number, jUpper: number): number {
  if (jUpper === jLower + 1) return 1;
  if (jUpper === jLower) return q === 1 ? -1 : q === -1 ? 1 : Math.sign(kLower);
  return q === 0 ? -1 : 1;
}

/** Transition moments of the group's states from one lower state. */
function groupMoments(species: SystemSpecies, lowerName: string, source: StateLevelSource): Float64Array {
  const group = source.coupled!.group;
  return Float64Array.from(group.states, (s) => {
    const band = species.bands.find((b) => b.lower === lowerName && b.upper === s.name);
    return band ? (band.momentSign ?? 1) * Math.sqrt(band.strength) : 0;
  });
}

/**
 * Σ over the lower level's components of |a|² into one coupled level (× 2 for an E level), in
 * units of band strength × Hönl–London factor.
 */
function coupledStrength(
  levels: CoupledLevels,
  index: number,
  jLower: number,
  kLower: number,
  lowerComps: number[],
  moments: Float64Array,
  isStructural: boolean,
): number {
  const block = levels.block[index];
  const u = levels.vector[index];
  const J = levels.J;
  const deltaJ = J - jLower;
  let total = 0;
  for (let c = 0; c < lowerComps.length; c += 2) {
    const k2 = lowerComps[c];
    let amp = 0;
    let reach = 0;
    for (let i = 0; i < u.length; i++) {
      const mu = moments[block.basisState[i]];
      if (mu === 0) continue;
      const q = block.basisK[i] - k2;
      const ell = block.basisEll[i];
      if (q !== ell) continue;
      const hl = honlLondonSigned(jLower, k2, deltaJ, q);
      if (!(hl > 0)) continue;
      reach++;
      amp += u[i] * (ell === -1 ? -mu : mu) * clebschOneSign(jLower, k2, q, J) * Math.sqrt(hl);
    }
    total += isStructural ? reach : amp * amp;
  }
  return block.isMirrored ? 2 * total : total;
}

/**
 * Visit every line of one band whose upper state belongs to a coupled group (the lower state
 * uncoupled): every level of the band's upper state at J' = J'' − 1 … J'' + 1 reached from a lower
 * level with non-zero strength. The callback gets the lower set and index, the upper set (that
 * state's levels, gradients omitted) and index, and the line's strength divided by the band's own
 * strength (so band strength × that = |a|²; the Hönl–London factor of an unmixed line).
 * A line is kept when its strength exceeds 1e-12 of the band strength times the largest HL.
 * @param species the species
 * @param lowerName the band's lower state (not coupled)
 * @param upperName the band's upper state (coupled)
 * @param sources the species' level sources (speciesLevelSources)
 */
export function coupledBandEnumerate(
  species: SystemSpecies,
  lowerName: string,
  upperName: string,
  bandStrength: number,
  jMax: number,
  kMax: number,
  sources: Map<string, StateLevelSource>,
  visit: (lower: LevelSet, lowerIndex: number, upper: LevelSet, upperIndex: number, honlLondon: number) => void,
): void {
  const lowerSource = sources.get(lowerName)!;
  const upperSource = sources.get(upperName)!;
  if (lowerSource.coupled)
    throw new Error(`coupledBandEnumerate: lower state '${lowerName}' is itself coupled; hot bands between coupled groups are not handled`);
  if (!(bandStrength > 0)) return;
  const cs = upperSource.coupled!;
  const moments = groupMoments(species, lowerName, upperSource);
  const lowerIsDegenerate = lowerSource.provider.isDegenerate;
  const upperSets: { set: LevelSet; levels: CoupledLevels; index: Int32Array }[] = [];
  for (let J = 0; J <= jMax + 1; J++) {
    const levels = cs.groupLevels(J, upperSource.values);
    const pick: number[] = [];
    for (let i = 0; i < levels.count; i++) if (levels.state[i] === cs.stateIndex) pick.push(i);
    upperSets.push({
      levels,
      index: Int32Array.from(pick),
      set: {
        J,
        count: pick.length,
        K: Int32Array.from(pick, (i) => levels.K[i]),
        l: Int8Array.from(pick, (i) => levels.l[i]),
        tag: pick.map((i) => levels.tag[i]),
        energyCm1: Float64Array.from(pick, (i) => levels.energyCm1[i]),
        gradient: new Float64Array(0),
        componentCount: Uint8Array.from(pick, (i) => levels.componentCount[i]),
      },
    });
  }
  const cut = 1e-12 * bandStrength;
  for (let J = 0; J <= jMax; J++) {
    const raw = lowerSource.provider.levels(J, lowerSource.values, kMax);
    const lower: LevelSet = {
      ...raw,
      K: raw.K.slice(0, raw.count),
      l: raw.l.slice(0, raw.count),
      tag: raw.tag.slice(0, raw.count),
      energyCm1: raw.energyCm1.slice(0, raw.count),
      gradient: new Float64Array(0),
      componentCount: raw.componentCount.slice(0, raw.count),
    };
    for (let i = 0; i < lower.count; i++) {
      if (lower.K[i] > kMax) continue;
      const comps = levelComponents(lower.K[i], lower.l[i], lowerIsDegenerate);
      for (let jUp = Math.max(0, J - 1); jUp <= J + 1; jUp++) {
        const up = upperSets[jUp];
        for (let j = 0; j < up.set.count; j++) {
          const s = coupledStrength(up.levels, up.index[j], J, lower.K[i], comps, moments, false);
          if (s > cut) visit(lower, i, up.set, j, s / bandStrength);
        }
      }
    }
  }
}

/**
 * Whether the dipole can reach a coupled level from a lower level at all, whatever the constants:
 * some basis function of the level's block is reachable (Δk = ℓ, allowed ΔJ, a band from the lower
 * state to its state) and, for an A1/A2 member reached from a single lower level (K'' = 0), σv
 * changes sign (Γ' ⊗ Γ'' ⊇ A2). This is the rule that decides what a line-table row may name.
 * @param levels the group's levels at J'
 * @param index the level
 * @param jLower J''
 * @param kLower K''
 * @param lLower l'' (0 for a nondegenerate lower state)
 * @param isLowerDegenerate whether the lower state is degenerate
 * @param moments transition moment of each group state from the lower state (only ≠ 0 matters)
 */
export function coupledLineAllowed(
  levels: CoupledLevels,
  index: number,
  jLower: number,
  kLower: number,
  lLower: number,
  isLowerDegenerate: boolean,
  moments: Float64Array,
): boolean {
  const comps = levelComponents(kLower, lLower, isLowerDegenerate);
  const block = levels.block[index];
  if (coupledStrength(levels, index, jLower, kLower, comps, moments, true) === 0) return false;
  if (block.isMirrored || isLowerDegenerate || kLower !== 0) return true;
  // Lower K'' = 0 of a nondegenerate (A1) state has σv = (−1)^J''; the dipole changes the sign.
  const sigmaLower = jLower % 2 === 0 ? 1 : -1;
  return levels.sigma[index] === -sigmaLower;
}

/** The group's moments from a lower state (for coupledLineAllowed). */
export function coupledMoments(species: SystemSpecies, lowerName: string, source: StateLevelSource): Float64Array {
  return groupMoments(species, lowerName, source);
}
