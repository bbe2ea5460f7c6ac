/**
 * Matrix elements of the higher-order terms of a coupled group that coupledLevels adds to each class
 * block after its first set (the constants interactionTerms.ts lists after C2K and after h3). They were
 * added for the high-J, high-K levels of the PH3 ν2/ν4 dyad (test/fit/ph3Dyad.test.ts).
 *
 * Basis and phases as in coupledLevels.ts: |s; J, k⟩ for a nondegenerate state s, |d; J, k, ℓ⟩ for a
 * degenerate state d; x = J(J+1); L_n(m) = Π_{i=0}^{n−1} √[x − (m+i)(m+i+1)] is the ladder factor of
 * J₊ⁿ from m to m + n (L_n(m) = L_n(−m−n), so it is the same read from either end).
 *
 * Nondegenerate state, Δk = ±3 (ε, the ΔK = ±3 term of a C3v top):
 *   ⟨s; k+3|H|s; k⟩ = eps · (2k + 3) · L_3(k)
 * Coriolis, nondegenerate s ↔ degenerate d (with the terms of coupledLevels.ts):
 *   Δk = ∓2, Δℓ = ±1, next J and K dependence:  ⟨d; k∓2, ±1|H|s; k⟩ += (C2JJ x² + C2JK x (k ∓ 1)²) · L_2
 *   Δk = ±4, Δℓ = ±1:                          ⟨d; k±4, ±1|H|s; k⟩ = C4 · L_4
 *   Δk = ∓5, Δℓ = ±1:                          ⟨d; k∓5, ±1|H|s; k⟩ = ±C5 · L_5
 * Every term keeps k − ℓ (mod 3) (Δk − Δℓ = 0, 3, −6, …), as C3v requires of the dyad's Hamiltonian
 * in the convention where the dipole has Δk = Δℓ. The signs follow from requiring each term to commute
 * with σv (|s; k⟩ → (−1)^{J+k}|s; −k⟩, |d; k, ℓ⟩ → (−1)^{J+k}|d; −k, −ℓ⟩): an element with an odd Δk
 * changes sign with ℓ (as C1 does), one with an even Δk does not (as C2), and the Δk = ±3 element
 * within a state must be odd under k → −k − 3, hence (2k + 3).
 * Source: the operator forms (J₊ⁿ ladder products times powers of J² and J_z, symmetrised) are the
 * power-series terms of the reduced effective Hamiltonians of C3v XY3 dyads, as in D. Papoušek and
 * M. R. Aliev, Molecular Vibrational–Rotational Spectra (1982), chapters on symmetric-top resonances,
 * and the PH3 ν2/ν4 analyses of G. Tarrago and co-workers (J. Mol. Spectrosc., 1990s) — from memory,
 * volume and page not re-checked; which of them the PH3 lines need was decided by residual patterns
 * and the fit (test/fit/ph3Dyad.test.ts); the σv sign rule worked out here.
 */
import { CORIOLIS_AE_NAMES, coupledStateParameterNames } from './interactionTerms';

/** Π_{i=0}^{n−1} √[x − (m+i)(m+i+1)]: the ladder factor of J₊ⁿ from m (0 when the ladder leaves |k| <= J). */
function ladder(x: number, m: number, n: number): number {
  let f = 1;
  for (let i = 0; i < n && f !== 0; i++) f *= Math.sqrt(Math.max(0, x - (m + i) * (m + i + 1)));
  return f;
}

const I_C2JJ = CORIOLIS_AE_NAMES.indexOf('C2JJ');
const I_C2JK = CORIOLIS_AE_NAMES.indexOf('C2JK');
const I_C4 = CORIOLIS_AE_NAMES.indexOf('C4');
const I_C5 = CORIOLIS_AE_NAMES.indexOf('C5');

/** Where the elements go: add (i, j) with its value (false, and nothing added, when j < 0: the partner is not in the block); then its ∂H_ij/∂p terms, only when withDerivatives. */
export interface ElementSink {
  readonly withDerivatives: boolean;
  add(i: number, j: number, value: number): boolean;
  term(param: number, coef: number): void;
}

