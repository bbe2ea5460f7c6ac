/**
 * The ladder panel drawn on a 2D canvas instead of as plotly traces: every rung is one short line,
 * so tens of thousands of rungs cost a few milliseconds per redraw, and a zoom or pan never makes
 * plotly recompute them. Pure: the scene is plain data built once per model (not per view), the
 * painter takes any object with the CanvasRenderingContext2D calls it uses, and hit testing maps a
 * pointer position back to a line of the line list.
 */
import { transitionSymmetryText, type LineLevelLabel } from '../../state/systemLevelLabels';
import type { LineList, TopShape } from '../../physics/model';
import type { AssignmentRow } from '../../state/selectors';
import { ladderLabelTemplate, rungExtent, type LadderRow } from './ladderGeometry';
import { ladderColour, type PlotTheme } from './plotColours';
import { sortedLowerBound } from './traceDecimate';
import { listAlign } from '../../state/memo';

/** Rungs of one colour and line width, drawn as one canvas path. */
export interface LadderStyleGroup {
  colour: string;
  widthPx: number;
  /** Series of the group: index ranges [start, end) into the scene's rung arrays, each sorted by position. */
  series: { start: number; end: number; rowY: number }[];
}

/** Everything the ladder panel draws that depends on the model only (not on the view). */
export interface LadderScene {
  /** Each row's name split into runs (drawn left of the panel). */
  rowLabels: MarkupRun[][];
  /** Rung position, cm^-1, in series order (series are contiguous). */
  nuCm1: Float64Array;
  /** Rung ends on the ladder axis (row centre ± extent). */
  yBottom: Float64Array;
  yTop: Float64Array;
  /** Index of the rung's line in the line list. */
  lineIndex: Int32Array;
  /** Index of the rung's row in `rows`. */
  rowIndex: Int32Array;
  groups: LadderStyleGroup[];
  /** Per row: its rungs sorted by position (indices into the rung arrays), for hit testing. */
  rowOrder: Int32Array[];
  /** Per row: the sorted positions matching rowOrder, cm^-1. */
  rowNuCm1: Float64Array[];
  /** Rung index of a line by its quanta (quantaNumber), for placing assigned markers. */
  rungOf: Map<number, number>;
  /** Rung index of each line of the line list (−1 for a line in no shown row). */
  rungOfLine: Int32Array;
  rows: readonly LadderRow[];
  /**
   * Widths of the row names' runs by font and text, CSS px, filled by the first paint: measuring
   * text is the costly canvas call, and a view change does not change a name.
   */
  labelWidthsPx: Map<string, number>;
}

/**
 * One number for a line's quanta (J', K', J'', K'' each below 2^12 — far beyond any band here), so
 * lookups need no key strings.
 */
export function quantaNumber(jUpper: number, kUpper: number, jLower: number, kLower: number): number {
  return ((jUpper * 4096 + kUpper) * 4096 + jLower) * 4096 + kLower;
}

/** Step between line tags in a rung key: above every quantaNumber (4096^4 = 2^48), 32 tags stay below 2^53. */
const QUANTA_TAG_STEP = 2 ** 48;

/** Assigned-line markers (the green dots and red crosses on rungs). */
export interface LadderMarkers {
  nuCm1: Float64Array;
  /** Marker centre on the ladder axis (the rung's tip). */
  y: Float64Array;
  /** 1 = far from the prediction or a fit outlier (drawn as a cross), 0 = fine. */
  isFlagged: Uint8Array;
  lineIndex: Int32Array;
  /** The table row of each marker (its tooltip is made from it when hovered). */
  rows: AssignmentRow[];
}

/** The visible window of the ladder panel, in data and in CSS pixels relative to the canvas. */
export interface LadderView {
  /** Visible x range, cm^-1 (x0 < x1 or reversed; either works). */
  x0Cm1: number;
  x1Cm1: number;
  /** Ladder axis range [bottom, top]. */
  y0: number;
  y1: number;
  /** The panel's box inside the canvas, CSS px. */
  leftPx: number;
  topPx: number;
  widthPx: number;
  heightPx: number;
}

/** What a pointer is over. */
export type LadderHit =
  | { kind: 'rung'; lineIndex: number; xPx: number; yPx: number }
  | { kind: 'marker'; marker: number; lineIndex: number; xPx: number; yPx: number };

