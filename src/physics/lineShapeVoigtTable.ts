/**
 * A lookup table of the Voigt shape in reduced units, for the hot loops of spectrum synthesis.
 *
 * Reduced variables: with Doppler HWHM α and Lorentz HWHM γ, y = √ln2 γ/α and the Voigt HWHM in
 * units of α/√ln2 is s(y) = 0.5346 y + √(0.2166 y² + ln2) (Olivero–Longbothum). The offset in
 * Voigt HWHMs is u = Δν / (s α/√ln2), and the tabulated shape is
 *   F(u, y) = s(y) · K(u s(y), y),   K = Re w (Faddeeva),
 * so that V(Δν) = √ln2/(α√π) · F(u, y)/s(y). Scaling by the HWHM keeps F between the Gaussian
 * (F(0,0) = √ln2 ≈ 0.83) and Lorentzian (F(0,∞) = 1/√π ≈ 0.56) forms, with O(1) curvature, so
 * one uniform step in u serves every y. Rows are uniform in η = y/(1 + y) ∈ [0, 1).
 *
 * Interpolation is bilinear in (u, η). Its error is at most Δu²/8·max|F_uu| + Δη²/8·max|F_ηη|;
 * numerically max|F_uu| = 1.15 and max|F_ηη| = 0.83 (both near u = 0), and |F_uu| ≤ 3.4/u⁴ for
 * u ≥ 8. With Δu = 1/512 on u ≤ 8, Δu = 1/32 on 8 < u ≤ 16 and Δη = 1/400 the bound is 1.2e-6 in F,
 * i.e. ≤ 2.2e-6 of the peak F(0, y) ≥ 0.56. Beyond u = 16 the two-term asymptotic series of w(z)
 * is used instead (error ≤ 5e-8 of the peak there, measured), so the table stops at u = 16.
 * Source: Weideman (1994) for K; J. J. Olivero and R. L. Longbothum, JQSRT 17, 233 (1977) for s(y);
 * asymptotic series w(z) ~ (i/√π)(1/z + 1/(2z³) + …), Abramowitz & Stegun (1964) eq. 7.1.23.
 */
import { faddeevaRe } from './faddeeva';

/** Step in u (Voigt HWHMs) of the fine part of the table, u ∈ [0, 8]. */
export const VOIGT_TABLE_FINE_STEP = 1 / 512;
/** End of the fine part of the table, in Voigt HWHMs. */
export const VOIGT_TABLE_FINE_END = 8;
/** Step in u of the coarse part of the table, u ∈ [8, 16]. */
export const VOIGT_TABLE_COARSE_STEP = 1 / 32;
/** End of the table, in Voigt HWHMs; beyond it the asymptotic series is used. */
export const VOIGT_TABLE_END = 16;
/** Step of the table rows in η = y/(1 + y). */
export const VOIGT_TABLE_ETA_STEP = 1 / 400;

const FINE_INTERVALS = Math.round(VOIGT_TABLE_FINE_END / VOIGT_TABLE_FINE_STEP);
const COARSE_INTERVALS = Math.round((VOIGT_TABLE_END - VOIGT_TABLE_FINE_END) / VOIGT_TABLE_COARSE_STEP);

/**
 * Bilinear Voigt table over a band of rows in η. For each row pair (j, j+1) and each u node i the
 * array holds four numbers [F_j(i), F_j(i+1) − F_j(i), F_{j+1}(i) − F_j(i), (ΔF_{j+1} − ΔF_j)(i)],
 * so the value at fractions (f in u, t in η) is q0 + t·q2 + f·(q1 + t·q3) from one 32-byte block.
 */
export interface LineShapeVoigtTable {
  /** η of row 0. */
  etaFrom: number;
  /** Number of rows (≥ 2); row pairs are 0 … nRows−2. */
  nRows: number;
  /** Fine part, u ∈ [0, 8]: (nRows−1) pairs × (FINE_INTERVALS + 1) nodes × 4. */
  fine: Float64Array;
  /** Coarse part, u ∈ [8, 16]: (nRows−1) pairs × (COARSE_INTERVALS + 1) nodes × 4. */
  coarse: Float64Array;
}

