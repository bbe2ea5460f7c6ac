import { describe, expect, it } from 'vitest';
import { bandLadders } from '../../src/physics/bandLadders';
import { bandLines } from '../../src/physics/bandLines';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';
import { ladderRowKey, ladderRowsBuild, ladderTracesBuild, rungExtent, rungTip } from '../../src/ui/plot/ladderGeometry';

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
  it('draws each ladder as one trace of segments separated by nulls, with quanta for clicks', () => {
    const lines = bandLines(model);
    const ladders = bandLadders(lines, 'prolate');
    const rows = ladderRowsBuild(ladders, 'prolate');
    const traces = ladderTracesBuild(rows, lines, 'prolate', { xRangeCm1: [0, 5000] });
    expect(traces.length).toBe(ladders.length);
    let rungs = 0;
    for (const t of traces as unknown as { x: (number | null)[]; y: (number | null)[]; customdata: (number[] | null)[]; hovertext: (string | null)[] }[]) {
      expect(t.x.length % 3).toBe(0);
      for (let k = 0; k < t.x.length; k += 3) {
        expect(t.x[k]).toBe(t.x[k + 1]);
        expect(t.x[k + 2]).toBeNull();
        expect(t.y[k + 2]).toBeNull();
        const q = t.customdata[k]!;
        // The segment sits at the line's position: find it in the line list by its quanta.
        const i = Array.from({ length: lines.count }, (_, n) => n).find(
          (n) => lines.jUpper[n] === q[0] && lines.kUpper[n] === q[1] && lines.jLower[n] === q[2] && lines.kLower[n] === q[3],
        )!;
        expect(t.x[k]).toBe(lines.wavenumberCm1[i]);
        expect(t.hovertext[k]).toContain(lines.wavenumberCm1[i].toFixed(4));
        rungs++;
      }
    }
    expect(rungs).toBe(lines.count);
  });

  it('leaves out rungs outside the visible range', () => {
    const lines = bandLines(model);
    const rows = ladderRowsBuild(bandLadders(lines, 'prolate'), 'prolate');
    const all = ladderTracesBuild(rows, lines, 'prolate', { xRangeCm1: [0, 5000] });
    const some = ladderTracesBuild(rows, lines, 'prolate', { xRangeCm1: [999, 1001] });
    const count = (ts: typeof all) => ts.reduce((n, t) => n + (t as { x: unknown[] }).x.length / 3, 0);
    let inRange = 0;
    for (let i = 0; i < lines.count; i++) if (lines.wavenumberCm1[i] >= 999 - 0.04 && lines.wavenumberCm1[i] <= 1001 + 0.04) inRange++;
    expect(count(some)).toBe(inRange);
    expect(count(some)).toBeLessThan(count(all));
  });
});
