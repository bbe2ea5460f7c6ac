/**
 * Eigenvalues and eigenvectors of small real symmetric matrices: the per-J blocks of effective
 * rovibrational Hamiltonians.
 *
 * Two entries: `symmetricEigen` for a dense block (cyclic Jacobi rotations, accurate to round-off
 * and simple; meant for blocks up to a few dozen rows) and `tridiagonalEigen` for a block that is
 * already tridiagonal (implicit QL with Wilkinson shifts, O(n²) without vectors), which is the shape
 * of the ℓ-type chains of a degenerate vibrational state.
 */

/** Eigen-decomposition A = V diag(values) Vᵀ. */
export interface SymmetricEigenResult {
  /** Order of the matrix. */
  n: number;
  /** Eigenvalues, ascending (units of the matrix, e.g. cm⁻¹). */
  values: Float64Array;
  /** n×n column-major: column j (entries j·n … j·n + n − 1) is the unit eigenvector of values[j]. */
  vectors: Float64Array;
}

/** Most Jacobi sweeps before giving up (convergence is quadratic; 5–10 are typical). */
const JACOBI_MAX_SWEEPS = 60;
/** Most QL iterations per eigenvalue (2–3 are typical). */
const QL_MAX_ITERATIONS = 60;

function checkSquare(name: string, a: ArrayLike<number>, n: number): void {
  if (!Number.isInteger(n) || n < 0) throw new Error(`${name}: order must be a non-negative integer, got ${n}`);
  if (a.length < n * n) throw new Error(`${name}: need ${n * n} matrix entries for order ${n}, got ${a.length}`);
  for (let i = 0; i < n * n; i++) {
    if (!Number.isFinite(a[i])) throw new Error(`${name}: entry ${i} (row ${i % n}, column ${Math.floor(i / n)}) is ${a[i]}`);
  }
}

/**
 * Eigenvalues and unit eigenvectors of a dense real symmetric matrix by cyclic Jacobi rotations
 * (each rotation zeroes one off-diagonal pair; sweeps repeat until the off-diagonal part is below
 * round-off of the diagonal). Only the lower triangle is read, so a matrix that is symmetric up to
 * round-off is treated as exactly symmetric.
 * Source: C. G. J. Jacobi, J. Reine Angew. Math. 30, 51 (1846); the rotation angle and the
 * threshold strategy of H. Rutishauser, Numer. Math. 9, 1 (1966); G. H. Golub and C. F. Van Loan,
 * Matrix Computations, 4th ed. (2013), §8.5.2 (cyclic Jacobi).
 * @param a column-major n×n symmetric matrix (not modified), any units
 * @param n order
 * @returns eigenvalues ascending (same units as a) and eigenvectors as columns
 */
export function symmetricEigen(a: ArrayLike<number>, n: number): SymmetricEigenResult {
  checkSquare('symmetricEigen', a, n);
  const w = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    for (let i = j; i < n; i++) {
      w[j * n + i] = a[j * n + i];
      w[i * n + j] = a[j * n + i];
    }
  }
  const v = new Float64Array(n * n);
  for (let j = 0; j < n; j++) v[j * n + j] = 1;
  const eps = 2.220446049250313e-16;
  for (let sweep = 0; sweep < JACOBI_MAX_SWEEPS; sweep++) {
    let off = 0;
    let diag = 0;
    for (let j = 0; j < n; j++) {
      diag += w[j * n + j] * w[j * n + j];
      for (let i = j + 1; i < n; i++) off += w[j * n + i] * w[j * n + i];
    }
    if (off <= eps * eps * diag || off === 0) break;
    if (sweep === JACOBI_MAX_SWEEPS - 1) throw new Error(`symmetricEigen: no convergence after ${JACOBI_MAX_SWEEPS} sweeps (n = ${n})`);
    for (let p = 0; p < n - 1; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = w[q * n + p];
        const app = w[p * n + p];
        const aqq = w[q * n + q];
        // An element below round-off of both diagonal entries changes nothing: set it to zero.
        if (Math.abs(apq) <= eps * 0.5 * Math.min(Math.abs(app), Math.abs(aqq))) {
          w[q * n + p] = 0;
          w[p * n + q] = 0;
          continue;
        }
        if (apq === 0) continue;
        const theta = (aqq - app) / (2 * apq);
        const t = (theta >= 0 ? 1 : -1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        // A' = Jᵀ A J with J the rotation in the (p, q) plane.
        for (let k = 0; k < n; k++) {
          const akp = w[p * n + k];
          const akq = w[q * n + k];
          w[p * n + k] = c * akp - s * akq;
          w[q * n + k] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = w[k * n + p];
          const aqk = w[k * n + q];
          w[k * n + p] = c * apk - s * aqk;
          w[k * n + q] = s * apk + c * aqk;
        }
        w[q * n + p] = 0;
        w[p * n + q] = 0;
        for (let k = 0; k < n; k++) {
          const vkp = v[p * n + k];
          const vkq = v[q * n + k];
          v[p * n + k] = c * vkp - s * vkq;
          v[q * n + k] = s * vkp + c * vkq;
        }
      }
    }
  }
  const d = new Float64Array(n);
  for (let j = 0; j < n; j++) d[j] = w[j * n + j];
  return sortedResult(n, d, v);
}

