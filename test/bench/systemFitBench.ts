/**
 * `npm run bench:system-fit`: times the joint fit of several bands (fit/systemFit.ts) on the real HC3N
 * problem (1,570 lines, 37 constants; test/fit/systemFitHc3nData.ts) and on a synthetic system of
 * 10,000 lines (two isotopologues, six bands, 38 constants; test/fit/systemFitTestData.ts), and prints
 * one JSON line per case: {"case", "median_ms", "median_cpu_ms", "runs", "lines", "parameters",
 * "iterations", "loadavg"}. The whole call is timed (set-up, iterations, statistics, per-line results).
 * Wall time grows with the machine's load; the process CPU time much less, so both are printed.
 * Not a unit test: timing is measured, never asserted. LB_BENCH_REPEATS sets the repeat count.
 */
import { loadavg } from 'node:os';
import { systemFit, type SystemFitInput } from '../../src/fit/systemFit';
import { hc3nProblem } from '../fit/systemFitHc3nData';
import { systemFitBigProblem } from '../fit/systemFitTestData';

const repeats = Math.max(5, Number(process.env.LB_BENCH_REPEATS ?? 11));
const median = (v: number[]) => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)];

const hc3n = hc3nProblem();
const big = systemFitBigProblem();
const cases: { name: string; input: SystemFitInput }[] = [
  { name: 'HC3N joint fit (real lines)', input: { model: hc3n.file.model, parameters: hc3n.file.parameters, lines: hc3n.lines } },
  { name: 'synthetic 10k-line system', input: { model: big.truth.model, parameters: big.parameters, lines: big.lines } },
];

for (const c of cases) {
  const run = () => {
    const o = systemFit(c.input);
    if (!o.ok) throw new Error(o.error.message);
    return o.result;
  };
  const warmStart = performance.now();
  for (let i = 0; i < 3 || (i < 20 && performance.now() - warmStart < 1000); i++) run();
  const times: number[] = [];
  const cpuTimes: number[] = [];
  let result = run();
  for (let i = 0; i < repeats; i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    result = run();
    times.push(performance.now() - t0);
    const c1 = process.cpuUsage(c0);
    cpuTimes.push((c1.user + c1.system) / 1000);
  }
  console.log(
    JSON.stringify({
      case: c.name,
      median_ms: Number(median(times).toFixed(1)),
      median_cpu_ms: Number(median(cpuTimes).toFixed(1)),
      runs: repeats,
      lines: result.nLines,
      parameters: result.nParameters,
      iterations: result.iterations,
      loadavg: loadavg()[0],
    }),
  );
}
