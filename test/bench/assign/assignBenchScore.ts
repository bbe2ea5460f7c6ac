/**
 * Run the `assign` command on a generated band (in process, files served from memory) and score
 * its output against the truth. Test code, not part of the product.
 *
 * Scoring (issue 14): a row is right when its quantum numbers are a true line's and its wavenumber
 * lies within 0.5 FWHM of that line. Precision = right rows / all rows written (seeds included);
 * recall = true lines with a right row / true lines that are resolvable (no other line above 10 %
 * of their intensity within 1.5 FWHM) and have peak SNR > 20.
 */
import type { CliIo } from '../../../src/cli/cliIo';
import { cliMain } from '../../../src/cli/main';
import type { BenchBand, BenchLine } from './assignBenchBand';

/** Score of one band. */
export interface BenchScore {
  id: number;
  nSeeds: number;
  rows: number;
  right: number;
  /** Right rows / rows (1 when nothing was written). */
  precision: number;
  /** Lines counted for recall. */
  nRecallable: number;
  recall: number;
  /** Wall time of the command, ms. */
  timeMs: number;
  exitCode: number;
  /** First stderr line on failure, or the worst wrong rows. */
  detail: string;
}

/** Run `assign` on the band and score the rows. */
export async function benchRunAndScore(band: Omit<BenchBand, 'truth'>, extraArgs: string[] = []): Promise<BenchScore> {
  const files = new Map<string, string>([
    ['model.json', band.modelText],
    [band.traceName, band.traceText],
  ]);
  if (band.seedsText) files.set('seeds.csv', band.seedsText);
  const out: string[] = [];
  const err: string[] = [];
  const io: CliIo = {
    stdout: (t) => void out.push(t),
    stderr: (t) => void err.push(t),
    readFile: (path) => {
      const text = files.get(path);
      if (text === undefined) throw new Error(`no such file '${path}'`);
      return text;
    },
  };
  const args = [
    'assign',
    '--model',
    'model.json',
    '--trace',
    band.traceName,
    ...(band.seedsText ? ['--lines', 'seeds.csv'] : []),
    ...extraArgs,
  ];
  const t0 = performance.now();
  const exitCode = await cliMain(args, io);
  const timeMs = performance.now() - t0;
  return benchScore(band, out.join(''), exitCode, err.join(''), timeMs);
}

/** Score the command's stdout against the band's truth. */
export function benchScore(
  band: Pick<BenchBand, 'id' | 'lines' | 'fwhmCm1' | 'nSeeds'>,
  stdout: string,
  exitCode: number,
  stderr: string,
  timeMs: number,
): BenchScore {
  // Published lists can hold two lines with one label (a K level split in two): the nearest counts.
  const truth = new Map<string, BenchLine[]>();
  for (const l of band.lines) {
    const key = `${l.jUpper},${l.kUpper},${l.jLower},${l.kLower}`;
    truth.set(key, [...(truth.get(key) ?? []), l]);
  }
  const found = new Set<BenchLine>();
  const wrong: string[] = [];
  let rows = 0;
  let right = 0;
  const text = stdout.trim();
  const lines = text ? text.split('\n').slice(1) : [];
  for (const row of lines) {
    // The first seven columns never hold quotes (numbers and the status).
    const cells = row.split(',');
    const key = cells.slice(0, 4).join(',');
    const wn = Number(cells[4]);
    rows++;
    const t = (truth.get(key) ?? []).reduce<BenchLine | undefined>(
      (best, l) => (best === undefined || Math.abs(wn - l.nuCm1) < Math.abs(wn - best.nuCm1) ? l : best),
      undefined,
    );
    if (t && Math.abs(wn - t.nuCm1) <= 0.5 * band.fwhmCm1) {
      right++;
      found.add(t);
    } else {
      const off = t ? ((wn - t.nuCm1) / band.fwhmCm1).toFixed(1) + ' FWHM' : 'no such line';
      wrong.push(`${cells[7]} ${key} at ${wn} (${cells[6]}, ${off})`);
    }
  }
  let nRecallable = 0;
  let hit = 0;
  for (const l of band.lines) {
    if (!l.isResolvable || !(l.snr > 20)) continue;
    nRecallable++;
    if (found.has(l)) hit++;
  }
  const audit = /assign: consistency: (.*)/.exec(stderr)?.[1] ?? '';
  const held = /assign: (\d+ line\(s\) held for review)/.exec(stderr)?.[1] ?? '';
  const detail = exitCode !== 0 ? stderr.split('\n')[0] : [audit, held, ...wrong.slice(0, 4)].filter(Boolean).join('; ');
  return {
    id: band.id,
    nSeeds: band.nSeeds,
    rows,
    right,
    precision: rows ? right / rows : 1,
    nRecallable,
    recall: nRecallable ? hit / nRecallable : 1,
    timeMs,
    exitCode,
    detail,
  };
}

/** q-quantile (linear interpolation) of a list of numbers. */
export function benchQuantile(values: number[], q: number): number {
  if (values.length === 0) return NaN;
  const a = [...values].sort((x, y) => x - y);
  const t = q * (a.length - 1);
  const i = Math.floor(t);
  return i + 1 < a.length ? a[i] + (t - i) * (a[i + 1] - a[i]) : a[i];
}

/** Summary of a set of scores: median, 5th-percentile and worst recall, worst precision, time. */
export function benchSummary(scores: BenchScore[]): string {
  const recall = scores.map((s) => s.recall);
  const precision = scores.map((s) => s.precision);
  const time = scores.map((s) => s.timeMs / 1000);
  const f = (v: number) => v.toFixed(3);
  return (
    `n=${scores.length} recall median ${f(benchQuantile(recall, 0.5))} p5 ${f(benchQuantile(recall, 0.05))} worst ${f(Math.min(...recall))}; ` +
    `precision worst ${f(Math.min(...precision))} (bands < 0.99: ${precision.filter((p) => p < 0.99).length}); ` +
    `time per band median ${benchQuantile(time, 0.5).toFixed(2)} s, max ${Math.max(...time).toFixed(2)} s; failures ${scores.filter((s) => s.exitCode !== 0).length}`
  );
}
