/**
 * Build the demo data in public/demo/ (run: `npx tsx src/cli/makeDemo.ts`). Deterministic: one seeded
 * PRNG, fixed constants, fixed number formatting, so running it twice gives identical files.
 *
 * The molecule "LB-7" is invented (no real species): a C3v-like prolate symmetric top with a
 * perpendicular fundamental near 1149 cm^-1. Writes
 *   truth.json  — the true model (model-file format) plus, under "notes", how the trace was made;
 *   model.json  — a first-guess model a user would start from (B within 0.3 %, origin within
 *                 0.2 cm^-1 of the truth, distortion constants rough);
 *   trace.csv   — the "measured" trace, header wavenumber_cm-1,transmittance;
 *   system.json, system-truth.json, system-trace.csv — the several-band demo (two isotopologues and
 *                 a hot band, makeDemoSystem.ts) in the same way.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { modelFileSerialize } from '../io/modelFile';
import { bandLines } from '../physics/bandLines';
import { stateConstantsFrom, type BandModel, type LineList } from '../physics/model';
import { systemLines } from '../physics/system/systemLines';
import { systemFileSerialize } from '../io/systemFileWrite';
import { demoSystemFirstGuess, demoSystemTruth, DEMO_SYSTEM_FLOATED } from './makeDemoSystem';
import { spectrumSynthesize } from '../physics/spectrum';

/** Name written into both model files. */
export const DEMO_NAME = 'LB-7 (fictitious prolate top)';

/** The invented true constants (cm^-1; ζ dimensionless), 296 K. */
export function makeDemoTruth(): BandModel {
  return {
    shape: 'prolate',
    band: 'perpendicular',
    lower: stateConstantsFrom({ B: 0.29183, A: 3.4127, DJ: 2.61e-7, DJK: 2.07e-6, DK: 3.3e-5 }),
    upper: stateConstantsFrom({ origin: 1148.6431, B: 0.29068, A: 3.3951, DJ: 2.58e-7, DJK: 2.21e-6, DK: 3.1e-5, zeta: 0.2873 }),
    temperatureK: 296,
    jMax: 75,
    kMax: 22,
    spinWeights: [4, 2, 2],
  };
}

/** How the trace is made; written into truth.json under "notes" so tests can rebuild it. */
export const DEMO_TRACE = {
  /** Molecular mass for the Doppler width, amu (invented). */
  massAmu: 64,
  /** Lorentz HWHM, cm^-1: pressure broadening at a few mbar plus, loosely, the instrument. */
  lorentzHwhmCm1: 0.002,
  /** Point spacing, cm^-1: a HeNe-referenced FTIR grid, 15 798.0 cm^-1 / 2^23. */
  stepCm1: 15_798.0 / 2 ** 23,
  /** Peak absorbance (−log10 T) of the strongest line before noise. */
  peakAbsorbance: 0.8,
  /** Noise σ as a fraction of the strongest line's depth (SNR = 1/this). */
  noiseFraction: 1 / 200,
  /** Lines weaker than this (relative) decide the covered range, cm^-1 margin beyond them. */
  rangeCut: 1e-3,
  rangeMarginCm1: 2,
  seed: 0x4c42_0007,
};

/** Mulberry32: small seeded 32-bit PRNG, uniform in [0, 1). Source: T. Ettinger (2017), public domain algorithm. */
function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4_294_967_296;
  };
}

/** Standard normal deviates by the Box–Muller transform (Box & Muller, Ann. Math. Stat. 29, 610, 1958). */
function gaussian(uniform: () => number): () => number {
  let spare: number | null = null;
  return () => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    const u = 1 - uniform();
    const v = uniform();
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
}

/** Round to a number of decimals (for human-looking first guesses). */
const roundTo = (x: number, decimals: number) => Number(x.toFixed(decimals));

/**
 * First-guess model from the truth: B' and B'' off by 0.1–0.3 %, origin by 0.08–0.2 cm^-1, A' by
 * ~0.5 %, ζ by ~3 %, distortion constants rounded and the upper ones copied from the lower state.
 * A'' is fixed at its true value (in practice it comes from another study: a single perpendicular
 * band cannot separate A'' from A'ζ and ν0).
 */
