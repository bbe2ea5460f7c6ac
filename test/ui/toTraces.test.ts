import { describe, expect, it } from 'vitest';
import { peaksFind } from '../../src/analysis/peaksFind';
import { bandLadders } from '../../src/physics/bandLadders';
import { bandLines } from '../../src/physics/bandLines';
import { peakIdAt } from '../../src/state/assignLogic';
import { ladderRowsBuild } from '../../src/ui/plot/ladderGeometry';
import type { AssignmentRow } from '../../src/state/selectors';
import { rungPointQuanta } from '../../src/ui/plot/ladderGeometry';
import { ASSIGNED_MARKERS_MAX, figureFullRange, spectrumFigure, type SpectrumFigureInput } from '../../src/ui/plot/toTraces';
import { smallModel, smallTrace } from '../state/fixtures';

function input(over: Partial<SpectrumFigureInput> = {}): SpectrumFigureInput {
  const model = smallModel();
  const { trace } = smallTrace(model);
  const lines = bandLines(model, { minIntensity: 0.02 });
  const ladders = bandLadders(lines, model.shape);
  const indexOf = new Map<string, number>();
  for (let i = 0; i < lines.count; i++) indexOf.set(`${lines.jUpper[i]},${lines.kUpper[i]},${lines.jLower[i]},${lines.kLower[i]}`, i);
  return {
    trace,
    xRange: null,
    columns: 600,
    heightPx: 500,
    ordinate: 'absorbance',
    peaks: peaksFind(trace),
    showPeaks: true,
    assignedPeaks: new Map(),
    peakId: peakIdAt,
    rows: ladderRowsBuild(ladders, model.shape),
    lines,
    indexOf,
    shape: model.shape,
    assignments: [],
    selectedAssignmentId: null,
    cursor: null,
    candidatePeakCm1: null,
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

  it('draws every visible rung in fewer ladder traces than series, on the ladder axis above the trace', () => {
    const inp = input();
    const { data, layout } = spectrumFigure(inp);
    const rungTraces = data.filter((d) => (d as { meta?: { kind?: string } }).meta?.kind === 'rungs' && (d as { mode?: string }).mode === 'lines');
    expect(rungTraces.length).toBeGreaterThan(0);
    expect(rungTraces.length).toBeLessThan(inp.rows.reduce((n, r) => n + r.ladders.length, 0));
    // Every line of the model is in view here, so every line has exactly one rung (4 vertices each).
    const rungCount = rungTraces.reduce((n, t) => n + (t as { x: unknown[] }).x.filter((v) => v !== null).length / 4, 0);
    expect(rungCount).toBe(inp.rows.reduce((n, r) => n + r.ladders.reduce((m, l) => m + l.lineIndex.length, 0), 0));
    for (const t of rungTraces) expect((t as { yaxis?: string }).yaxis).toBe('y2');
    const y = layout.yaxis as { domain: number[] };
    const y2 = layout.yaxis2 as { domain: number[]; tickvals: number[] };
    expect(y2.domain[0]).toBeGreaterThan(y.domain[1]);
    expect(y2.tickvals.length).toBe(inp.rows.length);
  });

  it('marks assigned peaks apart from free ones and adds the cursor marker and line', () => {
    const inp = input();
    const p = inp.peaks!;
    const assignedPeaks = new Map([[peakIdAt(p.wavenumberCm1[0]), 'x']]);
    const c = { jUpper: inp.lines.jUpper[0], kUpper: inp.lines.kUpper[0], jLower: inp.lines.jLower[0], kLower: inp.lines.kLower[0] };
    const { data, layout } = spectrumFigure({ ...inp, assignedPeaks, cursor: c });
    const peakTraces = data.filter((d) => (d as { meta?: { kind?: string } }).meta?.kind === 'peaks') as unknown as { x: number[]; customdata: number[] }[];
    expect(peakTraces[1].x).toEqual([p.wavenumberCm1[0]]);
    expect(peakTraces[0].x.length + peakTraces[1].x.length).toBe(p.count);
    expect(peakTraces[1].customdata).toEqual([0]);
    expect(data.some((d) => (d as { name?: string }).name === 'selected rung')).toBe(true);
    expect((layout.shapes as { x0: number }[]).some((s) => s.x0 === inp.lines.wavenumberCm1[0])).toBe(true);
  });

  it('adds the obs − sim axis below the trace only when asked and there is a simulation', () => {
    const inp = input();
    const sim = { xCm1: inp.trace!.wavenumberCm1, absorbance: inp.trace!.absorbance, scale: 1, offset: 0, obsMinusSim: new Float64Array(inp.trace!.wavenumberCm1.length) };
    expect(spectrumFigure({ ...inp, showObsMinusSim: true }).layout.yaxis3).toBeUndefined();
    const f = spectrumFigure({ ...inp, sim, showObsMinusSim: true, showSimulated: true });
    expect(f.layout.yaxis3).toBeDefined();
    expect(kinds(f.data)).toContain('residual');
    expect(kinds(f.data)).toContain('sim');
  });

  it('works without a trace (ladders only)', () => {
    const inp = input({ trace: null, peaks: null });
    const { data, layout } = spectrumFigure(inp);
    expect(kinds(data)).not.toContain('trace');
    const [lo, hi] = (layout.xaxis as { range: number[] }).range;
    for (let i = 0; i < inp.lines.count; i++) {
      expect(inp.lines.wavenumberCm1[i]).toBeGreaterThan(lo);
      expect(inp.lines.wavenumberCm1[i]).toBeLessThan(hi);
    }
  });

  it('draws assigned rungs as bars in one path once there are more than ASSIGNED_MARKERS_MAX in view, each vertex mapped back to its line', () => {
    const model = { ...smallModel(), jMax: 40, kMax: 8 };
    const lines = bandLines(model, { minIntensity: 0 });
    const ladders = bandLadders(lines, model.shape);
    const indexOf = new Map<string, number>();
    for (let i = 0; i < lines.count; i++) indexOf.set(`${lines.jUpper[i]},${lines.kUpper[i]},${lines.jLower[i]},${lines.kLower[i]}`, i);
    expect(lines.count).toBeGreaterThan(ASSIGNED_MARKERS_MAX);
    const assignments = Array.from({ length: lines.count }, (_, i) => {
      const a = { id: `a${i}`, jUpper: lines.jUpper[i], kUpper: lines.kUpper[i], jLower: lines.jLower[i], kLower: lines.kLower[i], observedCm1: lines.wavenumberCm1[i] };
      return { a, labelHtml: `line ${i}`, deltaJ: a.jUpper - a.jLower, deltaK: a.kUpper - a.kLower, omcCm1: 0, omcSigma: null, isFar: false, isOutlier: false } as unknown as AssignmentRow;
    });
    const { data } = spectrumFigure(input({ trace: null, peaks: null, lines, indexOf, rows: ladderRowsBuild(ladders, model.shape), assignments }));
    const bars = data.find((d) => d.name === 'assigned rungs') as unknown as { mode: string; x: (number | null)[]; hovertext: (string | null)[]; meta: { lineIndex: (number | null)[] } };
    expect(bars.mode).toBe('lines');
    expect(bars.x.length).toBe(3 * lines.count);
    for (let k = 0; k < bars.x.length; k += 3) {
      const q = rungPointQuanta(bars.meta, k, undefined, lines)!;
      const i = indexOf.get(`${q.jUpper},${q.kUpper},${q.jLower},${q.kLower}`)!;
      expect(bars.x[k]).toBe(lines.wavenumberCm1[i]);
      expect(bars.hovertext[k]).toMatch(new RegExp(`^line ${i} assigned`));
    }
  });
});
