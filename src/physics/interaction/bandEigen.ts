import { tridiagonalEigenFast, type SymmetricEigenResult } from '../hamiltonian/symmetricEigen';
import { householderEigen } from './householderEigen';

const EPS = 2.220446049250313e-16;
/** Inverse-iteration solves per vector at most (two are usual; Wilkinson 1965, ch. 9 §54). */
const INVERSE_ITERATION_MAX = 4;
/** Most QL iterations per eigenvalue (2–3 are typical). */
const QL_MAX_ITERATIONS = 60;
/** Below this order the dense solver is as fast and the band machinery not worth it. */
const BAND_MIN_ORDER = 12;
/** A vector is accepted when ‖A v − λ v‖ ≤ this × n ε‖A‖ (a few round-offs of a band row per entry). */
const RESIDUAL_STOP = 2;

/**
 * Work space for the temporaries of one call (band copies, the factors, the start vector), taken
 * from one buffer reused from call to call: a call allocates only what it returns. Calls never
 * overlap (JavaScript runs one at a time and nothing here calls out), so `workReset` at the start of
 * bandEigen frees the previous call's. When the buffer is too small a larger one is made; views
 * taken before keep the old one.
 */
let workFloat = new Float64Array(1 << 12);
let workInt = new Int32Array(1 << 10);
let workFloatTop = 0;
let workIntTop = 0;

function workReset(): void {
  workFloatTop = 0;
  workIntTop = 0;
}

/** A zero-filled Float64Array of `size` from the work space. */
function workFloats(size: number): Float64Array {
  if (workFloatTop + size > workFloat.length) {
    workFloat = new Float64Array(Math.max(2 * workFloat.length, 2 * size));
    workFloatTop = 0;
  }
  const view = workFloat.subarray(workFloatTop, workFloatTop + size);
  workFloatTop += size;
  return view.fill(0);
}

/** A zero-filled Int32Array of `size` from the work space. */
function workInts(size: number): Int32Array {
  if (workIntTop + size > workInt.length) {
    workInt = new Int32Array(Math.max(2 * workInt.length, 2 * size));
    workIntTop = 0;
  }
  const view = workInt.subarray(workIntTop, workIntTop + size);
  workIntTop += size;
  return view.fill(0);
}

/**
 * Eigenvalues and unit eigenvectors of a real symmetric band matrix (every entry farther than
 * `halfBandwidth` from the diagonal is zero), given by its band rows, in O(n² b²) instead of the
 * dense solver's O(n³):
 *
 * 1. the matrix, shifted by the mean of its diagonal (smaller norm, so smaller round-off), is reduced
 *    to tridiagonal form by Givens rotations that annihilate the outermost diagonal one element at a
 *    time and chase each bulge down the band (no transformation kept); its eigenvalues by QL;
 * 2. each eigenvector by inverse iteration on the band matrix itself, with the band LU factors of
 *    A − λI (partial pivoting), re-orthogonalised (modified Gram–Schmidt, twice) against the vectors
 *    whose eigenvalues lie within 10⁻³‖A‖, as LAPACK's dstein does for a tridiagonal matrix.
 *
 * Every vector is checked (‖A v − λ v‖ against round-off of ‖A‖, and its overlap with the vectors of
 * nearby eigenvalues); if one fails, the whole matrix is solved again by householderEigen, so the
 * result is never worse than the dense solver's. A band of 0 or 1 goes to the diagonal and
 * tridiagonal solvers, a wide band (4b ≥ n) or a small order to householderEigen.
 * Source: H. Rutishauser, "On Jacobi rotation patterns", Proc. Symp. Appl. Math. 15, 219 (1963) and
 * H. R. Schwarz, "Tridiagonalization of a symmetric band matrix", Numer. Math. 12, 231 (1968)
 * (band reduction by chased rotations); J. H. Wilkinson, The Algebraic Eigenvalue Problem (1965),
 * ch. 9 (inverse iteration); G. H. Golub and C. F. Van Loan, Matrix Computations, 4th ed. (2013),
 * §4.3 (band LU with partial pivoting), §8.2.2; the clustering tolerance of LAPACK dstein
 * (E. Anderson et al., LAPACK Users' Guide, 3rd ed. (1999)).
 * @param rows the band by rows: rows[i·(2b + 1) + (j − i + b)] = A[i, j] for |i − j| ≤ b (only j ≤ i
 *   is read; entries outside the matrix are ignored; not modified), any units
 * @param n order
 * @param halfBandwidth b: A[i, j] = 0 for |i − j| > b
 * @returns eigenvalues ascending (units of A) and unit eigenvectors as columns
 */
