/**
 * The assistant's working estimate of the constants: least squares of the current lines with a
 * prior on every floatable constant (its first-guess value ± a plausible first-guess error).
 *
 * Why a prior rather than staged floating: a constant the lines do not yet determine still has an
 * uncertain value, and that uncertainty belongs in every prediction's σ (held at its guess, a
 * constant would make extrapolations in J and K look certain when they are not). With the prior,
 * what the lines determine follows from the data (rank and conditioning of the design, as the
 * posterior σ against the prior σ), and predictions far from the assigned lines carry the full
 * first-guess uncertainty until lines pin it down.
 */
import { bandLineGradient, fitKeyParse } from '../fit/bandDesign';
import type { FitLineInput } from '../fit/fitTypes';
import type { BandModel, LineList, TransitionQuanta } from '../physics/model';
import { transitionWavenumber } from '../physics/termValues';
import { assistantStudentFactor } from './assistantPredict';

/** Plausible 1σ error of a first guess, per constant (common practice, from memory: see assistantPriorSigmas). */
export interface AssistantPriorScales {
  /** Band origin, cm^-1. @default 1 */
  originCm1: number;
  /** B, fraction of B. @default 0.01 */
  bFraction: number;
  /** A or C, fraction of it. @default 0.02 */
  uniqueFraction: number;
  /** Coriolis ζ (dimensionless). @default 0.05 */
  zeta: number;
  /** l-type doubling q, fraction of B''. @default 0.02 */
  qFraction: number;
}

export const ASSISTANT_PRIOR_DEFAULTS: AssistantPriorScales = {
  originCm1: 1,
  bFraction: 0.01,
  uniqueFraction: 0.02,
  zeta: 0.05,
  qFraction: 0.02,
};

/**
 * Centrifugal constants' typical size as a fraction of B'' (DJ/B ~ 1e-6…1e-5, |DJK|, |DK| up to
 * ~20 DJ, sextic terms ~ DJ²/B): the prior σ is the larger of this and twice the guess.
 * Source: common practice for semi-rigid small molecules (orders of magnitude from memory,
 * e.g. Gordy & Cook, Microwave Molecular Spectra (1984), ch. 8).
 */
const CENTRIFUGAL_SCALE: Record<string, number> = {
  DJ: 1e-5,
  DJK: 1.5e-4,
  DK: 2e-4,
  HJ: 1e-9,
  HJK: 1e-8,
  HKJ: 1e-8,
  HK: 1e-8,
};

/**
 * Prior 1σ of each floatable constant around its first-guess value, in the constant's unit.
 * origin: 1 cm^-1; B: 1 %; A or C: 2 %; ζ: 0.05; q: 2 % of B''; D and H: max(2|guess|, scale × B'')
 * with the scales of CENTRIFUGAL_SCALE. These are the σ of the mean of the two states' values;
 * their difference is known much better (see assistantPriorPairs).
 * @param model the first guess (cm^-1)
 * @param floatable keys such as "upper.B"
 * @returns σ per key (keys not recognised are left out)
 */
export function assistantPriorSigmas(
  model: BandModel,
  floatable: readonly string[],
  scales: AssistantPriorScales = ASSISTANT_PRIOR_DEFAULTS,
): Record<string, number> {
  const bRef = Math.abs(model.lower.B) || Math.abs(model.upper.B) || 1;
  const out: Record<string, number> = {};
  for (const key of floatable) {
    const k = fitKeyParse(key);
    if (!k) continue;
    const v = model[k.side][k.name];
    let s: number;
    if (k.name === 'origin') s = scales.originCm1;
    else if (k.name === 'B') s = scales.bFraction * Math.max(Math.abs(v), 0.1 * bRef);
    else if (k.name === 'A' || k.name === 'C') s = scales.uniqueFraction * Math.max(Math.abs(v), 0.1 * bRef);
    else if (k.name === 'zeta') s = scales.zeta;
    else if (k.name === 'q') s = Math.max(2 * Math.abs(v), scales.qFraction * bRef);
    else s = Math.max(2 * Math.abs(v), (CENTRIFUGAL_SCALE[k.name] ?? 1e-5) * bRef);
    out[key] = s;
  }
  return out;
}

