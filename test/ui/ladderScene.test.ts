import fc from 'fast-check';
import { assignmentOfLine } from '../state/fixtures';
import { describe, expect, it } from 'vitest';
import type { Assignment } from '../../src/fit/assignment';
import { bandLadders } from '../../src/physics/bandLadders';
import { bandLines } from '../../src/physics/bandLines';
import type { BandModel, LineList } from '../../src/physics/model';
import type { AssignmentRow } from '../../src/state/selectors';
import { ladderLabelTemplate, ladderRowsBuild, rungExtent, rungTip } from '../../src/ui/plot/ladderGeometry';
import {
  LADDER_DOTS_MAX,
  ladderHitTest,
  ladderLabelsPaint,
  ladderMarkersBuild,
  ladderMarkersUpdate,
  type LadderMarkersState,
  ladderSceneBuild,
  ladderMarkersPaint,
  ladderScenePaint,
  ladderStrongestInView,
  ladderTipHtml,
  markupRuns,
  type LadderView,
} from '../../src/ui/plot/ladderScene';
import { ladderColour, plotTheme } from '../../src/ui/plot/plotColours';
import { ladderTestModel } from './ladderFixtures';
import { paintRecorder } from './paintRecorder';

// The small invented band of the ladder-geometry tests, with more J and K so rows hold many rungs.
const model: BandModel = { ...ladderTestModel, jMax: 15, kMax: 4 };

const theme = plotTheme(false);

function setUp(m: BandModel = model) {
  const lines = bandLines(m);
  const rows = ladderRowsBuild(bandLadders(lines, m.shape), m.shape);
  const scene = ladderSceneBuild(rows, lines, false);
  return { lines, rows, scene };
}

function fullView(lines: LineList, rowsCount: number): LadderView {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < lines.count; i++) {
    lo = Math.min(lo, lines.wavenumberCm1[i]);
    hi = Math.max(hi, lines.wavenumberCm1[i]);
  }
  return { x0Cm1: lo - 1, x1Cm1: hi + 1, y0: -0.6, y1: rowsCount - 0.4, leftPx: 70, topPx: 10, widthPx: 1000, heightPx: 15 * rowsCount };
}

const px = (v: LadderView, nu: number) => v.leftPx + ((nu - v.x0Cm1) / (v.x1Cm1 - v.x0Cm1)) * v.widthPx;
const py = (v: LadderView, y: number) => v.topPx + ((v.y1 - y) / (v.y1 - v.y0)) * v.heightPx;

/** Index of the line with these quanta, by brute force over the list. */
function lineOf(lines: LineList, jUpper: number, kUpper: number, jLower: number, kLower: number): number {
  for (let i = 0; i < lines.count; i++)
    if (lines.jUpper[i] === jUpper && lines.kUpper[i] === kUpper && lines.jLower[i] === jLower && lines.kLower[i] === kLower) return i;
  return -1;
}

function rowOf(a: Assignment, lines: LineList, i: number, over: Partial<AssignmentRow> = {}): AssignmentRow {
  return {
    a,
    labelAscii: `line ${i}`,
    labelHtml: `line ${i}`,
    deltaJ: a.jUpper - a.jLower,
    deltaK: a.kUpper - a.kLower,
    calcCm1: lines.wavenumberCm1[i],
    omcCm1: a.observedCm1 - lines.wavenumberCm1[i],
    omcSigma: null,
    isFar: false,
    isOutlier: false,
    ...over,
  };
}

describe('ladderMarkersBuild with the drawn line of each row', () => {
  it('places a marker on the rung of the line given, not the first with its quanta (split pairs share J and K)', () => {
    const { lines, scene } = setUp();
    const i = lineOf(lines, 3, 1, 2, 0);
    const j = lineOf(lines, 4, 1, 3, 0);
    expect(i).toBeGreaterThanOrEqual(0);
    expect(j).toBeGreaterThanOrEqual(0);
    const a: Assignment = {
      id: 'a1',
      jUpper: 3,
      kUpper: 1,
      jLower: 2,
      kLower: 0,
      observedCm1: lines.wavenumberCm1[i],
      uncertaintyCm1: 0.001,
      isBlended: false,
      isExcluded: false,
      note: '',
    };
    // The row says line i by its quanta; the drawn-line map says j: the map wins.
    const m = ladderMarkersBuild([rowOf(a, lines, i)], scene, undefined, Int32Array.of(j));
    expect(m.lineIndex[0]).toBe(j);
    expect(m.nuCm1[0]).toBe(lines.wavenumberCm1[j]);
    // A row whose line is not drawn (−1) gets no marker.
    expect(ladderMarkersBuild([rowOf(a, lines, i)], scene, undefined, Int32Array.of(-1)).nuCm1.length).toBe(0);
  });
});

