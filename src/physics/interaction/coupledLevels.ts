/**
 * The levels of one J of a group of interacting vibrational states of a symmetric top, from one
 * effective Hamiltonian over the basis of all their functions, diagonalised together.
 *
 * Basis: |s; J, k⟩ (k = −J … J) for every nondegenerate state s and |d; J, k, ℓ⟩ (ℓ = ±1) for every
 * degenerate state d. Matrix elements (x = J(J+1); every √ is a ladder factor ⟨J,k±1|J±|J,k⟩):
 *
 * Diagonal — nondegenerate: origin + F(J,k) (rotor polynomial to octic order, rotorPolynomial.ts),
 *   with the Δk = ±6 term ⟨s; k+6|H|s; k⟩ = h3 Π_{i=0…5} √[x − (k+i)(k+i+1)] (splits K = 3 into A1/A2);
 *   degenerate: origin + F(J,k) − 2Uζkℓ + ηJ x kℓ + ηK k³ℓ (U = A or C), with the ℓ(2,2) and ℓ(2,−1)
 *   elements q22(J)·ellQ22Factor and q12·ellQ12Factor of hamiltonian/degenerateStateLevels.ts.
 * Coriolis, nondegenerate s ↔ degenerate d (x–y term, Δk = ±1, Δℓ = ±1 in the convention where the
 * dipole has Δk = Δℓ):
 *   ⟨d; k±1, ±1|H|s; k⟩ = ±(C1 + C1J x + C1K (k ± ½)² + C1JJ x²) √[x − k(k±1)]
 * and its ΔK = ±2 companion (Δk = ∓2, Δℓ = ±1, same (k − ℓ) mod 3 class):
 *   ⟨d; k∓2, ±1|H|s; k⟩ = (C2 + C2J x + C2K (k ∓ 1)²) √[x − k(k∓1)] √[x − (k∓1)(k∓2)]
 * Coriolis, degenerate d1 ↔ degenerate d2:
 *   ⟨d2; k, ℓ|H|d1; k, ℓ⟩ = (Cz + CzJ x) kℓ,   ⟨d2; k±1, ∓1|H|d1; k, ±1⟩ = ±(C1 + C1J x) √[x − k(k±1)]
 * Fermi, two states of the same degeneracy: ⟨b; k, ℓ|H|a; k, ℓ⟩ = W + WJ x + WK k².
 * Higher-order terms (ε, Δk = ±3 in a nondegenerate state; C2JJ, C2JK, C4, C5): coupledHigherTerms.ts.
 *
 * The relative signs (± above) are fixed by requiring every term to commute with σv, which acts as
 * |s; k⟩ → (−1)^{J+k}|s; −k⟩ (an A1 vibrational state) and |d; k, ℓ⟩ → (−1)^{J+k}|d; −k, −ℓ⟩, the
 * phases of degenerateStateLevels; the overall sign of each constant is a convention (authors
 * differ) and the levels do not depend on it. The J(J+1) and k² dependences are the usual
 * power-series forms of the effective interaction constants.
 * Source: the operator forms and the ladder factors as in D. Papoušek and M. R. Aliev, Molecular
 * Vibrational–Rotational Spectra (1982), chapters on Coriolis and Fermi resonances of symmetric
 * tops (x–y Coriolis between A1 and E, the accompanying ΔK = ±2 term of C3v molecules), and
 * G. Tarrago et al. on the PH3 ν2/ν4 dyad (J. Mol. Spectrosc., 1990s; volume and page not
 * re-checked) — from memory; the σv phase rule worked out here.
 *
 * Structure: k − ℓ is conserved mod 3, so the basis falls into three classes. Class 1 and class 2
 * are mirror images under σv (their levels are the E levels, each standing for two components);
 * only class 1 is diagonalised. Class 0 holds the A1/A2 pairs and is folded by σv into its +1 and −1
 * halves. Each block is dense and solved by householderEigen; derivatives by Hellmann–Feynman,
 * ∂E/∂p = uᵀ(∂H/∂p)u with u the eigenvector in the unfolded basis.
 */
import { ellQ12Factor, ellQ22Factor } from '../hamiltonian/degenerateStateLevels';
import { eigenLabelsAssign } from '../hamiltonian/eigenLabels';
import { rotorPolynomialBasis, type RotorShape } from '../hamiltonian/rotorPolynomial';
import { coupledHigherTermElements } from './coupledHigherTerms';
import { householderEigen } from './householderEigen';
import { coupledStateParameterNames, interactionParameterNames, type InteractionType } from './interactionTerms';