/**
 * Prior σ of the upper − lower difference of a constant, as a fraction of the σ of its mean:
 * a vibrational fundamental changes B by ~0.1–1 %, A or C by ~1 %, the centrifugal constants by
 * ~10 %, so the guess of X' − X'' (usually X' = X'' or a known α) is far better than X itself.
 * Source: common practice (vibration–rotation constants α of a few 1e-3 B; D' ≈ D''), from memory.
 */
export const ASSISTANT_PRIOR_DIFFERENCE: Record<string, number> = {
  B: 0.3,
  A: 0.25,
  C: 0.25,
  DJ: 0.1,
  DJK: 0.1,
  DK: 0.1,
  HJ: 0.2,
  HJK: 0.2,
  HKJ: 0.2,
  HK: 0.2,
};

/**
 * Correlation of the priors of upper.X and lower.X when both float: with σ_m the σ of each
 * (assistantPriorSigmas) taken as that of their mean and σ_d = f σ_m of their difference
 * (ASSISTANT_PRIOR_DIFFERENCE), each has variance σ_m² + σ_d²/4 and they correlate with
 * ρ = (σ_m² − σ_d²/4)/(σ_m² + σ_d²/4).
 * @returns [upper key, lower key, ρ] for every such pair
 */
function priorPairs(keys: readonly string[]): [number, number, number][] {
  const out: [number, number, number][] = [];
  keys.forEach((key, a) => {
    const k = fitKeyParse(key)!;
    if (k.side !== 'upper') return;
    const b = keys.indexOf(`lower.${k.name}`);
    const f = ASSISTANT_PRIOR_DIFFERENCE[k.name];
    if (b < 0 || f === undefined) return;
    const d2 = (f * f) / 4;
    out.push([a, b, (1 - d2) / (1 + d2)]);
  });
  return out;
}

/** Outcome of assistantPosteriorFit. */
export interface AssistantPosterior {
  /** The constants at the posterior optimum (cm^-1). */
  model: BandModel;
  /** Keys with a prior (the floatable ones), in covariance order. */
  keys: string[];
  /** Prior 1σ per key. */
  priorSigma: Float64Array;
  /** Posterior 1σ per key, after the scale below. */
  sigma: Float64Array;
  /** Covariance of the constants, row-major keys.length², scale included. */
  covariance: Float64Array;
  /** Weighted χ² of the lines alone. */
  chi2: number;
  /** The prior's share of the objective at the optimum, Σ ((θ − θ_guess)/σ_prior)² (with the pair correlations). */
  priorChi2: number;
  /** Lines in the fit. */
  nLines: number;
  /** Effective number of constants the lines determine: trace of the data's share of the information. */
  pEffective: number;
  /** χ²/(N − p_eff), floored at 1 (line σ are never taken smaller than stated); 1 with N − p_eff < 1. */
  scale2: number;
  /** Student widening for the prediction σ (1 when the scale was not estimated). */
  studentFactor: number;
  /** obs − calc of each input line (excluded ones too), cm^-1. */
  residualCm1: Float64Array;
  /** Robust spread of the fitted lines' residuals, 1.4826 × median |obs − calc| (0 below 4 lines), cm^-1. */
  scatterCm1: number;
}

/** Keys whose posterior σ is below this fraction of the prior σ count as determined by the lines. */
export const ASSISTANT_DETERMINED_RATIO = 0.3;

function modelWith(model: BandModel, keys: readonly string[], theta: Float64Array): BandModel {
  const m: BandModel = { ...model, lower: { ...model.lower }, upper: { ...model.upper } };
  keys.forEach((key, j) => {
    const k = fitKeyParse(key)!;
    m[k.side][k.name] = theta[j];
  });
  return m;
}

/** Cholesky factorisation in place (lower triangle), false when not positive definite. */
function cholesky(a: Float64Array, p: number): boolean {
  for (let j = 0; j < p; j++) {
    let d = a[j * p + j];
    for (let k = 0; k < j; k++) d -= a[j * p + k] * a[j * p + k];
    if (!(d > 0)) return false;
    d = Math.sqrt(d);
    a[j * p + j] = d;
    for (let i = j + 1; i < p; i++) {
      let s = a[i * p + j];
      for (let k = 0; k < j; k++) s -= a[i * p + k] * a[j * p + k];
      a[i * p + j] = s / d;
    }
  }
  return true;
}

