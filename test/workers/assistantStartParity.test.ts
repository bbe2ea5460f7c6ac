/**
 * The page's assistant runs the same start as the `assign` command (assistantStartRun): on bands of
 * the assignment benchmark's independent generator (test/bench/assign/assignBenchBand.ts: its own
 * term values, Hönl–London factors, line shapes and noise; a first guess with a user's errors), a
 * model-only run of the page's job (kind 'run', empty table) offers as 'confident' exactly the rows
 * the command writes (same quanta, same peak), and those rows are the generator's true lines.
 * Band 81 (prolate perpendicular, dense): the first run reaches one sub-band and only the comb of
 * the other sub-bands (assistantQHeadStart) brings the rest; band 602 (prolate parallel, J'' ≤ 45):
 * the shared-shift run writes nothing and the staged start (assistantParallelStart) is kept.
 * Cancellation: a model-only run stopped through isCancelled throws the cancellation and returns
 * nothing, and the page's client on this thread stops when its signal is aborted.
 */
import { describe, expect, it } from 'vitest';
import { AssistantCancelledError } from '../../src/analysis/assistantAutoExtend';
import { peaksFind, type PeakList } from '../../src/analysis/peaksFind';
import { ASSIGN_MIN_SNR } from '../../src/cli/assignCommand';
import { modelFileParse } from '../../src/io/modelFile';
import { importTrace } from '../../src/io/traceImport';
import { assistantJobStart } from '../../src/workers/assistantClient';
import { assistantJobRun } from '../../src/workers/assistantJob';
import type { AssistantProposalsOutput, AssistantRunJob } from '../../src/workers/assistantProtocol';
import { benchBand, type BenchBand } from '../bench/assign/assignBenchBand';
import { cliRunMemory } from '../cli/cliRunMemory';
import { assistantBandGuess, assistantBandTrace } from '../state/assistantBand';

/** The page's job for a band, model only: its model file's floated keys, the peaks the command finds. */
function pageJob(band: BenchBand): AssistantRunJob {
  const file = modelFileParse(band.modelText);
  const imported = importTrace(band.traceText, band.traceName);
  if (!imported.ok) throw new Error(`test band ${band.id}: ${imported.error.message}`);
  const peaks: PeakList = peaksFind(imported.trace, { minSnr: ASSIGN_MIN_SNR });
  return { kind: 'run', model: file.model, floatable: [...file.floated], peaks, assignments: [], rejected: [] };
}

/** The command's rows as "J',K',J'',K''@wavenumber" (wavenumber as it prints it, 6 decimals). */
async function commandRows(band: BenchBand): Promise<{ rows: string[]; firstLine: string }> {
  const r = await cliRunMemory(['assign', '--model', 'model.json', '--trace', band.traceName], {
    'model.json': band.modelText,
    [band.traceName]: band.traceText,
  });
  expect(r.code, r.stderr).toBe(0);
  const rows = r.stdout
    .trim()
    .split('\n')
    .slice(1)
    .map((row) => {
      const c = row.split(',');
      return `${c[0]},${c[1]},${c[2]},${c[3]}@${c[4]}`;
    });
  return { rows, firstLine: r.stderr.split('\n').find((l) => l.includes('seed line(s) from the model alone')) ?? '' };
}

/** The page's run: its confident proposals in the same form, its summary and the stages it reported. */
function pageRun(band: BenchBand): { confident: string[]; output: AssistantProposalsOutput; stages: string[]; firstRunLines: number } {
  const stages: string[] = [];
  let firstRunLines = 0;
  const output = assistantJobRun(pageJob(band), (_round, stage, rowsSoFar) => {
    stages.push(stage);
    if (stage.startsWith('first run, round')) firstRunLines = rowsSoFar;
  });
  if (output.kind !== 'run') throw new Error('expected a run');
  const confident = output.proposals
    .filter((p) => p.verdict === 'confident')
    .map((p) => `${p.jUpper},${p.kUpper},${p.jLower},${p.kLower}@${p.observedCm1.toFixed(6)}`);
  return { confident, output, stages, firstRunLines };
}

/** Rows that are the generator's true lines: same quanta, within 0.5 FWHM (the benchmark's rule). */
function rightCount(band: BenchBand, rows: string[]): number {
  const truth = new Map(band.lines.map((l) => [`${l.jUpper},${l.kUpper},${l.jLower},${l.kLower}`, l.nuCm1]));
  return rows.filter((r) => {
    const [key, at] = r.split('@');
    const nu = truth.get(key);
    return nu !== undefined && Math.abs(nu - Number(at)) <= 0.5 * band.fwhmCm1;
  }).length;
}