export function makeDemoFirstGuess(truth: BandModel, random: () => number): BandModel {
  const sign = () => (random() < 0.5 ? -1 : 1);
  const rel = (lo: number, hi: number) => sign() * (lo + (hi - lo) * random());
  const lowerB = roundTo(truth.lower.B * (1 + rel(0.001, 0.003)), 5);
  const upperB = roundTo(truth.upper.B * (1 + rel(0.001, 0.003)), 5);
  const origin = roundTo(truth.upper.origin + rel(0.08, 0.19), 2);
  const dj = Number(truth.lower.DJ.toPrecision(1));
  const djk = Number(truth.lower.DJK.toPrecision(1));
  const dk = Number(truth.lower.DK.toPrecision(1));
  return {
    ...truth,
    lower: stateConstantsFrom({ B: lowerB, A: truth.lower.A, DJ: dj, DJK: djk, DK: dk }),
    upper: stateConstantsFrom({
      origin,
      B: upperB,
      A: roundTo(truth.upper.A * (1 + rel(0.003, 0.007)), 3),
      DJ: dj,
      DJK: djk,
      DK: dk,
      zeta: roundTo(truth.upper.zeta * (1 + rel(0.02, 0.04)), 3),
    }),
    jMax: 60,
    kMax: 18,
  };
}

/** Constants the first-guess model floats. */
export const DEMO_FLOATED = [
  'upper.origin',
  'upper.B',
  'upper.A',
  'upper.zeta',
  'lower.B',
  'upper.DJ',
  'lower.DJ',
  'upper.DJK',
  'lower.DJK',
];

/**
 * Transmittance trace of the truth: T(x) = baseline(x) · 10^(−a·y(x)) + noise, clipped to [0, 1],
 * y the Voigt sum of spectrumSynthesize, a scaled so the strongest line reaches the peak
 * absorbance. Baseline: a cubic drift of up to ±1.7 % around 0.95 and an etalon fringe (period
 * 0.83 cm^-1, ±0.5 %), as a real single-beam ratio often shows.
 * @returns columns and the facts written into truth.json
 */
export function makeDemoTrace(truth: BandModel, random: () => number) {
  return makeDemoTraceOf(bandLines(truth), truth.temperatureK, random);
}

/**
 * The demo trace of any line list (makeDemoTrace's recipe: grid, Voigt sum, baseline, fringe, noise).
 * @param lines lines with relative intensities (cm^-1)
 * @param temperatureK for the Doppler width, K
 */
function makeDemoTraceOf(lines: LineList, temperatureK: number, random: () => number) {
  const t = DEMO_TRACE;
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < lines.count; i++) {
    if (lines.intensity[i] < t.rangeCut) continue;
    lo = Math.min(lo, lines.wavenumberCm1[i]);
    hi = Math.max(hi, lines.wavenumberCm1[i]);
  }
  const fromCm1 = Math.floor(lo - t.rangeMarginCm1);
  const npoints = Math.floor((Math.ceil(hi + t.rangeMarginCm1) - fromCm1) / t.stepCm1) + 1;
  const grid = { fromCm1, stepCm1: t.stepCm1, npoints };
  const y = spectrumSynthesize(lines, grid, {
    temperatureK,
    massAmu: t.massAmu,
    lorentzHwhmCm1: t.lorentzHwhmCm1,
  });
  let yMax = 0;
  for (let k = 0; k < npoints; k++) if (y[k] > yMax) yMax = y[k];
  const absorbanceScale = t.peakAbsorbance / yMax;
  const depth = 1 - 10 ** -t.peakAbsorbance;
  const noiseSigma = 0.95 * depth * t.noiseFraction;
  const normal = gaussian(random);
  const phase = 2 * Math.PI * random();
  const c = [random() - 0.5, random() - 0.5, random() - 0.5].map((v) => 0.02 * v);
  const x = new Float64Array(npoints);
  const transmittance = new Float64Array(npoints);
  const span = (npoints - 1) * t.stepCm1;
  for (let k = 0; k < npoints; k++) {
    const xk = fromCm1 + k * t.stepCm1;
    const u = (2 * (xk - fromCm1)) / span - 1;
    const baseline = 0.95 + c[0] * u + c[1] * (u * u - 1 / 3) + c[2] * u * u * u + 0.005 * Math.sin((2 * Math.PI * xk) / 0.83 + phase);
    const value = baseline * 10 ** (-absorbanceScale * y[k]) + noiseSigma * normal();
    x[k] = xk;
    transmittance[k] = Math.min(1, Math.max(0, value));
  }
  return { x, transmittance, lines: lines.count, grid, absorbanceScale, noiseSigma, baselineCoefficients: c, fringePhase: phase };
}

