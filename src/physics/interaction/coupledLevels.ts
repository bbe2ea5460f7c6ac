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
 * halves. Each (folded) block is split into the connected components of its non-zero pattern, each
 * ordered by k and solved as a band matrix (bandEigen: O(n² b²) against householderEigen's O(n³) on
 * the whole block, which the 'dense' option keeps as the reference); derivatives by Hellmann–Feynman,
 * ∂E/∂p = uᵀ(∂H/∂p)u with u the eigenvector in the unfolded basis.
 */
import { ellQ12Factor, ellQ22Factor } from '../hamiltonian/degenerateStateLevels';
import { eigenLabelsAssign } from '../hamiltonian/eigenLabels';
import { rotorPolynomialBasis, type RotorShape } from '../hamiltonian/rotorPolynomial';
import { bandEigen } from './bandEigen';
import { coupledHigherTermElements, type ElementSink } from './coupledHigherTerms';
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
  /**
   * ∂E/∂p, row-major by level over the group's parameter vector; empty when computed without
   * derivatives. Worked out on first read (a caller that wants a few levels asks levelGradient).
   */
  readonly gradient: Float64Array;
  /** ∂E/∂p of one level over the group's parameter vector (a view into `gradient`; only that row is worked out). */
  levelGradient(index: number): Float64Array;
  componentCount: Uint8Array;
  /** |c|² of the labelling basis function (folded basis for class 0). */
  labelWeight: Float64Array;
  /** σv eigenvalue (+1/−1) of a class-0 level, 0 for an E level. */
  sigma: Int8Array;
  /** The block each level comes from and its eigenvector over that block's unfolded basis. */
  block: CoupledBlock[];
  vector: Float64Array[];
}

/** 2²⁰: the factor that packs an element number below a pair key (sort keys stay below 2⁵³ for blocks of up to ~90,000 functions). */
const PACK = 1048576;

/** The gradient of levels computed without derivatives (empty). */
const NO_GRADIENT = new Float64Array(0);

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
  /**
   * 'factored': each (folded) class block split into the connected components of its non-zero
   * pattern, each solved as a band matrix (bandEigen); 'dense': each class block solved whole by
   * householderEigen (the reference the factored solver is checked against; O(n³)). The levels,
   * labels and eigenvectors agree to round-off. @default 'factored'
   */
  solver?: 'factored' | 'dense';
}

/** What coupledLevels remembers between calls to keep labels continuous (opaque to callers). */
export interface CoupledLabelMemory {
  blocks: Map<string, { vectors: Float64Array; labels: Int32Array; n: number }>;
}

/** One level before sorting. */
interface LevelOut {
  state: number;
  K: number;
  l: number;
  tag: string;
  e: number;
  /** Where ∂E/∂p comes from: the part's derivative terms and the level's eigenvector in it. */
  source: GradientSource;
  count: number;
  weight: number;
  sigma: number;
  block: CoupledBlock;
  vector: Float64Array;
}