/** The 2D-context calls the painter uses (CanvasRenderingContext2D has them all). */
export interface LadderPaintContext {
  strokeStyle: string | CanvasGradient | CanvasPattern;
  fillStyle: string | CanvasGradient | CanvasPattern;
  lineWidth: number;
  beginPath(): void;
  moveTo(x: number, y: number): void;
  lineTo(x: number, y: number): void;
  arc(x: number, y: number, r: number, a0: number, a1: number): void;
  closePath(): void;
  stroke(): void;
  fill(): void;
  save(): void;
  restore(): void;
  rect(x: number, y: number, w: number, h: number): void;
  clearRect(x: number, y: number, w: number, h: number): void;
  clip(): void;
  font: string;
  textBaseline: CanvasTextBaseline;
  fillText(text: string, x: number, y: number): void;
  measureText(text: string): { width: number };
}

/** A run of label text: plain, superscript or subscript. */
export interface MarkupRun {
  text: string;
  kind: 'plain' | 'sup' | 'sub';
}

/**
 * Split our own label markup (plain text with <sup>…</sup> and <sub>…</sub>, as lineLabelHtml and
 * the row names produce) into runs; any other tag is dropped, entities are not used by our labels.
 * @param html label markup
 */
export function markupRuns(html: string): MarkupRun[] {
  const runs: MarkupRun[] = [];
  const re = /<(sup|sub)>(.*?)<\/\1>/g;
  let at = 0;
  const plain = (t: string) => {
    const text = t.replace(/<[^>]*>/g, '');
    if (text) runs.push({ text, kind: 'plain' });
  };
  for (let m = re.exec(html); m; m = re.exec(html)) {
    plain(html.slice(at, m.index));
    const text = m[2].replace(/<[^>]*>/g, '');
    if (text) runs.push({ text, kind: m[1] as 'sup' | 'sub' });
    at = m.index + m[0].length;
  }
  plain(html.slice(at));
  return runs;
}

/**
 * Paint labels, each right-aligned at (xRight, yMiddle): sub- and superscripts at 75 % size,
 * shifted. The runs are painted grouped by font, so the context's font (parsed on every set) is set
 * once per size, not once per run.
 * @param labels each label's runs and anchor, CSS px
 * @param sizePx size of plain text, px
 * @param family font family
 * @param widthsPx run widths by font and text, filled here and reused by later calls
 */
export function markupPaintRight(
  ctx: LadderPaintContext,
  labels: readonly { runs: readonly MarkupRun[]; xRight: number; yMiddle: number }[],
  sizePx: number,
  family: string,
  widthsPx: Map<string, number>,
): void {
  const small = Math.round(sizePx * 0.75 * 10) / 10;
  const fontOf = (kind: MarkupRun['kind']) => `${kind === 'plain' ? sizePx : small}px ${family}`;
  const placed: { text: string; x: number; y: number; font: string }[] = [];
  for (const label of labels) {
    const widths = label.runs.map((r) => {
      const font = fontOf(r.kind);
      const key = `${font}|${r.text}`;
      let w = widthsPx.get(key);
      if (w === undefined) {
        ctx.font = font;
        widthsPx.set(key, (w = ctx.measureText(r.text).width));
      }
      return w;
    });
    let x = label.xRight - widths.reduce((a, b) => a + b, 0);
    label.runs.forEach((r, i) => {
      const dy = r.kind === 'sup' ? -0.35 * sizePx : r.kind === 'sub' ? 0.3 * sizePx : 0;
      placed.push({ text: r.text, x, y: label.yMiddle + dy, font: fontOf(r.kind) });
      x += widths[i];
    });
  }
  ctx.textBaseline = 'middle';
  for (const font of new Set(placed.map((p) => p.font))) {
    ctx.font = font;
    for (const p of placed) if (p.font === font) ctx.fillText(p.text, p.x, p.y);
  }
}

/** Font family of the row names (the plots' font). */
const LABEL_FONT = 'system-ui, sans-serif';

/** Most assigned markers drawn as dots; past this many in view they are drawn as short bars. */
export const LADDER_DOTS_MAX = 400;

/** Half length of an assigned bar (ladder-axis units; rows are 1 apart). */
const BAR_HALF = 0.09;

/** Width of an assigned bar, CSS px. */
const ASSIGNED_BAR_WIDTH_PX = 4;

/**
 * Build the scene of the ladder rows: one entry per rung, grouped by colour and width (Q rungs
 * wider), each series contiguous.
 * @param rows ladder rows (ladderRowsBuild)
 * @param lines the line list the ladders index
 * @param isDark dark theme colours
 * @param lineTag per line, a small number (0…31) told apart in `rungOf` beside the quanta: the band
 *   of each line when several bands share the panel (absent: 0 for every line)
 */
