/**
 * Helpers of the browser benchmark (browserBench.ts): statistics, the built app served by
 * `vite preview`, the generated input files (a 1,000,000-point trace, a model file, a project file
 * with 5,000 assigned lines) and the in-page probes (long tasks, worker messages, paint markers).
 * Nothing here changes the app: the probes only listen (PerformanceObserver, event listeners, a
 * Worker subclass that records message times and passes everything on unchanged).
 */
import { readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { preview, type PreviewServer } from 'vite';
import { projectFileSerialize } from '../../src/io/projectFile';
import { modelFileFromJson } from '../../src/io/modelFile';
import { bandLines } from '../../src/physics/bandLines';
import type { BandModel, LineList } from '../../src/physics/model';
import { spectrumSynthesizeWindowed } from '../../src/physics/spectrum';
import { sessionOf, stateFromSession } from '../../src/state/session';
import { benchReset, benchStore } from '../../src/state/store';
import { seededNormal, type WorkloadFile } from './workloads';

// ---------------------------------------------------------------- statistics

/** Median of a non-empty list. */
export function statMedian(values: readonly number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

/**
 * Percentile by the nearest-rank method: the smallest value with at least p % of the list at or below it.
 * Source: common practice (nearest-rank definition, e.g. NIST/SEMATECH e-Handbook §7.2.6.2 lists it among the definitions).
 * @param p percent, 0 < p <= 100
 */
export function statPercentile(values: readonly number[], p: number): number {
  if (values.length === 0) throw new Error('statPercentile: empty list');
  if (!(p > 0 && p <= 100)) throw new Error(`statPercentile: p must be in (0, 100], got ${p}`);
  const s = [...values].sort((a, b) => a - b);
  return s[Math.min(s.length, Math.ceil((p / 100) * s.length)) - 1];
}

/** Round to 0.1 (ms figures). */
export function round1(v: number): number {
  return Math.round(v * 10) / 10;
}

/** Reject with a clear message when `work` takes longer than `ms`. */
export async function withTimeout<T>(work: Promise<T>, ms: number, what: string): Promise<T> {
  let timer: ReturnType<typeof setTimeout> | undefined;
  const limit = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error(`browserBench: timed out after ${ms} ms while ${what}`)), ms);
  });
  try {
    return await Promise.race([work, limit]);
  } finally {
    clearTimeout(timer);
  }
}

// ---------------------------------------------------------------- server

/** A free TCP port on 127.0.0.1. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const port = (s.address() as { port: number }).port;
      s.close(() => resolve(port));
    });
  });
}

/** Serve a built app folder with vite preview on a free port. */
export async function previewStart(root: string, outDir: string): Promise<{ url: string; server: PreviewServer }> {
  const port = await freePort();
  const server = await preview({
    root,
    configFile: join(root, 'vite.config.ts'),
    logLevel: 'warn',
    build: { outDir },
    preview: { port, strictPort: true, host: '127.0.0.1', open: false },
  });
  return { url: `http://127.0.0.1:${port}`, server };
}

// ---------------------------------------------------------------- shipped JavaScript

/** Gzipped size of one built file. */
export interface AssetSize {
  file: string;
  bytes: number;
  gzipBytes: number;
  /** How the page gets it: 'entry' (script/modulepreload in index.html), 'lazy' (dynamic import) or 'worker'. */
  loading: 'entry' | 'lazy' | 'worker';
}

/**
 * Sizes of dist/assets/*.js, raw and gzipped (zlib level 6, the usual server setting), split by how
 * index.html and the chunk names say they load.
 */
