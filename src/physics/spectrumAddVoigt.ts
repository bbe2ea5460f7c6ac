/**
 * Add one line's Voigt profile onto a uniform grid over an index range — the inner loop shared by
 * spectrumSynthesize and spectrumSynthesizeWindowed.
 */
import {
  VOIGT_TABLE_COARSE_INTERVALS,
  VOIGT_TABLE_COARSE_STEP,
  VOIGT_TABLE_END,
  VOIGT_TABLE_FINE_END,
  VOIGT_TABLE_FINE_INTERVALS,
  VOIGT_TABLE_FINE_STEP,
  lineShapeVoigtTableRow,
  lineShapeVoigtTableScale,
  type LineShapeVoigtTable,
} from './lineShapeVoigtTable';

const SQRT_LN2 = Math.sqrt(Math.LN2);
const INV_SQRT_PI = 1 / Math.sqrt(Math.PI);
const FINE_NODES = VOIGT_TABLE_FINE_INTERVALS + 1;
const COARSE_NODES = VOIGT_TABLE_COARSE_INTERVALS + 1;
const INV_FINE_STEP = 1 / VOIGT_TABLE_FINE_STEP;
const INV_COARSE_STEP = 1 / VOIGT_TABLE_COARSE_STEP;

/**
 * Add amplitude · V(x_k − ν) to out[k] for k = kLo … kHi, where x_k = fromCm1 + k·stepCm1 and V is
 * the area-normalised Voigt profile (Doppler HWHM α, Lorentz HWHM γ). Uses the bilinear table for
 * |Δν| ≤ 16 Voigt HWHMs and the two-term asymptotic series beyond (optionally only its leading,
 * Lorentzian term beyond 32 HWHMs). Error ≤ 1e-6 of the peak and ≤ 1.1e-5 of the local value in
 * the wings (lineShapeVoigtTable.ts; the one-term option adds < 5e-7 of the peak); α = 0 gives
 * the exact Lorentzian.
 * WARNING: no validation — callers check the range lies inside out and that the table covers y.
 * Source: see lineShapeVoigtTable.ts (Weideman 1994; Olivero & Longbothum 1977; A&S 7.1.23).
 * @param out spectrum being accumulated (profile units cm × amplitude)
 * @param fromCm1 grid origin x_0, cm^-1
 * @param stepCm1 grid step, cm^-1
 * @param kLo first index (inclusive)
 * @param kHi last index (inclusive)
 * @param nuCm1 line centre, cm^-1
 * @param amplitude line intensity (integrated area), any unit
 * @param dopplerHwhmCm1 α, cm^-1 (≥ 0)
 * @param lorentzHwhmCm1 γ, cm^-1 (≥ 0, not both 0)
 * @param table Voigt table covering y = √ln2 γ/α (unused when α = 0)
 * @param farOneTerm keep only the leading term beyond 32 HWHMs: error < 5e-7 of the peak but up to
 *   2e-3 of the local wing value, so only for sums judged relative to the peak (windowed synthesis)
 */
export function spectrumAddVoigt(
  out: Float64Array,
  fromCm1: number,
  stepCm1: number,
  kLo: number,
  kHi: number,
  nuCm1: number,
  amplitude: number,
  dopplerHwhmCm1: number,
  lorentzHwhmCm1: number,
  table: LineShapeVoigtTable | null,
  farOneTerm: boolean,
): void {
  if (kHi < kLo || amplitude === 0) return;
  if (dopplerHwhmCm1 === 0) {
    const g = lorentzHwhmCm1;
    const g2 = g * g;
    const a = (amplitude * g) / Math.PI;
    for (let k = kLo; k <= kHi; k++) {
      const d = fromCm1 + k * stepCm1 - nuCm1;
      out[k] += a / (d * d + g2);
    }
    return;
  }
  const y = (SQRT_LN2 * lorentzHwhmCm1) / dopplerHwhmCm1;
  const s = lineShapeVoigtTableScale(y);
  const hwhm = (s * dopplerHwhmCm1) / SQRT_LN2;
  // V = √ln2/(α√π) · F(u, y)/s with u the offset in Voigt HWHMs.
  const ampF = (amplitude * SQRT_LN2 * INV_SQRT_PI) / (dopplerHwhmCm1 * s);
  const du = stepCm1 / hwhm;
  const uA = (fromCm1 - nuCm1) / hwhm;
  const tab = table as LineShapeVoigtTable;
  const [j, t] = lineShapeVoigtTableRow(tab, y);

  // Segments: u < −16 | −16 ≤ u < −8 | −8 ≤ u < 0 | 0 ≤ u ≤ 8 | 8 < u ≤ 16 | u > 16. Each boundary
  // is the first k with u ≥ threshold ("> thr" is "≥ the next double after thr").
  const kEnd = kHi + 1;
  const kM16 = firstAtLeast(-VOIGT_TABLE_END, uA, du, kLo, kEnd);
  const kM8 = firstAtLeast(-VOIGT_TABLE_FINE_END, uA, du, kLo, kEnd);
  const k0 = firstAtLeast(0, uA, du, kLo, kEnd);
  const kP8 = firstAtLeast(VOIGT_TABLE_FINE_END_UP, uA, du, kLo, kEnd);
  const kP16 = firstAtLeast(VOIGT_TABLE_END_UP, uA, du, kLo, kEnd);

  if (lorentzHwhmCm1 > 0) {
    // Beyond 32 HWHMs the second asymptotic term changes K by < 5e-7 of the peak (measured 4.2e-7 over
    // all y), so the cheaper one-term (Lorentzian) form may be used there.
    const kMFar = farOneTerm ? firstAtLeast(-FAR_ONE_TERM, uA, du, kLo, kM16) : kLo;
    const kPFar = farOneTerm ? firstAtLeast(FAR_ONE_TERM_UP, uA, du, kP16, kEnd) : kEnd;
    addLorentzTail(out, kLo, kMFar, uA, du, s, y, ampF * s);
    addAsymptotic(out, kMFar, kM16, uA, du, s, y, ampF * s);
    addAsymptotic(out, kP16, kPFar, uA, du, s, y, ampF * s);
    addLorentzTail(out, kPFar, kEnd, uA, du, s, y, ampF * s);
  }
  const fineBase = j * FINE_NODES * 4;
  const coarseBase = j * COARSE_NODES * 4;
  // Mirror halves: F is even in u, so u < 0 reads the table at −u.
  addTable(out, kM16, kM8, -uA, -du, -VOIGT_TABLE_FINE_END, INV_COARSE_STEP, tab.coarse, coarseBase, t, ampF);
  addTable(out, kM8, k0, -uA, -du, 0, INV_FINE_STEP, tab.fine, fineBase, t, ampF);
  addTable(out, k0, kP8, uA, du, 0, INV_FINE_STEP, tab.fine, fineBase, t, ampF);
  addTable(out, kP8, kP16, uA, du, -VOIGT_TABLE_FINE_END, INV_COARSE_STEP, tab.coarse, coarseBase, t, ampF);
}

