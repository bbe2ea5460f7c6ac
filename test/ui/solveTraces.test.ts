import { describe, expect, it } from 'vitest';
import { combinationDifferences } from '../../src/fit/combinationDifferences';
import { fitBand } from '../../src/fit/fitBand';
import { bandLines } from '../../src/physics/bandLines';
import { combinationFigure, correlationFigure, residualFigure, residualFigureBands } from '../../src/ui/plot/solveTraces';
import { bandColour } from '../../src/ui/plot/plotColours';
import { smallModel } from '../state/fixtures';

const model = smallModel();
const lines = bandLines(model, { minIntensity: 0.02 });
const obs = Array.from({ length: lines.count }, (_, i) => ({
  jUpper: lines.jUpper[i],
  kUpper: lines.kUpper[i],
  jLower: lines.jLower[i],
  kLower: lines.kLower[i],
  observedCm1: lines.wavenumberCm1[i] + (((i * 7919) % 13) - 6) * 1e-5,
  uncertaintyCm1: 1e-4,
}));

describe('residualFigure', () => {
  it('plots one trace per sub-branch series with obs − calc against J″ and the assignment ids', () => {
    const r = fitBand({ model, floated: ['upper.origin', 'upper.B', 'lower.B'], lines: obs });
    if (!r.ok) throw new Error(r.error.message);
    const ids = obs.map((_, i) => `a${i}`);
    const { data } = residualFigure(r.result, ids, 'prolate', false);
    const series = new Set(obs.map((o) => `${o.kUpper - o.kLower}:${o.kLower}:${o.jUpper - o.jLower}`));
    expect(data.length).toBe(series.size);
    let n = 0;
    for (const d of data as unknown as { x: number[]; y: number[]; customdata: string[] }[]) {
      d.customdata.forEach((id, k) => {
        const i = Number(id.slice(1));
        expect(d.x[k]).toBe(obs[i].jLower);
        expect(d.y[k]).toBe(r.result.lines[i].obsMinusCalc);
      });
      n += d.x.length;
    }
    expect(n).toBe(obs.length);
  });

  it('draws fitted, excluded and outlier lines as separate uniform-marker traces, each line once with its own hover text', () => {
    // Every 5th line excluded and every 7th shifted by 0.01 cm^-1 (≫ σ = 1e-4) so the fit flags it.
    const lines2 = obs.map((o, i) => ({ ...o, isExcluded: i % 5 === 0, observedCm1: o.observedCm1 + (i % 7 === 3 ? 0.01 : 0) }));
    const r = fitBand({ model, floated: ['upper.origin', 'upper.B', 'lower.B'], lines: lines2 });
    if (!r.ok) throw new Error(r.error.message);
    expect(r.result.outliers.length).toBeGreaterThan(0);
    const ids = obs.map((_, i) => `a${i}`);
    const { data } = residualFigure(r.result, ids, 'prolate', false);
    const seen = new Set<string>();
    for (const d of data as unknown as {
      x: number[];
      y: number[];
      customdata: string[];
      hovertext: string[];
      marker: { symbol: unknown; color: unknown };
    }[]) {
      expect(typeof d.marker.symbol).toBe('string');
      expect(typeof d.marker.color).toBe('string');
      d.customdata.forEach((id, k) => {
        const i = Number(id.slice(1));
        const l = r.result.lines[i];
        expect(seen.has(id)).toBe(false);
        seen.add(id);
        // Branch by marker (P ◀, Q ●, R ▶), excluded open, outliers crossed.
        const base = ['triangle-left', 'circle', 'triangle-right'][l.jUpper - l.jLower + 1];
        expect(d.marker.symbol).toBe(l.isOutlier ? 'x' : l.isExcluded ? `${base}-open` : base);
        expect(d.x[k]).toBe(l.jLower);
        expect(d.y[k]).toBe(l.obsMinusCalc);
        expect(d.hovertext[k]).toContain(`obs − calc ${l.obsMinusCalc.toExponential(2)} cm⁻¹`);
        expect(d.hovertext[k].includes('excluded')).toBe(l.isExcluded);
        expect(d.hovertext[k].includes('outlier')).toBe(l.isOutlier);
      });
    }
    expect(seen.size).toBe(obs.length);
    // One legend entry per sub-branch series (ΔK, K″, ΔJ), named as the ladders are ("rR3").
    const legend = (data as unknown as { showlegend: boolean; name: string }[]).filter((d) => d.showlegend);
    expect(legend.length).toBe(new Set(obs.map((o) => `${o.kUpper - o.kLower}:${o.kLower}:${o.jUpper - o.jLower}`)).size);
    for (const d of legend) expect(d.name).toMatch(/^[pqr]?[PQR]\d*$/);
  });
});