/** A state of a coupled group. */
export interface CoupledStateSpec {
  name: string;
  isDegenerate: boolean;
}

/** One interaction of a coupled group, between two of its states (by index into the group's states). */
export interface CoupledInteractionSpec {
  name: string;
  type: InteractionType;
  stateA: number;
  stateB: number;
}

/** The fixed structure of a group: states, interactions, and its parameter vector's layout. */
export interface CoupledGroup {
  shape: RotorShape;
  states: CoupledStateSpec[];
  interactions: CoupledInteractionSpec[];
  /** Owner (state or interaction name) and constant name of each entry of the parameter vector. */
  parameters: { owner: string; name: string }[];
  /** Offset of each state's constants in the parameter vector. */
  stateOffset: number[];
  /** Offset of each interaction's constants. */
  interactionOffset: number[];
}

/**
 * Lay out a group's parameter vector: every state's constants (coupledStateParameterNames), then
 * every interaction's (interactionParameterNames).
 * @throws Error naming the interaction that cannot join its two states
 */
export function coupledGroupCreate(shape: RotorShape, states: CoupledStateSpec[], interactions: CoupledInteractionSpec[]): CoupledGroup {
  const parameters: { owner: string; name: string }[] = [];
  const stateOffset: number[] = [];
  const interactionOffset: number[] = [];
  for (const s of states) {
    stateOffset.push(parameters.length);
    for (const name of coupledStateParameterNames(shape, s.isDegenerate)) parameters.push({ owner: s.name, name });
  }
  for (const it of interactions) {
    const a = states[it.stateA];
    const b = states[it.stateB];
    if (!a || !b || it.stateA === it.stateB)
      throw new Error(`coupledGroupCreate: interaction '${it.name}' must join two different states of the group`);
    const names = interactionParameterNames(it.type, a.isDegenerate, b.isDegenerate);
    if (typeof names === 'string')
      throw new Error(`coupledGroupCreate: interaction '${it.name}' (${it.type}, ${a.name} ↔ ${b.name}): ${names}`);
    interactionOffset.push(parameters.length);
    for (const name of names) parameters.push({ owner: it.name, name });
  }
  return { shape, states, interactions, parameters, stateOffset, interactionOffset };
}

/** A basis function of a class block. */
interface BasisFn {
  state: number;
  k: number;
  ell: number;
}

/** Matrix elements of a block in the unfolded basis, with sparse derivatives (∂H_ij/∂p). */
interface Elements {
  row: number[];
  col: number[];
  value: number[];
  dStart: number[];
  dParam: number[];
  dCoef: number[];
}

/** One class block after diagonalisation: basis and, per eigenvector, its unfolded coefficients. */
export interface CoupledBlock {
  basisState: Int32Array;
  basisK: Int32Array;
  basisEll: Int8Array;
  /** True for the class-1 block, whose levels stand also for their class-2 mirror images. */
  isMirrored: boolean;
  /** The basis functions with k = K − J … are byKIndex[byKStart[k + J] … byKStart[k + J + 1]) (lookup by k). */
  byKStart: Int32Array;
  byKIndex: Int32Array;
}

/** The levels of one J of a coupled group, as columns. */
export interface CoupledLevels {
  J: number;
  count: number;
  /** Index into the group's states of the level's largest component. */
  state: Int32Array;
  K: Int32Array;
  l: Int8Array;
  /** '' for E levels and single levels, 'A1'/'A2' for the σv = +1/−1 members of a class-0 pair. */
  tag: string[];
  /** Energy, cm⁻¹ (on the origins' zero). */
  energyCm1: Float64Array;
  /** ∂E/∂p, row-major by level over the group's parameter vector. */
  gradient: Float64Array;
  componentCount: Uint8Array;
  /** |c|² of the labelling basis function (folded basis for class 0). */
  labelWeight: Float64Array;
  /** σv eigenvalue (+1/−1) of a class-0 level, 0 for an E level. */
  sigma: Int8Array;
  /** The block each level comes from and its eigenvector over that block's unfolded basis. */
  block: CoupledBlock[];
  vector: Float64Array[];
}

function mod3(m: number): number {
  return ((m % 3) + 3) % 3;
}

