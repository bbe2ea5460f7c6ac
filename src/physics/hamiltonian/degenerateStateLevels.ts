import { eigenLabelsAssign } from './eigenLabels';
import {
  hamiltonianConstantsCheck,
  hamiltonianJCheck,
  type HamiltonianConstants,
  type HamiltonianLevel,
  type HamiltonianLevelSet,
} from './hamiltonianLevel';
import { hamiltonianTermsCheck } from './hamiltonianTermsCheck';
import { rotorPolynomialBasis, rotorPolynomialNames, type RotorShape } from './rotorPolynomial';
import { rovibGroupCheck, rovibSpeciesDegenerate, rovibSpeciesNondegenerate, type RovibPointGroup } from './rovibSymmetry';
import { tridiagonalEigen, tridiagonalEigenFast } from './symmetricEigen';

/** Options of degenerateStateLevels. */
export interface DegenerateStateOptions {
  shape: RotorShape;
  pointGroup: RovibPointGroup;
  /** Species of the vibrational state: 'E' (C3v), "E'" or "E''" (D3h). @default 'E' / "E'" */
  vibSpecies?: string;
  /** Largest K listed (the basis always holds every k, so energies do not depend on it). @default J */
  kMax?: number;
  /** Compute ∂E/∂p (Hellmann–Feynman). @default true */
  withDerivatives?: boolean;
}

/** The interaction constants of a degenerate state beyond the rotor polynomial. */
export const DEGENERATE_STATE_TERMS = ['zeta', 'etaJ', 'etaK', 'q22', 'q22J', 'q12'] as const;

/** Constant names of a degenerate state: origin, rotor polynomial, then DEGENERATE_STATE_TERMS. */
export function degenerateStateParameterNames(shape: RotorShape): string[] {
  return ['origin', ...rotorPolynomialNames(shape), ...DEGENERATE_STATE_TERMS];
}

const N_POLY = 14;
const I_ORIGIN = 0;
const I_UNIQUE = 2; // origin, B, A|C, ...
const I_ZETA = 1 + N_POLY;
const I_ETAJ = I_ZETA + 1;
const I_ETAK = I_ZETA + 2;
const I_Q22 = I_ZETA + 3;
const I_Q22J = I_ZETA + 4;
const I_Q12 = I_ZETA + 5;
const N_PARAMS = I_Q12 + 1;

/** A basis function |k, ℓ⟩ of a chain. */
interface ChainState {
  k: number;
  ell: 1 | -1;
}

