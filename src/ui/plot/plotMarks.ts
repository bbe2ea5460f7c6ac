/**
 * The plot's vertical marks at one wavenumber each: the selected rung's predicted line, the peak whose
 * candidate list is open and the selected row's observed position. They change on nearly every click,
 * so they are painted on a canvas of the overlay (PlotOverlay) under the rungs and peak markers rather
 * than kept as plotly shapes: a click that assigns, selects or opens a peak then never makes plotly
 * re-render the whole figure (its axes, grid rows and traces). Pure: positions in, canvas calls out.
 */
import type { LadderPaintContext } from './ladderScene';
import type { PlotTheme } from './plotColours';

/** What a mark shows. */
export type PlotMarkKind = 'cursor' | 'candidate' | 'selected';

/** One vertical mark. */
export interface PlotMark {
  kind: PlotMarkKind;
  /** Its position, cm^-1. */
  xCm1: number;
}

/**
 * The marks to draw, in painting order (later ones over earlier ones).
 * @param cursorCm1 the selected rung's predicted line, cm^-1, or null
 * @param candidatePeakCm1 the peak whose candidate list is open, cm^-1, or null
 * @param selectedObservedCm1 the selected row's observed position, cm^-1, or null
 */
export function plotMarks(cursorCm1: number | null, candidatePeakCm1: number | null, selectedObservedCm1: number | null): PlotMark[] {
  const out: PlotMark[] = [];
  if (cursorCm1 !== null && Number.isFinite(cursorCm1)) out.push({ kind: 'cursor', xCm1: cursorCm1 });
  if (candidatePeakCm1 !== null && Number.isFinite(candidatePeakCm1)) out.push({ kind: 'candidate', xCm1: candidatePeakCm1 });
  if (selectedObservedCm1 !== null && Number.isFinite(selectedObservedCm1)) out.push({ kind: 'selected', xCm1: selectedObservedCm1 });
  return out;
}

/** Where the marks go on the canvas, CSS px. */
export interface PlotMarksView {
  /** Visible x range, cm^-1 (either order). */
  x0Cm1: number;
  x1Cm1: number;
  /** The plot area's left edge and width (the x axis), px. */
  leftPx: number;
  widthPx: number;
  /** Top of the plot area (top of the ladder panel): cursor and candidate marks start here, px. */
  topPx: number;
  /** Top of the trace panel: the selected row's mark starts here, px. */
  traceTopPx: number;
  /** Bottom of the plot area (of the obs − sim panel when shown), px. */
  bottomPx: number;
}

/** The 2D-context calls the marks use (CanvasRenderingContext2D has them all). */
export type PlotMarksPaintContext = Pick<
  LadderPaintContext,
  'strokeStyle' | 'lineWidth' | 'beginPath' | 'moveTo' | 'lineTo' | 'stroke' | 'save' | 'restore'
> & {
  setLineDash(segments: number[]): void;
};

/** A mark as painted: its kind, position and canvas column (CSS px). */
export interface PlotMarkDrawn {
  kind: PlotMarkKind;
  xCm1: number;
  xPx: number;
}

/** Stroke of each kind: colour key of the theme, width (px) and dash pattern (px; plotly's 'dot' and 'dash' at these widths). */
const STYLE: Record<PlotMarkKind, { colour: 'cursor' | 'peak' | 'assigned'; widthPx: number; dashPx: number[] }> = {
  cursor: { colour: 'cursor', widthPx: 1.2, dashPx: [3, 3] },
  candidate: { colour: 'peak', widthPx: 1.5, dashPx: [] },
  selected: { colour: 'assigned', widthPx: 1.5, dashPx: [9, 9] },
};

/**
 * Paint the marks inside the visible range as vertical lines (cursor and candidate over the whole
 * plot height, the selected row's over the trace panel and below).
 * @returns the marks painted, with their canvas columns (for read-outs and tests)
 */
export function plotMarksPaint(
  ctx: PlotMarksPaintContext,
  marks: readonly PlotMark[],
  view: PlotMarksView,
  theme: PlotTheme,
): PlotMarkDrawn[] {
  const drawn: PlotMarkDrawn[] = [];
  const span = view.x1Cm1 - view.x0Cm1;
  if (!(view.widthPx > 0) || !(view.bottomPx > view.topPx) || span === 0 || !Number.isFinite(span)) return drawn;
  const lo = Math.min(view.x0Cm1, view.x1Cm1);
  const hi = Math.max(view.x0Cm1, view.x1Cm1);
  for (const m of marks) {
    if (!(m.xCm1 >= lo && m.xCm1 <= hi)) continue;
    const xPx = view.leftPx + ((m.xCm1 - view.x0Cm1) / span) * view.widthPx;
    const s = STYLE[m.kind];
    const top = m.kind === 'selected' ? Math.max(view.topPx, view.traceTopPx) : view.topPx;
    ctx.save();
    ctx.strokeStyle = theme[s.colour];
    ctx.lineWidth = s.widthPx;
    ctx.setLineDash(s.dashPx);
    ctx.beginPath();
    ctx.moveTo(xPx, top);
    ctx.lineTo(xPx, view.bottomPx);
    ctx.stroke();
    ctx.restore();
    drawn.push({ kind: m.kind, xCm1: m.xCm1, xPx });
  }
  return drawn;
}
