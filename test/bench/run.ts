/**
 * `npm run bench`: times workloads W1–W5 of bench/workloads.json in-process and prints one
 * JSON line per workload: {"workload", "median_ms", "runs", "size"}. Warm-up and repeat counts come
 * from the file (at least 5 timed runs); LB_BENCH_REPEATS raises the repeat count.
 *
 * Warm-up: the file's count is a minimum. V8 compiles a hot function with its optimising tier only
 * after it has run for a while, so a single warm-up times the interpreter for short workloads (W1
 * then reads ~35 ms instead of ~1.5 ms). Warm-up therefore continues until at least 20 runs or
 * 0.5 s have passed, whichever comes first, and the timed runs follow as the file defines them.
 */
import { median, workloadsPrepare, workloadsRead } from './workloads';

const file = workloadsRead();
const warmup = Math.max(1, Number(file.timing?.warmup ?? 1));
const repeats = Math.max(5, Number(file.timing?.repeats ?? 5), Number(process.env.LB_BENCH_REPEATS ?? 0));
const only = process.argv.slice(2);

for (const w of workloadsPrepare(file)) {
  if (only.length && !only.includes(w.name)) continue;
  const warmStart = performance.now();
  for (let i = 0; i < warmup || (i < 20 && performance.now() - warmStart < 500); i++) w.run();
  const times: number[] = [];
  for (let i = 0; i < repeats; i++) {
    const t0 = performance.now();
    w.run();
    times.push(performance.now() - t0);
  }
  console.log(JSON.stringify({ workload: w.name, median_ms: Number(median(times).toFixed(3)), runs: repeats, size: w.size }));
}
