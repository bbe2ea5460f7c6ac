/** Singular value decomposition A = U diag(s) Vᵀ of a small matrix (column-major arrays). */
export interface SvdResult {
  /** Rows of A. */
  m: number;
  /** Columns of A. */
  n: number;
  /** n singular values, descending, >= 0. */
  s: Float64Array;
  /** m×n column-major; column j is the left singular vector of s[j] (zero when s[j] = 0). */
  u: Float64Array;
  /** n×n column-major; column j is the right singular vector of s[j]. */
  v: Float64Array;
  /** Jacobi sweeps used. */
  sweeps: number;
}

/** Most sweeps before giving up (convergence is quadratic; 6–10 are typical). */
const MAX_SWEEPS = 60;

/**
 * One-sided (Hestenes) Jacobi SVD: rotate pairs of columns of A until all are mutually
 * orthogonal; the column norms are then the singular values. Accurate to round-off even for
 * tiny singular values, which is what the rank test needs. Meant for the small n×n
 * triangular factor R of a QR factorisation (n up to a few dozen).
 * Source: J. Demmel and K. Veselić, "Jacobi's method is more accurate than QR",
 * SIAM J. Matrix Anal. Appl. 13, 1204 (1992) (one-sided Jacobi with the rotation of their sec. 4).
 * @param a column-major m×n matrix, m >= n (not modified)
 * @param m rows
 * @param n columns
 */
export function jacobiSvd(a: Float64Array, m: number, n: number): SvdResult {
  if (m < n) throw new Error(`jacobiSvd: need rows >= columns, got ${m}×${n}`);
  const w = Float64Array.from(a.subarray(0, m * n));
  const v = new Float64Array(n * n);
  for (let j = 0; j < n; j++) v[j * n + j] = 1;
  const eps = 2.220446049250313e-16;
  let sweeps = 0;
  for (; sweeps < MAX_SWEEPS; sweeps++) {
    let rotated = false;
    for (let p = 0; p < n - 1; p++) {
      const cp = p * m;
      for (let q = p + 1; q < n; q++) {
        const cq = q * m;
        let alpha = 0;
        let betaN = 0;
        let gamma = 0;
        for (let i = 0; i < m; i++) {
          const x = w[cp + i];
          const y = w[cq + i];
          alpha += x * x;
          betaN += y * y;
          gamma += x * y;
        }
        if (gamma === 0 || Math.abs(gamma) <= eps * Math.sqrt(alpha * betaN)) continue;
        rotated = true;
        const zeta = (betaN - alpha) / (2 * gamma);
        const t = (zeta >= 0 ? 1 : -1) / (Math.abs(zeta) + Math.sqrt(1 + zeta * zeta));
        const c = 1 / Math.sqrt(1 + t * t);
        const s = c * t;
        for (let i = 0; i < m; i++) {
          const x = w[cp + i];
          const y = w[cq + i];
          w[cp + i] = c * x - s * y;
          w[cq + i] = s * x + c * y;
        }
        const vp = p * n;
        const vq = q * n;
        for (let i = 0; i < n; i++) {
          const x = v[vp + i];
          const y = v[vq + i];
          v[vp + i] = c * x - s * y;
          v[vq + i] = s * x + c * y;
        }
      }
    }
    if (!rotated) break;
  }
  const norms = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    let s2 = 0;
    for (let i = 0; i < m; i++) s2 += w[j * m + i] * w[j * m + i];
    norms[j] = Math.sqrt(s2);
  }
  const order = Array.from({ length: n }, (_, j) => j).sort((x, y) => norms[y] - norms[x]);
  const s = new Float64Array(n);
  const u = new Float64Array(m * n);
  const vSorted = new Float64Array(n * n);
  order.forEach((src, dst) => {
    s[dst] = norms[src];
    const inv = norms[src] > 0 ? 1 / norms[src] : 0;
    for (let i = 0; i < m; i++) u[dst * m + i] = w[src * m + i] * inv;
    for (let i = 0; i < n; i++) vSorted[dst * n + i] = v[src * n + i];
  });
  return { m, n, s, u, v: vSorted, sweeps };
}
