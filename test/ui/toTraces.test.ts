import { describe, expect, it } from 'vitest';
import { bandLadders } from '../../src/physics/bandLadders';
import { bandLines } from '../../src/physics/bandLines';
import { ladderRowsBuild } from '../../src/ui/plot/ladderGeometry';
import { figureFullRange, spectrumFigure, type SpectrumFigureInput } from '../../src/ui/plot/toTraces';
import { smallModel, smallTrace } from '../state/fixtures';

function input(over: Partial<SpectrumFigureInput> = {}): SpectrumFigureInput {
  const model = smallModel();
  const { trace } = smallTrace(model);
  const lines = bandLines(model, { minIntensity: 0.02 });
  const ladders = bandLadders(lines, model.shape);
  return {
    trace,
    xRange: null,
    columns: 600,
    heightPx: 500,
    ordinate: 'absorbance',
    rows: ladderRowsBuild(ladders, model.shape),
    lines,
    sim: null,
    showSimulated: false,
    showObsMinusSim: false,
    isDark: false,
    ...over,
  };
}

const kinds = (data: unknown[]) => data.map((d) => (d as { meta?: { kind?: string } }).meta?.kind);

describe('spectrumFigure', () => {
  it('shows the whole trace when nothing is zoomed, decimated to at most 2 points per column', () => {
    const inp = input();
    const { data, layout } = spectrumFigure(inp);
    const trace = data[0] as unknown as { x: number[]; y: number[] };
    expect(kinds(data)[0]).toBe('trace');
    expect(trace.x.length).toBeLessThanOrEqual(2 * 600 + 2);
    expect(inp.trace!.wavenumberCm1.length).toBeGreaterThan(2 * 600 + 2);
    expect((layout.xaxis as { range: number[] }).range).toEqual(figureFullRange(inp.trace, inp.lines));
  });

  it('draws transmittance as 10^−A of the same samples', () => {
    const a = spectrumFigure(input()).data[0] as unknown as { y: number[] };
    const t = spectrumFigure(input({ ordinate: 'transmittance' })).data[0] as unknown as { y: number[] };
    a.y.forEach((v, i) => expect(t.y[i]).toBeCloseTo(10 ** -v, 14));
  });

  it('gives the ladder axis above the trace no plotly data, grid lines or tick labels (rows, rungs and peaks are painted on the overlay)', () => {
    const inp = input();
    const { data, layout } = spectrumFigure(inp);
    expect(kinds(data)).toEqual(['trace', 'ladder-axis']);
    const axisTrace = data[1] as { x: unknown[]; yaxis?: string };
    expect(axisTrace.x).toEqual([]);
    expect(axisTrace.yaxis).toBe('y2');
    const y = layout.yaxis as { domain: number[] };
    const y2 = layout.yaxis2 as { domain: number[]; range: number[]; showticklabels: boolean; showgrid: boolean };
    expect(y2.domain[0]).toBeGreaterThan(y.domain[1]);
    // Every row's centre (0 … rows − 1) lies inside the axis range, half a row from its ends.
    expect(y2.range[0]).toBeLessThan(Math.min(...inp.rows.map((r) => r.y)));
    expect(y2.range[1]).toBeGreaterThan(Math.max(...inp.rows.map((r) => r.y)));
    expect(y2.showticklabels).toBe(false);
    expect(y2.showgrid).toBe(false);
  });

  it('has no shapes but the reviewed proposal (the vertical marks of clicks are the overlay’s, plotMarks)', () => {
    expect(spectrumFigure(input()).layout.shapes).toEqual([]);
  });

  it('adds the obs − sim axis below the trace only when asked and there is a simulation', () => {
    const inp = input();
    const sim = {
      xCm1: inp.trace!.wavenumberCm1,
      absorbance: inp.trace!.absorbance,
      scale: 1,
      offset: 0,
      obsMinusSim: new Float64Array(inp.trace!.wavenumberCm1.length),
    };
    expect(spectrumFigure({ ...inp, showObsMinusSim: true }).layout.yaxis3).toBeUndefined();
    const f = spectrumFigure({ ...inp, sim, showObsMinusSim: true, showSimulated: true });
    expect(f.layout.yaxis3).toBeDefined();
    expect(kinds(f.data)).toContain('residual');
    expect(kinds(f.data)).toContain('sim');
  });

  it('works without a trace (ladders only)', () => {
    const inp = input({ trace: null });
    const { data, layout } = spectrumFigure(inp);
    expect(kinds(data)).not.toContain('trace');
    const [lo, hi] = (layout.xaxis as { range: number[] }).range;
    for (let i = 0; i < inp.lines.count; i++) {
      expect(inp.lines.wavenumberCm1[i]).toBeGreaterThan(lo);
      expect(inp.lines.wavenumberCm1[i]).toBeLessThan(hi);
    }
  });
  it('marks the assistant’s open proposals inside the view on the trace (doubted ones in the flagged colour) and rings the selected one with a line', () => {
    const inp = input();
    const t = inp.trace!;
    const k = Math.floor(t.wavenumberCm1.length / 2);
    const [x0, x1] = [t.wavenumberCm1[k], t.wavenumberCm1[k + 10]];
    const outside = t.wavenumberCm1[0] - 5;
    const { data, layout } = spectrumFigure({
      ...inp,
      ordinate: 'transmittance',
      proposals: { xCm1: [x0, x1, outside], isDoubtful: [false, true, false] },
      selectedProposalCm1: x1,
    });
    const marks = data.find((d) => (d as { meta?: { kind?: string } }).meta?.kind === 'proposals') as unknown as {
      x: number[];
      y: number[];
      marker: { line: { color: string[] } };
    };
    expect(marks.x).toEqual([x0, x1]);
    // On the plotted ordinate: transmittance 10^−A of the sample at the proposal.
    expect(marks.y[0]).toBeCloseTo(10 ** -t.absorbance[k], 14);
    expect(marks.y[1]).toBeCloseTo(10 ** -t.absorbance[k + 10], 14);
    expect(marks.marker.line.color[0]).not.toBe(marks.marker.line.color[1]);
    const shapes = (layout.shapes ?? []) as { x0: number }[];
    expect(shapes.some((sh) => sh.x0 === x1)).toBe(true);
    // Without proposals, no such trace.
    expect(kinds(spectrumFigure(inp).data)).not.toContain('proposals');
  });
});