export function ladderSceneBuild(rows: readonly LadderRow[], lines: LineList, isDark: boolean, lineTag?: Int32Array): LadderScene {
  let n = 0;
  for (const row of rows) for (const l of row.ladders) n += l.lineIndex.length;
  const nuCm1 = new Float64Array(n);
  const yBottom = new Float64Array(n);
  const yTop = new Float64Array(n);
  const lineIndex = new Int32Array(n);
  const rowIndex = new Int32Array(n);
  const groups = new Map<string, LadderStyleGroup>();
  const perRow: number[][] = rows.map(() => []);
  let k = 0;
  rows.forEach((row, r) => {
    const colour = row.colour ?? ladderColour(row.deltaK, row.kLower, isDark);
    for (const ladder of row.ladders) {
      if (ladder.lineIndex.length === 0) continue;
      const widthPx = ladder.deltaJ === 0 ? 2.2 : 1.6;
      const key = `${colour}|${widthPx}`;
      let g = groups.get(key);
      if (!g) groups.set(key, (g = { colour, widthPx, series: [] }));
      const start = k;
      // By position within the series, so a paint finds the rungs in view by bisection.
      const byPosition = Array.from(ladder.lineIndex).sort((a, b) => lines.wavenumberCm1[a] - lines.wavenumberCm1[b]);
      for (const i of byPosition) {
        const [b, t] = rungExtent(ladder.deltaJ, lines.intensity[i]);
        nuCm1[k] = lines.wavenumberCm1[i];
        yBottom[k] = row.y + b;
        yTop[k] = row.y + t;
        lineIndex[k] = i;
        rowIndex[k] = r;
        perRow[r].push(k);
        k++;
      }
      g.series.push({ start, end: k, rowY: row.y });
    }
  });
  const rowOrder = perRow.map((list) => Int32Array.from(list.sort((a, b) => nuCm1[a] - nuCm1[b])));
  const rowNuCm1 = rowOrder.map((order) => Float64Array.from(order, (q) => nuCm1[q]));
  const rowLabels = rows.map((r) => markupRuns(r.tickHtml));
  const rungOf = new Map<number, number>();
  const rungOfLine = new Int32Array(lines.count).fill(-1);
  for (let q = 0; q < n; q++) {
    rungOfLine[lineIndex[q]] = q;
    const i = lineIndex[q];
    rungOf.set(
      quantaNumber(lines.jUpper[i], lines.kUpper[i], lines.jLower[i], lines.kLower[i]) + (lineTag ? lineTag[i] * QUANTA_TAG_STEP : 0),
      q,
    );
  }
  return {
    rowLabels,
    nuCm1,
    yBottom,
    yTop,
    lineIndex,
    rowIndex,
    groups: [...groups.values()],
    rowOrder,
    rowNuCm1,
    rungOf,
    rungOfLine,
    rows,
    labelWidthsPx: new Map(),
  };
}

/** The tip of rung q on the ladder axis: the lower end of a P rung (it hangs from its row line), else the upper (as rungTip). */
function rungTipAt(scene: LadderScene, q: number): number {
  return scene.yTop[q] > scene.rows[scene.rowIndex[q]].y ? scene.yTop[q] : scene.yBottom[q];
}

/**
 * Markers of the assigned lines that have a rung in the scene's rows (hidden rows and lines the
 * model does not predict have none), at the rung's tip.
 * @param assignments rows of the assignments table
 * @param scene from ladderSceneBuild
 * @param tagOf the line tag of an assignment (its band; see ladderSceneBuild), or -1 when its band is not drawn
 * @param lineOf per assignment (parallel to `assignments`), the index of the line it names in the
 *   scene's line list, or −1 when that line is not drawn: where given it places the marker (the two
 *   members of a split A1/A2 or s/a pair share J and K, so the quanta alone cannot tell their rungs apart)
 * @param rungOfAssignment the rung (or -1) each assignment object was found at, kept between calls
 *   for the same scene and tagOf: assignments are immutable, so a new row costs one lookup, not one
 *   per row (the caller makes a new map when the scene or tagOf changes); not used with `lineOf`
 */
