/**
 * Timing of peaksFindSimple on a W3-like input (not a unit test; run with
 * `npx tsx test/analysis/peaksFindSimple.timing.ts`). 1,000,000 points of Gaussian-blended lines
 * plus seeded Gaussian noise of 1e-3 × max; median of 5 runs after 1 warm-up, as in workloads.json.
 */
import { peaksFindSimple } from '../../src/analysis/peaksFindSimple';
import { noiseSigmaEstimate } from '../../src/analysis/noiseSigmaEstimate';
import { randomNormal, randomSeeded } from './syntheticTrace';

const n = 1_000_000;
const x = new Float64Array(n);
const y = new Float64Array(n);
const x0 = 1300;
const x1 = 1450;
for (let i = 0; i < n; i++) x[i] = x0 + (i * (x1 - x0)) / (n - 1);
// A ladder of lines 0.25 cm^-1 apart, Doppler-like FWHM 0.003 cm^-1, varying strengths.
const fwhm = 0.003;
const s = fwhm / (2 * Math.sqrt(2 * Math.LN2));
const h = (x1 - x0) / (n - 1);
let maxY = 0;
for (let c = x0 + 0.5, j = 0; c < x1 - 0.5; c += 0.25, j++) {
  const amp = 0.1 + 0.9 * Math.abs(Math.sin(j * 0.37));
  const i0 = Math.max(0, Math.floor((c - x0 - 10 * fwhm) / h));
  const i1 = Math.min(n - 1, Math.ceil((c - x0 + 10 * fwhm) / h));
  for (let i = i0; i <= i1; i++) y[i] += amp * Math.exp(-0.5 * ((x[i] - c) / s) ** 2);
}
for (let i = 0; i < n; i++) if (y[i] > maxY) maxY = y[i];
const sigma = 1e-3 * maxY;
const rand = randomSeeded(12345);
for (let i = 0; i < n; i++) y[i] += sigma * randomNormal(rand);

const times: number[] = [];
let count = 0;
for (let r = 0; r < 6; r++) {
  const t = performance.now();
  count = peaksFindSimple(x, y, sigma, 5).count;
  const dt = performance.now() - t;
  if (r > 0) times.push(dt);
}
times.sort((a, b) => a - b);
const t = performance.now();
const est = noiseSigmaEstimate(x, y);
const tNoise = performance.now() - t;
console.log(`peaksFindSimple n=${n}: ${count} peaks, median ${times[2].toFixed(2)} ms (runs ${times.map((v) => v.toFixed(1)).join(', ')})`);
console.log(`noiseSigmaEstimate: ${est.toExponential(4)} vs true ${sigma.toExponential(4)} (${tNoise.toFixed(1)} ms)`);

// For comparison, the careful peaksFind on the same trace (single run; it is not benchmarked).
{
  const { peaksFind } = await import('../../src/analysis/peaksFind');
  const t0 = performance.now();
  const list = peaksFind({ wavenumberCm1: x, absorbance: y });
  console.log(`peaksFind (estimated σ, minSnr 5): ${list.count} peaks in ${(performance.now() - t0).toFixed(0)} ms`);
}
