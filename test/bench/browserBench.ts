/**
 * `npm run bench:browser`: the workbench page's timings in Chromium (Debian's /usr/bin/chromium via
 * playwright-core), against the BUILT app served by `vite preview` on a free port. Prints one JSON
 * line per measurement: {"measure", "median_ms" | "p95_ms" | "bytes", "runs", "target", ...}.
 *
 * Measures (targets from the "Performance" issue):
 *  1. navigation → first drawn plot of the demo (trace path present, next paint)      ≤ 1.5 s
 *  2. a 1,000,000-point CSV chosen in the file input → its first plot (+ worker parse) ≤ 3 s
 *  3. p95 redraw over 50 zoom/pan steps on that trace with ladders (input → paint)     ≤ 50 ms
 *  4. click on a candidate → the new table row painted                               ≤ 30 ms
 *  5. fit of 5,000 assigned lines in the worker: click → result painted               ≤ 100 ms
 *  6. longest main-thread block (long task) during the 1e6 load and during the fit    ≤ 100 ms
 *  7. JavaScript shipped, gzipped (first paint vs lazily)                              ≤ 1.5 MB
 *  8. reload with the autosaved 1e6 trace and 5,000 lines → restored and painted (diagnostic),
 *     longest main-thread block during the restore                                    ≤ 100 ms
 *  9. several bands: a 4-band system (~20,000 lines drawn), a 1e6-point trace and 10,000 assigned
 *     lines with band columns: zoom/pan redraw p95, click-to-assign, joint fit click → result
 * Measure 4 (and 5) also report the long tasks in the 1.5 s after a zoom step with 5,000 assigned
 * lines (redraw and the autosave that follows it).
 *
 * Times are taken in the page (performance.now(), event time stamps): "painted" is the first
 * animation frame in which the DOM shows the result, plus the task right after it (the frame's
 * paint). The page is only observed (DOM, PerformanceObserver, a Worker subclass that time-stamps
 * messages); nothing in it is changed.
 *
 * Environment: LB_BENCH_DIST (built app folder, default dist), LB_BENCH_RUNS (repeats, default 5),
 * LB_BENCH_ONLY (comma list of measure numbers, e.g. "1,7"), LB_BENCH_CLICKS (candidate clicks timed per
 * click-to-assign measure, at least the default 8, or 6 for measure 9), LB_BENCH_PROFILE=1 (also record main-thread
 * CPU profiles of the first run of each measure (the first three candidate clicks of click-to-assign) and print time per function to stderr; LB_BENCH_PROFILE_DIR
 * also writes them there as .cpuprofile files; build with
 * `vite build --minify false` for readable names); LB_BENCH_TRACE_DIR (write a Chromium performance trace of the
 * first zoom/pan steps of each redraw measure there, and of the first candidate clicks of each click-to-assign
 * measure, for DevTools' Performance panel); LB_BENCH_RECORDED_CLICKS (how many candidate clicks of each
 * click-to-assign measure are profiled or traced, default 3).
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium, type Browser, type BrowserContext, type CDPSession, type Page } from 'playwright-core';
import type { PreviewServer } from 'vite';
import {
  assetSizes,
  benchInputsWrite,
  profileSummary,
  type CpuProfile,
  pageProbeInstall,
  previewStart,
  round1,
  statMedian,
  statPercentile,
  withTimeout,
  type BenchInputs,
  type PageProbe,
} from './browserBenchUtil';
import { workloadsRead } from './workloads';
import { BANDS_BENCH_MIN_INTENSITY, bandsBenchInputsWrite } from './browserBenchBands';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const DIST = resolve(ROOT, process.env.LB_BENCH_DIST ?? 'dist');
const RUNS = Math.max(1, Number(process.env.LB_BENCH_RUNS ?? 5));
/** Candidate clicks per click-to-assign measure when more than the default (its wall times vary by 2x at load). */
const CLICKS = Math.max(0, Number(process.env.LB_BENCH_CLICKS ?? 0) || 0);
const ONLY = new Set((process.env.LB_BENCH_ONLY ?? '').split(',').filter(Boolean).map(Number));
const want = (n: number) => ONLY.size === 0 || ONLY.has(n);
const PROFILE = process.env.LB_BENCH_PROFILE === '1';
/** Folder to also write the raw CPU profiles to (.cpuprofile, for DevTools), when set. */
const PROFILE_DIR = process.env.LB_BENCH_PROFILE_DIR ?? '';
/** Folder to write a Chromium performance trace of the first zoom/pan steps of each redraw measure to, when set. */
const TRACE_DIR = process.env.LB_BENCH_TRACE_DIR ?? '';
/** Zoom/pan steps covered by that trace. */
const TRACE_STEPS = 8;
/**
 * Candidate clicks (click-to-assign) traced (LB_BENCH_TRACE_DIR, one file each) or profiled (LB_BENCH_PROFILE):
 * the first is often JIT-cold, so a few. Recording slows those clicks; their times stay in the medians.
 */
const ASSIGN_RECORDED_CLICKS = Math.max(1, Number(process.env.LB_BENCH_RECORDED_CLICKS ?? 3) || 3);
/**
 * Trace categories: the main thread's tasks, script, layout and frames, and the compositor and raster
 * threads' work (cc, viz, gpu, frame events), for DevTools' Performance panel.
 */
const TRACE_CATEGORIES = [
  'devtools.timeline',
  'disabled-by-default-devtools.timeline',
  'disabled-by-default-devtools.timeline.frame',
  'blink',
  'cc',
  'viz',
  'gpu',
  'v8.execute',
  'toplevel',
];
const LAUNCH_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
];

type Json = Record<string, unknown>;

/** Prefix added to measure names (the several-band measure repeats measures 3 and 4). */
let emitPrefix = '';

function emit(line: Json): void {
  if (emitPrefix && typeof line.measure === 'string' && !line.measure.startsWith(emitPrefix))
    line = { ...line, measure: emitPrefix + line.measure };
  console.log(JSON.stringify({ ...line, loadavg: loadavg().map((v) => Number(v.toFixed(2))) }));
}

function note(text: string): void {
  console.error(`[bench] ${text}`);
}

// ---------------------------------------------------------------- in-page helpers

/**
 * Helpers added to window.__lb after the probes: a watcher that polls a named condition once per
 * animation frame and resolves with the frame time and the time of the task after it (the paint).
 * Self-contained (serialised into the page).
 */
