/**
 * The Levels panel: after a fit, the reduced term-value plot of the upper state and the list of
 * perturbed places. The line table is the demo's truth lines (written by globalSetup) with one upper
 * level, K' = 3, J' = 15, moved by +0.05 cm^-1 in every line that reaches it.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { assignedCount, fixture, gotoApp, launch, openPage, SHOTS } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

describe('levels panel', () => {
  it('plots the reduced term values after a fit and names a shifted level in its list', async () => {
    const rows = readFileSync(fixture('truth-lines.csv'), 'utf8').trim().split('\n');
    const header = rows[0].split(',');
    const col = (name: string) => header.indexOf(name);
    let moved = 0;
    const shifted = rows.slice(1).map((r) => {
      const c = r.split(',');
      if (+c[col('K_up')] === 3 && +c[col('J_up')] === 15) {
        c[col('wavenumber')] = (+c[col('wavenumber')] + 0.05).toFixed(6);
        moved++;
      }
      return c.join(',');
    });
    expect(moved).toBeGreaterThan(0);
    const file = join(mkdtempSync(join(tmpdir(), 'lb-levels-')), 'shifted-lines.csv');
    writeFileSync(file, [rows[0], ...shifted].join('\n') + '\n');

    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    await page.locator('[data-testid=file-input]').setInputFiles(file);
    await expect.poll(() => assignedCount(page)).toBe(rows.length - 1);
    await page.locator('[data-testid=tab-solve]').click();
    await page.locator('[data-testid=fit-run]').click();
    await page.waitForSelector('[data-testid=fit-constants]', { timeout: 60_000 });
    await page.locator('[data-testid=tab-levels]').click();
    await page.waitForSelector('[data-testid=levels-plot] .main-svg', { timeout: 30_000 });
    const list = (await page.locator('[data-testid=perturbation-list]').textContent()) ?? '';
    expect(list).toMatch(/K′ = 3/);
    expect(list).toMatch(/J′ = 15/);
    await page.screenshot({ path: `${SHOTS}/levels-panel.png` });
    await page.locator('[data-testid=levels-ordinate]').selectOption('obs-minus-calc');
    await page.waitForSelector('[data-testid=levels-plot] .main-svg');
    await page.screenshot({ path: `${SHOTS}/levels-panel-omc.png` });
    await page.locator('[data-testid=levels-state]').selectOption('lower');
    await page.waitForSelector('[data-testid=levels-plot] .main-svg');
    expect(log.pageErrors).toEqual([]);
    await context.close();
  });
});
