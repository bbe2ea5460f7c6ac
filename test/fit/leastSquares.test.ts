import { describe, expect, it } from 'vitest';
import { leastSquaresSolve, type LeastSquaresProblem } from '../../src/fit/leastSquares';
import { lineariseCovariance } from '../../src/fit/leastSquaresLinearise';

/**
 * NIST StRD nonlinear regression problem Misra1a (lower difficulty): y = b1 (1 − exp(−b2 x)),
 * 14 observations. Data, starts and certified values from the NIST Statistical Reference Datasets
 * page for Misra1a (D. Misra, NIST, 1978), recalled and cross-checked against copies of the
 * certified file in public repositories.
 */
const MISRA1A = {
  y: [10.07, 14.73, 17.94, 23.93, 29.61, 35.18, 40.02, 44.82, 50.76, 55.05, 61.01, 66.4, 75.47, 81.78],
  x: [77.6, 114.9, 141.1, 190.8, 239.9, 289.0, 332.8, 378.4, 434.8, 477.3, 536.8, 593.1, 689.1, 760.0],
  starts: [
    [500, 1e-4],
    [250, 5e-4],
  ],
  certified: {
    b1: 2.3894212918e2,
    b2: 5.5015643181e-4,
    sd1: 2.7070075241,
    sd2: 7.2668688436e-6,
    rss: 1.2455138894e-1,
    residualSd: 1.018787633e-1,
  },
};

function misraProblem(): LeastSquaresProblem {
  const { x, y } = MISRA1A;
  const m = x.length;
  return {
    nObservations: m,
    nParameters: 2,
    residuals(p, out) {
      for (let i = 0; i < m; i++) out[i] = y[i] - p[0] * (1 - Math.exp(-p[1] * x[i]));
    },
    jacobian(p, out) {
      for (let i = 0; i < m; i++) {
        const e = Math.exp(-p[1] * x[i]);
        out[i] = 1 - e;
        out[m + i] = p[0] * x[i] * e;
      }
    },
  };
}

/** A linear problem y = X p with unit weights, X column-major. */
function linearProblem(x: number[][], y: number[]): LeastSquaresProblem {
  const m = y.length;
  const n = x[0].length;
  return {
    nObservations: m,
    nParameters: n,
    residuals(p, out) {
      for (let i = 0; i < m; i++) {
        let f = 0;
        for (let j = 0; j < n; j++) f += x[i][j] * p[j];
        out[i] = y[i] - f;
      }
    },
    jacobian(_p, out) {
      for (let j = 0; j < n; j++) for (let i = 0; i < m; i++) out[j * m + i] = x[i][j];
    },
  };
}