/**
 * The levels of J of a coupled group, every K (labels by largest component, made unique per block;
 * see the file comment for the Hamiltonian).
 * @param group structure from coupledGroupCreate
 * @param J total angular momentum (whole number >= 0)
 * @param values the group's parameter vector (cm⁻¹; ζ dimensionless)
 * @param options derivatives, label following and solver
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
  const isDense = options.solver === 'dense';
  const nP = group.parameters.length;
  const x = J * (J + 1);
  const out: LevelOut[] = [];
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
    const basisState = new Int32Array(n);
    const basisK = new Int32Array(n);
    const basisEll = new Int8Array(n);
    for (let i = 0; i < n; i++) {
      basisState[i] = basis[i].state;
      basisK[i] = basis[i].k;
      basisEll[i] = basis[i].ell;
    }
    const block: CoupledBlock = { basisState, basisK, basisEll, isMirrored: cls === 1, byKStart, byKIndex };
    // The levels' eigenvectors over the unfolded basis (views into one buffer per class block: the
    // σv halves and their parts together have n levels).
    const classVectors = new Float64Array(n * n);
    let nextVector = 0;
    // Values only here; the ∂H/∂p terms are made again (same elements, same order) on the first gradient asked.
    const el = blockElements(group, J, x, values, basis, false);
    let elWithDerivatives: ElementList | null = null;
    const derivativeElements = () => (elWithDerivatives ??= blockElements(group, J, x, values, basis, true));
    // The pair orderings below pack an element number into the low 20 bits of a sort key.
    if (el.row.length >= PACK)
      throw new Error(`coupledLevels: J = ${J} gives ${el.row.length} matrix elements in one block, more than ${PACK - 1} handled`);
    // σv partner of each basis function: |s; k, ℓ⟩ → |s; −k, −ℓ⟩.
    const find = basisFinder(group.states.length, J, basis);
    const partner = new Int32Array(n);
    for (let i = 0; i < n; i++) partner[i] = find(basis[i].state, -basis[i].k, -basis[i].ell);
    for (const sigma of cls === 0 ? [1, -1] : [0]) {
      const fold = foldCreate(basis, J, sigma, partner);
      const m = fold.m;
      if (m === 0) continue;
      const folded = foldedElements(fold, el);
      const parts = isDense ? foldWhole(fold) : foldComponents(fold, folded, basis);
      let partElements: { el: ElementList; inside: Int32Array[] } | null = null;
      const derivativeParts = () => (partElements ??= elementsByPart(fold, parts, derivativeElements()));
      for (const part of parts) {
        const mc = part.members.length;
        const eig = isDense ? householderEigen(foldedDense(folded, m), m) : bandEigen(partRows(part, folded), mc, part.bandwidth);
        const key = isDense ? `${cls}:${sigma}` : `${cls}:${sigma}:${part.first}`;
        const labels = labelBlock(eig.vectors, mc, key, options.follow);
        const terms = partTermsLazy(part, fold, derivativeParts, nP);
        for (let v = 0; v < mc; v++) {
          const a = part.members[labels.basisIndex[v]];
          const dom = basis[fold.colI[a]];
          const st = group.states[dom.state];
          const K = Math.abs(dom.k);
          const u = classVectors.subarray(nextVector * n, (nextVector + 1) * n);
          nextVector++;
          // Sign convention: the labelling component is positive (so a level's vector does not change
          // sign from one J, solver or call to the next; nothing else depends on the sign).
          const sign = eig.vectors[v * mc + labels.basisIndex[v]] < 0 ? -1 : 1;
          for (let t = 0; t < mc; t++) {
            const c = sign * eig.vectors[v * mc + t];
            if (c === 0) continue;
            const at = part.members[t];
            const j = fold.colJ[at];
            if (j >= 0) {
              u[fold.colI[at]] += c * Math.SQRT1_2;
              u[j] += c * Math.SQRT1_2 * fold.colC[at];
            } else u[fold.colI[at]] += c;
          }
          out.push({
            state: dom.state,
            K,
            l: st.isDegenerate && K > 0 ? (dom.k * dom.ell > 0 ? 1 : -1) : 0,
            tag: fold.colJ[a] >= 0 ? (sigma > 0 ? 'A1' : 'A2') : '',
            e: eig.values[v],
            source: { terms, vector: u, members: part.members, fold },
            count: cls === 1 ? 2 : 1,
            weight: labels.weight[v],
            sigma,
            block,
            vector: u,
          });
        }
      }
    }
  }
  out.sort((a, b) => a.state - b.state || a.K - b.K || b.l - a.l || (a.tag < b.tag ? -1 : a.tag > b.tag ? 1 : 0));
  const count = out.length;
  // Allocated on the first gradient asked.
  let gradient: Float64Array | null = null;
  const isRowDone = new Uint8Array(count);
  const levelGradient = (index: number): Float64Array => {
    if (!withDerivatives) throw new Error('coupledLevels: levels computed without derivatives (withDerivatives: false)');
    if (!(Number.isInteger(index) && index >= 0 && index < count))
      throw new Error(`coupledLevels: level index must be a whole number from 0 to ${count - 1}, got ${index}`);
    gradient ??= new Float64Array(count * nP);
    const row = gradient.subarray(index * nP, (index + 1) * nP);
    if (!isRowDone[index]) {
      gradientRow(out[index].source, row);
      isRowDone[index] = 1;
    }
    return row;
  };
  const state = new Int32Array(count);
  const K = new Int32Array(count);
  const l = new Int8Array(count);
  const tag = new Array<string>(count);
  const energyCm1 = new Float64Array(count);
  const componentCount = new Uint8Array(count);
  const labelWeight = new Float64Array(count);
  const sigma = new Int8Array(count);
  const block = new Array<CoupledBlock>(count);
  const vector = new Array<Float64Array>(count);
  for (let i = 0; i < count; i++) {
    const o = out[i];
    state[i] = o.state;
    K[i] = o.K;
    l[i] = o.l;
    tag[i] = o.tag;
    energyCm1[i] = o.e;
    componentCount[i] = o.count;
    labelWeight[i] = o.weight;
    sigma[i] = o.sigma;
    block[i] = o.block;
    vector[i] = o.vector;
  }
  return {
    J,
    count,
    state,
    K,
    l,
    tag,
    energyCm1,
    get gradient() {
      if (!withDerivatives) return NO_GRADIENT;
      for (let i = 0; i < count; i++) if (!isRowDone[i]) levelGradient(i);
      return (gradient ??= new Float64Array(count * nP));
    },
    levelGradient,
    componentCount,
    labelWeight,
    sigma,
    block,
    vector,
  };
}

/**
 * The derivative terms of one part in its own basis: E = Σ over pairs (a, b) of c_a c_b H'_ab, so
 * ∂E/∂p = Σ_pairs c_a c_b Σ_t coef_t [param_t = p], each pair once (a ≤ b, local positions), the
 * factor 2 of an off-diagonal pair and the folding coefficients included; the two members of a σv
 * pair share their folded terms.
 */
