import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { peaksFind, type PeakList } from '../../src/analysis/peaksFind';
import type { Assignment } from '../../src/fit/assignment';
import { peakIdAt, peakIdPosition } from '../../src/state/assignLogic';
import type { AssignmentRow } from '../../src/state/selectors';
import type { LadderView } from '../../src/ui/plot/ladderScene';
import {
  PEAK_MARKERS_MAX,
  peakLayerBase,
  peakLayerAssignedOf,
  peakLayerBuild,
  peakLayerChanged,
  peakLayerHitTest,
  peakLayerPaint,
  peakLayerPixel,
  peakLayerRepaint,
  peakLayerTipHtml,
  peakLayerUpdate,
  type PeakLayerState,
  peakLayerVisible,
} from '../../src/ui/plot/peakLayer';
import { plotTheme } from '../../src/ui/plot/plotColours';
import { smallTrace } from '../state/fixtures';
import { paintRecorder } from './paintRecorder';

const theme = plotTheme(false);

function setUp() {
  const { trace } = smallTrace();
  const peaks = peaksFind(trace);
  return { trace, peaks };
}

/** The trace sample nearest a position, by a linear scan. */
function nearestSample(x: Float64Array, at: number): number {
  let best = 0;
  for (let i = 1; i < x.length; i++) if (Math.abs(x[i] - at) < Math.abs(x[best] - at)) best = i;
  return best;
}

function viewOf(peaks: PeakList, y0: number, y1: number): LadderView {
  return {
    x0Cm1: peaks.wavenumberCm1[0] - 1,
    x1Cm1: peaks.wavenumberCm1[peaks.count - 1] + 1,
    y0,
    y1,
    leftPx: 70,
    topPx: 200,
    widthPx: 4000,
    heightPx: 300,
  };
}

