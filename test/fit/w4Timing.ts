/**
 * Timing script (not a unit test) for benchmark W4 of bench/workloads.json:
 * weighted fit of the 5,000 strongest W1 lines with 13 floated constants.
 * Run: npx tsx test/fit/w4Timing.ts
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { bandLines } from '../../src/physics/bandLines';
import { stateConstantsFrom, type BandModel, type ParameterName } from '../../src/physics/model';
import { fitBand } from '../../src/fit/fitBand';
import type { FitInput, FitLineInput } from '../../src/fit/fitTypes';

interface W4Spec {
  nstrong: number;
  sigma: number;
  uncertainty: number;
  floated: string[];
  start: Record<string, string>;
}

/** Build the W4 fit input exactly as the workload text defines it. */
export function w4Input(workloads: { W1: { cut: number; model: Record<string, unknown> }; W4: W4Spec }): {
  input: FitInput;
  truth: BandModel;
} {
  const m = workloads.W1.model as {
    shape: 'prolate';
    band: 'perpendicular';
    lower: Partial<Record<ParameterName, number>>;
    upper: Partial<Record<ParameterName, number>>;
    temperature: number;
    jMax: number;
    kMax: number;
    spinWeights: number[];
  };
  const truth: BandModel = {
    shape: m.shape,
    band: m.band,
    lower: stateConstantsFrom(m.lower),
    upper: stateConstantsFrom(m.upper),
    temperatureK: m.temperature,
    jMax: m.jMax,
    kMax: m.kMax,
    spinWeights: m.spinWeights,
  };
  const lines = bandLines(truth, { minIntensity: workloads.W1.cut });
  const order = Array.from({ length: lines.count }, (_, i) => i).sort(
    (a, b) =>
      lines.intensity[b] - lines.intensity[a] ||
      lines.jLower[a] - lines.jLower[b] ||
      lines.kLower[a] - lines.kLower[b] ||
      lines.jUpper[a] - lines.jUpper[b] ||
      lines.kUpper[a] - lines.kUpper[b],
  );
  const w4 = workloads.W4;
  const fitLines: FitLineInput[] = order.slice(0, w4.nstrong).map((idx, i) => {
    const u = (((i + 1) * 2654435761) % 4294967296) / 4294967296;
    return {
      jUpper: lines.jUpper[idx],
      kUpper: lines.kUpper[idx],
      jLower: lines.jLower[idx],
      kLower: lines.kLower[idx],
      observedCm1: lines.wavenumberCm1[idx] + w4.sigma * Math.sqrt(12) * (u - 0.5),
      uncertaintyCm1: w4.uncertainty,
    };
  });
  const start: BandModel = { ...truth, lower: { ...truth.lower }, upper: { ...truth.upper } };
  for (const key of w4.floated) {
    const [side, name] = key.split('.') as ['lower' | 'upper', ParameterName];
    const rule = w4.start[name];
    if (!rule) continue;
    const x = Number(rule.slice(1));
    start[side][name] = rule[0] === '*' ? start[side][name] * x : start[side][name] + x;
  }
  return { input: { model: start, floated: w4.floated, lines: fitLines }, truth };
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const workloads = JSON.parse(readFileSync(new URL('../../bench/workloads.json', import.meta.url), 'utf8'));
  const { input, truth } = w4Input(workloads);
  // Protocol of workloads.json: 1 warm-up, then the median of 5 timed runs. V8 reaches its
  // optimising tier only after a few calls, so a second figure follows a longer warm-up
  // (20 runs, as test/bench/run.ts does).
  const timeRuns = (): number[] => {
    const out: number[] = [];
    for (let r = 0; r < workloads.timing.repeats; r++) {
      const t0 = performance.now();
      outcome = fitBand(input);
      out.push(performance.now() - t0);
    }
    return out.sort((a, b) => a - b);
  };
  let outcome = fitBand(input); // warm-up
  const times = timeRuns();
  for (let i = 0; i < 20; i++) fitBand(input);
  const warmTimes = timeRuns();
  if (!outcome.ok) throw new Error(outcome.error.message);
  const res = outcome.result;
  console.log(
    `W4: ${res.nLines} lines, ${res.nParameters} floated, ${res.iterations} iterations (${res.convergence}), σ_w = ${res.sigmaW}`,
  );
  const median = (t: number[]) => t[Math.floor(t.length / 2)].toFixed(2);
  console.log(`1 warm-up:   times ms ${times.map((t) => t.toFixed(2)).join(' ')}; median ${median(times)} ms`);
  console.log(`21 warm-ups: times ms ${warmTimes.map((t) => t.toFixed(2)).join(' ')}; median ${median(warmTimes)} ms`);
  for (const key of res.floated) {
    const [side, name] = key.split('.') as ['lower' | 'upper', ParameterName];
    const p = res.parameters[key];
    const t = truth[side][name];
    console.log(
      `${key.padEnd(14)} ${p.value.toPrecision(12).padStart(18)} ± ${p.sigma!.toExponential(2)}  (fit − truth)/σ = ${((p.value - t) / p.sigma!).toFixed(2)}`,
    );
  }
}
