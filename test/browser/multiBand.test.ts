/**
 * Several bands on the page: the two-isotopologue demo (public/demo/system*.json, invented) opens
 * from the model panel with a colour and a switch per band; a clicked peak offers lines of both
 * isotopologues; a line table with band columns assigns lines of every band; the joint fit runs in
 * the worker and returns the true constants; the exported line table carries the band; and a
 * single-band session still fits exactly as the one-band code does.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Browser, Download, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { fitBand } from '../../src/fit/fitBand';
import { lineTableParse, lineTableSerialize } from '../../src/io/lineTable';
import { modelFileParse } from '../../src/io/modelFile';
import { systemFileParse } from '../../src/io/systemFile';
import { systemLineTableParse } from '../../src/io/systemLineTable';
import { systemLines } from '../../src/physics/system/systemLines';
import { assignedCount, clickAPeak, fixture, gotoApp, launch, openPage, SHOTS, zoomPlot } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

async function downloadOf(page: Page, testId: string): Promise<{ name: string; text: string }> {
  const [d] = (await Promise.all([page.waitForEvent('download'), page.locator(`[data-testid=${testId}]`).click()])) as [Download, unknown];
  return { name: d.suggestedFilename(), text: readFileSync((await d.path())!, 'utf8') };
}

/** The true system's strong lines (seeded noise 0.0003 cm^-1) as a line table with band and species columns. */
function truthTable(): { path: string; count: number } {
  const truth = systemFileParse(readFileSync('public/demo/system-truth.json', 'utf8')).model;
  const lines = systemLines(truth, { minIntensity: 0.05 });
  let a = 15;
  const u = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), a | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const rows = [];
  for (let i = 0; i < lines.count; i++) {
    if (lines.jLower[i] > 30 || lines.kLower[i] > 6) continue;
    const ref = lines.bandRefs[lines.bandIndex[i]];
    rows.push({
      id: `t${i}`,
      jUpper: lines.jUpper[i],
      kUpper: lines.kUpper[i],
      jLower: lines.jLower[i],
      kLower: lines.kLower[i],
      observedCm1: lines.wavenumberCm1[i] + 0.0003 * Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u()),
      uncertaintyCm1: 0.0003,
      isBlended: false,
      isExcluded: false,
      note: '',
      band: ref.band,
      species: ref.species,
    });
  }
  const path = join(inject('fixtureDir'), 'system-truth-lines.csv');
  writeFileSync(path, lineTableSerialize(rows, { shape: 'prolate', hasBandColumns: true }));
  return { path, count: rows.length };
}