export function assetSizes(distDir: string): AssetSize[] {
  const html = readFileSync(join(distDir, 'index.html'), 'utf8');
  const referenced = new Set([...html.matchAll(/(?:src|href)="\/?(assets\/[^"]+\.js)"/g)].map((m) => m[1]));
  const dir = join(distDir, 'assets');
  return readdirSync(dir)
    .filter((f) => f.endsWith('.js'))
    .map((f) => {
      const body = readFileSync(join(dir, f));
      const rel = `assets/${f}`;
      const loading: AssetSize['loading'] = referenced.has(rel) ? 'entry' : /worker/i.test(f) ? 'worker' : 'lazy';
      return { file: rel, bytes: statSync(join(dir, f)).size, gzipBytes: gzipSync(body, { level: 6 }).length, loading };
    })
    .sort((a, b) => b.gzipBytes - a.gzipBytes);
}

// ---------------------------------------------------------------- generated inputs

/** Files written for the benchmark (all in a temporary folder). */
export interface BenchInputs {
  /** Two-column CSV, 1,000,000 points (absorbance). */
  traceCsv: string;
  traceFileName: string;
  traceRangeCm1: [number, number];
  tracePoints: number;
  /** Model file of the W1 model (the trace's true constants). */
  modelJson: string;
  /** Project file: the trace, the W4 start model, its floated constants and 5,000 assigned lines. */
  projectJson: string;
  projectFileName: string;
  nAssigned: number;
}

/** Row keys "r:K", "p:K", "q:K" for K'' = from..kMax (the rows the page hides for the demo). */
export function hiddenRowKeys(from: number, kMax: number): string[] {
  const out: string[] = [];
  for (let k = from; k <= kMax; k++) out.push(`r:${k}`, `p:${k}`, `q:${k}`);
  return out;
}

/**
 * Write the benchmark's input files: a 1e6-point absorbance trace of the W1 lines (Voigt profiles by
 * the engine's windowed synthesis on the W2 grid, scaled to a strongest peak of 1, plus seeded
 * Gaussian noise of 1e-3 as in W3), the W1 model as a model file, and a project file holding the
 * same trace with the W4 fit set-up (5,000 strongest lines, deterministic noise, perturbed start).
 * @param w the parsed workloads.json
 * @param dir folder to write into
 */
export function benchInputsWrite(w: WorkloadFile, dir: string): BenchInputs {
  const truth: BandModel = modelFileFromJson(w.W1.model).model;
  const lines: LineList = bandLines(truth, { minIntensity: w.W1.cut });
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < lines.count; i++) {
    lo = Math.min(lo, lines.wavenumberCm1[i]);
    hi = Math.max(hi, lines.wavenumberCm1[i]);
  }
  const npoints = w.W2.npoints as number;
  const x0 = Math.floor(lo) - 1;
  const x1 = Math.ceil(hi) + 1;
  const step = (x1 - x0) / (npoints - 1);
  const clean = spectrumSynthesizeWindowed(
    lines,
    { fromCm1: x0, stepCm1: step, npoints },
    { temperatureK: truth.temperatureK, massAmu: w.W2.mass_amu, lorentzHwhmCm1: w.W2.lorentz_hwhm, windowFwhm: w.W2.window_fwhm },
  );
  let yMax = 0;
  for (let i = 0; i < npoints; i++) yMax = Math.max(yMax, clean[i]);
  const normal = seededNormal(w.W3.noise_seed);
  const x = new Float64Array(npoints);
  const y = new Float64Array(npoints);
  const rows: string[] = ['wavenumber_cm-1,absorbance'];
  for (let i = 0; i < npoints; i++) {
    // Rounded to what the CSV holds, so the project's trace equals the file's.
    x[i] = Number((x0 + i * step).toFixed(6));
    y[i] = Number((clean[i] / yMax + w.W3.noise_rel * normal()).toFixed(6));
    rows.push(`${x[i].toFixed(6)},${y[i].toFixed(6)}`);
  }
  const traceFileName = 'bench-1e6-points.csv';
  const traceCsv = join(dir, traceFileName);
  writeFileSync(traceCsv, rows.join('\n') + '\n');

  const modelJson = join(dir, 'bench-w1-model.json');
  writeFileSync(modelJson, JSON.stringify({ name: 'bench W1 (fictitious)', ...w.W1.model, mass: w.W2.mass_amu }, null, 1));

  // W4 lines: the nstrong strongest, ties by J'', K'', J', K' (as workloads.ts builds them).
  const order = Array.from({ length: lines.count }, (_, i) => i).sort(
    (a, b) =>
      lines.intensity[b] - lines.intensity[a] ||
      lines.jLower[a] - lines.jLower[b] ||
      lines.kLower[a] - lines.kLower[b] ||
      lines.jUpper[a] - lines.jUpper[b] ||
      lines.kUpper[a] - lines.kUpper[b],
  );
  const nStrong = Math.min(w.W4.nstrong as number, lines.count);
  const sigma = w.W4.sigma as number;
  const assignments = order.slice(0, nStrong).map((li, i) => {
    const u = (((i + 1) * 2654435761) % 4294967296) / 4294967296;
    return {
      id: `a${i + 1}`,
      jUpper: lines.jUpper[li],
      kUpper: lines.kUpper[li],
      jLower: lines.jLower[li],
      kLower: lines.kLower[li],
      observedCm1: lines.wavenumberCm1[li] + sigma * Math.sqrt(12) * (u - 0.5),
      uncertaintyCm1: w.W4.uncertainty as number,
      isBlended: false,
      isExcluded: false,
      note: '',
    };
  });
  const start: BandModel = structuredClone(truth);
  for (const key of w.W4.floated as string[]) {
    const [side, name] = key.split('.') as ['lower' | 'upper', keyof BandModel['lower']];
    const rule = String(w.W4.start[name] ?? '');
    const t = truth[side][name] as number;
    if (rule.startsWith('+')) start[side][name] = t + Number(rule.slice(1));
    else if (rule.startsWith('*')) start[side][name] = t * Number(rule.slice(1));
  }
  // The page's own session defaults fill every field the benchmark does not set.
  benchReset();
  benchStore.setState(
    stateFromSession({
      model: start,
      floated: [...(w.W4.floated as string[])],
      modelName: 'bench W4 start (fictitious)',
      massAmu: w.W2.mass_amu,
      trace: { wavenumberCm1: x, absorbance: y },
      traceSource: 'project',
      assignments,
      nextAssignmentNumber: nStrong + 1,
      view: { hiddenRows: hiddenRowKeys(9, truth.kMax) } as never,
    }),
  );
  const projectFileName = 'bench-5000-lines.lbproj.json';
  const projectJson = join(dir, projectFileName);
  writeFileSync(
    projectJson,
    projectFileSerialize(sessionOf(benchStore.getState()), { appVersion: 'bench', savedAt: '2000-01-01T00:00:00.000Z' }),
  );
  benchReset();
  return {
    traceCsv,
    traceFileName,
    traceRangeCm1: [x[0], x[npoints - 1]],
    tracePoints: npoints,
    modelJson,
    projectJson,
    projectFileName,
    nAssigned: nStrong,
  };
}

