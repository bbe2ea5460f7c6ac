/**
 * The canvas overlay (ladders, peak markers) stays on the plot's axis while the pointer drags: a
 * box-zoom drag leaves both where they are until the button is released, a pan of the x axis moves
 * both together. The vertical marks of a click (the peak whose candidates are open, the selected
 * row) are painted on the overlay where plotly's axis puts their wavenumbers, without plotly
 * drawing the figure again.
 */
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { assignedCount, clickAPeak, gotoApp, launch, openPage, SHOTS, zoomPlot } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

/** The x range plotly has laid out and the one the overlay last painted, cm^-1. */
async function ranges(page: Page): Promise<{ axis: number[]; painted: number[] }> {
  return page.evaluate(() => {
    const gd = document.querySelector('[data-testid=spectrum-plot]') as unknown as { _fullLayout?: { xaxis?: { range?: unknown[] } } };
    const painted = (document.querySelector('[data-testid=plot-overlay]') as HTMLElement | null)?.dataset.xRange ?? '';
    return { axis: (gd._fullLayout?.xaxis?.range ?? []).map(Number), painted: painted.split(',').map(Number) };
  });
}

/** Two animation frames: the overlay paints once per frame. */
async function frames(page: Page): Promise<void> {
  await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r))));
}

describe('plot overlay while dragging', () => {
  it('keeps the ladders on the drawn range during a box-zoom drag and moves them with a pan of the axis', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    await expect
      .poll(async () => JSON.stringify((await ranges(page)).painted), { timeout: 30_000 })
      .toBe(JSON.stringify((await ranges(page)).axis));
    const before = await ranges(page);

    // Box zoom: button down, dragged across 30 % of the plot, not yet released.
    const area = (await page.locator('[data-testid=spectrum-plot] .nsewdrag').first().boundingBox())!;
    const y = area.y + area.height * 0.85;
    await page.mouse.move(area.x + area.width * 0.3, y);
    await page.mouse.down();
    await page.mouse.move(area.x + area.width * 0.6, y, { steps: 6 });
    await frames(page);
    await page.waitForTimeout(200);
    const during = await ranges(page);
    await page.screenshot({ path: `${SHOTS}/70-box-zoom-drag.png` });
    // plotly has not moved the axis, and the overlay is still painted for it (it used to follow the box).
    expect(during.axis).toEqual(before.axis);
    expect(during.painted).toEqual(before.axis);
    await page.mouse.up();
    await expect
      .poll(async () => (await ranges(page)).axis[1] - (await ranges(page)).axis[0], { timeout: 15_000 })
      .toBeLessThan(0.5 * (before.axis[1] - before.axis[0]));
    await expect
      .poll(async () => JSON.stringify((await ranges(page)).painted), { timeout: 15_000 })
      .toBe(JSON.stringify((await ranges(page)).axis));
    const zoomed = await ranges(page);

    // Pan: drag the middle of the x axis 120 px, button still down: plotly moves the axis and the
    // overlay follows it in the same frames.
    const axis = (await page.locator('[data-testid=spectrum-plot] .draglayer .ewdrag').first().boundingBox())!;
    const cx = axis.x + axis.width / 2;
    const cy = axis.y + axis.height / 2;
    await page.mouse.move(cx, cy);
    await page.mouse.down();
    await page.mouse.move(cx + 120, cy, { steps: 6 });
    await frames(page);
    await page.waitForTimeout(200);
    const panning = await ranges(page);
    expect(panning.axis[0]).toBeLessThan(zoomed.axis[0]);
    expect(panning.painted[0]).toBeCloseTo(panning.axis[0], 9);
    expect(panning.painted[1]).toBeCloseTo(panning.axis[1], 9);
    await page.mouse.up();
    expect(log.pageErrors).toEqual([]);
    await context.close();
  });

  it('repaints only the boxes around a newly assigned peak, and they come out as a whole repaint paints them', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    await zoomPlot(page, 0.55, 0.6);
    const overlay = page.locator('[data-testid=plot-overlay]');
    // The lower canvas (rungs, row names, peak markers) under the overlay's own, as RGBA bytes.
    const lowerPixels = () =>
      page.evaluate(() => {
        const top = document.querySelector('[data-testid=plot-overlay]') as HTMLCanvasElement;
        const lower = top.previousElementSibling as HTMLCanvasElement;
        const data = lower.getContext('2d')!.getImageData(0, 0, lower.width, lower.height).data;
        return { w: lower.width, h: lower.height, px: Array.from(data) };
      });
    await clickAPeak(page);
    await page.waitForSelector('[data-testid=candidates] [data-testid=candidate-0]', { timeout: 15_000 });
    await page.locator('[data-testid=candidate-0]').click();
    await expect.poll(() => assignedCount(page), { timeout: 15_000 }).toBe(1);
    await expect.poll(() => overlay.getAttribute('data-peaks-repainted'), { timeout: 15_000 }).toMatch(/^[1-9]\d*$/);
    await frames(page);
    const partial = await lowerPixels();
    // Nothing but the theme changes twice: each change paints the whole canvas.
    await page.getByRole('button', { name: 'Switch to dark theme' }).click();
    await expect.poll(() => page.evaluate(() => document.documentElement.dataset.theme)).toBe('dark');
    await frames(page);
    await page.getByRole('button', { name: 'Switch to light theme' }).click();
    await expect.poll(() => page.evaluate(() => document.documentElement.dataset.theme)).not.toBe('dark');
    await expect.poll(() => overlay.getAttribute('data-peaks-repainted'), { timeout: 15_000 }).toBe('all');
    await page.waitForTimeout(500);
    await frames(page);
    const whole = await lowerPixels();
    expect([whole.w, whole.h]).toEqual([partial.w, partial.h]);
    // The same pixels but for anti-aliasing along the markers' edges (one path of many markers is
    // rasterised a little differently from a path of a few): no pixel differs by more than an edge
    // does (a missing or stale marker differs by its whole opacity), and every difference lies in
    // the one repainted box (at most 2·7 px and a pixel of rounding on each side, CSS px).
    let painted = 0;
    let worst = 0;
    const xs: number[] = [];
    const ys: number[] = [];
    for (let k = 0; k < whole.px.length; k += 4) {
      if (whole.px[k + 3] > 0) painted++;
      // Colours compared as painted (weighted by their opacity; a nearly transparent pixel's colour means little).
      const pre = (px: number[], c: number) => (c === 3 ? px[k + 3] : (px[k + c] * px[k + 3]) / 255);
      const d = Math.max(...[0, 1, 2, 3].map((c) => Math.abs(pre(whole.px, c) - pre(partial.px, c))));
      if (d < 1) continue;
      worst = Math.max(worst, d);
      xs.push((k / 4) % whole.w);
      ys.push(Math.floor(k / 4 / whole.w));
    }
    const dpr = await page.evaluate(() => window.devicePixelRatio);
    expect(painted).toBeGreaterThan(1000);
    expect(worst).toBeLessThanOrEqual(96);
    if (xs.length > 0) {
      expect(Math.max(...xs) - Math.min(...xs)).toBeLessThanOrEqual(16 * dpr);
      expect(Math.max(...ys) - Math.min(...ys)).toBeLessThanOrEqual(16 * dpr);
    }
    expect(log.pageErrors).toEqual([]);
    await context.close();
  });

  it('marks the clicked peak and then the new row at their wavenumbers on the overlay, with a band hidden, and plotly does not draw again', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page, 'bands');
    await expect.poll(() => page.locator('[data-testid=band-switches] .band-switch').count(), { timeout: 30_000 }).toBe(3);
    const hot = page.getByRole('checkbox', { name: 'Show the ladders of band hot (LB-7)' });
    await hot.click();
    await expect.poll(() => hot.isChecked()).toBe(false);
    await zoomPlot(page, 0.45, 0.5);
    await frames(page);
    /** The marks painted (kind, cm^-1, column) and the column plotly's x axis gives each wavenumber (canvas px). */
    const marks = () =>
      page.evaluate(() => {
        const canvas = document.querySelector('[data-testid=plot-overlay]') as HTMLElement;
        const gd = document.querySelector('[data-testid=spectrum-plot]') as unknown as HTMLElement & {
          _fullLayout: { xaxis: { _offset: number; l2p: (x: number) => number } };
        };
        const xa = gd._fullLayout.xaxis;
        const shift = gd.getBoundingClientRect().left - canvas.getBoundingClientRect().left + xa._offset;
        return (canvas.dataset.marks ?? '')
          .split(';')
          .filter(Boolean)
          .map((m) => {
            const [kind, x, px] = m.split('@');
            return { kind, xCm1: Number(x), xPx: Number(px), axisPx: shift + xa.l2p(Number(x)) };
          });
      });
    // The figure plotly was last handed: a click that only marks, assigns or selects leaves it as it is.
    await page.evaluate(() => {
      const w = window as unknown as { __figureLayout: unknown };
      w.__figureLayout = (document.querySelector('[data-testid=spectrum-plot]') as unknown as { layout: unknown }).layout;
    });
    const isSameFigure = () =>
      page.evaluate(
        () =>
          (window as unknown as { __figureLayout: unknown }).__figureLayout ===
          (document.querySelector('[data-testid=spectrum-plot]') as unknown as { layout: unknown }).layout,
      );
    expect(await marks()).toEqual([]);

    await clickAPeak(page);
    await page.waitForSelector('[data-testid=candidates] [data-testid=candidate-0]', { timeout: 20_000 });
    const peakCm1 = Number(/at ([\d.]+) cm/.exec((await page.locator('[data-testid=candidates]').getAttribute('aria-label')) ?? '')?.[1]);
    await expect.poll(async () => (await marks()).map((m) => m.kind), { timeout: 10_000 }).toEqual(['candidate']);
    const [open] = await marks();
    // The list names the peak to 4 decimals.
    expect(Math.abs(open.xCm1 - peakCm1)).toBeLessThan(6e-5);
    expect(Math.abs(open.xPx - open.axisPx)).toBeLessThan(0.1);

    await page.locator('[data-testid=candidate-0]').click();
    await expect.poll(() => assignedCount(page), { timeout: 20_000 }).toBe(1);
    await expect.poll(async () => (await marks()).map((m) => m.kind), { timeout: 10_000 }).toEqual(['selected']);
    const [row] = await marks();
    const obsShown = Number(await page.locator('[data-testid=assignment-row] [role=cell].num').first().textContent());
    // The table shows the observed position to 5 decimals; the mark is the row's (the peak's) position.
    expect(Math.abs(row.xCm1 - obsShown)).toBeLessThan(6e-6);
    expect(Math.abs(row.xCm1 - peakCm1)).toBeLessThan(6e-5);
    expect(Math.abs(row.xPx - row.axisPx)).toBeLessThan(0.1);
    await page.screenshot({ path: `${SHOTS}/17-marks-several-bands.png` });
    expect(await isSameFigure()).toBe(true);

    // Deleting the row takes its mark away.
    await page
      .locator('[data-testid=assignment-row]')
      .getByRole('button', { name: /^Delete assignment/ })
      .click();
    await expect.poll(() => assignedCount(page), { timeout: 20_000 }).toBe(0);
    await expect.poll(async () => (await marks()).length, { timeout: 10_000 }).toBe(0);
    expect(await isSameFigure()).toBe(true);
    expect(log.pageErrors).toEqual([]);
    await context.close();
  });
});
