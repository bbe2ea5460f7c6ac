import { describe, expect, it } from 'vitest';
import { bandLadders } from '../../src/physics/bandLadders';
import { bandLines } from '../../src/physics/bandLines';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';
import { ladderLabelTemplate, ladderRowKey, rungPointQuanta, ladderRowsBuild, ladderTracesBuild, rungExtent, rungTip } from '../../src/ui/plot/ladderGeometry';

// Invented constants (cm^-1), small enough to count lines by hand.
const model: BandModel = {
  shape: 'prolate',
  band: 'perpendicular',
  lower: stateConstantsFrom({ B: 0.3, A: 5 }),
  upper: stateConstantsFrom({ origin: 1000, B: 0.299, A: 4.98, zeta: 0.2 }),
  temperatureK: 300,
  jMax: 6,
  kMax: 2,
  spinWeights: [1],
};

describe('ladderRowsBuild', () => {
  it('returns no rows for no ladders', () => {
    expect(ladderRowsBuild([], 'prolate')).toEqual([]);
  });

  it('makes one row per (ΔK, K″) holding its P, Q and R ladders, the first at the top', () => {
    const lines = bandLines(model);
    const rows = ladderRowsBuild(bandLadders(lines, 'prolate'), 'prolate');
    // Perpendicular selection rules (Herzberg II 1945, ch. IV): ΔK = +1 from K″ = 0, 1, 2 and
    // ΔK = −1 from K″ = 1, 2 (not from K″ = 0): 5 rows.
    expect(rows.map((r) => r.key)).toEqual(['r:0', 'r:1', 'r:2', 'p:1', 'p:2']);
    expect(rows.map((r) => r.y)).toEqual([4, 3, 2, 1, 0]);
    for (const r of rows) {
      expect(r.ladders.length).toBe(3);
      expect(r.ladders.map((l) => l.deltaJ).sort()).toEqual([-1, 0, 1]);
      for (const l of r.ladders) expect(ladderRowKey(l)).toBe(r.key);
    }
    expect(rows[0].name).toBe("ΔK=+1, K''=0");
  });

  it('leaves hidden rows out and renumbers the rest', () => {
    const lines = bandLines(model);
    const rows = ladderRowsBuild(bandLadders(lines, 'prolate'), 'prolate', new Set(['r:1', 'p:2']));
    expect(rows.map((r) => r.key)).toEqual(['r:0', 'r:2', 'p:1']);
    expect(rows.map((r) => r.y)).toEqual([2, 1, 0]);
  });

  it('gives a linear molecule a single row', () => {
    const lin: BandModel = { ...model, shape: 'linear', band: 'parallel', kMax: 0 };
    const rows = ladderRowsBuild(bandLadders(bandLines(lin), 'linear'), 'linear');
    expect(rows.length).toBe(1);
    expect(rows[0].tickHtml).toBe('band');
  });
});

describe('rungExtent', () => {
  it('hangs P below, stands R above and runs Q through the row line', () => {
    expect(rungExtent(-1, 1)[1]).toBe(0);
    expect(rungExtent(1, 1)[0]).toBe(0);
    const q = rungExtent(0, 0.25);
    expect(q[0]).toBe(-q[1]);
    expect(rungTip(-1, 1)).toBeLessThan(0);
    expect(rungTip(1, 1)).toBeGreaterThan(0);
  });
  it('grows with intensity and stays under 0.45 so rows 1 apart never touch', () => {
    expect(rungExtent(1, 0)[1]).toBeCloseTo(0.12, 12);
    expect(rungExtent(1, 1)[1]).toBeCloseTo(0.42, 12);
    expect(rungExtent(1, 5)[1]).toBeCloseTo(0.42, 12);
    expect(rungExtent(1, 0.25)[1]).toBeLessThan(rungExtent(1, 0.5)[1]);
  });
});