describe('peakLayer', () => {
  it('puts each marker on the trace sample nearest its peak, on the plotted ordinate', () => {
    const { trace, peaks } = setUp();
    expect(peaks.count).toBeGreaterThan(20);
    const a = peakLayerBase(peaks, trace, 'absorbance');
    const t = peakLayerBase(peaks, trace, 'transmittance');
    for (let i = 0; i < peaks.count; i++) {
      const j = nearestSample(trace.wavenumberCm1, peaks.wavenumberCm1[i]);
      expect(a.y[i]).toBe(trace.absorbance[j]);
      // Transmittance T = 10^−A (absorbance is decadic).
      expect(t.y[i]).toBeCloseTo(10 ** -trace.absorbance[j], 14);
    }
  });

  it('marks exactly the peaks whose ids carry an assignment, and their tooltip names it', () => {
    const { trace, peaks } = setUp();
    const base = peakLayerBase(peaks, trace, 'absorbance');
    const picked = [0, 3, peaks.count - 1];
    const assigned = new Map(picked.map((i) => [peakIdAt(peaks.wavenumberCm1[i]), `label ${i}`]));
    assigned.set('pk-not-a-peak', 'x');
    assigned.set('not an id', 'y');
    const layer = peakLayerBuild(base, assigned, peakIdAt, peakIdPosition);
    for (let i = 0; i < peaks.count; i++) expect(layer.isAssigned[i]).toBe(picked.includes(i) ? 1 : 0);
    expect(peakLayerTipHtml(layer, 3)).toContain('<br>assigned label 3');
    expect(peakLayerTipHtml(layer, 1)).not.toContain('assigned');
    expect(peakLayerTipHtml(layer, 1)).toMatch(new RegExp(`^peak ${peaks.wavenumberCm1[1].toFixed(4)} cm⁻¹<br>height `));
  });

  it('draws every peak in view, or the PEAK_MARKERS_MAX strongest by SNR when there are more', () => {
    const { trace, peaks } = setUp();
    const base = peakLayerBase(peaks, trace, 'absorbance');
    const lo = peaks.wavenumberCm1[2];
    const hi = peaks.wavenumberCm1[10];
    // Positions in [lo, hi) are in view.
    expect(Array.from(peakLayerVisible(base, lo, hi))).toEqual([2, 3, 4, 5, 6, 7, 8, 9]);
    expect(Array.from(peakLayerVisible(base, hi, lo))).toEqual([2, 3, 4, 5, 6, 7, 8, 9]);
    // Many peaks: the strongest kept, in ascending position.
    const n = 3 * PEAK_MARKERS_MAX;
    const many: PeakList = {
      ...peaks,
      count: n,
      wavenumberCm1: Float64Array.from({ length: n }, (_, i) => 1000 + 0.01 * i),
      snr: Float64Array.from({ length: n }, (_, i) => (i * 7919) % n),
    };
    const kept = peakLayerVisible({ peaks: many, nuCm1: many.wavenumberCm1, y: new Float64Array(n) }, 0, 2000);
    expect(kept.length).toBe(PEAK_MARKERS_MAX);
    const threshold = Array.from(many.snr).sort((a, b) => b - a)[PEAK_MARKERS_MAX - 1];
    for (const i of kept) expect(many.snr[i]).toBeGreaterThanOrEqual(threshold);
    for (let k = 1; k < kept.length; k++) expect(kept[k]).toBeGreaterThan(kept[k - 1]);
  });

  it('picks the same strongest peaks from the precomputed SNR order as by sorting each view (ties by position, ∞ first, NaN last)', () => {
    const n = 4 * PEAK_MARKERS_MAX;
    const x = Float64Array.from({ length: n }, (_, i) => 1000 + 0.01 * i);
    // Many equal SNR values (ties), one infinite and one NaN among them.
    const snr = Float64Array.from({ length: n }, (_, i) => (i * 7919) % 37);
    snr[613] = Infinity;
    snr[17] = NaN;
    const many: PeakList = { ...setUp().peaks, count: n, wavenumberCm1: x, snr };
    const base = peakLayerBase(many, { wavenumberCm1: x, absorbance: new Float64Array(n) }, 'absorbance');
    expect(base.snrOrder?.length).toBe(n);
    const unordered = { peaks: many, nuCm1: base.nuCm1, y: base.y };
    for (const [lo, hi] of [
      [0, 2000],
      [1001, 1007.5],
      [1005.9, 1009.99],
      [1002.345, 1002.3],
    ]) {
      const fast = Array.from(peakLayerVisible(base, lo, hi));
      expect(fast).toEqual(Array.from(peakLayerVisible(unordered, lo, hi)));
      expect(fast.length).toBe(Math.min(PEAK_MARKERS_MAX, x.filter((v) => v >= Math.min(lo, hi) && v < Math.max(lo, hi)).length));
    }
    expect(Array.from(peakLayerVisible(base, 0, 2000))).toContain(613);
    expect(Array.from(peakLayerVisible(base, 0, 2000))).not.toContain(17);
  });

  it('paints free peaks open and assigned ones filled, and hit-tests the marker under the pointer', () => {
    const { trace, peaks } = setUp();
    const layer = peakLayerBuild(
      peakLayerBase(peaks, trace, 'absorbance'),
      new Map([[peakIdAt(peaks.wavenumberCm1[4]), 'x']]),
      peakIdAt,
      peakIdPosition,
    );
    let ymax = 0;
    for (const v of layer.y) ymax = Math.max(ymax, v);
    const view = viewOf(peaks, 0, 1.1 * ymax);
    const drawn = peakLayerVisible(layer, view.x0Cm1, view.x1Cm1);
    const rec = paintRecorder();
    expect(peakLayerPaint(rec.ctx, layer, drawn, view, theme)).toBe(peaks.count);
    const filled = rec.arcs.filter((a) => a.how === 'fill');
    expect(filled.length).toBe(1);
    expect(filled[0].x).toBeCloseTo(peakLayerPixel(layer, 4, view).xPx, 9);
    for (const i of [0, 4, 7]) {
      const q = peakLayerPixel(layer, i, view);
      expect(peakLayerHitTest(layer, drawn, view, q.xPx + 2, q.yPx - 2)).toBe(i);
    }
    const q = peakLayerPixel(layer, 0, view);
    expect(peakLayerHitTest(layer, drawn, view, q.xPx, q.yPx + 40)).toBe(-1);
    // A peak that is not drawn is not hit.
    expect(peakLayerHitTest(layer, Int32Array.from([1]), view, q.xPx, q.yPx)).toBe(-1);
  });
});