const VOIGT_TABLE_FINE_END_UP = VOIGT_TABLE_FINE_END * (1 + Number.EPSILON);
/** Voigt HWHMs beyond which only the leading asymptotic term is kept. */
const FAR_ONE_TERM = 32;
const FAR_ONE_TERM_UP = FAR_ONE_TERM * (1 + Number.EPSILON);
const VOIGT_TABLE_END_UP = VOIGT_TABLE_END * (1 + Number.EPSILON);

/** First k in [lo, hi] with uA + k·du ≥ thr (hi if none), using the same expression as the loops' start. */
function firstAtLeast(thr: number, uA: number, du: number, lo: number, hi: number): number {
  let k = Math.ceil((thr - uA) / du);
  if (uA + k * du < thr) k++;
  else if (uA + (k - 1) * du >= thr) k--;
  return k < lo ? lo : k > hi ? hi : k;
}

/** out[k] += amp · bilinear(table) at p = (u0 + k·du + shift)·invStep, k ∈ [ka, kb). */
function addTable(
  out: Float64Array,
  ka: number,
  kb: number,
  u0: number,
  du: number,
  shift: number,
  invStep: number,
  arr: Float64Array,
  base: number,
  t: number,
  amp: number,
): void {
  // Incremental position: faster than recomputing, and the drift over a segment (~n·1e-16
  // relative) cannot leave the table, whose last node is repeated with zero slope.
  let p = (u0 + ka * du + shift) * invStep;
  const dp = du * invStep;
  for (let k = ka; k < kb; k++) {
    const i = p | 0;
    const f = p - i;
    const o = base + (i << 2);
    out[k] += amp * (arr[o] + t * arr[o + 2] + f * (arr[o + 1] + t * arr[o + 3]));
    p += dp;
  }
}

/** out[k] += ampK · K_asym(u s, y) for k ∈ [ka, kb), two-term asymptotic series (A&S 7.1.23). */
function addAsymptotic(out: Float64Array, ka: number, kb: number, uA: number, du: number, s: number, y: number, ampK: number): void {
  const y2 = y * y;
  const c1 = ampK * y * INV_SQRT_PI;
  let x = (uA + ka * du) * s;
  const dx = du * s;
  for (let k = ka; k < kb; k++) {
    const x2 = x * x;
    const inv = 1 / (x2 + y2);
    out[k] += c1 * inv * (1 + 0.5 * (3 * x2 - y2) * inv * inv);
    x += dx;
  }
}

/** out[k] += ampK · y/(√π (x² + y²)) for k ∈ [ka, kb): leading asymptotic term (A&S 7.1.23). */
function addLorentzTail(out: Float64Array, ka: number, kb: number, uA: number, du: number, s: number, y: number, ampK: number): void {
  const y2 = y * y;
  const c1 = ampK * y * INV_SQRT_PI;
  let x = (uA + ka * du) * s;
  const dx = du * s;
  for (let k = ka; k < kb; k++) {
    out[k] += c1 / (x * x + y2);
    x += dx;
  }
}
