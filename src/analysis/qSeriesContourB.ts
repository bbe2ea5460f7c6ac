/**
 * B of a perpendicular symmetric-top band whose Q-branch comb is resolved but whose J lines are not,
 * from a contour fit of the whole band seen through the spectrometer's instrument line shape
 * (contourFit), started from the rigid envelope fit of bandEnvelopeQSeriesFit.
 */
import { contourFit, type ContourFitResult } from '../fit/contourFit';
import { SECOND_RADIATION_CM_K } from '../physics/constants';
import type { ApodizationName } from '../physics/instrumentLineShape';
import { stateConstantsFrom, type BandModel } from '../physics/model';

/** Input of qSeriesContourB. */
export interface QSeriesContourBInput {
  /** Region axis, ascending, cm^-1. */
  x: Float64Array;
  /** Region absorbance as measured (its baseline is fitted as a quadratic), absorbance. */
  y: Float64Array;
  /** Rotational temperature, K (held). */
  temperatureK: number;
  /** Maximum optical path difference L, cm. */
  opdCm: number;
  apodization: ApodizationName;
  /** White-noise σ of y, absorbance. */
  noiseSigma: number;
  /**
   * Start from the rigid envelope fit: shape, B (cm^-1), U − B (U = A prolate, C oblate, cm^-1), ζ and
   * the origin (cm^-1) whose comb of Q branches matches the trace's.
   */
  start: {
    shape: 'prolate' | 'oblate';
    B: number;
    uniqueMinusB: number;
    zeta: number;
    origin: number;
    /** B range the envelope fit found fitting about as well, cm^-1 (restarts stay inside it). */
    bLow?: number;
    bHigh?: number;
  };
  /** Mass for the Doppler width, amu (negligible beside the instrument at L ≤ 10 cm). @default 50 */
  massAmu?: number;
  /**
   * Nuclear-spin statistical weights by K mod 3 ([K ≡ 0, K ≡ 1, K ≡ 2], as BandModel.spinWeights),
   * when the molecule is known; the Q branches' heights over K follow them. @default [1] (none)
   */
  spinWeights?: number[];
  /** Called after each contour fit run with the runs done and about how many there will be. */
  onProgress?: (runsDone: number, runsPlanned: number) => void;
}

/** Result of qSeriesContourB. */
export interface QSeriesContourBResult {
  /** Lower-state B and its 1σ from the fit's covariance, cm^-1. */
  B: number;
  bSigma: number;
  /** B ± 2σ, widened to span every other minimum about as deep (each ± 2σ), cm^-1. */
  bLow: number;
  bHigh: number;
  /** B of the other minima that fit about as well as the best (Δχ² ≤ 25), outside its B ± 2σ, cm^-1, ascending. */
  otherMinimaB: number[];
  /** Whether B counts as determined: fit converged, residual near the noise, B's range (bLow … bHigh) within ±10 %. */
  determined: boolean;
  /** Whether the fit found the band: converged, residual near the noise, B within the range the model was built for. */
  fitsBand: boolean;
  /** Why not, in words (empty when determined). */
  whyNot: string;
  /** rms residual over the noise σ (≈ 1 when the model fits to the noise). */
  rmsOverNoise: number;
  /** Lag-1 autocorrelation of the residuals (≈ 0 for white noise left alone; structure left raises it). */
  residualLag1: number;
  /** A′(1−ζ) − B′ (C′ for oblate) with its σ, cm^-1: half the Q-branch spacing. */
  uniqueZetaMinusB: number;
  uniqueZetaMinusBSigma: number;
  /** Fitted lower-state U = A (prolate) or C (oblate), cm^-1. */
  unique: number;
  shape: 'prolate' | 'oblate';
  status: ContourFitResult['status'];
}

/** A fit whose rms exceeds this multiple of the noise σ has not found the band's minimum (chosen here, see below). */
const Q_SERIES_CONTOUR_RMS_OVER_NOISE = 1.2;

/**
 * Residuals whose lag-1 autocorrelation exceeds this keep structure the model misses (a false minimum
 * fitting near the noise: 0.12–0.30 on the tuning seeds of bench:contour classify where B ± 2σ missed
 * the truth, |ρ1| ≤ 0.03 where the fit found the band); chosen here. Correlated noise (an interpolated
 * or smoothed trace) also raises it, and then B is withheld too: the safe side.
 */
const Q_SERIES_CONTOUR_LAG1_MAX = 0.1;

/**
 * Factors B′ and B″ of the best fit are scaled by for the restarts that look for another minimum of B
 * (chosen here: the false minima of the seeded bands lay 2–20 % below the true B, and as far above is
 * searched alike).
 */
