/**
 * Files in and out: a chosen and a dropped trace load with progress; a malformed file leaves the
 * session alone with an error in words; markup in a file's name or title executes nothing; a line
 * table fits in the worker; every export downloads with checked contents; a project file opens
 * back to the same state.
 */
import { readFileSync } from 'node:fs';
import type { Browser, Download, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { assignedCount, clickAPeak, fixture, gotoApp, launch, openPage, SHOTS, waitForPlot, zoomPlot } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

async function downloadOf(page: Page, testId: string): Promise<{ name: string; text: string }> {
  const [d] = (await Promise.all([page.waitForEvent('download'), page.locator(`[data-testid=${testId}]`).click()])) as [Download, unknown];
  const path = await d.path();
  return { name: d.suggestedFilename(), text: readFileSync(path!, 'utf8') };
}

async function dropFile(page: Page, name: string, text: string): Promise<void> {
  await page.evaluate(
    ({ name, text }) => {
      const dt = new DataTransfer();
      dt.items.add(new File([text], name, { type: 'text/plain' }));
      document.body.dispatchEvent(new DragEvent('dragenter', { dataTransfer: dt, bubbles: true }));
      document.body.dispatchEvent(new DragEvent('dragover', { dataTransfer: dt, bubbles: true, cancelable: true }));
      document.body.dispatchEvent(new DragEvent('drop', { dataTransfer: dt, bubbles: true, cancelable: true }));
    },
    { name, text },
  );
}

describe('files', () => {
  it('loads a chosen trace and a dropped one; a malformed file keeps the session; markup in names runs nothing', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    await page.locator('[data-testid=file-input]').setInputFiles(fixture('small-trace.csv'));
    await expect.poll(() => page.locator('[data-testid=file-name]').textContent(), { timeout: 30_000 }).toBe('small-trace.csv');
    await page.locator('[data-testid=tab-import]').click();
    await expect.poll(() => page.locator('[data-testid=import-facts]').textContent()).toContain('20,001');

    // Dropped anywhere on the page.
    await dropFile(page, 'dropped.csv', readFileSync(fixture('small-trace.csv'), 'utf8'));
    await expect.poll(() => page.locator('[data-testid=file-name]').textContent(), { timeout: 30_000 }).toBe('dropped.csv');

    // A malformed file: error in words, trace and assignments unchanged.
    const before = await page.locator('[data-testid=import-facts]').textContent();
    await page.locator('[data-testid=file-input]').setInputFiles(fixture('broken.csv'));
    await expect
      .poll(() => page.locator('.message.error').last().textContent(), { timeout: 30_000 })
      .toMatch(/Could not read broken\.csv.*unchanged/);
    expect(await page.locator('[data-testid=file-name]').textContent()).toBe('dropped.csv');
    expect(await page.locator('[data-testid=import-facts]').textContent()).toBe(before);
    await page.screenshot({ path: `${SHOTS}/11-malformed-file.png` });

    // Markup in the file name and in the JCAMP-DX title is shown as text and never runs.
    const evil = '<img src=x onerror="window.__xss=3">.jdx';
    await page
      .locator('[data-testid=file-input]')
      .setInputFiles({ name: evil, mimeType: 'text/plain', buffer: readFileSync(fixture('hostile.jdx')) });
    await expect.poll(() => page.locator('[data-testid=file-name]').textContent(), { timeout: 30_000 }).toBe(evil);
    await page.locator('[data-testid=tab-import]').click();
    await expect.poll(() => page.locator('[data-testid=import-facts]').textContent()).toContain('<script>window.__xss=2</script>');
    await page.waitForTimeout(500);
    expect(await page.evaluate(() => (window as unknown as { __xss?: number }).__xss)).toBeUndefined();
    expect(await page.locator('img[src=x]').count()).toBe(0);
    await page.screenshot({ path: `${SHOTS}/12-hostile-title.png` });
    expect(log.pageErrors).toEqual([]);
    expect(log.foreignRequests).toEqual([]);
    await context.close();
  });

  it('scrolls the table to a row assigned outside its window', async () => {
    const { context, page } = await openPage(browser);
    await gotoApp(page);
    await page.locator('[data-testid=file-input]').setInputFiles(fixture('truth-lines.csv'));
    const n = readFileSync(fixture('truth-lines.csv'), 'utf8').trim().split('\n').length - 1;
    await expect.poll(() => assignedCount(page)).toBe(n);
    // Sorted by obs and scrolled to the end, the table shows the highest wavenumbers only.
    await page.getByRole('button', { name: /^obs/ }).click();
    const body = page.locator('.tbody[role=rowgroup]').first();
    await body.evaluate((el) => (el.scrollTop = el.scrollHeight));
    await page.waitForTimeout(300);
    // A new line low in the band sorts far above that window.
    await zoomPlot(page, 0.2, 0.23);
    await clickAPeak(page);
    await page.waitForSelector('[data-testid=candidates]');
    await page.locator('[data-testid=candidates] tbody tr:not(.is-assigned) [data-testid^=candidate-]').first().click();
    await expect.poll(() => assignedCount(page)).toBe(n + 1);
    const selected = page.locator('[data-testid=assignment-row][aria-selected=true]');
    await expect.poll(() => selected.count(), { timeout: 10_000 }).toBe(1);
    const [rowBox, bodyBox] = [(await selected.boundingBox())!, (await body.boundingBox())!];
    expect(rowBox.y).toBeGreaterThanOrEqual(bodyBox.y - 1);
    expect(rowBox.y + rowBox.height).toBeLessThanOrEqual(bodyBox.y + bodyBox.height + 1);
    // The rendered rows stack one row height (30 px) apart in obs order, the row at index i at
    // i · 30 px from the top of the scrolled list (the window of rows is placed as a whole).
    const placed = await page.evaluate(() => {
      const body = document.querySelector('.tbody[role=rowgroup]') as HTMLElement;
      const top = body.getBoundingClientRect().top - body.scrollTop;
      return Array.from(body.querySelectorAll('[data-testid=assignment-row]')).map((el) => ({
        y: el.getBoundingClientRect().top - top,
        obs: Number(el.querySelectorAll('[role=cell].num')[0].textContent),
      }));
    });
    expect(placed.length).toBeGreaterThan(5);
    for (let k = 1; k < placed.length; k++) {
      expect(placed[k].y - placed[k - 1].y).toBeCloseTo(30, 3);
      expect(placed[k].obs).toBeGreaterThanOrEqual(placed[k - 1].obs);
    }
    expect(placed[0].y % 30).toBeCloseTo(0, 3);
    await context.close();
  });

  it('fits a line table in the worker, accepts the constants, and downloads every export with checked contents', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    await page.locator('[data-testid=file-input]').setInputFiles(fixture('truth-lines.csv'));
    const expected = readFileSync(fixture('truth-lines.csv'), 'utf8').trim().split('\n').length - 1;
    await expect.poll(() => assignedCount(page)).toBe(expected);
    await page.screenshot({ path: `${SHOTS}/13-assignments-table.png` });

    await page.locator('[data-testid=tab-solve]').click();
    await page.locator('[data-testid=fit-run]').click();
    await page.waitForSelector('[data-testid=fit-constants]', { timeout: 60_000 });
    expect(log.workers.some((u) => /solver\.worker/.test(u))).toBe(true);
    const originRow = page.locator('[data-testid=fit-constants] tr[data-key="upper.origin"]');
    // Ref: public/demo/truth.json, upper.origin = 1148.6431 cm^-1; lines carry 0.0003 cm^-1 noise,
    // so the fitted origin agrees to well within 0.001 cm^-1.
    const value = Number((await originRow.locator('td').first().textContent())!.split('(')[0]);
    expect(Math.abs(value - 1148.6431)).toBeLessThan(1e-3);
    await page.waitForSelector('[data-testid=corr-plot] .main-svg');
    await page.waitForSelector('[data-testid=residual-plot] .main-svg');
    await page.setViewportSize({ width: 1440, height: 1500 }); // room for the whole fit panel
    await page.waitForTimeout(400);
    await page.screenshot({ path: `${SHOTS}/14-fit.png` });
    await page.locator('[data-testid=fit-accept]').click();
    await expect.poll(() => page.locator('[data-testid=upper-origin]').inputValue()).toMatch(/^1148\.64/);

    await page.locator('[data-testid=tab-combination]').click();
    await page.waitForSelector('[data-testid=cd-plot] .main-svg');
    await page.screenshot({ path: `${SHOTS}/15-combination-differences.png` });
    await page.setViewportSize({ width: 1440, height: 920 });

    await page.locator('[data-testid=tab-export]').click();
    const table = await downloadOf(page, 'export-lines');
    expect(table.name).toMatch(/assignments\.csv$/);
    const header = table.text.split('\n')[0];
    expect(header).toBe('J_up,K_up,J_lo,K_lo,wavenumber,uncertainty,label,calc,obs_minus_calc,flags,note,id,peak_id');
    expect(table.text.trim().split('\n').length - 1).toBe(expected);
    const report = await downloadOf(page, 'export-report');
    expect(report.text).toMatch(/^# Fit report: LB-7/);
    expect(report.text).toContain('`upper.origin`');
    expect(report.text).toContain(`N = ${expected}`);
    expect(report.text).toMatch(/Ladder Bench 0\.1\.0/);
    const simLines = await downloadOf(page, 'export-sim-lines');
    expect(simLines.text.split('\n')[0]).toBe('J_up,K_up,J_lo,K_lo,label,wavenumber_cm-1,intensity_rel,E_lower_cm-1,honl_london');
    const spectrum = await downloadOf(page, 'export-sim-spectrum');
    expect(spectrum.text.split('\n')[0]).toBe('wavenumber_cm-1,absorbance_sim');
    expect(spectrum.text.split('\n').length).toBeGreaterThan(10_000);
    const model = await downloadOf(page, 'export-model');
    expect(JSON.parse(model.text).upper.origin).toBeCloseTo(1148.6431, 3);
    const project = await downloadOf(page, 'export-project');
    const doc = JSON.parse(project.text);
    expect(doc.format).toBe('ladder-bench-project');
    expect(doc.version).toBe(2);
    expect(doc.session.assignments.length).toBe(expected);

    // Delete everything, then open the project: the same state comes back.
    await page.locator('[data-testid=tab-assignments]').click();
    for (let i = 0; i < 3; i++)
      await page
        .locator('[data-testid=assignment-row]')
        .first()
        .getByRole('button', { name: /Delete assignment/ })
        .click();
    await expect.poll(() => assignedCount(page)).toBe(expected - 3);
    const parseWorkers = () => log.workers.filter((u) => /parse\.worker/.test(u)).length;
    const workersBefore = parseWorkers();
    await page
      .locator('[data-testid=file-input]')
      .setInputFiles({ name: project.name, mimeType: 'application/json', buffer: Buffer.from(project.text) });
    // Assignments exist, so the page asks before the project replaces them.
    await page.locator('[data-testid=confirm-open]').click();
    // The project was saved with the Export tab open, and opens that way again.
    await expect.poll(() => page.locator('[data-testid=tab-export]').getAttribute('aria-selected'), { timeout: 30_000 }).toBe('true');
    // It was read in a parse worker, not on the page's thread.
    expect(parseWorkers()).toBeGreaterThan(workersBefore);
    await page.locator('[data-testid=tab-assignments]').click();
    await expect.poll(() => assignedCount(page)).toBe(expected);
    await waitForPlot(page);
    await page.locator('[data-testid=tab-solve]').click();
    await page.waitForSelector('[data-testid=fit-constants]');
    expect(log.pageErrors).toEqual([]);
    expect(log.foreignRequests).toEqual([]);
    await context.close();
  });
});