interface PartTerms {
  pairA: Int32Array;
  pairB: Int32Array;
  /** Terms of pair q: param[start[q] … start[q + 1]) with coef. */
  start: Int32Array;
  param: Int32Array;
  coef: Float64Array;
}

/** What one level's gradient row is computed from. */
interface GradientSource {
  terms: () => PartTerms;
  /** The level's eigenvector over the unfolded basis, and the part's folded columns (in its local order). */
  vector: Float64Array;
  members: Int32Array;
  fold: Fold;
}

/** ∂E/∂p of one level into row (zeroed first). */
function gradientRow(source: GradientSource, row: Float64Array): void {
  const t = source.terms();
  const { members, fold, vector } = source;
  // The level's coefficients over the part's folded columns, back from the unfolded vector: a
  // σv pair (|i⟩ ± |j⟩)/√2 has c·√½ on |i⟩.
  const mc = members.length;
  const c = new Float64Array(mc);
  for (let q = 0; q < mc; q++) {
    const a = members[q];
    c[q] = fold.colJ[a] >= 0 ? vector[fold.colI[a]] * Math.SQRT2 : vector[fold.colI[a]];
  }
  row.fill(0);
  for (let q = 0; q < t.pairA.length; q++) {
    const w = c[t.pairA[q]] * c[t.pairB[q]];
    if (w === 0) continue;
    for (let d = t.start[q]; d < t.start[q + 1]; d++) row[t.param[d]] += w * t.coef[d];
  }
}

/**
 * The derivative terms of a part, built on first use from the block's elements with their ∂H/∂p
 * terms (made then): levels asked without gradients never build either.
 */
function partTermsLazy(part: FoldPart, fold: Fold, elements: () => { el: ElementList; inside: Int32Array[] }, nP: number): () => PartTerms {
  let terms: PartTerms | null = null;
  return () => {
    if (!terms) {
      const { el, inside } = elements();
      terms = partTerms(part, fold, el, inside[part.component], nP);
    }
    return terms;
  };
}

