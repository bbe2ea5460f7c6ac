/**
 * Turning raw columns (file units, file order) into a `Trace`: non-finite and unusable points dropped,
 * wavelengths converted to vacuum wavenumbers, axis stored ascending, duplicate abscissae removed,
 * ordinate converted to absorbance.
 */
import type { Trace, TraceImportIssue, TraceOrdinate, TraceXUnit } from './trace';
import { traceIssueText } from './traceImportWarnings';
import { TraceSkipLog, type TraceSkipReason } from './traceSkipLog';

/** Input of `traceAssemble`. */
export interface TraceAssembleInput {
  /** Abscissa in file units (cm^-1, µm or nm as `xUnit` says), file order. */
  x: Float64Array;
  /** Ordinate in file units (`ordinate`), file order. */
  y: Float64Array;
  /** 1-based line of every point, or the line of point 0 when points sit on consecutive lines. */
  lines: Int32Array | { firstLine: number };
  xUnit: TraceXUnit;
  ordinate: TraceOrdinate;
  /** Log that already holds the parser's skips; this function adds its own. */
  skipped: TraceSkipLog;
  /** Reason recorded for a non-finite value (JCAMP '?' values arrive as NaN). */
  nonFiniteReason: TraceSkipReason;
}

/** Output of `traceAssemble`. */
export interface TraceAssembleOutput {
  trace: Trace;
  /** The file's own axis ran from high to low (in its own unit). */
  wasDescending: boolean;
  /** Notes on sorting and clamping (the words of `issues`). */
  messages: string[];
  /** Sorting and clamping, as data. */
  issues: TraceImportIssue[];
  /** Rows skipped as 'duplicate x' whose y differed from the row kept. */
  duplicateDifferentY: number;
}

/** Smallest transmittance fraction used when a value T ≤ 0 is clamped (A = 6). */
export const TRACE_MIN_TRANSMITTANCE = 1e-6;

/**
 * Build the stored trace from raw columns.
 * WARNING: when nothing needs changing (ascending cm^-1 absorbance, all points usable) the returned
 * trace reuses the input arrays; callers pass arrays they own.
 * Duplicate abscissae keep the point that comes first in the file.
 * T ≤ 0 is clamped to min(1e-6, smallest positive T in the file) so clamped points never absorb less
 * than a measured one.
 * @returns the trace, or a message when fewer than 2 usable points remain
 * Source: ν̃ = 1/λ (IUPAC Green Book, §2.7); A = −log10 T (IUPAC Gold Book "absorbance").
 */