describe('peakLayerRepaint (the partial repaint after an assign)', () => {
  /** The layer with the peaks of `marked` assigned, on a narrow view where neighbouring markers crowd. */
  function layerWith(marked: number[]) {
    const { trace, peaks } = setUp();
    const base = peakLayerBase(peaks, trace, 'absorbance');
    const layer = peakLayerBuild(base, new Map(marked.map((i) => [peakIdAt(peaks.wavenumberCm1[i]), 'x'])), peakIdAt, peakIdPosition);
    let ymax = 0;
    for (const v of layer.y) ymax = Math.max(ymax, v);
    return { base, layer, peaks, view: { ...viewOf(peaks, 0, 1.1 * ymax), widthPx: 300 } };
  }

  it('finds exactly the drawn peaks whose marker changed, and asks for a whole repaint for other peaks or ordinates', () => {
    const { layer: before, peaks, view } = layerWith([3]);
    const { base } = layerWith([]);
    const after = peakLayerBuild(
      { ...base, peaks: before.peaks, nuCm1: before.nuCm1, y: before.y },
      new Map([3, 9].map((i) => [peakIdAt(peaks.wavenumberCm1[i]), 'x'])),
      peakIdAt,
      peakIdPosition,
    );
    const drawn = peakLayerVisible(before, view.x0Cm1, view.x1Cm1);
    expect(Array.from(peakLayerChanged(before, after, drawn)!)).toEqual([9]);
    expect(Array.from(peakLayerChanged(before, after, Int32Array.from([1, 2, 3]))!)).toEqual([]);
    expect(peakLayerChanged(before, before, drawn)!.length).toBe(0);
    // Another ordinate (other marker heights) or another peak list: no partial repaint.
    const { trace } = setUp();
    const other = peakLayerBuild(peakLayerBase(peaks, trace, 'transmittance'), new Map(), peakIdAt, peakIdPosition);
    expect(peakLayerChanged(before, other, drawn)).toBeNull();
    expect(peakLayerChanged(before, layerWith([3]).layer, drawn)).toBeNull();
  });

  it('clears a whole-pixel box over the changed marker and paints again every marker that reaches it, in its new state', () => {
    const { layer: before, peaks, view } = layerWith([]);
    const after = peakLayerBuild(
      { peaks: before.peaks, nuCm1: before.nuCm1, y: before.y },
      new Map([[peakIdAt(peaks.wavenumberCm1[9]), 'x']]),
      peakIdAt,
      peakIdPosition,
    );
    const drawn = peakLayerVisible(after, view.x0Cm1, view.x1Cm1);
    const changed = peakLayerChanged(before, after, drawn)!;
    expect(Array.from(changed)).toEqual([9]);
    for (const dpr of [1, 1.5, 2]) {
      const rec = paintRecorder();
      const n = peakLayerRepaint(rec.ctx, after, drawn, changed, view, theme, dpr);
      expect(rec.clears.length).toBe(1);
      const box = rec.clears[0];
      // On whole device pixels.
      for (const v of [box.x, box.y, box.x + box.w, box.y + box.h]) expect(Math.abs(v * dpr - Math.round(v * dpr))).toBeLessThan(1e-9);
      // The assigned marker's whole extent (radius 3.5 + 0.75 and its ring's half width 0.5) lies inside.
      const q = peakLayerPixel(after, 9, view);
      const reach = 3.5 + 0.75 + 0.5;
      expect(box.x).toBeLessThanOrEqual(q.xPx - reach);
      expect(box.x + box.w).toBeGreaterThanOrEqual(q.xPx + reach);
      expect(box.y).toBeLessThanOrEqual(q.yPx - reach);
      expect(box.y + box.h).toBeGreaterThanOrEqual(q.yPx + reach);
      // Every drawn marker that can touch the box (shape up to 3.5 + 0.8 px, outline up to 1.3 px) is painted again.
      const touch = 3.5 + 0.8 + 1.3;
      const expected = Array.from(drawn).filter((i) => {
        const m = peakLayerPixel(after, i, view);
        return m.xPx > box.x - touch && m.xPx < box.x + box.w + touch && m.yPx > box.y - touch && m.yPx < box.y + box.h + touch;
      });
      expect(expected.length).toBeGreaterThan(1);
      expect(n).toBeGreaterThanOrEqual(expected.length);
      const painted = [...rec.arcs.map((a) => a.x), ...rec.segments.map((sg) => (sg.x0 + sg.x1) / 2)];
      for (const i of expected) {
        const m = peakLayerPixel(after, i, view);
        expect(painted.some((x) => Math.abs(x - m.xPx) < 5)).toBe(true);
      }
      // The changed peak comes back filled.
      expect(rec.arcs.some((a) => a.how === 'fill' && Math.abs(a.x - q.xPx) < 1e-9)).toBe(true);
    }
    // Nothing changed: nothing is touched.
    const rec = paintRecorder();
    expect(peakLayerRepaint(rec.ctx, after, drawn, new Int32Array(0), view, theme)).toBe(0);
    expect(rec.clears.length + rec.arcs.length).toBe(0);
  });
});

