/**
 * Symmetry labels on the ladder rungs ("A1←A2", "E←A1", "a A2″←s A1′"): the levels' species or
 * tags written beside each rung where the view leaves room for them — rows tall enough for the
 * text and neighbouring rungs far enough apart that every label sits clearly beside its own rung
 * and no two labels touch — and always beside the selected rung. Pure: text per line in, canvas
 * calls out (the same LadderPaintContext as the ladder scene).
 */
import { lineLevelLabel, transitionSymmetryText, type LineLevelLabels } from '../../state/systemLevelLabels';
import type { LadderPaintContext, LadderScene, LadderView } from './ladderScene';
import type { PlotTheme } from './plotColours';
import { sortedLowerBound } from './traceDecimate';

/** Label font size, CSS px. */
const FONT_PX = 9;
const FONT = `${FONT_PX}px system-ui, sans-serif`;
/** Gap between a rung and its label, px. */
const GAP_PX = 3;
/** Rows shorter than this (px) get no labels but the selected rung's. */
const ROW_PITCH_MIN_PX = FONT_PX + 4;
/** Most rungs of one row in view that are examined for labels (past this the row is too dense anyway). */
const ROW_RUNGS_MAX = 400;

/**
 * The compact symmetry text of each line ("A1←A2"), '' where its levels carry none.
 * @param levels per-line level labels (state/systemLevelLabels), or null (a single-band session)
 * @param count number of lines
 * @returns the texts, or null when no line has one
 */
export function rungSymmetryTexts(levels: LineLevelLabels | null, count: number): string[] | null {
  if (!levels) return null;
  const out = new Array<string>(count);
  let any = false;
  for (let i = 0; i < count; i++) {
    const text = transitionSymmetryText(lineLevelLabel(levels, i)).replace(' ← ', '←');
    out[i] = text;
    if (text) any = true;
  }
  return any ? out : null;
}

/** What rungSymmetryLabelsPaint drew. */
export interface RungLabelsDrawn {
  count: number;
  /** The texts drawn, left to right per row (for read-outs and tests). */
  texts: string[];
}

/**
 * Paint the symmetry labels of the rungs in view. A rung's label sits right of it on its row's
 * line, on a paper-coloured backing, and is drawn only when rows are at least ROW_PITCH_MIN_PX
 * tall and the next rung of the row lies at least the label's width plus two gaps to the right
 * (so a label never covers another rung or label). The selected rung's label is drawn in any
 * case, beside the selection ring.
 * @param ctx 2D context scaled to CSS px
 * @param scene the ladder scene
 * @param texts per line index, the compact text (rungSymmetryTexts); null draws nothing
 * @param cursorLine line index of the selected rung, or −1
 * @param view the view the scene is painted with
 * @param theme colours
 */
export function rungSymmetryLabelsPaint(
  ctx: LadderPaintContext,
  scene: LadderScene,
  texts: readonly string[] | null,
  cursorLine: number,
  view: LadderView,
  theme: PlotTheme,
): RungLabelsDrawn {
  const drawn: RungLabelsDrawn = { count: 0, texts: [] };
  if (!texts || !(view.widthPx > 0 && view.heightPx > 0) || view.x1Cm1 === view.x0Cm1) return drawn;
  const sx = view.widthPx / (view.x1Cm1 - view.x0Cm1);
  const sy = view.heightPx / (view.y1 - view.y0);
  const px = (nu: number) => view.leftPx + (nu - view.x0Cm1) * sx;
  const py = (y: number) => view.topPx + (view.y1 - y) * sy;
  const lo = Math.min(view.x0Cm1, view.x1Cm1);
  const hi = Math.max(view.x0Cm1, view.x1Cm1);
  const pitchPx = Math.abs(sy);
  ctx.save();
  ctx.beginPath();
  ctx.rect(view.leftPx, view.topPx, view.widthPx, view.heightPx);
  ctx.clip();
  ctx.font = FONT;
  ctx.textBaseline = 'middle';
  // A label sits on its row's line, right of its rung, on a paper-coloured backing (rungs of the
  // rows above and below keep ≥ 0.58 of a row away, so the text never meets them).
  const label = (text: string, x: number, y: number, w: number, colour: string) => {
    ctx.fillStyle = theme.paper;
    ctx.beginPath();
    ctx.rect(x - 1, y - FONT_PX / 2 - 1, w + 2, FONT_PX + 2);
    ctx.fill();
    ctx.fillStyle = colour;
    ctx.fillText(text, x, y);
    drawn.count++;
    drawn.texts.push(text);
  };
  let cursorRung = -1;
  if (pitchPx >= ROW_PITCH_MIN_PX) {
    scene.rows.forEach((row, r) => {
      const y = py(row.y);
      if (y < view.topPx - pitchPx || y > view.topPx + view.heightPx + pitchPx) return;
      const order = scene.rowOrder[r];
      const nus = scene.rowNuCm1[r];
      const start = sortedLowerBound(nus, lo);
      const end = sortedLowerBound(nus, hi);
      if (end - start > ROW_RUNGS_MAX) return;
      for (let k = Math.max(0, start - 1); k < Math.min(order.length, end + 1); k++) {
        const q = order[k];
        const text = texts[scene.lineIndex[q]];
        if (!text) continue;
        const x = px(nus[k]);
        const w = ctx.measureText(text).width;
        const nextX = k + 1 < order.length ? px(nus[k + 1]) : Infinity;
        if (Math.abs(nextX - x) < w + 2 * GAP_PX) continue;
        if (scene.lineIndex[q] === cursorLine) continue;
        label(text, x + GAP_PX, y, w, theme.text);
      }
    });
  }
  if (cursorLine >= 0 && texts[cursorLine]) cursorRung = scene.lineIndex.indexOf(cursorLine);
  if (cursorRung >= 0 && scene.nuCm1[cursorRung] >= lo && scene.nuCm1[cursorRung] <= hi) {
    const text = texts[cursorLine];
    // Beside the selection ring (radius 7.5 px at the rung's tip), in the cursor's colour.
    const tip = scene.yTop[cursorRung] > scene.rows[scene.rowIndex[cursorRung]].y ? scene.yTop[cursorRung] : scene.yBottom[cursorRung];
    label(text, px(scene.nuCm1[cursorRung]) + 10, py(tip), ctx.measureText(text).width, theme.cursor);
  }
  ctx.restore();
  return drawn;
}