const B_RESTART_FACTORS = [0.8, 0.9, 0.95, 1.05, 1.12, 1.25];

/** Half-width of B ± 2σ, relative, under which B is called determined (issue's target: B within 10 %). */
const Q_SERIES_CONTOUR_B_RELATIVE = 0.1;

/**
 * Contour fit of a perpendicular band with a resolved Q-branch comb for B.
 *
 * Model: the band's lines (bandLines: term values, Hönl–London factors, Boltzmann factors at the
 * held T) convolved with the instrument line shape of L and the apodization in the weak-absorption
 * limit (the trace's absolute line strengths are unknown), a free scale and a quadratic baseline.
 * Floated: origin, B′, B″, U′, U″ and ζ (U = A prolate, C oblate), started from the rigid envelope fit,
 * whose comb fixes U′(1−ζ) − B′ (the Q-branch spacing) and the comb's phase, so the fit refines them
 * near there; B″ and U″ then follow from the sub-bands' P/R wings and the Q-branch heights over K,
 * and B′ − B″, U′ − U″ from the shading of each Q branch (which the rigid envelope lacks).
 * Two routes from the envelope's start, everything floated and U″ held at the envelope's value
 * (then refined with it floated when that route reached the lower residual), then restarts from the
 * better with B scaled by B_RESTART_FACTORS; the lowest residual wins.
 * σ from the residuals (contourFit); B's range is B ± 2σ widened over every other minimum about as
 * deep. B is called determined only when the fit converged, leaves at most
 * Q_SERIES_CONTOUR_RMS_OVER_NOISE × the noise (a fit caught in a false minimum, the rigid start
 * on the wrong side, left 1.35–4.7× on the tuning seeds of bench:contour classify against 0.6–1.2
 * where it found the band), its residuals look like white noise (lag-1 autocorrelation ≤
 * Q_SERIES_CONTOUR_LAG1_MAX) and that range lies within ±10 %.
 * Source: contourFit (Levenberg–Marquardt, instrument line shape per Griffiths & de Haseth (2007)
 * ch. 2); perpendicular-band structure, Herzberg II (1945) ch. IV.
 * @returns the fit, or null when the contour fit fails (the reason is then not B's)
 */