function choleskySolve(l: Float64Array, p: number, b: Float64Array): Float64Array {
  const y = Float64Array.from(b);
  for (let i = 0; i < p; i++) {
    let s = y[i];
    for (let k = 0; k < i; k++) s -= l[i * p + k] * y[k];
    y[i] = s / l[i * p + i];
  }
  for (let i = p - 1; i >= 0; i--) {
    let s = y[i];
    for (let k = i + 1; k < p; k++) s -= l[k * p + i] * y[k];
    y[i] = s / l[i * p + i];
  }
  return y;
}

/**
 * Posterior (maximum a posteriori) constants of the lines with a Gaussian prior on each floatable
 * constant: minimise Σ ((obs − calc)/σ_line)² + Σ ((θ − θ_guess)/σ_prior)² by Gauss–Newton in
 * prior-scaled coordinates u = (θ − θ_guess)/σ_prior (normal matrix JᵀWJ + I, always positive
 * definite); covariance (JᵀWJ + I)⁻¹ scaled back and multiplied by s² = max(1, χ²/(N − p_eff)),
 * p_eff = p − tr((JᵀWJ + I)⁻¹). Constants not in `priorSigma` stay at the guess.
 * Source: linear least squares with a Gaussian prior (Tikhonov/ridge form), e.g. Press et al.,
 * Numerical Recipes 3rd ed. (2007) sec. 15.6 and 19.4; effective number of parameters as the trace
 * of the hat matrix (Hastie, Tibshirani & Friedman, The Elements of Statistical Learning (2009) eq. 3.50).
 * @param guess the first guess (the prior's centre), cm^-1
 * @param priorSigma 1σ per floatable key (assistantPriorSigmas)
 * @param lines lines (excluded ones are skipped), cm^-1
 * @param start optional start point (an earlier posterior's model), for speed
 */
