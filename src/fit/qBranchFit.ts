/**
 * Sub-band analysis of a perpendicular band whose lines are not resolved: the Q-branch maxima
 * ^rQ_K and ^pQ_K fitted by the quadratic in the signed index m (m = K″ for ΔK = +1, m = −K″ for ΔK = −1)
 *   ν_sub(m) = c0 + c1·m + c2·m²,
 *   c0 = ν0 + A′(1 − 2ζ) − B′,  c1 = 2[A′(1 − ζ) − B′],  c2 = (A′ − B′) − (A″ − B″),
 * which follows from the term values of DEVELOPERS.md (F(J,K) + origin ∓ 2A′ζK′) with the J
 * dependence dropped. Herzberg writes the constant term A′(1 − ζ)² − B′: his vibrational term
 * carries A′ζ² more, which only moves ν0 by A′ζ². For an oblate top read C for A.
 * Source: G. Herzberg, Molecular Spectra and Molecular Structure II (1945), ch. IV, sub-band origins
 * of perpendicular bands of symmetric tops (equation number not given here).
 */

/** One assigned Q-branch maximum. */
export interface QBranchPoint {
  /** Signed sub-band index: K″ for ^rQ_K (ΔK = +1), −K″ for ^pQ_K (ΔK = −1). */
  m: number;
  /** Observed maximum, cm^-1. */
  wavenumberCm1: number;
  /** Its 1σ uncertainty, cm^-1 (> 0). */
  sigmaCm1: number;
}

/** A fitted quantity with its 1σ. */
export interface QBranchValue {
  value: number;
  sigma: number;
}

/** Result of qBranchFit. */
export interface QBranchFitResult {
  /** c0 = ν0 + A′(1 − 2ζ) − B′, cm^-1. */
  subBandCentre: QBranchValue;
  /** A′(1 − ζ) − B′ = c1/2, cm^-1. */
  uniqueZetaMinusB: QBranchValue;
  /** (A′ − B′) − (A″ − B″) = c2, cm^-1. */
  deltaUniqueMinusB: QBranchValue;
  /** Covariance of (c0, c1, c2), cm^-2, row-major 3×3 (scaled by the reduced χ² when above 1). */
  covariance: number[];
  /** χ²/(N − 3), or NaN for three points. */
  reducedChi2: number;
  /** obs − calc per point, cm^-1. */
  residualsCm1: number[];
  /** Remarks (few points, m range). */
  warnings: string[];
}

/**
 * Weighted least squares of the sub-band quadratic through assigned Q-branch maxima.
 * σ of the coefficients from the weighted normal matrix, scaled by √(χ²/(N−3)) when that exceeds 1
 * (the quoted σ of the maxima were too small), never scaled down.
 * Source: Herzberg II (1945) ch. IV for the quadratic; weighted linear least squares, e.g.
 * Press et al., Numerical Recipes 3rd ed. (2007) §15.4.
 * @param points at least three maxima with distinct m
 * @throws Error naming the fault for fewer than three distinct m, a non-finite value or σ ≤ 0
 */