function pageWatchInstall(): void {
  type Lb = PageProbe & {
    watch: (name: string, arg: unknown, timeoutMs: number) => void;
    pending: Promise<{ frame: number; paint: number; armed: number }> | null;
    baseline: unknown;
    conds: Record<string, (arg: unknown) => boolean>;
  };
  const lb = (window as unknown as { __lb: Lb }).__lb;
  // The main trace's group and its input x array (cheap: no path text is read).
  const traceInput = () => {
    const gd = document.querySelector('[data-testid=spectrum-plot]');
    if (!gd) return null;
    for (const g of Array.from(gd.querySelectorAll('.scatterlayer .trace'))) {
      const cd = (
        g as unknown as {
          __data__?: { trace?: { meta?: { kind?: string }; _input?: { x?: ArrayLike<number>; meta?: { kind?: string } } } }[];
        }
      ).__data__;
      const tr = cd?.[0]?.trace;
      const kind = tr?._input?.meta?.kind ?? tr?.meta?.kind;
      if (kind === 'trace') return { g, x: tr?._input?.x ?? null };
    }
    return null;
  };
  const isDrawn = (g: Element) => (g.querySelector('path.js-line')?.getAttribute('d')?.length ?? 0) >= 50;
  // The trace line is drawn: its input x, else null.
  const traceLine = () => {
    const t = traceInput();
    return t && isDrawn(t.g) ? { x: t.x } : null;
  };
  const solverResults = () =>
    lb.workerMessages.filter((m) => m.direction === 'receive' && m.type === 'result' && /solver/.test(m.url)).length;
  lb.conds = {
    // The trace line is drawn (any data).
    plotDrawn: () => traceLine() !== null,
    // The drawn trace starts and ends near [lo, hi] (a new file's range), cm^-1.
    traceRange: (arg) => {
      const [lo, hi] = arg as [number, number];
      const t = traceLine();
      if (!t?.x || t.x.length < 2) return false;
      const w = hi - lo;
      return Math.abs(t.x[0] - lo) < 0.02 * w && Math.abs(t.x[t.x.length - 1] - hi) < 0.02 * w;
    },
    // New trace data (another array than at arming time) is drawn.
    traceRedrawn: () => {
      const t = traceInput();
      return t !== null && t.x !== null && t.x !== lb.baseline && isDrawn(t.g);
    },
    // The assignments count reads n (and, when the new row is rendered, it is the selected one).
    rowCount: (arg) =>
      (document.querySelector('[data-testid=assignment-count]')?.textContent ?? '').startsWith(`${arg as number} assigned`),
    candidatesOpen: () =>
      document.querySelector('[data-testid=candidates] [data-testid=candidate-0]') !== null ||
      document.querySelector('[data-testid=candidates] p') !== null,
    // A solver result arrived after arming, no "Fitting…" status is left, and the summary is shown.
    fitShown: () =>
      solverResults() > (lb.baseline as number) &&
      document.querySelector('[data-testid=fit-summary]') !== null &&
      !Array.from(document.querySelectorAll('.solve-run [role=status]')).some((e) => /Fitting/.test(e.textContent ?? '')),
    projectOpen: (arg) =>
      (document.querySelector('[data-testid=assignment-count]')?.textContent ?? '').startsWith(`${arg as number} assigned`) &&
      traceLine() !== null,
  };
  lb.pending = null;
  lb.watch = (name, arg, timeoutMs) => {
    const armed = performance.now();
    if (name === 'traceRedrawn') lb.baseline = traceLine()?.x ?? null;
    if (name === 'fitShown') lb.baseline = solverResults();
    lb.pending = new Promise((resolveWatch, rejectWatch) => {
      const tick = () => {
        let ok: boolean;
        try {
          ok = lb.conds[name](arg);
        } catch {
          ok = false;
        }
        const frame = performance.now();
        if (ok) {
          setTimeout(() => resolveWatch({ frame, paint: performance.now(), armed }), 0);
          return;
        }
        if (frame - armed > timeoutMs) {
          rejectWatch(new Error(`condition '${name}' not met within ${timeoutMs} ms`));
          return;
        }
        requestAnimationFrame(tick);
      };
      requestAnimationFrame(tick);
    });
    // Keep an unobserved rejection from surfacing as a page error.
    lb.pending.catch(() => undefined);
  };
}

interface WatchResult {
  frame: number;
  paint: number;
  armed: number;
}

async function watchArm(page: Page, name: string, arg: unknown, timeoutMs: number): Promise<void> {
  await page.evaluate(
    ([n, a, t]) =>
      (window as unknown as { __lb: { watch: (n: string, a: unknown, t: number) => void } }).__lb.watch(n as string, a, t as number),
    [name, arg, timeoutMs] as const,
  );
}

async function watchResult(page: Page, what: string, timeoutMs: number): Promise<WatchResult> {
  return withTimeout(
    page.evaluate(() => (window as unknown as { __lb: { pending: Promise<WatchResult> } }).__lb.pending),
    timeoutMs + 5000,
    what,
  );
}

async function probe(page: Page): Promise<PageProbe> {
  return page.evaluate(() => {
    const lb = (window as unknown as { __lb: PageProbe }).__lb;
    return { longtasks: lb.longtasks, events: lb.events, workerMessages: lb.workerMessages, inputs: lb.inputs, paints: lb.paints };
  });
}

function longestTask(p: PageProbe, from: number, to: number): number {
  let worst = 0;
  for (const t of p.longtasks) if (t.start + t.duration > from && t.start < to) worst = Math.max(worst, t.duration);
  return worst;
}

function inputAfter(p: PageProbe, type: string, after: number, last = false): number {
  const list = p.inputs.filter((i) => i.type === type && i.t >= after - 1);
  if (list.length === 0) throw new Error(`browserBench: no '${type}' event recorded after ${after.toFixed(1)} ms`);
  return (last ? list[list.length - 1] : list[0]).t;
}

// ---------------------------------------------------------------- CPU profiles

/** Start a sampled CPU profile of the page's main thread; stop() prints its summary to stderr. */
async function profileStart(page: Page, what: string): Promise<{ stop: () => Promise<void> }> {
  if (!PROFILE) return { stop: async () => undefined };
  const cdp = await page.context().newCDPSession(page);
  await cdp.send('Profiler.enable');
  await cdp.send('Profiler.setSamplingInterval', { interval: 250 });
  await cdp.send('Profiler.start');
  return {
    stop: async () => {
      try {
        const { profile } = (await cdp.send('Profiler.stop')) as unknown as { profile: CpuProfile };
        const s = profileSummary(profile, 18);
        if (PROFILE_DIR) writeFileSync(join(PROFILE_DIR, `${what.replace(/[^a-z0-9]+/gi, '_')}.cpuprofile`), JSON.stringify(profile));
        console.error(
          JSON.stringify({
            profile: what,
            sampled_ms: s.sampledMs,
            by_total: s.byTotal.map((r) => `${r.totalMs} ${r.fn}`),
            by_self: s.bySelf.map((r) => `${r.selfMs} ${r.fn}`),
          }),
        );
      } catch (err) {
        note(`profile of ${what} lost: ${(err as Error).message}`);
      } finally {
        await cdp.detach().catch(() => undefined);
      }
    },
  };
}

/** Start a Chromium performance trace of the page into TRACE_DIR/<name>.json; false when no browser handle. */
async function traceStart(page: Page, name: string): Promise<boolean> {
  const browser = page.context().browser();
  if (!browser) return false;
  await browser.startTracing(page, { path: join(TRACE_DIR, `${name.replace(/[^a-z0-9]+/gi, '_')}.json`), categories: TRACE_CATEGORIES });
  return true;
}

/** Main-thread CPU totals of Chromium's Performance domain, ms (cumulative since the page opened). */
interface CpuMetrics {
  task: number;
  script: number;
  layout: number;
  style: number;
}

/**
 * Read the page's main-thread CPU totals (Performance.getMetrics: TaskDuration, ScriptDuration,
 * LayoutDuration, RecalcStyleDuration). They count busy time only, so they swell less with the
 * machine's load than wall times; the bench's own probes add the same small amount to every measure.
 */