/** The unfolded elements inside each part of a folded block (both ends in the part), by part. */
function elementsByPart(fold: Fold, parts: FoldPart[], el: ElementList): { el: ElementList; inside: Int32Array[] } {
  const lists: number[][] = parts.map(() => []);
  const componentOf = parts[0].componentOf;
  for (let e = 0; e < el.row.length; e++) {
    const a = fold.foldCol[el.row[e]];
    const b = fold.foldCol[el.col[e]];
    if (a >= 0 && b >= 0 && componentOf[a] === componentOf[b]) lists[componentOf[a]].push(e);
  }
  return { el, inside: lists.map((list) => Int32Array.from(list)) };
}

function partTerms(part: FoldPart, fold: Fold, el: ElementList, elements: Int32Array, nP: number): PartTerms {
  const mc = part.members.length;
  const local = new Int32Array(fold.m).fill(-1);
  part.members.forEach((a, t) => (local[a] = t));
  const ne = elements.length;
  const packed = new Float64Array(ne);
  let termBound = 0;
  for (let q = 0; q < ne; q++) {
    const e = elements[q];
    const a = local[fold.foldCol[el.row[e]]];
    const b = local[fold.foldCol[el.col[e]]];
    packed[q] = (Math.min(a, b) * mc + Math.max(a, b)) * PACK + q;
    termBound += el.dStart[e + 1] - el.dStart[e];
  }
  packed.sort();
  const sum = new Float64Array(nP);
  const isTouched = new Uint8Array(nP);
  const touched = new Int32Array(nP);
  const pairA = new Int32Array(ne);
  const pairB = new Int32Array(ne);
  const start = new Int32Array(ne + 1);
  const param = new Int32Array(termBound);
  const coef = new Float64Array(termBound);
  let nPairs = 0;
  let nTerms = 0;
  for (let q = 0; q < ne;) {
    const key = Math.floor(packed[q] / PACK);
    let nTouched = 0;
    for (; q < ne && Math.floor(packed[q] / PACK) === key; q++) {
      const e = elements[packed[q] % PACK];
      const i = el.row[e];
      const j = el.col[e];
      const g = i === j ? fold.foldCoef[i] * fold.foldCoef[i] : 2 * fold.foldCoef[i] * fold.foldCoef[j];
      for (let d = el.dStart[e]; d < el.dStart[e + 1]; d++) {
        const p = el.dParam[d];
        if (!isTouched[p]) {
          isTouched[p] = 1;
          touched[nTouched++] = p;
        }
        sum[p] += g * el.dCoef[d];
      }
    }
    pairA[nPairs] = Math.floor(key / mc);
    pairB[nPairs] = key % mc;
    for (let t = 0; t < nTouched; t++) {
      const p = touched[t];
      if (sum[p] !== 0) {
        param[nTerms] = p;
        coef[nTerms++] = sum[p];
      }
      sum[p] = 0;
      isTouched[p] = 0;
    }
    start[++nPairs] = nTerms;
  }
  return {
    pairA: pairA.slice(0, nPairs),
    pairB: pairB.slice(0, nPairs),
    start: start.slice(0, nPairs + 1),
    param: param.slice(0, nTerms),
    coef: coef.slice(0, nTerms),
  };
}

/**
 * The functions of one σv half of a class block as columns over its unfolded basis: a function that
 * is its own mirror image (phase σ) alone, a pair (|i⟩ + σ·phase|j⟩)/√2 with i < j its partner; σ = 0
 * (a mirrored class, not folded) keeps every function as it is.
 */
interface Fold {
  m: number;
  /** Column a: its first unfolded function, its partner (−1 for none) and the partner's sign σ·phase. */
  colI: Int32Array;
  colJ: Int32Array;
  colC: Float64Array;
  /** Per unfolded function: its column (−1 when not in this half) and its coefficient there. */
  foldCol: Int32Array;
  foldCoef: Float64Array;
}