describe('ladderMarkersUpdate', () => {
  type MarkerOp =
    | { kind: 'append'; lines: number[] }
    | { kind: 'remove'; at: number }
    | { kind: 'flag'; at: number }
    | { kind: 'relink'; at: number; to: number; removeAt: number | null }
    | { kind: 'undo'; back: number }
    | { kind: 'scene'; hidden: boolean }
    | { kind: 'lineOf'; on: boolean }
    | { kind: 'tagOf' };
  const opArb: fc.Arbitrary<MarkerOp> = fc.oneof(
    {
      weight: 5,
      arbitrary: fc.record({ kind: fc.constant('append' as const), lines: fc.array(fc.nat(10_000), { minLength: 1, maxLength: 3 }) }),
    },
    fc.record({ kind: fc.constant('remove' as const), at: fc.nat(200) }),
    fc.record({ kind: fc.constant('flag' as const), at: fc.nat(200) }),
    // The same row object on another drawn line (a band switched off and on moves line indices).
    // With a deletion in the same step, the moved row may sit in the list's unchanged tail.
    fc.record({
      kind: fc.constant('relink' as const),
      at: fc.nat(200),
      to: fc.integer({ min: -1, max: 10_000 }),
      removeAt: fc.option(fc.nat(200), { nil: null }),
    }),
    fc.record({ kind: fc.constant('undo' as const), back: fc.integer({ min: -2, max: 3 }) }),
    fc.record({ kind: fc.constant('scene' as const), hidden: fc.boolean() }),
    fc.record({ kind: fc.constant('lineOf' as const), on: fc.boolean() }),
    fc.constant({ kind: 'tagOf' as const }),
  );

  it('equals ladderMarkersBuild after any sequence of appends, deletions, flag changes, moved lines, undo/redo, hidden rows and line maps', () => {
    const { lines, rows: ladderRows, scene } = setUp();
    // The same lines with one row of rungs hidden (another scene).
    const hiddenScene = ladderSceneBuild(
      ladderRowsBuild(bandLadders(lines, model.shape), model.shape, new Set([ladderRows[1].key])),
      lines,
      false,
    );
    const assignmentAt = (i: number, id: string): Assignment => assignmentOfLine(lines, i, id);
    let nMarkers = 0;
    fc.assert(
      fc.property(fc.array(opArb, { minLength: 1, maxLength: 30 }), (ops) => {
        let state: LadderMarkersState | null = null;
        let current = scene;
        let withLineOf = false;
        let tagOf: ((r: AssignmentRow) => number) | undefined = undefined;
        // Each row's line index (the drawn-line map), kept beside the rows.
        const versions: { rows: AssignmentRow[]; line: number[] }[] = [{ rows: [], line: [] }];
        let at = 0;
        let next = 0;
        for (const op of ops) {
          let { rows, line } = versions[at];
          const isListChange = op.kind === 'append' || op.kind === 'remove' || op.kind === 'flag' || op.kind === 'relink';
          if (op.kind === 'append') {
            // Some rows name a line past the end (not predicted: no rung), some a line not drawn (−1).
            const picked = op.lines.map((k) => k % (lines.count + 3));
            rows = [
              ...rows,
              ...picked.map((i) => rowOf(assignmentAt(Math.min(i, lines.count - 1), `a${next++}`), lines, Math.min(i, lines.count - 1))),
            ];
            line = [...line, ...picked.map((i) => (i < lines.count ? i : -1))];
          } else if (op.kind === 'remove' && rows.length) {
            const k = op.at % rows.length;
            rows = rows.filter((_, i) => i !== k);
            line = line.filter((_, i) => i !== k);
          } else if (op.kind === 'flag' && rows.length) {
            const k = op.at % rows.length;
            rows = rows.map((r, i) => (i === k ? { ...r, isFar: !r.isFar } : r));
          } else if (op.kind === 'relink' && rows.length) {
            const k = op.at % rows.length;
            line = line.map((x, i) => (i === k ? (op.to < 0 ? -1 : op.to % lines.count) : x));
            if (op.removeAt !== null) {
              const r = op.removeAt % rows.length;
              rows = rows.filter((_, i) => i !== r);
              line = line.filter((_, i) => i !== r);
            }
          } else if (op.kind === 'undo') at = Math.min(Math.max(at - op.back, 0), versions.length - 1);
          else if (op.kind === 'scene') current = op.hidden ? hiddenScene : scene;
          else if (op.kind === 'lineOf') withLineOf = op.on;
          else if (op.kind === 'tagOf') tagOf = tagOf ? undefined : () => 0;
          if (isListChange) {
            versions.splice(at + 1, versions.length, { rows, line });
            at = versions.length - 1;
          } else ({ rows, line } = versions[at]);
          const lineOf = withLineOf ? Int32Array.from(line) : null;
          state = ladderMarkersUpdate(state, rows, current, tagOf, lineOf);
          expect(state.markers).toEqual(ladderMarkersBuild(rows, current, tagOf, lineOf));
          nMarkers += state.markers.rows.length;
        }
      }),
      { numRuns: 200, seed: 20261203 },
    );
    expect(nMarkers).toBeGreaterThan(1000);
  });

  it('places only the new row when one is appended (the others are copied)', () => {
    const { lines, scene } = setUp();
    const mk = (i: number): AssignmentRow => rowOf(assignmentOfLine(lines, i, `a${i}`), lines, i);
    const rows = Array.from({ length: 50 }, (_, i) => mk(i));
    let looked = 0;
    const tagOf = () => (looked++, 0);
    const s1 = ladderMarkersUpdate(null, rows, scene, tagOf);
    expect(looked).toBe(50);
    const s2 = ladderMarkersUpdate(s1, [...rows, mk(60)], scene, tagOf);
    expect(looked).toBe(51);
    expect(s2.markers).toEqual(ladderMarkersBuild([...rows, mk(60)], scene));
    // The same inputs again: the same state.
    expect(ladderMarkersUpdate(s2, s2.rows, scene, tagOf)).toBe(s2);
  });
});