// ---------------------------------------------------------------- in-page probes

/** What the probes record in the page (window.__lb). */
export interface PageProbe {
  longtasks: { start: number; duration: number }[];
  events: { name: string; start: number; duration: number; processingStart: number; processingEnd: number }[];
  workerMessages: { t: number; direction: 'post' | 'receive'; type: string; url: string }[];
  inputs: { type: string; t: number }[];
  paints: { name: string; start: number }[];
}

/**
 * Script run in the page before any of its own: long-task, event-timing and paint observers, the
 * time stamps of user input events, and a Worker subclass that records when messages are posted and
 * received (their `type` field) and otherwise behaves exactly like Worker.
 */
export function pageProbeInstall(): void {
  const w = window as unknown as { __lb: PageProbe; Worker: typeof Worker };
  const lb: PageProbe = { longtasks: [], events: [], workerMessages: [], inputs: [], paints: [] };
  w.__lb = lb;
  try {
    new PerformanceObserver((list) => {
      for (const e of list.getEntries()) lb.longtasks.push({ start: e.startTime, duration: e.duration });
    }).observe({ type: 'longtask', buffered: true });
  } catch {
    // longtask not supported: the bench reports none found.
  }
  try {
    new PerformanceObserver((list) => {
      for (const e of list.getEntries() as PerformanceEventTiming[]) {
        lb.events.push({
          name: e.name,
          start: e.startTime,
          duration: e.duration,
          processingStart: e.processingStart,
          processingEnd: e.processingEnd,
        });
      }
    }).observe({ type: 'event', buffered: true, durationThreshold: 16 } as PerformanceObserverInit);
  } catch {
    // Event Timing not supported.
  }
  try {
    new PerformanceObserver((list) => {
      for (const e of list.getEntries()) lb.paints.push({ name: e.name, start: e.startTime });
    }).observe({ type: 'paint', buffered: true });
  } catch {
    // no paint timing
  }
  for (const type of ['mousedown', 'mouseup', 'click', 'dblclick', 'change']) {
    window.addEventListener(type, (e) => lb.inputs.push({ type, t: e.timeStamp }), true);
  }
  const Base = w.Worker;
  class ProbedWorker extends Base {
    private readonly probeUrl: string;
    constructor(url: string | URL, options?: WorkerOptions) {
      super(url, options);
      this.probeUrl = String(url);
      // Registered before the app's own handler, so the time is taken when the message arrives.
      this.addEventListener('message', (e: MessageEvent) => {
        const d = e.data as { type?: unknown } | null;
        lb.workerMessages.push({ t: performance.now(), direction: 'receive', type: String(d?.type ?? ''), url: this.probeUrl });
      });
    }
    override postMessage(message: unknown, transfer?: Transferable[] | StructuredSerializeOptions): void {
      const d = message as { type?: unknown } | null;
      lb.workerMessages.push({ t: performance.now(), direction: 'post', type: String(d?.type ?? ''), url: this.probeUrl });
      super.postMessage(message, transfer as Transferable[]);
    }
  }
  w.Worker = ProbedWorker;
}