describe('ladderTracesBuild', () => {
  it('draws the ladders as few traces (one per colour and width) of rung polylines separated by nulls, each clickable back to its quanta', () => {
    const lines = bandLines(model);
    const ladders = bandLadders(lines, 'prolate');
    const rows = ladderRowsBuild(ladders, 'prolate');
    const traces = ladderTracesBuild(rows, lines, 'prolate', { xRangeCm1: [0, 5000] });
    // At most two widths (Q wider) per row colour, so never more traces than 2 x rows, and fewer than series.
    expect(traces.length).toBeLessThan(ladders.length);
    expect(traces.length).toBeLessThanOrEqual(2 * rows.length);
    let rungs = 0;
    const seen = new Set<number>();
    type T = { x: (number | null)[]; y: (number | null)[]; text: (string | null)[]; customdata: (number | null)[]; hovertemplate: string; meta: { deltaK: number; lineIndex: (number | null)[] } };
    for (const t of traces as unknown as T[]) {
      expect(t.hovertemplate).toBe('%{text}<br>%{x:.4f} cm⁻¹<br>rel. intensity %{customdata:.3g}<extra></extra>');
      // Series are polylines of 4 vertices per rung (row line, rung ends, row line) ended by a null.
      const pieces: number[][] = [[]];
      t.x.forEach((v, k) => (v === null ? pieces.push([]) : pieces[pieces.length - 1].push(k)));
      for (const piece of pieces) expect(piece.length % 4).toBe(0);
      for (const k of pieces.flatMap((piece) => piece.filter((_, n) => n % 4 === 0))) {
        expect(t.x[k]).toBe(t.x[k + 3]);
        expect(t.x[k + 1]).toBe(t.x[k]);
        expect(t.y[k]).toBe(t.y[k + 3]);
        expect(t.meta.lineIndex[k + 2]).toBe(t.meta.lineIndex[k]);
        const q = rungPointQuanta(t.meta, k, t.customdata[k], lines)!;
        // The segment sits at the position of the line with those quanta (found by brute force).
        const i = Array.from({ length: lines.count }, (_, n) => n).find(
          (n) => lines.jUpper[n] === q.jUpper && lines.kUpper[n] === q.kUpper && lines.jLower[n] === q.jLower && lines.kLower[n] === q.kLower,
        )!;
        expect(i).toBeDefined();
        expect(q.kUpper - q.kLower).toBe(t.meta.deltaK);
        expect(t.x[k]).toBe(lines.wavenumberCm1[i]);
        expect(t.customdata[k]).toBe(lines.intensity[i]);
        // The hover label is the line's own label.
        expect(t.text[k]).toBe(ladderLabelTemplate({ deltaK: q.kUpper - q.kLower, deltaJ: q.jUpper - q.jLower, kLower: q.kLower }, 'prolate').replace('%{text}', String(q.jLower)));
        seen.add(i);
        rungs++;
      }
    }
    expect(rungs).toBe(lines.count);
    expect(seen.size).toBe(lines.count);
  });

  it('leaves out rungs outside the visible range', () => {
    const lines = bandLines(model);
    const rows = ladderRowsBuild(bandLadders(lines, 'prolate'), 'prolate');
    const all = ladderTracesBuild(rows, lines, 'prolate', { xRangeCm1: [0, 5000] });
    const some = ladderTracesBuild(rows, lines, 'prolate', { xRangeCm1: [999, 1001] });
    const count = (ts: typeof all) => ts.reduce((n, t) => n + (t as { x: unknown[] }).x.filter((v) => v !== null).length / 4, 0);
    let inRange = 0;
    for (let i = 0; i < lines.count; i++) if (lines.wavenumberCm1[i] >= 999 - 0.04 && lines.wavenumberCm1[i] <= 1001 + 0.04) inRange++;
    expect(count(some)).toBe(inRange);
    expect(count(some)).toBeLessThan(count(all));
  });
});

describe('ladderLabelTemplate', () => {
  it('is the line label with J″ left to plotly', () => {
    expect(ladderLabelTemplate({ deltaK: 1, deltaJ: 0, kLower: 3 }, 'prolate')).toBe('<sup>r</sup>Q<sub>3</sub>(%{text})');
    expect(ladderLabelTemplate({ deltaK: 0, deltaJ: -1, kLower: 0 }, 'linear')).toBe('P(%{text})');
  });
});

describe('rungPointQuanta', () => {
  it('reads marker points from customdata, ladder vertices from meta.lineIndex, and refuses anything else', () => {
    const lines = bandLines(model);
    expect(rungPointQuanta(undefined, undefined, [5, 2, 4, 1], lines)).toEqual({ jUpper: 5, kUpper: 2, jLower: 4, kLower: 1 });
    expect(rungPointQuanta(undefined, undefined, 0.5, lines)).toBeNull();
    expect(rungPointQuanta({ lineIndex: [3, 3, null] }, 2, null, lines)).toBeNull();
    expect(rungPointQuanta({ lineIndex: [lines.count] }, 0, null, lines)).toBeNull();
    expect(rungPointQuanta({ lineIndex: [null, 4] }, 1, null, lines)).toEqual({ jUpper: lines.jUpper[4], kUpper: lines.kUpper[4], jLower: lines.jLower[4], kLower: lines.kLower[4] });
  });
});
