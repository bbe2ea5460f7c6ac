/**
 * Ground- and upper-state combination differences Δ2F(J) from assigned lines, and the weighted
 * linear least-squares fit of B, DJ, DJK to them.
 *
 * With F(J, K) = B J(J+1) + (A−B) K² − DJ J²(J+1)² − DJK J(J+1) K² − DK K⁴ (the K-only terms
 * cancel in a difference of the same K):
 *   Δ2F(J, K) = F(J+1, K) − F(J−1, K)
 *             = 4B(J+½) − 8DJ(J+½)((J+½)² + ¾) − 4DJK K²(J+½)
 * since (J+1)(J+2) − (J−1)J = 4(J+½) and (J+1)²(J+2)² − (J−1)²J² = 8(J+½)(J² + J + 1),
 * J² + J + 1 = (J+½)² + ¾.
 * Lower state: R(J−1) − P(J+1) of lines sharing the upper level (same J', K', ΔK).
 * Upper state: R(J) − P(J) of lines sharing the lower level (same J'', K'', ΔK); the Coriolis
 * term ∓2A'ζK' is the same for both and cancels, K is then K'.
 * Source: G. Herzberg, Molecular Spectra and Molecular Structure I: Spectra of Diatomic Molecules,
 * 2nd ed. (1950), ch. III, combination differences Δ2F(J) = R(J−1) − P(J+1) (from memory, equation
 * numbers not checked); the DJK term follows from the symmetric-top F(J, K) of physics/termValues.ts
 * by the algebra above, which test/fit/combinationDifferences.test.ts checks against levelEnergy.
 */
import type { TopShape, TransitionQuanta } from '../physics/model';
import { transitionCheck } from '../physics/transitionCheck';
import { leastSquaresSolve, type LeastSquaresProblem } from './leastSquares';
import { lineariseCovariance } from './leastSquaresLinearise';

/** A line offered to the combination-difference analysis (Assignment satisfies it). */
export interface CombDiffLine extends TransitionQuanta {
  /** Observed position, cm^-1. */
  observedCm1: number;
  /** 1σ uncertainty, cm^-1. */
  uncertaintyCm1: number;
  /** Excluded lines form no pairs. @default false */
  isExcluded?: boolean;
}

/** Which state's levels the differences measure. */
export type CombDiffState = 'lower' | 'upper';

/** One pair of lines and its combination difference (also the point of the diagnostic plot). */
export interface CombDiffPair {
  /** The J of Δ2F(J): J' for the lower state, J'' for the upper state. */
  j: number;
  /** K of the state measured (K'' lower, K' upper). */
  k: number;
  /** ΔK of both lines. */
  deltaK: number;
  /** Index (into the input lines) of the R line (higher-J term). */
  lineR: number;
  /** Index of the P line. */
  lineP: number;
  /** ν_R − ν_P = Δ2F(J), cm^-1. */
  differenceCm1: number;
  /** sqrt(σ_R² + σ_P²), cm^-1. */
  sigmaCm1: number;
  /** Plot abscissa (J+½)², dimensionless. */
  x: number;
  /** Plot ordinate Δ2F/(J+½), cm^-1 (= 4B − 8DJ((J+½)²+¾) − 4DJK K²). */
  y: number;
  /** σ of y, cm^-1. */
  sigmaY: number;
  /** Δ2F from the fitted constants, cm^-1. */
  calcCm1: number;
  /** (difference − calc)/sigma. */
  normalisedResidual: number;
  /** |normalisedResidual| > 3: one of the two lines is probably misassigned. */
  isSuspect: boolean;
}

/** A fitted constant of the analysis (cm^-1). */
export interface CombDiffParameter {
  value: number;
  /** 1σ, cm^-1; 0 when fixed, null when exactly determined. */
  sigma: number | null;
  fixed: boolean;
}

