import type { HamiltonianConstants } from './hamiltonianLevel';
import type { RovibPointGroup } from './rovibSymmetry';

/**
 * Which interaction terms of a degenerate (E) vibrational state a point group allows, as
 * refusals in words (empty list = everything given is allowed).
 *
 * Rule: a term connecting |k, ℓ⟩ with |k + Δk, ℓ + Δℓ⟩ survives C3 only if Δk − Δℓ ≡ 0 (mod 3); in
 * D3h, σh (equivalent rotation R_z^π, which multiplies |k⟩ by (−1)^k and leaves the ℓ-pair of an E'
 * or E'' vibration with a common sign) also requires Δk even. So
 *   - ℓ(2,2)  (q22, q22J; Δk = ±2, Δℓ = ±2): allowed in C3v and D3h;
 *   - ℓ(2,−1) (q12; Δk = ∓1, Δℓ = ±2): allowed in C3v, forbidden in D3h (Δk odd).
 * Source: the rule Δ(k − ℓ) ≡ 0 (mod 3) for C3v tops: Papoušek and Aliev (1982), chapter on
 * vibration–rotation interactions in degenerate states (from memory); the Δk-even rule for D3h is
 * derived here from the equivalent rotation of σh (rovibSymmetry.ts conventions).
 * @param group the molecule's point group
 * @param constants the state's constants by file key
 * @returns one sentence per disallowed nonzero constant
 */
export function hamiltonianTermsCheck(group: RovibPointGroup, constants: HamiltonianConstants): string[] {
  const out: string[] = [];
  if (group === 'D3h' && (constants.q12 ?? 0) !== 0) {
    out.push(
      `q12 (the ℓ(2,−1) interaction, Δk = ∓1 with Δℓ = ±2) is not allowed in D3h: the horizontal mirror plane ` +
        `makes every term with odd Δk vanish inside an E' or E'' state; set q12 to 0, or give the molecule C3v symmetry if it is not planar`,
    );
  }
  return out;
}
