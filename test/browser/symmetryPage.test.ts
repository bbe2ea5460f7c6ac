/**
 * Symmetry and interaction constants on the page: a system file of an invented C3v molecule (an E
 * state with q22, a ground state with h3 whose K = 3 levels split into A1/A2, a Coriolis coupling
 * to an A1 state) opens from the file input; the model panel lists q22 and the coupling's C1; the
 * candidate list, the ladder tooltip and the table name the A1/A2 member of a K = 3 pair; the
 * exported line table carries the tags; and a single-band model file with q22 opens as a one-band
 * system rather than being refused.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Browser, Download, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { systemFileParse } from '../../src/io/systemFile';
import { systemLineTableParse } from '../../src/io/systemLineTable';
import { systemLines } from '../../src/physics/system/systemLines';
import { assignedCount, clickAPeak, gotoApp, launch, openPage, SHOTS } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

/** Invented C3v symmetric top (constants made up for this test; h3 exaggerated so the K = 3 pairs split by ~0.03 cm^-1). */
const SYSTEM = {
  temperature: 200,
  jMax: 30,
  kMax: 8,
  species: [
    {
      name: 'LB-3v',
      shape: 'prolate',
      mass: 40,
      abundance: 1,
      pointGroup: 'C3v',
      spinWeightsBySymmetry: { A1: 4, A2: 4, E: 2 },
      states: {
        ground: {
          B: 0.2512,
          A: { value: 5.21, fixed: true },
          DJ: 2.1e-7,
          DJK: 3.2e-6,
          DK: { value: 8e-5, fixed: true },
          h3: { value: 4e-8, fixed: true },
        },
        v3: { origin: 1021.35, B: 0.2497, A: { value: 5.19, fixed: true }, DJ: 2.1e-7, DJK: 3.2e-6 },
        v4: { origin: 1052.72, degenerate: true, B: 0.2503, A: 5.18, DJ: 2.1e-7, DJK: 3.2e-6, zeta: 0.071, q22: 3.5e-4 },
      },
      bands: [
        { name: 'nu4', upper: 'v4', lower: 'ground', strength: 1 },
        { name: 'nu3', upper: 'v3', lower: 'ground', strength: 0.6 },
      ],
      interactions: [{ name: 'v3v4', type: 'coriolis', states: ['v3', 'v4'], constants: { C1: { value: 0.12, fixed: true } } }],
    },
  ],
};

async function downloadOf(page: Page, testId: string): Promise<{ text: string }> {
  const [d] = (await Promise.all([page.waitForEvent('download'), page.locator(`[data-testid=${testId}]`).click()])) as [Download, unknown];
  return { text: readFileSync((await d.path())!, 'utf8') };
}

/**
 * Files: the system, and a trace with one Gaussian peak (HWHM 0.004 cm^-1) on a tagged line of the
 * K'' = 3 pair (the ^pQ_3(13) A1 ← A2 member of nu4), alone in its window.
 */
function files(): { systemPath: string; tracePath: string; lineCm1: number } {
  const dir = inject('fixtureDir');
  const systemPath = join(dir, 'lb3v-system.json');
  writeFileSync(systemPath, JSON.stringify(SYSTEM));
  const lines = systemLines(systemFileParse(JSON.stringify(SYSTEM)).model, { minIntensity: 0 });
  let at = -1;
  for (let i = 0; i < lines.count; i++)
    if (
      lines.bandRefs[lines.bandIndex[i]].band === 'nu4' &&
      lines.jLower[i] === 13 &&
      lines.jUpper[i] === 13 &&
      lines.kLower[i] === 3 &&
      lines.kUpper[i] === 2 &&
      lines.tagLower[i] === 'A2'
    )
      at = i;
  if (at < 0) throw new Error('symmetryPage: the tagged K = 3 line is missing from the invented system');
  const lineCm1 = lines.wavenumberCm1[at];
  const rows = ['wavenumber,absorbance'];
  for (let k = 0; k <= 400; k++) {
    const nu = lineCm1 - 0.2 + k * 0.001;
    rows.push(`${nu.toFixed(5)},${(0.02 + 0.8 * Math.exp(-Math.LN2 * ((nu - lineCm1) / 0.004) ** 2)).toFixed(6)}`);
  }
  const tracePath = join(dir, 'lb3v-trace.csv');
  writeFileSync(tracePath, rows.join('\n') + '\n');
  return { systemPath, tracePath, lineCm1 };
}

