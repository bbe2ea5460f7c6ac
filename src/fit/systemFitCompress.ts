import { householderApplyQt, householderQr } from './householderQr';
import type { LeastSquaresProblem } from './leastSquares';

/** Lines whose Jacobian rows are zero outside the same few columns (one band: its two states). */
export interface SystemFitBlock {
  /** Observation indices (rows of the full problem) in the block. */
  rows: Int32Array;
  /** The floated-parameter columns the block's rows may touch. */
  columns: Int32Array;
}

/** What the compressed problem reads from the full one at a point p. */
export interface SystemFitBlockSource {
  /** Evaluate everything at p (called once per point, before any fill). */
  evaluate(p: Float64Array): void;
  /**
   * Fill a block's weighted residuals (y − f)/σ and its weighted Jacobian restricted to its
   * columns, column-major rows × columns, at the point last evaluated.
   */
  fill(block: SystemFitBlock, residuals: Float64Array, jacobian: Float64Array): void;
}

/**
 * The joint-fit least-squares problem with each block of lines reduced to its R factor: a block of
 * m_b lines touching n_b columns is factored J_b = Q_b R_b (Householder), and stands in the problem
 * as the n_b rows of R_b, with residuals the first n_b entries of Q_bᵀ r_b, plus one row with the
 * norm of the remaining m_b − n_b entries and zero Jacobian. Because Q_b is orthogonal,
 * χ² = ‖r‖² is kept, and so are the normal matrix JᵀJ, Jᵀr and every column norm, so the solver's
 * steps, rank test, singular values and covariance are those of the full problem to round-off,
 * while the full QR of 2·N·P² flops becomes Σ 2·m_b·n_b² (a joint fit's bands touch a few of its
 * constants each). The residuals at a point are compressed with the Q_b of that same point (the
 * Jacobian is computed with them and kept for the solver's next Jacobian call), so the residual
 * vector and the Jacobian the solver linearises always belong together.
 * Blocks with m_b ≤ n_b + 1 lines are passed through unchanged.
 * Source: Golub & Van Loan, Matrix Computations 4th ed. (2013) §5.3 (least squares by QR) and
 * §6.5.3 (updating/sequential QR of a stacked problem).
 * @param nParameters floated constants (columns)
 * @param blocks the blocks, together covering every observation once
 * @param source evaluation and fill callbacks of the full problem
 */
export function systemFitCompress(
  nParameters: number,
  blocks: readonly SystemFitBlock[],
  source: SystemFitBlockSource,
): LeastSquaresProblem {
  const isCompressed = blocks.map((b) => b.rows.length > b.columns.length + 1);
  const offsets: number[] = [];
  let m = 0;
  blocks.forEach((b, i) => {
    offsets.push(m);
    m += isCompressed[i] ? b.columns.length + 1 : b.rows.length;
  });
  const widest = Math.max(1, ...blocks.map((b) => b.rows.length * b.columns.length));
  const longest = Math.max(1, ...blocks.map((b) => b.rows.length));
  const jacB = new Float64Array(widest);
  const resB = new Float64Array(longest);
  const diag = new Float64Array(nParameters);
  const beta = new Float64Array(nParameters);
  const scale = new Float64Array(nParameters);
  // The compressed residuals and Jacobian at the last point seen.
  const lastP = new Float64Array(nParameters).fill(NaN);
  const res = new Float64Array(m);
  const jac = new Float64Array(m * nParameters);
  const compute = (p: Float64Array): void => {
    if (lastP.every((v, j) => v === p[j])) return;
    source.evaluate(p);
    jac.fill(0);
    blocks.forEach((b, i) => {
      const mb = b.rows.length;
      const nb = b.columns.length;
      const at = offsets[i];
      source.fill(b, resB, jacB);
      if (!isCompressed[i]) {
        for (let r = 0; r < mb; r++) {
          res[at + r] = resB[r];
          for (let c = 0; c < nb; c++) jac[b.columns[c] * m + at + r] = jacB[c * mb + r];
        }
        return;
      }
      // Columns scaled to unit norm first (their scales differ by up to 1e30: origin against HJ), R unscaled after.
      for (let c = 0; c < nb; c++) {
        let s2 = 0;
        for (let r = 0; r < mb; r++) s2 += jacB[c * mb + r] * jacB[c * mb + r];
        scale[c] = s2 > 0 ? Math.sqrt(s2) : 1;
        for (let r = 0; r < mb; r++) jacB[c * mb + r] /= scale[c];
      }
      householderQr(jacB, mb, nb, diag, beta);
      householderApplyQt(jacB, mb, nb, beta, resB);
      for (let r = 0; r < nb; r++) {
        res[at + r] = resB[r];
        // R: diagonal in diag, above it in the factored block (column-major, leading dimension mb).
        for (let c = r; c < nb; c++) jac[b.columns[c] * m + at + r] = (c === r ? diag[r] : jacB[c * mb + r]) * scale[c];
      }
      let rest = 0;
      for (let r = nb; r < mb; r++) rest += resB[r] * resB[r];
      res[at + nb] = Math.sqrt(rest);
    });
    lastP.set(p);
  };
  return {
    nObservations: m,
    nParameters,
    residuals(p, out) {
      compute(p);
      out.set(res);
    },
    jacobian(p, out) {
      compute(p);
      out.set(jac);
    },
  };
}
