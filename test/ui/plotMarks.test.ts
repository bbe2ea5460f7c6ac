import { describe, expect, it } from 'vitest';
import { plotTheme } from '../../src/ui/plot/plotColours';
import { plotMarks, plotMarksPaint, type PlotMarksPaintContext, type PlotMarksView } from '../../src/ui/plot/plotMarks';

/** A context that records the strokes: each as its style, dash and end points. */
function recorder() {
  const strokes: { colour: string; width: number; dash: number[]; from: [number, number]; to: [number, number] }[] = [];
  let dash: number[] = [];
  let path: [number, number][] = [];
  const ctx: PlotMarksPaintContext = {
    strokeStyle: '',
    lineWidth: 1,
    beginPath: () => (path = []),
    moveTo: (x, y) => path.push([x, y]),
    lineTo: (x, y) => path.push([x, y]),
    stroke: () => strokes.push({ colour: String(ctx.strokeStyle), width: ctx.lineWidth, dash, from: path[0], to: path[1] }),
    save: () => undefined,
    restore: () => undefined,
    setLineDash: (d) => (dash = [...d]),
  };
  return { ctx, strokes };
}

const VIEW: PlotMarksView = { x0Cm1: 1180, x1Cm1: 1190, leftPx: 74, widthPx: 1000, topPx: 6, traceTopPx: 260, bottomPx: 460 };
const theme = plotTheme(false);

describe('plotMarks', () => {
  it('lists the cursor, the candidate peak and the selected row in that order, skipping what is absent or not a number', () => {
    expect(plotMarks(1181, 1182, 1183).map((m) => m.kind)).toEqual(['cursor', 'candidate', 'selected']);
    expect(plotMarks(null, NaN, 1183)).toEqual([{ kind: 'selected', xCm1: 1183 }]);
    expect(plotMarks(null, null, null)).toEqual([]);
  });

  it('puts each mark at its wavenumber on a linear axis and paints none outside the view', () => {
    const { ctx, strokes } = recorder();
    const drawn = plotMarksPaint(ctx, plotMarks(1182.5, 1179.9, 1189), VIEW, theme);
    // A linear axis maps x to offset + (x − range0) / (range1 − range0) · length (plotly's linear
    // axis; common practice): 1182.5 is a quarter of the way, 1189 nine tenths; 1179.9 lies outside.
    expect(drawn.map((d) => [d.kind, d.xPx])).toEqual([
      ['cursor', 74 + 250],
      ['selected', 74 + 900],
    ]);
    expect(strokes).toHaveLength(2);
    expect(strokes[0].from[0]).toBeCloseTo(324, 9);
    expect(strokes[0].to[0]).toBeCloseTo(324, 9);
  });

  it('runs the cursor and candidate marks over the whole plot height and the selected row’s from the trace panel down', () => {
    const { ctx, strokes } = recorder();
    plotMarksPaint(ctx, plotMarks(1181, 1182, 1183), VIEW, theme);
    expect(strokes.map((s) => [s.from[1], s.to[1]])).toEqual([
      [6, 460],
      [6, 460],
      [260, 460],
    ]);
    // The kinds keep their colours and strokes: dotted cursor, solid candidate, dashed selected row.
    expect(strokes.map((s) => s.colour)).toEqual([theme.cursor, theme.peak, theme.assigned]);
    expect(strokes[0].dash.length).toBeGreaterThan(0);
    expect(strokes[1].dash).toEqual([]);
    expect(strokes[2].dash[0]).toBeGreaterThan(strokes[0].dash[0]);
  });

  it('follows a reversed axis and paints nothing in an empty view', () => {
    const { ctx } = recorder();
    const drawn = plotMarksPaint(ctx, plotMarks(1182.5, null, null), { ...VIEW, x0Cm1: 1190, x1Cm1: 1180 }, theme);
    expect(drawn[0].xPx).toBeCloseTo(74 + 750, 9);
    expect(plotMarksPaint(ctx, plotMarks(1182.5, null, null), { ...VIEW, widthPx: 0 }, theme)).toEqual([]);
    expect(plotMarksPaint(ctx, plotMarks(1182.5, null, null), { ...VIEW, x1Cm1: 1180 }, theme)).toEqual([]);
  });
});