/** Options of coupledLevels. */
export interface CoupledLevelsOptions {
  /** Compute ∂E/∂p. @default true */
  withDerivatives?: boolean;
  /**
   * Labels of the previous call at the same J, to be followed by eigenvector overlap rather than
   * re-derived from the largest component (see coupledLabelFollow). Keyed by block.
   */
  follow?: CoupledLabelMemory;
}

/** What coupledLevels remembers between calls to keep labels continuous (opaque to callers). */
export interface CoupledLabelMemory {
  blocks: Map<string, { vectors: Float64Array; labels: Int32Array; n: number }>;
}

/**
 * The levels of J of a coupled group, every K (labels by largest component, made unique per block;
 * see the file comment for the Hamiltonian).
 * @param group structure from coupledGroupCreate
 * @param J total angular momentum (whole number >= 0)
 * @param values the group's parameter vector (cm⁻¹; ζ dimensionless)
 * @param options derivatives and label following
 */
export function coupledLevels(
  group: CoupledGroup,
  J: number,
  values: ArrayLike<number>,
  options: CoupledLevelsOptions = {},
): CoupledLevels {
  if (!(Number.isInteger(J) && J >= 0)) throw new Error(`coupledLevels: J must be a whole number >= 0, got ${J}`);
  if (values.length !== group.parameters.length)
    throw new Error(`coupledLevels: expected ${group.parameters.length} constants, got ${values.length}`);
  const withDerivatives = options.withDerivatives ?? true;
  const nP = group.parameters.length;
  const x = J * (J + 1);
  const out: {
    state: number;
    K: number;
    l: number;
    tag: string;
    e: number;
    grad: Float64Array | null;
    count: number;
    weight: number;
    sigma: number;
    block: CoupledBlock;
    vector: Float64Array;
  }[] = [];
  for (const cls of [0, 1]) {
    const basis: BasisFn[] = [];
    group.states.forEach((s, si) => {
      for (let k = -J; k <= J; k++) {
        if (s.isDegenerate) {
          for (const ell of [1, -1]) if (mod3(k - ell) === cls) basis.push({ state: si, k, ell });
        } else if (mod3(k) === cls) basis.push({ state: si, k, ell: 0 });
      }
    });
    const n = basis.length;
    if (n === 0) continue;
    const byKStart = new Int32Array(2 * J + 2);
    for (const b of basis) byKStart[b.k + J + 1]++;
    for (let i = 1; i < byKStart.length; i++) byKStart[i] += byKStart[i - 1];
    const fill = byKStart.slice(0, 2 * J + 1);
    const byKIndex = new Int32Array(n);
    basis.forEach((b, i) => (byKIndex[fill[b.k + J]++] = i));
    const block: CoupledBlock = {
      basisState: Int32Array.from(basis, (b) => b.state),
      basisK: Int32Array.from(basis, (b) => b.k),
      basisEll: Int8Array.from(basis, (b) => b.ell),
      isMirrored: cls === 1,
      byKStart,
      byKIndex,
    };
    const el = blockElements(group, J, x, values, basis);
    const h = new Float64Array(n * n);
    for (let e = 0; e < el.row.length; e++) {
      h[el.col[e] * n + el.row[e]] += el.value[e];
      if (el.row[e] !== el.col[e]) h[el.row[e] * n + el.col[e]] += el.value[e];
    }
    // Folding: the symmetrised functions of σ = ±1 as sparse columns over the unfolded basis.
    const folds: { sigma: number; cols: { i: number; j: number; cj: number; orbit: number }[] }[] = [];
    const indexOf = new Map<string, number>();
    basis.forEach((b, i) => indexOf.set(`${b.state},${b.k},${b.ell}`, i));
    if (cls === 0) {
      for (const sigma of [1, -1]) {
        const cols: { i: number; j: number; cj: number; orbit: number }[] = [];
        basis.forEach((b, i) => {
          const j = indexOf.get(`${b.state},${-b.k},${-b.ell}`)!;
          const phase = (J + b.k) % 2 === 0 ? 1 : -1;
          if (j === i) {
            if (phase === sigma) cols.push({ i, j: -1, cj: 0, orbit: i });
          } else if (i < j || (b.k === 0 && b.ell > 0)) {
            cols.push({ i, j, cj: sigma * phase, orbit: i });
          }
        });
        folds.push({ sigma, cols });
      }
    } else {
      folds.push({ sigma: 0, cols: basis.map((_, i) => ({ i, j: -1, cj: 0, orbit: i })) });
    }
    for (const fold of folds) {
      const m = fold.cols.length;
      if (m === 0) continue;
      const hf = new Float64Array(m * m);
      const inv = Math.SQRT1_2;
      for (let a = 0; a < m; a++) {
        const ca = fold.cols[a];
        for (let b = 0; b <= a; b++) {
          const cb = fold.cols[b];
          let s = 0;
          const wa = ca.j >= 0 ? inv : 1;
          const wb = cb.j >= 0 ? inv : 1;
          s += wa * wb * h[cb.i * n + ca.i];
          if (ca.j >= 0) s += wa * ca.cj * wb * h[cb.i * n + ca.j];
          if (cb.j >= 0) s += wa * wb * cb.cj * h[cb.j * n + ca.i];
          if (ca.j >= 0 && cb.j >= 0) s += wa * ca.cj * wb * cb.cj * h[cb.j * n + ca.j];
          hf[b * m + a] = s;
          hf[a * m + b] = s;
        }
      }
      const eig = householderEigen(hf, m);
      const key = `${cls}:${fold.sigma}`;
      const labels = labelBlock(eig.vectors, m, key, options.follow);
      for (let v = 0; v < m; v++) {
        const col = fold.cols[labels.basisIndex[v]];
        const dom = basis[col.i];
        const st = group.states[dom.state];
        const K = Math.abs(dom.k);
        const u = new Float64Array(n);
        for (let a = 0; a < m; a++) {
          const c = eig.vectors[v * m + a];
          const ca = fold.cols[a];
          if (ca.j >= 0) {
            u[ca.i] += c * inv;
            u[ca.j] += c * inv * ca.cj;
          } else u[ca.i] += c;
        }
        let grad: Float64Array | null = null;
        if (withDerivatives) {
          grad = new Float64Array(nP);
          for (let e = 0; e < el.row.length; e++) {
            const w = el.row[e] === el.col[e] ? u[el.row[e]] * u[el.row[e]] : 2 * u[el.row[e]] * u[el.col[e]];
            if (w === 0) continue;
            for (let d = el.dStart[e]; d < el.dStart[e + 1]; d++) grad[el.dParam[d]] += w * el.dCoef[d];
          }
        }
        const isPair = col.j >= 0;
        out.push({
          state: dom.state,
          K,
          l: st.isDegenerate && K > 0 ? (dom.k * dom.ell > 0 ? 1 : -1) : 0,
          tag: isPair ? (fold.sigma > 0 ? 'A1' : 'A2') : '',
          e: eig.values[v],
          grad,
          count: cls === 1 ? 2 : 1,
          weight: labels.weight[v],
          sigma: fold.sigma,
          block,
          vector: u,
        });
      }
    }
  }
  out.sort((a, b) => a.state - b.state || a.K - b.K || b.l - a.l || (a.tag < b.tag ? -1 : a.tag > b.tag ? 1 : 0));
  const count = out.length;
  const res: CoupledLevels = {
    J,
    count,
    state: Int32Array.from(out, (o) => o.state),
    K: Int32Array.from(out, (o) => o.K),
    l: Int8Array.from(out, (o) => o.l),
    tag: out.map((o) => o.tag),
    energyCm1: Float64Array.from(out, (o) => o.e),
    gradient: new Float64Array(withDerivatives ? count * nP : 0),
    componentCount: Uint8Array.from(out, (o) => o.count),
    labelWeight: Float64Array.from(out, (o) => o.weight),
    sigma: Int8Array.from(out, (o) => o.sigma),
    block: out.map((o) => o.block),
    vector: out.map((o) => o.vector),
  };
  if (withDerivatives) out.forEach((o, i) => res.gradient.set(o.grad!, i * nP));
  return res;
}