export function traceAssemble(
  input: TraceAssembleInput,
): { ok: true; value: TraceAssembleOutput } | { ok: false; message: string; line?: number } {
  const { x, y, xUnit, ordinate, skipped } = input;
  const n = x.length;
  const lines = input.lines;
  const lineAt = lines instanceof Int32Array ? (i: number) => lines[i] : (i: number) => lines.firstLine + i;
  const isWavelength = xUnit !== 'cm-1';
  const xFactor = xUnit === 'um' ? 1e4 : 1e7;
  const isTrans = ordinate !== 'absorbance';
  const tScale = ordinate === 'percent-transmittance' ? 0.01 : 1;

  // Pass 1: validity, direction in file units, smallest positive T.
  const valid = new Uint8Array(n);
  let nValid = 0;
  let up = 0;
  let down = 0;
  let equal = 0;
  let firstReversal = -1;
  let prev = NaN;
  let minPositiveT = Infinity;
  for (let i = 0; i < n; i++) {
    const xi = x[i];
    const yi = y[i];
    if (!Number.isFinite(xi) || !Number.isFinite(yi)) {
      skipped.add(lineAt(i), input.nonFiniteReason);
      continue;
    }
    if (isWavelength && xi <= 0) {
      skipped.add(lineAt(i), 'non-positive wavelength');
      continue;
    }
    valid[i] = 1;
    nValid++;
    if (xi > prev) {
      up++;
      if (down > 0 && firstReversal < 0) firstReversal = i;
    } else if (xi < prev) {
      down++;
      if (up > 0 && firstReversal < 0) firstReversal = i;
    } else if (xi === prev) equal++;
    prev = xi;
    if (isTrans) {
      const t = yi * tScale;
      if (t > 0 && t < minPositiveT) minPositiveT = t;
    }
  }

  const issues: TraceImportIssue[] = [];
  const fileDescending = down > 0 && up === 0;
  if (nValid === n && n >= 2 && down === 0 && equal === 0 && !isWavelength && !isTrans) {
    // Common case (ascending cm^-1 absorbance, nothing to drop): the parser's fresh arrays are the trace.
    return {
      ok: true,
      value: { trace: { wavenumberCm1: x, absorbance: y }, wasDescending: false, messages: [], issues, duplicateDifferentY: 0 },
    };
  }
  // Visit points in ascending wavenumber: wavelengths reverse the order.
  let order: Uint32Array;
  if (up > 0 && down > 0) {
    const idx = new Uint32Array(nValid);
    for (let i = 0, k = 0; i < n; i++) if (valid[i]) idx[k++] = i;
    const key = (i: number) => (isWavelength ? xFactor / x[i] : x[i]);
    order = idx.sort((a, b) => key(a) - key(b) || a - b);
    issues.push({ kind: 'unsorted', firstLine: lineAt(firstReversal) });
  } else {
    order = new Uint32Array(nValid);
    const reverse = fileDescending !== isWavelength;
    for (let i = 0, k = 0; i < n; i++) if (valid[i]) order[reverse ? nValid - 1 - k++ : k++] = i;
  }
  // (The index array costs 4 bytes a point; only the monotone-but-not-trivial cases pay for it.)

  // Pass 2: convert, drop duplicates (keeping the earliest line), convert the ordinate.
  const floorT = Math.min(TRACE_MIN_TRANSMITTANCE, minPositiveT);
  const nu = new Float64Array(nValid);
  const absorb = new Float64Array(nValid);
  const keptIndex = new Uint32Array(nValid);
  let m = 0;
  let clamped = 0;
  let differentY = 0;
  const clampedLines: number[] = [];
  for (let k = 0; k < nValid; k++) {
    const i = order[k];
    const v = isWavelength ? xFactor / x[i] : x[i];
    let a: number;
    if (isTrans) {
      let t = y[i] * tScale;
      if (t <= 0) {
        clamped++;
        if (clampedLines.length < 100_000) clampedLines.push(lineAt(i));
        t = floorT;
      }
      a = 0 - Math.log10(t); // +0 (not −0) for T = 1
    } else a = y[i];
    if (m > 0 && v === nu[m - 1]) {
      const j = keptIndex[m - 1];
      if (a !== absorb[m - 1]) differentY++;
      if (i < j) {
        skipped.add(lineAt(j), 'duplicate x');
        absorb[m - 1] = a;
        keptIndex[m - 1] = i;
      } else skipped.add(lineAt(i), 'duplicate x');
      continue;
    }
    nu[m] = v;
    absorb[m] = a;
    keptIndex[m] = i;
    m++;
  }
  if (m < 2) {
    if (m === 1) {
      const line = lineAt(keptIndex[0]);
      return { ok: false, message: `only 1 usable data point (line ${line}); at least 2 are needed`, line };
    }
    return { ok: false, message: 'no numeric data rows found' };
  }
  if (clamped > 0) {
    clampedLines.sort((p, q) => p - q);
    issues.push({ kind: 'clamped', count: clamped, lines: clampedLines.slice(0, 20), transmittance: floorT });
  }
  const trace: Trace = {
    wavenumberCm1: m === nValid ? nu : nu.slice(0, m),
    absorbance: m === nValid ? absorb : absorb.slice(0, m),
  };
  return {
    ok: true,
    value: { trace, wasDescending: fileDescending, messages: issues.map(traceIssueText), issues, duplicateDifferentY: differentY },
  };
}