/** Number of fine-table u intervals (u ∈ [0, 8]). */
export const VOIGT_TABLE_FINE_INTERVALS = FINE_INTERVALS;
/** Number of coarse-table u intervals (u ∈ [8, 16]). */
export const VOIGT_TABLE_COARSE_INTERVALS = COARSE_INTERVALS;

/**
 * Voigt HWHM in units of α/√ln2 (α = Doppler HWHM) for the reduced Lorentz width y = √ln2 γ/α.
 * Source: Olivero & Longbothum, JQSRT 17, 233 (1977), applied to HWHMs √ln2 (Gauss) and y (Lorentz).
 * @param y reduced Lorentz width (dimensionless, ≥ 0)
 * @returns s(y), dimensionless
 */
export function lineShapeVoigtTableScale(y: number): number {
  return 0.5346 * y + Math.sqrt(0.2166 * y * y + Math.LN2);
}

/**
 * Build the table for reduced Lorentz widths y ∈ [yMin, yMax] (rows cover the η interval with at
 * least one row pair). Cost ≈ 4,400 Faddeeva evaluations per row.
 * Source: see the module comment (Weideman 1994; Olivero & Longbothum 1977).
 * @param yMin smallest reduced width y = √ln2 γ/α to cover (≥ 0)
 * @param yMax largest reduced width (≥ yMin, finite)
 * @returns the table
 */
export function lineShapeVoigtTable(yMin: number, yMax: number): LineShapeVoigtTable {
  if (!(yMin >= 0) || !Number.isFinite(yMin)) {
    throw new RangeError(`lineShapeVoigtTable: yMin must be finite and >= 0, got ${yMin}`);
  }
  if (!(yMax >= yMin) || !Number.isFinite(yMax)) {
    throw new RangeError(`lineShapeVoigtTable: yMax must be finite and >= yMin (${yMin}), got ${yMax}`);
  }
  const etaMin = yMin / (1 + yMin);
  const etaMax = yMax / (1 + yMax);
  const j0 = Math.floor(etaMin / VOIGT_TABLE_ETA_STEP);
  let j1 = Math.ceil(etaMax / VOIGT_TABLE_ETA_STEP);
  if (j1 <= j0) j1 = j0 + 1;
  const nRows = j1 - j0 + 1;
  const etaFrom = j0 * VOIGT_TABLE_ETA_STEP;
  const fineRows = buildRows(etaFrom, nRows, 0, VOIGT_TABLE_FINE_STEP, FINE_INTERVALS);
  const coarseRows = buildRows(etaFrom, nRows, VOIGT_TABLE_FINE_END, VOIGT_TABLE_COARSE_STEP, COARSE_INTERVALS);
  return {
    etaFrom,
    nRows,
    fine: packPairs(fineRows, nRows, FINE_INTERVALS),
    coarse: packPairs(coarseRows, nRows, COARSE_INTERVALS),
  };
}

function buildRows(etaFrom: number, nRows: number, uFrom: number, uStep: number, intervals: number): Float64Array {
  const nodes = intervals + 1;
  const rows = new Float64Array(nRows * nodes);
  for (let j = 0; j < nRows; j++) {
    const eta = etaFrom + j * VOIGT_TABLE_ETA_STEP;
    if (eta >= 1 - 1e-12) {
      // Row at η = 1 (y = ∞): the Lorentz limit F = c/(√π (c²u² + 1)), c = lim s/y = 0.5346 + √0.2166.
      const c = 0.5346 + Math.sqrt(0.2166);
      for (let i = 0; i < nodes; i++) {
        const u = uFrom + i * uStep;
        rows[j * nodes + i] = c / Math.sqrt(Math.PI) / (c * c * u * u + 1);
      }
      continue;
    }
    const y = eta / (1 - eta);
    const s = lineShapeVoigtTableScale(y);
    for (let i = 0; i < nodes; i++) rows[j * nodes + i] = s * faddeevaRe((uFrom + i * uStep) * s, y);
  }
  return rows;
}