/** Result of combinationDifferences. */
export interface CombDiffResult {
  state: CombDiffState;
  B: CombDiffParameter;
  DJ: CombDiffParameter;
  DJK: CombDiffParameter;
  nPairs: number;
  pairs: CombDiffPair[];
  /** sqrt(χ²/(nPairs − P)), null when exactly determined. */
  sigmaW: number | null;
  /** Unweighted rms of (Δobs − Δcalc), cm^-1. */
  rmsCm1: number;
  /** Indices into pairs of the suspect pairs. */
  suspects: number[];
  warnings: string[];
}

/** Refusal of the analysis. */
export interface CombDiffError {
  kind: 'bad-input' | 'too-few-pairs' | 'underdetermined';
  message: string;
  /** Input index of the offending line, when one is to blame. */
  lineIndex?: number;
}

/** Result of combinationDifferences: constants or a refusal (never an exception for bad data). */
export type CombDiffOutcome = { ok: true; result: CombDiffResult } | { ok: false; error: CombDiffError };

/** Options of combinationDifferences. */
export interface CombDiffOptions {
  /** Rotor shape (checks K and, for linear, fixes DJK). @default 'prolate' */
  shape?: TopShape;
  /** A pair is suspect beyond this many σ. @default 3 */
  suspectSigma?: number;
  /** How warnings name input line i. @default i => `#${i + 1}` */
  lineName?: (index: number) => string;
}

/** Δ2F(J, K) = 4B(J+½) − 8DJ(J+½)((J+½)²+¾) − 4DJK K²(J+½), cm^-1 (see file comment). */
export function combDiffValue(B: number, DJ: number, DJK: number, j: number, k: number): number {
  const h = j + 0.5;
  return 4 * B * h - 8 * DJ * h * (h * h + 0.75) - 4 * DJK * k * k * h;
}

function designRow(j: number, k: number): [number, number, number] {
  const h = j + 0.5;
  return [4 * h, -8 * h * (h * h + 0.75), -4 * k * k * h];
}

/**
 * Form every combination-difference pair of the assigned lines for one state and fit
 * B, DJ, DJK (cm^-1) by weighted linear least squares (weights 1/(σ_R² + σ_P²)).
 * DJK is fixed at 0 (and said so) when all pairs have K = 0, for a linear molecule, or when
 * the pairs cannot separate it from B; fewer than 2 pairs is an error. Pairs deviating by more
 * than 3σ from the fit are flagged as likely misassignments.
 * Source: see file comment (Herzberg I (1950) ch. III).
 * @param lines assigned lines (cm^-1)
 * @param state 'lower' for Δ2F'' or 'upper' for Δ2F'
 */
