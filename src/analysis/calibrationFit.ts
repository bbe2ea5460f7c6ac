/** One calibration line: where it was observed and where a reference puts it. */
export interface CalibrationPair {
  /** Observed (measured-axis) wavenumber, cm^-1. */
  observedCm1: number;
  /** Reference (true) wavenumber, cm^-1. */
  referenceCm1: number;
  /** 1σ of the pair, cm^-1 (reference and observation combined); weights are 1/σ². Give it for all pairs or none. */
  referenceSigmaCm1?: number;
}

/** Options of {@link calibrationFit}. */
export interface CalibrationFitOptions {
  /** Also fit an additive offset (ν_true = (1 + δ) ν_obs + offset). */
  withOffset: boolean;
}

/** Axis correction ν_true = (1 + delta) · ν_obs + offsetCm1, as applied by calibrationApply. */
export interface AxisCalibration {
  /** Relative scale correction δ, dimensionless. */
  delta: number;
  /** Additive offset, cm^-1 (0 when not fitted). */
  offsetCm1: number;
}

/** Result of {@link calibrationFit}. */
export interface CalibrationFit extends AxisCalibration {
  /** 1σ of δ; null when the fit is exactly determined (N = P). */
  deltaSigma: number | null;
  /** 1σ of the offset, cm^-1; null when it was not fitted or the fit is exactly determined. */
  offsetSigmaCm1: number | null;
  /** Correlation of δ and offset (null unless both fitted with N > P). */
  deltaOffsetCorrelation: number | null;
  /** reference − calibrated observation per pair, cm^-1, input order. */
  residualsCm1: Float64Array;
  /** Root-mean-square of the residuals, cm^-1 (unweighted). */
  rmsCm1: number;
  /** Standard deviation of unit weight √(χ²/(N − P)); null when N = P. 1 when the σ's are right. */
  sigmaW: number | null;
  /** Number of pairs. */
  n: number;
  /** Number of fitted parameters P (1 or 2). */
  parameters: number;
  /** True when N = P: the correction passes through the data exactly and no σ can be given. */
  isExactlyDetermined: boolean;
}

/**
 * Wavenumber-axis calibration from reference lines: weighted linear least squares for
 * ν_ref − ν_obs = δ ν_obs (+ offset), i.e. ν_true = (1 + δ) ν_obs (+ offset).
 *
 * Weights 1/σ_i² from referenceSigmaCm1 (all equal when none are given). The design is centred on
 * the weighted mean observed wavenumber, which makes δ and the centred offset uncorrelated and the
 * solution exact to round-off even at ν ≈ 10⁴ cm^-1; the offset at ν = 0 and its correlation with δ
 * follow by the linear transformation. Uncertainties are the covariance (AᵀWA)⁻¹ scaled by σ_w²,
 * σ_w² = χ²/(N − P) (Birge ratio: the scatter of the data decides, whether the given σ's were too
 * large or too small; with no σ's this is ordinary least squares). With N = P the fit is exactly
 * determined and no uncertainty is given.
 * Source: weighted linear least squares and its covariance, e.g. Bevington & Robinson, Data Reduction
 * and Error Analysis, 3rd ed. (2003), ch. 6 (from memory); the (1 + δ) scale model is common practice
 * for FTIR axes, whose wavenumbers all scale with the reference-laser wavenumber.
 * @param pairs observed and reference wavenumbers, cm^-1
 * @param options withOffset: fit the additive offset too
 * @returns δ, offset (cm^-1), their 1σ, residuals (cm^-1), rms (cm^-1), σ_w, n
 */
