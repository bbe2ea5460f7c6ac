import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { importTrace } from '../../src/io/traceImport';
import { modelFileParse } from '../../src/io/modelFile';
import { bandLines } from '../../src/physics/bandLines';
import { lineLabelAscii } from '../../src/physics/lineLabel';
import { transitionWavenumber } from '../../src/physics/termValues';
import { peakClick, peakNearest, selectCandidates } from '../../src/state/actionsAssign';
import { traceReplace } from '../../src/state/actionsImport';
import { modelLoadText } from '../../src/state/actionsModel';
import { selectPeaks } from '../../src/state/selectors';
import { benchStore } from '../../src/state/store';
describe('candidate list on the demo, from its first guess (public/demo/model.json) against its truth (truth.json)', () => {
  // Both files are invented (public/demo/README.md). The lines chosen are the 30 strongest (≥ 5 %
  // of the band's strongest) that make a peak of their own (no line ≥ 1/3 as strong within
  // 0.02 cm^-1, about the line width) and that the first guess puts 0.1–0.4 cm^-1 off, the case
  // reported (right line missing from the list, or 4th–7th).
  it('lists the true line of every such peak, and in the top three for most', () => {
    const out = importTrace(readFileSync('public/demo/trace.csv', 'utf8'), 'trace.csv');
    modelLoadText(readFileSync('public/demo/model.json', 'utf8'), 'model.json');
    if (!out.ok) throw new Error(out.error.message);
    traceReplace(out.trace, null, 'file');
    const truth = modelFileParse(readFileSync('public/demo/truth.json', 'utf8')).model;
    const guess = modelFileParse(readFileSync('public/demo/model.json', 'utf8')).model;
    const lines = bandLines(truth, { minIntensity: 0.002 });
    let strongest = 0;
    for (let i = 0; i < lines.count; i++) strongest = Math.max(strongest, lines.intensity[i]);
    const offOf = (i: number) =>
      Math.abs(transitionWavenumber(guess, lines.jUpper[i], lines.kUpper[i], lines.jLower[i], lines.kLower[i]) - lines.wavenumberCm1[i]);
    const order = Array.from({ length: lines.count }, (_, i) => i).sort((a, b) => lines.intensity[b] - lines.intensity[a]);
    const targets: number[] = [];
    for (const i of order) {
      if (targets.length === 30 || lines.intensity[i] < 0.05 * strongest) break;
      const off = offOf(i);
      if (off < 0.1 || off > 0.4) continue;
      let alone = true;
      for (let j = 0; j < lines.count && alone; j++)
        if (j !== i && Math.abs(lines.wavenumberCm1[j] - lines.wavenumberCm1[i]) < 0.02 && 3 * lines.intensity[j] >= lines.intensity[i])
          alone = false;
      if (alone) targets.push(i);
    }
    const { peaks } = selectPeaks(benchStore.getState());
    const ranks: number[] = [];
    for (const i of targets) {
      const p = peakNearest(peaks!, lines.wavenumberCm1[i], 0.01);
      if (p < 0) continue;
      benchStore.setState({ cursor: null, candidateTarget: null });
      peakClick(p);
      const label = lineLabelAscii(lines.deltaK[i], lines.deltaJ[i], lines.kLower[i], lines.jLower[i], truth.shape);
      ranks.push(selectCandidates(benchStore.getState()).findIndex((c) => c.labelAscii === label) + 1);
    }
    expect(ranks.length).toBe(30);
    // Never dropped (rank 0 = not listed).
    expect(Math.min(...ranks)).toBeGreaterThanOrEqual(1);
    // Measured 23 of 30 in the top three (2026-12-03); at least 20 required, two thirds.
    expect(ranks.filter((r) => r <= 3).length).toBeGreaterThanOrEqual(20);
  });
}, 120000);
