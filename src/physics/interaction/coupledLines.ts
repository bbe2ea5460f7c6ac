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
import { honlLondonSigned } from '../system/bandRules';
import type { LevelSet } from '../system/levelTypes';
import type { SystemSpecies } from '../system/systemModel';
import type { CoupledBlock, CoupledLevels } from './coupledLevels';
import { coupledLevelSpecies, type StateLevelSource } from './speciesLevelSources';

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

/** Transition moment μ_s (momentSign·√strength) of the band lowerName → each group state s. */
function groupMoments(species: SystemSpecies, lowerName: string, source: StateLevelSource): Float64Array {
  const group = source.coupled!.group;
  return Float64Array.from(group.states, (s) => {
    const band = species.bands.find((b) => b.lower === lowerName && b.upper === s.name);
    return band ? (band.momentSign ?? 1) * Math.sqrt(band.strength) : 0;
  });
}

/** A vector over signed lower basis functions k'' (nondegenerate lower state), pruned of tiny entries. */
interface LowerRep {
  k: Int32Array;
  c: Float64Array;
}

/** The representatives of a coupled level: its vector and, for an E level, its σv mirror image. */
function upperReps(levels: CoupledLevels, index: number): { k: Int32Array; ell: Int8Array; state: Int32Array; c: Float64Array }[] {
  const b = levels.block[index];
  const u = levels.vector[index];
  const rep = { k: b.basisK, ell: b.basisEll, state: b.basisState, c: u };
  if (!b.isMirrored) return [rep];
  const J = levels.J;
  const mirror = {
    k: Int32Array.from(b.basisK, (k) => -k),
    ell: Int8Array.from(b.basisEll, (l) => -l),
    state: b.basisState,
    c: Float64Array.from(u, (c, i) => ((J + b.basisK[i]) % 2 === 0 ? c : -c)),
  };
  return [rep, mirror];
}

/** The lower representatives of a lower level: unit components, or a coupled level's vector(s). */
function lowerReps(lower: LevelSet, index: number, coupledLower: CoupledLevels | null, lowerIndex: Int32Array | null): LowerRep[] {
  if (!coupledLower) {
    const K = lower.K[index];
    return K === 0
      ? [{ k: Int32Array.of(0), c: Float64Array.of(1) }]
      : [
          { k: Int32Array.of(K), c: Float64Array.of(1) },
          { k: Int32Array.of(-K), c: Float64Array.of(1) },
        ];
  }
  return upperReps(coupledLower, lowerIndex![index]).map((r) => {
    const keep: number[] = [];
    for (let i = 0; i < r.c.length; i++) if (Math.abs(r.c[i]) > 1e-7) keep.push(i);
    return { k: Int32Array.from(keep, (i) => r.k[i]), c: Float64Array.from(keep, (i) => r.c[i]) };
  });
}

/**
 * A lower level's reach into one upper block: for each mirror image (of an E block) and lower
 * representative, in that order, the basis functions the dipole meets and their coefficients, so
 * that an upper level's amplitude is a = Σ u_i·coef_i and its line strength Σ |a|² (in units of band
 * strength × Hönl–London factor; projectedStrength): coef_i = c''·(phase)·μ_{s_i,q}·sgn CG·√HL of the
 * sum in the file comment. The mirror image of an E level is read through the block's k lookup
 * (k → −k, ℓ → −ℓ, phase (−1)^{J+k}). Built once per lower level and upper block, then shared by
 * every upper level of the block.
 */
interface StrengthProjection {
  index: Int32Array;
  coef: Float64Array;
  /** Entries of group g (one mirror image × lower representative): start[g] … start[g + 1]. */
  start: Int32Array;
}

