/**
 * Peak markers painted on the plot's canvas overlay (not as plotly markers: every SVG marker cost
 * every redraw). Built once per peak list, trace, ordinate and assignment state; each paint picks
 * the strongest peaks in view. Pure, like ladderScene.
 */
import type { PeakList } from '../../analysis/peaksFind';
import type { Trace } from '../../io/trace';
import { listAlign } from '../../state/memo';
import type { AssignmentRow } from '../../state/selectors';
import { sortedLowerBound } from '../../state/sortedSearch';
import { assignedDotsFinish, viewMaps, type LadderPaintContext, type LadderView } from './ladderScene';
import type { PlotTheme } from './plotColours';

/** Largest number of peak markers drawn at once (the strongest by SNR in view are kept). */
export const PEAK_MARKERS_MAX = 250;

/** Radius of a peak marker, CSS px (an assigned one is drawn 0.75 px larger). */
const MARKER_RADIUS_PX = 3.5;

/** Peak markers ready to paint: position, height on the plotted ordinate, state. */
export interface PeakLayer {
  peaks: PeakList;
  /** Peak positions, cm^-1 (ascending, as in the peak list). */
  nuCm1: Float64Array;
  /** Marker height: the trace's value at the peak on the plotted ordinate. */
  y: Float64Array;
  /** 1 = carries an assignment (filled marker). */
  isAssigned: Uint8Array;
  /** Label markup of a peak's assignment, or undefined (for its tooltip). */
  assignedLabel: (positionCm1: number) => string | undefined;
}

/** Axis mapping of the trace panel, CSS px relative to the canvas (same form as the ladder panel's). */
export type PanelView = LadderView;

function traceValueAt(trace: Trace, positionCm1: number): number {
  const x = trace.wavenumberCm1;
  const k = Math.min(Math.max(sortedLowerBound(x, positionCm1), 0), x.length - 1);
  const j = k > 0 && Math.abs(x[k - 1] - positionCm1) < Math.abs(x[k] - positionCm1) ? k - 1 : k;
  return trace.absorbance[j];
}

/** The parts of a peak layer that do not depend on the assignments. */
export type PeakLayerBase = Pick<PeakLayer, 'peaks' | 'nuCm1' | 'y'> & {
  /**
   * Every peak index, strongest SNR first (ties by position), so a view with more peaks than
   * PEAK_MARKERS_MAX takes its strongest without sorting on every paint (absent: sorted per view).
   */
  snrOrder?: Int32Array;
};

/** Strongest first; an infinite SNR (noise-free trace) sorts first, NaN last; ties by index. */
function bySnrDescending(snr: Float64Array): (a: number, b: number) => number {
  return (a, b) => (snr[b] || 0) - (snr[a] || 0) || a - b;
}

/**
 * Positions and heights of the markers (once per peak list, trace and ordinate).
 * @param peaks peak list (positions ascending)
 * @param trace the trace the peaks were found in
 * @param ordinate plotted ordinate (transmittance = 10^−A)
 */
export function peakLayerBase(peaks: PeakList, trace: Trace, ordinate: 'absorbance' | 'transmittance'): PeakLayerBase {
  const n = peaks.count;
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const a = traceValueAt(trace, peaks.wavenumberCm1[i]);
    y[i] = ordinate === 'transmittance' ? 10 ** -a : a;
  }
  const snrOrder = Int32Array.from({ length: n }, (_, i) => i).sort(bySnrDescending(peaks.snr));
  return { peaks, nuCm1: peaks.wavenumberCm1.subarray(0, n), y, snrOrder };
}

/**
 * Add the assignment state (once per change of the assignments): each assigned peak is found by
 * its position, so the cost grows with the number of assignments, not of peaks.
 * @param base from peakLayerBase
 * @param assigned peak id → label markup of the (first) assignment on that peak
 * @param peakId the store's peak id of a position (ids encode the position)
 * @param idPositionCm1 the position an id encodes, cm^-1
 */
export function peakLayerBuild(
  base: PeakLayerBase,
  assigned: ReadonlyMap<string, string>,
  peakId: (positionCm1: number) => string,
  idPositionCm1: (id: string) => number,
): PeakLayer {
  const nu = base.nuCm1;
  const isAssigned = new Uint8Array(nu.length);
  for (const id of assigned.keys()) {
    const at = idPositionCm1(id);
    if (!Number.isFinite(at)) continue;
    const k = sortedLowerBound(nu, at);
    for (const j of [k - 1, k, k + 1]) if (j >= 0 && j < nu.length && peakId(nu[j]) === id) isAssigned[j] = 1;
  }
  return { ...base, isAssigned, assignedLabel: (positionCm1) => assigned.get(peakId(positionCm1)) };
}