function foldCreate(basis: BasisFn[], J: number, sigma: number, partner: Int32Array): Fold {
  const n = basis.length;
  const colI = new Int32Array(n);
  const colJ = new Int32Array(n).fill(-1);
  const colC = new Float64Array(n);
  const foldCol = new Int32Array(n).fill(-1);
  const foldCoef = new Float64Array(n);
  let m = 0;
  for (let i = 0; i < n; i++) {
    if (sigma === 0) {
      colI[m] = i;
      foldCol[i] = m;
      foldCoef[i] = 1;
      m++;
      continue;
    }
    const j = partner[i];
    const phase = (J + basis[i].k) % 2 === 0 ? 1 : -1;
    if (j === i) {
      if (phase !== sigma) continue;
      colI[m] = i;
      foldCol[i] = m;
      foldCoef[i] = 1;
      m++;
    } else if (i < j) {
      colI[m] = i;
      colJ[m] = j;
      colC[m] = sigma * phase;
      foldCol[i] = m;
      foldCoef[i] = Math.SQRT1_2;
      foldCol[j] = m;
      foldCoef[j] = Math.SQRT1_2 * sigma * phase;
      m++;
    }
  }
  return { m, colI, colJ, colC, foldCol, foldCoef };
}

/** The folded block Sᵀ H S (S: the symmetrised functions as columns) as its non-zero pairs a ≤ b, each once. */
interface FoldedElements {
  pairA: Int32Array;
  pairB: Int32Array;
  value: Float64Array;
}

function foldedElements(fold: Fold, el: ElementList): FoldedElements {
  const m = fold.m;
  const ne = el.row.length;
  // The elements by the smaller folded column of their pair (a counting sort, element order kept);
  // then, column by column, the two σv images of an element (and any element on the same pair) are
  // summed per partner column in element order, and the pairs given by ascending partner.
  const low = new Int32Array(ne);
  const high = new Int32Array(ne);
  const start = new Int32Array(m + 1);
  for (let e = 0; e < ne; e++) {
    const a = fold.foldCol[el.row[e]];
    const b = fold.foldCol[el.col[e]];
    if (a < 0 || b < 0) {
      low[e] = -1;
      continue;
    }
    low[e] = a < b ? a : b;
    high[e] = a < b ? b : a;
    start[low[e] + 1]++;
  }
  for (let a = 0; a < m; a++) start[a + 1] += start[a];
  const total = start[m];
  const order = new Int32Array(total);
  const fill = start.slice(0, m);
  for (let e = 0; e < ne; e++) if (low[e] >= 0) order[fill[low[e]]++] = e;
  const pairA = new Int32Array(total);
  const pairB = new Int32Array(total);
  const value = new Float64Array(total);
  const sum = new Float64Array(m);
  const isTouched = new Uint8Array(m);
  const touched = new Int32Array(m);
  let count = 0;
  for (let a = 0; a < m; a++) {
    let nTouched = 0;
    for (let q = start[a]; q < start[a + 1]; q++) {
      const e = order[q];
      const i = el.row[e];
      const j = el.col[e];
      const b = high[e];
      const v = fold.foldCoef[i] * fold.foldCoef[j] * el.value[e];
      if (!isTouched[b]) {
        isTouched[b] = 1;
        touched[nTouched++] = b;
      }
      sum[b] += i !== j && a === b ? 2 * v : v;
    }
    // Few partners per column (one per term and direction): an insertion sort.
    for (let t = 1; t < nTouched; t++) {
      const b = touched[t];
      let u = t - 1;
      for (; u >= 0 && touched[u] > b; u--) touched[u + 1] = touched[u];
      touched[u + 1] = b;
    }
    for (let t = 0; t < nTouched; t++) {
      const b = touched[t];
      if (sum[b] !== 0) {
        pairA[count] = a;
        pairB[count] = b;
        value[count++] = sum[b];
      }
      sum[b] = 0;
      isTouched[b] = 0;
    }
  }
  return { pairA: pairA.slice(0, count), pairB: pairB.slice(0, count), value: value.slice(0, count) };
}

/** The folded block as a dense column-major matrix (the dense reference). */
function foldedDense(folded: FoldedElements, m: number): Float64Array {
  const h = new Float64Array(m * m);
  for (let q = 0; q < folded.value.length; q++) {
    h[folded.pairA[q] * m + folded.pairB[q]] = folded.value[q];
    h[folded.pairB[q] * m + folded.pairA[q]] = folded.value[q];
  }
  return h;
}