/** bandEigen's result, with the path that produced it. */
export interface BandEigenResult extends SymmetricEigenResult {
  /**
   * 'band': reduction and inverse iteration; 'tridiagonal' / 'diagonal': a band of 1 or 0;
   * 'dense': householderEigen, for a small or wide matrix or after a vector failed its check.
   */
  solvedBy: 'band' | 'tridiagonal' | 'diagonal' | 'dense';
}

export function bandEigen(rows: ArrayLike<number>, n: number, halfBandwidth: number): BandEigenResult {
  if (!Number.isInteger(n) || n < 0) throw new Error(`bandEigen: order must be a non-negative integer, got ${n}`);
  if (!Number.isInteger(halfBandwidth) || halfBandwidth < 0)
    throw new Error(`bandEigen: half bandwidth must be a non-negative integer, got ${halfBandwidth}`);
  const width = 2 * halfBandwidth + 1;
  if (rows.length < n * width)
    throw new Error(`bandEigen: need ${n * width} band entries for order ${n} and half bandwidth ${halfBandwidth}, got ${rows.length}`);
  const b = Math.min(halfBandwidth, Math.max(0, n - 1));
  // A as band rows of width 2b + 1, both halves from the lower one (b may be smaller than asked).
  const B2 = 2 * b + 1;
  workReset();
  const ab = workFloats(n * B2);
  for (let i = 0; i < n; i++)
    for (let j = Math.max(0, i - b); j <= i; j++) {
      const v = rows[i * width + j - i + halfBandwidth];
      if (!Number.isFinite(v)) throw new Error(`bandEigen: entry (row ${i}, column ${j}) is ${v}`);
      ab[i * B2 + j - i + b] = v;
      ab[j * B2 + i - j + b] = v;
    }
  if (b === 0) return { ...diagonalResult(ab, n), solvedBy: 'diagonal' };
  if (b === 1) {
    const d = new Float64Array(n);
    const e = new Float64Array(n - 1);
    for (let i = 0; i < n; i++) d[i] = ab[i * 3 + 1];
    for (let i = 0; i < n - 1; i++) e[i] = ab[i * 3 + 2];
    return { ...tridiagonalEigenFast(d, e), solvedBy: 'tridiagonal' };
  }
  if (n < BAND_MIN_ORDER || 4 * b >= n) return { ...householderEigen(bandToDense(ab, n, b), n), solvedBy: 'dense' };
  let shift = 0;
  for (let i = 0; i < n; i++) shift += ab[i * B2 + b];
  shift /= n;
  for (let i = 0; i < n; i++) ab[i * B2 + b] -= shift;
  // The ∞-norm of A − shift·I, which scales every tolerance below.
  let norm = 0;
  for (let i = 0; i < n; i++) {
    let sum = 0;
    for (let t = 0; t < B2; t++) sum += Math.abs(ab[i * B2 + t]);
    norm = Math.max(norm, sum);
  }
  if (norm === 0) {
    for (let i = 0; i < n; i++) ab[i * B2 + b] += shift;
    return { ...diagonalResult(ab, n), solvedBy: 'diagonal' };
  }
  const values = bandValues(ab, n, b);
  const vectors = bandVectors(ab, n, b, values, norm);
  if (!vectors) {
    for (let i = 0; i < n; i++) ab[i * B2 + b] += shift;
    return { ...householderEigen(bandToDense(ab, n, b), n), solvedBy: 'dense' };
  }
  for (let j = 0; j < n; j++) values[j] += shift;
  return { n, values, vectors, solvedBy: 'band' };
}

/** Band rows of width 2b + 1 as a dense column-major matrix. */
function bandToDense(ab: Float64Array, n: number, b: number): Float64Array {
  const B2 = 2 * b + 1;
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = Math.max(0, i - b); j <= Math.min(n - 1, i + b); j++) a[j * n + i] = ab[i * B2 + j - i + b];
  return a;
}

/** A diagonal matrix (band rows of width 1): its entries sorted, unit vectors. */
function diagonalResult(ab: Float64Array, n: number): SymmetricEigenResult {
  const width = ab.length / Math.max(1, n);
  const mid = (width - 1) / 2;
  const order = Array.from({ length: n }, (_, i) => i).sort((p, q) => ab[p * width + mid] - ab[q * width + mid]);
  const values = Float64Array.from(order, (i) => ab[i * width + mid]);
  const vectors = new Float64Array(n * n);
  order.forEach((i, j) => (vectors[j * n + i] = 1));
  return { n, values, vectors };
}