export function ladderMarkersBuild(
  assignments: readonly AssignmentRow[],
  scene: LadderScene,
  tagOf?: (row: AssignmentRow) => number,
  lineOf?: Int32Array | null,
  rungOfAssignment?: WeakMap<AssignmentRow['a'], number>,
): LadderMarkers {
  const n = assignments.length;
  const nu = new Float64Array(n);
  const y = new Float64Array(n);
  const flag = new Uint8Array(n);
  const line = new Int32Array(n);
  const kept: AssignmentRow[] = [];
  for (let m = 0; m < n; m++) {
    const r = assignments[m];
    const a = r.a;
    let q: number | undefined;
    if (lineOf) {
      const line = lineOf[m];
      q = line >= 0 && line < scene.rungOfLine.length ? scene.rungOfLine[line] : -1;
    } else {
      q = rungOfAssignment?.get(a);
      if (q === undefined) {
        const tag = tagOf ? tagOf(r) : 0;
        q = tag < 0 ? -1 : (scene.rungOf.get(quantaNumber(a.jUpper, a.kUpper, a.jLower, a.kLower) + tag * QUANTA_TAG_STEP) ?? -1);
        rungOfAssignment?.set(a, q);
      }
    }
    if (q < 0) continue;
    const k = kept.length;
    nu[k] = scene.nuCm1[q];
    y[k] = rungTipAt(scene, q);
    flag[k] = r.isFar || r.isOutlier ? 1 : 0;
    line[k] = scene.lineIndex[q];
    kept.push(r);
  }
  const m = kept.length;
  return { nuCm1: nu.slice(0, m), y: y.slice(0, m), isFlagged: flag.slice(0, m), lineIndex: line.slice(0, m), rows: kept };
}

/** Markers and what the next ladderMarkersUpdate may reuse. */
export interface LadderMarkersState {
  markers: LadderMarkers;
  /** The inputs they were built from. */
  rows: readonly AssignmentRow[];
  scene: LadderScene;
  tagOf: ((row: AssignmentRow) => number) | undefined;
  lineOf: Int32Array | null;
  /** Rung of each row (−1: none), parallel to rows. */
  rungAt: Int32Array;
  /** Number of markers of the rows before each row (n + 1 entries). */
  keptBefore: Int32Array;
}

/** The rung of one row (see ladderMarkersBuild). */
function markerRung(
  r: AssignmentRow,
  i: number,
  scene: LadderScene,
  tagOf: ((row: AssignmentRow) => number) | undefined,
  lineOf: Int32Array | null,
  rungOfAssignment: WeakMap<AssignmentRow['a'], number> | undefined,
): number {
  if (lineOf) {
    const line = lineOf[i];
    return line >= 0 && line < scene.rungOfLine.length ? scene.rungOfLine[line] : -1;
  }
  let q = rungOfAssignment?.get(r.a);
  if (q === undefined) {
    const tag = tagOf ? tagOf(r) : 0;
    q = tag < 0 ? -1 : (scene.rungOf.get(quantaNumber(r.a.jUpper, r.a.kUpper, r.a.jLower, r.a.kLower) + tag * QUANTA_TAG_STEP) ?? -1);
    rungOfAssignment?.set(r.a, q);
  }
  return q;
}

/**
 * ladderMarkersBuild for new rows, reusing the previous markers: with the same scene, tagOf and
 * kind of lineOf, the rows in the unchanged head and tail of the list (by identity, memo/listAlign,
 * and with the same drawn line) keep their markers, copied as blocks; only the rows between them are
 * placed (one lookup each). Appending a row to 10,000 so costs a few block copies, no lookup per
 * row. Equal to ladderMarkersBuild (checked in test/ui/ladderScene.test.ts).
 * @param prev the state of the previous call, or null
 * @param rowOfAssignment see ladderMarkersBuild's rungOfAssignment (used for the rows placed anew)
 */