describe('several bands on the page', () => {
  it('draws each band with its switch, offers candidates of both isotopologues, fits them jointly and exports the band', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    await page.locator('[data-testid=system-tree] summary').first().click();
    await page.getByRole('button', { name: 'Open the two-isotopologue demo' }).click();
    await expect.poll(() => page.locator('[data-testid=file-name]').textContent(), { timeout: 30_000 }).toBe('demo/system-trace.csv');
    const switches = page.locator('[data-testid=band-switches] .band-switch');
    await expect.poll(() => switches.count(), { timeout: 20_000 }).toBe(3);
    const rungs = () => page.locator('[data-testid=plot-overlay]').evaluate((el) => Number((el as HTMLElement).dataset.rungsDrawn));
    await expect.poll(rungs, { timeout: 20_000 }).toBeGreaterThan(100);
    const allOn = await rungs();
    await page.screenshot({ path: `${SHOTS}/40-several-bands.png` });
    // The hot band switched off: fewer rungs; on again: as before.
    await page.getByRole('checkbox', { name: 'Show the ladders of band hot (LB-7)' }).click();
    await expect.poll(rungs, { timeout: 20_000 }).toBeLessThan(allOn);
    await page.getByRole('checkbox', { name: 'Show the ladders of band hot (LB-7)' }).click();
    await expect.poll(rungs, { timeout: 20_000 }).toBe(allOn);

    // A peak near the band centre: its candidates come from both isotopologues.
    await zoomPlot(page, 0.45, 0.5);
    await clickAPeak(page);
    await page.waitForSelector('[data-testid=candidates]', { timeout: 20_000 });
    const bands = await page.locator('[data-testid=candidates] .band-tag').allTextContents();
    expect(bands.some((b) => b.endsWith('·LB-7'))).toBe(true);
    expect(bands.some((b) => b.endsWith('·LB-7-66'))).toBe(true);
    await page.screenshot({ path: `${SHOTS}/41-candidates-two-isotopologues.png` });
    const n66 = bands.findIndex((b) => b.endsWith('·LB-7-66'));
    await page.locator(`[data-testid=candidate-${n66}]`).click();
    await expect.poll(() => assignedCount(page), { timeout: 20_000 }).toBe(1);
    await expect.poll(() => page.locator('[data-testid=row-band]').first().textContent()).toBe('nu4·LB-7-66');

    // Lines of every band from a line table with band columns, then the joint fit in the worker.
    const table = truthTable();
    await page.locator('[data-testid=file-input]').setInputFiles(table.path);
    // The clicked line stays beside them unless the table holds the same line of the same band.
    await expect.poll(() => assignedCount(page), { timeout: 30_000 }).toBeGreaterThanOrEqual(table.count);
    expect(await assignedCount(page)).toBeLessThanOrEqual(table.count + 1);
    await page.locator('[data-testid=tab-solve]').click();
    await page.locator('[data-testid=fit-run]').click();
    // Strong lines only: the hot band gives its Q branches, which fix B′ − B″ of v3v4 ← v3 but not
    // both; the page refuses in words and offers to fix v3's B (the demo's first guess).
    await page.waitForSelector('[data-testid=fit-refusal]', { timeout: 60_000 });
    expect(await page.locator('[data-testid=fit-refusal]').textContent()).toContain('LB-7/v3.B');
    await page.locator('[data-testid=fit-apply-suggestion]').click();
    await page.waitForSelector('[data-testid=fit-constants]', { timeout: 60_000 });
    expect(log.workers.some((u) => /solver\.worker/.test(u))).toBe(true);
    const valueOf = async (key: string) =>
      Number((await page.locator(`[data-testid=fit-constants] tr[data-key="${key}"] td`).first().textContent())!.split('(')[0]);
    // Ref: public/demo/system-truth.json (invented): v4 origins 1148.6431 and 1139.2876 cm^-1, the hot
    // band's upper state 1685.9012 cm^-1; lines carry 0.0003 cm^-1 noise, so within 0.002 cm^-1 even
    // with the one hand-clicked line.
    expect(Math.abs((await valueOf('LB-7/v4.origin')) - 1148.6431)).toBeLessThan(2e-3);
    expect(Math.abs((await valueOf('LB-7-66/v4.origin')) - 1139.2876)).toBeLessThan(2e-3);
    await page.screenshot({ path: `${SHOTS}/42-joint-fit.png` });

    // Combination differences of the panels' band (LB-7 nu4): its ground state, from every LB-7
    // band that reaches it (only nu4 in the demo), each pair naming its band; never LB-7-66's lines.
    await page.locator('[data-testid=tab-combination]').click();
    await expect
      .poll(() => page.locator('[data-testid=cd-state-bands]').textContent(), { timeout: 20_000 })
      .toMatch(/State ground of LB-7, from the band nu4/);
    const pairBands = await page.locator('[data-testid=cd-pairs] tbody tr td:first-child').allTextContents();
    expect(pairBands.length).toBeGreaterThan(10);
    expect(new Set(pairBands)).toEqual(new Set(['nu4']));
    await page.screenshot({ path: `${SHOTS}/43-combination-several-bands.png` });

    await page.locator('[data-testid=tab-export]').click();
    const lines = await downloadOf(page, 'export-lines');
    expect(lines.text.split('\n')[0]).toBe(
      // Rows of degenerate states keep their levels' l (and tags where they have them), so they read back as the same lines.
      'J_up,K_up,J_lo,K_lo,wavenumber,uncertainty,label,calc,obs_minus_calc,flags,note,id,peak_id,band,species,l_up,l_lo,tag_up,tag_lo',
    );
    expect(lines.text).toContain(',hot,LB-7,');
    expect(lines.text).toContain(',nu4,LB-7-66,');
    // It reads back with the system columns, every row naming its band.
    const back = systemLineTableParse(lines.text);
    expect(back.rows.every((r) => r.band !== null)).toBe(true);
    const report = await downloadOf(page, 'export-report');
    expect(report.text).toContain('## Bands');
    const model = await downloadOf(page, 'export-model');
    expect(systemFileParse(model.text).model.species.map((s) => s.name)).toEqual(['LB-7', 'LB-7-66']);
    expect(log.pageErrors).toEqual([]);
    await context.close();
  });

  it('starts on the two-isotopologue demo, and the model panel opens the single-band demo and back', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page, 'bands');
    await expect.poll(() => page.locator('[data-testid=file-name]').textContent(), { timeout: 30_000 }).toBe('demo/system-trace.csv');
    await expect.poll(() => page.locator('[data-testid=band-switches] .band-switch').count(), { timeout: 20_000 }).toBe(3);
    // Nothing to undo back out of: the demo is the starting point.
    expect(await page.locator('[data-testid=undo]').isDisabled()).toBe(true);
    // The page itself never scrolls: the sidebar and workspace scroll inside it (the sidebar's visually
    // hidden captions once sat against the page and made it twice the window's height).
    expect(await page.evaluate(() => document.scrollingElement!.scrollHeight - window.innerHeight)).toBeLessThanOrEqual(0);
    await page.locator('[data-testid=demo-choice]').getByRole('button', { name: 'single band' }).click();
    await expect.poll(() => page.locator('[data-testid=file-name]').textContent(), { timeout: 30_000 }).toBe('demo/trace.csv');
    await expect.poll(() => page.locator('[data-testid=band-switches]').count(), { timeout: 20_000 }).toBe(0);
    await page.locator('[data-testid=demo-choice]').getByRole('button', { name: 'two isotopologues + hot band' }).click();
    await expect.poll(() => page.locator('[data-testid=band-switches] .band-switch').count(), { timeout: 30_000 }).toBe(3);
    expect(log.pageErrors).toEqual([]);
    await context.close();
  });

  it('still fits a single-band session exactly as the one-band fit does', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    expect(await page.locator('[data-testid=band-switches]').count()).toBe(0);
    await page.locator('[data-testid=file-input]').setInputFiles(fixture('truth-lines.csv'));
    const rows = lineTableParse(readFileSync(fixture('truth-lines.csv'), 'utf8')).assignments;
    await expect.poll(() => assignedCount(page), { timeout: 30_000 }).toBe(rows.length);
    await page.locator('[data-testid=tab-solve]').click();
    await page.locator('[data-testid=fit-run]').click();
    await page.waitForSelector('[data-testid=fit-constants]', { timeout: 60_000 });
    const guess = modelFileParse(readFileSync('public/demo/model.json', 'utf8'));
    const direct = fitBand({ model: guess.model, floated: guess.floated, lines: rows });
    expect(direct.ok).toBe(true);
    if (!direct.ok) return;
    const shown = (await page.locator('[data-testid=fit-constants] tr[data-key="upper.origin"] td').first().textContent())!;
    // The value shown is the one-band fit's, to the digits shown.
    const v = Number(shown.split('(')[0]);
    expect(Math.abs(v - direct.result.parameters['upper.origin'].value)).toBeLessThan(1e-6);
    expect(log.pageErrors).toEqual([]);
    await context.close();
  });
});