/** A peak layer and what the next peakLayerUpdate may reuse. */
export interface PeakLayerState {
  layer: PeakLayer;
  base: PeakLayerBase;
  /** The assignment rows it marks. */
  rows: readonly AssignmentRow[];
}

/** Peak id → label markup of the first row on that peak (what peakLayerBuild takes). */
export function peakLayerAssignedOf(rows: readonly AssignmentRow[]): Map<string, string> {
  const m = new Map<string, string>();
  for (const r of rows) if (r.a.peakId && !m.has(r.a.peakId)) m.set(r.a.peakId, r.labelHtml);
  return m;
}

/** Mark the peak of `id` in isAssigned (see peakLayerBuild). */
function peakMark(
  isAssigned: Uint8Array,
  nu: Float64Array,
  id: string,
  peakId: (positionCm1: number) => string,
  idPositionCm1: (id: string) => number,
): void {
  const at = idPositionCm1(id);
  if (!Number.isFinite(at)) return;
  const k = sortedLowerBound(nu, at);
  for (const j of [k - 1, k, k + 1]) if (j >= 0 && j < nu.length && peakId(nu[j]) === id) isAssigned[j] = 1;
}

/**
 * The layer of peakLayerBuild(base, peakLayerAssignedOf(rows)) made from the previous one where it
 * can: with the same base, rows appended or replaced by rows on the same peak (memo/listAlign) only
 * mark their own peaks; a row that left its peak (deleted, moved, undone) rebuilds the layer. The
 * tooltip's labels are looked up in a map built on the first hover, not on every change. Equal to
 * peakLayerBuild (checked in test/ui/peakLayer.test.ts).
 * @param prev the state of the previous call, or null
 */
export function peakLayerUpdate(
  prev: PeakLayerState | null,
  base: PeakLayerBase,
  rows: readonly AssignmentRow[],
  peakId: (positionCm1: number) => string,
  idPositionCm1: (id: string) => number,
): PeakLayerState {
  if (prev && prev.base === base && prev.rows === rows) return prev;
  const nu = base.nuCm1;
  let isAssigned: Uint8Array | null = null;
  if (prev && prev.base === base) {
    const old = prev.rows;
    const n0 = old.length;
    const n = rows.length;
    const { prefix, suffix } = listAlign(old, rows);
    const added: string[] = [];
    let isLeft = false;
    for (let i = prefix; i < Math.max(n0, n) - suffix && !isLeft; i++) {
      const was = i < n0 - suffix ? old[i].a.peakId : undefined;
      const now = i < n - suffix ? rows[i].a.peakId : undefined;
      if (was === now) continue;
      if (was) isLeft = true;
      else if (now) added.push(now);
    }
    if (!isLeft) {
      isAssigned = prev.layer.isAssigned;
      if (added.length > 0) {
        isAssigned = isAssigned.slice();
        for (const id of added) peakMark(isAssigned, nu, id, peakId, idPositionCm1);
      }
    }
  }
  if (!isAssigned) {
    isAssigned = new Uint8Array(nu.length);
    const seen = new Set<string>();
    for (const r of rows) {
      const id = r.a.peakId;
      if (!id || seen.has(id)) continue;
      seen.add(id);
      peakMark(isAssigned, nu, id, peakId, idPositionCm1);
    }
  }
  let labels: Map<string, string> | null = null;
  const layer: PeakLayer = {
    ...base,
    isAssigned,
    assignedLabel: (positionCm1) => (labels ??= peakLayerAssignedOf(rows)).get(peakId(positionCm1)),
  };
  return { layer, base, rows };
}

/** Tooltip markup of a peak: position, height, SNR, width, blend flag and its assignment. */
export function peakLayerTipHtml(layer: PeakLayer, i: number): string {
  const p = layer.peaks;
  const nu = p.wavenumberCm1[i];
  const label = layer.isAssigned[i] ? layer.assignedLabel(nu) : undefined;
  return (
    `peak ${nu.toFixed(4)} cm⁻¹<br>height ${p.height[i].toPrecision(3)} (SNR ${Number.isFinite(p.snr[i]) ? p.snr[i].toFixed(0) : '∞'})` +
    `<br>FWHM ${p.fwhmCm1[i].toPrecision(2)} cm⁻¹${p.isBlend[i] ? '<br>blend' : ''}${label ? `<br>assigned ${label}` : ''}`
  );
}