export function ladderMarkersUpdate(
  prev: LadderMarkersState | null,
  rows: readonly AssignmentRow[],
  scene: LadderScene,
  tagOf?: (row: AssignmentRow) => number,
  lineOf?: Int32Array | null,
  rungOfAssignment?: WeakMap<AssignmentRow['a'], number>,
): LadderMarkersState {
  const lines = lineOf ?? null;
  const n = rows.length;
  let prefix = 0;
  let suffix = 0;
  const old = prev && prev.scene === scene && prev.tagOf === tagOf && (prev.lineOf === null) === (lines === null) ? prev : null;
  if (old) {
    if (old.rows === rows && old.lineOf === lines) return old;
    ({ prefix, suffix } = listAlign(old.rows, rows));
    const n0 = old.rows.length;
    if (lines && old.lineOf) {
      // A row keeps its marker only with the same drawn line.
      let k = 0;
      while (k < prefix && lines[k] === old.lineOf[k]) k++;
      prefix = k;
      k = 0;
      while (k < suffix && lines[n - 1 - k] === old.lineOf[n0 - 1 - k]) k++;
      suffix = k;
    }
  }
  const n0 = old ? old.rows.length : 0;
  const rungAt = new Int32Array(n);
  const keptBefore = new Int32Array(n + 1);
  if (old) {
    rungAt.set(old.rungAt.subarray(0, prefix));
    keptBefore.set(old.keptBefore.subarray(0, prefix + 1));
  }
  for (let i = prefix; i < n - suffix; i++) {
    // Between head and tail, a row at its old index with the same object (and line) keeps its rung.
    const isKept = old !== null && i < n0 - suffix && old.rows[i] === rows[i] && (!lines || lines[i] === old.lineOf![i]);
    const q = isKept ? old.rungAt[i] : markerRung(rows[i], i, scene, tagOf, lines, rungOfAssignment);
    rungAt[i] = q;
    keptBefore[i + 1] = keptBefore[i] + (q >= 0 ? 1 : 0);
  }
  for (let i = n - suffix; i < n; i++) {
    rungAt[i] = old!.rungAt[i - n + n0];
    keptBefore[i + 1] = keptBefore[i] + (rungAt[i] >= 0 ? 1 : 0);
  }
  const m = keptBefore[n];
  const nu = new Float64Array(m);
  const y = new Float64Array(m);
  const flag = new Uint8Array(m);
  const line = new Int32Array(m);
  const kept: AssignmentRow[] = new Array(m);
  const head = keptBefore[prefix];
  if (old && head > 0) {
    const pm = old.markers;
    nu.set(pm.nuCm1.subarray(0, head));
    y.set(pm.y.subarray(0, head));
    flag.set(pm.isFlagged.subarray(0, head));
    line.set(pm.lineIndex.subarray(0, head));
    for (let k = 0; k < head; k++) kept[k] = pm.rows[k];
  }
  for (let i = prefix; i < n - suffix; i++) {
    const q = rungAt[i];
    if (q < 0) continue;
    const k = keptBefore[i];
    const r = rows[i];
    nu[k] = scene.nuCm1[q];
    y[k] = rungTipAt(scene, q);
    flag[k] = r.isFar || r.isOutlier ? 1 : 0;
    line[k] = scene.lineIndex[q];
    kept[k] = r;
  }
  const tail = m - keptBefore[n - suffix];
  if (old && tail > 0) {
    const pm = old.markers;
    const from = pm.nuCm1.length - tail;
    const to = m - tail;
    nu.set(pm.nuCm1.subarray(from), to);
    y.set(pm.y.subarray(from), to);
    flag.set(pm.isFlagged.subarray(from), to);
    line.set(pm.lineIndex.subarray(from), to);
    for (let k = 0; k < tail; k++) kept[to + k] = pm.rows[from + k];
  }
  return {
    markers: { nuCm1: nu, y, isFlagged: flag, lineIndex: line, rows: kept },
    rows,
    scene,
    tagOf,
    lineOf: lines,
    rungAt,
    keptBefore,
  };
}

/** Data → CSS px maps of a view. */
export function viewMaps(view: LadderView): { px: (nu: number) => number; py: (y: number) => number } {
  const sx = view.widthPx / (view.x1Cm1 - view.x0Cm1);
  const sy = view.heightPx / (view.y1 - view.y0);
  return {
    px: (nu) => view.leftPx + (nu - view.x0Cm1) * sx,
    py: (y) => view.topPx + (view.y1 - y) * sy,
  };
}

/**
 * Paint each row's base line (1 px across the panel, grid colour) and the row names left of the
 * ladder panel, right-aligned 6 px from its edge. Both depend on the panel's placement only, not on
 * the visible wavenumber range (a caller may keep the result as an image between zooms). The base
 * lines were plotly grid lines: a hundred rows of five bands made a hundred SVG paths that every
 * zoom step laid out and painted again (five-band redraw median 44–46 → 41–44 ms over five alternating
 * runs of bench:browser; its p95 spreads over 50–70 ms on either build).
 * @param ctx a 2D context already scaled to CSS px
 * @param view the panel's window (its x range is not used)
 */
export function ladderLabelsPaint(ctx: LadderPaintContext, scene: LadderScene, view: LadderView, theme: PlotTheme): void {
  if (!(view.heightPx > 0) || view.y1 === view.y0) return;
  const { py } = viewMaps(view);
  const sizePx = scene.rows.length > 24 ? 8 : scene.rows.length > 14 ? 9 : 10;
  ctx.fillStyle = theme.grid;
  ctx.beginPath();
  for (const row of scene.rows) {
    const y = Math.round(py(row.y));
    if (y >= view.topPx && y <= view.topPx + view.heightPx) ctx.rect(view.leftPx, y, view.widthPx, 1);
  }
  ctx.fill();
  ctx.fillStyle = theme.text;
  const labels: { runs: readonly MarkupRun[]; xRight: number; yMiddle: number }[] = [];
  scene.rows.forEach((row, r) => {
    const y = py(row.y);
    if (y >= view.topPx - 1 && y <= view.topPx + view.heightPx + 1)
      labels.push({ runs: scene.rowLabels[r], xRight: view.leftPx - 6, yMiddle: y });
  });
  markupPaintRight(ctx, labels, sizePx, LABEL_FONT, scene.labelWidthsPx);
}