describe('the page runs the same model-only start as the assign command', () => {
  it('band 81 (prolate perpendicular): the sub-band comb is run on the page too, and the confident proposals are the rows', async () => {
    const band = benchBand(81);
    expect(band.truth.shape).toBe('prolate');
    expect(band.truth.band).toBe('perpendicular');
    const cli = await commandRows(band);
    const page = pageRun(band);
    // The comb made the difference: the command says it placed it and kept its run.
    expect(cli.firstLine).toMatch(/sub-band comb: .* puts \d+ of \d+ lines of \d+ sub-bands on a peak/);
    expect(cli.firstLine).not.toMatch(/not kept/);
    expect(page.output.summary).toMatch(/sub-band comb: .* puts \d+ of \d+ lines/);
    expect(page.stages.some((s) => /^first run: sub-band comb, round \d+/.test(s))).toBe(true);
    expect(page.stages).toContain('first run: placing the comb of the other sub-bands');
    // The first run alone (before the comb) proposed far fewer lines than the page offers now.
    expect(page.confident.length).toBeGreaterThan(4 * Math.max(1, page.firstRunLines));
    expect(page.output.doubt).toBeNull();
    expect(new Set(page.confident)).toEqual(new Set(cli.rows));
    expect(page.confident.length).toBe(cli.rows.length);
    // Issue 14's precision target (≥ 0.99) against the generator's truth.
    expect(rightCount(band, page.confident) / page.confident.length).toBeGreaterThanOrEqual(0.99);
  }, 240_000);

  it('band 602 (prolate parallel): the staged start is run on the page too, and the confident proposals are the rows', async () => {
    const band = benchBand(602, { seeds: 0, jLimit: 45, kLimit: 12 });
    expect(band.truth.band).toBe('parallel');
    const cli = await commandRows(band);
    const page = pageRun(band);
    expect(cli.firstLine).toMatch(/the staged start for a parallel band was tried: .*\(kept\)$/);
    expect(page.output.summary).toMatch(/the staged start for a parallel band was tried: .*\(kept\)/);
    expect(page.stages.some((s) => /^staged start, round \d+/.test(s))).toBe(true);
    expect(page.output.doubt).toBeNull();
    expect(page.confident.length).toBeGreaterThan(300);
    expect(new Set(page.confident)).toEqual(new Set(cli.rows));
    expect(page.confident.length).toBe(cli.rows.length);
    expect(rightCount(band, page.confident) / page.confident.length).toBeGreaterThanOrEqual(0.99);
  }, 240_000);
});

describe('rejected pairs on the page', () => {
  it('are carried through the relabelled repeat and the Q-branch run: band 605 (Π–Σ) never proposes them again', () => {
    const band = benchBand(605, { seeds: 0, jLimit: 45, kLimit: 12 });
    const job = pageJob(band);
    const first = assistantJobRun(job);
    if (first.kind !== 'run') throw new Error('expected a run');
    // This band's lines come from the relabelled repeat and the Q branch from the Q-branch search's run.
    expect(first.summary).toMatch(/relabelled \(/);
    expect(first.summary).toMatch(/the Q branch placed by q/);
    const confident = first.proposals.filter((p) => p.verdict === 'confident');
    const q = confident.find((p) => p.jUpper === p.jLower);
    const pr = confident.find((p) => p.jUpper !== p.jLower);
    if (!q || !pr) throw new Error('expected confident Q and P/R proposals');
    const rejected = [q, pr].map((p) => ({
      jUpper: p.jUpper,
      kUpper: p.kUpper,
      jLower: p.jLower,
      kLower: p.kLower,
      observedCm1: p.observedCm1,
    }));
    const again = assistantJobRun({ ...job, rejected });
    if (again.kind !== 'run') throw new Error('expected a run');
    for (const r of rejected) {
      const same = again.proposals.filter(
        (p) =>
          p.jUpper === r.jUpper &&
          p.kUpper === r.kUpper &&
          p.jLower === r.jLower &&
          p.kLower === r.kLower &&
          p.observedCm1 === r.observedCm1,
      );
      expect(same).toEqual([]);
    }
    expect(again.proposals.filter((p) => p.verdict === 'confident').length).toBeGreaterThan(0.9 * confident.length);
  }, 120_000);
});

describe('cancelling a model-only run', () => {
  const band = assistantBandTrace();
  const peaks = peaksFind(band.trace, { minSnr: 5 });
  const job: AssistantRunJob = {
    kind: 'run',
    model: assistantBandGuess(),
    floatable: ['upper.origin', 'upper.B', 'upper.A', 'upper.zeta', 'lower.B', 'upper.DJ', 'lower.DJ'],
    peaks,
    assignments: [],
    rejected: [],
  };

  it('stops at the next check after the cancel, with the cancellation and no output', () => {
    let rounds = 0;
    let output: unknown = null;
    let error: unknown = null;
    try {
      output = assistantJobRun(
        job,
        (round) => {
          if (round > 0) rounds++;
        },
        () => rounds >= 1,
      );
    } catch (err) {
      error = err;
    }
    expect(output).toBeNull();
    expect(error).toBeInstanceOf(AssistantCancelledError);
    expect((error as Error).name).toBe('AbortError');
    expect(rounds).toBe(1);
  });

  it('on this thread (no Worker), the client rejects with an AbortError when its signal is aborted during the run', async () => {
    const ctrl = new AbortController();
    const seen: string[] = [];
    const done = assistantJobStart(job, ctrl.signal, (round, stage) => {
      seen.push(stage);
      if (round > 0) ctrl.abort();
    });
    await expect(done).rejects.toMatchObject({ name: 'AbortError' });
    expect(seen.filter((s) => /round \d+/.test(s))).toHaveLength(1);
  });
});