/**
 * Indices of the peaks drawn in a view: all in the visible range, or the PEAK_MARKERS_MAX strongest
 * by SNR when there are more (ascending position).
 */
export function peakLayerVisible(layer: PeakLayerBase, x0Cm1: number, x1Cm1: number): Int32Array {
  const lo = sortedLowerBound(layer.nuCm1, Math.min(x0Cm1, x1Cm1));
  const hi = sortedLowerBound(layer.nuCm1, Math.max(x0Cm1, x1Cm1));
  const n = Math.max(hi - lo, 0);
  if (n <= PEAK_MARKERS_MAX) return Int32Array.from({ length: n }, (_, k) => lo + k);
  const order = layer.snrOrder;
  if (order) {
    // The first PEAK_MARKERS_MAX of the whole list's order that lie in view: the same peaks as
    // sorting the view's own, since a sub-list keeps the order.
    const kept = new Int32Array(PEAK_MARKERS_MAX);
    let m = 0;
    for (let k = 0; k < order.length && m < PEAK_MARKERS_MAX; k++) if (order[k] >= lo && order[k] < hi) kept[m++] = order[k];
    return kept.sort();
  }
  const bySnr = Array.from({ length: n }, (_, k) => lo + k).sort(bySnrDescending(layer.peaks.snr));
  return Int32Array.from(bySnr.slice(0, PEAK_MARKERS_MAX)).sort();
}

/**
 * Paint the peak markers of a view: free peaks as open circles (blends as open diamonds), assigned
 * peaks as filled circles with a paper-coloured ring.
 * @param drawn indices from peakLayerVisible
 * @returns the number of markers painted
 */
export function peakLayerPaint(ctx: LadderPaintContext, layer: PeakLayer, drawn: Int32Array, view: PanelView, theme: PlotTheme): number {
  if (!(view.widthPx > 0 && view.heightPx > 0) || view.x1Cm1 === view.x0Cm1 || view.y1 === view.y0) return 0;
  ctx.save();
  ctx.beginPath();
  ctx.rect(view.leftPx, view.topPx, view.widthPx, view.heightPx);
  ctx.clip();
  markersDraw(ctx, layer, drawn, view, theme);
  ctx.restore();
  return drawn.length;
}

/** Free markers (one stroked path), then assigned ones (one filled and ringed path), of the listed peaks. */
function markersDraw(ctx: LadderPaintContext, layer: PeakLayer, list: ArrayLike<number>, view: PanelView, theme: PlotTheme): void {
  const { px, py } = viewMaps(view);
  const r = MARKER_RADIUS_PX;
  // Free peaks: one path of open shapes.
  ctx.beginPath();
  for (let k = 0; k < list.length; k++) {
    const i = list[k];
    if (layer.isAssigned[i]) continue;
    const x = px(layer.nuCm1[i]);
    const y = py(layer.y[i]);
    if (layer.peaks.isBlend[i]) {
      ctx.moveTo(x, y - r - 0.8);
      ctx.lineTo(x + r + 0.8, y);
      ctx.lineTo(x, y + r + 0.8);
      ctx.lineTo(x - r - 0.8, y);
      ctx.closePath();
    } else {
      ctx.moveTo(x + r, y);
      ctx.arc(x, y, r, 0, 2 * Math.PI);
    }
  }
  ctx.strokeStyle = theme.peak;
  ctx.lineWidth = 1.3;
  ctx.stroke();
  // Assigned peaks: filled.
  ctx.beginPath();
  for (let k = 0; k < list.length; k++) {
    const i = list[k];
    if (!layer.isAssigned[i]) continue;
    const x = px(layer.nuCm1[i]);
    const y = py(layer.y[i]);
    ctx.moveTo(x + r + 0.75, y);
    ctx.arc(x, y, r + 0.75, 0, 2 * Math.PI);
  }
  assignedDotsFinish(ctx, theme);
}

/**
 * Half the side of the box a marker may touch, CSS px: the largest shape (a blend's diamond, r + 0.8)
 * plus its outline's reach at a corner (the miter of a right angle, 0.65·√2 < 1.3 px) plus a pixel
 * of anti-aliasing, rounded up.
 */
const MARKER_BOX_HALF_PX = Math.ceil(MARKER_RADIUS_PX + 0.8 + 1.3 + 1);

/**
 * The drawn peaks whose marker differs between two layers of the same peaks (one was assigned or
 * freed), for a partial repaint; null when the layers do not place the same peaks at the same
 * heights (another peak list, trace or ordinate), which needs a whole one.
 * @param drawn indices from peakLayerVisible (the same for both layers)
 */