/**
 * Paint the ladder panel: rungs and series lines, then the assigned markers, then the cursor ring.
 * Only what lies inside the view (plus one pixel) is drawn; the panel box is clipped.
 * @param ctx a 2D context already scaled to CSS px
 * @param scene from ladderSceneBuild
 * @param markers from ladderMarkersBuild (or null)
 * @param cursorLine line index of the selected rung, or -1
 * @param view visible window
 * @param theme colours
 * @param isLabelled also paint the row names (ladderLabelsPaint) @default true
 * @returns the number of rungs drawn
 */
export function ladderScenePaint(
  ctx: LadderPaintContext,
  scene: LadderScene,
  markers: LadderMarkers | null,
  cursorLine: number,
  view: LadderView,
  theme: PlotTheme,
  isLabelled = true,
): number {
  if (!(view.widthPx > 0 && view.heightPx > 0) || view.x1Cm1 === view.x0Cm1) return 0;
  const { px, py } = viewMaps(view);
  const lo = Math.min(view.x0Cm1, view.x1Cm1);
  const hi = Math.max(view.x0Cm1, view.x1Cm1);
  const pad = (hi - lo) / view.widthPx;
  if (isLabelled) ladderLabelsPaint(ctx, scene, view, theme);
  ctx.save();
  ctx.beginPath();
  ctx.rect(view.leftPx, view.topPx, view.widthPx, view.heightPx);
  ctx.clip();
  let drawn = 0;
  // Rungs and series lines are filled bars whose left (and top, bottom) edges sit on whole pixels:
  // the browser fills such rectangles several times faster than it strokes the same number of
  // anti-aliased lines (stroking 20,000 rungs cost 60–150 ms of rasterisation per redraw in headless
  // Chromium, bars 10–30 ms), and they look the same.
  for (const g of scene.groups) {
    const w = g.widthPx;
    ctx.fillStyle = g.colour;
    ctx.beginPath();
    for (const s of g.series) {
      let first = Infinity;
      let last = -Infinity;
      for (let k = lowerBoundIn(scene.nuCm1, s.start, s.end, lo - pad); k < s.end; k++) {
        const nu = scene.nuCm1[k];
        if (nu > hi + pad) break;
        const x = Math.round(px(nu));
        const top = Math.round(py(scene.yTop[k]));
        const bottom = Math.round(py(scene.yBottom[k]));
        ctx.rect(x, top, w, Math.max(1, bottom - top));
        if (x < first) first = x;
        if (x > last) last = x;
        drawn++;
      }
      if (last > first) ctx.rect(first, Math.round(py(s.rowY)), last - first + w, w);
    }
    ctx.fill();
  }
  ctx.restore();
  ladderMarkersPaint(ctx, scene, markers, cursorLine, view, theme);
  return drawn;
}

/**
 * Paint what changes on a click over the rungs: the assigned markers (dots, crosses) and the selected
 * rung's ring, clipped to the ladder panel. The page paints it on its own canvas above the rungs, so
 * an assignment repaints only these (ladderScenePaint paints both).
 * @param cursorLine line index of the selected rung, or −1
 */
export function ladderMarkersPaint(
  ctx: LadderPaintContext,
  scene: LadderScene,
  markers: LadderMarkers | null,
  cursorLine: number,
  view: LadderView,
  theme: PlotTheme,
): void {
  if (!(view.widthPx > 0 && view.heightPx > 0) || view.x1Cm1 === view.x0Cm1) return;
  if (!markers && cursorLine < 0) return;
  const { px, py } = viewMaps(view);
  const lo = Math.min(view.x0Cm1, view.x1Cm1);
  const hi = Math.max(view.x0Cm1, view.x1Cm1);
  const pad = (hi - lo) / view.widthPx;
  ctx.save();
  ctx.beginPath();
  ctx.rect(view.leftPx, view.topPx, view.widthPx, view.heightPx);
  ctx.clip();
  if (markers) markersPaint(ctx, markers, px, py, lo - pad, hi + pad, theme);
  if (cursorLine >= 0) {
    const k = scene.lineIndex.indexOf(cursorLine);
    if (k >= 0) {
      const tipY = rungTipAt(scene, k);
      ctx.strokeStyle = theme.cursor;
      ctx.lineWidth = 2.5;
      ctx.beginPath();
      ctx.arc(px(scene.nuCm1[k]), py(tipY), 7.5, 0, 2 * Math.PI);
      ctx.stroke();
    }
  }
  ctx.restore();
}

