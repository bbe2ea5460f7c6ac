/**
 * A fixed subset of the assignment-assistant benchmark (test/bench/assign, `npm run bench:assign`)
 * with the targets of issue 14 as assertions. Same generator as the benchmark, smaller bands
 * (J'' ≤ 45, K'' ≤ 12) so it runs in a few minutes on two cores; bands 600–623,
 * seeds 10, 3, 0 in turn (fixed before any result was seen).
 */
import { describe, expect, it } from 'vitest';
import { benchBand, type BenchBand } from './assign/assignBenchBand';
import { benchQuantile, benchRunAndScore, benchSummary, type BenchScore } from './assign/assignBenchScore';

const IDS = Array.from({ length: 24 }, (_, i) => 600 + i);
const SEEDS = [10, 3, 0] as const;

function subsetBand(id: number): BenchBand {
  return benchBand(id, { seeds: SEEDS[id % 3], jLimit: 45, kLimit: 12 });
}

describe('assign benchmark subset (issue 14 targets)', () => {
  const scores: BenchScore[] = [];
  const ready = (async () => {
    for (const id of IDS) scores.push(await benchRunAndScore(subsetBand(id)));
    console.log(`assign bench subset: ${benchSummary(scores)}`);
  })();

  it('writes no band started from seed lines with precision below 0.99 (a wrong row is worse than a missing one)', async () => {
    await ready;
    // Target of issue 14: precision ≥ 0.99 on every band; rows = seeds and proposals written.
    for (const s of scores.filter((x) => x.nSeeds > 0)) expect(s.precision, `band ${s.id}: ${s.detail}`).toBeGreaterThanOrEqual(0.99);
  }, 600_000);

  it('writes no band started from the model alone with precision below 0.99 (labels a rival fits as well go to review)', async () => {
    await ready;
    // Target of issue 14: precision ≥ 0.99 on every band, also from the model alone (a ladder laid
    // one rung or sub-band off must be refused by the rival-labelling check, assistantLabelCheck).
    for (const s of scores.filter((x) => x.nSeeds === 0)) expect(s.precision, `band ${s.id}: ${s.detail}`).toBeGreaterThanOrEqual(0.99);
  }, 600_000);

  it('with 10 seeds reaches recall ≥ 0.85 on every band and ≥ 0.95 in the median', async () => {
    await ready;
    const ten = scores.filter((s) => s.nSeeds === 10);
    expect(ten.length).toBeGreaterThanOrEqual(6);
    for (const s of ten) expect(s.recall, `band ${s.id}: ${s.detail}`).toBeGreaterThanOrEqual(0.85);
    expect(
      benchQuantile(
        ten.map((s) => s.recall),
        0.5,
      ),
    ).toBeGreaterThanOrEqual(0.95);
  }, 600_000);

  // Target of issue 14: median recall ≥ 0.90 from the model alone (8 of the 24 bands: parallel tops
  // and linear molecules). Three of them still get no start and write nothing; the median stands on
  // the other five (per-band figures in test/bench/assign/README.md).
  it('from the model alone reaches a median recall ≥ 0.90', async () => {
    await ready;
    const none = scores.filter((s) => s.nSeeds === 0);
    expect(
      benchQuantile(
        none.map((s) => s.recall),
        0.5,
      ),
    ).toBeGreaterThanOrEqual(0.9);
  }, 600_000);
});