/**
 * Eigenvalues and unit eigenvectors of a real symmetric tridiagonal matrix by the implicit QL
 * algorithm with Wilkinson's shift; a negligible off-diagonal element splits the matrix, so chains
 * that fall apart (an interaction constant set to 0) cost nothing extra.
 * Source: H. Bowdler, R. S. Martin, C. Reinsch and J. H. Wilkinson, "The QR and QL algorithms for
 * symmetric matrices", Numer. Math. 11, 293 (1968); Golub and Van Loan (2013) §8.3.
 * @param diagonal the n diagonal entries (not modified), any units
 * @param offDiagonal the n − 1 entries T[i, i+1] = T[i+1, i] (not modified)
 * @param withVectors false skips the eigenvectors (then `vectors` has length 0) @default true
 * @returns eigenvalues ascending and eigenvectors as columns
 */
export function tridiagonalEigen(diagonal: ArrayLike<number>, offDiagonal: ArrayLike<number>, withVectors = true): SymmetricEigenResult {
  const n = diagonal.length;
  if (n > 0 && offDiagonal.length < n - 1) {
    throw new Error(`tridiagonalEigen: need ${n - 1} off-diagonal entries for order ${n}, got ${offDiagonal.length}`);
  }
  const d = Float64Array.from(diagonal);
  const e = new Float64Array(n);
  for (let i = 0; i < n - 1; i++) e[i] = offDiagonal[i];
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(d[i]) || !Number.isFinite(e[i])) throw new Error(`tridiagonalEigen: entry ${i} is not finite`);
  }
  const z = withVectors ? new Float64Array(n * n) : new Float64Array(0);
  if (withVectors) for (let j = 0; j < n; j++) z[j * n + j] = 1;
  tridiagonalQl(d, e, z, n, withVectors);
  return withVectors ? sortedResult(n, d, z) : { n, values: d.sort(), vectors: z };
}

/** Below this order the QL vectors are as cheap as inverse iteration. */
const INVERSE_ITERATION_MIN_ORDER = 24;

/**
 * Same result as tridiagonalEigen, faster for long chains: eigenvalues by QL without vectors
 * (O(n²)), then each eigenvector by inverse iteration with the tridiagonal LU factors of T − λI
 * (O(n) per vector), re-orthogonalised (modified Gram–Schmidt) against the vectors of eigenvalues
 * closer than 1e-3‖T‖, as LAPACK's dstein does. Every vector is checked (‖T v − λ v‖ and its
 * overlap with its neighbours); if one fails, the whole block is redone with QL vectors, so the
 * result is never worse than tridiagonalEigen's.
 * Source: J. H. Wilkinson, The Algebraic Eigenvalue Problem (1965), ch. 9 (inverse iteration);
 * Golub and Van Loan (2013) §8.2.2; the clustering tolerance of LAPACK dstein (E. Anderson et al.,
 * LAPACK Users' Guide, 3rd ed. (1999)).
 * @param diagonal the n diagonal entries, any units
 * @param offDiagonal the n − 1 entries beside the diagonal
 * @returns eigenvalues ascending and unit eigenvectors as columns
 */