/** Write model.json, truth.json, trace.csv into the directory. */
export function makeDemo(outDir: string): { points: number; lines: number; bytes: number } {
  const random = mulberry32(DEMO_TRACE.seed);
  const truth = makeDemoTruth();
  const guess = makeDemoFirstGuess(truth, random);
  const trace = makeDemoTrace(truth, random);
  mkdirSync(outDir, { recursive: true });

  const truthJson = JSON.parse(modelFileSerialize({ model: truth, floated: DEMO_FLOATED, massAmu: DEMO_TRACE.massAmu, name: DEMO_NAME }));
  truthJson.notes = {
    about: 'True constants of the invented molecule LB-7 and how public/demo/trace.csv was made (src/cli/makeDemo.ts).',
    lorentzHwhmCm1: DEMO_TRACE.lorentzHwhmCm1,
    massAmu: DEMO_TRACE.massAmu,
    gridFromCm1: trace.grid.fromCm1,
    gridStepCm1: trace.grid.stepCm1,
    gridPoints: trace.grid.npoints,
    peakAbsorbance: DEMO_TRACE.peakAbsorbance,
    absorbancePerUnitY: trace.absorbanceScale,
    noiseSigmaTransmittance: trace.noiseSigma,
    lines: trace.lines,
    seed: DEMO_TRACE.seed,
  };
  writeFileSync(join(outDir, 'truth.json'), JSON.stringify(truthJson, null, 2) + '\n');
  writeFileSync(
    join(outDir, 'model.json'),
    modelFileSerialize({ model: guess, floated: DEMO_FLOATED, massAmu: DEMO_TRACE.massAmu, name: DEMO_NAME }),
  );

  const csv = traceCsv(trace);
  writeFileSync(join(outDir, 'trace.csv'), csv);
  makeDemoSystemFiles(outDir);
  return { points: trace.x.length, lines: trace.lines, bytes: csv.length };
}

function traceCsv(trace: { x: Float64Array; transmittance: Float64Array }): string {
  const rows: string[] = ['wavenumber_cm-1,transmittance'];
  for (let k = 0; k < trace.x.length; k++) rows.push(`${trace.x[k].toFixed(6)},${trace.transmittance[k].toFixed(5)}`);
  return rows.join('\n') + '\n';
}

/** Seed of the several-band demo (its own stream, so the single-band files stay as they were). */
const DEMO_SYSTEM_SEED = 0x4c42_0015;

/**
 * The several-band demo (src/cli/makeDemoSystem.ts): system.json (first guess, system-file format),
 * system-truth.json and system-trace.csv (made as trace.csv, from every line of every band).
 */
function makeDemoSystemFiles(outDir: string): void {
  const random = mulberry32(DEMO_SYSTEM_SEED);
  const truth = demoSystemTruth();
  const guess = demoSystemFirstGuess(truth, random);
  const trace = makeDemoTraceOf(systemLines(truth), truth.temperatureK, random);
  const name = 'LB-7 and LB-7-66 (fictitious prolate tops), nu4 and a hot band';
  writeFileSync(join(outDir, 'system.json'), systemFileSerialize(guess, { floated: DEMO_SYSTEM_FLOATED, name }));
  writeFileSync(join(outDir, 'system-truth.json'), systemFileSerialize(truth, { floated: DEMO_SYSTEM_FLOATED, name }));
  writeFileSync(join(outDir, 'system-trace.csv'), traceCsv(trace));
}

const isEntry = process.argv[1] && /makeDemo\.ts$/.test(process.argv[1]);
if (isEntry) {
  const outDir = join(dirname(fileURLToPath(import.meta.url)), '../../public/demo');
  const r = makeDemo(outDir);
  process.stdout.write(`wrote ${outDir}: trace ${r.points} points (${(r.bytes / 1e6).toFixed(2)} MB), ${r.lines} lines\n`);
}