export function assistantPosteriorFit(
  guess: BandModel,
  priorSigma: Record<string, number>,
  lines: readonly FitLineInput[],
  start?: BandModel,
): AssistantPosterior {
  const keys = Object.keys(priorSigma).filter((k) => priorSigma[k] > 0 && fitKeyParse(k) !== null);
  const p = keys.length;
  const parsed = keys.map((k) => fitKeyParse(k)!);
  const sig = Float64Array.from(keys, (k) => priorSigma[k]);
  // Prior precision in scaled coordinates: the inverse of the prior correlation matrix (block
  // diagonal: 1, or a 2×2 block for each upper/lower pair).
  const pairs = priorPairs(keys);
  const precision = new Float64Array(p * p);
  for (let a = 0; a < p; a++) precision[a * p + a] = 1;
  for (const [a, b, rho] of pairs) {
    const d = Math.sqrt(1 + (1 - rho) / (1 + rho)); // marginal σ factor: sqrt(σ_m² + σ_d²/4)/σ_m
    sig[a] *= d;
    sig[b] *= d;
    const inv = 1 / (1 - rho * rho);
    precision[a * p + a] = inv;
    precision[b * p + b] = inv;
    precision[a * p + b] = -rho * inv;
    precision[b * p + a] = -rho * inv;
  }
  const theta0 = Float64Array.from(parsed, (k) => guess[k.side][k.name]);
  const theta = start ? Float64Array.from(parsed, (k) => start[k.side][k.name]) : Float64Array.from(theta0);
  const used = lines.filter((l) => !l.isExcluded);
  const n = used.length;
  const g = new Float64Array(p);
  const normal = new Float64Array(p * p);
  const rhs = new Float64Array(p);
  let chi2 = 0;
  let model = modelWith(guess, keys, theta);
  // Positions are linear in every constant except the product A'ζ, so a few steps converge.
  for (let iter = 0; iter < 8; iter++) {
    normal.fill(0);
    rhs.fill(0);
    chi2 = 0;
    for (const l of used) {
      const w = 1 / (l.uncertaintyCm1 * l.uncertaintyCm1);
      const r = l.observedCm1 - transitionWavenumber(model, l.jUpper, l.kUpper, l.jLower, l.kLower);
      chi2 += r * r * w;
      bandLineGradient(model, keys, l, g);
      for (let a = 0; a < p; a++) {
        const ga = g[a] * sig[a] * w;
        rhs[a] += ga * r;
        for (let b = 0; b <= a; b++) normal[a * p + b] += ga * g[b] * sig[b];
      }
    }
    let maxStep = 0;
    for (let a = 0; a < p; a++) {
      for (let b = 0; b < a; b++) normal[b * p + a] = normal[a * p + b];
    }
    for (let a = 0; a < p; a++) {
      for (let b = 0; b < p; b++) {
        normal[a * p + b] += precision[a * p + b];
        rhs[a] -= (precision[a * p + b] * (theta[b] - theta0[b])) / sig[b];
      }
    }
    const l = Float64Array.from(normal);
    if (!cholesky(l, p)) break;
    const du = choleskySolve(l, p, rhs);
    for (let a = 0; a < p; a++) {
      theta[a] += du[a] * sig[a];
      maxStep = Math.max(maxStep, Math.abs(du[a]));
    }
    model = modelWith(guess, keys, theta);
    if (maxStep < 1e-6) break;
  }
  // Final normal matrix and χ² at the optimum.
  normal.fill(0);
  chi2 = 0;
  const residualCm1 = new Float64Array(lines.length);
  lines.forEach((l, i) => {
    residualCm1[i] = l.observedCm1 - transitionWavenumber(model, l.jUpper, l.kUpper, l.jLower, l.kLower);
    if (l.isExcluded) return;
    const w = 1 / (l.uncertaintyCm1 * l.uncertaintyCm1);
    chi2 += residualCm1[i] * residualCm1[i] * w;
    bandLineGradient(model, keys, l, g);
    for (let a = 0; a < p; a++) {
      const ga = g[a] * sig[a] * w;
      for (let b = 0; b <= a; b++) normal[a * p + b] += ga * g[b] * sig[b];
    }
  });
  for (let a = 0; a < p; a++) {
    for (let b = 0; b < a; b++) normal[b * p + a] = normal[a * p + b];
  }
  for (let a = 0; a < p * p; a++) normal[a] += precision[a];
  const lf = Float64Array.from(normal);
  const inverse = new Float64Array(p * p);
  if (cholesky(lf, p)) {
    const e = new Float64Array(p);
    for (let a = 0; a < p; a++) {
      e.fill(0);
      e[a] = 1;
      const col = choleskySolve(lf, p, e);
      for (let b = 0; b < p; b++) inverse[b * p + a] = col[b];
    }
  } else {
    for (let a = 0; a < p; a++) inverse[a * p + a] = 1;
  }
  // p_eff = tr(N⁻¹ JᵀWJ) = p − tr(N⁻¹ R), R the prior precision.
  let trace = 0;
  for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) trace += inverse[a * p + b] * precision[b * p + a];
  const pEffective = p - trace;
  let priorChi2 = 0;
  for (let a = 0; a < p; a++) {
    for (let b = 0; b < p; b++) priorChi2 += ((theta[a] - theta0[a]) / sig[a]) * precision[a * p + b] * ((theta[b] - theta0[b]) / sig[b]);
  }
  const dof = n - pEffective;
  const isScaleEstimated = dof >= 1;
  const scale2 = isScaleEstimated ? Math.max(1, chi2 / dof) : 1;
  const covariance = new Float64Array(p * p);
  const sigma = new Float64Array(p);
  for (let a = 0; a < p; a++) {
    for (let b = 0; b < p; b++) covariance[a * p + b] = inverse[a * p + b] * sig[a] * sig[b] * scale2;
    sigma[a] = Math.sqrt(covariance[a * p + a]);
  }
  const abs = used.length >= 4 ? lines.map((l, i) => (l.isExcluded ? NaN : Math.abs(residualCm1[i]))).filter((v) => !Number.isNaN(v)) : [];
  abs.sort((a, b) => a - b);
  const mid = abs.length >> 1;
  // 1.4826 = 1/Φ⁻¹(3/4): the median absolute deviation of a normal sample estimates σ.
  const scatterCm1 = abs.length ? 1.4826 * (abs.length % 2 ? abs[mid] : 0.5 * (abs[mid - 1] + abs[mid])) : 0;
  return {
    model,
    keys,
    priorSigma: sig,
    sigma,
    covariance,
    chi2,
    priorChi2,
    nLines: n,
    pEffective,
    scale2,
    studentFactor: isScaleEstimated && scale2 > 1 ? assistantStudentFactor(Math.max(1, Math.floor(dof))) : 1,
    residualCm1,
    scatterCm1,
  };
}