/**
 * The levels of one J of a doubly degenerate (E) vibrational state with v_t = 1 (ℓ = ±1) of a
 * symmetric top, by diagonalising the effective Hamiltonian in the |J, k, ℓ⟩ basis.
 *
 * Diagonal (x = J(J+1); U = A for a prolate, C for an oblate top):
 *   ⟨k,ℓ|H|k,ℓ⟩ = origin + F(J,k) − 2Uζ kℓ + ηJ x kℓ + ηK k³ℓ
 * with F the rotor polynomial (rotorPolynomial.ts).
 * ℓ(2,2) interaction (Δk = Δℓ = ±2), with its J dependence q22(J) = q22 + q22J·x:
 *   ⟨k−2, ℓ=−1|H|k, ℓ=+1⟩ = −½ q22(J) √[x − k(k−1)] √[x − (k−1)(k−2)]
 * ℓ(2,−1) interaction (Δk = ∓1, Δℓ = ±2), C3v only:
 *   ⟨k−1, ℓ=+1|H|k, ℓ=−1⟩ = q12 (2k−1) √[x − k(k−1)]
 * Signs and phases: the overall sign of each ℓ-type constant is a convention (authors differ); here
 * the q22 sign is chosen so that the K = 1 (+l) pair splits into levels at ±½ q22 J(J+1) with the
 * levels reached by P and R lines from K'' = 0 at +½ q22 J(J+1), as the project's linear-molecule q;
 * the basis phases are those in which σv acts as |J,k,ℓ⟩ → (−1)^{J+k} |J,−k,−ℓ⟩, which make both
 * interactions real. With q22 = q12 = 0 the levels are the first-order ones of DEVELOPERS.md,
 * origin + F(J,K) ∓ 2UζK.
 * Source: diagonal terms and the v_t = 1 forms of the ℓ(2,2) and ℓ(2,−1) matrix elements as in
 * Papoušek and Aliev (1982), chapter on degenerate vibrational states of symmetric tops, and
 * G. J. Cartwright and I. M. Mills, J. Mol. Spectrosc. (1970) (ℓ-type doubling and resonance
 * operators; volume and page not re-checked), from memory; the √ factors are the standard ⟨J,k±1|J±|J,k⟩ ladder elements.
 *
 * Structure: H conserves (k − ℓ) mod 3, and in each class the basis ordered by m = k − ℓ
 * (descending, ℓ = +1 before ℓ = −1) is a chain with ℓ(2,2) links inside one m and ℓ(2,−1) links
 * from m to m − 3, i.e. a tridiagonal matrix. Class (k − ℓ) ≡ 0 holds the A1/A2 pairs; σv maps it
 * onto itself and is used to fold it into two half-chains (σv = ±1). Classes 1 and 2 are mirror
 * images (E levels); only class 1 is diagonalised. Every block is solved by tridiagonalEigenFast, and
 * each eigenvector is labelled (eigenLabelsAssign) by its dominant |k, ℓ⟩: K = |k|, l = sign(kℓ).
 * Derivatives ∂E/∂p = vᵀ (∂H/∂p) v (Hellmann–Feynman theorem; the basis does not depend on p).
 * @param constants origin, rotor polynomial and DEGENERATE_STATE_TERMS, cm⁻¹ (ζ dimensionless)
 * @param J rotational quantum number
 * @returns the levels sorted by K, then l (+1 first), then tag; energies in cm⁻¹
 */
export function degenerateStateLevels(constants: HamiltonianConstants, J: number, options: DegenerateStateOptions): HamiltonianLevelSet {
  const where = 'degenerateStateLevels';
  const group = rovibGroupCheck(options.pointGroup, where);
  const names = degenerateStateParameterNames(options.shape);
  hamiltonianConstantsCheck(where, constants, names);
  hamiltonianJCheck(where, J);
  const refusals = hamiltonianTermsCheck(group, constants);
  if (refusals.length > 0) throw new Error(`${where}: ${refusals.join('; ')}`);
  const vib = options.vibSpecies ?? (group === 'C3v' ? 'E' : "E'");
  const allowedVib = group === 'C3v' ? ['E'] : ["E'", "E''"];
  if (!allowedVib.includes(vib))
    throw new Error(`${where}: vibSpecies must be ${allowedVib.join(' or ')} in ${group}, got ${JSON.stringify(vib)}`);
  const vibSigmaH = vib === "E''" ? -1 : 1;
  const p = names.map((n) => constants[n] ?? 0);
  const kMax = Math.min(J, options.kMax ?? J);
  const withDerivatives = options.withDerivatives ?? true;
  const ctx: BlockContext = { J, x: J * (J + 1), p, withDerivatives, basis: new Float64Array(N_POLY) };

  const levels: HamiltonianLevel[] = [];
  // E levels: class (k − ℓ) ≡ 1 (mod 3).
  solveChain(ctx, eChainOf(J), 0, (state) => rovibSpeciesDegenerate(group, parity(state.k) * vibSigmaH), 2, '', kMax, levels);
  // A1/A2 levels: class 0, folded by σv.
  const aChain = aChainOf(J);
  for (const sigma of [1, -1]) {
    solveChain(ctx, aChain, sigma, (state) => rovibSpeciesNondegenerate(group, sigma, parity(state.k) * vibSigmaH), 1, null, kMax, levels);
  }
  levels.sort((a, b) => a.K - b.K || b.l - a.l || (a.tag < b.tag ? -1 : a.tag > b.tag ? 1 : 0));
  return { parameterNames: names, levels };
}

