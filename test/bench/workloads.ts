/**
 * Benchmark workloads W1–W5, built from the definitions in bench/workloads.json at the project root (read
 * at run time; no numbers are copied here). Each workload is split into an untimed `prepare` and a timed `run`.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { analysisRequire } from './benchDeps';

/** The parsed workloads.json (only the fields used are typed). */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type WorkloadFile = Record<string, any>;

/** Path of the workload definitions: bench/workloads.json at the project root. */
export const WORKLOADS_PATH = fileURLToPath(new URL('../../bench/workloads.json', import.meta.url));

/** Read the workload definitions. */
export function workloadsRead(path = WORKLOADS_PATH): WorkloadFile {
  return JSON.parse(readFileSync(path, 'utf8'));
}

/** A prepared workload: `run` is what is timed; `size` is reported. */
export interface PreparedWorkload {
  name: string;
  size: number;
  run: () => unknown;
}

/** Seeded uniform generator (mulberry32; T. Ettinger, public domain), returns [0, 1). */
export function seededUniform(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Seeded standard normal deviates (Box–Muller on seededUniform). */
export function seededNormal(seed: number): () => number {
  const u = seededUniform(seed);
  return () => {
    const u1 = u() || 1e-300;
    return Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u());
  };
}

/**
 * Build all five workloads. `scale` < 1 shrinks the grid and row counts for a smoke run
 * (the line list and fit keep their definitions except nstrong, which is capped by the list).
 */
export function workloadsPrepare(w: WorkloadFile, scale = 1): PreparedWorkload[] {
  const { modelFileFromJson, bandLines, spectrumSynthesizeWindowed, peaksFindSimple, fitBand, delimitedParseNumeric } = analysisRequire();
  const model = modelFileFromJson(w.W1.model).model;
  const cut = w.W1.cut as number;
  const lines = bandLines(model, { minIntensity: cut });

  // W2 grid: x0 = floor(min nu) − 1, x1 = ceil(max nu) + 1, npoints uniform.
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < lines.count; i++) {
    lo = Math.min(lo, lines.wavenumberCm1[i]);
    hi = Math.max(hi, lines.wavenumberCm1[i]);
  }
  const npoints = Math.max(1000, Math.round(w.W2.npoints * scale));
  const x0 = Math.floor(lo) - 1;
  const x1 = Math.ceil(hi) + 1;
  const grid = { fromCm1: x0, stepCm1: (x1 - x0) / (npoints - 1), npoints };
  const synthOpts = {
    temperatureK: model.temperatureK,
    massAmu: w.W2.mass_amu,
    lorentzHwhmCm1: w.W2.lorentz_hwhm,
    windowFwhm: w.W2.window_fwhm,
  };
  const spectrumOut = new Float64Array(npoints);

  // W3 input: W2 spectrum + seeded Gaussian noise of noise_rel · max(y) (made outside the timing).
  const clean = spectrumSynthesizeWindowed(lines, grid, synthOpts);
  let yMax = 0;
  for (let i = 0; i < npoints; i++) yMax = Math.max(yMax, clean[i]);
  const noiseSigma = w.W3.noise_rel * yMax;
  const normal = seededNormal(w.W3.noise_seed);
  const noisy = new Float64Array(npoints);
  const xAxis = new Float64Array(npoints);
  for (let i = 0; i < npoints; i++) {
    noisy[i] = clean[i] + noiseSigma * normal();
    xAxis[i] = x0 + i * grid.stepCm1;
  }

  // W4: the nstrong strongest lines, deterministic noise, perturbed start values.
  const order = Array.from({ length: lines.count }, (_, i) => i).sort(
    (a, b) =>
      lines.intensity[b] - lines.intensity[a] ||
      lines.jLower[a] - lines.jLower[b] ||
      lines.kLower[a] - lines.kLower[b] ||
      lines.jUpper[a] - lines.jUpper[b] ||
      lines.kUpper[a] - lines.kUpper[b],
  );
  const nStrong = Math.min(w.W4.nstrong, lines.count);
  const sigma = w.W4.sigma as number;
  const fitLines = order.slice(0, nStrong).map((li, i) => {
    const u = (((i + 1) * 2654435761) % 4294967296) / 4294967296;
    return {
      jUpper: lines.jUpper[li],
      kUpper: lines.kUpper[li],
      jLower: lines.jLower[li],
      kLower: lines.kLower[li],
      observedCm1: lines.wavenumberCm1[li] + sigma * Math.sqrt(12) * (u - 0.5),
      uncertaintyCm1: w.W4.uncertainty as number,
    };
  });
  const start = structuredClone(model);
  for (const key of w.W4.floated as string[]) {
    const [side, name] = key.split('.') as ['lower' | 'upper', keyof typeof model.lower];
    const rule = String(w.W4.start[name] ?? '');
    const truth = model[side][name];
    if (rule.startsWith('+')) start[side][name] = truth + Number(rule.slice(1));
    else if (rule.startsWith('*')) start[side][name] = truth * Number(rule.slice(1));
  }
  const fitInput = { model: start, floated: w.W4.floated as string[], lines: fitLines };

  // W5 text: header 'x,y' then nrows rows.
  const nrows = Math.max(1000, Math.round(w.W5.nrows * scale));
  const parts: string[] = ['x,y\n'];
  for (let i = 0; i < nrows; i++) {
    parts.push(`${(1000 + 0.0005 * i).toFixed(4)},${(0.5 + 0.4 * Math.sin(0.001 * i)).toFixed(6)}\n`);
  }
  const csv = parts.join('');
  const headerEnd = csv.indexOf('\n') + 1;

  return [
    { name: 'W1', size: lines.count, run: () => bandLines(model, { minIntensity: cut }) },
    { name: 'W2', size: npoints, run: () => spectrumSynthesizeWindowed(lines, grid, synthOpts, spectrumOut) },
    { name: 'W3', size: npoints, run: () => peaksFindSimple(xAxis, noisy, noiseSigma, w.W3.prominence_sigma) },
    {
      name: 'W4',
      size: nStrong,
      run: () => {
        const outcome = fitBand(fitInput);
        if (!outcome.ok) throw new Error(`W4 fit failed: ${outcome.error.message}`);
        return outcome;
      },
    },
    {
      name: 'W5',
      size: nrows,
      run: () => {
        const cols = delimitedParseNumeric(csv, { start: headerEnd });
        if (!cols) throw new Error('W5: the numeric fast path refused the text');
        return cols;
      },
    },
  ];
}

/** Median of a list of numbers. */
export function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}
