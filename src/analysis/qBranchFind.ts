/**
 * Q-branch maxima of a perpendicular band in a trace region, and their K assignment from a model's
 * prediction of the sub-band positions.
 */
import { axisRegionIndices } from '../physics/axisRegion';
import { shapeUniqueName, type BandModel } from '../physics/model';
import { noiseSigmaEstimate } from './noiseSigmaEstimate';
import { peakProminence } from './peakProminence';

/** A Q-branch maximum found in the trace. */
export interface QBranchMaximum {
  /** Position, cm^-1 (three-point parabola through the top). */
  wavenumberCm1: number;
  /** Height above the lower of its two neighbouring minima, absorbance. */
  prominence: number;
  /** 1σ of the position from the noise and the top's curvature, cm^-1. */
  sigmaCm1: number;
}

/**
 * Maxima that stand out as Q branches: prominence ≥ max(minSnr·σ_noise, fraction × the largest).
 * Position σ from the three-point vertex x0 = x_i + h(a − c)/(2(a − 2b + c)): δx0 ≈ σ_noise/(√2·κ·h),
 * κ = −(a − 2b + c)/h² the top's curvature and h the sample step (error propagation, common practice).
 * @param wavenumberCm1 ascending axis, cm^-1
 * @param absorbance ordinate
 * @param fromCm1 region start, cm^-1
 * @param toCm1 region end, cm^-1
 * @param fraction smallest prominence relative to the largest @default 0.2
 * @param minSnr smallest prominence in noise σ @default 6
 */
export function qBranchFind(
  wavenumberCm1: Float64Array,
  absorbance: Float64Array,
  fromCm1: number,
  toCm1: number,
  fraction = 0.2,
  minSnr = 6,
): QBranchMaximum[] {
  const [i0, i1] = axisRegionIndices(wavenumberCm1, fromCm1, toCm1);
  if (i1 - i0 < 5) throw new Error(`qBranchFind: the region ${fromCm1} … ${toCm1} cm^-1 holds ${i1 - i0} points, too few`);
  const x = wavenumberCm1.subarray(i0, i1);
  const y = absorbance.subarray(i0, i1);
  const sigma = noiseSigmaEstimate(x, y);
  const maxima = peakProminence(y);
  let maxProm = 0;
  for (let k = 0; k < maxima.count; k++) maxProm = Math.max(maxProm, maxima.prominence[k]);
  const out: QBranchMaximum[] = [];
  for (let k = 0; k < maxima.count; k++) {
    const prom = maxima.prominence[k];
    if (prom < fraction * maxProm || prom < minSnr * sigma) continue;
    const i = maxima.index[k];
    const a = y[i - 1];
    const b = y[i];
    const c = y[i + 1];
    const den = a - 2 * b + c;
    const h = 0.5 * (x[i + 1] - x[i - 1]);
    const off = den < 0 ? Math.max(-0.5, Math.min(0.5, (0.5 * (a - c)) / den)) : 0;
    const curvature = -den / (h * h); // absorbance per (cm^-1)²
    const sigmaCm1 = curvature > 0 ? Math.max((sigma * Math.SQRT1_2) / (curvature * h), 1e-6) : h;
    out.push({ wavenumberCm1: x[i] + off * h, prominence: prom, sigmaCm1 });
  }
  return out;
}

/** Predicted sub-band centre of index m from a model (cm^-1): the quadratic of qBranchFit's module comment. */
export function qBranchPredict(model: BandModel, m: number): number {
  const u = shapeUniqueName(model.shape);
  if (!u || model.band !== 'perpendicular') throw new Error('qBranchPredict: the model must be a perpendicular band of a symmetric top');
  const up = model.upper;
  const lo = model.lower;
  const c0 = up.origin + up[u] * (1 - 2 * up.zeta) - up.B;
  const c1 = 2 * (up[u] * (1 - up.zeta) - up.B);
  const c2 = up[u] - up.B - (lo[u] - lo.B);
  return c0 + c1 * m + c2 * m * m;
}

/** A maximum with its proposed index and how sure the proposal is. */
export interface QBranchAssignment extends QBranchMaximum {
  m: number;
  /** obs − predicted, cm^-1. */
  offsetCm1: number;
  /** True when the maximum lies more than a quarter of the local spacing from its prediction. */
  isUncertain: boolean;
}

/**
 * Assign each maximum the index m whose predicted sub-band centre is nearest, after removing the
 * median offset between the maxima and their nearest predictions (a shifted model origin or the Q
 * maxima's common displacement). A maximum more than a quarter of the local spacing away from its
 * prediction is marked uncertain; two maxima claiming one m keep only the nearer.
 * @param maxima from qBranchFind
 * @param model perpendicular symmetric-top model
 * @param kMax largest |m| considered @default model.kMax
 */
export function qBranchAssign(maxima: readonly QBranchMaximum[], model: BandModel, kMax = model.kMax): QBranchAssignment[] {
  const ms: number[] = [];
  for (let m = -kMax; m <= kMax; m++) ms.push(m);
  const pred = ms.map((m) => qBranchPredict(model, m));
  const nearest = (nu: number, shift: number) => {
    let best = 0;
    for (let j = 1; j < ms.length; j++) if (Math.abs(nu - shift - pred[j]) < Math.abs(nu - shift - pred[best])) best = j;
    return best;
  };
  const offsets = maxima.map((q) => q.wavenumberCm1 - pred[nearest(q.wavenumberCm1, 0)]).sort((a, b) => a - b);
  const shift = offsets.length ? offsets[Math.floor(offsets.length / 2)] : 0;
  const byM = new Map<number, QBranchAssignment>();
  for (const q of maxima) {
    const j = nearest(q.wavenumberCm1, shift);
    const spacing = Math.abs((pred[Math.min(j + 1, ms.length - 1)] - pred[Math.max(j - 1, 0)]) / 2) || 1;
    const offsetCm1 = q.wavenumberCm1 - pred[j];
    const a: QBranchAssignment = { ...q, m: ms[j], offsetCm1, isUncertain: Math.abs(offsetCm1 - shift) > 0.25 * spacing };
    const prev = byM.get(a.m);
    if (!prev || Math.abs(a.offsetCm1 - shift) < Math.abs(prev.offsetCm1 - shift)) byM.set(a.m, a);
  }
  return [...byM.values()].sort((a, b) => a.m - b.m);
}