async function cpuMetricsRead(page: Page): Promise<CpuMetrics> {
  // One session per page, kept: the domain counts from the moment it is enabled.
  let session = cpuSessions.get(page);
  if (!session) {
    session = page
      .context()
      .newCDPSession(page)
      .then(async (cdp) => {
        await cdp.send('Performance.enable');
        return cdp;
      });
    cpuSessions.set(page, session);
  }
  const { metrics } = await (await session).send('Performance.getMetrics');
  const get = (name: string) => 1000 * (metrics.find((m) => m.name === name)?.value ?? NaN);
  return { task: get('TaskDuration'), script: get('ScriptDuration'), layout: get('LayoutDuration'), style: get('RecalcStyleDuration') };
}

const cpuSessions = new WeakMap<Page, Promise<CDPSession>>();

/** Median of each CPU figure over runs, ms. */
function cpuMedians(rows: readonly Record<keyof CpuMetrics, number>[]): Record<keyof CpuMetrics, number> | null {
  if (rows.length === 0) return null;
  const m = (k: keyof CpuMetrics) => round1(statMedian(rows.map((r) => r[k])));
  return { task: m('task'), script: m('script'), layout: m('layout'), style: m('style') };
}

/** CPU per step between two reads, ms, rounded to 0.1. */
function cpuPerStep(from: CpuMetrics, to: CpuMetrics, steps: number): Record<keyof CpuMetrics, number> {
  const per = (k: keyof CpuMetrics) => round1((to[k] - from[k]) / Math.max(1, steps));
  return { task: per('task'), script: per('script'), layout: per('layout'), style: per('style') };
}

// ---------------------------------------------------------------- page set-up

async function contextOpen(browser: Browser, baseUrl: string): Promise<{ context: BrowserContext; page: Page; errors: string[] }> {
  const context = await browser.newContext({ viewport: { width: 1440, height: 920 } });
  const origin = new URL(baseUrl).origin;
  await context.route('**/*', (route) => {
    const url = route.request().url();
    return url.startsWith(origin) || url.startsWith('data:') || url.startsWith('blob:') ? route.continue() : route.abort();
  });
  // tsx (esbuild keepNames) wraps functions in __name(); give the page a no-op one.
  await context.addInitScript({ content: 'globalThis.__name = globalThis.__name || ((f) => f);' });
  await context.addInitScript(pageProbeInstall);
  await context.addInitScript(pageWatchInstall);
  const page = await context.newPage();
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(e.message));
  return { context, page, errors };
}

async function gotoDemo(page: Page, baseUrl: string): Promise<WatchResult> {
  // The single-band demo: the page starts on the several-band one, measure 9 loads its own system.
  await page.goto(`${baseUrl}?demo=single`, { waitUntil: 'commit', timeout: 30_000 });
  await page.waitForFunction(() => (window as unknown as { __lb?: { watch?: unknown } }).__lb?.watch !== undefined, null, {
    timeout: 30_000,
  });
  await watchArm(page, 'plotDrawn', null, 60_000);
  return watchResult(page, 'waiting for the demo plot', 60_000);
}

async function chooseFile(page: Page, path: string): Promise<void> {
  await page.locator('[data-testid=file-input]').setInputFiles(path);
}

/**
 * Screen box of one of plotly's drag rectangles of the trace subplot 'xy' (the ladder panel above
 * it is 'xy2' and comes first in the DOM).
 * @param cls 'nsewdrag' (plot area: box zoom) or 'ewdrag' (middle of the x axis: pan)
 */
async function plotBox(page: Page, cls: 'nsewdrag' | 'ewdrag'): Promise<{ x: number; y: number; width: number; height: number }> {
  const box = await page.evaluate((c) => {
    const el = Array.from(document.querySelectorAll(`[data-testid=spectrum-plot] .draglayer .${c}`)).find(
      (e) => (e.parentNode as Element | null)?.getAttribute('class') === 'xy',
    );
    const b = el?.getBoundingClientRect();
    return b ? { x: b.x, y: b.y, width: b.width, height: b.height } : null;
  }, cls);
  if (!box || box.width < 10) throw new Error(`browserBench: the trace subplot's ${cls} rectangle is not on screen`);
  return box;
}

async function pause(ms: number): Promise<void> {
  await new Promise((r) => setTimeout(r, ms));
}

// ---------------------------------------------------------------- measures

async function measureDemo(browser: Browser, baseUrl: string): Promise<void> {
  const times: number[] = [];
  const wall: number[] = [];
  const jsBefore: number[] = [];
  let jsFiles: string[] = [];
  const phases: Record<string, number[]> = {
    fcp: [],
    entry_js_loaded: [],
    plotly_js_loaded: [],
    demo_trace_fetched: [],
    parse_post: [],
    parse_result: [],
    longtask_sum: [],
    longtask_max: [],
  };
  let census: Record<string, number> = {};
  for (let run = 0; run < RUNS; run++) {
    const { context, page, errors } = await contextOpen(browser, baseUrl);
    try {
      const js: { url: string; t: number }[] = [];
      const t0 = Date.now();
      page.on('response', (r) => {
        if (/\.js(\?|$)/.test(r.url())) js.push({ url: r.url(), t: Date.now() - t0 });
      });
      const prof = run === 0 ? await profileStart(page, 'demo: navigation to first plot') : null;
      const w = await gotoDemo(page, baseUrl);
      await prof?.stop();
      wall.push(Date.now() - t0);
      times.push(w.paint);
      jsBefore.push(js.length);
      jsFiles = js.map((j) => new URL(j.url).pathname);
      const p = await probe(page);
      phases.fcp.push(p.paints.find((e) => e.name === 'first-contentful-paint')?.start ?? NaN);
      const res = await page.evaluate(() =>
        performance.getEntriesByType('resource').map((e) => ({ name: e.name, end: (e as PerformanceResourceTiming).responseEnd })),
      );
      const ended = (re: RegExp) => res.find((e) => re.test(e.name))?.end ?? NaN;
      phases.entry_js_loaded.push(ended(/assets\/index-.*\.js/));
      phases.plotly_js_loaded.push(ended(/plotly/));
      phases.demo_trace_fetched.push(ended(/demo\/trace\.csv/));
      if (run === 0) census = await plotCensus(page);
      phases.parse_post.push(p.workerMessages.find((m) => /parse/.test(m.url) && m.direction === 'post')?.t ?? NaN);
      phases.parse_result.push(p.workerMessages.find((m) => /parse/.test(m.url) && m.type === 'result')?.t ?? NaN);
      const tasks = p.longtasks.filter((t) => t.start < w.paint);
      phases.longtask_sum.push(tasks.reduce((a, t) => a + t.duration, 0));
      phases.longtask_max.push(Math.max(0, ...tasks.map((t) => t.duration)));
      if (run === 0)
        note(
          `demo long tasks before the plot (start:duration ms): ${tasks.map((t) => `${t.start.toFixed(0)}:${t.duration.toFixed(0)}`).join(' ')}`,
        );
      if (errors.length) note(`demo run ${run}: page errors: ${errors.join(' | ')}`);
    } finally {
      await context.close();
    }
  }
  emit({
    measure: 'demo_first_plot',
    median_ms: round1(statMedian(times)),
    runs: times.length,
    target: 1500,
    min_ms: round1(Math.min(...times)),
    max_ms: round1(Math.max(...times)),
    wall_clock_median_ms: round1(statMedian(wall)),
    js_requested_before_plot: jsFiles,
    plot_nodes: census,
    phases_median_ms: Object.fromEntries(Object.entries(phases).map(([k, v]) => [k, round1(statMedian(v))])),
    note: 'performance.now() of the paint after the first frame with the trace path drawn (0 = navigation start)',
  });
}

interface LoadedTrace {
  context: BrowserContext;
  page: Page;
  errors: string[];
}