describe('symmetry labels and interaction constants on the page', () => {
  it('lists q22 and C1, names the A1/A2 member of a K = 3 pair in candidates, tooltip and table, and exports its tags', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    const f = files();
    await page.locator('[data-testid=file-input]').setInputFiles(f.systemPath);
    await page.waitForSelector('[data-testid=system-tree] [data-interaction=v3v4]', { timeout: 30_000 });
    // The model panel: q22 of the E state and the coupling's C1, with names and units.
    const q22 = page.getByRole('textbox', { name: 'q_22 of v4' });
    expect(Number(await q22.inputValue())).toBeCloseTo(3.5e-4, 12);
    const c1 = page.getByRole('textbox', { name: 'C_1 of v3v4' });
    expect(Number(await c1.inputValue())).toBeCloseTo(0.12, 12);
    expect(await page.locator('[data-testid=system-tree] [data-interaction=v3v4]').textContent()).toContain('Coriolis v3 ↔ v4');
    await page.screenshot({ path: `${SHOTS}/60-symmetry-model-panel.png` });

    await page.locator('[data-testid=file-input]').setInputFiles(f.tracePath);
    await expect.poll(() => page.locator('[data-testid=file-name]').textContent(), { timeout: 30_000 }).toBe('lb3v-trace.csv');
    await expect
      .poll(() => page.locator('[data-testid=plot-overlay]').evaluate((el) => (el as HTMLElement).dataset.freePeaks ?? ''), {
        timeout: 30_000,
      })
      .not.toBe('');
    await clickAPeak(page);
    await page.waitForSelector('[data-testid=candidates]', { timeout: 20_000 });
    const syms = await page.locator('[data-testid=candidates] .sym-tag').allTextContents();
    // Both members of the K'' = 3 pair are offered, each with its A1/A2 tags (upper ← lower).
    expect(syms).toContain('A1 ← A2');
    expect(syms).toContain('A2 ← A1');
    await page.screenshot({ path: `${SHOTS}/61-symmetry-candidates.png` });
    const n = (await page.locator('[data-testid=candidates] tbody tr').allTextContents()).findIndex(
      (t) => t.includes('A1 ← A2') && t.includes('nu4'),
    );
    expect(n).toBeGreaterThanOrEqual(0);
    await page.locator(`[data-testid=candidate-${n}]`).click();
    await expect.poll(() => assignedCount(page), { timeout: 20_000 }).toBe(1);
    await expect.poll(() => page.locator('[data-testid=row-sym]').first().textContent()).toBe('A1 ← A2');

    // The assigned marker's tooltip names the member it was assigned to.
    const overlay = page.locator('[data-testid=plot-overlay]');
    const box = (await overlay.boundingBox())!;
    const tip = page.locator('[data-testid=plot-tip]');
    const markerAt = await page.evaluate(() => {
      const gd = document.querySelector('[data-testid=spectrum-plot]') as unknown as {
        _fullLayout: { xaxis: { range: number[]; _length: number; _offset: number } };
      };
      return gd._fullLayout.xaxis;
    });
    const xPx = markerAt._offset + ((f.lineCm1 - markerAt.range[0]) / (markerAt.range[1] - markerAt.range[0])) * markerAt._length;
    let tipText = '';
    for (let y = 0.02; y < 0.6 && !tipText.includes('←'); y += 0.01) {
      await page.mouse.move(box.x + xPx, box.y + box.height * y);
      await page.waitForTimeout(30);
      if (await tip.isVisible()) tipText = (await tip.textContent()) ?? '';
    }
    expect(tipText).toMatch(/A[12] ← A[12]/);
    await page.screenshot({ path: `${SHOTS}/62-symmetry-tooltip.png` });

    // The export carries the tags and reads back as the same line of the pair.
    await page.locator('[data-testid=tab-export]').click();
    const csv = (await downloadOf(page, 'export-lines')).text;
    expect(csv.split('\n')[0]).toBe(
      'J_up,K_up,J_lo,K_lo,wavenumber,uncertainty,label,calc,obs_minus_calc,flags,note,id,peak_id,band,species,l_up,l_lo,tag_up,tag_lo,sym_up,sym_lo',
    );
    const back = systemLineTableParse(csv).rows;
    expect(back).toHaveLength(1);
    expect([back[0].jUpper, back[0].kUpper, back[0].jLower, back[0].kLower]).toEqual([13, 2, 13, 3]);
    expect([back[0].tagUpper, back[0].tagLower, back[0].band]).toEqual(['A1', 'A2', 'nu4']);
    expect(log.pageErrors).toEqual([]);
    await context.close();
  });

  it('shows o − c near 0 and no far flag for lines assigned at their drawn positions, and labels rungs with their symmetry', async () => {
    // Peaks at the drawn positions of every nu4 and nu3 line in a 0.8 cm^-1 window around the
    // K'' = 3 pair above (E lines, both members of the A1/A2 pair, coupled-state lines): assigned one
    // by one from the candidate list (the candidate at distance 0), each row's calc must be its peak.
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    const dir = inject('fixtureDir');
    const systemPath = join(dir, 'lb3v-system-2.json');
    writeFileSync(systemPath, JSON.stringify(SYSTEM));
    const all = systemLines(systemFileParse(JSON.stringify(SYSTEM)).model, { minIntensity: 0.002 });
    const centre = files().lineCm1;
    const picks: number[] = [];
    for (let i = 0; i < all.count; i++) if (Math.abs(all.wavenumberCm1[i] - centre) < 0.4) picks.push(i);
    const near = [...new Set(picks.map((i) => all.wavenumberCm1[i].toFixed(5)))].map(Number).sort((a, b) => a - b);
    // A peak for each line position with no other within 0.02 cm^-1 (5 HWHM: no blends; an unsplit
    // pair's two lines are one position); at least the K'' = 3 pair member of the test above.
    // Peak heights follow the lines' intensities (the candidate list weighs height agreement); lines
    // under a third of the strongest get no peak.
    const isolated = near.filter((p, k) => (k === 0 || p - near[k - 1] > 0.02) && (k === near.length - 1 || near[k + 1] - p > 0.02));
    const strength = new Map(isolated.map((p) => [p, 0]));
    for (const i of picks) {
      const p = Number(all.wavenumberCm1[i].toFixed(5));
      if (strength.has(p)) strength.set(p, strength.get(p)! + all.intensity[i]);
    }
    const strongest = Math.max(...strength.values());
    const positions = isolated.filter((p) => strength.get(p)! >= strongest / 3);
    expect(positions.length).toBeGreaterThanOrEqual(3);
    expect(positions.some((p) => Math.abs(p - centre) < 1e-5)).toBe(true);
    const rows = ['wavenumber,absorbance'];
    for (let k = 0; k <= 1000; k++) {
      const nu = centre - 0.5 + k * 0.001;
      let a = 0.02;
      for (const p of positions) a += ((0.8 * strength.get(p)!) / strongest) * Math.exp(-Math.LN2 * ((nu - p) / 0.004) ** 2);
      rows.push(`${nu.toFixed(5)},${a.toFixed(6)}`);
    }
    const tracePath = join(dir, 'lb3v-trace-2.csv');
    writeFileSync(tracePath, rows.join('\n') + '\n');
    await page.locator('[data-testid=file-input]').setInputFiles(systemPath);
    await page.waitForSelector('[data-testid=system-tree] [data-interaction=v3v4]', { timeout: 30_000 });
    await page.locator('[data-testid=file-input]').setInputFiles(tracePath);
    await expect.poll(() => page.locator('[data-testid=file-name]').textContent(), { timeout: 30_000 }).toBe('lb3v-trace-2.csv');
    const overlay = page.locator('[data-testid=plot-overlay]');
    for (let n = 0; n < positions.length; n++) {
      await expect.poll(() => overlay.evaluate((el) => (el as HTMLElement).dataset.freePeaks ?? ''), { timeout: 30_000 }).not.toBe('');
      const box = (await overlay.boundingBox())!;
      const free = ((await overlay.getAttribute('data-free-peaks')) ?? '').split(';').filter(Boolean)[0].split(',').map(Number);
      await page.mouse.click(box.x + free[0], box.y + free[1]);
      await page.waitForSelector('[data-testid=candidates]', { timeout: 20_000 });
      // The candidate at distance 0 (|distance| < 5e-4 cm^-1, the peak's fitted centre against the line).
      const texts = await page.locator('[data-testid=candidates] tbody tr').allTextContents();
      const dist = await page.locator('[data-testid=candidates] tbody tr td:nth-child(4)').allTextContents();
      const at = dist.findIndex((d) => Math.abs(Number(d.replace('−', '-'))) < 5e-4);
      expect(at, `no candidate at the peak: ${texts.join(' | ')}`).toBeGreaterThanOrEqual(0);
      await page.locator(`[data-testid=candidate-${at}]`).click();
      await expect.poll(() => assignedCount(page), { timeout: 20_000 }).toBe(n + 1);
    }
    // Every row: |o − c| below 5e-4 cm^-1 (before: ~0.5 on the E-state and pair lines), no flag.
    const omc = await page.locator('[data-testid=row-omc]').allTextContents();
    expect(omc).toHaveLength(positions.length);
    for (const t of omc) expect(Math.abs(Number(t))).toBeLessThan(5e-4);
    expect(await page.locator('[data-testid=assignment-row].flagged').count()).toBe(0);
    expect(await page.locator('[data-testid=assignment-count]').textContent()).not.toContain('far');
    await page.screenshot({ path: `${SHOTS}/63-symmetry-table-omc.png` });

    // Rung labels: with nu3 switched off and only the ΔK = −1, K'' = 2…4 rows of nu4 chosen, rows are
    // tall enough for them (neighbouring pQ3 rungs are ≥ 0.03 cm^-1 apart, ≥ 30 px at this zoom).
    // "None" hides the rows of every band drawn (here a parallel and a perpendicular one), not only
    // the rows the active band has.
    await page.getByRole('button', { name: /^Ladders \(/ }).click();
    await page.locator('#ladder-rows').getByRole('button', { name: 'None' }).click();
    await page.locator('#ladder-rows').getByRole('button', { name: 'Close ladder list' }).click();
    await expect.poll(() => overlay.getAttribute('data-rungs-drawn'), { timeout: 20_000 }).toBe('0');
    await page.getByRole('checkbox', { name: 'Show the ladders of band nu3 (LB-3v)' }).uncheck();
    await page.getByRole('button', { name: /^Ladders \(/ }).click();
    await page.locator('#ladder-rows').getByRole('button', { name: 'None' }).click();
    const rowChecks = page.locator('#ladder-rows .row-check');
    const names = await rowChecks.allTextContents();
    for (let k = 0; k < names.length; k++) if (/ΔK=-1, K''=[234](?!\d)/.test(names[k])) await rowChecks.nth(k).locator('input').check();
    await page.locator('#ladder-rows').getByRole('button', { name: 'Close ladder list' }).click();
    await expect
      .poll(() => overlay.evaluate((el) => Number((el as HTMLElement).dataset.rungLabelsDrawn ?? 0)), { timeout: 20_000 })
      .toBeGreaterThan(0);
    const labels = ((await overlay.getAttribute('data-rung-labels')) ?? '').split('|');
    expect(labels).toContain('A1←A2');
    expect(labels).toContain('A2←A1');
    expect(labels.some((t) => t.startsWith('E←'))).toBe(true);
    await page.screenshot({ path: `${SHOTS}/64-symmetry-rung-labels.png` });
    expect(log.pageErrors).toEqual([]);
    await context.close();
  });

  it('opens a single-band model file with q22 and a point group as a one-band system', async () => {
    const { context, page, log } = await openPage(browser);
    await gotoApp(page);
    const path = join(inject('fixtureDir'), 'lb3v-model.json');
    // Invented: the same molecule's ν4 as a single-band model file.
    writeFileSync(
      path,
      JSON.stringify({
        shape: 'prolate',
        band: 'perpendicular',
        pointGroup: 'C3v',
        spinWeightsBySymmetry: { A1: 4, A2: 4, E: 2 },
        lower: { B: 0.2512, A: 5.21, DJ: 2.1e-7, DJK: 3.2e-6 },
        upper: { origin: 1052.72, B: 0.2503, A: 5.18, DJ: 2.1e-7, DJK: 3.2e-6, zeta: 0.071, q22: 3.5e-4 },
        temperature: 200,
        jMax: 30,
        kMax: 8,
      }),
    );
    await page.locator('[data-testid=file-input]').setInputFiles(path);
    const q22 = page.getByRole('textbox', { name: 'q_22 of upper' });
    await q22.waitFor({ timeout: 30_000 });
    expect(Number(await q22.inputValue())).toBeCloseTo(3.5e-4, 12);
    expect(await page.locator('[data-testid=messages]').textContent()).toContain('as a one-band system');
    expect(log.pageErrors).toEqual([]);
    await context.close();
  });
});
