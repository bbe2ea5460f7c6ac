/**
 * The page itself: the demo opens onto a plot with ladders, click-to-assign adds a row, undo takes
 * it back, a reload restores the session, nothing is fetched from another host, and the built
 * page's Content-Security-Policy is in force without violations.
 */
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { assignedCount, clickAPeak, clickARung, gotoApp, launch, openPage, SHOTS, waitForPlot, zoomPlot } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

describe('workbench page', () => {
  it('opens straight onto the demo: trace, peaks and ladders drawn, file and detection shown', async () => {
    const { context, page, log } = await openPage(browser);
    const t0 = Date.now();
    await gotoApp(page);
    const loadMs = Date.now() - t0;
    await expect.poll(() => page.locator('[data-testid=file-name]').textContent()).toBe('demo/trace.csv');
    // One trace line drawn by plotly; peak markers (found in the worker, so they may arrive after the
    // trace) and the ladders painted on the overlay canvas.
    await expect
      .poll(() =>
        page.evaluate(() => {
          const gd = document.querySelector('[data-testid=spectrum-plot]') as unknown as {
            data?: { meta?: { kind?: string }; x: unknown[] }[];
          };
          const overlay = (document.querySelector('[data-testid=plot-overlay]') as HTMLElement | null)?.dataset;
          const hasTrace = (gd.data ?? []).some((t) => t.meta?.kind === 'trace' && t.x.length > 0);
          return hasTrace && Number(overlay?.peaksDrawn) > 0 && Number(overlay?.rungsDrawn) > 100;
        }),
      )
      .toBe(true);
    expect(log.workers.some((u) => /analysis\.worker/.test(u))).toBe(true);
    const csp = await page.locator('meta[http-equiv="Content-Security-Policy"]').getAttribute('content');
    expect(csp).toContain("script-src 'self'");
    expect(csp).not.toContain('unsafe-eval');
    await page.waitForTimeout(300);
    await page.screenshot({ path: `${SHOTS}/01-demo.png` });
    await page.locator('[data-testid=tab-import]').click();
    await expect.poll(() => page.locator('[data-testid=import-facts]').textContent()).toContain('116,288');
    await page.screenshot({ path: `${SHOTS}/02-trace-file-panel.png` });
    expect(log.pageErrors).toEqual([]);
    expect(log.foreignRequests).toEqual([]);
    expect(await page.evaluate(() => (window as unknown as { __csp?: string[] }).__csp ?? [])).toEqual([]);
    // The parse ran in a worker.
    expect(log.workers.some((u) => /parse\.worker/.test(u))).toBe(true);
    console.info(`demo ready after ${loadMs} ms`);
    await context.close();
  });

  it('assigns a clicked peak from its candidate list, marks it, undoes and redoes it, and restores it after a reload', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    await zoomPlot(page, 0.55, 0.57);
    await clickAPeak(page);
    await page.waitForSelector('[data-testid=candidates]');
    await page.screenshot({ path: `${SHOTS}/03-candidates.png` });
    const label = await page.locator('[data-testid=candidates] tbody tr').first().locator('.line-label').textContent();
    await page.locator('[data-testid=candidate-0]').click();
    await expect.poll(() => assignedCount(page)).toBe(1);
    const row = page.locator('[data-testid=assignment-row]').first();
    expect(await row.locator('.line-label').textContent()).toBe(label);
    // Assigned peak and rung markers appear (green traces named in the figure).
    await page.screenshot({ path: `${SHOTS}/04-assigned.png` });

    await page.locator('[data-testid=undo]').click();
    await expect.poll(() => assignedCount(page)).toBe(0);
    await page.keyboard.press('Control+Shift+Z');
    await expect.poll(() => assignedCount(page)).toBe(1);
    await page.keyboard.press('Control+z');
    await expect.poll(() => assignedCount(page)).toBe(0);
    await page.keyboard.press('Control+y');
    await expect.poll(() => assignedCount(page)).toBe(1);

    // Click a rung (its tooltip shows label, position, intensity), then a peak: that line is assigned.
    const hover = await clickARung(page);
    expect(hover).toMatch(/^[pr][PQR]\d+\(\d+\)[\d.]+ cm⁻¹rel\. intensity [\d.e-]+$/);
    await expect.poll(() => page.locator('[data-testid=plot-overlay]').getAttribute('data-selected-rung')).toBe(hover.split(')')[0] + ')');
    await clickAPeak(page);
    await expect.poll(() => assignedCount(page)).toBe(2);
    const rungLabel = hover.split('(')[0] + '(' + hover.split('(')[1].split(')')[0] + ')';
    expect(await page.locator('[data-testid=assignment-row] .line-label').allTextContents()).toContain(rungLabel);

    // Keyboard: select the strongest rung and press A; with only the first guess the walk assigns
    // where one peak matches within 3σ and otherwise says why (test/browser/assignSafety.test.ts).
    await page.locator('body').click({ position: { x: 2, y: 2 } });
    await page.keyboard.press('Escape');
    await page.keyboard.press('ArrowRight');
    await page.keyboard.press('a');
    await expect.poll(() => page.locator('[data-testid=messages]').textContent()).toMatch(/Assigned .*within 3σ|not assigned: /);
    const n = await assignedCount(page);
    expect(n).toBeGreaterThanOrEqual(2);

    await page.waitForTimeout(800); // autosave runs 300 ms after the last change
    await page.reload();
    await waitForPlot(page);
    await expect.poll(() => assignedCount(page)).toBe(n);
    await expect.poll(() => page.locator('[data-testid=messages]').textContent()).toContain('Restored your last session');
    expect(log.pageErrors).toEqual([]);
    expect(log.foreignRequests).toEqual([]);
    await context.close();
  });

  it('shows help, the dark theme and every panel readably (screenshots)', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    await page.keyboard.press('?');
    await page.waitForSelector('#help-title');
    await page.screenshot({ path: `${SHOTS}/05-help.png` });
    await page.keyboard.press('Escape');
    await page.getByRole('button', { name: 'Switch to dark theme' }).click();
    await page.waitForTimeout(500);
    expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe('dark');
    await page.screenshot({ path: `${SHOTS}/06-dark.png` });
    await page.getByRole('button', { name: /Ladders/ }).click();
    await page.screenshot({ path: `${SHOTS}/07-ladder-rows.png` });
    await page.getByRole('button', { name: 'Close ladder list' }).click();
    await page.getByRole('button', { name: 'Switch to light theme' }).click();
    await page.locator('[data-testid=toggle-sim]').check();
    await page.getByLabel('obs − sim').check();
    await zoomPlot(page, 0.5, 0.56);
    await page.waitForTimeout(600);
    await page.screenshot({ path: `${SHOTS}/08-simulated.png` });
    // A double-click on the plot away from markers shows the whole trace again.
    const xRange = () =>
      page.evaluate(() =>
        (
          document.querySelector('[data-testid=spectrum-plot]') as unknown as { _fullLayout: { xaxis: { range: number[] } } }
        )._fullLayout.xaxis.range.map((v) => Math.round(v)),
      );
    expect(await xRange()).not.toEqual([1033, 1252]);
    const overlayBox = (await page.locator('[data-testid=plot-overlay]').boundingBox())!;
    const traceArea = (await page.locator('[data-testid=spectrum-plot] .nsewdrag').last().boundingBox())!;
    await page.mouse.dblclick(traceArea.x + 6, traceArea.y + 6);
    await expect.poll(xRange).toEqual([1033, 1252]);
    expect(overlayBox.width).toBeGreaterThan(0);
    await page.locator('[data-testid=tab-loomis]').click();
    await page.waitForSelector('[data-testid=loomis-plot] .main-svg');
    await page.setViewportSize({ width: 1440, height: 1400 });
    await page.waitForTimeout(400);
    await page.screenshot({ path: `${SHOTS}/09-loomis-wood.png` });
    await page.setViewportSize({ width: 1440, height: 920 });
    await page.locator('[data-testid=tab-export]').click();
    await page.screenshot({ path: `${SHOTS}/10-export.png` });
    await page.locator('[data-testid=lower-unit]').click();
    await expect.poll(() => page.locator('[data-testid=lower-B-mhz]').inputValue()).toMatch(/^873/);
    expect(log.pageErrors).toEqual([]);
    await context.close();
  });
});
