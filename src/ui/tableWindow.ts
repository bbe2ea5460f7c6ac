/**
 * Windowing of a long table whose rows all have one height: which rows to render for a scroll
 * position, and where to scroll so a row is in view. O(1) whatever the number of rows, with no
 * measurement of the rows and no read of the page's layout.
 */

/** Rows [start, end) to render. */
export interface RowWindow {
  start: number;
  end: number;
}

/**
 * The rows that meet the visible band of a scrolled list, plus `overscan` on each side.
 * @param scrollTopPx the list's scroll offset, px
 * @param viewportPx the height of its visible band, px
 * @param count number of rows
 * @param rowPx height of one row, px (> 0)
 * @param overscan rows rendered beyond each edge
 */
export function rowWindow(scrollTopPx: number, viewportPx: number, count: number, rowPx: number, overscan: number): RowWindow {
  if (count <= 0) return { start: 0, end: 0 };
  const top = Math.max(0, scrollTopPx);
  const first = Math.floor(top / rowPx);
  const last = Math.ceil((top + Math.max(0, viewportPx)) / rowPx); // exclusive
  const start = Math.min(count, Math.max(0, first - overscan));
  const end = Math.min(count, Math.max(start, last + overscan));
  return { start, end };
}

/**
 * The scroll offset that shows row `index` whole, moving as little as possible: unchanged when it is
 * already in view, else the row at the top (it lay above) or at the bottom (it lay below).
 * @returns the new scroll offset, px
 */
export function scrollTopShowing(index: number, scrollTopPx: number, viewportPx: number, rowPx: number): number {
  const top = index * rowPx;
  const bottom = top + rowPx;
  if (top < scrollTopPx) return top;
  if (bottom > scrollTopPx + viewportPx) return Math.max(0, bottom - viewportPx);
  return scrollTopPx;
}