describe('leastSquaresSolve', () => {
  it('reports rank-deficient for two identical columns and hands back the null vector', () => {
    const sol = leastSquaresSolve(
      linearProblem(
        [
          [1, 1],
          [2, 2],
          [3, 3],
        ],
        [1, 2, 3],
      ),
      [0, 0],
    );
    expect(sol.status).toBe('rank-deficient');
    expect(sol.linearisation!.rank).toBe(1);
    // Null direction (1, −1)/√2 in the column-scaled coordinates.
    const v = sol.linearisation!.svd.v;
    expect(Math.abs(v[2] + v[3])).toBeLessThan(1e-12);
  });

  it('names a zero column', () => {
    const sol = leastSquaresSolve(
      linearProblem(
        [
          [1, 0],
          [2, 0],
          [3, 0],
        ],
        [1, 2, 3],
      ),
      [0, 0],
    );
    expect(sol.status).toBe('rank-deficient');
    expect(sol.linearisation!.zeroColumns).toEqual([1]);
  });

  it('fits a straight line exactly as the closed-form formulas give', () => {
    // Hand-checkable: Bevington & Robinson (2003) eqs. 6.12 for y = a + b x with unit weights:
    // b = (NΣxy − ΣxΣy)/Δ, a = (Σx²Σy − ΣxΣxy)/Δ, Δ = NΣx² − (Σx)²; σ_a² = Σx²/Δ, σ_b² = N/Δ.
    const xs = [0, 1, 2, 3, 4, 5];
    const ys = [1.1, 2.9, 5.2, 7.1, 8.8, 11.2];
    const N = xs.length;
    const sx = xs.reduce((s, v) => s + v, 0);
    const sy = ys.reduce((s, v) => s + v, 0);
    const sxx = xs.reduce((s, v) => s + v * v, 0);
    const sxy = xs.reduce((s, v, i) => s + v * ys[i], 0);
    const delta = N * sxx - sx * sx;
    const sol = leastSquaresSolve(
      linearProblem(
        xs.map((x) => [1, x]),
        ys,
      ),
      [0, 0],
    );
    expect(sol.status === 'chi2-change' || sol.status === 'step-size' || sol.status === 'no-further-decrease').toBe(true);
    expect(sol.parameters[0]).toBeCloseTo((sxx * sy - sx * sxy) / delta, 12);
    expect(sol.parameters[1]).toBeCloseTo((N * sxy - sx * sy) / delta, 12);
    const cov = lineariseCovariance(sol.linearisation!);
    expect(cov[0]).toBeCloseTo(sxx / delta, 12);
    expect(cov[3]).toBeCloseTo(N / delta, 12);
    expect(sol.iterations).toBeLessThanOrEqual(2);
  });

  for (const [k, start] of MISRA1A.starts.entries()) {
    it(`solves NIST StRD Misra1a from start ${k + 1} to the certified values`, () => {
      const sol = leastSquaresSolve(misraProblem(), start, { chi2RelativeTolerance: 1e-15, stepToleranceSigma: 1e-9 });
      const c = MISRA1A.certified;
      expect(['chi2-change', 'step-size', 'no-further-decrease']).toContain(sol.status);
      // NIST asks for agreement in ~6 significant digits (log relative error ≥ 6) for the
      // estimates; we demand 1e-7 relative. Standard errors: sqrt(diag((JᵀJ)⁻¹))·s with
      // s² = RSS/(n − p), certified to 1e-6 relative here (they depend on the Jacobian at the solution).
      expect(Math.abs(sol.parameters[0] / c.b1 - 1)).toBeLessThan(1e-7);
      expect(Math.abs(sol.parameters[1] / c.b2 - 1)).toBeLessThan(1e-7);
      expect(Math.abs(sol.chi2 / c.rss - 1)).toBeLessThan(1e-9);
      const s = Math.sqrt(sol.chi2 / 12);
      expect(Math.abs(s / c.residualSd - 1)).toBeLessThan(1e-8);
      const cov = lineariseCovariance(sol.linearisation!);
      expect(Math.abs((Math.sqrt(cov[0]) * s) / c.sd1 - 1)).toBeLessThan(1e-6);
      expect(Math.abs((Math.sqrt(cov[3]) * s) / c.sd2 - 1)).toBeLessThan(1e-6);
    });
  }

  it('reports each iteration and stops when asked to cancel', () => {
    const seen: number[] = [];
    let calls = 0;
    const sol = leastSquaresSolve(misraProblem(), MISRA1A.starts[0], {
      onIteration: (it) => seen.push(it),
      shouldCancel: () => ++calls > 2,
    });
    expect(sol.status).toBe('cancelled');
    expect(seen).toEqual([1, 2]);
  });

  it('stops with non-finite for a start where the model overflows', () => {
    const sol = leastSquaresSolve(misraProblem(), [1, -10]);
    expect(sol.status).toBe('non-finite');
  });

  it('gives up at the iteration limit', () => {
    const sol = leastSquaresSolve(misraProblem(), MISRA1A.starts[0], { maxIterations: 1 });
    expect(sol.status).toBe('max-iterations');
    expect(sol.iterations).toBe(1);
  });
});