/** Energies of every level of one J with their species, without labels (degenerateStateEnergies). */
export interface StateEnergies {
  /** Energies, cm⁻¹ (unsorted). */
  energyCm1: number[];
  /** Symmetry species of each level. */
  species: string[];
  /** Basis functions each level stands for (1, or 2 for an E level). */
  degeneracy: number[];
}

/**
 * The energies and species of every level of one J of an E state — the same multiset as
 * degenerateStateLevels gives, without eigenvectors, labels or derivatives: each chain is split where
 * its coupling is exactly 0 (always between the ℓ(2,2) pairs in D3h, where q12 is forbidden) and each
 * piece solved by QL without vectors. The species is constant on a piece (C3v: E, or A1/A2 by σv on
 * the folded A chain; D3h: a piece keeps the parity of k). Meant for sums over all levels (partition
 * functions), where it is several times faster.
 * Source: as degenerateStateLevels.
 * @param constants origin, rotor polynomial and DEGENERATE_STATE_TERMS, cm⁻¹ (ζ dimensionless)
 * @param J rotational quantum number
 */
export function degenerateStateEnergies(constants: HamiltonianConstants, J: number, options: DegenerateStateOptions): StateEnergies {
  const where = 'degenerateStateEnergies';
  const group = rovibGroupCheck(options.pointGroup, where);
  const names = degenerateStateParameterNames(options.shape);
  hamiltonianConstantsCheck(where, constants, names);
  hamiltonianJCheck(where, J);
  const refusals = hamiltonianTermsCheck(group, constants);
  if (refusals.length > 0) throw new Error(`${where}: ${refusals.join('; ')}`);
  const vib = options.vibSpecies ?? (group === 'C3v' ? 'E' : "E'");
  const vibSigmaH = vib === "E''" ? -1 : 1;
  const p = names.map((n) => constants[n] ?? 0);
  const ctx: BlockContext = { J, x: J * (J + 1), p, withDerivatives: false, basis: new Float64Array(N_POLY) };
  const out: StateEnergies = { energyCm1: [], species: [], degeneracy: [] };
  const solve = (chain: ChainState[], sigma: number, speciesOf: (first: ChainState) => string, degeneracy: number) => {
    const n = chain.length;
    if (n === 0) return;
    const { diag, off } = chainMatrix(ctx, chain, sigma, null, null);
    let start = 0;
    for (let i = 0; i < n; i++) {
      if (i < n - 1 && off[i] !== 0) continue;
      const values = tridiagonalEigen(diag.subarray(start, i + 1), off.subarray(start, i), false).values;
      const species = speciesOf(chain[start]);
      for (const v of values) {
        out.energyCm1.push(v);
        out.species.push(species);
        out.degeneracy.push(degeneracy);
      }
      start = i + 1;
    }
  };
  solve(eChainOf(J), 0, (st) => rovibSpeciesDegenerate(group, parity(st.k) * vibSigmaH), 2);
  const aChain = aChainOf(J);
  for (const sigma of [1, -1]) solve(aChain, sigma, (st) => rovibSpeciesNondegenerate(group, sigma, parity(st.k) * vibSigmaH), 1);
  return out;
}

/** The E chain of J: class (k − ℓ) ≡ 1 (mod 3), ordered by m = k − ℓ descending, ℓ = +1 first. */
function eChainOf(J: number): ChainState[] {
  const eChain: ChainState[] = [];
  for (let m = J + 1; m >= -J - 1; m--) {
    if (mod3(m) !== 1) continue;
    if (Math.abs(m + 1) <= J) eChain.push({ k: m + 1, ell: 1 });
    if (Math.abs(m - 1) <= J) eChain.push({ k: m - 1, ell: -1 });
  }
  return eChain;
}