/** A fresh page on the demo, the W1 model loaded, then the 1e6-point trace chosen; timings of the last step. */
async function loadBigTrace(browser: Browser, baseUrl: string, inputs: BenchInputs, isProfiled = false) {
  const { context, page, errors } = await contextOpen(browser, baseUrl);
  await gotoDemo(page, baseUrl);
  await chooseFile(page, inputs.modelJson);
  await page
    .waitForFunction(() => /bench W1/.test(document.body.textContent ?? ''), null, { timeout: 30_000 })
    .catch(() => note('model file: its name did not show on the page (continuing)'));
  await pause(800); // let the model's redraw and autosave pass
  await watchArm(page, 'traceRange', inputs.traceRangeCm1, 60_000);
  const armed = await page.evaluate(() => performance.now());
  const prof = isProfiled ? await profileStart(page, '1e6 trace: file chosen to first plot') : null;
  await chooseFile(page, inputs.traceCsv);
  const w = await watchResult(page, 'waiting for the 1e6-point trace to be plotted', 60_000);
  await prof?.stop();
  const profAfter = isProfiled ? await profileStart(page, '1e6 trace: the 1.5 s after the first plot (autosave)') : null;
  await pause(1500); // the autosave (300 ms after the change) writes the new trace; count it as "after"
  await profAfter?.stop();
  const p = await probe(page);
  const start = inputAfter(p, 'change', armed);
  const posts = p.workerMessages.filter((m) => /parse/.test(m.url) && m.direction === 'post' && m.t >= start);
  const results = p.workerMessages.filter((m) => /parse/.test(m.url) && m.direction === 'receive' && m.type === 'result' && m.t >= start);
  const workerMs = posts.length && results.length ? results[0].t - posts[0].t : NaN;
  return {
    loaded: { context, page, errors } as LoadedTrace,
    toPlotMs: w.paint - start,
    changeToPostMs: posts.length ? posts[0].t - start : NaN,
    workerMs,
    resultToPaintMs: results.length ? w.paint - results[0].t : NaN,
    longestDuringMs: longestTask(p, start, w.paint),
    longestAfterMs: longestTask(p, w.paint, w.paint + 1500),
    longtasksDuring: p.longtasks.filter((t) => t.start + t.duration > start && t.start < w.paint).map((t) => round1(t.duration)),
  };
}

async function measureBigTrace(browser: Browser, baseUrl: string, inputs: BenchInputs): Promise<LoadedTrace | null> {
  const rows: Awaited<ReturnType<typeof loadBigTrace>>[] = [];
  let keep: LoadedTrace | null = null;
  for (let run = 0; run < RUNS; run++) {
    const r = await loadBigTrace(browser, baseUrl, inputs, run === 0);
    rows.push(r);
    if (r.loaded.errors.length) note(`1e6 run ${run}: page errors: ${r.loaded.errors.join(' | ')}`);
    note(
      `1e6 run ${run}: plot ${r.toPlotMs.toFixed(0)} ms, worker ${r.workerMs.toFixed(0)} ms, result→paint ${r.resultToPaintMs.toFixed(0)} ms, long tasks ${r.longtasksDuring.join(', ')}`,
    );
    if (run === RUNS - 1) keep = r.loaded;
    else await r.loaded.context.close();
  }
  const m = (f: (r: (typeof rows)[number]) => number) => round1(statMedian(rows.map(f)));
  emit({
    measure: 'trace_1e6_to_first_plot',
    median_ms: m((r) => r.toPlotMs),
    runs: rows.length,
    target: 3000,
    points: inputs.tracePoints,
    max_ms: round1(Math.max(...rows.map((r) => r.toPlotMs))),
  });
  emit({
    measure: 'trace_1e6_parse_in_worker',
    median_ms: m((r) => r.workerMs),
    runs: rows.length,
    target: null,
    note: 'the page does not report a parse time; this is request posted to the parse worker → its result received on the main thread (file read + parse + transfer)',
    change_to_post_median_ms: m((r) => r.changeToPostMs),
    result_to_paint_median_ms: m((r) => r.resultToPaintMs),
  });
  emit({
    measure: 'longtask_during_1e6_load',
    median_ms: m((r) => r.longestDuringMs),
    runs: rows.length,
    target: 100,
    max_ms: round1(Math.max(...rows.map((r) => r.longestDuringMs))),
    after_plot_1500ms_median_ms: m((r) => r.longestAfterMs),
    note: 'longest long task between the change event and the first plot paint; after_plot: the 1.5 s that follow (autosave of the trace)',
  });
  return keep;
}

/** One zoom/pan step driven with the mouse; resolves with input → paint of the new trace data. */
async function redrawStep(page: Page, kind: 'zoom' | 'pan' | 'reset', k: number): Promise<number> {
  const area = await plotBox(page, 'nsewdrag');
  await watchArm(page, 'traceRedrawn', null, 15_000);
  const armed = await page.evaluate(() => performance.now());
  if (kind === 'zoom') {
    const a = 0.25 + 0.1 * (k % 3);
    await boxZoomDrag(page, area, a, a + 0.35);
  } else if (kind === 'pan') {
    const axis = await plotBox(page, 'ewdrag');
    const cx = axis.x + axis.width / 2;
    const cy = axis.y + axis.height / 2;
    const dx = (k % 2 ? -1 : 1) * axis.width * 0.15;
    await page.mouse.move(cx, cy);
    await page.mouse.down();
    await page.mouse.move(cx + dx, cy, { steps: 4 });
    await page.mouse.up();
  } else {
    // The toolbar's "Zoom out" (the whole trace); a double-click on the plot would also click a point.
    await zoomOutButton(page).click();
  }
  const w = await watchResult(page, `waiting for the redraw after ${kind} step ${k}`, 15_000);
  const p = await probe(page);
  return w.paint - (kind === 'reset' ? inputAfter(p, 'click', armed) : inputAfter(p, 'mouseup', armed, true));
}

/** Number of SVG nodes the plot has drawn, by kind (diagnosis of redraw cost). */
async function plotCensus(page: Page): Promise<Record<string, number>> {
  return page.evaluate(() => {
    const gd = document.querySelector('[data-testid=spectrum-plot]');
    const n = (sel: string) => gd?.querySelectorAll(sel).length ?? 0;
    return {
      traces: n('.scatterlayer .trace'),
      line_paths: n('.scatterlayer path.js-line'),
      marker_points: n('.scatterlayer path.point'),
      tick_labels: n('.xtick, .ytick, .y2tick'),
      svg_elements: n('*'),
    };
  });
}

