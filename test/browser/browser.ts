/** Shared helpers of the browser tests: launch Debian's Chromium, open the app, wait for the plot. */
import { mkdirSync } from 'node:fs';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { inject } from 'vitest';

export const SHOTS = '/tmp/shots';
mkdirSync(SHOTS, { recursive: true });

export function baseUrl(): string {
  return inject('baseUrl');
}

export function fixture(name: string): string {
  return `${inject('fixtureDir')}/${name}`;
}

export async function launch(): Promise<Browser> {
  return chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
      '--no-first-run',
    ],
  });
}

/** Everything a page did that a test may want to check. */
export interface PageLog {
  foreignRequests: string[];
  pageErrors: string[];
  cspViolations: string[];
  workers: string[];
}

/**
 * A fresh context (own IndexedDB) and page; requests to any other host are recorded and aborted.
 */
export async function openPage(browser: Browser): Promise<{ context: BrowserContext; page: Page; log: PageLog }> {
  const context = await browser.newContext({ viewport: { width: 1440, height: 920 }, acceptDownloads: true });
  const log: PageLog = { foreignRequests: [], pageErrors: [], cspViolations: [], workers: [] };
  const origin = new URL(baseUrl()).origin;
  await context.route('**/*', (route) => {
    const url = route.request().url();
    if (url.startsWith(origin) || url.startsWith('data:') || url.startsWith('blob:')) return route.continue();
    log.foreignRequests.push(url);
    return route.abort();
  });
  await context.addInitScript(() => {
    document.addEventListener('securitypolicyviolation', (e) => {
      (window as unknown as { __csp?: string[] }).__csp ??= [];
      (window as unknown as { __csp: string[] }).__csp.push(`${e.violatedDirective} ${e.blockedURI}`);
    });
  });
  const page = await context.newPage();
  page.on('pageerror', (e) => log.pageErrors.push(e.message));
  page.on('worker', (w) => log.workers.push(w.url()));
  return { context, page, log };
}

/**
 * The app's address. The page starts on the several-band demo; `single` (the default here, which
 * the tests written for one band rely on) asks for the single-band demo with `?demo=single`.
 */
export function appUrl(demo: 'single' | 'bands' = 'single'): string {
  return demo === 'single' ? `${baseUrl()}?demo=single` : baseUrl();
}

/** Go to the app (on the single-band demo unless told) and wait until the plot has drawn its trace and ladders. */
export async function gotoApp(page: Page, demo: 'single' | 'bands' = 'single'): Promise<void> {
  await page.goto(appUrl(demo));
  await waitForPlot(page);
}

export async function waitForPlot(page: Page): Promise<void> {
  await page.waitForSelector('[data-testid=spectrum-plot] .scatterlayer .trace', { timeout: 60_000 });
  await page.waitForFunction(() => document.querySelector('[data-testid=file-name]')?.textContent !== 'no trace', null, {
    timeout: 60_000,
  });
}

/** Number of assignments shown in the table header. */
export async function assignedCount(page: Page): Promise<number> {
  const t = (await page.locator('[data-testid=assignment-count]').textContent()) ?? '';
  return Number(/^(\d+)/.exec(t)?.[1] ?? NaN);
}

/** Drag-zoom the plot's x axis between two fractions of the trace area's width. */
export async function zoomPlot(page: Page, fromFrac: number, toFrac: number): Promise<void> {
  const drag = page.locator('[data-testid=spectrum-plot] .nsewdrag').first();
  const box = (await drag.boundingBox())!;
  const y = box.y + box.height * 0.85;
  await page.mouse.move(box.x + box.width * fromFrac, y);
  await page.mouse.down();
  await page.mouse.move(box.x + box.width * toFrac, y, { steps: 6 });
  await page.mouse.up();
  await page.waitForTimeout(400);
}

/** Click the first unassigned peak marker in the middle of the visible trace (from the overlay's read-out). */
export async function clickAPeak(page: Page): Promise<void> {
  const overlay = page.locator('[data-testid=plot-overlay]');
  const box = (await overlay.boundingBox())!;
  const list = ((await overlay.getAttribute('data-free-peaks')) ?? '').split(';').filter(Boolean);
  const candidates = list.map((p) => p.split(',').map(Number)).filter(([x]) => x > box.width * 0.3 && x < box.width * 0.7);
  if (candidates.length === 0) throw new Error(`clickAPeak: no peak marker on screen (${list.length} listed)`);
  await page.mouse.click(box.x + candidates[0][0], box.y + candidates[0][1]);
}

/**
 * Hover over the strongest rung in the middle of the view (position from the overlay's read-out)
 * and click it; when the layout moved under the pointer (e.g. a message appeared above the plot)
 * and the click missed, hover and click again at the new position.
 * @returns the tooltip text shown before the click
 */
export async function clickARung(page: Page): Promise<string> {
  const overlay = page.locator('[data-testid=plot-overlay]');
  const tip = page.locator('[data-testid=plot-tip]');
  let label = '';
  for (let attempt = 0; attempt < 3; attempt++) {
    const box = (await overlay.boundingBox())!;
    const at = (await overlay.getAttribute('data-strongest-rung')) ?? '';
    if (!at) {
      const state = await page.evaluate(() => {
        const d = (document.querySelector('[data-testid=plot-overlay]') as HTMLElement | null)?.dataset ?? {};
        const gd = document.querySelector('[data-testid=spectrum-plot]') as unknown as {
          _fullLayout?: { xaxis?: { range?: number[]; _length?: number } };
        };
        return JSON.stringify({ ...d, freePeaks: undefined, range: gd._fullLayout?.xaxis?.range, widthPx: gd._fullLayout?.xaxis?._length });
      });
      throw new Error(`clickARung: no rung on screen (attempt ${attempt + 1}; overlay ${state})`);
    }
    const [x, y] = at.split(',').map(Number);
    await page.mouse.move(box.x + x, box.y + y);
    await tip.waitFor({ state: 'visible', timeout: 5000 });
    label = (await tip.textContent()) ?? '';
    await page.mouse.click(box.x + x, box.y + y);
    const selected = await page
      .waitForFunction(
        () => ((document.querySelector('[data-testid=plot-overlay]') as HTMLElement | null)?.dataset.selectedRung ?? '') !== '',
        null,
        { timeout: 1000 },
      )
      .then(() => true)
      .catch(() => false);
    if (selected) return label;
  }
  return label;
}