/** The A chain of J (class 0, representatives with k >= 1, folded by σv): |1,+1⟩, |2,−1⟩, |4,+1⟩, |5,−1⟩, … */
function aChainOf(J: number): ChainState[] {
  const aChain: ChainState[] = [];
  if (J >= 1) aChain.push({ k: 1, ell: 1 });
  for (let m = 3; m - 1 <= J; m += 3) {
    aChain.push({ k: m - 1, ell: -1 });
    if (m + 1 <= J) aChain.push({ k: m + 1, ell: 1 });
  }
  return aChain;
}

interface BlockContext {
  J: number;
  x: number;
  p: number[];
  withDerivatives: boolean;
  basis: Float64Array;
}

function mod3(m: number): number {
  return ((m % 3) + 3) % 3;
}

function parity(k: number): number {
  return k % 2 === 0 ? 1 : -1;
}

/** Diagonal element of |k, ℓ⟩ and (optionally) its derivatives into d[i·n + row] for every parameter i. */
function diagonalElement(ctx: BlockContext, k: number, ell: number, d: Float64Array | null, n: number, row: number): number {
  const { p, x, basis } = ctx;
  rotorPolynomialBasis(ctx.J, k, basis);
  const kl = k * ell;
  const unique = p[I_UNIQUE];
  let e = p[I_ORIGIN];
  for (let i = 0; i < N_POLY; i++) e += p[1 + i] * basis[i];
  e += -2 * unique * p[I_ZETA] * kl + p[I_ETAJ] * x * kl + p[I_ETAK] * k * k * kl;
  if (d) {
    d[I_ORIGIN * n + row] = 1;
    for (let i = 0; i < N_POLY; i++) d[(1 + i) * n + row] = basis[i];
    d[I_UNIQUE * n + row] += -2 * p[I_ZETA] * kl;
    d[I_ZETA * n + row] = -2 * unique * kl;
    d[I_ETAJ * n + row] = x * kl;
    d[I_ETAK * n + row] = k * k * kl;
  }
  return e;
}

/**
 * The (J, k) factor of the ℓ(2,2) element ⟨k−2, ℓ=−1|H|k, ℓ=+1⟩ = q22(J) × this (see degenerateStateLevels).
 * @param x J(J+1)
 * @param k signed k of the |k, +1⟩ function
 */
export function ellQ22Factor(x: number, k: number): number {
  return -0.5 * Math.sqrt(Math.max(0, x - k * (k - 1))) * Math.sqrt(Math.max(0, x - (k - 1) * (k - 2)));
}

/**
 * The (J, k) factor of the ℓ(2,−1) element ⟨k−1, ℓ=+1|H|k, ℓ=−1⟩ = q12 × this (see degenerateStateLevels).
 * @param x J(J+1)
 * @param k signed k of the |k, −1⟩ function
 */
export function ellQ12Factor(x: number, k: number): number {
  return (2 * k - 1) * Math.sqrt(Math.max(0, x - k * (k - 1)));
}

/** ℓ(2,2) element between |k, +1⟩ and |k−2, −1⟩, with derivatives. */
function q22Element(ctx: BlockContext, k: number, d: Float64Array | null, n: number, row: number, scale = 1): number {
  const { x, p } = ctx;
  const f = scale * ellQ22Factor(x, k);
  if (d) {
    d[I_Q22 * n + row] += f;
    d[I_Q22J * n + row] += f * x;
  }
  return f * (p[I_Q22] + p[I_Q22J] * x);
}

/** ℓ(2,−1) element between |k, −1⟩ and |k−1, +1⟩, with derivative. */
function q12Element(ctx: BlockContext, k: number, d: Float64Array | null, n: number, row: number): number {
  const f = ellQ12Factor(ctx.x, k);
  if (d) d[I_Q12 * n + row] += f;
  return f * ctx.p[I_Q12];
}

/**
 * Build one tridiagonal chain, diagonalise it and append its labelled levels.
 * sigma = 0: an E chain; ±1: the folded A chain with σv = sigma (its first state is |1, +1⟩).
 */
