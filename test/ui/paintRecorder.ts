/** A stand-in 2D context for the overlay painters: records every segment, filled rectangle, arc and text it is given. */
import type { LadderPaintContext } from '../../src/ui/plot/ladderScene';

export interface Segment {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
  colour: string;
  widthPx: number;
}

export interface PaintRecord {
  ctx: LadderPaintContext;
  /** Stroked straight segments (moveTo → lineTo), with the style they were stroked in. */
  segments: Segment[];
  /** Filled rectangles (rect → fill), with the colour they were filled in; CSS px, h > 0 downwards. */
  rects: { x: number; y: number; w: number; h: number; colour: string }[];
  /** Arcs: centre, radius, and whether stroked or filled (both recorded when both). */
  arcs: { x: number; y: number; r: number; colour: string; how: 'stroke' | 'fill' }[];
  texts: { text: string; x: number; y: number; font: string }[];
  /** Cleared rectangles (clearRect), CSS px. */
  clears: { x: number; y: number; w: number; h: number }[];
}

export function paintRecorder(): PaintRecord {
  const rec: PaintRecord = { ctx: undefined as unknown as LadderPaintContext, segments: [], rects: [], arcs: [], texts: [], clears: [] };
  let path: { kind: 'seg'; x0: number; y0: number; x1: number; y1: number }[] = [];
  let arcs: { x: number; y: number; r: number }[] = [];
  let rects: { x: number; y: number; w: number; h: number }[] = [];
  let at = { x: NaN, y: NaN };
  const ctx = {
    strokeStyle: '#000',
    fillStyle: '#000',
    lineWidth: 1,
    font: '10px sans-serif',
    textBaseline: 'alphabetic' as CanvasTextBaseline,
    beginPath() {
      path = [];
      arcs = [];
      rects = [];
    },
    moveTo(x: number, y: number) {
      at = { x, y };
    },
    lineTo(x: number, y: number) {
      path.push({ kind: 'seg', x0: at.x, y0: at.y, x1: x, y1: y });
      at = { x, y };
    },
    arc(x: number, y: number, r: number) {
      arcs.push({ x, y, r });
    },
    closePath() {},
    stroke() {
      for (const s of path)
        rec.segments.push({ x0: s.x0, y0: s.y0, x1: s.x1, y1: s.y1, colour: String(ctx.strokeStyle), widthPx: ctx.lineWidth });
      for (const a of arcs) rec.arcs.push({ ...a, colour: String(ctx.strokeStyle), how: 'stroke' });
    },
    fill() {
      for (const a of arcs) rec.arcs.push({ ...a, colour: String(ctx.fillStyle), how: 'fill' });
      for (const r of rects) rec.rects.push({ ...r, colour: String(ctx.fillStyle) });
    },
    save() {},
    restore() {},
    rect(x: number, y: number, w: number, h: number) {
      rects.push({ x, y, w, h });
    },
    clip() {},
    clearRect(x: number, y: number, w: number, h: number) {
      rec.clears.push({ x, y, w, h });
    },
    fillText(text: string, x: number, y: number) {
      rec.texts.push({ text, x, y, font: ctx.font });
    },
    // 6 px per character at 10 px, proportional to the font size.
    measureText(text: string) {
      const size = Number(/([\d.]+)px/.exec(ctx.font)?.[1] ?? 10);
      return { width: text.length * 0.6 * size };
    },
  };
  rec.ctx = ctx;
  return rec;
}
