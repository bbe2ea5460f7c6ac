import {
  hamiltonianConstantsCheck,
  hamiltonianJCheck,
  type HamiltonianConstants,
  type HamiltonianLevel,
  type HamiltonianLevelSet,
} from './hamiltonianLevel';
import { rotorPolynomialBasis, rotorPolynomialNames, type RotorShape } from './rotorPolynomial';
import { eigenLabelsAssign } from './eigenLabels';
import {
  inversionVibSpecies,
  rovibLevelSpecies,
  rovibSpeciesDegenerate,
  rovibSpeciesDimension,
  rovibSpeciesNondegenerate,
} from './rovibSymmetry';
import { tridiagonalEigenFast } from './symmetricEigen';

/** Options of inversionStateLevels. */
export interface InversionStateOptions {
  /** Pyramidal XY3 tops are oblate (NH3) but either shape is accepted. */
  shape: RotorShape;
  /** C3v species of the vibrational state, one-dimensional. @default 'A1' */
  vibSpecies?: 'A1' | 'A2';
  /** Largest K listed. @default J */
  kMax?: number;
}

/**
 * Constant names of an inversion-doubled state: the mean term-value constants (origin and the
 * rotor polynomial) and, with the prefix 'inv', their differences a − s: 'inv' is the splitting
 * Δ0 of the J = K = 0 pair, 'invB', 'invC' (or 'invA'), 'invDJ', … its J and K dependence.
 */
export function inversionStateParameterNames(shape: RotorShape): string[] {
  const mean = ['origin', ...rotorPolynomialNames(shape)];
  return [...mean, 'inv', ...rotorPolynomialNames(shape).map((n) => `inv${n}`), 'eps3', 'eps3J'];
}

/**
 * The levels of one J of an inversion-doubled nondegenerate state of a pyramidal XY3 top, in
 * D3h(M). Every (J, K) gives a lower component s and an upper component a:
 *
 *   E_s,a(J,K) = origin + F(J,K) ∓ ½ Δ(J,K),   Δ(J,K) = inv + F_inv(J,K),
 *
 * with F the rotor polynomial of the mean constants and F_inv the same polynomial of the 'inv…'
 * constants, so Δ(J,K) = Δ0 + invB·J(J+1) + (invC − invB)·K² − invDJ·J²(J+1)² − …; this is the
 * same as giving each component its own constants (p_s = p − ½ inv_p, p_a = p + ½ inv_p).
 * Optional ΔK = ±3 interaction between the components (x = J(J+1)), the s ↔ a term that D3h(M) allows:
 *   ⟨k+3, a|H|k, s⟩ = ⟨k+3, s|H|k, a⟩ = (eps3 + eps3J·x) (2k+3) √{[x − k(k+1)][x − (k+1)(k+2)][x − (k+2)(k+3)]}
 * (the anticommutator {J_z, J_±³} form, which is the real σv-invariant one in these phases; from memory,
 * as used for NH3 in the trade; sign conventions differ). With it, each J is diagonalised in chains
 * k, k ± 3, … of alternating s/a (tridiagonal; the K = 3n chains folded by σv) and the levels are
 * labelled by their dominant (K, s/a); its derivative at eps3 = 0 is 0 (second-order effect), so a fit
 * must start it away from 0.
 * Species: s has the vibrational species Γ', a has Γ' ⊗ A2'' (inversionVibSpecies), times the
 * rotational species; levels of zero spin weight (e.g. one of each K = 0 pair of ¹⁴NH3) are still
 * listed, with their species, so a caller's statistics decide.
 * Source: the power-series expansion of the inversion splitting in J(J+1) and K² is common
 * practice in analyses of the NH3 ground and v2 states (Papoušek and Aliev (1982), chapter on
 * nonrigid molecules; from memory, no equation number); D3h(M) species: Bunker and Jensen (1998)
 * ch. 15 (from memory, checked in the tests against the labels of empirical ¹⁴NH3 levels).
 * @param constants mean and 'inv…' constants, cm⁻¹ (absent = 0)
 * @param J rotational quantum number
 * @returns levels by K ascending then s before a, energies in cm⁻¹
 */
