/**
 * The main plot's canvas overlay: paints the ladder panel (rungs, row names, assigned markers, the
 * selected rung) and the peak markers over plotly's axes whenever plotly has drawn or is panning;
 * shows a tooltip for what is under the pointer; turns clicks into rung, peak and trace clicks,
 * and a double-click into one zoom-out gesture. No decisions of its own.
 */
import type { LineLevelLabel } from '../state/systemLevelLabels';
import { useEffect, useImperativeHandle, useRef, type Ref } from 'react';
import { lineLabelAscii } from '../physics/lineLabel';
import { plotClickBegin, plotClickTakeBack } from '../state/actionsAssign';
import type { LineList, TopShape } from '../physics/model';
import {
  ladderHitTest,
  ladderLabelsPaint,
  ladderMarkersPaint,
  ladderScenePaint,
  ladderStrongestInView,
  ladderTipHtml,
  type LadderMarkers,
  type LadderScene,
  type LadderView,
} from './plot/ladderScene';
import {
  peakLayerChanged,
  peakLayerHitTest,
  peakLayerPaint,
  peakLayerPixel,
  peakLayerRepaint,
  peakLayerTipHtml,
  peakLayerVisible,
  type PeakLayer,
} from './plot/peakLayer';
import { plotTheme } from './plot/plotColours';
import { plotMarksPaint, type PlotMark } from './plot/plotMarks';
import { rungSymmetryLabelsPaint } from './plot/rungSymmetryLabels';

/** What the chart hands over after each draw: the plot element, and the x range while panning. */
export interface PlotOverlayHandle {
  paint(plotEl: HTMLElement, xRangeOverrideCm1?: [number, number]): void;
}

interface AxisLayout {
  range: number[];
  _offset: number;
  _length: number;
}

/** plotly's laid-out plot area inside the chart element, px. */
interface PlotSize {
  l: number;
  t: number;
  w: number;
  h: number;
}

export interface PlotOverlayProps {
  ref?: Ref<PlotOverlayHandle>;
  scene: LadderScene;
  markers: LadderMarkers | null;
  /** Line index of the selected rung, or −1. */
  cursorLine: number;
  lines: LineList;
  shape: TopShape;
  /** Vertical marks (selected rung's line, the peak whose candidates are open, the selected row), painted under everything else. */
  marks: readonly PlotMark[];
  peaks: PeakLayer | null;
  isDark: boolean;
  onRungClick: (lineIndex: number) => void;
  /** A line's level labels (tags, symmetry species) for the tooltip; absent in a single-band session. */
  levelsOf?: (lineIndex: number) => LineLevelLabel | null;
  /** Per line, the compact symmetry text drawn beside its rung where there is room (rungSymmetryTexts); null for none. */
  rungLabels?: readonly string[] | null;
  onPeakClick: (peakIndex: number) => void;
  /** A click in the trace panel away from any marker: position (cm^-1) and visible width (cm^-1). */
  onTraceClick: (positionCm1: number, visibleWidthCm1: number) => void;
  /** A double-click anywhere on the plot (its first click's effect has been taken back). */
  onDoubleClick: () => void;
}

/** What the lower canvas shows: its view key, scene and peak layer, and the rungs drawn. */
interface BaseDrawn {
  key: string;
  scene: LadderScene | null;
  peaks: PeakLayer | null;
  rungsDrawn: number;
  peaksDrawn: number;
}

const BASE_BLANK: BaseDrawn = { key: '', scene: null, peaks: null, rungsDrawn: 0, peaksDrawn: 0 };

/** More peaks changed than this (an undo of many rows): the lower canvas is painted whole. */
const PEAKS_REPAINTED_MAX = 24;

/** Views of the two panels in canvas CSS px, from plotly's laid-out axes. */
interface Views {
  ladder: LadderView | null;
  trace: LadderView | null;
}

/** Two clicks this close in time (ms) and place (CSS px) are a double-click. */
const DOUBLE_CLICK_MS = 400;
const DOUBLE_CLICK_PX = 6;

/** Peak read-out for tests: up to this many free markers' positions. */
const FREE_PEAKS_LISTED = 40;
/** Rung-label read-out for tests: up to this many texts. */
const RUNG_LABELS_LISTED = 40;