async function measureRedraw(loaded: LoadedTrace, nSteps: number): Promise<void> {
  const { page } = loaded;
  const censusFull = await plotCensus(page);
  const plan: ('zoom' | 'pan' | 'reset')[] = [];
  while (plan.length < nSteps) plan.push('zoom', 'pan', 'zoom', 'pan', 'zoom', 'pan', 'reset');
  plan.length = nSteps;
  const times: number[] = [];
  const byKind: Record<string, number[]> = { zoom: [], pan: [], reset: [] };
  const failed: string[] = [];
  const t0 = await page.evaluate(() => performance.now());
  const cpu0 = await cpuMetricsRead(page);
  const prof = await profileStart(page, `redraw: ${plan.length} zoom/pan steps (includes the 400 ms pauses)`);
  let isTracing = false;
  if (TRACE_DIR) {
    const browser = page.context().browser();
    if (browser) {
      await browser.startTracing(page, {
        path: join(TRACE_DIR, `${emitPrefix || 'one_band_'}redraw.json`),
        categories: TRACE_CATEGORIES,
      });
      isTracing = true;
    }
  }
  for (let k = 0; k < plan.length; k++) {
    if (isTracing && k === TRACE_STEPS) {
      await page.context().browser()?.stopTracing();
      isTracing = false;
    }
    try {
      const ms = await redrawStep(page, plan[k], k);
      times.push(ms);
      byKind[plan[k]].push(ms);
    } catch (err) {
      failed.push(`${plan[k]} ${k}: ${(err as Error).message}`);
    }
    await pause(400); // past plotly's double-click window
  }
  await prof?.stop();
  const cpu1 = await cpuMetricsRead(page);
  const p1 = await probe(page);
  const t1 = await page.evaluate(() => performance.now());
  if (failed.length) note(`redraw steps that did not redraw: ${failed.join(' | ')}`);
  const censusEnd = await plotCensus(page);
  if (times.length === 0) {
    emit({ measure: 'redraw_zoom_pan_p95', p95_ms: null, runs: 0, target: 50, error: failed.slice(0, 3) });
    return;
  }
  emit({
    measure: 'redraw_zoom_pan_p95',
    p95_ms: round1(statPercentile(times, 95)),
    runs: times.length,
    target: 50,
    median_ms: round1(statMedian(times)),
    max_ms: round1(Math.max(...times)),
    zoom_median_ms: byKind.zoom.length ? round1(statMedian(byKind.zoom)) : null,
    pan_median_ms: byKind.pan.length ? round1(statMedian(byKind.pan)) : null,
    reset_median_ms: byKind.reset.length ? round1(statMedian(byKind.reset)) : null,
    failed_steps: failed.length,
    plot_nodes_full_range: censusFull,
    plot_nodes_last_step: censusEnd,
    longest_longtask_ms: round1(longestTask(p1, t0, t1)),
    main_thread_cpu_per_step_ms: cpuPerStep(cpu0, cpu1, plan.length),
    note: 'mouseup of a box zoom / x-axis pan (or click on Zoom out) → paint of the first frame drawing the re-decimated trace',
  });
}

/** The toolbar's "Zoom out" button (plotly's mode bar has one of the same name). */
function zoomOutButton(page: Page) {
  return page.locator('.plot-toolbar').getByRole('button', { name: 'Zoom out' });
}

/** Show the whole trace, then box-zoom to fractions of it (no timing). */
async function zoomFromFull(page: Page, steps: [number, number][]): Promise<void> {
  await zoomOutButton(page).click();
  await pause(800);
  for (const [a, b] of steps) await zoomTo(page, a, b);
}

/**
 * A box zoom in x between two fractions of the trace subplot's width, low in the plot; the vertical
 * move stays under plotly's minimum drag, so only x zooms.
 */
async function boxZoomDrag(
  page: Page,
  area: { x: number; y: number; width: number; height: number },
  fromFrac: number,
  toFrac: number,
): Promise<void> {
  const y = area.y + area.height * 0.8;
  await page.mouse.move(area.x + area.width * fromFrac, y);
  await page.mouse.down();
  await page.mouse.move(area.x + area.width * toFrac, y + 2, { steps: 4 });
  await page.mouse.up();
}

/** Zoom the plot to a fraction of the current range with a box drag (no timing). */
async function zoomTo(page: Page, fromFrac: number, toFrac: number): Promise<void> {
  const area = await plotBox(page, 'nsewdrag');
  await watchArm(page, 'traceRedrawn', null, 15_000);
  await boxZoomDrag(page, area, fromFrac, toFrac);
  await watchResult(page, 'waiting for a zoom', 15_000);
  await pause(400);
}

/**
 * Screen positions of free (unassigned) peak markers inside the middle of the plot: the overlay
 * canvas lists some of the markers it painted (data-free-peaks, canvas CSS px).
 */
async function freePeakPositions(page: Page): Promise<{ x: number; y: number }[]> {
  return page.evaluate(() => {
    const canvas = document.querySelector('[data-testid=plot-overlay]') as HTMLElement | null;
    if (!canvas) return [];
    const r = canvas.getBoundingClientRect();
    const out: { x: number; y: number }[] = [];
    for (const pair of (canvas.dataset.freePeaks ?? '').split(';').filter(Boolean)) {
      const [x, y] = pair.split(',').map(Number);
      if (x > 0.1 * r.width && x < 0.9 * r.width) out.push({ x: r.left + x, y: r.top + y });
    }
    return out;
  });
}

async function assignedCount(page: Page): Promise<number> {
  const t = (await page.locator('[data-testid=assignment-count]').textContent()) ?? '';
  return Number(/^(\d+)/.exec(t)?.[1] ?? NaN);
}

/**
 * Click-to-assign: click a free peak marker (candidates open), then the first candidate not yet
 * assigned; time each click → paint of its result.
 */
