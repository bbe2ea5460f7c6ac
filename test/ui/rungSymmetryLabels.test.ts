import { describe, expect, it } from 'vitest';
import { bandLadders } from '../../src/physics/bandLadders';
import { bandLines } from '../../src/physics/bandLines';
import type { BandModel, LineList } from '../../src/physics/model';
import type { LineLevelLabels } from '../../src/state/systemLevelLabels';
import { ladderRowsBuild } from '../../src/ui/plot/ladderGeometry';
import { ladderSceneBuild, type LadderView } from '../../src/ui/plot/ladderScene';
import { plotTheme } from '../../src/ui/plot/plotColours';
import { rungSymmetryLabelsPaint, rungSymmetryTexts } from '../../src/ui/plot/rungSymmetryLabels';
import { ladderTestModel } from './ladderFixtures';
import { paintRecorder } from './paintRecorder';

const model: BandModel = { ...ladderTestModel, jMax: 10, kMax: 3 };
const theme = plotTheme(false);

/** Invented labels: every line "E ← A1" except K″ = 3 lines, tagged as members of an A1/A2 pair. */
function labelsOf(lines: LineList): LineLevelLabels {
  const n = lines.count;
  const isPair = (i: number) => lines.kLower[i] === 3;
  return {
    lUpper: new Int8Array(n),
    lLower: new Int8Array(n),
    tagUpper: Array.from({ length: n }, () => ''),
    tagLower: Array.from({ length: n }, (_, i) => (isPair(i) ? (i % 2 ? 'A1' : 'A2') : '')),
    symUpper: Array.from({ length: n }, () => 'E'),
    symLower: Array.from({ length: n }, (_, i) => (isPair(i) ? '' : 'A1')),
  };
}

function setUp() {
  const lines = bandLines(model);
  const rows = ladderRowsBuild(bandLadders(lines, model.shape), model.shape);
  const scene = ladderSceneBuild(rows, lines, false);
  return { lines, rows, scene, texts: rungSymmetryTexts(labelsOf(lines), lines.count)! };
}

function viewOf(lines: LineList, rowsCount: number, pitchPx: number, widthPx: number, span?: [number, number]): LadderView {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < lines.count; i++) {
    lo = Math.min(lo, lines.wavenumberCm1[i]);
    hi = Math.max(hi, lines.wavenumberCm1[i]);
  }
  const [x0, x1] = span ?? [lo - 1, hi + 1];
  return { x0Cm1: x0, x1Cm1: x1, y0: -0.6, y1: rowsCount - 0.4, leftPx: 70, topPx: 10, widthPx, heightPx: pitchPx * rowsCount };
}

describe('rungSymmetryTexts', () => {
  it('writes upper ← lower compactly, the tag of a pair member in place of its species', () => {
    const { lines, texts } = setUp();
    for (let i = 0; i < lines.count; i++) expect(texts[i]).toBe(lines.kLower[i] === 3 ? `E←${i % 2 ? 'A1' : 'A2'}` : 'E←A1');
  });
  it('gives null where no line has a label (nothing to draw)', () => {
    const lines = bandLines(model);
    const none = labelsOf(lines);
    none.symUpper.fill('');
    none.symLower.fill('');
    none.tagLower.fill('');
    expect(rungSymmetryTexts(none, lines.count)).toBeNull();
    expect(rungSymmetryTexts(null, lines.count)).toBeNull();
  });
});

describe('rungSymmetryLabelsPaint', () => {
  it('draws nothing in rows too short for the text, but the selected rung’s label', () => {
    const { lines, rows, scene, texts } = setUp();
    const rec = paintRecorder();
    const view = viewOf(lines, rows.length, 10, 20000);
    expect(rungSymmetryLabelsPaint(rec.ctx, scene, texts, -1, view, theme).count).toBe(0);
    const sel = scene.lineIndex[5];
    const d = rungSymmetryLabelsPaint(rec.ctx, scene, texts, sel, view, theme);
    expect(d.texts).toEqual([texts[sel]]);
  });

  it('labels each rung right of it only where the next rung of its row leaves room, never overlapping', () => {
    const { lines, rows, scene, texts } = setUp();
    const rec = paintRecorder();
    // Zoomed so rungs 2B ≈ 0.6 cm⁻¹ apart are ~60 px apart; rows 30 px tall.
    const view = viewOf(lines, rows.length, 30, 100 * (lines.wavenumberCm1.reduce((a, b) => Math.max(a, b)) - 980));
    const d = rungSymmetryLabelsPaint(rec.ctx, scene, texts, -1, view, theme);
    expect(d.count).toBeGreaterThan(20);
    expect(d.texts).toContain('E←A1');
    expect(d.texts.some((t) => t === 'E←A1' || t === 'E←A2')).toBe(true);
    // No two labels of one row (same y) overlap: 9 px font, 0.6 × 9 px per character in the recorder.
    const byY = new Map<number, { x: number; w: number }[]>();
    for (const t of rec.texts) {
      const list = byY.get(Math.round(t.y)) ?? [];
      list.push({ x: t.x, w: t.text.length * 0.6 * 9 });
      byY.set(Math.round(t.y), list);
    }
    for (const list of byY.values()) {
      list.sort((a, b) => a.x - b.x);
      for (let k = 1; k < list.length; k++) expect(list[k].x).toBeGreaterThanOrEqual(list[k - 1].x + list[k - 1].w);
    }
    // Squeezed to a tenth of the width, most labels give way (their rungs are too close).
    const rec2 = paintRecorder();
    const narrow = { ...view, widthPx: view.widthPx / 10 };
    expect(rungSymmetryLabelsPaint(rec2.ctx, scene, texts, -1, narrow, theme).count).toBeLessThan(d.count / 2);
  });
});
