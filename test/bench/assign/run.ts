/**
 * `npm run bench:assign [-- FIRST COUNT | subset]`: the assignment assistant's robustness benchmark
 * (`subset`: the 24 smaller bands of the unit test, with their per-band lines).
 * Generates bands FIRST … FIRST+COUNT−1 (default 0 … 119; benchBand), runs the `assign` command on
 * each in process and prints one line per band, then the distribution overall and per seed count.
 * `LB_ASSIGN_JSON=1` adds one JSON line per band.
 */
import { benchBand } from './assignBenchBand';
import { benchRunAndScore, benchSummary, type BenchScore } from './assignBenchScore';

const isSubset = process.argv[2] === 'subset';
const first = isSubset ? 600 : Number(process.argv[2] ?? 0);
const count = isSubset ? 24 : Number(process.argv[3] ?? 120);
const scores: BenchScore[] = [];
for (let id = first; id < first + count; id++) {
  // `subset`: the bands of test/bench/assignBench.test.ts (same options).
  const band = isSubset ? benchBand(id, { seeds: ([10, 3, 0] as const)[id % 3], jLimit: 45, kLimit: 12 }) : benchBand(id);
  const s = await benchRunAndScore(band);
  scores.push(s);
  const mark = s.precision < 0.99 || s.exitCode !== 0 || (s.nSeeds === 10 && s.recall < 0.85) ? ' <<' : '';
  console.log(
    `#${id} P=${s.precision.toFixed(3)} R=${s.recall.toFixed(3)} rows=${s.rows} of ${s.nRecallable} ${(s.timeMs / 1000).toFixed(2)}s | ${band.summary}${mark}` +
      (s.detail ? `\n    ${s.detail}` : ''),
  );
  if (process.env.LB_ASSIGN_JSON) console.log(JSON.stringify(s));
}
console.log(`all:      ${benchSummary(scores)}`);
for (const k of [0, 3, 10]) {
  const sub = scores.filter((s) => s.nSeeds === k);
  if (sub.length) console.log(`${String(k).padStart(2)} seeds: ${benchSummary(sub)}`);
}