async function measureAssign(loaded: LoadedTrace, label: string, nRuns: number, regions: [number, number][]): Promise<void> {
  const { page } = loaded;
  await page.locator('[data-testid=tab-assignments]').click();
  await pause(300);
  const xRange = () =>
    page.evaluate(
      () =>
        (
          document.querySelector('[data-testid=spectrum-plot]') as unknown as { _fullLayout?: { xaxis?: { range?: number[] } } }
        )._fullLayout?.xaxis?.range?.join(',') ?? '',
    );
  let region = 0;
  let regionRange = '';
  let viewMoved = 0;
  const enterRegion = async () => {
    await zoomFromFull(page, [regions[region]]);
    regionRange = await xRange();
  };
  await enterRegion();
  const toCandidates: number[] = [];
  const toRow: number[] = [];
  const eventDurations: number[] = [];
  const cpuToRow: Record<keyof CpuMetrics, number>[] = [];
  const cpuAfterRow: Record<keyof CpuMetrics, number>[] = [];
  let rowRendered = 0;
  const problems: string[] = [];
  let tries = 0;
  let allAssigned = 0;
  const tried = new Set<number>();
  while (toRow.length < nRuns && tries < nRuns * 12) {
    tries++;
    if ((await xRange()) !== regionRange) {
      // The page moved the view (e.g. to the new row's line); go back to the region.
      viewMoved++;
      await enterRegion();
    }
    const peaks = await freePeakPositions(page);
    // Each peak once (by screen column); spread the picks over the plot.
    const untried = peaks.filter((q) => !tried.has(Math.round(q.x)));
    if (untried.length === 0) {
      problems.push(
        `region ${regions[region].join('–')}: ${peaks.length ? `all ${peaks.length} free peak markers tried` : `no free peak marker (plot ${JSON.stringify(await plotCensus(page))})`}`,
      );
      if (++region >= regions.length) break;
      tried.clear();
      await enterRegion();
      continue;
    }
    const target = untried[(tries * 7) % untried.length];
    tried.add(Math.round(target.x));
    await watchArm(page, 'candidatesOpen', null, 10_000);
    let armed = await page.evaluate(() => performance.now());
    const profPeak = toCandidates.length === 0 ? await profileStart(page, `assign (${label}): one peak click to candidates painted`) : null;
    await page.mouse.click(target.x, target.y);
    let w: WatchResult;
    try {
      w = await watchResult(page, 'waiting for the candidate list', 10_000);
      await profPeak?.stop();
    } catch (err) {
      const state = await page.evaluate(() => ({
        selectedRung: (document.querySelector('[data-testid=plot-overlay]') as HTMLElement | null)?.dataset.selectedRung ?? '',
        message: document.querySelector('[data-testid=messages]')?.textContent?.slice(0, 160) ?? '',
      }));
      problems.push(
        `peak click at ${target.x.toFixed(0)},${target.y.toFixed(0)}: ${(err as Error).message} (selected rung '${state.selectedRung}', messages '${state.message}')`,
      );
      await page.keyboard.press('Escape');
      continue;
    }
    let p = await probe(page);
    toCandidates.push(w.paint - inputAfter(p, 'click', armed));
    const free = page.locator('[data-testid=candidates] tbody tr:not(.is-assigned) [data-testid^=candidate-]');
    if ((await free.count()) === 0) {
      allAssigned++;
      await page.keyboard.press('Escape');
      await pause(200);
      continue;
    }
    const n = await assignedCount(page);
    // The list scrolls (at most 45 % of the plot's height): a candidate below its fold must be
    // scrolled into view first, else the click lands on the plot under the list.
    await free.first().scrollIntoViewIfNeeded();
    const box = await free.first().boundingBox();
    if (!box) continue;
    await watchArm(page, 'rowCount', n + 1, 10_000);
    armed = await page.evaluate(() => performance.now());
    const profRow =
      toRow.length < ASSIGN_RECORDED_CLICKS
        ? await profileStart(page, `assign (${label}): candidate click ${toRow.length} to row painted`)
        : null;
    const isTracing =
      toRow.length < ASSIGN_RECORDED_CLICKS && TRACE_DIR !== '' && (await traceStart(page, `${label}_assign_${toRow.length}`));
    const cpuBefore = await cpuMetricsRead(page);
    await page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
    let cpuPainted: CpuMetrics;
    try {
      w = await watchResult(page, 'waiting for the new table row', 10_000);
      cpuPainted = await cpuMetricsRead(page);
      await profRow?.stop();
    } catch (err) {
      problems.push(`candidate click: ${(err as Error).message}`);
      continue;
    } finally {
      if (isTracing) await page.context().browser()?.stopTracing();
    }
    p = await probe(page);
    const clickT = inputAfter(p, 'click', armed);
    toRow.push(w.paint - clickT);
    const ev = p.events.filter((e) => Math.abs(e.start - clickT) < 10);
    if (ev.length) eventDurations.push(Math.max(...ev.map((e) => e.duration)));
    if (await page.locator('[data-testid=assignment-row][aria-selected=true]').count()) rowRendered++;
    await pause(700); // the autosave runs 300 ms after a change; keep it out of the next click
    const cpuAfter = await cpuMetricsRead(page);
    cpuToRow.push(cpuPerStep(cpuBefore, cpuPainted, 1));
    cpuAfterRow.push(cpuPerStep(cpuPainted, cpuAfter, 1));
  }
  if (problems.length) note(`assign (${label}): ${problems.join(' | ')}`);
  emit({
    measure: `click_to_assign_${label}`,
    median_ms: toRow.length ? round1(statMedian(toRow)) : null,
    runs: toRow.length,
    target: 30,
    max_ms: toRow.length ? round1(Math.max(...toRow)) : null,
    peak_click_to_candidates_median_ms: toCandidates.length ? round1(statMedian(toCandidates)) : null,
    event_timing_durations_ms: eventDurations,
    main_thread_cpu_click_to_row_median_ms: cpuMedians(cpuToRow),
    main_thread_cpu_700ms_after_row_median_ms: cpuMedians(cpuAfterRow),
    new_row_rendered_in_table: `${rowRendered}/${toRow.length}`,
    peaks_with_every_candidate_assigned: allAssigned,
    view_moved_after_assign: viewMoved,
    note: 'click on a candidate → paint of the first frame whose table count shows the new row (event_timing: Event Timing durations ≥ 16 ms of the input events at the click, for comparison)',
  });
}

async function measureFit(browser: Browser, baseUrl: string, inputs: BenchInputs): Promise<LoadedTrace> {
  const { context, page, errors } = await contextOpen(browser, baseUrl);
  await gotoDemo(page, baseUrl);
  await pause(500);
  await watchArm(page, 'projectOpen', inputs.nAssigned, 120_000);
  const armed = await page.evaluate(() => performance.now());
  const profOpen = await profileStart(page, 'project open: 1e6 trace + 5000 lines');
  await chooseFile(page, inputs.projectJson);
  const open = await watchResult(page, 'waiting for the project with 5,000 lines to open', 120_000);
  await profOpen.stop();
  const profOpenAfter = await profileStart(page, 'project open: the 2 s after it is painted (autosave)');
  await pause(2000);
  await profOpenAfter.stop();
  let p = await probe(page);
  const openStart = inputAfter(p, 'change', armed);
  const readPost = p.workerMessages.find(
    (m) => /parse/.test(m.url) && m.direction === 'post' && m.type === 'project-read' && m.t >= openStart,
  );
  const readResult = p.workerMessages.find(
    (m) => /parse/.test(m.url) && m.direction === 'receive' && m.type === 'project-read-result' && m.t >= openStart,
  );
  emit({
    measure: 'project_open_1e6_trace_5000_lines',
    median_ms: round1(open.paint - openStart),
    runs: 1,
    target: null,
    longest_longtask_ms: round1(longestTask(p, openStart, open.paint)),
    longest_longtask_after_2000ms: round1(longestTask(p, open.paint, open.paint + 2000)),
    read_in: readPost ? 'parse worker' : 'main thread',
    worker_post_to_result_ms: readPost && readResult ? round1(readResult.t - readPost.t) : null,
    note: 'extra: choosing the project file → its trace and table painted (read on the main thread)',
  });
  await page.locator('[data-testid=tab-solve]').click();
  await pause(500);
  const shown: number[] = [];
  const worker: number[] = [];
  const during: number[] = [];
  const after: number[] = [];
  let summary = '';
  for (let run = 0; run < RUNS; run++) {
    await watchArm(page, 'fitShown', null, 60_000);
    const a = await page.evaluate(() => performance.now());
    const prof = run === 0 ? await profileStart(page, 'fit: click to result shown + 1.5 s') : null;
    await page.locator('[data-testid=fit-run]').click();
    const w = await watchResult(page, 'waiting for the fit result', 60_000);
    await pause(1500);
    await prof?.stop();
    p = await probe(page);
    const click = inputAfter(p, 'click', a);
    shown.push(w.paint - click);
    const post = p.workerMessages.find((m) => /solver/.test(m.url) && m.direction === 'post' && m.t >= click);
    const res = p.workerMessages.find((m) => /solver/.test(m.url) && m.direction === 'receive' && m.type === 'result' && m.t >= click);
    worker.push(post && res ? res.t - post.t : NaN);
    during.push(longestTask(p, click, w.paint));
    after.push(longestTask(p, w.paint, w.paint + 1500));
    // Diagnostic only: where the click → paint time goes in this run.
    note(
      `fit run ${run}: click→post ${post ? round1(post.t - click) : '?'} ms, worker ${round1(worker[worker.length - 1])} ms, result→paint ${res ? round1(w.paint - res.t) : '?'} ms, longest task during ${during[during.length - 1]} ms, after ${after[after.length - 1]} ms`,
    );
    summary = (await page.locator('[data-testid=fit-summary]').textContent()) ?? '';
  }
  if (!/N = 5000/.test(summary.replace(/\s+/g, ' '))) note(`fit summary does not read N = 5000: ${summary}`);
  if (errors.length) note(`fit page errors: ${errors.join(' | ')}`);
  emit({
    measure: 'fit_5000_lines_click_to_result',
    median_ms: round1(statMedian(shown)),
    runs: shown.length,
    target: 100,
    max_ms: round1(Math.max(...shown)),
    worker_post_to_result_median_ms: round1(statMedian(worker)),
    summary: summary.replace(/\s+/g, ' ').trim().slice(0, 160),
    note: 'click on Fit → paint of the first frame with the fit summary after the solver result',
  });
  emit({
    measure: 'longtask_during_fit',
    median_ms: round1(statMedian(during)),
    runs: during.length,
    target: 100,
    max_ms: round1(Math.max(...during)),
    after_result_1500ms_median_ms: round1(statMedian(after)),
    note: 'longest long task between the Fit click and the result paint; after_result: the 1.5 s that follow (plots, autosave)',
  });
  await zoomLongTasks(page);
  return { context, page, errors };
}