/**
 * Labels of one block: by largest component (eigenLabelsAssign); with a memory, by following the
 * eigenvectors of the first call at this J (the reference, never overwritten, so a rejected trial
 * step of a fit cannot disturb it) to the new ones they overlap most (coupledLabelFollow), unless
 * every label of the block is clear (largest |c|² > 0.75, where both rules agree). When the
 * overlaps are poor (mean matched |⟨ref|new⟩|² below ½: the constants moved too far for "the same
 * level" to mean anything) the largest-component labels are used.
 */
function labelBlock(vectors: Float64Array, n: number, key: string, memory: CoupledLabelMemory | undefined) {
  const byComponent = eigenLabelsAssign(vectors, n);
  if (!memory) return byComponent;
  const ref = memory.blocks.get(key);
  if (!ref || ref.n !== n) {
    memory.blocks.set(key, { vectors: vectors.slice(), labels: byComponent.basisIndex.slice(), n });
    return byComponent;
  }
  // Where every label is clear (largest |c|² above 0.75) both rules agree; following is then skipped (O(n³)).
  let clear = true;
  for (let j = 0; j < n && clear; j++) clear = byComponent.weight[j] > 0.75;
  if (clear) return byComponent;
  const followed = coupledLabelFollow(ref.vectors, ref.labels, vectors, n);
  if (followed.meanOverlap < 0.5) return byComponent;
  const weight = Float64Array.from(followed.labels, (b, j) => vectors[j * n + b] * vectors[j * n + b]);
  return { basisIndex: followed.labels, weight };
}

