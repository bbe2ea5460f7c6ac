/**
 * A user walking sub-branches with the keyboard (select a rung, press A, the cursor moves to the
 * next J″; → skips a rung the walk declined; a fit every so often, its constants accepted), driven
 * through the store actions on a synthetic band with noise and the real peak finder. Counts the
 * walk's assignments against the truth. Test helper, not part of the product.
 */
import { fitBand } from '../../src/fit/fitBand';
import { stateConstantsFrom, type BandModel, type TransitionQuanta } from '../../src/physics/model';
import { transitionWavenumber } from '../../src/physics/termValues';
import { cursorAssignMatched, cursorStep, peakClick, peakNearest } from '../../src/state/actionsAssign';
import { fitAccept, fitStart } from '../../src/state/actionsFit';
import { traceReplace } from '../../src/state/actionsImport';
import { selectBand, selectPeaks } from '../../src/state/selectors';
import { benchStore } from '../../src/state/store';
import { syntheticBand, syntheticIsCorrect, type SyntheticBand } from '../analysis/assistantSyntheticBand';

/** Invented prolate top, parallel band (constants in cm^-1; no real molecule). */
export function walkParallelTruth(): BandModel {
  return {
    shape: 'prolate',
    band: 'parallel',
    lower: stateConstantsFrom({ B: 0.2613, A: 3.874, DJ: 2.3e-7, DJK: 1.9e-6, DK: 3.1e-5 }),
    upper: stateConstantsFrom({ origin: 1043.217, B: 0.2596, A: 3.851, DJ: 2.2e-7, DJK: 1.8e-6, DK: 3.0e-5 }),
    temperatureK: 270,
    jMax: 45,
    kMax: 10,
    spinWeights: [1],
  };
}

/** Invented prolate top, perpendicular band (constants in cm^-1, ζ dimensionless; no real molecule). */
export function walkPerpendicularTruth(): BandModel {
  return {
    shape: 'prolate',
    band: 'perpendicular',
    lower: stateConstantsFrom({ B: 0.3342, A: 4.417, DJ: 3.4e-7, DJK: 2.7e-6, DK: 4.4e-5 }),
    upper: stateConstantsFrom({ origin: 1512.836, B: 0.3318, A: 4.371, DJ: 3.3e-7, DJK: 2.6e-6, DK: 4.2e-5, zeta: 0.187 }),
    temperatureK: 260,
    jMax: 40,
    kMax: 8,
    spinWeights: [1],
  };
}

/**
 * A realistic first guess: the origin off by +0.06 cm^-1, B″ and B′ off by +0.05 % and −0.04 %,
 * A′ off by +0.2 %, centrifugal distortion 20 % high and ζ off by +0.01 (the kind of start an
 * estimate from a related molecule gives; common practice).
 */
export function walkFirstGuess(truth: BandModel): BandModel {
  const l = truth.lower;
  const u = truth.upper;
  return {
    ...truth,
    lower: { ...l, B: l.B * 1.0005, DJ: l.DJ * 1.2, DJK: l.DJK * 1.2 },
    upper: {
      ...u,
      origin: u.origin + 0.06,
      B: u.B * 0.9996,
      A: u.A * 1.002,
      DJ: u.DJ * 1.2,
      DJK: u.DJK * 1.2,
      zeta: truth.band === 'perpendicular' ? u.zeta + 0.01 : u.zeta,
    },
  };
}

/** Counts of one walk. */
export interface WalkTally {
  correct: number;
  wrong: number;
  /** Rungs where the walk assigned nothing and said why. */
  declined: number;
  /** The wrong ones, for the failure message. */
  wrongLabels: string[];
  /**
   * For comparison, on the same rungs: what the earlier rule (nearest peak within 0.6 B″ of the
   * model's position) would have assigned, right and wrong.
   */
  nearestRuleCorrect: number;
  nearestRuleWrong: number;
}

/** Ladder keys ("r:3:R" = ΔK·K″ sub-branch letter, K″, branch) to walk. */
export type WalkLadders = readonly string[];

const runFit = (input: Parameters<typeof fitBand>[0]) => Promise.resolve(fitBand(input));

/** How the simulated user works. */
export interface WalkPlan {
  /** Ladders whose `seedsPerLadder` strongest rungs the user assigns by hand first (rung, then its peak). */
  seedLadders: readonly string[];
  seedsPerLadder: number;
  /** Keys floated in a fit of n lines (a user floats more constants as lines come in). */
  floated: (nLines: number) => string[];
  /** Ladders to walk, in order. */
  ladders: WalkLadders;
  /** Fit (and accept the constants) after this many new lines. @default 15 */
  fitEvery?: number;
  /** Stop a direction after this many refusals in a row. @default 4 */
  giveUpAfter?: number;
  /** Noise 1σ of the trace (tallest point 1). @default 0.002 */
  noise?: number;
}

/**
 * Walk the given ladders the way a user does: first assign a few strong lines by hand (select
 * the rung, click the peak of its true line, as someone who recognises the pattern would) and
 * fit; then, per ladder, put the cursor on its strongest rung, press A (cursorAssignMatched) and
 * let the cursor move on to higher J″; on a refusal press →; stop a direction after
 * `giveUpAfter` refusals in a row; then walk down from the strongest rung. After every
 * `fitEvery` new lines, fit and accept the constants. Only the walk's own assignments are counted.
 * @param truth the band that made the trace
 * @param guess the start model
 * @param plan seeds, floated keys, ladders
 * @param seed noise seed
 */