export function qSeriesContourB(input: QSeriesContourBInput): QSeriesContourBResult | null {
  const { x, y, temperatureK: T, start } = input;
  const n = x.length;
  if (n < 40 || !(start.B > 0)) return null;
  const B = start.B;
  const U = start.uniqueMinusB + B;
  const u = start.shape === 'prolate' ? 'A' : 'C';
  const c2T = SECOND_RADIATION_CM_K / T;
  const constants: Record<string, number> = { B, [u]: U };
  const upperStart = { ...constants, origin: start.origin, zeta: start.zeta };
  const floatAll = ['upper.origin', 'upper.B', 'lower.B', `upper.${u}`, `lower.${u}`, 'upper.zeta', 'scale'];
  const floatHeldU = floatAll.filter((k) => k !== `lower.${u}`);
  interface Run {
    fit: ContourFitResult;
    /** Lower-state B the model's J range was sized for, cm^-1. */
    bSized: number;
  }
  // One contour fit from the given constants, with the model's J and K range sized for them.
  // Two routes, the held one refined, then the restarts of B (settling reruns come on top).
  const runsPlanned = 3 + B_RESTART_FACTORS.length;
  let runsDone = 0;
  const fitFrom = (lower: Record<string, number>, upper: Record<string, number>, float: string[]): Run | null => {
    const run = fitOnce(lower, upper, float);
    runsDone++;
    input.onProgress?.(runsDone, Math.max(runsPlanned, runsDone));
    return run;
  };
  const fitOnce = (lower: Record<string, number>, upper: Record<string, number>, float: string[]): Run | null => {
    const bSized = lower.B;
    const uMinusB = Math.abs(lower[u] - lower.B);
    // Thermal reach: populations exp(−c2 B J²/T) and exp(−c2 (U − B) K²/T) down to ~e^−10 with B
    // allowed to fall to 0.6 of the value sized for (common practice for a band's J and K range).
    const jMax = Math.min(400, Math.ceil(Math.sqrt(10 / (c2T * 0.6 * bSized))) + 5);
    const kMax = Math.min(jMax, Math.ceil(Math.sqrt(10 / (c2T * Math.max(uMinusB * 0.6, 0.02 * bSized)))) + 3);
    const model: BandModel = {
      shape: start.shape,
      band: 'perpendicular',
      lower: stateConstantsFrom(lower),
      upper: stateConstantsFrom(upper),
      temperatureK: T,
      jMax,
      kMax,
      spinWeights: input.spinWeights ?? [1],
    };
    try {
      const fit = contourFit({
        model,
        wavenumberCm1: x,
        absorbance: y,
        fromCm1: x[0],
        toCm1: x[n - 1],
        opdCm: input.opdCm,
        apodization: input.apodization,
        massAmu: input.massAmu ?? 50,
        float,
        baselineDegree: 2,
        noiseSigma: input.noiseSigma,
        route: 'linear',
        // The long, shallow valleys of B against U and ζ (chosen here; tuning seed 63 stopped at 40 with B exact).
        maxIterations: 100,
        // The restarts here collect every minimum of B about as deep for B's range; the fit must not
        // leave one for a lower alias by itself.
        lineAliasScan: false,
      });
      const b = fit.parameters['lower.B'];
      return b && b.value > 0 ? { fit, bSized } : null;
    } catch {
      return null;
    }
  };
  const constantsOf = (f: ContourFitResult) => {
    const value = (key: string) => f.parameters[key]?.value ?? 0;
    return {
      lower: { B: value('lower.B'), [u]: value(`lower.${u}`) },
      upper: { B: value('upper.B'), [u]: value(`upper.${u}`), origin: value('upper.origin'), zeta: value('upper.zeta') },
    };
  };
  // Constants of a fit with B′ and B″ scaled by f, U′ moved to hold the comb's U′(1−ζ) − B′ and U′ − U″
  // kept; null when 1 − ζ is too small to move U′ by.
  const scaledStart = (f: ContourFitResult, factor: number) => {
    const c = constantsOf(f);
    const z = c.upper.zeta;
    if (!(Math.abs(1 - z) > 0.05)) return null;
    const comb = c.upper[u] * (1 - z) - c.upper.B;
    const bUpper = c.upper.B * factor;
    const uUpper = (comb + bUpper) / (1 - z);
    return {
      lower: { B: c.lower.B * factor, [u]: uUpper - (c.upper[u] - c.lower[u]) },
      upper: { ...c.upper, B: bUpper, [u]: uUpper },
    };
  };
  // A B that moved far from where the model was sized (the rigid envelope's B can be off by a factor
  // 2) is fitted once more with the J and K range sized for it.
  const settle = (run: Run | null, float: string[]): Run | null => {
    if (!run) return null;
    const v = run.fit.parameters['lower.B'].value;
    if (v >= 0.7 * run.bSized && v <= 1.5 * run.bSized) return run;
    const c = constantsOf(run.fit);
    return fitFrom(c.lower, c.upper, float) ?? run;
  };
  // Two routes from the envelope's start: everything floated, and U″ held at the envelope's value
  // (U′ − U″ still free). On the seeded bands each route alone ended in a false minimum on some band
  // that the other avoided, with a residual a few per cent above the other's; so both run, the
  // held route is refined with U″ floated when it reached the lower residual, and the lowest wins.
  const full = settle(fitFrom(constants, upperStart, floatAll), floatAll);
  let held = settle(fitFrom(constants, upperStart, floatHeldU), floatHeldU);
  if (held && (!full || held.fit.rms < full.fit.rms)) {
    const c = constantsOf(held.fit);
    held = settle(fitFrom(c.lower, c.upper, floatAll), floatAll) ?? held;
  }
  const runs = [full, held].filter((r): r is Run => r !== null);
  if (!runs.length) return null;
  const lowest = () => runs.reduce((a, r) => (r.fit.rms < a.fit.rms ? r : a));
  // B's χ² has several minima a few to twenty per cent apart where the P/R lines are nearly resolved
  // (the J structure lines up again at another B; held-out seed 1069 of bench:contour classify: minima
  // at B = 0.168, 0.177 and the true 0.207 cm^-1, the rigid start falling into the first; 1036: 0.166,
  // 0.168 and the true 0.1715 within Δχ² 16). So the fit starts again from the best fit with B′ and B″
  // scaled by each of B_RESTART_FACTORS (U′ moved so the comb's U′(1−ζ) − B′ holds, U′ − U″ kept),
  // brought inside the envelope fit's B range when it gave one; the lowest residual of all runs wins,
  // and B's range below spans every minimum about as deep.
  const first = lowest();
  const bFirst = first.fit.parameters['lower.B'].value;
  const factorsTried: number[] = [];
  for (const f of B_RESTART_FACTORS) {
    let factor = f;
    if (start.bLow !== undefined && start.bHigh !== undefined) factor = Math.min(Math.max(bFirst * f, start.bLow), start.bHigh) / bFirst;
    // A start the clamp moved onto the best fit's B, or onto one already tried, adds nothing.
    if (Math.abs(factor - 1) < 0.02 || factorsTried.some((t) => Math.abs(t - factor) < 0.02)) continue;
    factorsTried.push(factor);
    const s = scaledStart(first.fit, factor);
    if (!s) continue;
    const run = settle(fitFrom(s.lower, s.upper, floatAll), floatAll);
    if (run) runs.push(run);
  }
  const best = lowest();
  const fit = best.fit;
  const bSized = best.bSized;
  const b = fit.parameters['lower.B'];
  if (b.fixed) return null;
  let r0 = 0;
  let r1 = 0;
  for (let i = 0; i < fit.residual.length; i++) {
    r0 += fit.residual[i] ** 2;
    if (i > 0) r1 += fit.residual[i] * fit.residual[i - 1];
  }
  const residualLag1 = r0 > 0 ? r1 / r0 : 0;
  const combo = fit.combinations[`${u}'(1-zeta)-B'`];
  const rmsOverNoise = fit.rms / input.noiseSigma;
  // Every run that fits about as well (Δχ² ≤ 25 in units of the best fit's residual variance, chosen
  // here) is a minimum the contour cannot tell from the best: B's range spans them all (each ± 2σ).
  let bLow = b.value - 2 * b.sigma;
  let bHigh = b.value + 2 * b.sigma;
  const otherMinimaB: number[] = [];
  for (const other of runs) {
    if (other === best) continue;
    const dChi2 = fit.nPoints * ((other.fit.rms / fit.rms) ** 2 - 1);
    const o = other.fit.parameters['lower.B'];
    if (!(dChi2 <= 25) || !(Math.abs(o.value - b.value) > 2 * b.sigma)) continue;
    if (!otherMinimaB.some((v) => Math.abs(v - o.value) <= 2 * o.sigma)) otherMinimaB.push(o.value);
    bLow = Math.min(bLow, o.value - 2 * o.sigma);
    bHigh = Math.max(bHigh, o.value + 2 * o.sigma);
  }
  otherMinimaB.sort((p, q) => p - q);
  const reasons: string[] = [];
  // The model's J range was sized for B ≥ 0.6 × bSized: a B below that lacks its high-J lines.
  if (!(b.value >= 0.6 * bSized))
    reasons.push(
      `B fell to ${b.value.toPrecision(3)} cm^-1, under 0.6× the ${bSized.toPrecision(3)} cm^-1 the model's J range was sized for`,
    );
  if (residualLag1 > Q_SERIES_CONTOUR_LAG1_MAX)
    reasons.push(
      `the residuals keep structure (lag-1 autocorrelation ${residualLag1.toFixed(2)}, over ${Q_SERIES_CONTOUR_LAG1_MAX}: the model misses part of the band, or the noise is correlated), so σ cannot be trusted`,
    );
  if (fit.status === 'max-iterations') reasons.push('the contour fit stopped at its iteration limit without converging');
  if (!(rmsOverNoise <= Q_SERIES_CONTOUR_RMS_OVER_NOISE))
    reasons.push(
      `the contour fit leaves ${rmsOverNoise.toFixed(2)}× the noise (over ${Q_SERIES_CONTOUR_RMS_OVER_NOISE}: it has not found the band's own minimum, or the band is not this model)`,
    );
  const fitsBand = reasons.length === 0;
  const halfSpan = Math.max(b.value - bLow, bHigh - b.value);
  if (!(halfSpan <= Q_SERIES_CONTOUR_B_RELATIVE * b.value))
    reasons.push(
      `${otherMinimaB.length ? `B ± 2σ with the other minima about as deep (B = ${otherMinimaB.map((v) => v.toPrecision(3)).join(', ')} cm^-1)` : 'B ± 2σ'} spans ±${((100 * halfSpan) / b.value).toFixed(0)} %, over ±${Q_SERIES_CONTOUR_B_RELATIVE * 100} %`,
    );
  return {
    B: b.value,
    bSigma: b.sigma,
    bLow,
    bHigh,
    otherMinimaB,
    determined: reasons.length === 0,
    fitsBand,
    whyNot: reasons.join('; '),
    rmsOverNoise,
    residualLag1,
    uniqueZetaMinusB: combo?.value ?? NaN,
    uniqueZetaMinusBSigma: combo?.sigma ?? NaN,
    unique: fit.parameters[`lower.${u}`]?.value ?? NaN,
    shape: start.shape,
    status: fit.status,
  };
}