function solveChain(
  ctx: BlockContext,
  chain: ChainState[],
  sigma: number,
  speciesOf: (dominant: ChainState) => string,
  degeneracy: 1 | 2,
  fixedTag: string | null,
  kMax: number,
  out: HamiltonianLevel[],
): void {
  const n = chain.length;
  if (n === 0) return;
  const dDiag = ctx.withDerivatives ? new Float64Array(N_PARAMS * n) : null;
  const dOff = ctx.withDerivatives ? new Float64Array(N_PARAMS * Math.max(1, n - 1)) : null;
  const nOff = Math.max(1, n - 1);
  const { diag, off } = chainMatrix(ctx, chain, sigma, dDiag, dOff);
  const eig = tridiagonalEigenFast(diag, off);
  const labels = eigenLabelsAssign(eig.vectors, n);
  for (let j = 0; j < n; j++) {
    const dominant = chain[labels.basisIndex[j]];
    const K = Math.abs(dominant.k);
    if (K > kMax) continue;
    const kl = dominant.k * dominant.ell;
    const species = speciesOf(dominant);
    const derivatives = new Float64Array(N_PARAMS);
    if (dDiag && dOff) {
      const v = eig.vectors.subarray(j * n, j * n + n);
      for (let q = 0; q < N_PARAMS; q++) {
        let s = 0;
        for (let i = 0; i < n; i++) s += v[i] * v[i] * dDiag[q * n + i];
        // Only the ℓ-type constants appear off the diagonal.
        if (q >= I_Q22) for (let i = 0; i < n - 1; i++) s += 2 * v[i] * v[i + 1] * dOff[q * nOff + i];
        derivatives[q] = s;
      }
    }
    out.push({
      J: ctx.J,
      K,
      // K = 0 (kℓ = 0) is l = 0, the system engine's label (levelTypes.ts).
      l: kl > 0 ? 1 : kl < 0 ? -1 : 0,
      tag: fixedTag ?? species,
      energyCm1: eig.values[j],
      species,
      degeneracy,
      labelWeight: labels.weight[j],
      derivatives,
    });
  }
}

/** The tridiagonal matrix of a chain (sigma ±1: the folded A chain), with its derivatives into dDiag/dOff when given. */
function chainMatrix(
  ctx: BlockContext,
  chain: ChainState[],
  sigma: number,
  dDiag: Float64Array | null,
  dOff: Float64Array | null,
): { diag: Float64Array; off: Float64Array } {
  const n = chain.length;
  const nOff = Math.max(1, n - 1);
  const diag = new Float64Array(n);
  const off = new Float64Array(Math.max(0, n - 1));
  for (let i = 0; i < n; i++) {
    const s = chain[i];
    diag[i] = diagonalElement(ctx, s.k, s.ell, dDiag, n, i);
    if (i < n - 1) {
      const t = chain[i + 1];
      // Chain neighbours are linked by ℓ(2,2) (Δk = 2) or ℓ(2,−1) (Δk = 1); both orders occur.
      if (s.ell === 1 && t.ell === -1 && t.k === s.k - 2) off[i] = q22Element(ctx, s.k, dOff, nOff, i);
      else if (s.ell === -1 && t.ell === 1 && t.k === s.k + 2) off[i] = q22Element(ctx, t.k, dOff, nOff, i);
      else if (s.ell === -1 && t.ell === 1 && t.k === s.k - 1) off[i] = q12Element(ctx, s.k, dOff, nOff, i);
      else if (s.ell === 1 && t.ell === -1 && t.k === s.k + 1) off[i] = q12Element(ctx, t.k, dOff, nOff, i);
    }
  }
  if (sigma !== 0) {
    // ⟨φ|H|φ⟩ of (|1,+1⟩ + σ (−1)^{J+1} |−1,−1⟩)/√2 gains σ (−1)^{J+1} times the ℓ(2,2) element of the pair.
    const phase = sigma * (ctx.J % 2 === 0 ? -1 : 1);
    diag[0] += q22Element(ctx, 1, dDiag, n, 0, phase);
  }
  return { diag, off };
}