function packPairs(rows: Float64Array, nRows: number, intervals: number): Float64Array {
  const nodes = intervals + 1;
  const out = new Float64Array((nRows - 1) * nodes * 4);
  for (let j = 0; j + 1 < nRows; j++) {
    const a = j * nodes;
    const b = a + nodes;
    for (let i = 0; i < nodes; i++) {
      // The last node repeats its value (zero slope) so an index landing exactly on the end is safe.
      const i1 = i + 1 < nodes ? i + 1 : i;
      const o = (j * nodes + i) * 4;
      const fa = rows[a + i];
      const fb = rows[b + i];
      const da = rows[a + i1] - fa;
      const db = rows[b + i1] - fb;
      out[o] = fa;
      out[o + 1] = da;
      out[o + 2] = fb - fa;
      out[o + 3] = db - da;
    }
  }
  return out;
}

/**
 * Row pair index and fraction for a reduced width y in a table.
 * @returns [pair index j (0 … nRows−2), fraction t ∈ [0, 1]]; y outside the table is clamped
 */
export function lineShapeVoigtTableRow(table: LineShapeVoigtTable, y: number): [number, number] {
  const eta = y === Infinity ? 1 : y / (1 + y);
  let r = (eta - table.etaFrom) / VOIGT_TABLE_ETA_STEP;
  if (r < 0) r = 0;
  const rMax = table.nRows - 1;
  if (r > rMax) r = rMax;
  let j = Math.floor(r);
  if (j > rMax - 1) j = rMax - 1;
  return [j, r - j];
}

/**
 * F(u, y) = s(y) K(u s(y), y) from the table (bilinear), or from the two-term asymptotic series
 * for |u| > 16. Scalar reference path (the synthesis loops inline the same arithmetic).
 * Source: module comment; A&S (1964) eq. 7.1.23 for the asymptotic part.
 * @param table table covering y
 * @param u offset in Voigt HWHMs (dimensionless)
 * @param y reduced Lorentz width (dimensionless)
 * @returns F(u, y), dimensionless
 */
export function lineShapeVoigtTableValue(table: LineShapeVoigtTable, u: number, y: number): number {
  const au = Math.abs(u);
  const s = lineShapeVoigtTableScale(y);
  if (au > VOIGT_TABLE_END) return s * lineShapeVoigtAsymptoticK(au * s, y);
  const [j, t] = lineShapeVoigtTableRow(table, y);
  let arr: Float64Array;
  let p: number;
  let nodes: number;
  if (au <= VOIGT_TABLE_FINE_END) {
    arr = table.fine;
    p = au / VOIGT_TABLE_FINE_STEP;
    nodes = FINE_INTERVALS + 1;
  } else {
    arr = table.coarse;
    p = (au - VOIGT_TABLE_FINE_END) / VOIGT_TABLE_COARSE_STEP;
    nodes = COARSE_INTERVALS + 1;
  }
  const i = Math.floor(p);
  const f = p - i;
  const o = (j * nodes + i) * 4;
  return arr[o] + t * arr[o + 2] + f * (arr[o + 1] + t * arr[o + 3]);
}

/**
 * Two-term asymptotic Voigt function K(x, y) ≈ (1/√π)[y/r² + (3x²y − y³)/(2r⁶)], r² = x² + y²,
 * the real part of (i/√π)(1/z + 1/(2z³)).
 * Source: Abramowitz & Stegun (1964) eq. 7.1.23 (asymptotic expansion of erfc).
 * @param x reduced offset (dimensionless)
 * @param y reduced Lorentz width (dimensionless, ≥ 0)
 * @returns K(x, y) for large |z|; relative error ~ (15/4)/x⁴ (first neglected term, y ≪ |x|)
 */
export function lineShapeVoigtAsymptoticK(x: number, y: number): number {
  const r2 = x * x + y * y;
  const inv = 1 / r2;
  return (inv * (y + 0.5 * (3 * x * x * y - y * y * y) * inv * inv)) / Math.sqrt(Math.PI);
}