function strengthProjection(block: CoupledBlock, J: number, jLower: number, lows: LowerRep[], moments: Float64Array): StrengthProjection {
  const deltaJ = J - jLower;
  const index: number[] = [];
  const coef: number[] = [];
  const start: number[] = [0];
  for (let mirror = 0; mirror <= (block.isMirrored ? 1 : 0); mirror++) {
    for (const low of lows) {
      for (let a = 0; a < low.k.length; a++) {
        const k2 = low.k[a];
        for (let q = -1; q <= 1; q++) {
          const kOrig = mirror ? -(k2 + q) : k2 + q;
          if (kOrig < -J || kOrig > J) continue;
          for (let t = block.byKStart[kOrig + J]; t < block.byKStart[kOrig + J + 1]; t++) {
            const i = block.byKIndex[t];
            const ell = mirror ? -block.basisEll[i] : block.basisEll[i];
            if (ell !== q) continue;
            const mu = moments[block.basisState[i]];
            if (mu === 0) continue;
            const hl = honlLondonSigned(jLower, k2, deltaJ, q);
            if (!(hl > 0)) continue;
            const phase = mirror && (J + kOrig) % 2 !== 0 ? -1 : 1;
            index.push(i);
            coef.push(low.c[a] * phase * (q === -1 ? -mu : mu) * clebschOneSign(jLower, k2, q, J) * Math.sqrt(hl));
          }
        }
      }
      start.push(index.length);
    }
  }
  return { index: Int32Array.from(index), coef: Float64Array.from(coef), start: Int32Array.from(start) };
}

/** Σ over the projection's groups of |Σ u_i·coef_i|²: the line strength into the upper level of eigenvector u. */
function projectedStrength(p: StrengthProjection, u: Float64Array): number {
  let total = 0;
  for (let g = 0; g + 1 < p.start.length; g++) {
    let amp = 0;
    for (let t = p.start[g]; t < p.start[g + 1]; t++) amp += u[p.index[t]] * p.coef[t];
    total += amp * amp;
  }
  return total;
}

/**
 * Visit every line of one band whose upper state belongs to a coupled group: every level of the
 * band's upper state at J' = J'' − 1 … J'' + 1 reached from a lower level with non-zero strength.
 * The lower state is nondegenerate; it may itself be diagonalised (a ground state with h3), its
 * levels then entering with their eigenvectors. The callback gets the lower set and index, the
 * upper set (that state's levels, gradients omitted) and index, and the line's strength divided by
 * the band's own strength (so band strength × that = |a|²; the Hönl–London factor of an unmixed line).
 * A line is kept when its strength exceeds 1e-12 of the band strength.
 * @param species the species
 * @param lowerName the band's lower state (nondegenerate)
 * @param upperName the band's upper state (coupled)
 * @param bandStrength the band's strength (μ²)
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
  if (lowerSource.provider.isDegenerate)
    throw new Error(
      `coupledBandEnumerate: lower state '${lowerName}' is degenerate; bands into a coupled group are handled from a nondegenerate lower state only`,
    );
  if (lowerSource.coupled && lowerSource.coupled.group === upperSource.coupled!.group)
    throw new Error(
      `coupledBandEnumerate: '${lowerName}' and '${upperName}' are in one coupled group; transitions within a group are not handled`,
    );
  if (!(bandStrength > 0)) return;
  const cs = upperSource.coupled!;
  const moments = groupMoments(species, lowerName, upperSource);
  const upperSets = Array.from({ length: jMax + 2 }, (_, J) =>
    stateView(cs.groupLevels(J, upperSource.values), cs.stateIndex, cs.hasSpecies),
  );
  const cut = 1e-12 * bandStrength;
  for (let J = 0; J <= jMax; J++) {
    const lc = lowerSource.coupled;
    const low = lc
      ? stateView(lc.groupLevels(J, lowerSource.values), lc.stateIndex, lc.hasSpecies)
      : { set: copyLevelSet(lowerSource.provider.levels(J, lowerSource.values, kMax)), levels: null, index: null };
    for (let i = 0; i < low.set.count; i++) {
      if (low.set.K[i] > kMax) continue;
      const lows = lowerReps(low.set, i, low.levels, low.index);
      for (let jUp = Math.max(0, J - 1); jUp <= J + 1; jUp++) {
        const up = upperSets[jUp];
        let projectionBlock: CoupledBlock | null = null;
        let projection: StrengthProjection | null = null;
        for (let j = 0; j < up.set.count; j++) {
          // k − ℓ is conserved: K'' ≡ 0 (mod 3) reaches only class-0 (A1/A2) levels, other K'' only E levels.
          const block = up.levels.block[up.index[j]];
          if (block.isMirrored === (low.set.K[i] % 3 === 0)) continue;
          if (block !== projectionBlock) {
            projection = strengthProjection(block, jUp, J, lows, moments);
            projectionBlock = block;
          }
          const s = projectedStrength(projection!, up.levels.vector[up.index[j]]);
          if (s > cut) visit(low.set, i, up.set, j, s / bandStrength);
        }
      }
    }
  }
}

function copyLevelSet(raw: LevelSet): LevelSet {
  return {
    ...raw,
    K: raw.K.slice(0, raw.count),
    l: raw.l.slice(0, raw.count),
    tag: raw.tag.slice(0, raw.count),
    energyCm1: raw.energyCm1.slice(0, raw.count),
    gradient: new Float64Array(0),
    componentCount: raw.componentCount.slice(0, raw.count),
  };
}

/** One state's levels out of a group's, as a LevelSet (gradients omitted) with their indices in the group's. */
function stateView(
  levels: CoupledLevels,
  stateIndex: number,
  hasSpecies: boolean,
): { set: LevelSet; levels: CoupledLevels; index: Int32Array } {
  const pick: number[] = [];
  for (let i = 0; i < levels.count; i++) if (levels.state[i] === stateIndex) pick.push(i);
  return {
    levels,
    index: Int32Array.from(pick),
    set: {
      J: levels.J,
      count: pick.length,
      K: Int32Array.from(pick, (i) => levels.K[i]),
      l: Int8Array.from(pick, (i) => levels.l[i]),
      tag: pick.map((i) => levels.tag[i]),
      energyCm1: Float64Array.from(pick, (i) => levels.energyCm1[i]),
      gradient: new Float64Array(0),
      componentCount: Uint8Array.from(pick, (i) => levels.componentCount[i]),
      ...(hasSpecies ? { species: pick.map((i) => coupledLevelSpecies(levels.sigma[i])) } : {}),
    },
  };
}

