import type { HamiltonianLevel } from './hamiltonianLevel';
import { rovibDipoleAllowed, rovibGroupCheck, type RovibPointGroup } from './rovibSymmetry';
import { levelSpinWeight, type SpinStatistics } from './spinStatistics';

/** Options of transitionsAllowed. */
export interface TransitionsAllowedOptions {
  pointGroup: RovibPointGroup;
  /** parallel: ΔK = 0 (and Δl = 0); perpendicular: ΔK = ±1 with the ℓ label rule below. */
  band: 'parallel' | 'perpendicular';
  /** When given, pairs with a level of zero statistical weight are dropped. */
  spin?: SpinStatistics;
}

/** One allowed pair of levels (indices into the upper and lower arrays). */
export interface AllowedTransition {
  upper: number;
  lower: number;
  /** J' − J'': −1 (P), 0 (Q), +1 (R). */
  deltaJ: -1 | 0 | 1;
  /** K' − K'' (unsigned K): −1, 0 or +1. */
  deltaK: -1 | 0 | 1;
}

/**
 * Every electric-dipole transition allowed between two level sets:
 *   - ΔJ = 0, ±1, not J' = J'' = 0;
 *   - symmetry: Γ' ⊗ Γ'' contains Γ* (A2 in C3v(M), A1'' in D3h(M); rovibDipoleAllowed). This alone
 *     gives the s ↔ a rule of a parallel band of an inverting XY3 (ν2 of NH3: s←a and a←s) and
 *     s ↔ s, a ↔ a in a perpendicular one, the A1 ↔ A2 rule of the K = 3n pairs, and no Q line
 *     from K = 0 of a parallel band;
 *   - band type: parallel ΔK = 0 with equal ℓ labels; perpendicular ΔK = ±1 where, between a
 *     nondegenerate and a degenerate state, the degenerate level must be the (+l) one when its K is
 *     the larger and the (−l) one when it is the smaller (Δk = Δℓ); K = 0 of a degenerate state (l = 0) is
 *     reached only from K = 1 (ΔK = −1), which needs no l rule.
 * Source: Herzberg II (1945) ch. IV (ΔJ, ΔK, Δk = Δℓ rules); Bunker and Jensen (1998) ch. 14 (symmetry rule); from memory.
 * @returns the allowed pairs, ordered by upper then lower index
 */
export function transitionsAllowed(
  upper: readonly HamiltonianLevel[],
  lower: readonly HamiltonianLevel[],
  options: TransitionsAllowedOptions,
): AllowedTransition[] {
  const group = rovibGroupCheck(options.pointGroup, 'transitionsAllowed');
  const weightOk = (lev: HamiltonianLevel) => !options.spin || levelSpinWeight(options.spin, lev) > 0;
  const out: AllowedTransition[] = [];
  const lowerOk = lower.map(weightOk);
  // Lower levels by J, so each upper level looks at J' − 1 … J' + 1 only.
  const byJ = new Map<number, number[]>();
  lower.forEach((lo, il) => {
    if (!byJ.has(lo.J)) byJ.set(lo.J, []);
    byJ.get(lo.J)!.push(il);
  });
  upper.forEach((up, iu) => {
    if (!weightOk(up)) return;
    const candidates = [up.J - 1, up.J, up.J + 1].flatMap((j) => byJ.get(j) ?? []).sort((a, b) => a - b);
    candidates.forEach((il) => {
      const lo = lower[il];
      if (!lowerOk[il]) return;
      const dJ = up.J - lo.J;
      if (Math.abs(dJ) > 1 || (up.J === 0 && lo.J === 0)) return;
      const dK = up.K - lo.K;
      if (options.band === 'parallel') {
        if (dK !== 0 || up.l !== lo.l) return;
      } else {
        if (Math.abs(dK) !== 1) return;
        if (lo.l === 0 && up.l !== 0 && up.l !== dK) return;
        if (up.l === 0 && lo.l !== 0 && lo.l !== -dK) return;
      }
      if (!rovibDipoleAllowed(group, up.species, lo.species)) return;
      out.push({ upper: iu, lower: il, deltaJ: dJ as -1 | 0 | 1, deltaK: dK as -1 | 0 | 1 });
    });
  });
  return out;
}
