import { describe, expect, it } from 'vitest';
import { bandLadders } from '../../src/physics/bandLadders';
import { bandLines } from '../../src/physics/bandLines';
import type { BandModel } from '../../src/physics/model';
import { ladderTestModel } from './ladderFixtures';
import { ladderLabelTemplate, ladderRowKey, ladderRowsBuild, rungExtent, rungTip } from '../../src/ui/plot/ladderGeometry';

const model = ladderTestModel;

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

describe('ladderLabelTemplate', () => {
  it('is the line label with J″ left to plotly', () => {
    expect(ladderLabelTemplate({ deltaK: 1, deltaJ: 0, kLower: 3 }, 'prolate')).toBe('<sup>r</sup>Q<sub>3</sub>(%{text})');
    expect(ladderLabelTemplate({ deltaK: 0, deltaJ: -1, kLower: 0 }, 'linear')).toBe('P(%{text})');
  });
});