/**
 * Diagnostic: long tasks in the 1.5 s after each view-only change (a box zoom, then Zoom out, in
 * turn) with 5,000 assigned lines: the redraw and the autosave that follows 300 ms later.
 */
async function zoomLongTasks(page: Page): Promise<void> {
  await page.locator('[data-testid=tab-assignments]').click();
  await pause(800);
  const worst: number[] = [];
  const late: number[] = [];
  const lists: string[] = [];
  for (let run = 0; run < Math.max(RUNS, 4); run++) {
    const area = await plotBox(page, 'nsewdrag');
    await watchArm(page, 'traceRedrawn', null, 15_000);
    const armed = await page.evaluate(() => performance.now());
    const prof =
      run < 2 ? await profileStart(page, `view change with 5000 assigned (${run % 2 ? 'zoom out' : 'box zoom'}): input + 1.5 s`) : null;
    if (run % 2 === 0) await boxZoomDrag(page, area, 0.3, 0.7);
    else await zoomOutButton(page).click();
    await watchResult(page, 'waiting for the redraw after a view change', 15_000).catch((err: Error) => note(err.message));
    await pause(1500);
    await prof?.stop();
    const p = await probe(page);
    const t0 = inputAfter(p, run % 2 === 0 ? 'mouseup' : 'click', armed);
    const tasks = p.longtasks.filter((t) => t.start + t.duration > t0 && t.start < t0 + 1500);
    worst.push(Math.max(0, ...tasks.map((t) => t.duration)));
    late.push(Math.max(0, ...tasks.filter((t) => t.start >= t0 + 250).map((t) => t.duration)));
    lists.push(tasks.map((t) => `+${(t.start - t0).toFixed(0)}:${t.duration.toFixed(0)}`).join(' '));
  }
  emit({
    measure: 'longtask_after_view_change_with_5000_assigned',
    median_ms: round1(statMedian(worst)),
    runs: worst.length,
    target: 100,
    max_ms: round1(Math.max(...worst)),
    from_250ms_median_ms: round1(statMedian(late)),
    longtasks_start_duration_ms: lists,
    note: 'diagnostic: longest long task in the 1.5 s after a box zoom (mouseup) or Zoom out (click) with 5,000 assigned lines; from_250ms: only tasks starting 250 ms or more after the input (the autosave runs at 300 ms, the redraw before it)',
  });
}

/**
 * Measure 8: a project with the 1e6 trace and 5,000 lines is opened and autosaved; each reload then
 * restores it. Navigation start → first frame with the restored table count and trace drawn.
 */
async function measureRestore(browser: Browser, baseUrl: string, inputs: BenchInputs): Promise<void> {
  const { context, page, errors } = await contextOpen(browser, baseUrl);
  try {
    await gotoDemo(page, baseUrl);
    await pause(500);
    await watchArm(page, 'projectOpen', inputs.nAssigned, 120_000);
    await chooseFile(page, inputs.projectJson);
    await watchResult(page, 'waiting for the project with 5,000 lines to open', 120_000);
    await pause(2500); // the autosave writes the trace, the assignments and the rest
    const shown: number[] = [];
    const longest: number[] = [];
    const lists: string[] = [];
    let restoredMessage = 0;
    for (let run = 0; run < RUNS; run++) {
      await page.reload({ waitUntil: 'commit', timeout: 30_000 });
      const prof = run === 0 ? await profileStart(page, 'reload: autosaved 1e6 trace + 5000 lines restored') : null;
      await page.waitForFunction(() => (window as unknown as { __lb?: { watch?: unknown } }).__lb?.watch !== undefined, null, {
        timeout: 30_000,
      });
      await watchArm(page, 'projectOpen', inputs.nAssigned, 120_000);
      const w = await watchResult(page, 'waiting for the restored session', 120_000);
      await prof?.stop();
      await pause(1000);
      const p = await probe(page);
      shown.push(w.paint);
      longest.push(longestTask(p, 0, w.paint));
      lists.push(
        p.longtasks
          .filter((t) => t.start < w.paint)
          .map((t) => `${t.start.toFixed(0)}:${t.duration.toFixed(0)}`)
          .join(' '),
      );
      if (/Restored your last session \(5000 assignments\)/.test((await page.locator('[data-testid=messages]').textContent()) ?? ''))
        restoredMessage++;
    }
    if (errors.length) note(`restore page errors: ${errors.join(' | ')}`);
    emit({
      measure: 'session_restore_1e6_trace_5000_lines',
      median_ms: round1(statMedian(shown)),
      runs: shown.length,
      target: null,
      longest_longtask_median_ms: round1(statMedian(longest)),
      longest_longtask_max_ms: round1(Math.max(...longest)),
      longtasks_start_duration_ms: lists,
      restored_message_seen: `${restoredMessage}/${shown.length}`,
      note: 'reload → paint of the first frame with 5000 assigned and the trace drawn (0 = navigation start); long tasks before that paint',
    });
  } finally {
    await context.close();
  }
}

function measureBundle(): void {
  const sizes = assetSizes(DIST);
  const sum = (f: (s: (typeof sizes)[number]) => boolean) => sizes.filter(f).reduce((t, s) => t + s.gzipBytes, 0);
  emit({
    measure: 'js_shipped_gzip',
    bytes: sum(() => true),
    runs: 1,
    target: 1_500_000,
    entry_gzip_bytes: sum((s) => s.loading === 'entry'),
    lazy_gzip_bytes: sum((s) => s.loading === 'lazy'),
    worker_gzip_bytes: sum((s) => s.loading === 'worker'),
    files: sizes.map((s) => ({ file: s.file, loading: s.loading, bytes: s.bytes, gzip_bytes: s.gzipBytes })),
    note: 'sum of dist/assets/*.js gzipped at level 6; entry = referenced by index.html (needed for first paint); lazy = dynamic import (plotly, needed for the first plot)',
  });
}

// ---------------------------------------------------------------- main

/**
 * Measure 9: a session of five bands (20,518 drawn lines at the cut BANDS_BENCH_MIN_INTENSITY), a 1e6-point trace and 10,000 assigned
 * lines: the same redraw and click-to-assign measures as 3 and 4, and the joint fit in the worker.
 */
