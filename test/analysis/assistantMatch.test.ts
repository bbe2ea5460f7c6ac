import { describe, expect, it } from 'vitest';
import { assistantMatch, type AssistantMatchInput } from '../../src/analysis/assistantMatch';
import { assistantOptionsResolve } from '../../src/analysis/assistantOptions';
import { assistantPeakContext } from '../../src/analysis/assistantPeakContext';
import type { AssistantCatalogue } from '../../src/analysis/assistantPredict';
import type { PeakList } from '../../src/analysis/peaksFind';
import { stateConstantsFrom, type LineList } from '../../src/physics/model';

/** Rungs R(0), R(1), … of a linear molecule at hand-placed predictions (σ_tol 1e-3 cm^-1). */
function catalogue(positions: number[], intensities: number[]): AssistantCatalogue {
  const n = positions.length;
  const lines: LineList = {
    count: n,
    jUpper: Int32Array.from({ length: n }, (_, i) => i + 1),
    kUpper: new Int32Array(n),
    jLower: Int32Array.from({ length: n }, (_, i) => i),
    kLower: new Int32Array(n),
    deltaK: new Int8Array(n),
    deltaJ: new Int8Array(n).fill(1),
    wavenumberCm1: Float64Array.from(positions),
    intensity: Float64Array.from(intensities),
    eLowerCm1: new Float64Array(n),
    honlLondon: new Float64Array(n).fill(1),
  };
  const order = Int32Array.from({ length: n }, (_, i) => i).sort((a, b) => positions[a] - positions[b]);
  const indexOf = new Map<string, number>();
  for (let i = 0; i < n; i++) indexOf.set(`${i + 1},0,${i},0`, i);
  return {
    lines,
    predictedCm1: Float64Array.from(positions),
    predictionSigmaCm1: new Float64Array(n).fill(1e-3),
    toleranceSigmaCm1: new Float64Array(n).fill(1e-3),
    order,
    indexOf,
  };
}

function peaksAt(x: number[], heights: number[]): PeakList {
  const n = x.length;
  return {
    count: n,
    wavenumberCm1: Float64Array.from(x),
    height: Float64Array.from(heights),
    fwhmCm1: new Float64Array(n).fill(0.01),
    snr: Float64Array.from(heights, (h) => h / 0.01),
    prominence: Float64Array.from(heights),
    isBlend: new Uint8Array(n),
    centreSigmaCm1: new Float64Array(n).fill(0),
    noiseSigma: 0.01,
  };
}

const options = assistantOptionsResolve({ lower: stateConstantsFrom({ B: 1 }) });

function input(cat: AssistantCatalogue, peaks: PeakList, over: Partial<AssistantMatchInput> = {}): AssistantMatchInput {
  return {
    cat,
    peaks,
    context: assistantPeakContext(peaks),
    shape: 'linear',
    candidates: Array.from({ length: cat.lines.count }, (_, i) => i),
    isRungAssigned: new Uint8Array(cat.lines.count),
    peakOwner: new Array(peaks.count).fill(''),
    forbidden: new Set(),
    heightScale: NaN,
    options,
    ...over,
  };
}

describe('assistantMatch', () => {
  // Window: k·σ = 3 × 1e-3 cm^-1 (σ_tol 1e-3, centre σ 0).
  it('matches one rung to one peak and gives the distance in σ', () => {
    const r = assistantMatch(input(catalogue([100, 101], [1, 1]), peaksAt([100.0015, 101], [1, 1])));
    expect(r.matches.map((m) => [m.rung, m.peak])).toEqual([
      [0, 0],
      [1, 1],
    ]);
    expect(r.matches[0].distanceSigma).toBeCloseTo(1.5, 9);
    expect(r.ambiguous).toHaveLength(0);
  });

  it('never chooses between two peaks in the window', () => {
    const r = assistantMatch(input(catalogue([100], [1]), peaksAt([99.999, 100.002], [1, 1])));
    expect(r.matches).toHaveLength(0);
    expect(r.ambiguous[0].kind).toBe('several-peaks');
    expect(r.ambiguous[0].peaks.map((p) => p.peakIndex)).toEqual([0, 1]);
  });

  it('never chooses between two comparably strong rungs for one peak', () => {
    // R(1) is half as strong as R(0): within the dominance factor 4, so both are candidates.
    const r = assistantMatch(input(catalogue([100, 100.002], [1, 0.5]), peaksAt([100.001], [1])));
    expect(r.matches).toHaveLength(0);
    expect(r.ambiguous).toHaveLength(1);
    expect(r.ambiguous[0].kind).toBe('several-rungs');
    expect(r.ambiguous[0].rungs.map((x) => x.label).sort()).toEqual(['R(0)', 'R(1)']);
  });

  it('gives the peak to a rung four times stronger than its rival, as a possible blend', () => {
    const r = assistantMatch(input(catalogue([100, 100.002], [1, 0.2]), peaksAt([100.001], [1])));
    expect(r.matches).toHaveLength(1);
    expect(r.matches[0].rung).toBe(0);
    expect(r.matches[0].isBlend).toBe(true);
    expect(r.matches[0].hasPartnerWithin).toBe(true);
    expect(r.matches[0].reason).toMatch(/possible blend with weaker R\(1\) \(0\.20×\)/);
    // The weak rung sees the strong one as a competitor: listed, not matched.
    expect(r.ambiguous.map((a) => a.kind)).toEqual(['several-rungs']);
  });

  it('assigns an unresolved K stack (same ΔJ and J″, K differs) to its peak together, as a blend', () => {
    // qR0(5), qR1(5), qR2(5) of a parallel band 0.001 cm^-1 apart, one peak between them.
    const cat = catalogue([100, 100.001, 100.002], [1, 0.9, 0.8]);
    cat.lines.jLower.fill(5);
    cat.lines.jUpper.fill(6);
    cat.lines.kLower.set([0, 1, 2]);
    cat.lines.kUpper.set([0, 1, 2]);
    const r = assistantMatch(input(cat, peaksAt([100.001], [2.7]), { shape: 'prolate' }));
    expect(r.ambiguous).toHaveLength(0);
    expect(r.matches.map((m) => m.rung).sort()).toEqual([0, 1, 2]);
    for (const m of r.matches) {
      expect(m.peak).toBe(0);
      expect(m.stack).toBe(3);
      expect(m.isBlend).toBe(true);
      expect(m.reason).toMatch(/unresolved K components K'' = 0, 1, 2 of qR\(5\) share the only peak/);
    }
  });

  it('does not take a peak that already carries a line, nor a rejected pair', () => {
    const cat = catalogue([100, 101], [1, 1]);
    const peaks = peaksAt([100, 101], [1, 1]);
    const r = assistantMatch(input(cat, peaks, { peakOwner: ['P(3)', ''], forbidden: new Set(['2,0,1,0@1']) }));
    expect(r.matches).toHaveLength(0);
    expect(r.ambiguous.map((a) => a.kind)).toEqual(['peak-taken']);
    expect(r.ambiguous[0].reason).toMatch(/already carries P\(3\)/);
  });

  it('refuses a peak far stronger or weaker than the rung predicts once the scale is known', () => {
    const cat = catalogue([100, 101], [1, 1]);
    const peaks = peaksAt([100, 101], [1, 0.1]);
    const r = assistantMatch(input(cat, peaks, { heightScale: 1 }));
    expect(r.matches.map((m) => m.rung)).toEqual([0]);
    expect(r.ambiguous[0].kind).toBe('intensity-mismatch');
    expect(r.ambiguous[0].reason).toMatch(/0\.10× the predicted height \(allowed 1\/3…3\)/);
  });
});