export function inversionStateLevels(constants: HamiltonianConstants, J: number, options: InversionStateOptions): HamiltonianLevelSet {
  const where = 'inversionStateLevels';
  const names = inversionStateParameterNames(options.shape);
  hamiltonianConstantsCheck(where, constants, names);
  hamiltonianJCheck(where, J);
  const vib = options.vibSpecies ?? 'A1';
  if (vib !== 'A1' && vib !== 'A2') throw new Error(`${where}: vibSpecies must be A1 or A2, got ${JSON.stringify(vib)}`);
  const values = names.map((n) => constants[n] ?? 0);
  const kTop = Math.min(J, options.kMax ?? J);
  if (values[I_EPS3] !== 0 || values[I_EPS3J] !== 0)
    return { parameterNames: names, levels: coupledLevels(values, J, vib, kTop, names.length) };
  const basis = new Float64Array(N_POLY);
  const levels: HamiltonianLevel[] = [];
  for (let K = 0; K <= kTop; K++) {
    rotorPolynomialBasis(J, K, basis);
    let mean = values[0];
    let split = values[1 + N_POLY];
    for (let i = 0; i < N_POLY; i++) {
      mean += values[1 + i] * basis[i];
      split += values[2 + N_POLY + i] * basis[i];
    }
    for (const inversion of ['s', 'a'] as const) {
      const sign = inversion === 's' ? -0.5 : 0.5;
      const species = rovibLevelSpecies('D3h', inversionVibSpecies(vib, inversion), J, K);
      for (const s of species) {
        const derivatives = new Float64Array(names.length);
        derivatives[0] = 1;
        derivatives[1 + N_POLY] = sign;
        for (let i = 0; i < N_POLY; i++) {
          derivatives[1 + i] = basis[i];
          derivatives[2 + N_POLY + i] = sign * basis[i];
        }
        levels.push({
          J,
          K,
          l: 0,
          tag: species.length > 1 ? `${inversion}:${s}` : inversion,
          energyCm1: mean + sign * split,
          species: s,
          degeneracy: rovibSpeciesDimension('D3h', s) as 1 | 2,
          labelWeight: 1,
          derivatives,
        });
      }
    }
  }
  return { parameterNames: names, levels };
}

const N_POLY = 14;
const I_EPS3 = 2 + 2 * N_POLY;
const I_EPS3J = I_EPS3 + 1;

type Inversion = 's' | 'a';

/** Diagonal energy of (J, K, v) and its derivatives (written into d at column stride n, row). */
function componentEnergy(values: number[], J: number, K: number, v: Inversion, d: Float64Array, n: number, row: number): number {
  const basis = new Float64Array(N_POLY);
  rotorPolynomialBasis(J, K, basis);
  const sign = v === 's' ? -0.5 : 0.5;
  let e = values[0] + sign * values[1 + N_POLY];
  d[0 * n + row] = 1;
  d[(1 + N_POLY) * n + row] = sign;
  for (let i = 0; i < N_POLY; i++) {
    e += (values[1 + i] + sign * values[2 + N_POLY + i]) * basis[i];
    d[(1 + i) * n + row] = basis[i];
    d[(2 + N_POLY + i) * n + row] = sign * basis[i];
  }
  return e;
}

/** The ΔK = 3 element between k and k + 3 (without the constant), x = J(J+1). */
function deltaK3Factor(x: number, k: number): number {
  const f = (q: number) => Math.max(0, x - q * (q + 1));
  return (2 * k + 3) * Math.sqrt(f(k) * f(k + 1) * f(k + 2));
}

