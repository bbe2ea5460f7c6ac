/**
 * `npm run bench:assign [-- FIRST COUNT]`: the assignment assistant's robustness benchmark.
 * Generates bands FIRST … FIRST+COUNT−1 (default 0 … 119; benchBand), runs the `assign` command on
 * each in process and prints one line per band, then the distribution overall and per seed count.
 * `LB_ASSIGN_JSON=1` adds one JSON line per band.
 */
import { benchBand } from './assignBenchBand';
import { benchRunAndScore, benchSummary, type BenchScore } from './assignBenchScore';

const first = Number(process.argv[2] ?? 0);
const count = Number(process.argv[3] ?? 120);
const scores: BenchScore[] = [];
for (let id = first; id < first + count; id++) {
  const band = benchBand(id);
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
