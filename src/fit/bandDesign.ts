/**
 * The band's line positions as a function of the constants, and their derivatives, laid out for
 * the least-squares solver.
 *
 * ν = E'(J', K') − F''(J'', K'') is linear in every constant except the first-order Coriolis
 * term ∓2A'ζK' (C' for an oblate top), so ν = Σ θ_p G_p + A'ζ·h with G_p a fixed function of
 * the quantum numbers and h = ∓2K' (− for ΔK = +1, + for ΔK = −1). The derivatives are
 * G_p, plus ζ·h for A' and A'·h for ζ.
 * Source: the term values of physics/termValues.ts (Herzberg II (1945) eqs. (I,31)–(I,33) and (IV,45)).
 */
import {
  shapeUniqueName,
  stateUniqueConstant,
  type BandModel,
  type ParameterName,
  type TopShape,
  type TransitionQuanta,
} from '../physics/model';
import { householderQr, householderR } from './householderQr';
import type { LeastSquaresProblem } from './leastSquares';

/** Constants each state may carry for a shape, as fit keys; upper state first. */
export function fitParameterKeys(shape: TopShape): string[] {
  return [...fitStateNames(shape, 'upper').map((n) => `upper.${n}`), ...fitStateNames(shape, 'lower').map((n) => `lower.${n}`)];
}

/** Constants of one state for a shape (origin, ζ and q in the upper state only). */
export function fitStateNames(shape: TopShape, side: 'lower' | 'upper'): ParameterName[] {
  const common: ParameterName[] =
    shape === 'linear' ? ['B', 'DJ', 'HJ'] : ['B', shape === 'prolate' ? 'A' : 'C', 'DJ', 'DJK', 'DK', 'HJ', 'HJK', 'HKJ', 'HK'];
  if (side === 'lower') return common;
  return ['origin', ...common, shape === 'linear' ? 'q' : 'zeta'];
}

/** A parsed fit key. */
export interface FitKey {
  side: 'lower' | 'upper';
  name: ParameterName;
}

/** Split "upper.B" into side and name (no validation beyond the form). */
export function fitKeyParse(key: string): FitKey | null {
  const m = /^(lower|upper)\.([A-Za-z]+)$/.exec(key);
  return m ? { side: m[1] as 'lower' | 'upper', name: m[2] as ParameterName } : null;
}

/**
 * Each constant's term as monomials c·x^a·(K²)^b of its state, x = J(J+1); the sign is that
 * of F(J, K) (the lower state enters ν with the opposite sign). origin is x⁰K⁰ of the upper
 * state; ζ (bilinear) and q (l-doubling) are handled apart.
 */
const TERM_MONOMIALS: Partial<Record<ParameterName, ReadonlyArray<readonly [number, number, number]>>> = {
  origin: [[1, 0, 0]],
  B: [
    [1, 1, 0],
    [-1, 0, 1],
  ],
  A: [[1, 0, 1]],
  C: [[1, 0, 1]],
  DJ: [[-1, 2, 0]],
  DJK: [[-1, 1, 1]],
  DK: [[-1, 0, 2]],
  HJ: [[1, 3, 0]],
  HJK: [[1, 2, 1]],
  HKJ: [[1, 1, 2]],
  HK: [[1, 0, 3]],
};

/** ∂ν/∂q of one line: +J'(J'+1)/2 for P/R lines, −J'(J'+1)/2 for Q lines of a linear Π–Σ band, else 0. */
function lDoublingDerivative(model: Pick<BandModel, 'shape' | 'band'>, q: TransitionQuanta): number {
  if (model.band !== 'perpendicular' || model.shape !== 'linear') return 0;
  return (q.jUpper === q.jLower ? -0.5 : 0.5) * q.jUpper * (q.jUpper + 1);
}

/** h = ∂(Coriolis term)/∂(A'ζ): −2K' for ΔK = +1, +2K' for ΔK = −1, 0 without Coriolis term. */
function coriolisFactor(model: Pick<BandModel, 'shape' | 'band'>, q: TransitionQuanta): number {
  if (model.band !== 'perpendicular' || model.shape === 'linear') return 0;
  return (q.kUpper - q.kLower > 0 ? -2 : 2) * q.kUpper;
}

/** The part G_p of ∂ν/∂θ_p of one line that does not depend on the constants. */
function linearDerivative(model: Pick<BandModel, 'shape' | 'band'>, key: FitKey, q: TransitionQuanta): number {
  if (key.side === 'upper' && key.name === 'q') return lDoublingDerivative(model, q);
  const terms = TERM_MONOMIALS[key.name];
  if (!terms) return 0;
  const j = key.side === 'upper' ? q.jUpper : q.jLower;
  const k = key.side === 'upper' ? q.kUpper : q.kLower;
  const x = j * (j + 1);
  const k2 = k * k;
  let d = 0;
  for (const [c, a, b] of terms) d += c * x ** a * k2 ** b;
  return key.side === 'upper' ? d : -d;
}

