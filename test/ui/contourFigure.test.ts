import { describe, expect, it } from 'vitest';
import { contourFigure, contourRelayoutRegion } from '../../src/ui/plot/contourFigure';

const x = Float64Array.from({ length: 200 }, (_, i) => 1000 + i * 0.5);
const y = x.map((v) => Math.exp(-(((v - 1050) / 5) ** 2)));

describe('contourFigure', () => {
  it('draws only the trace before a fit, and the fit and its residual on a lower panel after one', () => {
    const before = contourFigure({
      trace: { wavenumberCm1: x, absorbance: y },
      region: [1010, 1090],
      fit: null,
      qMaxima: [],
      columns: 300,
      isDark: false,
    });
    expect(before.data.map((d) => d.name)).toEqual(['trace']);
    expect(before.layout.yaxis2).toBeUndefined();
    const fit = { x: x.slice(20, 180), simulation: y.slice(20, 180), residual: new Float64Array(160) };
    const after = contourFigure({
      trace: { wavenumberCm1: x, absorbance: y },
      region: [1010, 1090],
      fit,
      qMaxima: [1050],
      columns: 300,
      isDark: true,
    });
    expect(after.data.map((d) => d.name)).toEqual(['trace', 'fitted contour', 'obs − fit', 'Q maxima']);
    expect((after.data[2] as { yaxis?: string }).yaxis).toBe('y2');
    expect(after.layout.xaxis?.range).toEqual([1010, 1090]);
  });
});

describe('contourRelayoutRegion', () => {
  it('reads a zoom as the region, a reset as the whole trace, and ignores y-only changes', () => {
    expect(contourRelayoutRegion({ 'xaxis.range[0]': 1100, 'xaxis.range[1]': 1120 })).toEqual([1100, 1120]);
    expect(contourRelayoutRegion({ 'xaxis.range': [1120, 1100] })).toEqual([1100, 1120]);
    expect(contourRelayoutRegion({ 'xaxis.autorange': true })).toBeNull();
    expect(contourRelayoutRegion({ 'yaxis.range[0]': 0, 'yaxis.range[1]': 1 })).toBeUndefined();
    expect(contourRelayoutRegion({ 'xaxis.range[0]': 5, 'xaxis.range[1]': 5 })).toBeUndefined();
  });
});
