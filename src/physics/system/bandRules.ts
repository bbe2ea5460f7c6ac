import { ROVIB_POINT_GROUPS, rovibDipoleAllowed, rovibSpeciesList, type RovibPointGroup } from '../hamiltonian/rovibSymmetry';
import { honlLondonFactor } from '../honlLondon';
import type { LevelSet } from './levelTypes';

/**
 * Selection rules and line strengths between the labelled levels of two vibrational states.
 *
 * Each level stands for signed basis components (k, ℓ) (see levelComponents). The vibrational
 * transition moment of a symmetric top (or linear molecule) with ℓ = 0, ±1 states allows
 *   Δk = Δℓ, |Δℓ| <= 1   (k − ℓ is conserved),
 * which gives every case of the model: nondegenerate ↔ nondegenerate ΔK = 0 (parallel);
 * nondegenerate → degenerate Δk = ℓ' = ±1 (perpendicular; ΔK = +1 reaches the (+l) levels,
 * ΔK = −1 the (−l) levels and K' = 0); degenerate → nondegenerate Δk = −ℓ'' (perpendicular from a
 * degenerate lower state); degenerate → degenerate Δk = Δℓ = 0 (hot band within a degenerate
 * mode: (+l) ↔ (+l), (−l) ↔ (−l), ΔK = 0). Each component pair carries the symmetric-top
 * Hönl–London factor of its signed k'' and Δk; a line's strength is the sum over the components
 * of its two levels. Where levels carry tags, the sum is shared equally among the tag pairs
 * levelTagsAllowed accepts (for a linear molecule e ↔ e, f ↔ f in P and R, e ↔ f in Q).
 * Source: Herzberg II (1945) ch. IV, sec. 2 (selection rules ΔK = 0, Δℓ = 0 and ΔK = ±1, Δℓ = ±1 with
 * the same sign; Hönl–London factors eqs. (IV,60)–(IV,62), (IV,72)); P. R. Bunker and P. Jensen,
 * Molecular Symmetry and Spectroscopy, 2nd ed. (1998), ch. 14 (e/f parity rules for linear molecules).
 */

/** Band type that follows from the two states' degeneracy: ΔK = 0 when both are alike. */
export function systemBandType(isLowerDegenerate: boolean, isUpperDegenerate: boolean): 'parallel' | 'perpendicular' {
  return isLowerDegenerate === isUpperDegenerate ? 'parallel' : 'perpendicular';
}

/**
 * The signed components (k, ℓ) of the level (K, l) of a state: [k1, ℓ1, k2, ℓ2, ...].
 * Nondegenerate: (0, 0), or (K, 0) and (−K, 0). Degenerate: K = 0 → (0, +1), (0, −1); l = +1 →
 * (K, +1), (−K, −1); l = −1 → (K, −1), (−K, +1).
 * Source: Herzberg II (1945) ch. IV (each symmetric-top level with K > 0 is twofold, ±k).
 */
export function levelComponents(K: number, l: number, isDegenerate: boolean): number[] {
  if (!isDegenerate) return K === 0 ? [0, 0] : [K, 0, -K, 0];
  if (K === 0) return [0, 1, 0, -1];
  return l > 0 ? [K, 1, -K, -1] : [K, -1, -K, 1];
}

/**
 * Hönl–London factor of one signed component k'' → k'' + Δk, dimensionless.
 * The unsigned factor depends on k''·Δk only, so a negative k'' is the unsigned one with Δk reversed.
 * Source: Herzberg II (1945) eqs. (IV,60)–(IV,62), (IV,72) (physics/honlLondon.ts).
 * @param jLower J''
 * @param kLowerSigned k'' (signed)
 * @param deltaJ J' − J''
 * @param deltaK k' − k'' (−1, 0, +1)
 */
export function honlLondonSigned(jLower: number, kLowerSigned: number, deltaJ: number, deltaK: number): number {
  return honlLondonFactor(jLower, Math.abs(kLowerSigned), deltaJ, kLowerSigned >= 0 ? deltaK : -deltaK);
}

/**
 * Whether a transition may join a lower level tagged tagLower to an upper level tagged tagUpper.
 * e/f (linear molecules): P and R lines keep the tag, Q lines change it. An empty tag on either
 * side puts no condition. Other tags must match (a placeholder a later symmetry rule replaces).
 * Source: J. M. Brown et al., J. Mol. Spectrosc. 55, 500 (1975) (e/f labels); Bunker & Jensen
 * (1998) ch. 14 (parity selection rule + ↔ −).
 */
export function levelTagsAllowed(tagLower: string, tagUpper: string, deltaJ: number): boolean {
  if (tagLower === '' || tagUpper === '') return true;
  const isParity = (t: string) => t === 'e' || t === 'f';
  if (isParity(tagLower) && isParity(tagUpper)) return deltaJ === 0 ? tagLower !== tagUpper : tagLower === tagUpper;
  return tagLower === tagUpper;
}