/** First index in [start, end) of an ascending array whose value is >= x (end when none). */
function lowerBoundIn(sorted: Float64Array, start: number, end: number, x: number): number {
  let a = start;
  let b = end;
  while (a < b) {
    const m = (a + b) >>> 1;
    if (sorted[m] < x) a = m + 1;
    else b = m;
  }
  return a;
}

/** Fill the current path of circles as assigned dots with a thin paper-coloured ring (ladders and peaks alike). */
export function assignedDotsFinish(ctx: LadderPaintContext, theme: PlotTheme): void {
  ctx.fillStyle = theme.assigned;
  ctx.fill();
  ctx.strokeStyle = theme.paper;
  ctx.lineWidth = 1;
  ctx.stroke();
}

function markersPaint(
  ctx: LadderPaintContext,
  m: LadderMarkers,
  px: (nu: number) => number,
  py: (y: number) => number,
  lo: number,
  hi: number,
  theme: PlotTheme,
): void {
  let nOk = 0;
  for (let k = 0; k < m.nuCm1.length; k++) if (!m.isFlagged[k] && m.nuCm1[k] >= lo && m.nuCm1[k] <= hi) nOk++;
  const isDense = nOk > LADDER_DOTS_MAX;
  // Fine markers: dots with a thin paper-coloured ring (bars when hundreds are in view: filled
  // pixel-aligned rectangles, as the rungs, centred on the rung's bar).
  ctx.beginPath();
  for (let k = 0; k < m.nuCm1.length; k++) {
    const nu = m.nuCm1[k];
    if (m.isFlagged[k] || nu < lo || nu > hi) continue;
    const x = px(nu);
    if (isDense) {
      const top = Math.round(py(m.y[k] + BAR_HALF));
      const bottom = Math.round(py(m.y[k] - BAR_HALF));
      ctx.rect(Math.round(x) - 1, top, ASSIGNED_BAR_WIDTH_PX, Math.max(1, bottom - top));
    } else {
      const y = py(m.y[k]);
      ctx.moveTo(x + 3.5, y);
      ctx.arc(x, y, 3.5, 0, 2 * Math.PI);
    }
  }
  if (isDense) {
    ctx.fillStyle = theme.assigned;
    ctx.fill();
  } else {
    assignedDotsFinish(ctx, theme);
  }
  // Flagged markers: crosses.
  ctx.beginPath();
  for (let k = 0; k < m.nuCm1.length; k++) {
    const nu = m.nuCm1[k];
    if (!m.isFlagged[k] || nu < lo || nu > hi) continue;
    const x = px(nu);
    const y = py(m.y[k]);
    ctx.moveTo(x - 4, y - 4);
    ctx.lineTo(x + 4, y + 4);
    ctx.moveTo(x - 4, y + 4);
    ctx.lineTo(x + 4, y - 4);
  }
  ctx.strokeStyle = theme.flagged;
  ctx.lineWidth = 2;
  ctx.stroke();
}

/**
 * What lies under a pointer: an assigned marker within 6 px, else the nearest rung of the row under
 * the pointer within `tolerancePx` horizontally.
 * @param scene the scene
 * @param markers the markers (or null)
 * @param view the view the scene was painted with
 * @param xPx pointer x, CSS px in the canvas
 * @param yPx pointer y, CSS px in the canvas
 * @param tolerancePx largest horizontal distance to a rung, px @default 5
 */