/**
 * The derivative columns of a set of keys as a flat list of terms, so that one pass over the
 * lines fills every column (no per-line calls or allocations). Term t adds
 * coef[t] · x^xPow · (K²)^kPow of state isUpper[t] (or ∂ν/∂q when isLDoubling[t]) into column[t].
 */
interface TermPlan {
  count: number;
  column: Int32Array;
  coef: Float64Array;
  isUpper: Uint8Array;
  xPow: Uint8Array;
  kPow: Uint8Array;
  isLDoubling: Uint8Array;
}

function termPlan(entries: { key: FitKey; factor: number; column: number }[]): TermPlan {
  const rows: [number, number, number, number, number, number][] = [];
  for (const { key, factor, column } of entries) {
    const upper = key.side === 'upper';
    if (upper && key.name === 'q') {
      rows.push([column, factor, 1, 0, 0, 1]);
      continue;
    }
    for (const [c, a, b] of TERM_MONOMIALS[key.name] ?? []) rows.push([column, (upper ? 1 : -1) * c * factor, upper ? 1 : 0, a, b, 0]);
  }
  return {
    count: rows.length,
    column: Int32Array.from(rows, (r) => r[0]),
    coef: Float64Array.from(rows, (r) => r[1]),
    isUpper: Uint8Array.from(rows, (r) => r[2]),
    xPow: Uint8Array.from(rows, (r) => r[3]),
    kPow: Uint8Array.from(rows, (r) => r[4]),
    isLDoubling: Uint8Array.from(rows, (r) => r[5]),
  };
}

function parseKeys(keys: readonly string[]): FitKey[] {
  return keys.map((k) => {
    const p = fitKeyParse(k);
    if (!p) throw new Error(`bandDesign: parameter key must look like "upper.B" or "lower.DJ", got '${k}'`);
    return p;
  });
}

/**
 * ∂ν/∂θ of one line with respect to each key, at the model's constants (cm^-1 per unit of θ).
 * @param model band model (constants in cm^-1)
 * @param keys fit keys such as "upper.B"
 * @param q the line's quantum numbers
 * @param out optional output of length keys.length
 * @returns the gradient
 * Source: derivatives of physics/termValues.ts transitionWavenumber (see file comment).
 */
export function bandLineGradient(
  model: BandModel,
  keys: readonly string[],
  q: TransitionQuanta,
  out: Float64Array = new Float64Array(keys.length),
): Float64Array {
  const unique = shapeUniqueName(model.shape);
  const h = coriolisFactor(model, q);
  const parsed = parseKeys(keys);
  for (let j = 0; j < parsed.length; j++) {
    const key = parsed[j];
    let d = linearDerivative(model, key, q);
    if (key.side === 'upper' && h !== 0) {
      if (key.name === unique) d += model.upper.zeta * h;
      else if (key.name === 'zeta') d = stateUniqueConstant(model.upper, model.shape) * h;
    }
    out[j] = d;
  }
  return out;
}

/** Quantum numbers of many lines as columns (one pass of property reads, then typed arrays only). */
interface QuantaColumns {
  jUpper: Int32Array;
  kUpper: Int32Array;
  jLower: Int32Array;
  kLower: Int32Array;
}

function quantaColumns(quanta: readonly TransitionQuanta[]): QuantaColumns {
  const n = quanta.length;
  const c = { jUpper: new Int32Array(n), kUpper: new Int32Array(n), jLower: new Int32Array(n), kLower: new Int32Array(n) };
  for (let i = 0; i < n; i++) {
    const q = quanta[i];
    c.jUpper[i] = q.jUpper;
    c.kUpper[i] = q.kUpper;
    c.jLower[i] = q.jLower;
    c.kLower[i] = q.kLower;
  }
  return c;
}

/**
 * Fill the weighted design [basis columns | t] (column-major, n rows) in one pass over the lines.
 * Kept small and free of objects so V8 optimises it early (it is the per-line hot loop).
 */
