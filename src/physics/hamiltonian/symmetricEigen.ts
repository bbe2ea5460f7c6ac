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