export function peakLayerChanged(prev: PeakLayer, next: PeakLayer, drawn: Int32Array): Int32Array | null {
  if (prev.peaks !== next.peaks || prev.nuCm1 !== next.nuCm1 || prev.y !== next.y) return null;
  if (prev.isAssigned === next.isAssigned) return new Int32Array(0);
  const out: number[] = [];
  for (const i of drawn) if (prev.isAssigned[i] !== next.isAssigned[i]) out.push(i);
  return Int32Array.from(out);
}

/**
 * Repaint the markers around some peaks only, on a canvas that shows `drawn` as peakLayerPaint painted
 * them: the box around each changed peak is cleared and every drawn marker that reaches a box is
 * painted again, clipped to the boxes and in peakLayerPaint's order, so the boxes come out as a whole
 * repaint would paint them and nothing outside them is touched.
 * @param changed indices of the peaks whose marker changed (peakLayerChanged)
 * @param devicePixelRatio device pixels per CSS px of the canvas @default 1
 * @returns the number of markers painted again
 */
export function peakLayerRepaint(
  ctx: LadderPaintContext,
  layer: PeakLayer,
  drawn: Int32Array,
  changed: Int32Array,
  view: PanelView,
  theme: PlotTheme,
  devicePixelRatio = 1,
): number {
  if (changed.length === 0) return 0;
  if (!(view.widthPx > 0 && view.heightPx > 0) || view.x1Cm1 === view.x0Cm1 || view.y1 === view.y0) return 0;
  const { px, py } = viewMaps(view);
  const h = MARKER_BOX_HALF_PX;
  // Boxes on whole device pixels, so their edges clear and repaint whole pixels (no blend of old and new).
  const snapDown = (v: number) => Math.floor(v * devicePixelRatio) / devicePixelRatio;
  const snapUp = (v: number) => Math.ceil(v * devicePixelRatio) / devicePixelRatio;
  const boxes = Array.from(changed, (i) => {
    const x = px(layer.nuCm1[i]);
    const y = py(layer.y[i]);
    return { x0: snapDown(x - h), y0: snapDown(y - h), x1: snapUp(x + h), y1: snapUp(y + h) };
  });
  // A marker reaches a box when its centre lies within h of it.
  const near = Array.from(drawn).filter((i) => {
    const x = px(layer.nuCm1[i]);
    const y = py(layer.y[i]);
    return boxes.some((b) => x > b.x0 - h && x < b.x1 + h && y > b.y0 - h && y < b.y1 + h);
  });
  ctx.save();
  ctx.beginPath();
  ctx.rect(view.leftPx, view.topPx, view.widthPx, view.heightPx);
  ctx.clip();
  ctx.beginPath();
  for (const b of boxes) ctx.rect(b.x0, b.y0, b.x1 - b.x0, b.y1 - b.y0);
  ctx.clip();
  for (const b of boxes) ctx.clearRect(b.x0, b.y0, b.x1 - b.x0, b.y1 - b.y0);
  markersDraw(ctx, layer, near, view, theme);
  ctx.restore();
  return near.length;
}

/**
 * The drawn peak nearest a pointer within `tolerancePx` (CSS px), or −1.
 * @param drawn indices from peakLayerVisible (the ones on screen)
 */
export function peakLayerHitTest(layer: PeakLayer, drawn: Int32Array, view: PanelView, xPx: number, yPx: number, tolerancePx = 6): number {
  if (
    xPx < view.leftPx - tolerancePx ||
    xPx > view.leftPx + view.widthPx + tolerancePx ||
    yPx < view.topPx - tolerancePx ||
    yPx > view.topPx + view.heightPx + tolerancePx
  )
    return -1;
  const { px, py } = viewMaps(view);
  let best = -1;
  let bestD = tolerancePx * tolerancePx;
  for (const i of drawn) {
    const dx = px(layer.nuCm1[i]) - xPx;
    if (dx * dx > bestD) continue;
    const dy = py(layer.y[i]) - yPx;
    const d = dx * dx + dy * dy;
    if (d <= bestD) {
      bestD = d;
      best = i;
    }
  }
  return best;
}

/** Canvas CSS px of a drawn peak (for the overlay's tooltip and read-outs). */
export function peakLayerPixel(layer: PeakLayer, i: number, view: PanelView): { xPx: number; yPx: number } {
  const { px, py } = viewMaps(view);
  return { xPx: px(layer.nuCm1[i]), yPx: py(layer.y[i]) };
}