describe('ladderSceneBuild', () => {
  it('holds one rung per line of the ladders, at the line position, with the rung extent of its branch and intensity', () => {
    const { lines, rows, scene } = setUp();
    const total = rows.reduce((n, r) => n + r.ladders.reduce((m, l) => m + l.lineIndex.length, 0), 0);
    expect(scene.nuCm1.length).toBe(total);
    expect(new Set(scene.lineIndex).size).toBe(total);
    for (let k = 0; k < scene.nuCm1.length; k++) {
      const i = scene.lineIndex[k];
      const row = rows[scene.rowIndex[k]];
      expect(scene.nuCm1[k]).toBe(lines.wavenumberCm1[i]);
      const [b, t] = rungExtent(lines.jUpper[i] - lines.jLower[i], lines.intensity[i]);
      expect(scene.yBottom[k]).toBeCloseTo(row.y + b, 14);
      expect(scene.yTop[k]).toBeCloseTo(row.y + t, 14);
      // The rung belongs to its row's ΔK and K''.
      expect(lines.kUpper[i] - lines.kLower[i]).toBe(row.deltaK);
      expect(lines.kLower[i]).toBe(row.kLower);
    }
  });

  it('groups rungs by row colour and width (Q wider), and sorts each row by position for hit testing', () => {
    const { rows, scene } = setUp();
    expect(scene.groups.length).toBeLessThanOrEqual(2 * rows.length);
    for (const g of scene.groups) {
      expect([1.6, 2.2]).toContain(g.widthPx);
      for (const s of g.series) {
        const row = rows.find((r) => r.y === s.rowY)!;
        expect(g.colour).toBe(ladderColour(row.deltaK, row.kLower, false));
      }
    }
    scene.rowNuCm1.forEach((nu, r) => {
      for (let j = 1; j < nu.length; j++) expect(nu[j]).toBeGreaterThanOrEqual(nu[j - 1]);
      expect(scene.rowOrder[r].every((k) => scene.rowIndex[k] === r)).toBe(true);
    });
  });
});

