/**
 * Householder QR factorisation of a tall column-major matrix, in place.
 *
 * On return the upper triangle above the diagonal holds R (strictly upper part), `rDiagonal`
 * holds R's diagonal, and column k from row k down holds the Householder vector v_k of
 * H_k = I − beta_k v_k v_kᵀ, with Q = H_0 H_1 … H_{n−1}. Columns are contiguous
 * (a[j*m + i] is row i, column j) so the inner loops run over consecutive memory.
 * Source: G. H. Golub and C. F. Van Loan, Matrix Computations, 4th ed. (2013), Alg. 5.1.1 and 5.2.1.
 * @param a column-major m×n matrix, m >= n (overwritten)
 * @param m rows
 * @param n columns
 * @param rDiagonal out: n diagonal entries of R
 * @param beta out: n reflector coefficients (0 for a zero column)
 */
export function householderQr(a: Float64Array, m: number, n: number, rDiagonal: Float64Array, beta: Float64Array): void {
  if (m < n) throw new Error(`householderQr: need rows >= columns, got ${m}×${n}`);
  for (let k = 0; k < n; k++) {
    const ck = k * m;
    let norm2 = 0;
    for (let i = ck + k; i < ck + m; i++) norm2 += a[i] * a[i];
    const norm = Math.sqrt(norm2);
    if (norm === 0) {
      rDiagonal[k] = 0;
      beta[k] = 0;
      continue;
    }
    const x0 = a[ck + k];
    // Choose the sign that avoids cancellation in v0 = x0 − alpha.
    const alpha = x0 >= 0 ? -norm : norm;
    a[ck + k] = x0 - alpha;
    const b = 1 / (norm * (norm + Math.abs(x0)));
    beta[k] = b;
    rDiagonal[k] = alpha;
    // Two columns per pass: the reflector column is read once for both (memory-bound loop).
    let j = k + 1;
    for (; j + 1 < n; j += 2) {
      const c1 = j * m;
      const c2 = c1 + m;
      let s1 = 0;
      let s2 = 0;
      for (let i = k; i < m; i++) {
        const v = a[ck + i];
        s1 += v * a[c1 + i];
        s2 += v * a[c2 + i];
      }
      s1 *= b;
      s2 *= b;
      for (let i = k; i < m; i++) {
        const v = a[ck + i];
        a[c1 + i] -= s1 * v;
        a[c2 + i] -= s2 * v;
      }
    }
    if (j < n) {
      const cj = j * m;
      let s = 0;
      for (let i = k; i < m; i++) s += a[ck + i] * a[cj + i];
      s *= b;
      for (let i = k; i < m; i++) a[cj + i] -= s * a[ck + i];
    }
  }
}

/**
 * Apply Qᵀ of a householderQr factorisation to a vector, in place (y ← Qᵀ y).
 * @param a factored matrix from householderQr
 * @param m rows
 * @param n columns
 * @param beta reflector coefficients from householderQr
 * @param y length-m vector (overwritten)
 */
export function householderApplyQt(a: Float64Array, m: number, n: number, beta: Float64Array, y: Float64Array): void {
  for (let k = 0; k < n; k++) {
    const b = beta[k];
    if (b === 0) continue;
    const ck = k * m;
    let s = 0;
    for (let i = k; i < m; i++) s += a[ck + i] * y[i];
    s *= b;
    for (let i = k; i < m; i++) y[i] -= s * a[ck + i];
  }
}

/**
 * Copy R (n×n upper triangular, column-major) out of a householderQr factorisation.
 * @returns out (allocated when not given)
 */
export function householderR(
  a: Float64Array,
  m: number,
  n: number,
  rDiagonal: Float64Array,
  out: Float64Array = new Float64Array(n * n),
): Float64Array {
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      out[j * n + i] = i < j ? a[j * m + i] : i === j ? rDiagonal[j] : 0;
    }
  }
  return out;
}