/**
 * Eigenvalues (ascending) of a band matrix (band rows ab): band reduction to tridiagonal form by
 * chased Givens rotations (Rutishauser 1963), one outer diagonal at a time, then QL without vectors.
 */
function bandValues(ab: Float64Array, n: number, b: number): Float64Array {
  // Lower triangle in band storage one wider than the band (room for the bulge): entry (r, c),
  // 0 <= r − c <= b + 1, at w[c·(b + 2) + r − c].
  const B1 = b + 2;
  const B2 = 2 * b + 1;
  const w = workFloats(n * B1);
  for (let r = 0; r < n; r++) for (let c = Math.max(0, r - b); c <= r; c++) w[c * B1 + r - c] = ab[r * B2 + c - r + b];
  for (let d = b; d >= 2; d--) {
    // Bandwidth d → d − 1: zero A[j + d, j] for each column j, then chase the bulge it makes.
    for (let j = 0; j + d < n; j++) {
      let col = j;
      let q = j + d;
      while (q < n) {
        const p = q - 1;
        const x = w[col * B1 + p - col];
        const y = w[col * B1 + q - col];
        if (y === 0) break;
        const r = Math.sqrt(x * x + y * y);
        const c = x / r;
        const s = -y / r;
        // Rows and columns p, q hold non-zeros only within [q − d − 1, q + d] (band plus bulge).
        // Left of p: the pairs (p, t), (q, t); below q: (t, p), (t, q); then the 2×2 block.
        for (let t = Math.max(0, q - d - 1); t < p; t++) {
          const o = t * B1 - t;
          const tp = w[o + p];
          const tq = w[o + q];
          w[o + p] = c * tp - s * tq;
          w[o + q] = s * tp + c * tq;
        }
        const hi = Math.min(n - 1, q + d);
        for (let t = q + 1; t <= hi; t++) {
          const tp = w[p * B1 + t - p];
          const tq = w[q * B1 + t - q];
          w[p * B1 + t - p] = c * tp - s * tq;
          w[q * B1 + t - q] = s * tp + c * tq;
        }
        const app = w[p * B1];
        const aqq = w[q * B1];
        const apq = w[p * B1 + 1];
        w[p * B1] = c * c * app - 2 * c * s * apq + s * s * aqq;
        w[q * B1] = s * s * app + 2 * c * s * apq + c * c * aqq;
        w[p * B1 + 1] = c * s * (app - aqq) + (c * c - s * s) * apq;
        w[col * B1 + q - col] = 0;
        // The rotation moved row q's last band entry (column q + d) into row p: the next bulge.
        col = p;
        q += d;
      }
    }
  }
  const diagonal = new Float64Array(n);
  const off = workFloats(n - 1);
  for (let i = 0; i < n; i++) diagonal[i] = w[i * B1];
  for (let i = 0; i < n - 1; i++) off[i] = w[i * B1 + 1];
  return tridiagonalValues(diagonal, off);
}

/**
 * Eigenvalues (ascending) of a symmetric tridiagonal matrix by implicit QL with Wilkinson's shift,
 * values only: hamiltonian/symmetricEigen's tridiagonalQl without the vector branch, with √(x² + y²)
 * for Math.hypot (several times faster; entries here are cm⁻¹-sized, far from overflow, which is
 * checked: |entries| < 1e150).
 * Source: H. Bowdler, R. S. Martin, C. Reinsch and J. H. Wilkinson, Numer. Math. 11, 293 (1968)
 * (procedure tql1); Golub and Van Loan (2013) §8.3.
 * @param d the n diagonal entries (overwritten)
 * @param e the n − 1 off-diagonal entries (overwritten)
 */