/** An independent sub-block of a folded block: its columns in solving order, band width, and its elements. */
interface FoldPart {
  members: Int32Array;
  /** Smallest column index (names the part in the label memory). */
  first: number;
  bandwidth: number;
  /** Indices of the folded pairs inside the part, and every folded column's position in its part. */
  pairs: Int32Array;
  position: Int32Array;
  /** The part's number and every folded column's part (which unfolded elements belong to it, for ∂E/∂p). */
  component: number;
  componentOf: Int32Array;
}

/** The whole folded block as one part (the dense reference). */
function foldWhole(fold: Fold): FoldPart[] {
  const members = Int32Array.from({ length: fold.m }, (_, a) => a);
  return [
    {
      members,
      first: 0,
      bandwidth: Math.max(0, fold.m - 1),
      pairs: new Int32Array(0),
      position: members,
      component: 0,
      componentOf: new Int32Array(fold.m),
    },
  ];
}

/**
 * The connected components of a folded block's non-zero pattern (union–find over its off-diagonal
 * pairs, whatever term made them): independent sub-blocks with the same eigenvalues and, padded
 * with zeros, the same eigenvectors. Nothing here knows a symmetry rule; a term that conserves a
 * quantum number (k − ℓ for the Δk = ±1 Coriolis term alone, k mod 6 for h3 alone) shows up as
 * separate components by itself. Each component's columns are ordered by k of their first function
 * (every term has a bounded Δk, so the sub-block is a band matrix) and its half bandwidth measured.
 */
function foldComponents(fold: Fold, folded: FoldedElements, basis: BasisFn[]): FoldPart[] {
  const m = fold.m;
  const parent = Int32Array.from({ length: m }, (_, a) => a);
  const root = (a: number): number => {
    while (parent[a] !== a) {
      parent[a] = parent[parent[a]];
      a = parent[a];
    }
    return a;
  };
  for (let q = 0; q < folded.value.length; q++) {
    const ra = root(folded.pairA[q]);
    const rb = root(folded.pairB[q]);
    if (ra !== rb) parent[Math.max(ra, rb)] = Math.min(ra, rb);
  }
  // Components by root (the smallest column, since unions keep the smaller root), in column order.
  const compOf = new Int32Array(m);
  const compIndex = new Int32Array(m).fill(-1);
  const firsts: number[] = [];
  for (let a = 0; a < m; a++) {
    const r = root(a);
    if (compIndex[r] < 0) {
      compIndex[r] = firsts.length;
      firsts.push(r);
    }
    compOf[a] = compIndex[r];
  }
  const lists: number[][] = firsts.map(() => []);
  for (let a = 0; a < m; a++) lists[compOf[a]].push(a);
  const position = new Int32Array(m);
  const parts = lists.map((list, c) => {
    list.sort((p, q) => basis[fold.colI[p]].k - basis[fold.colI[q]].k || p - q);
    list.forEach((a, t) => (position[a] = t));
    return { members: Int32Array.from(list), first: firsts[c], bandwidth: 0, pairs: [] as number[] };
  });
  for (let q = 0; q < folded.value.length; q++) {
    const a = folded.pairA[q];
    const b = folded.pairB[q];
    const part = parts[compOf[a]];
    part.pairs.push(q);
    part.bandwidth = Math.max(part.bandwidth, Math.abs(position[a] - position[b]));
  }
  return parts.map((p, c) => ({ ...p, pairs: Int32Array.from(p.pairs), position, component: c, componentOf: compOf }));
}

