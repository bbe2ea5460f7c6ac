import { describe, expect, it } from 'vitest';
import { assistantAutoExtend, assistantSubBandIndex } from '../../src/analysis/assistantAutoExtend';
import { assistantNearestPeak, assistantPeakContext, assistantPeaksUsable } from '../../src/analysis/assistantPeakContext';
import { assistantAccept, assistantLinesFromAssignments, assistantReject, assistantUndo } from '../../src/analysis/assistantReview';
import type { AssistantLine } from '../../src/analysis/assistantTypes';
import type { PeakList } from '../../src/analysis/peaksFind';
import type { Assignment } from '../../src/fit/assignment';
import { bandLines } from '../../src/physics/bandLines';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';
import { syntheticAssignable, syntheticBand, syntheticIsCorrect, syntheticTruthModel, type SyntheticBand } from './assistantSyntheticBand';

/** Constants floated in the target run (lower.A stays fixed: one perpendicular band cannot give A'', A' and ζ; rankDiagnosis). */
const FLOATABLE = [
  'upper.origin',
  'upper.B',
  'lower.B',
  'upper.A',
  'upper.zeta',
  'upper.DJ',
  'lower.DJ',
  'upper.DJK',
  'lower.DJK',
  'upper.DK',
  'lower.DK',
];

/** First-guess errors of the target: B′ +0.8 %, B″ +0.6 %, origin +0.3 cm^-1, A′ +0.3 %, ζ −0.004. */
function firstGuess(truth: BandModel): BandModel {
  const g: BandModel = { ...truth, lower: { ...truth.lower }, upper: { ...truth.upper } };
  g.upper.B *= 1.008;
  g.lower.B *= 1.006;
  g.upper.origin += 0.3;
  g.upper.A *= 1.003;
  g.upper.zeta -= 0.004;
  return g;
}

/**
 * Ten seeds as a person would pick them: the strongest assignable P and R lines with K'' ≤ 2 and
 * J'' ≤ 15, at most two per sub-band, observed at the nearest peak.
 */
function tenSeeds(band: SyntheticBand): Assignment[] {
  const L = band.lines;
  const pool = syntheticAssignable(band)
    .filter((i) => L.kLower[i] <= 2 && L.jLower[i] <= 15 && L.deltaJ[i] !== 0)
    .sort((a, b) => L.intensity[b] - L.intensity[a]);
  const perSubBand = new Map<string, number>();
  const out: Assignment[] = [];
  for (const i of pool) {
    const key = `${L.deltaK[i]},${L.kLower[i]}`;
    if ((perSubBand.get(key) ?? 0) >= 2) continue;
    perSubBand.set(key, (perSubBand.get(key) ?? 0) + 1);
    const k = assistantNearestPeak(band.peaks, L.wavenumberCm1[i]);
    out.push({
      id: `seed${out.length + 1}`,
      jUpper: L.jUpper[i],
      kUpper: L.kUpper[i],
      jLower: L.jLower[i],
      kLower: L.kLower[i],
      observedCm1: band.peaks.wavenumberCm1[k],
      uncertaintyCm1: 0.001,
      isBlended: false,
      isExcluded: false,
      note: '',
    });
    if (out.length === 10) break;
  }
  return out;
}

const keyOf = (q: { jUpper: number; kUpper: number; jLower: number; kLower: number }) => `${q.jUpper},${q.kUpper},${q.jLower},${q.kLower}`;