/**
 * Every allowed transition between the levels of a lower set (J'') and an upper set (J') of two
 * states, with its strength (sum of Hönl–London factors over the component pairs, dimensionless).
 * @param lower levels of the lower state at J''
 * @param isLowerDegenerate lower state degenerate
 * @param upper levels of the upper state at J' (|J' − J''| <= 1)
 * @param isUpperDegenerate upper state degenerate
 *
 * With a point group, when both sets carry symmetry species (Hamiltonian providers), the tag rule
 * gives way to the symmetry rule Γ' ⊗ Γ'' ⊇ Γ* (rovibDipoleAllowed: A2 in C3v(M), A1'' in D3h(M);
 * it gives s ↔ a in a parallel band of an inverting XY3, A1 ↔ A2 between K = 3n pairs), and the
 * summed factor of a (K, l) group is shared by function: per component function it is
 * S/n (n = the group's signed components, levelComponents), a level of d functions (its
 * componentCount) carries d·S/n, divided among its allowed partners in proportion to theirs.
 * (A split pair reached from one level gets the whole d·S/n on the one member symmetry allows; an
 * unsplit A1/A2 pair gives each member half of S, as the closed-form level did in one.)
 * Source (symmetry rule): Bunker and Jensen (1998) ch. 14, from memory.
 * @param kMaxLower lower levels with K > kMaxLower give no lines
 * @param emit called once per allowed pair (indices into the sets, strength > 0)
 * @param pointGroup the species' point group, when declared (see above)
 */
export function bandTransitions(
  lower: LevelSet,
  isLowerDegenerate: boolean,
  upper: LevelSet,
  isUpperDegenerate: boolean,
  kMaxLower: number,
  emit: (lowerIndex: number, upperIndex: number, strength: number) => void,
  pointGroup?: RovibPointGroup,
): void {
  const bySymmetry = pointGroup !== undefined && lower.species !== undefined && upper.species !== undefined;
  const deltaJ = upper.J - lower.J;
  if (deltaJ < -1 || deltaJ > 1) return;
  const upperL = isUpperDegenerate ? [1, -1] : [0];
  const groupLower: number[] = [];
  const groupUpper: number[] = [];
  const targetK: number[] = [];
  const targetL: number[] = [];
  const targetS: number[] = [];
  for (let i = 0; i < lower.count; i++) {
    const K = lower.K[i];
    const l = lower.l[i];
    if (K > kMaxLower) continue;
    // Handle each (K, l) group once, at its first level.
    let seenBefore = false;
    for (let p = 0; p < i && !seenBefore; p++) seenBefore = lower.K[p] === K && lower.l[p] === l;
    if (seenBefore) continue;
    groupLower.length = 0;
    for (let p = i; p < lower.count; p++) if (lower.K[p] === K && lower.l[p] === l) groupLower.push(p);
    targetK.length = 0;
    targetL.length = 0;
    targetS.length = 0;
    const comps = levelComponents(K, l, isLowerDegenerate);
    for (let c = 0; c < comps.length; c += 2) {
      const k = comps[c];
      const ell = comps[c + 1];
      for (const ellUp of upperL) {
        const deltaL = ellUp - ell;
        if (deltaL < -1 || deltaL > 1) continue;
        const kUp = k + deltaL;
        const factor = honlLondonSigned(lower.J, k, deltaJ, deltaL);
        if (!(factor > 0)) continue;
        const KUp = Math.abs(kUp);
        const lUp = isUpperDegenerate ? Math.sign(kUp * ellUp) : 0;
        let t = 0;
        while (t < targetK.length && !(targetK[t] === KUp && targetL[t] === lUp)) t++;
        if (t === targetK.length) {
          targetK.push(KUp);
          targetL.push(lUp);
          targetS.push(0);
        }
        targetS[t] += factor;
      }
    }
    for (let t = 0; t < targetK.length; t++) {
      groupUpper.length = 0;
      for (let q = 0; q < upper.count; q++) if (upper.K[q] === targetK[t] && upper.l[q] === targetL[t]) groupUpper.push(q);
      if (bySymmetry) {
        const perFunction = targetS[t] / (comps.length / 2);
        for (const a of groupLower) {
          let partners = 0;
          for (const b of groupUpper)
            if (symmetryAllowed(pointGroup, upper.species![b], lower.species![a])) partners += upper.componentCount[b];
          if (partners === 0) continue;
          const levelTotal = perFunction * lower.componentCount[a];
          for (const b of groupUpper)
            if (symmetryAllowed(pointGroup, upper.species![b], lower.species![a]))
              emit(a, b, (levelTotal * upper.componentCount[b]) / partners);
        }
        continue;
      }
      let nPairs = 0;
      for (const a of groupLower) for (const b of groupUpper) if (levelTagsAllowed(lower.tag[a], upper.tag[b], deltaJ)) nPairs++;
      if (nPairs === 0) continue;
      const share = targetS[t] / nPairs;
      for (const a of groupLower) for (const b of groupUpper) if (levelTagsAllowed(lower.tag[a], upper.tag[b], deltaJ)) emit(a, b, share);
    }
  }
}

/** Every allowed (group, Γ', Γ'') of rovibDipoleAllowed, computed once at load (a fixed table). */
const DIPOLE_ALLOWED: ReadonlySet<string> = new Set(
  ROVIB_POINT_GROUPS.flatMap((g) =>
    rovibSpeciesList(g).flatMap((up) => rovibSpeciesList(g).flatMap((lo) => (rovibDipoleAllowed(g, up, lo) ? [`${g}|${up}|${lo}`] : []))),
  ),
);

/** rovibDipoleAllowed by table lookup. */
function symmetryAllowed(group: RovibPointGroup, speciesUpper: string, speciesLower: string): boolean {
  return DIPOLE_ALLOWED.has(`${group}|${speciesUpper}|${speciesLower}`);
}
