import { describe, expect, it } from 'vitest';
import { assistantPeakContext } from '../../src/analysis/assistantPeakContext';
import {
  assistantAccept,
  assistantAcceptAll,
  assistantFitLines,
  assistantLinesFromAssignments,
  assistantReject,
  assistantUndo,
} from '../../src/analysis/assistantReview';
import type { AssistantLine } from '../../src/analysis/assistantTypes';
import type { PeakList } from '../../src/analysis/peaksFind';
import type { Assignment } from '../../src/fit/assignment';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';

const model: BandModel = {
  shape: 'prolate',
  band: 'perpendicular',
  lower: stateConstantsFrom({ B: 0.5, A: 4 }),
  upper: stateConstantsFrom({ origin: 1000, B: 0.49, A: 3.9, zeta: 0.1 }),
  temperatureK: 296,
  jMax: 10,
  kMax: 2,
  spinWeights: [1],
};
const peaks: PeakList = {
  count: 2,
  wavenumberCm1: Float64Array.from([1001.0, 1002.0]),
  height: Float64Array.from([1, 1]),
  fwhmCm1: Float64Array.from([0.01, 0.01]),
  snr: Float64Array.from([100, 100]),
  prominence: Float64Array.from([1, 1]),
  isBlend: new Uint8Array(2),
  centreSigmaCm1: Float64Array.from([1e-4, 1e-4]),
  noiseSigma: 0.01,
};
const context = assistantPeakContext(peaks);
const base = { isBlended: false, isExcluded: false, note: '', uncertaintyCm1: 0.001 };
const assignments: Assignment[] = [
  { id: 'a', jUpper: 3, kUpper: 1, jLower: 2, kLower: 0, observedCm1: 1001.002, ...base },
  { id: 'b', jUpper: 4, kUpper: 1, jLower: 3, kLower: 0, observedCm1: 1003.5, ...base },
];

function proposal(id: string): AssistantLine {
  return {
    ...assignments[0],
    id,
    status: 'proposed',
    source: 'auto-extend',
    peakIndex: 1,
    predictedCm1: 1002,
    matchSigmaCm1: 1e-3,
    distanceSigma: 0.1,
    reason: 'test',
    iteration: 1,
  };
}

describe('assistantLinesFromAssignments', () => {
  it('ties a line to the peak within half a FWHM (or 3σ) and keeps position and σ as given', () => {
    const lines = assistantLinesFromAssignments(assignments, model, peaks, context);
    expect(lines.map((l) => l.peakIndex)).toEqual([0, null]);
    expect(lines[0]).toMatchObject({ observedCm1: 1001.002, uncertaintyCm1: 0.001, status: 'seed', source: 'user', iteration: 0 });
    expect(lines[1].reason).toMatch(/no peak of the list within reach/);
  });

  it('refuses a transition the band does not allow, naming the line', () => {
    const bad = [{ ...assignments[0], kUpper: 0 }];
    expect(() => assistantLinesFromAssignments(bad, model, peaks, context)).toThrow(
      /line 1 \(id 'a'\): ΔK = 0 is not allowed in a perpendicular band/,
    );
    expect(() => assistantLinesFromAssignments([{ ...assignments[0], observedCm1: NaN }], model, peaks, context)).toThrow(
      /observedCm1 must be a finite/,
    );
  });
});

describe('review helpers', () => {
  const seeds = assistantLinesFromAssignments(assignments, model, peaks, context);
  const set = [...seeds, proposal('p1'), { ...proposal('p2'), isExcluded: true }];

  it('accepts chosen proposals, or all that are not excluded; seeds stay seeds', () => {
    expect(assistantAccept(set, ['p1', 'a']).map((l) => l.status)).toEqual(['seed', 'seed', 'accepted', 'proposed']);
    expect(assistantAcceptAll(set).map((l) => l.status)).toEqual(['seed', 'seed', 'accepted', 'proposed']);
    expect(set[2].status).toBe('proposed');
  });

  it('rejects (kept, excluded) but never a seed', () => {
    const r = assistantReject(set, ['p1', 'a']);
    expect(r.map((l) => l.status)).toEqual(['seed', 'seed', 'rejected', 'proposed']);
    expect(r[2].isExcluded).toBe(true);
    expect(assistantFitLines(r).map((l) => l.id)).toEqual(['a', 'b']);
  });

  it('undoes a run in one step and keeps lines added after it', () => {
    const record = { previousLines: seeds, addedIds: ['p1', 'p2'] };
    const later = { ...proposal('hand'), status: 'accepted' as const, source: 'user' as const };
    const current = [...assistantAccept(set, ['p1']), later];
    expect(assistantUndo(current, record)).toEqual([...seeds, later]);
    expect(assistantUndo(set, record)).toEqual(seeds);
  });
});