async function measureBands(browser: Browser, baseUrl: string, dir: string): Promise<void> {
  const t = Date.now();
  const b = bandsBenchInputsWrite(dir);
  note(`several-band inputs in ${Date.now() - t} ms: ${b.nLines} lines drawn, ${b.nAssigned} assigned, ${b.tracePoints} points`);
  const { context, page, errors } = await contextOpen(browser, baseUrl);
  try {
    await gotoDemo(page, baseUrl);
    await chooseFile(page, b.systemJson);
    await page.waitForSelector('[data-testid=band-switches]', { timeout: 60_000 });
    await page.getByLabel('Intensity cut', { exact: true }).fill(String(BANDS_BENCH_MIN_INTENSITY));
    await page.getByLabel('Intensity cut', { exact: true }).press('Enter');
    await pause(800);
    await watchArm(page, 'traceRange', b.traceRangeCm1, 120_000);
    await chooseFile(page, b.traceCsv);
    await watchResult(page, 'waiting for the several-band 1e6 trace', 120_000);
    await pause(1500);
    await watchArm(page, 'projectOpen', b.nAssigned, 120_000);
    await chooseFile(page, b.lineTableCsv);
    await watchResult(page, 'waiting for the 10,000-line table', 120_000);
    await pause(1500);
    const loaded = { context, page, errors } as LoadedTrace;
    emitPrefix = 'five_bands_';
    await measureRedraw(loaded, 30);
    await measureAssign(loaded, 'five_bands_10000_assigned', Math.max(RUNS, 6, CLICKS), [
      [0.8, 0.85],
      [0.15, 0.2],
      [0.85, 0.9],
      [0.1, 0.15],
    ]);
    emitPrefix = '';
    await page.locator('[data-testid=tab-solve]').click();
    await pause(500);
    const shown: number[] = [];
    const worker: number[] = [];
    const during: number[] = [];
    const after: number[] = [];
    const cpuAfterFit: Record<keyof CpuMetrics, number>[] = [];
    let summary = '';
    for (let run = 0; run < RUNS; run++) {
      await watchArm(page, 'fitShown', null, 120_000);
      // The first fit resolves every row to its line; the last one finds them resolved.
      const prof =
        run === 0 || run === RUNS - 1 ? await profileStart(page, `joint fit of 10000 lines, five bands, run ${run + 1} of ${RUNS}`) : null;
      const a = await page.evaluate(() => performance.now());
      await page.locator('[data-testid=fit-run]').click();
      const w = await watchResult(page, 'waiting for the joint fit', 120_000);
      const cpuShown = await cpuMetricsRead(page);
      await pause(1500);
      cpuAfterFit.push(cpuPerStep(cpuShown, await cpuMetricsRead(page), 1));
      await prof?.stop();
      const p = await probe(page);
      const click = inputAfter(p, 'click', a);
      shown.push(w.paint - click);
      const post = p.workerMessages.find((m) => /solver/.test(m.url) && m.direction === 'post' && m.t >= click);
      const res = p.workerMessages.find((m) => /solver/.test(m.url) && m.direction === 'receive' && m.type === 'result' && m.t >= click);
      worker.push(post && res ? res.t - post.t : NaN);
      during.push(longestTask(p, click, w.paint));
      after.push(longestTask(p, w.paint, w.paint + 1500));
      summary = (await page.locator('[data-testid=fit-summary]').textContent()) ?? '';
      const tasks = p.longtasks.filter((t) => t.start + t.duration > click && t.start < w.paint + 1500);
      note(
        `joint fit run ${run}: click→post ${post ? round1(post.t - click) : '?'} ms, worker ${round1(worker[worker.length - 1])} ms, result→paint ${res ? round1(w.paint - res.t) : '?'} ms; long tasks from the click (start:duration ms) ${tasks.map((t) => `${round1(t.start - click)}:${round1(t.duration)}`).join(' ')}`,
      );
    }
    emit({
      measure: 'five_bands_joint_fit_10000_lines_click_to_result',
      median_ms: round1(statMedian(shown)),
      runs: shown.length,
      target: null,
      worker_post_to_result_median_ms: round1(statMedian(worker)),
      longest_longtask_median_ms: round1(statMedian(during)),
      longest_longtask_1500ms_after_median_ms: round1(statMedian(after)),
      main_thread_cpu_1500ms_after_median_ms: cpuMedians(cpuAfterFit),
      lines_drawn: b.nLines,
      summary: summary.replace(/\s+/g, ' ').trim().slice(0, 160),
    });
    if (errors.length) note(`several-band page errors: ${errors.join(' | ')}`);
  } finally {
    emitPrefix = '';
    await context.close();
  }
}

async function main(): Promise<void> {
  let server: PreviewServer | null = null;
  let browser: Browser | null = null;
  const dir = mkdtempSync(join(tmpdir(), 'ladder-bench-browserbench-'));
  const kill = setTimeout(() => {
    console.error('browserBench: the whole run exceeded 30 minutes; stopping');
    process.exit(2);
  }, 30 * 60_000);
  try {
    note(
      `serving ${DIST}; ${RUNS} runs per measure; load average ${loadavg()
        .map((v) => v.toFixed(2))
        .join(' ')}`,
    );
    if (want(7)) measureBundle();
    const needInputs = [2, 3, 4, 5, 6, 8].some(want);
    let inputs: BenchInputs | null = null;
    if (needInputs) {
      const t = Date.now();
      inputs = benchInputsWrite(workloadsRead(), dir);
      note(`inputs written to ${dir} in ${Date.now() - t} ms (${inputs.tracePoints} points, ${inputs.nAssigned} assigned lines)`);
    }
    const started = await withTimeout(previewStart(ROOT, DIST), 30_000, 'starting vite preview');
    server = started.server;
    browser = await withTimeout(chromium.launch({ executablePath: '/usr/bin/chromium', args: LAUNCH_ARGS }), 60_000, 'launching Chromium');
    if (want(1)) await measureDemo(browser, started.url);
    if (inputs && [2, 3, 4, 6].some(want)) {
      const loaded = await measureBigTrace(browser, started.url, inputs);
      if (loaded) {
        try {
          if (want(3)) await measureRedraw(loaded, 50);
          if (want(4)) {
            await measureAssign(loaded, '1e6_trace', Math.max(RUNS, 8, CLICKS), [
              [0.45, 0.5],
              [0.5, 0.55],
              [0.55, 0.6],
            ]);
          }
        } finally {
          await loaded.context.close();
        }
      }
    }
    if (inputs && [4, 5, 6].some(want)) {
      const fitPage = await measureFit(browser, started.url, inputs);
      try {
        if (want(4)) {
          // Most lines near the centre are among the 5,000 assigned: try regions towards the band's wings.
          const wings: [number, number][] = [
            [0.8, 0.85],
            [0.15, 0.2],
            [0.85, 0.9],
            [0.1, 0.15],
            [0.75, 0.8],
            [0.2, 0.25],
            [0.9, 0.95],
            [0.05, 0.1],
          ];
          await measureAssign(fitPage, 'with_5000_assigned', Math.max(RUNS, 8, CLICKS), wings);
        }
      } finally {
        await fitPage.context.close();
      }
    }
    if (inputs && want(8)) await measureRestore(browser, started.url, inputs);
    if (want(9)) await measureBands(browser, started.url, dir);
  } finally {
    clearTimeout(kill);
    await browser?.close().catch(() => undefined);
    await server?.close().catch(() => undefined);
    rmSync(dir, { recursive: true, force: true });
  }
}

main().then(
  () => process.exit(0),
  (err: Error) => {
    console.error(`browserBench failed: ${err.stack ?? err.message}`);
    process.exit(1);
  },
);