/**
 * Carry labels from one set of eigenvectors to a nearby one (the same block after a small change
 * of the constants): each new eigenvector takes the label of the old eigenvector it overlaps most,
 * pairs fixed greedily by descending |⟨old|new⟩|², so every label is used once. Through an avoided
 * crossing this keeps a level's label on the eigenvector that changes continuously, where the
 * largest-component rule would swap two labels at the 50/50 point.
 * Source: common practice in tracking eigenstates along a parameter (maximum-overlap rule).
 * @param oldVectors column-major n×n, previous eigenvectors
 * @param oldLabels label of each previous eigenvector
 * @param newVectors column-major n×n, new eigenvectors
 * @param n order
 * @returns the label of each new eigenvector and the mean |⟨old|new⟩|² of the matched pairs (1 = unchanged)
 */
export function coupledLabelFollow(
  oldVectors: ArrayLike<number>,
  oldLabels: ArrayLike<number>,
  newVectors: ArrayLike<number>,
  n: number,
): { labels: Int32Array; meanOverlap: number } {
  const overlap = new Float64Array(n * n);
  for (let a = 0; a < n; a++) {
    for (let b = 0; b < n; b++) {
      let s = 0;
      for (let i = 0; i < n; i++) s += oldVectors[a * n + i] * newVectors[b * n + i];
      overlap[a * n + b] = s * s;
    }
  }
  const pairs = Array.from({ length: n * n }, (_, i) => i).sort((p, q) => overlap[q] - overlap[p]);
  const labels = new Int32Array(n).fill(-1);
  const oldDone = new Uint8Array(n);
  let left = n;
  let sum = 0;
  for (const p of pairs) {
    if (left === 0) break;
    const a = Math.floor(p / n);
    const b = p - a * n;
    if (oldDone[a] || labels[b] >= 0) continue;
    oldDone[a] = 1;
    labels[b] = oldLabels[a];
    sum += overlap[p];
    left--;
  }
  return { labels, meanOverlap: n > 0 ? sum / n : 1 };
}