export async function keyboardWalk(
  truth: BandModel,
  guess: BandModel,
  plan: WalkPlan,
  seed: number,
): Promise<{ tally: WalkTally; band: SyntheticBand }> {
  const band = syntheticBand(truth, plan.noise ?? 0.002, seed);
  benchStore.setState(benchStore.getInitialState(), true);
  benchStore.setState({ model: guess, floated: plan.floated(0), minIntensity: 0.002 });
  traceReplace(band.trace, null, 'file');
  const fitEvery = plan.fitEvery ?? 15;
  const giveUpAfter = plan.giveUpAfter ?? 4;
  const tally: WalkTally = { correct: 0, wrong: 0, declined: 0, wrongLabels: [], nearestRuleCorrect: 0, nearestRuleWrong: 0 };
  const { peaks } = selectPeaks(benchStore.getState());
  if (!peaks) throw new Error('keyboardWalk: no peaks found');
  let sinceFit = 0;
  const refit = async () => {
    benchStore.setState({ floated: plan.floated(benchStore.getState().assignments.length) });
    await fitStart(runFit);
    if (benchStore.getState().fitOutcome?.ok) fitAccept();
    sinceFit = 0;
  };
  const pressA = (): boolean => {
    const s = benchStore.getState();
    const q = s.cursor as TransitionQuanta;
    const before = s.assignments.length;
    const band0 = selectBand(s);
    const li = band0.indexOf.get(`${q.jUpper},${q.kUpper},${q.jLower},${q.kLower}`);
    if (li !== undefined) {
      const near = peakNearest(peaks, band0.lines.wavenumberCm1[li], 0.6 * Math.abs(s.model.lower.B));
      if (near >= 0) {
        if (syntheticIsCorrect(band, q, peaks.wavenumberCm1[near])) tally.nearestRuleCorrect++;
        else tally.nearestRuleWrong++;
      }
    }
    const ok = cursorAssignMatched();
    const after = benchStore.getState().assignments;
    if (ok && after.length > before) {
      const a = after[after.length - 1];
      if (syntheticIsCorrect(band, q, a.observedCm1)) tally.correct++;
      else {
        tally.wrong++;
        tally.wrongLabels.push(`${JSON.stringify(q)}@${a.observedCm1.toFixed(4)}`);
      }
      sinceFit++;
    } else if (!ok) tally.declined++;
    return ok;
  };
  // Hand-made seeds: the rung, then the peak nearest its true position.
  for (const key of plan.seedLadders) {
    const b = selectBand(benchStore.getState());
    const ladder = b.ladderByKey.get(key);
    if (!ladder) throw new Error(`keyboardWalk: no ladder ${key}`);
    const strongest = [...ladder.lineIndex].sort((x, y) => b.lines.intensity[y] - b.lines.intensity[x]).slice(0, plan.seedsPerLadder);
    for (const i of strongest) {
      const q = { jUpper: b.lines.jUpper[i], kUpper: b.lines.kUpper[i], jLower: b.lines.jLower[i], kLower: b.lines.kLower[i] };
      const nu = transitionWavenumber(truth, q.jUpper, q.kUpper, q.jLower, q.kLower);
      let p = 0;
      for (let k = 1; k < peaks.count; k++) if (Math.abs(peaks.wavenumberCm1[k] - nu) < Math.abs(peaks.wavenumberCm1[p] - nu)) p = k;
      benchStore.setState({ cursor: q, candidateTarget: null });
      peakClick(p);
    }
  }
  await refit();
  for (const key of plan.ladders) {
    for (const dir of [1, -1]) {
      const b = selectBand(benchStore.getState());
      const ladder = b.ladderByKey.get(key);
      if (!ladder || ladder.lineIndex.length === 0) continue;
      let start = ladder.lineIndex[0];
      for (const i of ladder.lineIndex) if (b.lines.intensity[i] > b.lines.intensity[start]) start = i;
      const q = {
        jUpper: b.lines.jUpper[start],
        kUpper: b.lines.kUpper[start],
        jLower: b.lines.jLower[start],
        kLower: b.lines.kLower[start],
      };
      benchStore.setState({ cursor: q, candidateTarget: null });
      if (dir < 0) cursorStep(-1, false);
      let misses = 0;
      let lastJ = -1;
      for (let guard = 0; guard < 200; guard++) {
        const c = benchStore.getState().cursor;
        if (!c || c.jLower === lastJ) break;
        lastJ = c.jLower;
        if (dir > 0) {
          if (pressA()) misses = 0;
          else {
            misses++;
            cursorStep(1, false);
          }
        } else {
          // Walking down: A assigns and steps up, so step back down twice after a success.
          if (pressA()) {
            misses = 0;
            cursorStep(-1, false);
          } else misses++;
          cursorStep(-1, false);
        }
        if (misses >= giveUpAfter) break;
        if (sinceFit >= fitEvery) await refit();
      }
    }
    if (sinceFit > 0) await refit();
  }
  return { tally, band };
}