/** A part's sub-block as band rows (bandEigen's layout, lower half filled). */
function partRows(part: FoldPart, folded: FoldedElements): Float64Array {
  const b = part.bandwidth;
  const width = 2 * b + 1;
  const rows = new Float64Array(part.members.length * width);
  for (const q of part.pairs) {
    const la = part.position[folded.pairA[q]];
    const lb = part.position[folded.pairB[q]];
    const hi = Math.max(la, lb);
    rows[hi * width + Math.min(la, lb) - hi + b] = folded.value[q];
  }
  return rows;
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
  // Pairs by descending overlap (ties: lower pair index first), fixed greedily. The pairs of overlap
  // at least 1/(2n) are sorted and visited first, the rest only if some label is still open: the
  // order of one full sort, at the cost of a few pairs per vector.
  const labels = new Int32Array(n).fill(-1);
  const oldDone = new Uint8Array(n);
  let left = n;
  let sum = 0;
  const threshold = 0.5 / n;
  for (const isAbove of [true, false]) {
    if (left === 0) break;
    const pairs: number[] = [];
    for (let p = 0; p < n * n; p++) if (overlap[p] >= threshold === isAbove) pairs.push(p);
    pairs.sort((p, q) => overlap[q] - overlap[p] || p - q);
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
  }
  return { labels, meanOverlap: n > 0 ? sum / n : 1 };
}

/**
 * The matrix elements of a class block, each pair once, in the order they are made; the ∂H_ij/∂p
 * terms only when asked (`withDerivatives`), so a call without them allocates nothing per element.
 * Two calls over the same block make the same elements in the same order (their indices agree).
 */
class ElementList implements ElementSink {
  row: number[] = [];
  col: number[] = [];
  value: number[] = [];
  /** Element e's terms are dParam/dCoef[dStart[e] … dStart[e + 1]) (with derivatives only). */
  dStart: number[] = [];
  dParam: number[] = [];
  dCoef: number[] = [];
  constructor(readonly withDerivatives: boolean) {}
  add(i: number, j: number, value: number): boolean {
    if (j < 0) return false;
    this.row.push(i);
    this.col.push(j);
    this.value.push(value);
    if (this.withDerivatives) this.dStart.push(this.dParam.length);
    return true;
  }
  term(param: number, coef: number): void {
    this.dParam.push(param);
    this.dCoef.push(coef);
  }
  /** Close the last element's terms (dStart gets its final entry). */
  close(): this {
    if (this.withDerivatives) this.dStart.push(this.dParam.length);
    return this;
  }
}

/** A class block's basis functions by (state, k, ℓ): the index of a function, or −1 when it is not in the block. */
function basisFinder(states: number, J: number, basis: BasisFn[]): (state: number, k: number, ell: number) => number {
  const span = 2 * J + 1;
  const lookup = new Int32Array(states * span * 3).fill(-1);
  basis.forEach((b, i) => (lookup[(b.state * span + b.k + J) * 3 + b.ell + 1] = i));
  return (state, k, ell) => (k < -J || k > J ? -1 : lookup[(state * span + k + J) * 3 + ell + 1]);
}