describe('ladderScenePaint', () => {
  it('paints every rung in view as a bar from its pixel column, spanning the rung to the nearest pixel, in its row colour', () => {
    const { lines, rows, scene } = setUp();
    const view = fullView(lines, rows.length);
    const rec = paintRecorder();
    const drawn = ladderScenePaint(rec.ctx, scene, null, -1, view, theme);
    expect(drawn).toBe(scene.nuCm1.length);
    // Series base lines are the bars as thick as a rung is wide (1.6 or 2.2 px), the rows' base lines
    // those in the grid colour; the rest are rungs.
    const bars = rec.rects.filter((r) => r.colour !== theme.grid && !scene.groups.some((g) => g.widthPx === r.h));
    expect(bars.length).toBe(drawn);
    expect(rec.segments).toEqual([]);
    for (let k = 0; k < scene.nuCm1.length; k++) {
      const x = Math.round(px(view, scene.nuCm1[k]));
      const row = rows[scene.rowIndex[k]];
      const top = py(view, scene.yTop[k]);
      const bottom = py(view, scene.yBottom[k]);
      const bar = bars.find((r) => r.x === x && Math.abs(r.y - top) <= 0.5 && Math.abs(r.y + r.h - bottom) <= 0.5 + 1e-9);
      expect(bar).toBeDefined();
      // Whole-pixel edges (the fast fill) and the rung's width from its group.
      expect(Number.isInteger(bar!.y) && Number.isInteger(bar!.h) && bar!.h >= 1).toBe(true);
      expect(bar!.colour).toBe(ladderColour(row.deltaK, row.kLower, false));
      expect(bar!.w).toBe(scene.groups.find((g) => g.series.some((s) => k >= s.start && k < s.end))!.widthPx);
    }
    // The row names are painted left of the panel, one per row.
    expect(rec.texts.map((t) => t.text).join('|')).toContain('K″=0');
    expect(rec.texts.every((t) => t.x < view.leftPx)).toBe(true);
  });

  it('keeps each series sorted by position, so a view finds its rungs by bisection', () => {
    const { scene } = setUp();
    for (const g of scene.groups)
      for (const s of g.series) for (let k = s.start + 1; k < s.end; k++) expect(scene.nuCm1[k]).toBeGreaterThanOrEqual(scene.nuCm1[k - 1]);
  });

  it('measures each row name once however often the panel is painted, and paints it at the same place', () => {
    const { lines, rows, scene } = setUp();
    const view = fullView(lines, rows.length);
    const first = paintRecorder();
    let measured = 0;
    const measure = first.ctx.measureText.bind(first.ctx);
    first.ctx.measureText = (t: string) => {
      measured++;
      return measure(t);
    };
    ladderScenePaint(first.ctx, scene, null, -1, view, theme);
    const once = measured;
    expect(once).toBeGreaterThan(0);
    ladderScenePaint(first.ctx, scene, null, -1, { ...view, x0Cm1: view.x0Cm1 + 1 }, theme);
    expect(measured).toBe(once);
    // The second paint's names (widths from the cache) sit where a fresh scene puts them.
    const fresh = paintRecorder();
    ladderScenePaint(fresh.ctx, setUp().scene, null, -1, view, theme);
    const n = fresh.texts.length;
    expect(first.texts.slice(n)).toEqual(fresh.texts);
    // Each name ends 6 px left of the panel: its runs (widths by the recorder's 0.6 em per character)
    // follow one another up to that edge.
    const rowYs = rows.map((r) => py(view, r.y));
    const ends = new Map<number, number>();
    for (const t of fresh.texts) {
      const size = Number(/([\d.]+)px/.exec(t.font)![1]);
      const row = rowYs.reduce((best, y, r) => (Math.abs(y - t.y) < Math.abs(rowYs[best] - t.y) ? r : best), 0);
      ends.set(row, Math.max(ends.get(row) ?? -Infinity, t.x + t.text.length * 0.6 * size));
    }
    expect(ends.size).toBe(rows.length);
    for (const end of ends.values()) expect(end).toBeCloseTo(view.leftPx - 6, 9);
  });

  it('paints the row names and base lines alone (for a kept image) exactly as with the rungs, and leaves them out when told', () => {
    const { lines, rows, scene } = setUp();
    const view = fullView(lines, rows.length);
    const whole = paintRecorder();
    ladderScenePaint(whole.ctx, scene, null, -1, view, theme);
    const names = paintRecorder();
    ladderLabelsPaint(names.ctx, scene, { ...view, x0Cm1: 0, x1Cm1: 1 }, theme);
    expect(names.texts.length).toBeGreaterThan(0);
    expect(names.texts).toEqual(whole.texts);
    expect(names.segments).toEqual([]);
    // One base line per row: 1 px high at the row's centre (to the pixel), across the panel, grid colour.
    expect(names.rects).toEqual(
      rows.map((r) => ({ x: view.leftPx, y: Math.round(py(view, r.y)), w: view.widthPx, h: 1, colour: theme.grid })),
    );
    const bare = paintRecorder();
    expect(ladderScenePaint(bare.ctx, scene, null, -1, view, theme, false)).toBe(scene.nuCm1.length);
    expect(bare.texts).toEqual([]);
    expect([...names.rects, ...bare.rects]).toEqual(whole.rects);
  });

  it('leaves out rungs outside the visible range', () => {
    const { lines, rows, scene } = setUp();
    const view = { ...fullView(lines, rows.length), x0Cm1: 999, x1Cm1: 1001 };
    const drawn = ladderScenePaint(paintRecorder().ctx, scene, null, -1, view, theme);
    // One pixel of margin each side (2 cm^-1 over 1000 px).
    let inRange = 0;
    for (const nu of scene.nuCm1) if (nu >= 999 - 0.002 && nu <= 1001 + 0.002) inRange++;
    expect(drawn).toBe(inRange);
    expect(drawn).toBeLessThan(scene.nuCm1.length);
  });

  it('draws assigned lines as dots at the rung tips, flagged ones as crosses, and bars once more than LADDER_DOTS_MAX are in view', () => {
    const big: BandModel = { ...model, jMax: 40, kMax: 8 };
    const { lines, rows, scene } = setUp(big);
    const mk = (i: number): Assignment => assignmentOfLine(lines, i, `a${i}`);
    const few = [0, 1, 2].map((i) => rowOf(mk(i), lines, i, { isFar: i === 2 }));
    // A line the model does not predict has no rung, so no marker.
    const unpredicted = rowOf({ ...mk(0), id: 'none', jUpper: 900, jLower: 899 }, lines, 0);
    const markers = ladderMarkersBuild([...few, unpredicted], scene);
    expect(Array.from(markers.lineIndex)).toEqual([0, 1, 2]);
    // Nor does a line of a hidden row.
    const hiddenKey = rows.find((r) => r.deltaK === lines.kUpper[1] - lines.kLower[1] && r.kLower === lines.kLower[1])!.key;
    const partial = ladderSceneBuild(ladderRowsBuild(bandLadders(lines, 'prolate'), 'prolate', new Set([hiddenKey])), lines, false);
    expect(Array.from(ladderMarkersBuild(few, partial).lineIndex)).not.toContain(1);
    expect(Array.from(markers.isFlagged)).toEqual([0, 0, 1]);
    // With a rung cache the markers are the same, and a second build (one row added, one row's flag
    // changed) looks up only the new assignment; the flag is read from the row each time.
    const cache = new WeakMap<Assignment, number>();
    let looked = 0;
    const counted = () => (looked++, 0);
    expect(ladderMarkersBuild([...few, unpredicted], scene, counted, undefined, cache)).toEqual(markers);
    expect(looked).toBe(4);
    const more = [rowOf(few[0].a, lines, 0, { isFar: true }), ...few.slice(1), unpredicted, rowOf(mk(3), lines, 3)];
    const again = ladderMarkersBuild(more, scene, counted, undefined, cache);
    expect(looked).toBe(5);
    expect(again).toEqual(ladderMarkersBuild(more, scene));
    expect(Array.from(again.isFlagged)).toEqual([1, 0, 1, 0]);
    for (let k = 0; k < 3; k++) {
      const i = markers.lineIndex[k];
      const row = rows.find((r) => r.deltaK === lines.kUpper[i] - lines.kLower[i] && r.kLower === lines.kLower[i])!;
      expect(markers.y[k]).toBeCloseTo(row.y + rungTip(lines.jUpper[i] - lines.jLower[i], lines.intensity[i]), 14);
    }
    const view = fullView(lines, rows.length);
    const rec = paintRecorder();
    ladderScenePaint(rec.ctx, scene, markers, -1, view, theme);
    const dots = rec.arcs.filter((a) => a.how === 'fill');
    expect(dots.map((d) => d.colour)).toEqual([theme.assigned, theme.assigned]);
    expect(dots[0].x).toBeCloseTo(px(view, lines.wavenumberCm1[0]), 9);
    expect(rec.segments.filter((s) => s.colour === theme.flagged).length).toBe(2);

    expect(lines.count).toBeGreaterThan(LADDER_DOTS_MAX);
    const all = Array.from({ length: lines.count }, (_, i) => rowOf(mk(i), lines, i));
    const rec2 = paintRecorder();
    ladderScenePaint(rec2.ctx, scene, ladderMarkersBuild(all, scene), -1, view, theme);
    expect(rec2.arcs.filter((a) => a.how === 'fill').length).toBe(0);
    const assignedBars = rec2.rects.filter((r) => r.colour === theme.assigned && r.w === 4);
    expect(assignedBars.length).toBe(lines.count);
    // Each bar is centred (to a pixel) on its rung's bar and spans the marker's ±0.09 row units.
    const dense = ladderMarkersBuild(all, scene);
    for (let k = 0; k < dense.nuCm1.length; k++) {
      const bar = assignedBars[k];
      expect(bar.x).toBe(Math.round(px(view, dense.nuCm1[k])) - 1);
      expect(Math.abs(bar.y + bar.h / 2 - py(view, dense.y[k]))).toBeLessThanOrEqual(1);
    }
  });

  it('rings the selected rung at its tip', () => {
    const { lines, rows, scene } = setUp();
    const view = fullView(lines, rows.length);
    const i = scene.lineIndex[5];
    const rec = paintRecorder();
    ladderScenePaint(rec.ctx, scene, null, i, view, theme);
    const ring = rec.arcs.find((a) => a.colour === theme.cursor)!;
    expect(ring).toBeDefined();
    expect(ring.x).toBeCloseTo(px(view, lines.wavenumberCm1[i]), 9);
    const row = rows[scene.rowIndex[5]];
    expect(ring.y).toBeCloseTo(py(view, row.y + rungTip(lines.jUpper[i] - lines.jLower[i], lines.intensity[i])), 9);
  });

  it('paints on the page as two layers that add up to the whole: rungs alone, then markers and ring alone', () => {
    const { lines, rows, scene } = setUp();
    const view = fullView(lines, rows.length);
    const marked = [0, 3, 8].map((i) => rowOf(assignmentOfLine(lines, i, `a${i}`), lines, i, { isOutlier: i === 3 }));
    const markers = ladderMarkersBuild(marked, scene);
    const cursor = scene.lineIndex[5];
    const whole = paintRecorder();
    ladderScenePaint(whole.ctx, scene, markers, cursor, view, theme);
    const rungs = paintRecorder();
    ladderScenePaint(rungs.ctx, scene, null, -1, view, theme);
    const top = paintRecorder();
    ladderMarkersPaint(top.ctx, scene, markers, cursor, view, theme);
    expect(top.rects.length).toBe(0);
    expect(rungs.arcs.length).toBe(0);
    expect(top.arcs.length).toBeGreaterThan(0);
    expect([...rungs.rects, ...top.rects]).toEqual(whole.rects);
    expect([...rungs.arcs, ...top.arcs]).toEqual(whole.arcs);
    expect([...rungs.segments, ...top.segments]).toEqual(whole.segments);
    expect([...rungs.texts, ...top.texts]).toEqual(whole.texts);
    // Nothing to mark: the top layer stays empty.
    const none = paintRecorder();
    ladderMarkersPaint(none.ctx, scene, null, -1, view, theme);
    expect(none.arcs.length + none.rects.length + none.segments.length).toBe(0);
  });
});