describe('assistantAutoExtend on a synthetic perpendicular band (target)', () => {
  // Truth: invented prolate top (syntheticTruthModel), perpendicular band, jMax 40, kMax 8, T 250 K,
  // Voigt lines (46 amu, Lorentz HWHM 0.004 cm^-1), step 0.003 cm^-1, seeded white noise σ = 1/400
  // of the tallest point; peaks by peaksFind (minSnr 5).
  const truth = syntheticTruthModel();
  const band = syntheticBand(truth, 1 / 400, 11);
  band.peaks = assistantPeaksUsable(band.peaks).peaks;
  const guess = firstGuess(truth);
  const context = assistantPeakContext(band.peaks);
  const seeds = assistantLinesFromAssignments(tenSeeds(band), guess, band.peaks, context);
  const t0 = performance.now();
  const run = assistantAutoExtend({ model: guess, floatable: FLOATABLE, peaks: band.peaks, lines: seeds });
  const runMs = performance.now() - t0;
  const confident = run.lines.filter((l) => l.status !== 'rejected' && !l.isExcluded);
  const correct = confident.filter((l) => syntheticIsCorrect(band, l, l.observedCm1));
  const assignable = syntheticAssignable(band);
  const correctKeys = new Set(correct.map(keyOf));
  const L = band.lines;
  const found = assignable.filter((i) =>
    correctKeys.has(keyOf({ jUpper: L.jUpper[i], kUpper: L.kUpper[i], jLower: L.jLower[i], kLower: L.kLower[i] })),
  );
  const recall = found.length / assignable.length;
  const precision = correct.length / confident.length;
  // Reported, not asserted (no timed assertions in unit tests).
  console.log(
    `assistant target: ${band.lines.count} lines, ${band.peaks.count} peaks, ${assignable.length} assignable (SNR >= 20, resolvable); ` +
      `${confident.length} assigned in ${run.iterations.length} iterations, recall ${(100 * recall).toFixed(1)} %, precision ${(100 * precision).toFixed(2)} %, ` +
      `${run.lines.filter((l) => l.isExcluded).length} excluded, ${run.ambiguous.length} ambiguous, run ${runMs.toFixed(0)} ms`,
  );

  it('starts from ten seeds spread over at least four sub-bands', () => {
    expect(seeds).toHaveLength(10);
    expect(new Set(seeds.map((s) => assistantSubBandIndex(guess, s.kUpper - s.kLower, s.kLower))).size).toBeGreaterThanOrEqual(4);
    expect(seeds.every((s) => s.peakIndex !== null)).toBe(true);
  });

  it('assigns at least 90 % of the assignable lines', () => {
    // Target of the brief: ≥ 90 % of lines with peaks above SNR 20 and no comparable line within 1 FWHM.
    expect(assignable.length).toBeGreaterThan(800);
    expect(recall).toBeGreaterThanOrEqual(0.9);
  });

  it('makes at least 99 % correct assignments', () => {
    // Correct: the truth line lies within half a FWHM of the observed peak and carries at least a
    // quarter of the strongest truth intensity there (syntheticIsCorrect).
    expect(precision).toBeGreaterThanOrEqual(0.99);
  });

  it('ends with constants within 3σ of the truth', () => {
    // 3σ: the fit's own standard errors (σ_w-scaled covariance); the brief's criterion.
    const fit = run.fit!;
    expect(fit).not.toBeNull();
    expect(fit.floated).toEqual(
      expect.arrayContaining(['upper.origin', 'upper.B', 'lower.B', 'upper.A', 'upper.zeta', 'upper.DJ', 'lower.DJ']),
    );
    for (const key of fit.floated) {
      const [side, name] = key.split('.') as ['upper' | 'lower', keyof BandModel['upper']];
      const p = fit.parameters[key];
      expect(p.sigma, key).not.toBeNull();
      expect(Math.abs(p.value - truth[side][name]), key).toBeLessThanOrEqual(3 * p.sigma!);
    }
  });

  it('marks every added line as proposed with its reason and distance', () => {
    const addedSet = new Set(run.addedIds);
    const added = run.lines.filter((l) => addedSet.has(l.id));
    expect(added.length).toBe(run.addedIds.length);
    for (const l of added) {
      expect(l.status).toBe('proposed');
      expect(l.source).toBe('auto-extend');
      expect(l.reason).toMatch(/only peak within 3σ/);
      expect(l.distanceSigma).toBeLessThanOrEqual(3);
      expect(l.peakIndex).not.toBeNull();
    }
  });

  it('never gives one peak to two lines (K stacks cannot occur in this prolate perpendicular band)', () => {
    const peaks = confident.map((l) => l.peakIndex).filter((p) => p !== null);
    expect(new Set(peaks).size).toBe(peaks.length);
  });

  it('never decides an ambiguity: no listed peak carries a proposal', () => {
    const carried = new Set(run.lines.filter((l) => l.source === 'auto-extend').map((l) => l.peakIndex));
    const decided = run.ambiguous.filter((a) => a.kind === 'several-peaks' || a.kind === 'several-rungs');
    expect(decided.length).toBeGreaterThan(0);
    for (const a of decided) for (const p of a.peaks) expect(carried.has(p.peakIndex)).toBe(false);
    for (const a of run.ambiguous.filter((x) => x.kind === 'several-rungs')) expect(a.rungs.length).toBeGreaterThanOrEqual(2);
  });

  it('leaves the seed lines unchanged and lets the undo record restore them in one step', () => {
    for (const s of seeds) expect(run.lines.find((l) => l.id === s.id)).toEqual(s);
    expect(assistantUndo(run.lines, run.undo)).toEqual(seeds);
  });
});