/** Every nonzero matrix element of a class block (each pair once), with ∂/∂p. */
function blockElements(group: CoupledGroup, J: number, x: number, p: ArrayLike<number>, basis: BasisFn[]): Elements {
  const el: Elements = { row: [], col: [], value: [], dStart: [0], dParam: [], dCoef: [] };
  const index = new Map<number, number>();
  const code = (state: number, k: number, ell: number) => (state * 4096 + (k + 2048)) * 4 + (ell + 1);
  basis.forEach((b, i) => index.set(code(b.state, b.k, b.ell), i));
  const poly = new Float64Array(14);
  const push = (i: number, j: number | undefined, value: number, derivs: number[]) => {
    if (j === undefined) return;
    el.row.push(i);
    el.col.push(j);
    el.value.push(value);
    for (let d = 0; d < derivs.length; d += 2) {
      el.dParam.push(derivs[d]);
      el.dCoef.push(derivs[d + 1]);
    }
    el.dStart.push(el.dParam.length);
  };
  basis.forEach((b, i) => {
    const st = group.states[b.state];
    const o = group.stateOffset[b.state];
    rotorPolynomialBasis(J, b.k, poly);
    let e = p[o];
    const d: number[] = [o, 1];
    for (let t = 0; t < 14; t++) {
      e += p[o + 1 + t] * poly[t];
      d.push(o + 1 + t, poly[t]);
    }
    if (st.isDegenerate) {
      // origin, B, U, …(14 polynomial)…, zeta, etaJ, etaK, q22, q22J, q12
      const kl = b.k * b.ell;
      const iU = o + 2;
      const iZ = o + 15;
      e += -2 * p[iU] * p[iZ] * kl + p[o + 16] * x * kl + p[o + 17] * b.k * b.k * kl;
      d.push(iU, -2 * p[iZ] * kl, iZ, -2 * p[iU] * kl, o + 16, x * kl, o + 17, b.k * b.k * kl);
      push(i, i, e, d);
      if (b.ell === 1) {
        const f = ellQ22Factor(x, b.k);
        if (f !== 0) push(i, index.get(code(b.state, b.k - 2, -1)), f * (p[o + 18] + p[o + 19] * x), [o + 18, f, o + 19, f * x]);
      } else {
        const f = ellQ12Factor(x, b.k);
        if (f !== 0) push(i, index.get(code(b.state, b.k - 1, 1)), f * p[o + 20], [o + 20, f]);
      }
    } else {
      push(i, i, e, d);
      const iH3 = o + 15;
      let f = 1;
      for (let t = 0; t < 6 && f !== 0; t++) f *= Math.sqrt(Math.max(0, x - (b.k + t) * (b.k + t + 1)));
      if (f !== 0) push(i, index.get(code(b.state, b.k + 6, 0)), p[iH3] * f, [iH3, f]);
    }
  });
  group.interactions.forEach((it, n) => {
    const o = group.interactionOffset[n];
    const a = group.states[it.stateA];
    const bState = group.states[it.stateB];
    if (it.type === 'fermi') {
      basis.forEach((b, i) => {
        if (b.state !== it.stateA) return;
        const k2 = b.k * b.k;
        push(i, index.get(code(it.stateB, b.k, b.ell)), p[o] + p[o + 1] * x + p[o + 2] * k2, [o, 1, o + 1, x, o + 2, k2]);
      });
      return;
    }
    if (a.isDegenerate !== bState.isDegenerate) {
      const s = a.isDegenerate ? it.stateB : it.stateA;
      const dg = a.isDegenerate ? it.stateA : it.stateB;
      basis.forEach((b, i) => {
        if (b.state !== s) return;
        const k = b.k;
        for (const sign of [1, -1]) {
          // Δk = ±1, Δℓ = ±1.
          const r = Math.sqrt(Math.max(0, x - k * (k + sign)));
          if (r > 0) {
            const kAvg2 = (k + sign / 2) ** 2;
            const c = p[o] + p[o + 1] * x + p[o + 2] * kAvg2 + p[o + 5] * x * x;
            push(i, index.get(code(dg, k + sign, sign)), sign * c * r, [
              o,
              sign * r,
              o + 1,
              sign * r * x,
              o + 2,
              sign * r * kAvg2,
              o + 5,
              sign * r * x * x,
            ]);
          }
          // Δk = ∓2, Δℓ = ±1; (k ∓ 1)² is the mean k of the pair, squared (σv-symmetric).
          const r2 = Math.sqrt(Math.max(0, x - k * (k - sign))) * Math.sqrt(Math.max(0, x - (k - sign) * (k - 2 * sign)));
          const kMid2 = (k - sign) ** 2;
          if (r2 > 0)
            push(i, index.get(code(dg, k - 2 * sign, sign)), (p[o + 3] + p[o + 4] * x + p[o + 6] * kMid2) * r2, [
              o + 3,
              r2,
              o + 4,
              r2 * x,
              o + 6,
              r2 * kMid2,
            ]);
        }
      });
      return;
    }
    // Two degenerate states.
    basis.forEach((b, i) => {
      if (b.state !== it.stateA) return;
      const kl = b.k * b.ell;
      if (kl !== 0) push(i, index.get(code(it.stateB, b.k, b.ell)), (p[o] + p[o + 1] * x) * kl, [o, kl, o + 1, x * kl]);
      const sign = b.ell;
      const r = Math.sqrt(Math.max(0, x - b.k * (b.k + sign)));
      if (r > 0) {
        const c = p[o + 2] + p[o + 3] * x;
        push(i, index.get(code(it.stateB, b.k + sign, -sign)), sign * c * r, [o + 2, sign * r, o + 3, sign * r * x]);
      }
    });
  });
  coupledHigherTermElements(group, x, p, basis, (s, k, ell) => index.get(code(s, k, ell)), push);
  return el;
}