export function calibrationFit(pairs: readonly CalibrationPair[], options: CalibrationFitOptions): CalibrationFit {
  if (!Array.isArray(pairs)) throw new Error(`calibrationFit: pairs must be an array, got ${typeof pairs}`);
  const withOffset = options?.withOffset;
  if (typeof withOffset !== 'boolean') throw new Error(`calibrationFit: options.withOffset must be true or false, got ${withOffset}`);
  const n = pairs.length;
  const p = withOffset ? 2 : 1;
  if (n < p) {
    throw new Error(`calibrationFit: need at least ${p} pair(s) to fit ${withOffset ? 'δ and an offset' : 'δ'}, got ${n}`);
  }
  const withSigma = pairs.filter((q) => q?.referenceSigmaCm1 !== undefined).length;
  if (withSigma !== 0 && withSigma !== n) {
    throw new Error(`calibrationFit: referenceSigmaCm1 given for ${withSigma} of ${n} pairs; give it for all or none`);
  }
  const obs = new Float64Array(n);
  const ref = new Float64Array(n);
  const w = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const q = pairs[i];
    if (!q || !Number.isFinite(q.observedCm1) || !(q.observedCm1 > 0)) {
      throw new Error(`calibrationFit: pairs[${i}].observedCm1 must be a finite wavenumber > 0 cm^-1, got ${q?.observedCm1}`);
    }
    if (!Number.isFinite(q.referenceCm1) || !(q.referenceCm1 > 0)) {
      throw new Error(`calibrationFit: pairs[${i}].referenceCm1 must be a finite wavenumber > 0 cm^-1, got ${q.referenceCm1}`);
    }
    const s = q.referenceSigmaCm1;
    if (s !== undefined && !(Number.isFinite(s) && s > 0)) {
      throw new Error(`calibrationFit: pairs[${i}].referenceSigmaCm1 must be a finite number > 0 cm^-1, got ${s}`);
    }
    obs[i] = q.observedCm1;
    ref[i] = q.referenceCm1;
    w[i] = s === undefined ? 1 : 1 / (s * s);
  }

  // Weighted centre of the observed axis; centred regressor u = ν_obs − ν̄.
  let sw = 0;
  let swx = 0;
  for (let i = 0; i < n; i++) {
    sw += w[i];
    swx += w[i] * obs[i];
  }
  const centre = withOffset ? swx / sw : 0;
  let suu = 0;
  let suy = 0;
  let sy = 0;
  for (let i = 0; i < n; i++) {
    const u = obs[i] - centre;
    const yv = ref[i] - obs[i];
    suu += w[i] * u * u;
    suy += w[i] * u * yv;
    sy += w[i] * yv;
  }
  // Identical observed wavenumbers leave δ undetermined once an offset is fitted.
  if (withOffset && !(suu > 1e-24 * sw * centre * centre)) {
    throw new Error(`calibrationFit: all observedCm1 values are identical (${obs[0]} cm^-1); δ and offset cannot both be fitted`);
  }
  const delta = suy / suu;
  const offsetCentred = withOffset ? sy / sw : 0;
  const offsetCm1 = offsetCentred - delta * centre;

  const residualsCm1 = new Float64Array(n);
  let chi2 = 0;
  let sumSq = 0;
  for (let i = 0; i < n; i++) {
    const r = ref[i] - ((1 + delta) * obs[i] + offsetCm1);
    residualsCm1[i] = r;
    chi2 += w[i] * r * r;
    sumSq += r * r;
  }
  const dof = n - p;
  const isExactlyDetermined = dof === 0;
  const sigmaW = isExactlyDetermined ? null : Math.sqrt(chi2 / dof);
  let deltaSigma: number | null = null;
  let offsetSigmaCm1: number | null = null;
  let deltaOffsetCorrelation: number | null = null;
  if (sigmaW !== null) {
    const varDelta = (sigmaW * sigmaW) / suu;
    deltaSigma = Math.sqrt(varDelta);
    if (withOffset) {
      // offset = c' − δ ν̄ with Cov(δ, c') = 0 in the centred design.
      const varCentred = (sigmaW * sigmaW) / sw;
      const varOffset = varCentred + centre * centre * varDelta;
      offsetSigmaCm1 = Math.sqrt(varOffset);
      deltaOffsetCorrelation = varOffset > 0 && varDelta > 0 ? (-centre * varDelta) / Math.sqrt(varDelta * varOffset) : 0;
    }
  }
  return {
    delta,
    deltaSigma,
    offsetCm1,
    offsetSigmaCm1,
    deltaOffsetCorrelation,
    residualsCm1,
    rmsCm1: Math.sqrt(sumSq / n),
    sigmaW,
    n,
    parameters: p,
    isExactlyDetermined,
  };
}