export function ladderHitTest(
  scene: LadderScene,
  markers: LadderMarkers | null,
  view: LadderView,
  xPx: number,
  yPx: number,
  tolerancePx = 5,
): LadderHit | null {
  if (xPx < view.leftPx || xPx > view.leftPx + view.widthPx || yPx < view.topPx || yPx > view.topPx + view.heightPx) return null;
  const { px, py } = viewMaps(view);
  if (markers) {
    let best = -1;
    let bestD = 36;
    for (let k = 0; k < markers.nuCm1.length; k++) {
      const dx = px(markers.nuCm1[k]) - xPx;
      if (dx * dx > bestD) continue;
      const dy = py(markers.y[k]) - yPx;
      if (dx * dx + dy * dy < bestD) {
        bestD = dx * dx + dy * dy;
        best = k;
      }
    }
    if (best >= 0)
      return { kind: 'marker', marker: best, lineIndex: markers.lineIndex[best], xPx: px(markers.nuCm1[best]), yPx: py(markers.y[best]) };
  }
  const yData = view.y1 - ((yPx - view.topPx) / view.heightPx) * (view.y1 - view.y0);
  const rowY = Math.round(yData);
  const r = scene.rows.findIndex((row) => row.y === rowY);
  if (r < 0 || Math.abs(yData - rowY) > 0.5) return null;
  const nuAt = view.x0Cm1 + ((xPx - view.leftPx) / view.widthPx) * (view.x1Cm1 - view.x0Cm1);
  const sorted = scene.rowNuCm1[r];
  const at = sortedLowerBound(sorted, nuAt);
  let best = -1;
  let bestD = tolerancePx;
  for (const j of [at - 1, at]) {
    if (j < 0 || j >= sorted.length) continue;
    const d = Math.abs(px(sorted[j]) - xPx);
    if (d <= bestD) {
      bestD = d;
      best = j;
    }
  }
  if (best < 0) return null;
  const k = scene.rowOrder[r][best];
  return { kind: 'rung', lineIndex: scene.lineIndex[k], xPx: px(scene.nuCm1[k]), yPx: py((scene.yBottom[k] + scene.yTop[k]) / 2) };
}

/**
 * Tooltip markup of a hit: a rung's label, position and relative intensity; an assigned marker's
 * assignment text.
 * @param hit from ladderHitTest
 * @param markers the markers the hit refers to
 * @param lines line list
 * @param shape rotor shape (labels)
 * @param isSelected the rung is the selected one (adds how to assign it)
 * @param levelsOf a line's level labels (several-band session; tags and species shown as "A2 ← A1"), null when unknown
 */
export function ladderTipHtml(
  hit: LadderHit,
  markers: LadderMarkers | null,
  lines: LineList,
  shape: TopShape,
  isSelected: boolean,
  levelsOf?: (lineIndex: number) => LineLevelLabel | null,
): string {
  const symText = (i: number, own?: { tagUpper?: string; tagLower?: string }): string => {
    const lv = levelsOf?.(i);
    if (!lv) return '';
    // An assigned line shows the tags it was assigned with (the marker may sit on either member of an unsplit pair).
    const t = transitionSymmetryText(own?.tagUpper || own?.tagLower ? { ...lv, tagUpper: own.tagUpper, tagLower: own.tagLower } : lv);
    return t ? ` ${htmlEscape(t)}` : '';
  };
  if (hit.kind === 'marker' && markers) {
    const r = markers.rows[hit.marker];
    const sig = r.omcSigma !== null ? ` (${r.omcSigma.toFixed(1)} σ)` : '';
    return `${r.labelHtml}${symText(hit.lineIndex, r.a)} assigned<br>obs ${r.a.observedCm1.toFixed(4)} cm⁻¹<br>obs − calc ${r.omcCm1.toExponential(2)} cm⁻¹${sig}${r.isFar ? '<br>far from prediction' : ''}`;
  }
  const i = hit.lineIndex;
  const dk = lines.kUpper[i] - lines.kLower[i];
  const dj = lines.jUpper[i] - lines.jLower[i];
  const label = ladderLabelTemplate({ deltaK: dk, deltaJ: dj, kLower: lines.kLower[i] }, shape).replace('%{text}', String(lines.jLower[i]));
  const inten = Number(lines.intensity[i].toPrecision(3));
  const base = `${label}${symText(i)}<br>${lines.wavenumberCm1[i].toFixed(4)} cm⁻¹<br>rel. intensity ${inten}`;
  return isSelected ? `${base}<br>selected: click a peak to assign` : base;
}

/** The scene's strongest rung inside the middle of a view (for keyboard focus and tests), or null. */
export function ladderStrongestInView(
  scene: LadderScene,
  lines: LineList,
  view: LadderView,
): { lineIndex: number; xPx: number; yPx: number } | null {
  const lo = Math.min(view.x0Cm1, view.x1Cm1);
  const hi = Math.max(view.x0Cm1, view.x1Cm1);
  const { px, py } = viewMaps(view);
  let best = -1;
  for (let k = 0; k < scene.nuCm1.length; k++) {
    const nu = scene.nuCm1[k];
    if (nu < lo + 0.3 * (hi - lo) || nu > hi - 0.3 * (hi - lo)) continue;
    if (best < 0 || lines.intensity[scene.lineIndex[k]] > lines.intensity[scene.lineIndex[best]]) best = k;
  }
  if (best < 0) return null;
  return { lineIndex: scene.lineIndex[best], xPx: px(scene.nuCm1[best]), yPx: py((scene.yBottom[best] + scene.yTop[best]) / 2) };
}

function htmlEscape(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
}