export function tridiagonalEigenFast(diagonal: ArrayLike<number>, offDiagonal: ArrayLike<number>): SymmetricEigenResult {
  const n = diagonal.length;
  if (n < INVERSE_ITERATION_MIN_ORDER) return tridiagonalEigen(diagonal, offDiagonal);
  const { values } = tridiagonalEigen(diagonal, offDiagonal, false);
  const vectors = inverseIterationVectors(diagonal, offDiagonal, values);
  if (!vectors) return tridiagonalEigen(diagonal, offDiagonal);
  return sortedResult(n, values, vectors);
}

/** Eigenvectors for known eigenvalues (ascending) by inverse iteration; null when a check fails. */
function inverseIterationVectors(d: ArrayLike<number>, e: ArrayLike<number>, values: Float64Array): Float64Array | null {
  const n = d.length;
  const eps = 2.220446049250313e-16;
  let norm = 0;
  for (let i = 0; i < n; i++) norm = Math.max(norm, Math.abs(d[i]) + (i > 0 ? Math.abs(e[i - 1]) : 0) + (i < n - 1 ? Math.abs(e[i]) : 0));
  if (norm === 0) return null;
  const tiny = eps * norm;
  const clusterTol = 1e-3 * norm;
  const z = new Float64Array(n * n);
  const u0 = new Float64Array(n);
  const u1 = new Float64Array(n);
  const u2 = new Float64Array(n);
  const mult = new Float64Array(n);
  const swapped = new Uint8Array(n);
  const x = new Float64Array(n);
  const start = new Float64Array(n);
  for (let i = 0; i < n; i++) start[i] = 0.5 + ((i * 0.6180339887498949) % 1);
  let clusterStart = 0;
  let previousShift = -Infinity;
  for (let j = 0; j < n; j++) {
    if (j > 0 && values[j] - values[j - 1] > clusterTol) clusterStart = j;
    // Eigenvalues closer than round-off are pulled apart slightly so each solve gives a new direction.
    let shift = values[j];
    if (shift - previousShift < 10 * tiny) shift = previousShift + 10 * tiny;
    previousShift = shift;
    // LU of T − shift·I with partial pivoting (rows k and k+1 swap when the subdiagonal is larger).
    let bk = d[0] - shift;
    let ck = n > 1 ? e[0] : 0;
    for (let k = 0; k < n - 1; k++) {
      const a = e[k];
      const bNext = d[k + 1] - shift;
      const cNext = k + 1 < n - 1 ? e[k + 1] : 0;
      if (Math.abs(a) > Math.abs(bk)) {
        const m = bk / a;
        swapped[k] = 1;
        mult[k] = m;
        u0[k] = a;
        u1[k] = bNext;
        u2[k] = cNext;
        bk = ck - m * bNext;
        ck = -m * cNext;
      } else {
        const pivot = Math.abs(bk) < tiny ? (bk < 0 ? -tiny : tiny) : bk;
        const m = a / pivot;
        swapped[k] = 0;
        mult[k] = m;
        u0[k] = pivot;
        u1[k] = ck;
        u2[k] = 0;
        bk = bNext - m * ck;
        ck = cNext;
      }
    }
    u0[n - 1] = Math.abs(bk) < tiny ? (bk < 0 ? -tiny : tiny) : bk;
    // Start vector: fixed, with no special structure (a golden-ratio sequence in [0.5, 1.5)). With an
    // eigenvalue accurate to round-off, one solve already amplifies its direction by ~1/ε; a second
    // one settles the rest (Wilkinson 1965, ch. 9 §54).
    x.set(start);
    for (let iteration = 0; iteration < 2; iteration++) {
      for (let k = 0; k < n - 1; k++) {
        if (swapped[k]) {
          const t = x[k];
          x[k] = x[k + 1];
          x[k + 1] = t;
        }
        x[k + 1] -= mult[k] * x[k];
      }
      for (let k = n - 1; k >= 0; k--) {
        let s = x[k];
        if (k + 1 < n) s -= u1[k] * x[k + 1];
        if (k + 2 < n) s -= u2[k] * x[k + 2];
        x[k] = s / u0[k];
      }
      for (let q = clusterStart; q < j; q++) {
        let dot = 0;
        for (let i = 0; i < n; i++) dot += x[i] * z[q * n + i];
        for (let i = 0; i < n; i++) x[i] -= dot * z[q * n + i];
      }
      let s2 = 0;
      for (let i = 0; i < n; i++) s2 += x[i] * x[i];
      const inv = 1 / Math.sqrt(s2);
      if (!Number.isFinite(inv)) return null;
      for (let i = 0; i < n; i++) x[i] *= inv;
    }
    // Checks: residual ‖T x − λ x‖ and orthogonality to the previous vector.
    let r2 = 0;
    for (let i = 0; i < n; i++) {
      let t = (d[i] - values[j]) * x[i];
      if (i > 0) t += e[i - 1] * x[i - 1];
      if (i < n - 1) t += e[i] * x[i + 1];
      r2 += t * t;
    }
    if (Math.sqrt(r2) > 1e3 * n * tiny) return null;
    if (j > 0) {
      let dot = 0;
      for (let i = 0; i < n; i++) dot += x[i] * z[(j - 1) * n + i];
      if (Math.abs(dot) > 1e-8) return null;
    }
    z.set(x, j * n);
  }
  return z;
}