/** A small noise-free linear Σ–Σ band as peaks, with chosen positions changed (for hand-checkable cases). */
function linearBand(): { model: BandModel; peaks: PeakList; lines: ReturnType<typeof bandLines> } {
  const model: BandModel = {
    shape: 'linear',
    band: 'parallel',
    lower: stateConstantsFrom({ B: 1.5 }),
    upper: stateConstantsFrom({ origin: 2000, B: 1.48 }),
    temperatureK: 296,
    jMax: 20,
    kMax: 0,
    spinWeights: [1],
  };
  const lines = bandLines(model);
  const order = Array.from({ length: lines.count }, (_, i) => i).sort((a, b) => lines.wavenumberCm1[a] - lines.wavenumberCm1[b]);
  const n = order.length;
  const peaks: PeakList = {
    count: n,
    wavenumberCm1: Float64Array.from(order, (i) => lines.wavenumberCm1[i]),
    height: Float64Array.from(order, (i) => lines.intensity[i]),
    fwhmCm1: new Float64Array(n).fill(0.02),
    snr: Float64Array.from(order, (i) => lines.intensity[i] * 1000),
    prominence: Float64Array.from(order, (i) => lines.intensity[i]),
    isBlend: new Uint8Array(n),
    centreSigmaCm1: new Float64Array(n).fill(1e-4),
    noiseSigma: 0.001,
  };
  return { model, peaks, lines };
}

function addPeak(peaks: PeakList, xCm1: number, height: number): PeakList {
  const at = peaks.wavenumberCm1.findIndex((x) => x > xCm1);
  const ins = <T extends Float64Array | Uint8Array>(col: T, v: number): T => {
    const out = new (col.constructor as new (n: number) => T)(col.length + 1);
    out.set(col.subarray(0, at), 0);
    out[at] = v;
    out.set(col.subarray(at), at + 1);
    return out;
  };
  return {
    count: peaks.count + 1,
    wavenumberCm1: ins(peaks.wavenumberCm1, xCm1),
    height: ins(peaks.height, height),
    fwhmCm1: ins(peaks.fwhmCm1, 0.02),
    snr: ins(peaks.snr, height / peaks.noiseSigma),
    prominence: ins(peaks.prominence, height),
    isBlend: ins(peaks.isBlend, 0),
    centreSigmaCm1: ins(peaks.centreSigmaCm1, 1e-4),
    noiseSigma: peaks.noiseSigma,
  };
}

function seedsOf(model: BandModel, peaks: PeakList, labels: [number, number][]): AssistantLine[] {
  const context = assistantPeakContext(peaks);
  const assignments: Assignment[] = labels.map(([jUpper, jLower], n) => {
    const nu = model.upper.origin + model.upper.B * jUpper * (jUpper + 1) - model.lower.B * jLower * (jLower + 1);
    return {
      id: `s${n}`,
      jUpper,
      kUpper: 0,
      jLower,
      kLower: 0,
      observedCm1: nu,
      uncertaintyCm1: 1e-4,
      isBlended: false,
      isExcluded: false,
      note: '',
    };
  });
  return assistantLinesFromAssignments(assignments, model, peaks, context);
}