function tridiagonalValues(d: Float64Array, e: Float64Array): Float64Array {
  const n = d.length;
  const off = workFloats(n);
  off.set(e);
  for (let i = 0; i < n; i++)
    if (!(Math.abs(d[i]) < 1e150 && Math.abs(off[i]) < 1e150))
      throw new Error(`bandEigen: tridiagonal entry ${i} is not finite or too large`);
  for (let l = 0; l < n; l++) {
    let iteration = 0;
    for (;;) {
      // A negligible off-diagonal element at or after l: the block l..m is unreduced.
      let m = l;
      for (; m < n - 1; m++) if (Math.abs(off[m]) <= EPS * (Math.abs(d[m]) + Math.abs(d[m + 1]))) break;
      if (m === l) break;
      if (++iteration > QL_MAX_ITERATIONS) throw new Error(`bandEigen: no QL convergence for eigenvalue ${l} (n = ${n})`);
      let g = (d[l + 1] - d[l]) / (2 * off[l]);
      let r = Math.sqrt(g * g + 1);
      g = d[m] - d[l] + off[l] / (g + (g >= 0 ? r : -r));
      let s = 1;
      let c = 1;
      let p = 0;
      let isSplit = false;
      for (let i = m - 1; i >= l; i--) {
        const f = s * off[i];
        const b = c * off[i];
        r = Math.sqrt(f * f + g * g);
        off[i + 1] = r;
        if (r === 0) {
          // The chase met an exact zero: deflate there and restart the block.
          d[i + 1] -= p;
          off[m] = 0;
          isSplit = true;
          break;
        }
        s = f / r;
        c = g / r;
        g = d[i + 1] - p;
        r = (d[i] - g) * s + 2 * c * b;
        p = s * r;
        d[i + 1] = g + p;
        g = c * r - b;
      }
      if (isSplit) continue;
      d[l] -= p;
      off[l] = g;
      off[m] = 0;
    }
  }
  return d.sort();
}

/**
 * Unit eigenvectors of a band matrix (band rows ab) for its eigenvalues (ascending) by inverse
 * iteration with band LU factors; null when a vector fails its check.
 */
