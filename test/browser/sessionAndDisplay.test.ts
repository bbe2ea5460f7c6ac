/**
 * Starting over and honest display, each reproduced on the page at 1280×720: a new session and its
 * undo; a question before a project or another trace replaces assignments; project open undone;
 * ticked rows deleted as one step; constant fields that show the whole exponent, one cm⁻¹/MHz switch
 * for every column, values as 2.0921(51)×10⁻⁷ with units and trade names, no internal ids; one-line
 * messages that never move the plot; the combination-difference panel saying why it has no pairs;
 * undoing a model load restoring its name; export names and the exported mass; the residual plot's
 * sub-branches; a typed x range.
 */
import { readFileSync } from 'node:fs';
import type { Browser, Download, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { assignedCount, fixture, gotoApp, launch, openPage, SHOTS } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

const SMALL = { width: 1280, height: 720 };

async function downloadOf(page: Page, testId: string): Promise<{ name: string; text: string }> {
  const [d] = (await Promise.all([page.waitForEvent('download'), page.locator(`[data-testid=${testId}]`).click()])) as [Download, unknown];
  return { name: d.suggestedFilename(), text: readFileSync((await d.path())!, 'utf8') };
}

async function openSmall(): Promise<{ page: Page; close: () => Promise<void>; log: { pageErrors: string[] } }> {
  const { context, page, log } = await openPage(browser);
  await page.setViewportSize(SMALL);
  await gotoApp(page);
  return { page, log, close: () => context.close() };
}

async function loadTruthLines(page: Page): Promise<number> {
  await page.locator('[data-testid=file-input]').setInputFiles(fixture('truth-lines.csv'));
  const n = readFileSync(fixture('truth-lines.csv'), 'utf8').trim().split('\n').length - 1;
  await expect.poll(() => assignedCount(page)).toBe(n);
  return n;
}

/** A number as shown ("2.8×10⁻⁸", "0.291(3)") read back: the σ digits dropped, the power of ten applied. */
function readShown(text: string | null): number {
  const sup: Record<string, string> = {
    '⁻': '-',
    '⁰': '0',
    '¹': '1',
    '²': '2',
    '³': '3',
    '⁴': '4',
    '⁵': '5',
    '⁶': '6',
    '⁷': '7',
    '⁸': '8',
    '⁹': '9',
  };
  const t = (text ?? '')
    .replace(/\(\d+\)/, '')
    .replace('×10', 'e')
    .replace(/[⁻⁰¹²³⁴⁵⁶⁷⁸⁹]/g, (c) => sup[c]);
  return Number(t);
}

/** Every aria-label and the visible text of the page, for leak checks. */
async function pageWords(page: Page): Promise<{ labels: string[]; text: string }> {
  return page.evaluate(() => ({
    labels: Array.from(document.querySelectorAll('[aria-label]')).map((e) => e.getAttribute('aria-label') ?? ''),
    text: document.body.innerText,
  }));
}

describe('layout at 1280×720', () => {
  it('gives the work panel room and keeps the plot still when messages come and go', async () => {
    const { page, log, close } = await openSmall();
    const lower = (await page.locator('section.lower').boundingBox())!;
    const plot = (await page.locator('[data-testid=spectrum-plot]').boundingBox())!;
    await page.screenshot({ path: `${SHOTS}/20-layout-1280x720.png` });
    // Before: the work panel was about 250 px tall. Now it shares the height with the plot.
    expect(lower.height).toBeGreaterThanOrEqual(300);
    expect(plot.height).toBeGreaterThanOrEqual(200);
    expect(lower.y + lower.height).toBeLessThanOrEqual(SMALL.height + 1);
    expect(log.pageErrors).toEqual([]);
    await close();
  });
});

describe('messages', () => {
  it('show one line, newest first, can be dismissed, and never move the plot', async () => {
    const { page, log, close } = await openSmall();
    const plotY = async () => (await page.locator('[data-testid=spectrum-plot]').boundingBox())!.y;
    const y0 = await plotY();
    // Three messages: two errors from a malformed file and a note from an impossible zoom range.
    await page.locator('[data-testid=file-input]').setInputFiles(fixture('broken.csv'));
    await expect.poll(() => page.locator('.message.error').count(), { timeout: 30_000 }).toBeGreaterThan(0);
    await page
      .locator('[data-testid=file-input]')
      .setInputFiles({ name: 'second.csv', mimeType: 'text/plain', buffer: Buffer.from('a,b\nc,d\n') });
    await expect.poll(() => page.locator('.message.error').count(), { timeout: 30_000 }).toBe(2);
    // Before: each message added a row above the plot and moved every click target down.
    expect(await plotY()).toBe(y0);
    const strip = (await page.locator('[data-testid=messages]').boundingBox())!;
    expect(strip.height).toBeLessThanOrEqual(30);
    // Newest first: the message on the strip is about second.csv.
    expect(await page.locator('.message').first().textContent()).toContain('second.csv');
    const first = (await page.locator('.message').first().boundingBox())!;
    expect(first.height).toBeLessThanOrEqual(26);
    await page.screenshot({ path: `${SHOTS}/21-messages.png` });
    // The older ones open over the page, not in it.
    await page.locator('[data-testid=messages-more]').click();
    await expect.poll(async () => (await page.locator('[data-testid=messages-list]').boundingBox())!.height).toBeGreaterThan(40);
    expect(await plotY()).toBe(y0);
    await page.screenshot({ path: `${SHOTS}/22-messages-open.png` });
    const n = await page.locator('.message').count();
    await page.locator('.message').first().getByRole('button', { name: 'Dismiss message' }).click();
    await expect.poll(() => page.locator('.message').count()).toBe(n - 1);
    expect(await plotY()).toBe(y0);
    expect(log.pageErrors).toEqual([]);
    await close();
  });
});

describe('starting over', () => {
  it('starts a new session after asking, and Undo brings the old one back', async () => {
    const { page, log, close } = await openSmall();
    const n = await loadTruthLines(page);
    await page.locator('[data-testid=new-session]').click();
    // An in-page question (not window.confirm); Cancel keeps everything.
    const dialog = page.getByRole('alertdialog');
    await dialog.waitFor();
    expect(await dialog.textContent()).toContain(`${n} assignments`);
    await page.screenshot({ path: `${SHOTS}/23-new-session-question.png` });
    await page.locator('[data-testid=confirm-cancel]').click();
    expect(await assignedCount(page)).toBe(n);
    await page.locator('[data-testid=new-session]').click();
    await page.locator('[data-testid=confirm-new]').click();
    await expect.poll(() => assignedCount(page)).toBe(0);
    expect(await page.locator('[data-testid=file-name]').textContent()).toBe('no trace');
    await page.locator('[data-testid=undo]').click();
    await expect.poll(() => assignedCount(page)).toBe(n);
    await expect.poll(() => page.locator('[data-testid=file-name]').textContent()).toBe('demo/trace.csv');
    expect(log.pageErrors).toEqual([]);
    await close();
  });

  it('asks before another trace replaces assignments and says what it did with them', async () => {
    const { page, log, close } = await openSmall();
    const n = await loadTruthLines(page);
    await page.locator('[data-testid=file-input]').setInputFiles(fixture('small-trace.csv'));
    await page.getByRole('alertdialog').waitFor();
    await page.locator('[data-testid=confirm-keep]').click();
    await expect.poll(() => page.locator('[data-testid=file-name]').textContent(), { timeout: 30_000 }).toBe('small-trace.csv');
    expect(await assignedCount(page)).toBe(n);
    await expect
      .poll(() => page.locator('[data-testid=messages]').textContent())
      .toContain(`The ${n} assignments of the previous trace were kept`);
    // Again, clearing them: one undo step brings them back.
    await page
      .locator('[data-testid=file-input]')
      .setInputFiles({ name: 'third.csv', mimeType: 'text/plain', buffer: readFileSync(fixture('small-trace.csv')) });
    await page.locator('[data-testid=confirm-clear]').click();
    await expect.poll(() => assignedCount(page), { timeout: 30_000 }).toBe(0);
    await page.keyboard.press('Control+z');
    await expect.poll(() => assignedCount(page)).toBe(n);
    expect(log.pageErrors).toEqual([]);
    await close();
  });

  it('asks before a project replaces the session, and Undo reopens the replaced session', async () => {
    const { page, log, close } = await openSmall();
    const n = await loadTruthLines(page);
    await page.locator('[data-testid=tab-export]').click();
    const project = await downloadOf(page, 'export-project');
    await page.locator('[data-testid=tab-assignments]').click();
    // Work done after saving: 3 rows deleted (ticked, shift for the range, deleted as one step).
    const checks = page.locator('[data-testid=row-check]');
    await checks.nth(0).click();
    await checks.nth(2).click({ modifiers: ['Shift'] });
    await page.locator('[data-testid=delete-selected]').click();
    await expect.poll(() => assignedCount(page)).toBe(n - 3);
    await page
      .locator('[data-testid=file-input]')
      .setInputFiles({ name: project.name, mimeType: 'application/json', buffer: Buffer.from(project.text) });
    await page.getByRole('alertdialog').waitFor();
    await page.locator('[data-testid=confirm-open]').click();
    await expect.poll(() => page.locator('[data-testid=tab-export]').getAttribute('aria-selected')).toBe('true');
    await page.locator('[data-testid=tab-assignments]').click();
    await expect.poll(() => assignedCount(page)).toBe(n);
    // Opening is one undo step: the session with 3 rows fewer comes back.
    await page.locator('[data-testid=undo]').click();
    await expect.poll(() => assignedCount(page)).toBe(n - 3);
    expect(log.pageErrors).toEqual([]);
    await close();
  });

  it('ticks rows (shift for a range, or every row shown) and deletes them as one undo step', async () => {
    const { page, log, close } = await openSmall();
    const n = await loadTruthLines(page);
    const checks = page.locator('[data-testid=row-check]');
    await checks.nth(1).click();
    await checks.nth(4).click({ modifiers: ['Shift'] });
    await expect.poll(() => page.locator('[data-testid=delete-selected]').textContent()).toBe('Delete selected (4)');
    await page.screenshot({ path: `${SHOTS}/24-ticked-rows.png` });
    await page.locator('[data-testid=delete-selected]').click();
    await expect.poll(() => assignedCount(page)).toBe(n - 4);
    await page.locator('[data-testid=undo]').click();
    await expect.poll(() => assignedCount(page)).toBe(n);
    // Every row shown (a filter to K″ = 0 first).
    await page.getByLabel('K″', { exact: true }).fill('0');
    const shown = await page.evaluate(() =>
      Number(/(\d+) shown/.exec(document.querySelector('[data-testid=assignment-count]')!.textContent!)?.[1]),
    );
    await page.locator('[data-testid=check-all]').check();
    await page.locator('[data-testid=delete-selected]').click();
    await expect.poll(() => assignedCount(page)).toBe(n - shown);
    expect(log.pageErrors).toEqual([]);
    await close();
  });
});

describe('constants as the trade writes them', () => {
  it('shows a constant field with its whole exponent, and one unit switch converts both states', async () => {
    const { page, log, close } = await openSmall();
    const dj = page.locator('[data-testid=upper-DJ]');
    await dj.fill('2.13475981901e-7');
    await dj.blur();
    await expect.poll(() => dj.inputValue()).toBe('2.13475981901e-7');
    // Before: the field cut the text off at "2.13475981901"; now the whole text fits in the field.
    const fits = await dj.evaluate((el: HTMLInputElement) => [el.scrollWidth, el.clientWidth]);
    expect(fits[0]).toBeLessThanOrEqual(fits[1] + 1);
    const negative = page.locator('[data-testid=lower-DJK]');
    await negative.fill('-2.13475981901e-7');
    await negative.blur();
    const fitsNegative = await negative.evaluate((el: HTMLInputElement) => [el.scrollWidth, el.clientWidth]);
    expect(fitsNegative[0]).toBeLessThanOrEqual(fitsNegative[1] + 1);
    // Names, not keys; ids never in labels.
    expect(await dj.getAttribute('aria-label')).toBeNull();
    expect(await page.getByLabel('D_J′ in cm⁻¹').inputValue()).toBe('2.13475981901e-7');
    const upperB = Number(await page.locator('[data-testid=upper-B]').inputValue());
    const lowerB = Number(await page.locator('[data-testid=lower-B]').inputValue());
    await page.locator('[data-testid=lower-unit]').click();
    // Before: only the lower column changed to MHz. Ref: 1 cm⁻¹ = 29 979.2458 MHz (c exact, CODATA 2018);
    // tolerance 1e-6 relative for the 12 digits shown.
    const mhz = 29979.2458;
    await expect.poll(async () => Number(await page.locator('[data-testid=upper-B-mhz]').inputValue()) / (upperB * mhz)).toBeCloseTo(1, 6);
    expect(Number(await page.locator('[data-testid=lower-B-mhz]').inputValue()) / (lowerB * mhz)).toBeCloseTo(1, 6);
    // The band origin stays in cm⁻¹.
    expect(Number(await page.locator('[data-testid=upper-origin]').inputValue())).toBeCloseTo(1148.75, 6);
    await page.screenshot({ path: `${SHOTS}/25-model-mhz.png` });
    await page.locator('[data-testid=lower-unit]').click();
    expect(log.pageErrors).toEqual([]);
    await close();
  });

  it('writes fitted values as 2.0921(51)×10⁻⁷ with units and names, in the unit chosen, with no internal ids or keys', async () => {
    const { page, log, close } = await openSmall();
    await loadTruthLines(page);
    await page.locator('[data-testid=tab-solve]').click();
    await page.locator('[data-testid=fit-run]').click();
    await page.waitForSelector('[data-testid=fit-constants]', { timeout: 60_000 });
    const head = await page.locator('[data-testid=fit-constants] thead').textContent();
    expect(head).toContain('Value (σ) / cm⁻¹');
    expect(head).toContain('σ / cm⁻¹');
    const cell = (key: string, i: number) => page.locator(`[data-testid=fit-constants] tr[data-key="${key}"] td`).nth(i);
    // D_J is of order 3e-7 cm⁻¹ (public/demo/truth.json): mantissa, σ in the last digits, power of ten.
    expect(await cell('upper.DJ', 0).textContent()).toMatch(/^\d\.\d+\(\d{1,2}\)×10⁻⁷$/);
    expect(await page.locator('[data-testid=fit-constants] tr[data-key="upper.DJ"] th').textContent()).toBe('DJ′');
    const bCm = readShown(await cell('lower.B', 0).textContent());
    const sigmaCm = readShown(await cell('lower.B', 1).textContent());
    await page.locator('[data-testid=lower-unit]').click();
    expect(await page.locator('[data-testid=fit-constants] thead').textContent()).toContain('Value (σ) / MHz');
    // Value and σ both converted (before: the σ column stayed in cm⁻¹). Ref: 1 cm⁻¹ = 29 979.2458 MHz.
    const bMhz = readShown(await cell('lower.B', 0).textContent());
    // Tolerance 1e-6 relative: each value is rounded to the place of its σ (about 1e-7 of B here).
    expect(bMhz / bCm / 29979.2458).toBeCloseTo(1, 6);
    // σ is shown to two digits: the converted σ agrees to 5 % (rounding of the second digit).
    const sigmaMhz = readShown(await cell('lower.B', 1).textContent());
    expect(sigmaMhz / (sigmaCm * 29979.2458)).toBeCloseTo(1, 1);
    // ν₀ stays in cm⁻¹ and says so.
    expect(await page.locator('[data-testid=fit-constants] tr[data-key="upper.origin"] th').textContent()).toContain('cm⁻¹');
    await page.setViewportSize({ width: 1280, height: 1400 });
    await page.waitForSelector('[data-testid=residual-plot] .main-svg');
    await page.screenshot({ path: `${SHOTS}/26-fit-mhz.png` });
    const words = await pageWords(page);
    expect(words.text).not.toMatch(/-0\.0+(?![0-9])/);
    expect(words.text).not.toMatch(/\b(upper|lower)\.(origin|B|A|DJ|DJK|DK|zeta)\b/);
    expect(words.labels.filter((l) => /\b[at]\d+\b/.test(l))).toEqual([]);
    // The residual plot tells the sub-branches apart: a legend entry per series, a marker per branch.
    const traces = await page.evaluate(() =>
      (
        (
          document.querySelector('[data-testid=residual-plot]') as unknown as {
            data: { name: string; showlegend: boolean; marker: { symbol: string } }[];
          }
        ).data ?? []
      ).map((d) => ({
        name: d.name,
        legend: d.showlegend,
        symbol: d.marker.symbol,
      })),
    );
    const names = traces.filter((t) => t.legend).map((t) => t.name);
    expect(names).toContain('rR1');
    expect(names).toContain('pP2');
    // Outliers (if any) are crosses whatever their branch.
    const symbols = new Set(traces.map((t) => t.symbol.replace('-open', '')).filter((x) => x !== 'x'));
    expect(symbols).toEqual(new Set(['triangle-left', 'circle', 'triangle-right']));
    await page.locator('[data-testid=lower-unit]').click();
    expect(log.pageErrors).toEqual([]);
    await close();
  });
});

describe('smaller things', () => {
  it('undoes a model load to the previous name, names exports after the trace, and exports no mass nobody set', async () => {
    const { page, log, close } = await openSmall();
    const nameShown = () => page.locator('.model-name').textContent();
    const before = await nameShown();
    const model = JSON.parse(readFileSync('public/demo/model.json', 'utf8')) as Record<string, unknown>;
    delete model.name;
    delete model.mass;
    await page.locator('[data-testid=model-file-input]').setInputFiles({
      name: 'x.model_guess.json',
      mimeType: 'application/json',
      buffer: Buffer.from(JSON.stringify(model)),
    });
    await expect.poll(nameShown).toBe('x.model_guess.json');
    await page.locator('[data-testid=tab-export]').click();
    const exported = await downloadOf(page, 'export-model');
    // Before: "x.model_guess.json-model.json" carrying the demo's mass of 64 amu.
    expect(exported.name).toBe('trace-model.json');
    expect(JSON.parse(exported.text).mass).toBeUndefined();
    await page.locator('[data-testid=undo]').click();
    await expect.poll(nameShown).toBe(before);
    expect(log.pageErrors).toEqual([]);
    await close();
  });

  it('says why a perpendicular band has no combination-difference pairs', async () => {
    const { page, log, close } = await openSmall();
    // Only the Q lines of the line table (J′ = J″): no R/P pair can exist.
    const [header, ...rows] = readFileSync(fixture('truth-lines.csv'), 'utf8').trim().split('\n');
    const q = rows.filter((r) => r.split(',')[0] === r.split(',')[2]);
    await page
      .locator('[data-testid=file-input]')
      .setInputFiles({ name: 'q-lines.csv', mimeType: 'text/csv', buffer: Buffer.from([header, ...q].join('\n')) });
    await expect.poll(() => assignedCount(page)).toBe(q.length);
    await page.locator('[data-testid=tab-combination]').click();
    const hint = await page.locator('[data-testid=cd-hint]').textContent();
    // Before: "found 0 … pairs" and nothing more.
    expect(hint).toContain('Q lines never pair');
    expect(hint).toMatch(/rR with rP/);
    await page.screenshot({ path: `${SHOTS}/27-cd-no-pairs.png` });
    expect(log.pageErrors).toEqual([]);
    await close();
  });

  it('zooms to a typed x range', async () => {
    const { page, log, close } = await openSmall();
    await page.locator('[data-testid=x-from]').fill('1100');
    await page.locator('[data-testid=x-to]').fill('1110');
    await page.locator('[data-testid=x-to]').press('Enter');
    const range = () =>
      page.evaluate(() =>
        (
          document.querySelector('[data-testid=spectrum-plot]') as unknown as { _fullLayout: { xaxis: { range: number[] } } }
        )._fullLayout.xaxis.range.map((v) => Math.round(v * 1000) / 1000),
      );
    await expect.poll(range).toEqual([1100, 1110]);
    // A reversed range is refused in words and changes nothing.
    await page.locator('[data-testid=x-from]').fill('1120');
    await page.locator('[data-testid=x-to]').press('Enter');
    expect(await page.locator('.x-range [role=alert]').textContent()).toContain('must be above');
    expect(await range()).toEqual([1100, 1110]);
    await page.screenshot({ path: `${SHOTS}/28-typed-range.png` });
    expect(log.pageErrors).toEqual([]);
    await close();
  });
});