describe('assistantAutoExtend, hand-checkable cases', () => {
  const floatable = ['upper.origin', 'upper.B', 'lower.B'];

  it('assigns every line of a clean linear band from four seeds', () => {
    // ν = ν0 + B′J′(J′+1) − B″J″(J″+1) (Herzberg I (1950) ch. III); every peak is a line, no noise.
    const { model, peaks, lines } = linearBand();
    const seeds = seedsOf(model, peaks, [
      [3, 2],
      [4, 3],
      [2, 3],
      [3, 4],
    ]);
    const run = assistantAutoExtend({ model, floatable, peaks, lines: seeds });
    const assigned = run.lines.filter((l) => !l.isExcluded);
    expect(assigned).toHaveLength(lines.count);
    // Exact positions: the fitted constants reproduce the model to round-off (tol 1e-9 cm^-1).
    expect(Math.abs(run.fit!.parameters['upper.B'].value - 1.48)).toBeLessThan(1e-9);
    expect(run.ambiguous).toHaveLength(0);
  });

  it('lists a rung with two peaks inside its window as ambiguous and assigns neither', () => {
    const { model, peaks } = linearBand();
    const nuR5 = model.upper.origin + 1.48 * 6 * 7 - 1.5 * 5 * 6;
    // A second peak 0.001 cm^-1 (0.05 FWHM) from R(5), well inside the 3σ window (σ ≥ 0.1 FWHM floor).
    const crowded = addPeak(peaks, nuR5 + 0.001, 0.5);
    const seeds = seedsOf(model, crowded, [
      [3, 2],
      [4, 3],
      [2, 3],
      [3, 4],
    ]);
    const run = assistantAutoExtend({ model, floatable, peaks: crowded, lines: seeds });
    expect(run.lines.some((l) => l.jUpper === 6 && l.jLower === 5)).toBe(false);
    const amb = run.ambiguous.find((a) => a.kind === 'several-peaks' && a.rungs[0].label === 'R(5)');
    expect(amb).toBeDefined();
    expect(amb!.peaks).toHaveLength(2);
    // Every other line is still found.
    expect(run.lines.filter((l) => !l.isExcluded)).toHaveLength(crowded.count - 2);
  });

  it('leaves a peak wider than one line that no predicted line explains for review, and says why', () => {
    const { model, peaks } = linearBand();
    const nuR7 = model.upper.origin + 1.48 * 8 * 9 - 1.5 * 7 * 8;
    const k = assistantNearestPeak(peaks, nuR7);
    peaks.fwhmCm1[k] = 0.05; // 2.5× the common width 0.02 cm^-1: above the 1.5× blend ratio
    const seeds = seedsOf(model, peaks, [
      [3, 2],
      [4, 3],
      [2, 3],
      [3, 4],
    ]);
    const run = assistantAutoExtend({ model, floatable, peaks, lines: seeds });
    // The peak's width does not match the predicted line (issue 14): its maximum is nobody's
    // position, so R(7) is not proposed but listed with the reason; R(6) on a normal peak is.
    expect(run.lines.find((l) => l.jUpper === 8 && l.jLower === 7)).toBeUndefined();
    const why = run.ambiguous.find((a) => a.kind === 'shape-mismatch' && a.rungs[0].jLower === 7);
    expect(why?.reason).toMatch(/possible blend \(FWHM 0\.0500 cm\^-1 is 2\.50× the local median\) that no predicted line explains/);
    const r6 = run.lines.find((l) => l.jUpper === 7 && l.jLower === 6)!;
    expect(r6.isBlended).toBe(false);
  });

  it('does not propose again a pair the user rejected', () => {
    const { model, peaks } = linearBand();
    const seeds = seedsOf(model, peaks, [
      [3, 2],
      [4, 3],
      [2, 3],
      [3, 4],
    ]);
    const first = assistantAutoExtend({ model, floatable, peaks, lines: seeds });
    const r8 = first.lines.find((l) => l.jUpper === 9 && l.jLower === 8)!;
    const reviewed = assistantReject(
      assistantAccept(
        first.lines,
        first.addedIds.filter((id) => id !== r8.id),
      ),
      [r8.id],
    );
    const second = assistantAutoExtend({ model, floatable, peaks, lines: reviewed });
    expect(second.addedIds).toHaveLength(0);
    expect(second.lines.filter((l) => l.jUpper === 9 && l.jLower === 8).map((l) => l.status)).toEqual(['rejected']);
  });

  it('runs without seeds, and with one seed, without throwing', () => {
    const { model, peaks } = linearBand();
    const none = assistantAutoExtend({ model, floatable, peaks, lines: [] });
    expect(none.addedIds).toHaveLength(0);
    expect(none.warnings.join(' ')).toMatch(/no lines to start from/);
    const one = assistantAutoExtend({ model, floatable, peaks, lines: seedsOf(model, peaks, [[3, 2]]) });
    expect(one.fit).not.toBeNull();
    // From one seed the origin is the first constant the lines pin down (more follow as lines come in).
    expect(one.fit!.floated).toContain('upper.origin');
  });

  it('refuses invalid lines and peak lists with the field named', () => {
    const { model, peaks } = linearBand();
    const seeds = seedsOf(model, peaks, [[3, 2]]);
    expect(() => assistantAutoExtend({ model, floatable, peaks, lines: [{ ...seeds[0], jUpper: 5 }] })).toThrow(
      /assistantAutoExtend: lines\[0\] \(id 's0'\): ΔJ = 3 is not allowed/,
    );
    expect(() => assistantAutoExtend({ model, floatable, peaks, lines: [seeds[0], seeds[0]] })).toThrow(/id 's0' is used twice/);
    const unsorted = { ...peaks, wavenumberCm1: Float64Array.from(peaks.wavenumberCm1).reverse() };
    expect(() => assistantAutoExtend({ model, floatable, peaks: unsorted, lines: seeds })).toThrow(/peaks must be in ascending wavenumber/);
    expect(() => assistantAutoExtend({ model, floatable, peaks, lines: seeds, options: { toleranceSigma: -1 } })).toThrow(
      /option toleranceSigma must be a number in \[0.5, 20\], got -1/,
    );
  });
});

describe('assistantSubBandIndex', () => {
  it('numbers perpendicular sub-bands ΔK·K″ so that neighbours differ by one', () => {
    const m = { shape: 'prolate', band: 'perpendicular' } as const;
    expect([
      assistantSubBandIndex(m, -1, 2),
      assistantSubBandIndex(m, -1, 1),
      assistantSubBandIndex(m, 1, 0),
      assistantSubBandIndex(m, 1, 1),
    ]).toEqual([-2, -1, 0, 1]);
    expect(assistantSubBandIndex({ shape: 'oblate', band: 'parallel' }, 0, 3)).toBe(3);
    expect(assistantSubBandIndex({ shape: 'linear', band: 'perpendicular' }, 1, 0)).toBe(0);
  });
});