// ---------------------------------------------------------------- CPU profiles (diagnosis)

/** The parts of a CDP Profiler.Profile used here. */
export interface CpuProfile {
  nodes: { id: number; callFrame: { functionName: string; url: string; lineNumber: number }; children?: number[] }[];
  samples: number[];
  timeDeltas: number[];
}

/** Main-thread time by function: self (in the function itself) and total (function and its callees), ms. */
export interface ProfileRow {
  fn: string;
  selfMs: number;
  totalMs: number;
}

/**
 * Summarise a sampled CPU profile: time per function name and file ("name @ file:line"), self and
 * inclusive (a function counted once per sample however deep it recurses). Idle, program and GC are
 * kept under their own names.
 * @param topN rows kept, by each ordering
 */
export function profileSummary(profile: CpuProfile, topN = 15): { bySelf: ProfileRow[]; byTotal: ProfileRow[]; sampledMs: number } {
  const parent = new Map<number, number>();
  const byId = new Map(profile.nodes.map((n) => [n.id, n]));
  for (const n of profile.nodes) for (const c of n.children ?? []) parent.set(c, n.id);
  const label = (id: number) => {
    const f = byId.get(id)!.callFrame;
    const file = f.url ? f.url.slice(f.url.lastIndexOf('/') + 1).replace(/-[A-Za-z0-9_-]{8}\.js$/, '.js') : '';
    return `${f.functionName || '(anonymous)'}${file ? ` @ ${file}:${f.lineNumber + 1}` : ''}`;
  };
  const self = new Map<string, number>();
  const total = new Map<string, number>();
  let sampledMs = 0;
  for (let i = 0; i < profile.samples.length; i++) {
    const dt = (profile.timeDeltas[i + 1] ?? 0) / 1000;
    const id = profile.samples[i];
    sampledMs += dt;
    const own = label(id);
    self.set(own, (self.get(own) ?? 0) + dt);
    const seen = new Set<string>();
    for (let n: number | undefined = id; n !== undefined; n = parent.get(n)) {
      const l = label(n);
      if (seen.has(l)) continue;
      seen.add(l);
      total.set(l, (total.get(l) ?? 0) + dt);
    }
  }
  const rows = [...self.keys()].map((fn) => ({ fn, selfMs: round1(self.get(fn) ?? 0), totalMs: round1(total.get(fn) ?? 0) }));
  const totals = [...total.keys()].map((fn) => ({ fn, selfMs: round1(self.get(fn) ?? 0), totalMs: round1(total.get(fn) ?? 0) }));
  const skip = /^\((root|program|idle)\)/;
  return {
    bySelf: rows
      .filter((r) => !skip.test(r.fn))
      .sort((a, b) => b.selfMs - a.selfMs)
      .slice(0, topN),
    byTotal: totals
      .filter((r) => !skip.test(r.fn))
      .sort((a, b) => b.totalMs - a.totalMs)
      .slice(0, topN),
    sampledMs: round1(sampledMs),
  };
}