/**
 * Push every nonzero element of the higher-order terms of one class block (each pair once).
 * @param group states (degeneracy), interactions and parameter offsets of the group (coupledGroupCreate)
 * @param x J(J+1)
 * @param p the group's parameter vector (cm⁻¹)
 * @param basis the block's basis functions
 * @param find index of a basis function in the block, or −1 when it is not there
 * @param sink receives element (i, j) with its value (cm⁻¹) and, when asked, its terms (parameter index, ∂H_ij/∂p)
 */
export function coupledHigherTermElements(
  group: {
    shape: 'prolate' | 'oblate';
    states: readonly { isDegenerate: boolean }[];
    interactions: readonly { type: string; stateA: number; stateB: number }[];
    stateOffset: readonly number[];
    interactionOffset: readonly number[];
  },
  x: number,
  p: ArrayLike<number>,
  basis: readonly { state: number; k: number; ell: number }[],
  find: (state: number, k: number, ell: number) => number,
  sink: ElementSink,
): void {
  const withDerivatives = sink.withDerivatives;
  const iEps = coupledStateParameterNames(group.shape, false).indexOf('eps');
  // |k| <= J bounds every partner; x = J(J+1) gives J back.
  const J = Math.round((Math.sqrt(4 * x + 1) - 1) / 2);
  basis.forEach((b, i) => {
    if (group.states[b.state].isDegenerate || b.k + 3 > J) return;
    const o = group.stateOffset[b.state] + iEps;
    const f = ladder(x, b.k, 3) * (2 * b.k + 3);
    if (f !== 0 && sink.add(i, find(b.state, b.k + 3, 0), p[o] * f) && withDerivatives) sink.term(o, f);
  });
  group.interactions.forEach((it, n) => {
    const a = group.states[it.stateA];
    const d = group.states[it.stateB];
    if (it.type !== 'coriolis' || a.isDegenerate === d.isDegenerate) return;
    const s = a.isDegenerate ? it.stateB : it.stateA;
    const dg = a.isDegenerate ? it.stateA : it.stateB;
    const o = group.interactionOffset[n];
    basis.forEach((b, i) => {
      if (b.state !== s) return;
      const k = b.k;
      for (let sign = 1; sign >= -1; sign -= 2) {
        // Δk = ∓2, Δℓ = ±1: x² and x·(k ∓ 1)² on C2 (the pair's mean k squared, σv-symmetric).
        const r2 = ladder(x, sign > 0 ? k - 2 : k, 2);
        if (r2 !== 0) {
          const kMid2 = (k - sign) ** 2;
          if (sink.add(i, find(dg, k - 2 * sign, sign), r2 * (p[o + I_C2JJ] * x * x + p[o + I_C2JK] * x * kMid2)) && withDerivatives) {
            sink.term(o + I_C2JJ, r2 * x * x);
            sink.term(o + I_C2JK, r2 * x * kMid2);
          }
        }
        // Δk = ±4, Δℓ = ±1 (even Δk: the same sign both ways).
        if (Math.abs(k + 4 * sign) <= J) {
          const r4 = ladder(x, sign > 0 ? k : k - 4, 4);
          if (r4 !== 0 && sink.add(i, find(dg, k + 4 * sign, sign), r4 * p[o + I_C4]) && withDerivatives) sink.term(o + I_C4, r4);
        }
        // Δk = ∓5, Δℓ = ±1 (odd Δk: the sign of ℓ).
        if (Math.abs(k - 5 * sign) <= J) {
          const r5 = sign * ladder(x, sign > 0 ? k - 5 : k, 5);
          if (r5 !== 0 && sink.add(i, find(dg, k - 5 * sign, sign), r5 * p[o + I_C5]) && withDerivatives) sink.term(o + I_C5, r5);
        }
      }
    });
  });
}