/** Every nonzero matrix element of a class block (each pair once), with ∂/∂p when asked. */
function blockElements(
  group: CoupledGroup,
  J: number,
  x: number,
  p: ArrayLike<number>,
  basis: BasisFn[],
  withDerivatives: boolean,
): ElementList {
  const el = new ElementList(withDerivatives);
  const find = basisFinder(group.states.length, J, basis);
  const poly = new Float64Array(14);
  basis.forEach((b, i) => {
    const st = group.states[b.state];
    const o = group.stateOffset[b.state];
    rotorPolynomialBasis(J, b.k, poly);
    let e = p[o];
    for (let t = 0; t < 14; t++) e += p[o + 1 + t] * poly[t];
    if (st.isDegenerate) {
      // origin, B, U, …(14 polynomial)…, zeta, etaJ, etaK, q22, q22J, q12
      const kl = b.k * b.ell;
      const iU = o + 2;
      const iZ = o + 15;
      e += -2 * p[iU] * p[iZ] * kl + p[o + 16] * x * kl + p[o + 17] * b.k * b.k * kl;
      el.add(i, i, e);
      if (withDerivatives) {
        diagonalTerms(el, o, poly);
        el.term(iU, -2 * p[iZ] * kl);
        el.term(iZ, -2 * p[iU] * kl);
        el.term(o + 16, x * kl);
        el.term(o + 17, b.k * b.k * kl);
      }
      if (b.ell === 1) {
        const f = ellQ22Factor(x, b.k);
        if (f !== 0 && el.add(i, find(b.state, b.k - 2, -1), f * (p[o + 18] + p[o + 19] * x)) && withDerivatives) {
          el.term(o + 18, f);
          el.term(o + 19, f * x);
        }
      } else {
        const f = ellQ12Factor(x, b.k);
        if (f !== 0 && el.add(i, find(b.state, b.k - 1, 1), f * p[o + 20]) && withDerivatives) el.term(o + 20, f);
      }
    } else {
      el.add(i, i, e);
      if (withDerivatives) diagonalTerms(el, o, poly);
      const iH3 = o + 15;
      let f = 1;
      for (let t = 0; t < 6 && f !== 0; t++) f *= Math.sqrt(Math.max(0, x - (b.k + t) * (b.k + t + 1)));
      if (f !== 0 && el.add(i, find(b.state, b.k + 6, 0), p[iH3] * f) && withDerivatives) el.term(iH3, f);
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
        if (el.add(i, find(it.stateB, b.k, b.ell), p[o] + p[o + 1] * x + p[o + 2] * k2) && withDerivatives) {
          el.term(o, 1);
          el.term(o + 1, x);
          el.term(o + 2, k2);
        }
      });
      return;
    }
    if (a.isDegenerate !== bState.isDegenerate) {
      const s = a.isDegenerate ? it.stateB : it.stateA;
      const dg = a.isDegenerate ? it.stateA : it.stateB;
      basis.forEach((b, i) => {
        if (b.state !== s) return;
        const k = b.k;
        for (let sign = 1; sign >= -1; sign -= 2) {
          // Δk = ±1, Δℓ = ±1.
          const r = Math.sqrt(Math.max(0, x - k * (k + sign)));
          if (r > 0) {
            const kAvg2 = (k + sign / 2) ** 2;
            const c = p[o] + p[o + 1] * x + p[o + 2] * kAvg2 + p[o + 5] * x * x;
            if (el.add(i, find(dg, k + sign, sign), sign * c * r) && withDerivatives) {
              el.term(o, sign * r);
              el.term(o + 1, sign * r * x);
              el.term(o + 2, sign * r * kAvg2);
              el.term(o + 5, sign * r * x * x);
            }
          }
          // Δk = ∓2, Δℓ = ±1; (k ∓ 1)² is the mean k of the pair, squared (σv-symmetric).
          const r2 = Math.sqrt(Math.max(0, x - k * (k - sign))) * Math.sqrt(Math.max(0, x - (k - sign) * (k - 2 * sign)));
          const kMid2 = (k - sign) ** 2;
          if (r2 > 0 && el.add(i, find(dg, k - 2 * sign, sign), (p[o + 3] + p[o + 4] * x + p[o + 6] * kMid2) * r2) && withDerivatives) {
            el.term(o + 3, r2);
            el.term(o + 4, r2 * x);
            el.term(o + 6, r2 * kMid2);
          }
        }
      });
      return;
    }
    // Two degenerate states.
    basis.forEach((b, i) => {
      if (b.state !== it.stateA) return;
      const kl = b.k * b.ell;
      if (kl !== 0 && el.add(i, find(it.stateB, b.k, b.ell), (p[o] + p[o + 1] * x) * kl) && withDerivatives) {
        el.term(o, kl);
        el.term(o + 1, x * kl);
      }
      const sign = b.ell;
      const r = Math.sqrt(Math.max(0, x - b.k * (b.k + sign)));
      if (r > 0) {
        const c = p[o + 2] + p[o + 3] * x;
        if (el.add(i, find(it.stateB, b.k + sign, -sign), sign * c * r) && withDerivatives) {
          el.term(o + 2, sign * r);
          el.term(o + 3, sign * r * x);
        }
      }
    });
  });
  coupledHigherTermElements(group, x, p, basis, find, el);
  return el.close();
}

/** The ∂/∂p terms of a diagonal element common to every state: origin and the 14 rotor-polynomial constants. */
function diagonalTerms(el: ElementList, o: number, poly: Float64Array): void {
  el.term(o, 1);
  for (let t = 0; t < 14; t++) el.term(o + 1 + t, poly[t]);
}