function bandVectors(ab: Float64Array, n: number, b: number, values: Float64Array, norm: number): Float64Array | null {
  const tiny = EPS * norm;
  const clusterTol = 1e-3 * norm;
  const B2 = 2 * b + 1;
  // LU of A − λI in a window of 3b + 1 entries per row: entry (r, c) at r·W + (c − r + b), c − r ∈ [−b, 2b]
  // (row swaps of partial pivoting widen U to 2b above the diagonal).
  const W = 3 * b + 1;
  const lu = workFloats(n * W);
  // A in the same window, zeros past its band: copied into lu for each λ.
  const padded = workFloats(n * W);
  for (let r = 0; r < n; r++) padded.set(ab.subarray(r * B2, (r + 1) * B2), r * W);
  const mult = workFloats(n * b);
  const pivot = workInts(n);
  // 1 / U[k, k]: one division per column instead of one per entry.
  const inverse = workFloats(n);
  // last[r]: the last column of row r of the factors that can be non-zero (r + b, up to r + 2b
  // after row swaps); the updates skip the columns past it, which hold exact zeros.
  const last = workInts(n);
  const z = new Float64Array(n * n);
  const x = workFloats(n);
  const start = workFloats(n);
  for (let i = 0; i < n; i++) start[i] = 0.5 + ((i * 0.6180339887498949) % 1);
  let previousShift = -Infinity;
  for (let j = 0; j < n; j++) {
    // Eigenvalues closer than round-off are pulled apart slightly so each solve gives a new direction.
    let lambda = values[j];
    if (lambda - previousShift < 10 * tiny) lambda = previousShift + 10 * tiny;
    previousShift = lambda;
    for (let r = 0; r < n; r++) last[r] = Math.min(n - 1, r + b);
    lu.set(padded);
    for (let r = 0; r < n; r++) lu[r * W + b] -= lambda;
    // Start vector with no special structure; with λ accurate to round-off, each solve amplifies its
    // direction by ~‖A‖/(ε‖A‖), so one or two solves settle it (Wilkinson 1965, ch. 9 §54). The
    // first solve's forward substitution (L⁻¹P x) is done alongside the factorisation.
    x.set(start);
    for (let k = 0; k < n; k++) {
      const lastRow = Math.min(n - 1, k + b);
      let p = k;
      let best = Math.abs(lu[k * W + b]);
      for (let r = k + 1; r <= lastRow; r++) {
        const v = Math.abs(lu[r * W + k - r + b]);
        if (v > best) {
          best = v;
          p = r;
        }
      }
      pivot[k] = p;
      const rowK = k * W - k + b;
      if (p !== k) {
        const rowP = p * W - p + b;
        const swapEnd = Math.max(last[k], last[p]);
        for (let c = k; c <= swapEnd; c++) {
          const t = lu[rowK + c];
          lu[rowK + c] = lu[rowP + c];
          lu[rowP + c] = t;
        }
        const t = last[k];
        last[k] = last[p];
        last[p] = t;
        const xt = x[k];
        x[k] = x[p];
        x[p] = xt;
      }
      const cEnd = last[k];
      let piv = lu[rowK + k];
      // A singular pivot (λ exact to round-off) is replaced by ±ε‖A‖, as inverse iteration wants.
      if (Math.abs(piv) < tiny) lu[rowK + k] = piv = piv < 0 ? -tiny : tiny;
      const inv = 1 / piv;
      inverse[k] = inv;
      const xk = x[k];
      for (let r = k + 1; r <= lastRow; r++) {
        const rowR = r * W - r + b;
        const m = lu[rowR + k] * inv;
        mult[k * b + (r - k - 1)] = m;
        if (m === 0) continue;
        // Two entries a step (the rows are short, b to 2b entries: the loop's own cost counts).
        let c = k + 1;
        for (; c < cEnd; c += 2) {
          lu[rowR + c] -= m * lu[rowK + c];
          lu[rowR + c + 1] -= m * lu[rowK + c + 1];
        }
        if (c === cEnd) lu[rowR + c] -= m * lu[rowK + c];
        if (last[r] < cEnd) last[r] = cEnd;
        x[r] -= m * xk;
      }
    }
    let ok = false;
    let res = Infinity;
    for (let iteration = 0; iteration < INVERSE_ITERATION_MAX && !ok; iteration++) {
      if (iteration > 0)
        for (let k = 0; k < n; k++) {
          const p = pivot[k];
          if (p !== k) {
            const t = x[k];
            x[k] = x[p];
            x[p] = t;
          }
          const xk = x[k];
          const lastRow = Math.min(n - 1, k + b);
          if (xk !== 0) for (let r = k + 1; r <= lastRow; r++) x[r] -= mult[k * b + (r - k - 1)] * xk;
        }
      for (let k = n - 1; k >= 0; k--) {
        const rowK = k * W - k + b;
        const cEnd = last[k];
        let s = x[k];
        for (let c = k + 1; c <= cEnd; c++) s -= lu[rowK + c] * x[c];
        x[k] = s * inverse[k];
      }
      let before = 0;
      for (let i = 0; i < n; i++) before += x[i] * x[i];
      // Twice: one pass can leave a remainder whose own round-off is not orthogonal when most of x
      // lay along earlier vectors (a degenerate pair); two are enough (Parlett 1980, §6.9, after Kahan).
      for (let pass = 0; pass < 2; pass++) {
        for (let q = j - 1; q >= 0 && values[j] - values[q] <= clusterTol; q--) {
          let dot = 0;
          for (let i = 0; i < n; i++) dot += x[i] * z[q * n + i];
          for (let i = 0; i < n; i++) x[i] -= dot * z[q * n + i];
        }
      }
      let s2 = 0;
      for (let i = 0; i < n; i++) s2 += x[i] * x[i];
      const inv = 1 / Math.sqrt(s2);
      if (!Number.isFinite(inv) || inv === 0) return null;
      for (let i = 0; i < n; i++) x[i] *= inv;
      // Done when the residual is at round-off (it bounds the angle to the true vector by
      // residual/gap, whatever the iteration) and the last solve's direction was not mostly
      // cancelled by the orthogonalisation (the remainder would carry that solve's error).
      res = residual(ab, n, b, values[j], x);
      ok = s2 > 0.25 * before && res <= RESIDUAL_STOP * n * tiny;
    }
    ok ||= res <= 1e3 * n * tiny;
    if (!ok) return null;
    // Orthogonal to the vectors of nearby eigenvalues (far ones are orthogonal by the residual bound).
    for (let q = j - 1; q >= 0 && values[j] - values[q] <= clusterTol; q--) {
      let dot = 0;
      for (let i = 0; i < n; i++) dot += x[i] * z[q * n + i];
      if (Math.abs(dot) > 1e-12) return null;
    }
    z.set(x, j * n);
  }
  return z;
}

/** ‖A x − λ x‖₂ of a band matrix (band rows ab). */
function residual(ab: Float64Array, n: number, b: number, lambda: number, x: Float64Array): number {
  const B2 = 2 * b + 1;
  let r2 = 0;
  for (let i = 0; i < n; i++) {
    const row = i * B2 - i + b;
    let t = -lambda * x[i];
    const hi = Math.min(n - 1, i + b);
    for (let j = Math.max(0, i - b); j <= hi; j++) t += ab[row + j] * x[j];
    r2 += t * t;
  }
  return Math.sqrt(r2);
}
