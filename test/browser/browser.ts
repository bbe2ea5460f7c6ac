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
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
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

/** Go to the app and wait until the plot has drawn its trace and ladders. */
export async function gotoApp(page: Page): Promise<void> {
  await page.goto(baseUrl());
  await waitForPlot(page);
}

export async function waitForPlot(page: Page): Promise<void> {
  await page.waitForSelector('[data-testid=spectrum-plot] .scatterlayer .trace', { timeout: 60_000 });
  await page.waitForFunction(() => document.querySelector('[data-testid=file-name]')?.textContent !== 'no trace', null, { timeout: 60_000 });
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

/** Click the first unassigned peak marker in the middle of the visible trace. */
export async function clickAPeak(page: Page): Promise<void> {
  const box = (await page.locator('[data-testid=spectrum-plot] .nsewdrag').first().boundingBox())!;
  const markers = page.locator('[data-testid=spectrum-plot] .scatterlayer .trace .points path');
  const n = await markers.count();
  const candidates: { x: number; y: number }[] = [];
  for (let i = 0; i < n; i++) {
    const b = await markers.nth(i).boundingBox();
    if (b && b.y > box.y + box.height * 0.6 && b.x > box.x + box.width * 0.3 && b.x < box.x + box.width * 0.7) candidates.push({ x: b.x + b.width / 2, y: b.y + b.height / 2 });
    if (candidates.length > 3) break;
  }
  if (candidates.length === 0) throw new Error('clickAPeak: no peak marker on screen');
  await page.mouse.click(candidates[0].x, candidates[0].y);
}

/**
 * Hover over the middle rung of the first ladder trace in view (pixel position from plotly's own
 * axis mapping) and click it.
 * @returns the hover label text shown before the click
 */
export async function clickARung(page: Page): Promise<string> {
  const pos = await page.evaluate(() => {
    type Ax = { d2p: (v: number) => number; _offset: number };
    const gd = document.querySelector('[data-testid=spectrum-plot]') as unknown as {
      data: { meta?: { kind?: string; deltaK?: number }; x: (number | null)[]; y: (number | null)[] }[];
      _fullLayout: { xaxis: Ax; yaxis2: Ax };
      getBoundingClientRect: () => DOMRect;
    };
    const L = gd._fullLayout;
    const r = gd.getBoundingClientRect();
    const [xr0, xr1] = (L.xaxis as unknown as { range: number[] }).range;
    for (const t of gd.data) {
      if (t.meta?.kind !== 'rungs' || t.meta.deltaK === undefined) continue;
      const xs = t.x.map((v, i) => ({ v, i })).filter((p) => p.v !== null && p.v > xr0 + 0.3 * (xr1 - xr0) && p.v < xr1 - 0.3 * (xr1 - xr0));
      if (xs.length === 0) continue;
      const { v, i } = xs[Math.floor(xs.length / 2)];
      return { x: r.left + L.xaxis._offset + L.xaxis.d2p(v!), y: r.top + L.yaxis2._offset + L.yaxis2.d2p(t.y[i]!) };
    }
    return null;
  });
  if (!pos) throw new Error('clickARung: no rung on screen');
  await page.mouse.move(pos.x, pos.y);
  await page.waitForSelector('[data-testid=spectrum-plot] .hoverlayer .hovertext', { timeout: 5000 });
  const label = (await page.locator('[data-testid=spectrum-plot] .hoverlayer .hovertext').first().textContent()) ?? '';
  await page.mouse.click(pos.x, pos.y);
  return label;
}