function designFill(
  q: QuantaColumns,
  lines: { observedCm1: Float64Array; uncertaintyCm1: Float64Array },
  plan: TermPlan,
  a: Float64Array,
  o: { tColumn: number; coriolisBasis: number; hasCoriolis: boolean; isLDoublingBand: boolean; fixedBilinear: number },
): void {
  const n = q.jUpper.length;
  const width = o.tColumn + 1;
  const { column, coef, isUpper, xPow, kPow, isLDoubling, count } = plan;
  const powers = new Float64Array(16); // [upper x^0..3, upper K²^0..3, lower x^0..3, lower K²^0..3]
  const { tColumn, coriolisBasis, hasCoriolis, isLDoublingBand, fixedBilinear } = o;
  for (let i = 0; i < n; i++) {
    const ju = q.jUpper[i];
    const kuq = q.kUpper[i];
    const jl = q.jLower[i];
    const klq = q.kLower[i];
    const xu = ju * (ju + 1);
    const ku = kuq * kuq;
    const xl = jl * (jl + 1);
    const kl = klq * klq;
    powers[0] = 1;
    powers[1] = xu;
    powers[2] = xu * xu;
    powers[3] = xu * xu * xu;
    powers[4] = 1;
    powers[5] = ku;
    powers[6] = ku * ku;
    powers[7] = ku * ku * ku;
    powers[8] = 1;
    powers[9] = xl;
    powers[10] = xl * xl;
    powers[11] = xl * xl * xl;
    powers[12] = 1;
    powers[13] = kl;
    powers[14] = kl * kl;
    powers[15] = kl * kl * kl;
    // ∂ν/∂q (linear Π–Σ: ±J'(J'+1)/2) and h (−2K' for ΔK = +1, +2K' for ΔK = −1), as in
    // lDoublingDerivative and coriolisFactor.
    const lDoubling = isLDoublingBand ? (ju === jl ? -0.5 : 0.5) * xu : 0;
    const coriolis = hasCoriolis ? (kuq - klq > 0 ? -2 : 2) * kuq : 0;
    a[tColumn * n + i] = lines.observedCm1[i] - fixedBilinear * coriolis;
    for (let t = 0; t < count; t++) {
      const off = isUpper[t] === 1 ? 0 : 8;
      const v = isLDoubling[t] === 1 ? lDoubling : powers[off + xPow[t]] * powers[off + 4 + kPow[t]];
      a[column[t] * n + i] += coef[t] * v;
    }
    if (coriolisBasis >= 0) a[coriolisBasis * n + i] = coriolis;
    const w = 1 / lines.uncertaintyCm1[i];
    for (let b = 0; b < width; b++) a[b * n + i] *= w;
  }
}

/** Line data of a band fit problem (only the lines that enter the fit). */
export interface BandProblemLines {
  quanta: readonly TransitionQuanta[];
  /** Observed positions, cm^-1. */
  observedCm1: Float64Array;
  /** 1σ uncertainties, cm^-1. */
  uncertaintyCm1: Float64Array;
}

/** Options of bandProblem. */
export interface BandProblemOptions {
  /**
   * Reduce the N lines to an equivalent problem of (basis size + 1) pseudo-observations by one
   * QR factorisation (exact up to round-off; see bandProblem). Ignored when N is too small.
   * @default true
   */
  isCompressed?: boolean;
}

/** A band fit posed for leastSquaresSolve. */
export interface BandProblem {
  problem: LeastSquaresProblem;
  /** Start values of the floated constants, in key order. */
  start: Float64Array;
  /** Whether the problem was compressed to pseudo-observations. */
  isCompressed: boolean;
}

/**
 * Pose a band fit for leastSquaresSolve.
 *
 * Weighted, the positions are ν/σ = A·c(p): A holds the fixed basis columns G_p/σ of the
 * floated constants plus h/σ (the Coriolis column) when A' or ζ floats, and c(p) their
 * coefficients (p itself, and A'ζ for h). The fixed constants' contribution is moved into the
 * target t = (obs − fixed part)/σ. Because A does not depend on p, one Householder QR of
 * [A | t] = Q [[R, z], [0, ρ]] turns χ² = ‖t − A c‖² into ‖z − R c‖² + ρ² exactly (Q is
 * orthogonal), so every iteration works on (basis size + 1) pseudo-observations with the
 * same solution, Jacobian singular values and covariance as the full problem. The cost per fit
 * is one QR of an N×(P+2) matrix; nothing is allocated per line per iteration.
 * Source: Golub & Van Loan, Matrix Computations 4th ed. (2013) §5.3.3 (least squares via QR:
 * ‖Ax − b‖² = ‖Rx − z‖² + ρ²); derivatives as in the file comment.
 * @param model start model (cm^-1)
 * @param floated fit keys to float, in order
 * @param lines observed lines (all used)
 */