describe('ladderHitTest', () => {
  it('maps a pointer on a rung back to its line, and misses between rows, far from rungs and outside the panel', () => {
    const { lines, rows, scene } = setUp();
    // Zoomed so rungs of one row are several pixels apart.
    const view = { ...fullView(lines, rows.length), x0Cm1: 995, x1Cm1: 1005 };
    let checked = 0;
    for (let k = 0; k < scene.nuCm1.length; k++) {
      const nu = scene.nuCm1[k];
      if (nu < 995 || nu > 1005) continue;
      const r = scene.rowIndex[k];
      const neighbours = scene.rowNuCm1[r].filter((v) => v !== nu && Math.abs(px(view, v) - px(view, nu)) < 12);
      if (neighbours.length) continue;
      const hit = ladderHitTest(scene, null, view, px(view, nu) + 2, py(view, rows[r].y + 0.1));
      expect(hit?.kind).toBe('rung');
      const i = hit!.lineIndex;
      expect(lineOf(lines, lines.jUpper[i], lines.kUpper[i], lines.jLower[i], lines.kLower[i])).toBe(scene.lineIndex[k]);
      checked++;
    }
    expect(checked).toBeGreaterThan(5);
    expect(ladderHitTest(scene, null, view, view.leftPx - 5, view.topPx + 20)).toBeNull();
    expect(ladderHitTest(scene, null, view, view.leftPx + 10, view.topPx + view.heightPx + 5)).toBeNull();
    // 0.6 row units above the top row: inside the panel, but in no row.
    expect(ladderHitTest(scene, null, view, view.leftPx + 500, py(view, rows[0].y + 0.55))).toBeNull();
  });

  it('prefers an assigned marker within 6 px, and its tooltip is the assignment', () => {
    const { lines, rows, scene } = setUp();
    const i = scene.lineIndex[3];
    const a: Assignment = { ...assignmentOfLine(lines, i, 'x'), observedCm1: lines.wavenumberCm1[i] + 0.001 };
    const markers = ladderMarkersBuild([rowOf(a, lines, i)], scene);
    const view = fullView(lines, rows.length);
    const hit = ladderHitTest(scene, markers, view, px(view, markers.nuCm1[0]) + 3, py(view, markers.y[0]) - 2)!;
    expect(hit.kind).toBe('marker');
    expect(hit.lineIndex).toBe(i);
    expect(ladderTipHtml(hit, markers, lines, 'prolate', false)).toBe(
      `line ${i} assigned<br>obs ${a.observedCm1.toFixed(4)} cm⁻¹<br>obs − calc ${(0.001).toExponential(2)} cm⁻¹`,
    );
  });

  it("a rung's tooltip gives its label, position and relative intensity", () => {
    const { lines, scene } = setUp();
    const i = scene.lineIndex[0];
    const label = ladderLabelTemplate(
      { deltaK: lines.kUpper[i] - lines.kLower[i], deltaJ: lines.jUpper[i] - lines.jLower[i], kLower: lines.kLower[i] },
      'prolate',
    ).replace('%{text}', String(lines.jLower[i]));
    const tip = ladderTipHtml({ kind: 'rung', lineIndex: i, xPx: 0, yPx: 0 }, null, lines, 'prolate', false);
    expect(tip).toBe(
      `${label}<br>${lines.wavenumberCm1[i].toFixed(4)} cm⁻¹<br>rel. intensity ${Number(lines.intensity[i].toPrecision(3))}`,
    );
    expect(ladderTipHtml({ kind: 'rung', lineIndex: i, xPx: 0, yPx: 0 }, null, lines, 'prolate', true)).toContain('click a peak to assign');
  });

  it('finds the strongest rung in the middle of a view', () => {
    const { lines, rows, scene } = setUp();
    const view = fullView(lines, rows.length);
    const s = ladderStrongestInView(scene, lines, view)!;
    const lo = view.x0Cm1 + 0.3 * (view.x1Cm1 - view.x0Cm1);
    const hi = view.x1Cm1 - 0.3 * (view.x1Cm1 - view.x0Cm1);
    let best = -1;
    for (let i = 0; i < lines.count; i++)
      if (lines.wavenumberCm1[i] >= lo && lines.wavenumberCm1[i] <= hi && (best < 0 || lines.intensity[i] > lines.intensity[best]))
        best = i;
    expect(lines.intensity[s.lineIndex]).toBe(lines.intensity[best]);
  });
});

describe('markupRuns', () => {
  it('splits our label markup into plain, superscript and subscript runs', () => {
    expect(markupRuns('<sup>r</sup>K″=3')).toEqual([
      { text: 'r', kind: 'sup' },
      { text: 'K″=3', kind: 'plain' },
    ]);
    expect(markupRuns('<sup>p</sup>Q<sub>12</sub>(40)')).toEqual([
      { text: 'p', kind: 'sup' },
      { text: 'Q', kind: 'plain' },
      { text: '12', kind: 'sub' },
      { text: '(40)', kind: 'plain' },
    ]);
    expect(markupRuns('band')).toEqual([{ text: 'band', kind: 'plain' }]);
    expect(markupRuns('<b>x</b>')).toEqual([{ text: 'x', kind: 'plain' }]);
  });
});
