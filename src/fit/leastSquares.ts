import { linearisePredictedDecrease, lineariserCreate, lineariseStep, type Linearisation } from './leastSquaresLinearise';

/**
 * A weighted nonlinear least-squares problem, written so the solver allocates nothing per
 * observation: the callbacks fill caller-owned typed arrays.
 */
export interface LeastSquaresProblem {
  nObservations: number;
  nParameters: number;
  /** Fill out[i] = (y_i − f_i(p)) / σ_i. */
  residuals(p: Float64Array, out: Float64Array): void;
  /** Fill the weighted Jacobian ∂f_i/∂p_j / σ_i, column-major: out[j * nObservations + i]. */
  jacobian(p: Float64Array, out: Float64Array): void;
}

/** Options of leastSquaresSolve. */
export interface LeastSquaresOptions {
  /** @default 50 */
  maxIterations?: number;
  /** Converged when a step lowers χ² by less than this fraction. @default 1e-10 */
  chi2RelativeTolerance?: number;
  /** Converged when no parameter moves by more than this many unit-weight σ. @default 1e-6 */
  stepToleranceSigma?: number;
  /** Relative singular-value threshold of the rank test. @default 1e-10 */
  rankRelativeTolerance?: number;
  /** Called after each iteration (with χ² at the point reached). */
  onIteration?: (iteration: number, chi2: number) => void;
  /** Polled once per iteration. */
  shouldCancel?: () => boolean;
}

/** How leastSquaresSolve ended. */
export type LeastSquaresStatus =
  'chi2-change' | 'step-size' | 'no-further-decrease' | 'max-iterations' | 'rank-deficient' | 'non-finite' | 'cancelled';

/** Result of leastSquaresSolve. */
export interface LeastSquaresSolution {
  status: LeastSquaresStatus;
  /** Final parameters (the start values when refused). */
  parameters: Float64Array;
  /** Weighted residuals at the final parameters. */
  residuals: Float64Array;
  /** Σ residuals². */
  chi2: number;
  /** Jacobian evaluations (= iterations). */
  iterations: number;
  /**
   * Linearisation used for the last step (at the point the final, converged step started from;
   * that step is below the tolerance, so its covariance is that of the solution to first order).
   * For 'rank-deficient' it is the deficient one. Null only when nothing was linearised.
   */
  linearisation: Linearisation | null;
}

/** Largest number of damping increases tried within one iteration. */
const MAX_DAMPING_TRIES = 40;

function sumSquares(r: Float64Array): number {
  let s = 0;
  for (let i = 0; i < r.length; i++) s += r[i] * r[i];
  return s;
}

/**
 * Minimise χ²(p) = Σ ((y_i − f_i(p))/σ_i)² by Gauss–Newton steps with Levenberg–Marquardt
 * damping as a fallback (λ = 0 first; raised while χ² would rise, lowered by the gain ratio
 * after success, as Nielsen proposes).
 * Each step solves the column-scaled weighted Jacobian by Householder QR and a Jacobi SVD of R,
 * so a rank deficiency is seen, not papered over: the solver then stops with 'rank-deficient'
 * and hands back the SVD for the caller to explain.
 * Source: K. Levenberg, Q. Appl. Math. 2, 164 (1944); D. W. Marquardt, J. SIAM 11, 431 (1963);
 * H. B. Nielsen, "Damping parameter in Marquardt's method", IMM-REP-1999-05 (DTU, 1999) for the
 * damping update; Golub & Van Loan (2013) §5.5 for the SVD solve.
 * @param problem residual and Jacobian callbacks
 * @param start start parameters (not modified)
 */
export function leastSquaresSolve(
  problem: LeastSquaresProblem,
  start: ArrayLike<number>,
  options: LeastSquaresOptions = {},
): LeastSquaresSolution {
  const m = problem.nObservations;
  const n = problem.nParameters;
  const maxIterations = options.maxIterations ?? 50;
  const chi2Tol = options.chi2RelativeTolerance ?? 1e-10;
  const stepTol = options.stepToleranceSigma ?? 1e-6;
  const rankTol = options.rankRelativeTolerance ?? 1e-10;

  let p = Float64Array.from(start);
  let trial = new Float64Array(n);
  let r = new Float64Array(m);
  let rTrial = new Float64Array(m);
  const jac = new Float64Array(m * n);
  const step = new Float64Array(n);
  const lineariser = lineariserCreate(m, n, rankTol);

  problem.residuals(p, r);
  let chi2 = sumSquares(r);
  const done = (status: LeastSquaresStatus, iterations: number, lin: Linearisation | null): LeastSquaresSolution => ({
    status,
    parameters: p,
    residuals: r,
    chi2,
    iterations,
    linearisation: lin,
  });
  if (!Number.isFinite(chi2)) return done('non-finite', 0, null);

  // Damping λ (units of the scaled singular values squared) and its growth factor ν (Nielsen 1999).
  let lambda = 0;
  let nu = 2;
  let lin: Linearisation | null = null;
  for (let iteration = 1; iteration <= maxIterations; iteration++) {
    if (options.shouldCancel?.()) return done('cancelled', iteration - 1, lin);
    problem.jacobian(p, jac);
    lin = lineariser.linearise(jac, r);
    if (lin.zeroColumns.length > 0 || lin.rank < n) return done('rank-deficient', iteration, lin);
    const s0sq = lin.svd.s[0] * lin.svd.s[0];

    let accepted = false;
    let stepSigma = 0;
    let chi2Trial = Infinity;
    for (let attempt = 0; attempt < MAX_DAMPING_TRIES; attempt++) {
      stepSigma = lineariseStep(lin, lambda, step);
      for (let j = 0; j < n; j++) trial[j] = p[j] + step[j];
      problem.residuals(trial, rTrial);
      chi2Trial = sumSquares(rTrial);
      const predicted = linearisePredictedDecrease(lin, lambda);
      const gain = predicted > 0 ? (chi2 - chi2Trial) / predicted : chi2Trial <= chi2 ? 1 : -1;
      if (Number.isFinite(chi2Trial) && chi2Trial <= chi2 && gain > 0) {
        accepted = true;
        if (lambda > 0) {
          lambda *= Math.max(1 / 3, 1 - (2 * gain - 1) ** 3);
          if (lambda < 1e-12 * s0sq) lambda = 0;
        }
        nu = 2;
        break;
      }
      // A rise of χ² at round-off level while the linear model also expects (almost) no gain
      // means we already sit at the minimum.
      if (lambda === 0 && Number.isFinite(chi2Trial) && chi2Trial - chi2 <= 1e-12 * chi2 && predicted <= 1e-8 * chi2) {
        options.onIteration?.(iteration, chi2);
        return done('no-further-decrease', iteration, lin);
      }
      lambda = lambda === 0 ? 1e-3 * s0sq : lambda * nu;
      nu *= 2;
    }
    if (!accepted) {
      options.onIteration?.(iteration, chi2);
      return done('no-further-decrease', iteration, lin);
    }

    const decrease = chi2 - chi2Trial;
    const previous = chi2;
    [p, trial] = [trial, p];
    [r, rTrial] = [rTrial, r];
    chi2 = chi2Trial;
    options.onIteration?.(iteration, chi2);
    if (decrease <= chi2Tol * previous) return done('chi2-change', iteration, lin);
    if (stepSigma < stepTol) return done('step-size', iteration, lin);
  }
  return done('max-iterations', maxIterations, lin);
}