export function bandProblem(
  model: BandModel,
  floated: readonly string[],
  lines: BandProblemLines,
  options: BandProblemOptions = {},
): BandProblem {
  const n = lines.quanta.length;
  const nP = floated.length;
  const fKeys = parseKeys(floated);
  const floatedSet = new Set(floated);
  const fixedKeys = parseKeys(fitParameterKeys(model.shape).filter((k) => !floatedSet.has(k)));
  const unique = shapeUniqueName(model.shape);
  const uniqueIndex = unique ? floated.indexOf(`upper.${unique}`) : -1;
  const zetaIndex = floated.indexOf('upper.zeta');
  const uniqueFixed = stateUniqueConstant(model.upper, model.shape);
  const zetaFixed = model.upper.zeta;

  const isPerpendicular = model.band === 'perpendicular';
  const isLinear = model.shape === 'linear';
  let hasCoriolis = false;
  if (isPerpendicular && !isLinear) for (let i = 0; i < n && !hasCoriolis; i++) hasCoriolis = lines.quanta[i].kUpper !== 0;
  const useCoriolisColumn = hasCoriolis && (uniqueIndex >= 0 || zetaIndex >= 0);

  // Basis columns: one per floated constant except ζ (whose G is 0), then h if needed, then t.
  const basisOfParam = new Int32Array(nP).fill(-1);
  let nBasis = 0;
  for (let j = 0; j < nP; j++) if (j !== zetaIndex) basisOfParam[j] = nBasis++;
  const coriolisBasis = useCoriolisColumn ? nBasis++ : -1;
  const width = nBasis + 1;
  const tColumn = nBasis;
  // The fixed constants' terms go into the t column with the opposite sign (t = obs − fixed part).
  const plan = termPlan([
    ...fKeys.flatMap((key, j) => (basisOfParam[j] >= 0 ? [{ key, factor: 1, column: basisOfParam[j] }] : [])),
    ...fixedKeys.filter((k) => model[k.side][k.name] !== 0).map((key) => ({ key, factor: -model[key.side][key.name], column: tColumn })),
  ]);
  const fixedBilinear = useCoriolisColumn ? 0 : uniqueFixed * zetaFixed;
  const a = new Float64Array(n * width);
  designFill(quantaColumns(lines.quanta), lines, plan, a, {
    tColumn,
    coriolisBasis,
    hasCoriolis,
    isLDoublingBand: isPerpendicular && isLinear,
    fixedBilinear,
  });
  const tOffset = tColumn * n;
  const start = Float64Array.from(fKeys, (k) => model[k.side][k.name]);

  const isCompressed = (options.isCompressed ?? true) && n > width;
  let matrix: Float64Array;
  let rows: number;
  let target: Float64Array;
  let rho = -1;
  if (isCompressed) {
    const rDiagonal = new Float64Array(width);
    householderQr(a, n, width, rDiagonal, new Float64Array(width));
    const r = householderR(a, n, width, rDiagonal);
    rows = nBasis;
    matrix = new Float64Array(nBasis * nBasis);
    for (let b = 0; b < nBasis; b++) matrix.set(r.subarray(b * width, b * width + nBasis), b * nBasis);
    target = Float64Array.from(r.subarray(nBasis * width, nBasis * width + nBasis));
    rho = Math.abs(r[nBasis * width + nBasis]);
  } else {
    rows = n;
    matrix = a;
    target = a.subarray(tOffset, tOffset + n);
  }
  const coefficients = new Float64Array(nBasis);
  const fillCoefficients = (p: Float64Array): void => {
    for (let j = 0; j < nP; j++) if (basisOfParam[j] >= 0) coefficients[basisOfParam[j]] = p[j];
    if (coriolisBasis >= 0) {
      coefficients[coriolisBasis] = (uniqueIndex >= 0 ? p[uniqueIndex] : uniqueFixed) * (zetaIndex >= 0 ? p[zetaIndex] : zetaFixed);
    }
  };
  const nObservations = rows + (rho >= 0 ? 1 : 0);

  const residuals = (p: Float64Array, out: Float64Array): void => {
    fillCoefficients(p);
    out.set(target);
    for (let b = 0; b < nBasis; b++) {
      const cb = coefficients[b];
      if (cb === 0) continue;
      const off = b * rows;
      for (let i = 0; i < rows; i++) out[i] -= cb * matrix[off + i];
    }
    if (rho >= 0) out[rows] = rho;
  };

  const jacobian = (p: Float64Array, out: Float64Array): void => {
    out.fill(0);
    for (let j = 0; j < nP; j++) {
      const col = j * nObservations;
      const b = basisOfParam[j];
      if (b >= 0) for (let i = 0; i < rows; i++) out[col + i] = matrix[b * rows + i];
      // ∂(A'ζ)/∂A' = ζ and ∂(A'ζ)/∂ζ = A' multiply the Coriolis column.
      let dCoriolis = 0;
      if (coriolisBasis >= 0 && j === uniqueIndex) dCoriolis = zetaIndex >= 0 ? p[zetaIndex] : zetaFixed;
      if (coriolisBasis >= 0 && j === zetaIndex) dCoriolis = uniqueIndex >= 0 ? p[uniqueIndex] : uniqueFixed;
      if (dCoriolis !== 0) {
        const off = coriolisBasis * rows;
        for (let i = 0; i < rows; i++) out[col + i] += dCoriolis * matrix[off + i];
      }
    }
  };

  return { problem: { nObservations, nParameters: nP, residuals, jacobian }, start, isCompressed };
}
