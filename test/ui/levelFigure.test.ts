import { describe, expect, it } from 'vitest';
import { perturbationScan } from '../../src/analysis/perturbationScan';
import { fitBand } from '../../src/fit/fitBand';
import { levelTermValues } from '../../src/fit/levelTermValues';
import { reducedTermFigure } from '../../src/ui/plot/levelFigure';
import { inventedModel, simulatedLines } from '../fit/fitTestData';

describe('reducedTermFigure', () => {
  const truth = inventedModel('prolate', 'parallel');
  // One upper level of an invented band moved by +0.04 cm^-1 in every line that reaches it.
  const lines = simulatedLines(truth, 500, 0.0005, 8).map((l) =>
    l.kUpper === 2 && l.jUpper === 12 ? { ...l, observedCm1: l.observedCm1 + 0.04 } : l,
  );
  const r = fitBand({ model: truth, floated: ['upper.origin', 'upper.B', 'upper.A', 'lower.B'], lines });
  if (!r.ok) throw new Error(r.error.message);
  const levels = levelTermValues(r.result, 'upper');
  const scan = perturbationScan(levels);

  it('draws one calculated line and one marker trace per K, with every level once', () => {
    const fig = reducedTermFigure(levels, [], false);
    const ks = new Set(levels.map((l) => l.k));
    expect(fig.data).toHaveLength(2 * ks.size);
    const markers = fig.data.filter((d) => (d as { mode?: string }).mode === 'markers');
    expect(markers.reduce((n, d) => n + ((d as { x: number[] }).x.length ?? 0), 0)).toBe(levels.length);
    // y is the reduced value E − B̄·J(J+1) of each level, as levelTermValues gives it.
    const first = markers[0] as { x: number[]; y: number[] };
    const lv = levels.find((l) => l.j === first.x[0] && l.k === levels[0].k)!;
    expect(first.y[0]).toBe(lv.reducedObsCm1);
  });

  it('rings the level the scan flags and no other', () => {
    expect(scan.findings[0]).toMatchObject({ k: 2, jPeak: 12 });
    const fig = reducedTermFigure(levels, scan.findings, true);
    const rings = fig.data[fig.data.length - 1] as { x: number[]; name: string };
    expect(rings.name).toMatch(/perturbed/);
    expect(rings.x).toEqual([12]);
  });

  it("plots each level's obs − calc on request, with the calculated course at zero", () => {
    const fig = reducedTermFigure(levels, scan.findings, false, 'obs-minus-calc');
    const line = fig.data[0] as { y: number[] };
    expect(line.y.every((y) => y === 0)).toBe(true);
    const lv = levels.find((l) => l.k === 2 && l.j === 12)!;
    const rings = fig.data[fig.data.length - 1] as { y: number[] };
    expect(rings.y).toEqual([lv.obsMinusCalcCm1]);
  });
});