export function combinationDifferences(
  lines: readonly CombDiffLine[],
  state: CombDiffState,
  options: CombDiffOptions = {},
): CombDiffOutcome {
  const shape = options.shape ?? 'prolate';
  const suspectSigma = options.suspectSigma ?? 3;
  const lineName = options.lineName ?? ((i: number) => `#${i + 1}`);
  if (state !== 'lower' && state !== 'upper') {
    return {
      ok: false,
      error: { kind: 'bad-input', message: `combinationDifferences: state must be 'lower' or 'upper', got '${String(state)}'` },
    };
  }
  const active = lines.map((l, i) => i).filter((i) => !lines[i].isExcluded);
  const anyDeltaK = active.some((i) => lines[i].kUpper !== lines[i].kLower);
  const band =
    shape === 'linear'
      ? active.some((i) => lines[i].kUpper === 1)
        ? 'perpendicular'
        : 'parallel'
      : anyDeltaK
        ? 'perpendicular'
        : 'parallel';
  for (const i of active) {
    const l = lines[i];
    const why = transitionCheck(l, band, shape);
    if (why) {
      const mixed = band === 'perpendicular' && l.kUpper === l.kLower ? ' (lines with ΔK = 0 and ΔK = ±1 cannot be mixed)' : '';
      return { ok: false, error: { kind: 'bad-input', message: why + mixed, lineIndex: i } };
    }
    if (!Number.isFinite(l.observedCm1)) {
      return { ok: false, error: { kind: 'bad-input', message: `wavenumber must be finite, got ${l.observedCm1}`, lineIndex: i } };
    }
    if (!(l.uncertaintyCm1 > 0) || !Number.isFinite(l.uncertaintyCm1)) {
      return {
        ok: false,
        error: { kind: 'bad-input', message: `uncertainty must be a number > 0, got ${l.uncertaintyCm1}`, lineIndex: i },
      };
    }
  }

  // Group lines by the shared level; within a group, R and P by the other state's J.
  const groups = new Map<string, { r: number[]; p: number[]; j: number; k: number; deltaK: number }>();
  for (const i of active) {
    const l = lines[i];
    const deltaJ = l.jUpper - l.jLower;
    if (deltaJ === 0) continue;
    const deltaK = l.kUpper - l.kLower;
    const j = state === 'lower' ? l.jUpper : l.jLower;
    const k = state === 'lower' ? l.kLower : l.kUpper;
    const shared = state === 'lower' ? `${l.jUpper},${l.kUpper},${deltaK}` : `${l.jLower},${l.kLower},${deltaK}`;
    let g = groups.get(shared);
    if (!g) groups.set(shared, (g = { r: [], p: [], j, k, deltaK }));
    // Lower state: R(J−1) has J'' = J'−1 (ΔJ = +1). Upper state: R(J) has J' = J''+1 (ΔJ = +1).
    (deltaJ > 0 ? g.r : g.p).push(i);
  }
  const pairs: CombDiffPair[] = [];
  for (const g of groups.values()) {
    for (const r of g.r) {
      for (const p of g.p) {
        const diff = lines[r].observedCm1 - lines[p].observedCm1;
        const sigma = Math.hypot(lines[r].uncertaintyCm1, lines[p].uncertaintyCm1);
        const h = g.j + 0.5;
        pairs.push({
          j: g.j,
          k: g.k,
          deltaK: g.deltaK,
          lineR: r,
          lineP: p,
          differenceCm1: diff,
          sigmaCm1: sigma,
          x: h * h,
          y: diff / h,
          sigmaY: sigma / h,
          calcCm1: NaN,
          normalisedResidual: NaN,
          isSuspect: false,
        });
      }
    }
  }
  pairs.sort((a, b) => a.k - b.k || a.deltaK - b.deltaK || a.j - b.j || a.lineR - b.lineR || a.lineP - b.lineP);
  const nPairs = pairs.length;
  const what = state === 'lower' ? 'R(J−1)/P(J+1) pairs sharing an upper level' : 'R(J)/P(J) pairs sharing a lower level';
  if (nPairs < 2) {
    return {
      ok: false,
      error: {
        kind: 'too-few-pairs',
        message: `found ${nPairs} ${what}; at least 2 are needed to determine B and DJ`,
      },
    };
  }

  const warnings: string[] = [];
  let fitDjk = pairs.some((p) => p.k !== 0);
  if (!fitDjk) warnings.push('All pairs have K = 0, so DJK cannot be determined; it is reported fixed at 0.');
  if (fitDjk && shape === 'linear') {
    fitDjk = false;
    warnings.push('A linear molecule has no DJK; it is reported fixed at 0.');
  }
  if (fitDjk && nPairs < 3) {
    fitDjk = false;
    warnings.push('Only 2 pairs: DJK is fixed at 0 so that B and DJ can be determined.');
  }
  if (shape === 'linear' && state === 'upper' && band === 'perpendicular') {
    warnings.push('For a Π upper state the R/P pairs measure the e-parity levels: B is B′ + q/2 (l-type doubling).');
  }

  let solved = solveConstants(pairs, fitDjk);
  if (!solved.ok && fitDjk) {
    fitDjk = false;
    warnings.push('The pairs cannot separate DJK from B (too few distinct K); DJK is reported fixed at 0.');
    solved = solveConstants(pairs, false);
  }
  if (!solved.ok) {
    return { ok: false, error: { kind: 'underdetermined', message: `the ${nPairs} pairs cannot separate B from DJ (${solved.message})` } };
  }
  const { values, sigmas, sigmaW } = solved;
  const [B, DJ, DJK] = [values[0], values[1], fitDjk ? values[2] : 0];
  let sumSq = 0;
  const suspects: number[] = [];
  pairs.forEach((p, idx) => {
    p.calcCm1 = combDiffValue(B, DJ, DJK, p.j, p.k);
    p.normalisedResidual = (p.differenceCm1 - p.calcCm1) / p.sigmaCm1;
    p.isSuspect = Math.abs(p.normalisedResidual) > suspectSigma;
    sumSq += (p.differenceCm1 - p.calcCm1) ** 2;
    if (p.isSuspect) suspects.push(idx);
  });
  const exact = sigmaW === null;
  if (exact) warnings.push(`Exactly determined: ${nPairs} pairs for ${fitDjk ? 3 : 2} constants, so no uncertainties can be given.`);
  for (const idx of suspects.slice(0, 10)) {
    const p = pairs[idx];
    warnings.push(
      `The pair of lines ${lineName(p.lineR)} and ${lineName(p.lineP)} (J = ${p.j}, K = ${p.k}) disagrees with the fit by ${p.normalisedResidual.toFixed(1)}σ: one of them is likely misassigned.`,
    );
  }
  const param = (v: number, s: number | null, fixed: boolean): CombDiffParameter => ({ value: v, sigma: fixed ? 0 : s, fixed });
  return {
    ok: true,
    result: {
      state,
      B: param(B, exact ? null : sigmas[0], false),
      DJ: param(DJ, exact ? null : sigmas[1], false),
      DJK: fitDjk ? param(DJK, exact ? null : sigmas[2], false) : param(0, 0, true),
      nPairs,
      pairs,
      sigmaW,
      rmsCm1: Math.sqrt(sumSq / nPairs),
      suspects,
      warnings,
    },
  };
}