export function PlotOverlay(props: PlotOverlayProps) {
  const canvasRef = useRef<HTMLCanvasElement>(null);
  // The rungs and row names are painted on a canvas of their own under the markers' one, and only when
  // the scene, the view, the size or the theme changed: a click that assigns, selects or marks a peak
  // repaints the small top canvas alone, so the browser does not rasterise every rung again.
  const baseRef = useRef<HTMLCanvasElement>(null);
  // The vertical marks have the lowest canvas of their own (plotly drew them under the rungs and peak
  // markers as shapes); it is cleared and painted with the top one.
  const marksRef = useRef<HTMLCanvasElement>(null);
  const baseDrawnRef = useRef<BaseDrawn>(BASE_BLANK);
  const tipRef = useRef<HTMLDivElement>(null);
  const latest = useRef(props);
  latest.current = props;
  const viewsRef = useRef<Views>({ ladder: null, trace: null });
  const drawnPeaksRef = useRef<Int32Array>(new Int32Array(0));
  const plotRef = useRef<{ el: HTMLElement; override?: [number, number] } | null>(null);
  const labelsRef = useRef<{ scene: LadderScene; key: string; image: HTMLCanvasElement } | null>(null);

  const paint = () => {
    const canvas = canvasRef.current;
    const base = baseRef.current;
    const marksCanvas = marksRef.current;
    const plot = plotRef.current;
    if (!canvas || !base || !marksCanvas || !plot) return;
    const fl = (plot.el as unknown as { _fullLayout?: { xaxis?: AxisLayout; yaxis?: AxisLayout; yaxis2?: AxisLayout; _size?: PlotSize } })
      ._fullLayout;
    const cssW = canvas.clientWidth;
    const cssH = canvas.clientHeight;
    const dpr = window.devicePixelRatio || 1;
    for (const c of [canvas, base, marksCanvas]) {
      if (c.width !== Math.round(cssW * dpr) || c.height !== Math.round(cssH * dpr)) {
        c.width = Math.round(cssW * dpr);
        c.height = Math.round(cssH * dpr);
        // A resized canvas is blank: what it showed is forgotten.
        if (c === base) baseDrawnRef.current = BASE_BLANK;
      }
    }
    const ctx = canvas.getContext('2d');
    const bctx = base.getContext('2d');
    const mctx = marksCanvas.getContext('2d');
    if (!ctx || !bctx || !mctx) return;
    ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
    ctx.clearRect(0, 0, cssW, cssH);
    mctx.setTransform(dpr, 0, 0, dpr, 0, 0);
    mctx.clearRect(0, 0, cssW, cssH);
    bctx.setTransform(dpr, 0, 0, dpr, 0, 0);
    const xa = fl?.xaxis;
    if (!xa || !Array.isArray(xa.range)) {
      viewsRef.current = { ladder: null, trace: null };
      canvas.dataset.marks = '';
      if (baseDrawnRef.current !== BASE_BLANK) bctx.clearRect(0, 0, cssW, cssH);
      baseDrawnRef.current = BASE_BLANK;
      return;
    }
    const cr = canvas.getBoundingClientRect();
    const pr = plot.el.getBoundingClientRect();
    const [x0, x1] = plot.override ?? [Number(xa.range[0]), Number(xa.range[1])];
    const viewOf = (ya: AxisLayout | undefined): LadderView | null =>
      ya && Array.isArray(ya.range)
        ? {
            x0Cm1: x0,
            x1Cm1: x1,
            y0: Number(ya.range[0]),
            y1: Number(ya.range[1]),
            leftPx: pr.left - cr.left + xa._offset,
            topPx: pr.top - cr.top + ya._offset,
            widthPx: xa._length,
            heightPx: ya._length,
          }
        : null;
    const views: Views = { ladder: viewOf(fl?.yaxis2), trace: viewOf(fl?.yaxis) };
    viewsRef.current = views;
    const p = latest.current;
    const theme = plotTheme(p.isDark);
    // The vertical marks, from the top of the plot area (or of the trace panel) to its bottom.
    const size = fl?._size;
    const marksDrawn = size
      ? plotMarksPaint(
          mctx,
          p.marks,
          {
            x0Cm1: x0,
            x1Cm1: x1,
            leftPx: pr.left - cr.left + xa._offset,
            widthPx: xa._length,
            topPx: pr.top - cr.top + size.t,
            traceTopPx: views.trace ? views.trace.topPx : pr.top - cr.top + size.t,
            bottomPx: pr.top - cr.top + size.t + size.h,
          },
          theme,
        )
      : [];
    // Read-outs for tests and checks: the range painted (cm^-1), what is drawn, the selected rung, and
    // where the strongest rung and some free peaks sit (canvas CSS px).
    const data = canvas.dataset;
    data.xRange = `${x0},${x1}`;
    // kind@position (cm^-1)@column (canvas CSS px) of each vertical mark painted.
    data.marks = marksDrawn.map((m) => `${m.kind}@${m.xCm1}@${m.xPx.toFixed(1)}`).join(';');
    const lv = views.ladder;
    const tv = views.trace;
    const drawnPeaks = tv && p.peaks ? peakLayerVisible(p.peaks, tv.x0Cm1, tv.x1Cm1) : new Int32Array(0);
    drawnPeaksRef.current = drawnPeaks;
    // The lower canvas (row names, rungs, peak markers) is painted again only when what it shows
    // changed; when only some peaks became assigned or free, only the boxes around them are.
    const viewKey = (v: LadderView | null) => (v ? `${v.leftPx},${v.topPx},${v.widthPx},${v.heightPx},${v.y0},${v.y1}` : '-');
    const baseKey = `${canvas.width}x${canvas.height}|${dpr}|${p.isDark}|${x0},${x1}|${viewKey(lv)}|${viewKey(tv)}`;
    const was = baseDrawnRef.current;
    const isSameFrame = was.key === baseKey && was.scene === p.scene && (was.peaks === null) === (p.peaks === null);
    const changed = !isSameFrame ? null : was.peaks && p.peaks ? peakLayerChanged(was.peaks, p.peaks, drawnPeaks) : new Int32Array(0);
    if (changed === null || changed.length > PEAKS_REPAINTED_MAX) {
      bctx.clearRect(0, 0, cssW, cssH);
      let rungsDrawn = 0;
      if (lv) {
        // Row names and base lines come from an image kept while the scene and the panel's placement stay:
        // a zoom or pan then copies one bitmap instead of painting a hundred names (fillText is the
        // costly canvas call; five bands have many rows).
        const key = `${canvas.width}x${canvas.height}|${dpr}|${lv.leftPx}|${lv.topPx}|${lv.widthPx}|${lv.heightPx}|${lv.y0}|${lv.y1}|${p.isDark}`;
        const cached = labelsRef.current;
        let image = cached && cached.scene === p.scene && cached.key === key ? cached.image : null;
        if (!image) {
          image = cached?.image ?? document.createElement('canvas');
          image.width = canvas.width;
          image.height = canvas.height;
          const lctx = image.getContext('2d');
          if (lctx) {
            lctx.setTransform(dpr, 0, 0, dpr, 0, 0);
            lctx.clearRect(0, 0, cssW, cssH);
            ladderLabelsPaint(lctx, p.scene, lv, theme);
          }
          labelsRef.current = { scene: p.scene, key, image };
        }
        bctx.drawImage(image, 0, 0, cssW, cssH);
        rungsDrawn = ladderScenePaint(bctx, p.scene, null, -1, lv, theme, false);
      }
      const peaksDrawn = tv && p.peaks ? peakLayerPaint(bctx, p.peaks, drawnPeaks, tv, theme) : 0;
      baseDrawnRef.current = { key: baseKey, scene: p.scene, peaks: p.peaks, rungsDrawn, peaksDrawn };
      data.peaksRepainted = 'all';
    } else {
      // Read-out: how many markers the last partial repaint painted again ('all' after a whole one).
      if (changed.length > 0 && tv && p.peaks)
        data.peaksRepainted = String(peakLayerRepaint(bctx, p.peaks, drawnPeaks, changed, tv, theme, dpr));
      baseDrawnRef.current = { ...was, peaks: p.peaks };
    }
    if (lv) {
      data.rungsDrawn = String(baseDrawnRef.current.rungsDrawn);
      // The upper canvas: what a click changes (assigned markers, the selected rung's ring, its labels).
      ladderMarkersPaint(ctx, p.scene, p.markers, p.cursorLine, lv, theme);
      const labels = rungSymmetryLabelsPaint(ctx, p.scene, p.rungLabels ?? null, p.cursorLine, lv, theme);
      data.rungLabelsDrawn = String(labels.count);
      data.rungLabels = labels.texts.slice(0, RUNG_LABELS_LISTED).join('|');
      const strongest = ladderStrongestInView(p.scene, p.lines, lv);
      data.strongestRung = strongest ? `${strongest.xPx.toFixed(1)},${strongest.yPx.toFixed(1)}` : '';
    }
    data.selectedRung = p.cursorLine >= 0 && p.cursorLine < p.lines.count ? ascii(p.lines, p.cursorLine, p.shape) : '';
    if (tv && p.peaks) {
      data.peaksDrawn = String(baseDrawnRef.current.peaksDrawn);
      // Free markers inside the panel, spread evenly over the drawn ones.
      const inside: number[] = [];
      for (const i of drawnPeaks) {
        if (p.peaks.isAssigned[i]) continue;
        const q = peakLayerPixel(p.peaks, i, tv);
        if (q.yPx >= tv.topPx && q.yPx <= tv.topPx + tv.heightPx) inside.push(i);
      }
      const stride = Math.max(1, Math.ceil(inside.length / FREE_PEAKS_LISTED));
      const free: string[] = [];
      for (let k = 0; k < inside.length; k += stride) {
        const q = peakLayerPixel(p.peaks, inside[k], tv);
        free.push(`${q.xPx.toFixed(1)},${q.yPx.toFixed(1)}`);
      }
      data.freePeaks = free.join(';');
    } else {
      data.peaksDrawn = '0';
      data.freePeaks = '';
    }
  };

  // Paint once per animation frame however often it is asked (plotly's afterplot fires twice in a
  // zoom, relayouting on every pointer move of a pan), and apart from the task that drew plotly.
  const frameRef = useRef(0);
  const paintSoon = () => {
    if (frameRef.current) return;
    frameRef.current = requestAnimationFrame(() => {
      frameRef.current = 0;
      paint();
    });
  };
  useEffect(() => () => cancelAnimationFrame(frameRef.current), []);

  useImperativeHandle(
    props.ref,
    () => ({
      paint(el, override) {
        plotRef.current = { el, override };
        paintSoon();
      },
    }),
    // paintSoon only schedules paint(), which reads the latest props and scene through refs, so the
    // handle made at mount stays right; re-creating it per render would cost the parent a re-bind.
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [],
  );

  // Repaint when what is drawn changes (the plot itself may not redraw).
  useEffect(() => {
    paintSoon();
    // The listed props are what the canvas shows; paintSoon is a fresh closure each render on purpose.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [props.scene, props.markers, props.cursorLine, props.marks, props.peaks, props.isDark, props.rungLabels]);

  useEffect(() => {
    const canvas = canvasRef.current;
    const host = canvas?.parentElement;
    if (!canvas || !host) return;
    type Hit = { html: string; xPx: number; yPx: number; act: () => void } | null;
    const hitAt = (e: MouseEvent): Hit => {
      const views = viewsRef.current;
      const r = canvas.getBoundingClientRect();
      const x = e.clientX - r.left;
      const y = e.clientY - r.top;
      const p = latest.current;
      if (views.ladder) {
        const hit = ladderHitTest(p.scene, p.markers, views.ladder, x, y);
        if (hit)
          return {
            html: ladderTipHtml(hit, p.markers, p.lines, p.shape, hit.lineIndex === p.cursorLine, p.levelsOf),
            xPx: hit.xPx,
            yPx: hit.yPx,
            act: () => p.onRungClick(hit.lineIndex),
          };
      }
      const tv = views.trace;
      if (tv && p.peaks) {
        const i = peakLayerHitTest(p.peaks, drawnPeaksRef.current, tv, x, y);
        if (i >= 0) {
          const q = peakLayerPixel(p.peaks, i, tv);
          return { html: peakLayerTipHtml(p.peaks, i), xPx: q.xPx, yPx: q.yPx, act: () => p.onPeakClick(i) };
        }
      }
      if (tv && x >= tv.leftPx && x <= tv.leftPx + tv.widthPx && y >= tv.topPx && y <= tv.topPx + tv.heightPx) {
        const nu = tv.x0Cm1 + ((x - tv.leftPx) / tv.widthPx) * (tv.x1Cm1 - tv.x0Cm1);
        return { html: '', xPx: x, yPx: y, act: () => p.onTraceClick(nu, Math.abs(tv.x1Cm1 - tv.x0Cm1)) };
      }
      return null;
    };
    const hide = () => {
      if (tipRef.current) tipRef.current.hidden = true;
    };
    const onMove = (e: MouseEvent) => {
      const tip = tipRef.current;
      if (!tip) return;
      if (e.buttons !== 0 || !(e.target instanceof Element) || !e.target.closest('.plot-surface')) return hide();
      const hit = hitAt(e);
      if (!hit || !hit.html) return hide();
      tip.innerHTML = hit.html;
      tip.hidden = false;
      const w = canvas.clientWidth;
      const left = hit.xPx + 14 + tip.offsetWidth > w ? hit.xPx - 14 - tip.offsetWidth : hit.xPx + 14;
      tip.style.left = `${Math.max(0, left)}px`;
      tip.style.top = `${Math.max(0, hit.yPx - tip.offsetHeight / 2)}px`;
    };
    // plotly covers the page while a button is down, so the browser's own click lands on the cover;
    // plotly then re-dispatches the click (untrusted) on its drag layer. That one is ours; a trusted
    // click that still reaches us (no cover on touch devices) is the same click and is skipped.
    // Two clicks within DOUBLE_CLICK_MS and DOUBLE_CLICK_PX are a double-click, one gesture: zoom
    // out. The first click has already acted (a click must answer at once), so the second takes
    // that back (plotClickTakeBack) before zooming: a double-click never assigns, selects or
    // leaves a candidate list open.
    // The browser counts clicks on the input's own timing (UIEvent.detail of the mousedown, which
    // lands on plotly's drag layer before the cover goes up): a busy page that re-dispatches the
    // second click late still sees a double-click.
    let last = { x: NaN, y: NaN, t: -Infinity };
    let downCount = 0;
    const onDown = (e: MouseEvent) => {
      if (e.isTrusted) downCount = e.detail;
      hide();
    };
    const onClick = (e: MouseEvent) => {
      if (e.isTrusted) return;
      if (!(e.target instanceof Element) || !e.target.closest('.plot-surface')) return;
      const isDouble =
        downCount >= 2 ||
        (Math.hypot(e.clientX - last.x, e.clientY - last.y) <= DOUBLE_CLICK_PX && e.timeStamp - last.t <= DOUBLE_CLICK_MS);
      downCount = 0;
      last = isDouble ? { x: NaN, y: NaN, t: -Infinity } : { x: e.clientX, y: e.clientY, t: e.timeStamp };
      if (isDouble) {
        plotClickTakeBack();
        latest.current.onDoubleClick();
        return;
      }
      plotClickBegin();
      hitAt(e)?.act();
    };
    host.addEventListener('mousemove', onMove);
    host.addEventListener('mouseleave', hide);
    host.addEventListener('mousedown', onDown);
    host.addEventListener('click', onClick);
    return () => {
      host.removeEventListener('mousemove', onMove);
      host.removeEventListener('mouseleave', hide);
      host.removeEventListener('mousedown', onDown);
      host.removeEventListener('click', onClick);
    };
  }, []);

  return (
    <>
      <canvas ref={marksRef} className="plot-overlay" aria-hidden="true" />
      <canvas ref={baseRef} className="plot-overlay" aria-hidden="true" />
      <canvas ref={canvasRef} className="plot-overlay" data-testid="plot-overlay" aria-hidden="true" />
      <div ref={tipRef} className="plot-tip" role="tooltip" data-testid="plot-tip" hidden />
    </>
  );
}

function ascii(lines: LineList, i: number, shape: TopShape): string {
  return lineLabelAscii(lines.kUpper[i] - lines.kLower[i], lines.jUpper[i] - lines.jLower[i], lines.kLower[i], lines.jLower[i], shape);
}