/**
 * Keys the lines inform: posterior σ below ratio × prior σ (the data, not the prior, fix them,
 * alone or in a combination such as A' − A''; a fit floating them all then lets its rank test
 * hold what only the combination fixes).
 * @param ratio @default ASSISTANT_DETERMINED_RATIO
 */
export function assistantPosteriorDetermined(post: AssistantPosterior, ratio = ASSISTANT_DETERMINED_RATIO): string[] {
  const p = post.keys.length;
  const out = new Set(post.keys.filter((_, j) => post.sigma[j] < ratio * post.priorSigma[j]));
  // A pair whose difference X' − X'' the lines inform (e.g. A' − A'' of a parallel band) floats
  // both; the fit's rank test then holds the one only the difference fixes.
  for (const [a, b, rho] of priorPairs(post.keys)) {
    const c = post.covariance;
    const varDiff = c[a * p + a] + c[b * p + b] - 2 * c[a * p + b];
    const priorDiff = post.priorSigma[a] ** 2 + post.priorSigma[b] ** 2 - 2 * rho * post.priorSigma[a] * post.priorSigma[b];
    if (varDiff < ratio * ratio * priorDiff) {
      out.add(post.keys[a]);
      out.add(post.keys[b]);
    }
  }
  return post.keys.filter((k) => out.has(k));
}

/**
 * Predicted position and 1σ of every line of a list from the posterior: ν from the posterior
 * constants, σ = f_t sqrt(g C gᵀ) with g = ∂ν/∂θ over every floatable constant (so a constant the
 * lines do not determine contributes its prior uncertainty).
 * Source: first-order error propagation, Bevington & Robinson (2003) ch. 3.
 * @returns positions and σ, cm^-1
 */
export function assistantPosteriorPredict(
  post: AssistantPosterior,
  lines: LineList,
): { wavenumberCm1: Float64Array; sigmaCm1: Float64Array; gradient: Float64Array } {
  const p = post.keys.length;
  const wavenumberCm1 = new Float64Array(lines.count);
  const sigmaCm1 = new Float64Array(lines.count);
  // ∂ν/∂θ of every line, row-major lines.count × p (kept for conditional predictions).
  const gradient = new Float64Array(lines.count * p);
  let g: Float64Array;
  const q: TransitionQuanta = { jUpper: 0, kUpper: 0, jLower: 0, kLower: 0 };
  const c = post.covariance;
  for (let i = 0; i < lines.count; i++) {
    q.jUpper = lines.jUpper[i];
    q.kUpper = lines.kUpper[i];
    q.jLower = lines.jLower[i];
    q.kLower = lines.kLower[i];
    wavenumberCm1[i] = transitionWavenumber(post.model, q.jUpper, q.kUpper, q.jLower, q.kLower);
    if (p === 0) continue;
    g = gradient.subarray(i * p, (i + 1) * p);
    bandLineGradient(post.model, post.keys, q, g);
    let s = 0;
    for (let a = 0; a < p; a++) {
      if (g[a] === 0) continue;
      let t = 0;
      for (let b = 0; b < p; b++) t += c[a * p + b] * g[b];
      s += g[a] * t;
    }
    sigmaCm1[i] = post.studentFactor * Math.sqrt(Math.max(s, 0));
  }
  return { wavenumberCm1, sigmaCm1, gradient };
}

/**
 * 1σ of the predicted position of each given transition, cm^-1 (as assistantPosteriorPredict, for
 * a short list of quantum numbers).
 * Source: first-order error propagation, Bevington & Robinson (2003) ch. 3.
 */
export function assistantPosteriorSigmas(post: AssistantPosterior, quanta: readonly TransitionQuanta[]): number[] {
  const p = post.keys.length;
  const g = new Float64Array(p);
  const c = post.covariance;
  return quanta.map((q) => {
    if (p === 0) return 0;
    bandLineGradient(post.model, post.keys, q, g);
    let s = 0;
    for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) s += g[a] * c[a * p + b] * g[b];
    return post.studentFactor * Math.sqrt(Math.max(s, 0));
  });
}