/** Levels of one J with the ΔK = ±3 s ↔ a interaction, by diagonalising the chains. */
function coupledLevels(values: number[], J: number, vib: 'A1' | 'A2', kTop: number, nParams: number): HamiltonianLevel[] {
  const x = J * (J + 1);
  const coupling = values[I_EPS3] + values[I_EPS3J] * x;
  const other = (v: Inversion): Inversion => (v === 's' ? 'a' : 's');
  // Characters of the inversion functions (s: Γ', a: Γ' ⊗ A2''): under σv A1' and A2'' have +1, A2' and
  // A1'' −1 (so s and a agree); under σh the primed ones +1, the double-primed −1.
  const sigmaV = vib === 'A1' ? 1 : -1;
  const sigmaHOf = (v: Inversion) => (inversionVibSpecies(vib, v).endsWith("''") ? -1 : 1);
  const levels: HamiltonianLevel[] = [];
  const solve = (ks: number[], vs: Inversion[], sigma: number) => {
    const n = ks.length;
    if (n === 0) return;
    const diag = new Float64Array(n);
    const off = new Float64Array(Math.max(0, n - 1));
    const dDiag = new Float64Array(nParams * n);
    const dOff = new Float64Array(2 * Math.max(1, n - 1));
    for (let i = 0; i < n; i++) {
      diag[i] = componentEnergy(values, J, Math.abs(ks[i]), vs[i], dDiag, n, i);
      if (i < n - 1) {
        // Folded chains start at k = 0: its link to k = 3 carries √2 (see the doc comment of the fold).
        const f = deltaK3Factor(x, ks[i]) * (sigma !== 0 && ks[i] === 0 ? Math.SQRT2 : 1);
        off[i] = coupling * f;
        dOff[i] = f;
        dOff[n - 1 + i] = f * x;
      }
    }
    const eig = tridiagonalEigenFast(diag, off);
    const labels = eigenLabelsAssign(eig.vectors, n);
    for (let j = 0; j < n; j++) {
      const b = labels.basisIndex[j];
      const K = Math.abs(ks[b]);
      if (K > kTop) continue;
      const v = vs[b];
      const sigmaH = (ks[b] % 2 === 0 ? 1 : -1) * sigmaHOf(v);
      const species = sigma === 0 ? rovibSpeciesDegenerate('D3h', sigmaH) : rovibSpeciesNondegenerate('D3h', sigma, sigmaH);
      const vec = eig.vectors.subarray(j * n, j * n + n);
      const derivatives = new Float64Array(nParams);
      for (let q = 0; q < I_EPS3; q++) {
        let acc = 0;
        for (let i = 0; i < n; i++) acc += vec[i] * vec[i] * dDiag[q * n + i];
        derivatives[q] = acc;
      }
      for (let i = 0; i < n - 1; i++) {
        derivatives[I_EPS3] += 2 * vec[i] * vec[i + 1] * dOff[i];
        derivatives[I_EPS3J] += 2 * vec[i] * vec[i + 1] * dOff[n - 1 + i];
      }
      levels.push({
        J,
        K,
        l: 0,
        tag: sigma !== 0 && K > 0 ? `${v}:${species}` : v,
        energyCm1: eig.values[j],
        species,
        degeneracy: sigma === 0 ? 2 : 1,
        labelWeight: labels.weight[j],
        derivatives,
      });
    }
  };
  for (const v0 of ['s', 'a'] as const) {
    // E levels: k ≡ 1 (mod 3), from the lowest k upwards, s and a alternating (k ≡ 2 are their mirror images).
    const ks: number[] = [];
    const vs: Inversion[] = [];
    for (let k = -J; k <= J; k++) {
      if (((k % 3) + 3) % 3 !== 1) continue;
      const t = (k - 1) / 3;
      ks.push(k);
      vs.push(t % 2 === 0 ? v0 : other(v0));
    }
    solve(ks, vs, 0);
    // K = 3n levels: representatives k = 0, 3, 6, … folded by σv; k = 0 exists in one σv sector only.
    for (const sigma of [1, -1]) {
      const kf: number[] = [];
      const vf: Inversion[] = [];
      for (let k = 0; k <= J; k += 3) {
        const v = (k / 3) % 2 === 0 ? v0 : other(v0);
        if (k === 0 && sigma !== (J % 2 === 0 ? 1 : -1) * sigmaV) continue;
        kf.push(k);
        vf.push(v);
      }
      solve(kf, vf, sigma);
    }
  }
  levels.sort((a, b) => a.K - b.K || (a.tag < b.tag ? -1 : a.tag > b.tag ? 1 : 0));
  return levels;
}
