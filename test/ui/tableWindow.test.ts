import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { rowWindow, scrollTopShowing } from '../../src/ui/tableWindow';

// Checks against the definition of a fixed-height list (common practice for windowed tables): row i
// occupies [i·h, (i+1)·h); it is visible when that meets [scrollTop, scrollTop + viewport).
const visible = (i: number, top: number, view: number, h: number) => i * h < top + view && (i + 1) * h > top;

describe('rowWindow', () => {
  it('renders every row that meets the visible band, the overscan on each side, and nothing past the list', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 20_000 }),
        fc.integer({ min: 0, max: 700_000 }),
        fc.integer({ min: 0, max: 1200 }),
        fc.integer({ min: 1, max: 60 }),
        fc.integer({ min: 0, max: 20 }),
        (count, top, view, h, over) => {
          const w = rowWindow(top, view, count, h, over);
          expect(0 <= w.start && w.start <= w.end && w.end <= count).toBe(true);
          const shown = Array.from({ length: count }, (_, i) => i).filter((i) => visible(i, top, view, h));
          for (const i of shown) expect(i >= w.start && i < w.end).toBe(true);
          if (shown.length > 0) {
            expect(w.start).toBe(Math.max(0, shown[0] - over));
            expect(w.end).toBe(Math.min(count, shown[shown.length - 1] + 1 + over));
          }
        },
      ),
      { numRuns: 300 },
    );
  });

  it('gives the first rows of a list not yet measured, and none of an empty one', () => {
    expect(rowWindow(0, 0, 10_000, 30, 8)).toEqual({ start: 0, end: 8 });
    expect(rowWindow(0, 240, 0, 30, 8)).toEqual({ start: 0, end: 0 });
    // 240 px at 30 px a row: rows 100–107 in view from 3000 px, 92–115 with 8 more each side.
    expect(rowWindow(3000, 240, 10_000, 30, 8)).toEqual({ start: 92, end: 116 });
  });
});

describe('scrollTopShowing', () => {
  it('leaves a row in view where it is, and otherwise brings it whole to the nearer edge', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 10_000 }),
        fc.integer({ min: 0, max: 300_000 }),
        fc.integer({ min: 60, max: 1200 }),
        fc.integer({ min: 1, max: 60 }),
        (i, top, view, h) => {
          const to = scrollTopShowing(i, top, view, h);
          // Whole row in view afterwards.
          expect(i * h >= to && (i + 1) * h <= to + view).toBe(true);
          if (i * h >= top && (i + 1) * h <= top + view) expect(to).toBe(top);
          else if (i * h < top) expect(to).toBe(i * h);
          else expect(to).toBe((i + 1) * h - view);
        },
      ),
      { numRuns: 300 },
    );
  });
});
