/**
 * Build the low-resolution demo trace in public/demo/ (run: `npx tsx src/cli/makeDemoLowRes.ts`).
 * Deterministic: one seeded PRNG, fixed constants and formatting.
 *
 * The same invented molecule "LB-7" as the high-resolution demo (a C3v-like prolate top with a
 * perpendicular fundamental near 1149 cm^-1), now recorded by a Fourier-transform spectrometer at a
 * maximum optical path difference of 1 cm with Norton–Beer medium apodization: the J lines merge,
 * the Q branches of the sub-bands stand out as a series about 4.3 cm^-1 apart. Writes
 *   lowres-trace.csv — header wavenumber_cm-1,absorbance (decadic), every 0.125 cm^-1;
 *   lowres-truth.json — the true constants and how the trace was made (instrument, mass, scale,
 *                       baseline, noise, seed), for tests and for checking a contour fit;
 *   lowres-model.json — a first guess such as an earlier Q-branch analysis gives (origin 0.15 cm^-1
 *                       high, B′ and B″ 0.2 % high, A′ 0.1 % low, ζ 1 % high; A″ and the distortion
 *                       constants held at rounded values).
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { bandLines } from '../physics/bandLines';
import { instrumentSpectrum } from '../physics/instrumentSpectrum';
import { stateConstantsFrom, type BandModel } from '../physics/model';
import { makeDemoTruth } from './makeDemo';

/** The invented true constants of LB-7 (cm^-1; ζ dimensionless), 296 K: the high-resolution demo's own. */
export function makeDemoLowResTruth(): BandModel {
  return makeDemoTruth();
}

/** How the low-resolution trace is made (written into lowres-truth.json under "notes"). */
export const DEMO_LOWRES = {
  /** Maximum optical path difference, cm (resolution 1/(2L) = 0.5 cm^-1). */
  opdCm: 1,
  apodization: 'norton-beer-medium' as const,
  /** Molecular mass for the Doppler width, amu (invented, as in the high-resolution demo). */
  massAmu: 64,
  /** Axis, cm^-1. */
  fromCm1: 1080,
  toCm1: 1220,
  stepCm1: 0.125,
  /** Optical-depth scale (−ln T per unit line intensity × cm); the strongest lines saturate at their Doppler width. */
  opticalDepthScale: 1e-5,
  /** Decadic absorbance baseline c0 + c1·t, t = (2x − from − to)/(to − from). */
  baseline: [4e-5, 1.2e-5],
  /** Noise σ, decadic absorbance. */
  noiseSigma: 2e-6,
  seed: 0x4c42_0101,
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

/**
 * The low-resolution trace: decadic absorbance −log10(ILS ⊛ e^{−τ})·… + baseline + Gaussian noise
 * (Box & Muller, Ann. Math. Stat. 29, 610 (1958)).
 * @returns axis (cm^-1), noise-free and noisy absorbance
 */
export function makeDemoLowResTrace(truth: BandModel) {
  const d = DEMO_LOWRES;
  const n = Math.round((d.toCm1 - d.fromCm1) / d.stepCm1) + 1;
  const x = Float64Array.from({ length: n }, (_, i) => d.fromCm1 + i * d.stepCm1);
  const lines = bandLines(truth);
  const tau = instrumentSpectrum(lines, x, {
    opdCm: d.opdCm,
    apodization: d.apodization,
    temperatureK: truth.temperatureK,
    massAmu: d.massAmu,
    opticalDepthScale: d.opticalDepthScale,
  });
  const random = mulberry32(d.seed);
  const clean = new Float64Array(n);
  const noisy = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = (2 * x[i] - d.fromCm1 - d.toCm1) / (d.toCm1 - d.fromCm1);
    clean[i] = tau.opticalDepth[i] / Math.LN10 + d.baseline[0] + d.baseline[1] * t;
    const u = 1 - random();
    const v = random();
    noisy[i] = clean[i] + d.noiseSigma * Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  }
  return { x, clean, noisy, route: tau.route };
}

/** The first guess written to lowres-model.json (see the module comment). */
export function makeDemoLowResFirstGuess(truth: BandModel): BandModel {
  const round = (v: number, digits: number) => Number(v.toPrecision(digits));
  return {
    ...truth,
    lower: stateConstantsFrom({
      B: round(truth.lower.B * 1.002, 5),
      A: truth.lower.A,
      DJ: round(truth.lower.DJ, 1),
      DJK: round(truth.lower.DJK, 1),
      DK: round(truth.lower.DK, 1),
    }),
    upper: stateConstantsFrom({
      origin: round(truth.upper.origin + 0.15, 6),
      B: round(truth.upper.B * 1.002, 5),
      A: round(truth.upper.A * 0.999, 5),
      DJ: round(truth.lower.DJ, 1),
      DJK: round(truth.lower.DJK, 1),
      DK: round(truth.lower.DK, 1),
      zeta: round(truth.upper.zeta * 1.01, 4),
    }),
  };
}

function main(): void {
  const here = dirname(fileURLToPath(import.meta.url));
  const out = join(here, '..', '..', 'public', 'demo');
  mkdirSync(out, { recursive: true });
  const truth = makeDemoLowResTruth();
  const trace = makeDemoLowResTrace(truth);
  let csv = 'wavenumber_cm-1,absorbance\n';
  for (let i = 0; i < trace.x.length; i++) csv += `${trace.x[i].toFixed(4)},${trace.noisy[i].toExponential(6)}\n`;
  writeFileSync(join(out, 'lowres-trace.csv'), csv);
  const constants = (s: BandModel['lower']) => Object.fromEntries(Object.entries(s).filter(([, v]) => v !== 0));
  const file = {
    name: 'LB-7 (fictitious prolate top), low resolution',
    shape: truth.shape,
    band: truth.band,
    lower: constants(truth.lower),
    upper: constants(truth.upper),
    temperature: truth.temperatureK,
    jMax: truth.jMax,
    kMax: truth.kMax,
    spinWeights: truth.spinWeights,
    mass: DEMO_LOWRES.massAmu,
    notes: { ...DEMO_LOWRES, route: trace.route, points: trace.x.length },
  };
  writeFileSync(join(out, 'lowres-truth.json'), JSON.stringify(file, null, 2) + '\n');
  const guess = makeDemoLowResFirstGuess(truth);
  const held = (v: number) => ({ value: v, fixed: true });
  const model = {
    name: 'LB-7 (fictitious prolate top), first guess for the low-resolution trace',
    shape: guess.shape,
    band: guess.band,
    lower: { B: guess.lower.B, A: held(guess.lower.A), DJ: held(guess.lower.DJ), DJK: held(guess.lower.DJK), DK: held(guess.lower.DK) },
    upper: {
      origin: guess.upper.origin,
      B: guess.upper.B,
      A: guess.upper.A,
      DJ: held(guess.upper.DJ),
      DJK: held(guess.upper.DJK),
      DK: held(guess.upper.DK),
      zeta: guess.upper.zeta,
    },
    temperature: guess.temperatureK,
    jMax: guess.jMax,
    kMax: guess.kMax,
    spinWeights: guess.spinWeights,
    mass: DEMO_LOWRES.massAmu,
  };
  writeFileSync(join(out, 'lowres-model.json'), JSON.stringify(model, null, 2) + '\n');
  console.log(`wrote ${trace.x.length} points (${trace.route} route) to ${out}`);
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) main();