type Solved = { ok: true; values: Float64Array; sigmas: Float64Array; sigmaW: number | null } | { ok: false; message: string };

/** Weighted linear least squares for [B, DJ(, DJK)] through the generic solver (one Gauss–Newton step). */
function solveConstants(pairs: CombDiffPair[], withDjk: boolean): Solved {
  const m = pairs.length;
  const n = withDjk ? 3 : 2;
  const design = new Float64Array(m * n);
  const target = new Float64Array(m);
  pairs.forEach((p, i) => {
    const row = designRow(p.j, p.k);
    const w = 1 / p.sigmaCm1;
    for (let j = 0; j < n; j++) design[j * m + i] = row[j] * w;
    target[i] = p.differenceCm1 * w;
  });
  const problem: LeastSquaresProblem = {
    nObservations: m,
    nParameters: n,
    residuals(p, out) {
      out.set(target);
      for (let j = 0; j < n; j++) for (let i = 0; i < m; i++) out[i] -= p[j] * design[j * m + i];
    },
    jacobian(_p, out) {
      out.set(design);
    },
  };
  // Start at B = Δ/(4(J+½)) of the first pair so the single Gauss–Newton step is well scaled.
  const start = new Float64Array(n);
  start[0] = pairs[0].differenceCm1 / (4 * (pairs[0].j + 0.5));
  const sol = leastSquaresSolve(problem, start, { maxIterations: 10 });
  if (sol.status === 'rank-deficient' || !sol.linearisation) return { ok: false, message: 'the pairs do not determine the constants' };
  const dof = m - n;
  const sigmaW = dof > 0 ? Math.sqrt(sol.chi2 / dof) : null;
  const unit = lineariseCovariance(sol.linearisation);
  const sigmas = new Float64Array(n);
  for (let j = 0; j < n; j++) sigmas[j] = sigmaW === null ? NaN : Math.sqrt(unit[j * n + j]) * sigmaW;
  return { ok: true, values: sol.parameters, sigmas, sigmaW };
}