/** In place: d ← eigenvalues, z (columns) ← rotations applied to the starting columns. */
function tridiagonalQl(d: Float64Array, e: Float64Array, z: Float64Array, n: number, withVectors: boolean): void {
  const eps = 2.220446049250313e-16;
  for (let l = 0; l < n; l++) {
    let iteration = 0;
    for (;;) {
      // Look for a negligible off-diagonal element at or after l: the block l..m is unreduced.
      let m = l;
      for (; m < n - 1; m++) {
        if (Math.abs(e[m]) <= eps * (Math.abs(d[m]) + Math.abs(d[m + 1]))) break;
      }
      if (m === l) break;
      if (++iteration > QL_MAX_ITERATIONS) throw new Error(`tridiagonalEigen: no convergence for eigenvalue ${l} (n = ${n})`);
      // Wilkinson shift from the leading 2×2 of the block.
      let g = (d[l + 1] - d[l]) / (2 * e[l]);
      let r = Math.hypot(g, 1);
      g = d[m] - d[l] + e[l] / (g + (g >= 0 ? r : -r));
      let s = 1;
      let c = 1;
      let p = 0;
      let underflow = false;
      for (let i = m - 1; i >= l; i--) {
        const f = s * e[i];
        const b = c * e[i];
        r = Math.hypot(f, g);
        e[i + 1] = r;
        if (r === 0) {
          // The chase met an exact zero: deflate there and restart the block.
          d[i + 1] -= p;
          e[m] = 0;
          underflow = true;
          break;
        }
        s = f / r;
        c = g / r;
        g = d[i + 1] - p;
        r = (d[i] - g) * s + 2 * c * b;
        p = s * r;
        d[i + 1] = g + p;
        g = c * r - b;
        if (withVectors) {
          const ci = i * n;
          const cj = (i + 1) * n;
          for (let k = 0; k < n; k++) {
            const zk1 = z[cj + k];
            const zk0 = z[ci + k];
            z[cj + k] = s * zk0 + c * zk1;
            z[ci + k] = c * zk0 - s * zk1;
          }
        }
      }
      if (underflow) continue;
      d[l] -= p;
      e[l] = g;
      e[m] = 0;
    }
  }
}

/** Order eigenpairs by ascending eigenvalue and fix each vector's sign (largest component > 0). */
function sortedResult(n: number, d: Float64Array, v: Float64Array): SymmetricEigenResult {
  const order = Array.from({ length: n }, (_, j) => j).sort((x, y) => d[x] - d[y]);
  const values = new Float64Array(n);
  const vectors = new Float64Array(n * n);
  order.forEach((src, dst) => {
    values[dst] = d[src];
    let big = 0;
    for (let i = 0; i < n; i++) if (Math.abs(v[src * n + i]) > Math.abs(v[src * n + big])) big = i;
    const sign = v[src * n + big] < 0 ? -1 : 1;
    for (let i = 0; i < n; i++) vectors[dst * n + i] = sign * v[src * n + i];
  });
  return { n, values, vectors };
}