describe('residualFigureBands', () => {
  it('colours each band in its family, with one legend entry per band, and draws every line once', () => {
    const r = fitBand({ model, floated: ['upper.origin', 'upper.B', 'lower.B'], lines: obs });
    if (!r.ok) throw new Error(r.error.message);
    // The same lines split over two bands of a system (alternate lines), as a joint fit labels them.
    const result = { ...r.result, lines: r.result.lines.map((l, i) => ({ ...l, band: i % 2 ? 'hot' : 'nu4', species: 'X' })) };
    const ids = obs.map((_, i) => `a${i}`);
    const keys = ['X/nu4', 'X/hot'];
    const { data } = residualFigureBands(result, ids, keys, 'prolate', false);
    const traces = data as unknown as { name: string; showlegend: boolean; x: number[]; customdata: string[]; marker: { color: string } }[];
    expect(traces.filter((d) => d.showlegend).map((d) => d.name)).toEqual(['nu4 (X)', 'hot (X)']);
    for (const d of traces) {
      const band = d.name.startsWith('nu4') ? 0 : 1;
      expect(d.marker.color).toBe(bandColour(band, false));
      for (const id of d.customdata) expect(Number(id.slice(1)) % 2).toBe(band);
    }
    expect(traces.reduce((n, d) => n + d.x.length, 0)).toBe(obs.length);
  });
});

describe('correlationFigure', () => {
  it('shows the correlation matrix on a fixed −1 … +1 scale', () => {
    const r = fitBand({ model, floated: ['upper.origin', 'upper.B', 'lower.B'], lines: obs });
    if (!r.ok) throw new Error(r.error.message);
    const h = correlationFigure(r.result, false).data[0] as unknown as { z: number[][]; zmin: number; zmax: number; x: string[] };
    expect(h.zmin).toBe(-1);
    expect(h.zmax).toBe(1);
    // The constants are named as the trade writes them, in the order floated.
    expect(h.x).toEqual(['ν<sub>0</sub>', 'B′', 'B″']);
    expect(h.z).toEqual(r.result.correlation);
  });
});

describe('combinationFigure', () => {
  it('draws each K with its line 4B − 8DJ((J+½)²+¾) − 4DJK K² through the points', () => {
    // Exact lines from the model: the lower-state differences follow the formula with the
    // model's B″, DJ″ (Herzberg I 1950, ch. III), so each point lies on its K line.
    const exact = obs.map((o, i) => ({ ...o, observedCm1: lines.wavenumberCm1[i] }));
    const cd = combinationDifferences(exact, 'lower', { shape: 'prolate' });
    if (!cd.ok) throw new Error(cd.error.message);
    const { data } = combinationFigure(cd.result, false);
    const B = cd.result.B.value;
    const DJ = cd.result.DJ.value;
    const DJK = cd.result.DJK.value;
    expect(B).toBeCloseTo(model.lower.B, 9);
    for (let t = 0; t < data.length; t += 2) {
      const pts = data[t] as unknown as { x: number[]; y: number[]; name: string };
      const k = Number(pts.name.split('=')[1]);
      pts.x.forEach((x, i) => expect(pts.y[i]).toBeCloseTo(4 * B - 8 * DJ * (x + 0.75) - 4 * DJK * k * k, 8));
    }
  });
});
