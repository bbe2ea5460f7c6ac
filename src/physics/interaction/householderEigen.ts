import { tridiagonalEigenFast, type SymmetricEigenResult } from '../hamiltonian/symmetricEigen';

/**
 * Eigenvalues and unit eigenvectors of a dense real symmetric matrix: Householder reduction to
 * tridiagonal form T = Qᵀ A Q (reflectors kept), the tridiagonal problem by QL values and inverse
 * iteration (hamiltonian/symmetricEigen.ts tridiagonalEigenFast), then each vector of T carried back
 * by the reflectors. About (4/3 + 2) n³ flops against the Jacobi method's ~10 n³ per sweep, which
 * matters for the coupled blocks of a dyad (order 2J + 1 per class, a hundred and more at J = 60).
 * Source: A. S. Householder, J. ACM 5, 339 (1958); G. H. Golub and C. F. Van Loan, Matrix
 * Computations, 4th ed. (2013), §8.3.1 (Householder tridiagonalisation, Algorithm 8.3.1).
 * @param a column-major n×n symmetric matrix (only the lower triangle is read; not modified), any units
 * @param n order
 * @returns eigenvalues ascending (same units as a) and unit eigenvectors as columns
 */
export function householderEigen(a: ArrayLike<number>, n: number): SymmetricEigenResult {
  if (!Number.isInteger(n) || n < 0) throw new Error(`householderEigen: order must be a non-negative integer, got ${n}`);
  if (a.length < n * n) throw new Error(`householderEigen: need ${n * n} matrix entries for order ${n}, got ${a.length}`);
  // Working copy, full symmetric, column-major (w[c * n + r]).
  const w = new Float64Array(n * n);
  for (let c = 0; c < n; c++) {
    for (let r = c; r < n; r++) {
      const x = a[c * n + r];
      if (!Number.isFinite(x)) throw new Error(`householderEigen: entry (row ${r}, column ${c}) is ${x}`);
      w[c * n + r] = x;
      w[r * n + c] = x;
    }
  }
  const diagonal = new Float64Array(n);
  const off = new Float64Array(Math.max(0, n - 1));
  // Reflector of step c: v (entries c+1 … n−1, stored in refl[c * n + i]) with H = I − β v vᵀ.
  const refl = new Float64Array(n * n);
  const beta = new Float64Array(n);
  const p = new Float64Array(n);
  for (let c = 0; c < n - 2; c++) {
    let scale = 0;
    for (let i = c + 1; i < n; i++) scale = Math.max(scale, Math.abs(w[c * n + i]));
    if (scale === 0) {
      beta[c] = 0;
      continue;
    }
    let sigma = 0;
    for (let i = c + 1; i < n; i++) {
      const v = w[c * n + i] / scale;
      refl[c * n + i] = v;
      sigma += v * v;
    }
    const x0 = refl[c * n + c + 1];
    const alpha = x0 >= 0 ? -Math.sqrt(sigma) : Math.sqrt(sigma);
    refl[c * n + c + 1] = x0 - alpha;
    const vv = sigma - x0 * x0 + (x0 - alpha) * (x0 - alpha);
    if (vv === 0) {
      beta[c] = 0;
      continue;
    }
    const b = 2 / vv;
    beta[c] = b;
    // A ← H A H on the trailing block: p = β A v, K = β/2 vᵀp, q = p − K v, A ← A − v qᵀ − q vᵀ.
    let vp = 0;
    for (let i = c + 1; i < n; i++) {
      let s = 0;
      // w is kept symmetric, so row i is read as column i (contiguous).
      const row = i * n;
      const v = c * n;
      for (let j = c + 1; j < n; j++) s += w[row + j] * refl[v + j];
      p[i] = b * s;
      vp += refl[c * n + i] * p[i];
    }
    const kk = 0.5 * b * vp;
    for (let i = c + 1; i < n; i++) p[i] -= kk * refl[c * n + i];
    for (let j = c + 1; j < n; j++) {
      const vj = refl[c * n + j];
      const qj = p[j];
      for (let i = c + 1; i < n; i++) w[j * n + i] -= refl[c * n + i] * qj + p[i] * vj;
    }
    // Column c below the subdiagonal is now (alpha·scale, 0, …).
    w[c * n + c + 1] = alpha * scale;
    w[(c + 1) * n + c] = alpha * scale;
    for (let i = c + 2; i < n; i++) {
      w[c * n + i] = 0;
      w[i * n + c] = 0;
    }
  }
  for (let i = 0; i < n; i++) diagonal[i] = w[i * n + i];
  for (let i = 0; i < n - 1; i++) off[i] = w[i * n + i + 1];
  const t = tridiagonalEigenFast(diagonal, off);
  // Back-transform: x = H_0 H_1 … H_{n−3} y, applied from the last reflector to the first.
  const vectors = t.vectors;
  for (let j = 0; j < n; j++) {
    const col = j * n;
    for (let c = n - 3; c >= 0; c--) {
      const b = beta[c];
      if (b === 0) continue;
      let s = 0;
      for (let i = c + 1; i < n; i++) s += refl[c * n + i] * vectors[col + i];
      s *= b;
      for (let i = c + 1; i < n; i++) vectors[col + i] -= s * refl[c * n + i];
    }
  }
  return { n, values: t.values, vectors };
}