describe('peakLayerUpdate', () => {
  /** A table row on peak `peak` (an index into the peaks, or −1: no peak, −2: an id that is no peak). */
  function rowOn(peaks: PeakList, peak: number, id: string, label: string): AssignmentRow {
    const a: Assignment = {
      id,
      jUpper: 1,
      kUpper: 0,
      jLower: 0,
      kLower: 0,
      observedCm1: 1000,
      uncertaintyCm1: 0.001,
      isBlended: false,
      isExcluded: false,
      note: '',
      ...(peak >= 0 ? { peakId: peakIdAt(peaks.wavenumberCm1[peak]) } : peak === -2 ? { peakId: 'pk-none' } : {}),
    };
    return {
      a,
      labelAscii: label,
      labelHtml: label,
      deltaJ: 1,
      deltaK: 0,
      calcCm1: 1000,
      omcCm1: 0,
      omcSigma: null,
      isFar: false,
      isOutlier: false,
    };
  }

  type PeakOp =
    | { kind: 'append'; peaks: number[] }
    | { kind: 'remove'; at: number }
    | { kind: 'move'; at: number; peak: number }
    | { kind: 'flag'; at: number }
    | { kind: 'undo'; back: number }
    | { kind: 'base' };

  it('equals peakLayerBuild (marks and tooltip labels) after any sequence of assigns, blends, deletions, moves, undo/redo and new peak lists', () => {
    const { trace, peaks } = setUp();
    const bases = [peakLayerBase(peaks, trace, 'absorbance'), peakLayerBase(peaks, trace, 'transmittance')];
    // Few peaks so rows share them (blends); now and then a row with no peak or an id of no peak.
    const peakArb = fc.integer({ min: -2, max: Math.min(12, peaks.count - 1) });
    const opArb: fc.Arbitrary<PeakOp> = fc.oneof(
      {
        weight: 5,
        arbitrary: fc.record({ kind: fc.constant('append' as const), peaks: fc.array(peakArb, { minLength: 1, maxLength: 3 }) }),
      },
      fc.record({ kind: fc.constant('remove' as const), at: fc.nat(100) }),
      fc.record({ kind: fc.constant('move' as const), at: fc.nat(100), peak: peakArb }),
      fc.record({ kind: fc.constant('flag' as const), at: fc.nat(100) }),
      fc.record({ kind: fc.constant('undo' as const), back: fc.integer({ min: -2, max: 3 }) }),
      fc.constant({ kind: 'base' as const }),
    );
    fc.assert(
      fc.property(fc.array(opArb, { minLength: 1, maxLength: 30 }), (ops) => {
        let state: PeakLayerState | null = null;
        let base = 0;
        const versions: AssignmentRow[][] = [[]];
        let at = 0;
        let next = 0;
        for (const op of ops) {
          let rows = versions[at];
          if (op.kind === 'append') rows = [...rows, ...op.peaks.map((p) => rowOn(peaks, p, `a${next}`, `label ${next++}`))];
          else if (op.kind === 'remove' && rows.length) rows = rows.filter((_, i) => i !== op.at % rows.length);
          else if (op.kind === 'move' && rows.length) {
            const k = op.at % rows.length;
            rows = rows.map((r, i) => (i === k ? rowOn(peaks, op.peak, r.a.id, r.labelHtml) : r));
          } else if (op.kind === 'flag' && rows.length) {
            // A blend flag set on a row (a new object on the same peak).
            const k = op.at % rows.length;
            rows = rows.map((r, i) => (i === k ? { ...r, a: { ...r.a, isBlended: !r.a.isBlended } } : r));
          } else if (op.kind === 'undo') at = Math.min(Math.max(at - op.back, 0), versions.length - 1);
          else if (op.kind === 'base') base = 1 - base;
          if (op.kind === 'undo') rows = versions[at];
          else if (op.kind !== 'base') {
            versions.splice(at + 1, versions.length, rows);
            at = versions.length - 1;
          }
          state = peakLayerUpdate(state, bases[base], rows, peakIdAt, peakIdPosition);
          const full = peakLayerBuild(bases[base], peakLayerAssignedOf(rows), peakIdAt, peakIdPosition);
          expect(state.layer.isAssigned).toEqual(full.isAssigned);
          expect(state.layer.y).toBe(full.y);
          for (let i = 0; i < 14 && i < peaks.count; i++)
            expect(state.layer.assignedLabel(peaks.wavenumberCm1[i])).toBe(full.assignedLabel(peaks.wavenumberCm1[i]));
        }
      }),
      { numRuns: 200, seed: 20261203 },
    );
  });

  it('marks only the peak of a row appended', () => {
    const { trace, peaks } = setUp();
    const base = peakLayerBase(peaks, trace, 'absorbance');
    const rows = Array.from({ length: 8 }, (_, i) => rowOn(peaks, i, `a${i}`, `l${i}`));
    let formatted = 0;
    const counting = (nu: number) => (formatted++, peakIdAt(nu));
    const s1 = peakLayerUpdate(null, base, rows, counting, peakIdPosition);
    const before = formatted;
    const s2 = peakLayerUpdate(s1, base, [...rows, rowOn(peaks, 9, 'a9', 'l9')], counting, peakIdPosition);
    // Three neighbours of one peak looked at, not of all nine.
    expect(formatted - before).toBeLessThanOrEqual(3);
    expect(s2.layer.isAssigned[9]).toBe(1);
    expect(s2.layer.isAssigned[8]).toBe(0);
  });
});