/**
 * Whether the dipole can reach a coupled level from a lower level at all, whatever the constants:
 * some basis function of the level's block is reachable from a signed component of the lower level
 * (Δk = ℓ', allowed ΔJ, a band from the lower state to its state) and, between two A1/A2 members,
 * σv changes sign (Γ' ⊗ Γ'' ⊇ A2). This decides what a line-table row may name.
 * @param levels the group's levels at J'
 * @param index the level
 * @param jLower J''
 * @param kLower K''
 * @param sigmaLower σv of the lower level: ±1 for an A1/A2 member or a single K'' = 0 level, 0 for an E level or an unsplit pair
 * @param moments transition moment of each group state from the lower state (only ≠ 0 matters)
 */
export function coupledLineAllowed(
  levels: CoupledLevels,
  index: number,
  jLower: number,
  kLower: number,
  sigmaLower: number,
  moments: Float64Array,
): boolean {
  const block = levels.block[index];
  const J = levels.J;
  let reach = 0;
  for (const k2 of kLower === 0 ? [0] : [kLower, -kLower])
    for (let i = 0; i < block.basisK.length; i++) {
      const q = block.basisK[i] - k2;
      if (q !== block.basisEll[i] || moments[block.basisState[i]] === 0) continue;
      if (honlLondonSigned(jLower, k2, J - jLower, q) > 0) reach++;
    }
  if (block.isMirrored) {
    for (const k2 of kLower === 0 ? [0] : [kLower, -kLower])
      for (let i = 0; i < block.basisK.length; i++) {
        const q = -block.basisK[i] - k2;
        if (q !== -block.basisEll[i] || moments[block.basisState[i]] === 0) continue;
        if (honlLondonSigned(jLower, k2, J - jLower, q) > 0) reach++;
      }
  }
  if (reach === 0) return false;
  if (block.isMirrored || sigmaLower === 0) return true;
  return levels.sigma[index] === -sigmaLower;
}

/** The group's moments from a lower state (for coupledLineAllowed). */
export function coupledMoments(species: SystemSpecies, lowerName: string, source: StateLevelSource): Float64Array {
  return groupMoments(species, lowerName, source);
}
