import { householderApplyQt, householderQr, householderR } from './householderQr';
import { jacobiSvd, type SvdResult } from './jacobiSvd';

/**
 * The linearised weighted problem at one point: J_w D = Q U S Vᵀ with D the column scaling,
 * plus Uᵀ Qᵀ r. Everything the step, the rank test and the covariance need.
 */
export interface Linearisation {
  nParameters: number;
  /** D_j = 1/‖column j of J_w‖ (1 for an all-zero column). */
  columnScale: Float64Array;
  /** Columns that are identically zero: no observation depends on that parameter. */
  zeroColumns: number[];
  /** R of the QR of the scaled Jacobian, n×n column-major (for re-testing rank with columns removed). */
  rTriangular: Float64Array;
  /** SVD of rTriangular (= singular values and right vectors of the scaled Jacobian). */
  svd: SvdResult;
  /** u_jᵀ (Qᵀ r)_{0..n−1}, the residual's components along the left singular vectors. */
  uTc: Float64Array;
  /** Singular values above rankRelativeTolerance · s_max. */
  rank: number;
  /** s_max / s_min of the scaled Jacobian (Infinity when rank deficient). */
  conditionNumber: number;
}

/** Linearises a problem at successive points with buffers allocated once per solve. */
export interface Lineariser {
  /**
   * Column-scale, QR-factor and SVD the weighted Jacobian at the current point.
   * @param jac weighted Jacobian ∂f/∂p / σ, column-major m×n (overwritten by the factorisation)
   * @param residuals weighted residuals (y − f)/σ, length m (read only)
   */
  linearise(jac: Float64Array, residuals: Float64Array): Linearisation;
}

/**
 * Make a Lineariser for m observations and n parameters.
 * Scaling each column to unit length first makes the rank test and condition number
 * independent of the parameters' units (B in cm^-1 against HJ ~ 1e-13 cm^-1). No column
 * pivoting: the rank is judged from the SVD of R, which does not need it.
 * Source: Golub & Van Loan, Matrix Computations 4th ed. (2013) §5.5 (rank-deficient least squares
 * via the SVD); J. J. Moré, "The Levenberg–Marquardt algorithm: implementation and theory",
 * in G. A. Watson (ed.), Numerical Analysis, Springer LNM 630 (1978) for the column-scaled formulation.
 * @param rankRelativeTolerance relative singular-value threshold of the rank test
 */
export function lineariserCreate(m: number, n: number, rankRelativeTolerance: number): Lineariser {
  const rDiagonal = new Float64Array(n);
  const beta = new Float64Array(n);
  const qtr = new Float64Array(m);
  return {
    linearise(jac, residuals) {
      const columnScale = new Float64Array(n);
      const zeroColumns: number[] = [];
      for (let j = 0; j < n; j++) {
        const c = j * m;
        let s2 = 0;
        for (let i = c; i < c + m; i++) s2 += jac[i] * jac[i];
        if (s2 === 0) {
          zeroColumns.push(j);
          columnScale[j] = 1;
          continue;
        }
        const d = 1 / Math.sqrt(s2);
        columnScale[j] = d;
        for (let i = c; i < c + m; i++) jac[i] *= d;
      }
      householderQr(jac, m, n, rDiagonal, beta);
      qtr.set(residuals);
      householderApplyQt(jac, m, n, beta, qtr);
      const rTriangular = householderR(jac, m, n, rDiagonal);
      const svd = jacobiSvd(rTriangular, n, n);
      const uTc = new Float64Array(n);
      for (let j = 0; j < n; j++) {
        let s = 0;
        for (let i = 0; i < n; i++) s += svd.u[j * n + i] * qtr[i];
        uTc[j] = s;
      }
      const sMax = n > 0 ? svd.s[0] : 0;
      let rank = 0;
      while (rank < n && svd.s[rank] > rankRelativeTolerance * sMax) rank++;
      const conditionNumber = rank === n && n > 0 ? sMax / svd.s[n - 1] : n === 0 ? 1 : Infinity;
      return { nParameters: n, columnScale, zeroColumns, rTriangular, svd, uTc, rank, conditionNumber };
    },
  };
}

/**
 * The damped Gauss–Newton step δp = D V diag(s/(s² + λ)) Uᵀ Qᵀ r (λ = 0: plain Gauss–Newton),
 * using only the first `rank` singular triplets.
 * Source: Levenberg (1944) / Marquardt, J. Soc. Ind. Appl. Math. 11, 431 (1963), in the SVD form of
 * Golub & Van Loan (2013) §6.1 (ridge regression form).
 * @param lambda damping ≥ 0, in units of the scaled singular values squared
 * @param stepOut out: parameter step, length n, in parameter units
 * @returns the largest |δp_i| in units of the unit-weight standard error of p_i
 */
export function lineariseStep(lin: Linearisation, lambda: number, stepOut: Float64Array): number {
  const { nParameters: n, svd, uTc, rank, columnScale } = lin;
  let worst = 0;
  for (let i = 0; i < n; i++) {
    let z = 0;
    let var2 = 0;
    for (let j = 0; j < rank; j++) {
      const s = svd.s[j];
      const vij = svd.v[j * n + i];
      z += vij * ((s / (s * s + lambda)) * uTc[j]);
      var2 += (vij * vij) / (s * s);
    }
    stepOut[i] = z * columnScale[i];
    const inSigma = var2 > 0 ? Math.abs(z) / Math.sqrt(var2) : 0;
    if (inSigma > worst) worst = inSigma;
  }
  return worst;
}

/**
 * χ² decrease the linearised model predicts for the damped step of lineariseStep:
 * Σ_j (u_jᵀc)² (1 − (λ/(s_j² + λ))²).
 * Source: H. B. Nielsen, IMM-REP-1999-05 (1999), the gain-ratio denominator L(0) − L(h).
 */
export function linearisePredictedDecrease(lin: Linearisation, lambda: number): number {
  let d = 0;
  for (let j = 0; j < lin.rank; j++) {
    const s2 = lin.svd.s[j] * lin.svd.s[j];
    const f = lambda / (s2 + lambda);
    d += lin.uTc[j] * lin.uTc[j] * (1 - f * f);
  }
  return d;
}

/**
 * Unit-weight covariance (J_wᵀ J_w)⁻¹ = D V S⁻² Vᵀ D of the parameters (not yet scaled by σ_w²).
 * Source: Golub & Van Loan (2013) §5.5; W. H. Press et al., Numerical Recipes 3rd ed. (2007) §15.4.2 (covariance from the SVD).
 * @returns n×n row-major Float64Array in parameter units squared
 */
export function lineariseCovariance(lin: Linearisation): Float64Array {
  const { nParameters: n, svd, rank, columnScale } = lin;
  const c = new Float64Array(n * n);
  for (let a = 0; a < n; a++) {
    for (let b = a; b < n; b++) {
      let sum = 0;
      for (let j = 0; j < rank; j++) {
        const s = svd.s[j];
        sum += (svd.v[j * n + a] * svd.v[j * n + b]) / (s * s);
      }
      const val = sum * columnScale[a] * columnScale[b];
      c[a * n + b] = val;
      c[b * n + a] = val;
    }
  }
  return c;
}