export function qBranchFit(points: readonly QBranchPoint[]): QBranchFitResult {
  const fn = 'qBranchFit';
  points.forEach((p, i) => {
    if (!Number.isInteger(p.m)) throw new Error(`${fn}: point ${i} has a non-integer index m = ${p.m}`);
    if (!Number.isFinite(p.wavenumberCm1)) throw new Error(`${fn}: point ${i} has a non-finite wavenumber ${p.wavenumberCm1}`);
    if (!(p.sigmaCm1 > 0) || !Number.isFinite(p.sigmaCm1)) throw new Error(`${fn}: point ${i} needs sigmaCm1 > 0, got ${p.sigmaCm1}`);
  });
  const distinct = new Set(points.map((p) => p.m)).size;
  if (distinct < 3) throw new Error(`${fn}: at least three Q branches with different K are needed, got ${distinct}`);
  const a = [
    [0, 0, 0],
    [0, 0, 0],
    [0, 0, 0],
  ];
  const b = [0, 0, 0];
  for (const p of points) {
    const w = 1 / (p.sigmaCm1 * p.sigmaCm1);
    const row = [1, p.m, p.m * p.m];
    for (let r = 0; r < 3; r++) {
      b[r] += w * row[r] * p.wavenumberCm1;
      for (let c = 0; c < 3; c++) a[r][c] += w * row[r] * row[c];
    }
  }
  const inv = invert3(a);
  const coef = [0, 1, 2].map((r) => inv[r][0] * b[0] + inv[r][1] * b[1] + inv[r][2] * b[2]);
  const residualsCm1 = points.map((p) => p.wavenumberCm1 - (coef[0] + coef[1] * p.m + coef[2] * p.m * p.m));
  const chi2 = points.reduce((s, p, i) => s + (residualsCm1[i] / p.sigmaCm1) ** 2, 0);
  const dof = points.length - 3;
  const reducedChi2 = dof > 0 ? chi2 / dof : NaN;
  const f = dof > 0 && reducedChi2 > 1 ? reducedChi2 : 1;
  const covariance = inv.flat().map((v) => v * f);
  const sd = (k: number) => Math.sqrt(covariance[k * 4]);
  const warnings: string[] = [];
  if (dof <= 1) warnings.push(`Only ${points.length} Q branches: the σ rest on the quoted σ of the maxima, not on the scatter.`);
  const mMax = Math.max(...points.map((p) => Math.abs(p.m)));
  if (mMax < 4) warnings.push(`|K| reaches only ${mMax}: the K² coefficient (A′ − B′) − (A″ − B″) is poorly determined.`);
  warnings.push(
    'Q-branch maxima sit a little off the sub-band origins (by about (B′ − B″)·J(J+1) at the J of the maximum, nearly the same for every K): c0 absorbs most of it.',
  );
  return {
    subBandCentre: { value: coef[0], sigma: sd(0) },
    uniqueZetaMinusB: { value: coef[1] / 2, sigma: sd(1) / 2 },
    deltaUniqueMinusB: { value: coef[2], sigma: sd(2) },
    covariance,
    reducedChi2,
    residualsCm1,
    warnings,
  };
}

/**
 * Band origin from the fitted sub-band centre: ν0 = c0 − c1/2 + A′ζ, with A′ζ taken from a model
 * (one band cannot give it: Herzberg II ch. IV). σ from c0 and c1 only.
 * @param fit result of qBranchFit
 * @param uniqueZetaCm1 A′ζ (C′ζ for an oblate top) from the model, cm^-1
 * @returns origin and its σ, cm^-1
 */
export function qBranchOrigin(fit: QBranchFitResult, uniqueZetaCm1: number): QBranchValue {
  const c = fit.covariance;
  // ν0 = c0 − c1/2 + A′ζ: variance = C00 − C01 + C11/4.
  const variance = c[0] - c[1] + c[4] / 4;
  return { value: fit.subBandCentre.value - fit.uniqueZetaMinusB.value + uniqueZetaCm1, sigma: Math.sqrt(Math.max(variance, 0)) };
}

function invert3(m: number[][]): number[][] {
  const [[a, b, c], [d, e, f], [g, h, i]] = m;
  const A = e * i - f * h;
  const B = -(d * i - f * g);
  const C = d * h - e * g;
  const det = a * A + b * B + c * C;
  if (!(Math.abs(det) > 0)) throw new Error('qBranchFit: the Q-branch indices do not determine a quadratic (singular normal matrix)');
  return [
    [A / det, -(b * i - c * h) / det, (b * f - c * e) / det],
    [B / det, (a * i - c * g) / det, -(a * f - c * d) / det],
    [C / det, -(a * h - b * g) / det, (a * e - b * d) / det],
  ];
}
