/**
 * `npm run bench:assign:real [-- ch3cn|ph3 [FIRST COUNT]]`: the assignment assistant on
 * traces made from published line lists of real molecules (realBand.ts), 0, 3 and 10 seeds in turn,
 * scored like the generated benchmark. `LB_ASSIGN_JSON=1` adds one JSON line per band.
 */
import { benchRunAndScore, benchSummary, type BenchScore } from './assignBenchScore';
import { REAL_RECIPES, realBand } from './realBand';

const name = (process.argv[2] ?? 'ch3cn') as keyof typeof REAL_RECIPES;
const recipe = REAL_RECIPES[name];
if (!recipe) throw new Error(`unknown band '${name}': one of ${Object.keys(REAL_RECIPES).join(', ')}`);
const first = Number(process.argv[3] ?? 0);
const count = Number(process.argv[4] ?? 6);
const scores: BenchScore[] = [];
for (let id = first; id < first + count; id++) {
  const band = realBand(recipe, id, ([0, 3, 10] as const)[id % 3]);
  const s = await benchRunAndScore(band);
  scores.push(s);
  const mark = s.precision < 0.99 || s.exitCode !== 0 ? ' <<' : '';
  console.log(
    `#${id} P=${s.precision.toFixed(3)} R=${s.recall.toFixed(3)} rows=${s.rows} of ${s.nRecallable} ${(s.timeMs / 1000).toFixed(2)}s | ${band.summary}${mark}` +
      (s.detail ? `\n    ${s.detail}` : ''),
  );
  if (process.env.LB_ASSIGN_JSON) console.log(JSON.stringify(s));
}
console.log(`all:      ${benchSummary(scores)}`);
