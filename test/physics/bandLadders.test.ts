import { describe, expect, it } from 'vitest';
import { bandLadders } from '../../src/physics/bandLadders';
import { bandLines } from '../../src/physics/bandLines';
import { stateConstantsFrom, type BandModel, type LineList } from '../../src/physics/model';

const PERP: BandModel = {
  shape: 'prolate',
  band: 'perpendicular',
  lower: stateConstantsFrom({ B: 0.3, A: 2.5 }),
  upper: stateConstantsFrom({ origin: 1100, B: 0.298, A: 2.49, zeta: 0.2 }),
  temperatureK: 296,
  jMax: 15,
  kMax: 4,
  spinWeights: [1],
};

/** Reverse a line list so the input is not already in ladder order. */
function reversed(l: LineList): LineList {
  const rev = <T extends { slice(): T; reverse(): T }>(a: T) => a.slice().reverse();
  return {
    count: l.count,
    jUpper: rev(l.jUpper),
    kUpper: rev(l.kUpper),
    jLower: rev(l.jLower),
    kLower: rev(l.kLower),
    deltaK: rev(l.deltaK),
    deltaJ: rev(l.deltaJ),
    wavenumberCm1: rev(l.wavenumberCm1),
    intensity: rev(l.intensity),
    eLowerCm1: rev(l.eLowerCm1),
    honlLondon: rev(l.honlLondon),
  };
}

describe('bandLadders', () => {
  it('returns no ladders for an empty line list', () => {
    const empty = bandLines({ ...PERP, spinWeights: [0] });
    expect(empty.count).toBe(0);
    expect(bandLadders(empty, 'prolate')).toEqual([]);
  });

  it('orders ladders by ΔK (+1, 0, −1), then K″, then P, Q, R, with rungs ascending in J″', () => {
    const lines = reversed(bandLines(PERP));
    const ladders = bandLadders(lines, 'prolate');
    // Perpendicular, kMax = 4: r ladders for K'' = 0..4 (3 each), p ladders for K'' = 1..4 (3 each).
    expect(ladders.length).toBe(5 * 3 + 4 * 3);
    expect(ladders.slice(0, 4).map((l) => l.label)).toEqual(['rP0', 'rQ0', 'rR0', 'rP1']);
    expect(ladders.at(-1)!.label).toBe('pR4');
    for (let i = 1; i < ladders.length; i++) {
      const a = ladders[i - 1];
      const b = ladders[i];
      const order = b.deltaK - a.deltaK || a.kLower - b.kLower || a.deltaJ - b.deltaJ;
      expect(order, `${a.label} before ${b.label}`).toBeLessThan(0);
    }
    let total = 0;
    for (const lad of ladders) {
      total += lad.lineIndex.length;
      expect(lad.key).toBe(`${'pqr'[lad.deltaK + 1]}:${lad.kLower}:${'PQR'[lad.deltaJ + 1]}`);
      for (let r = 0; r < lad.lineIndex.length; r++) {
        const i = lad.lineIndex[r];
        expect([lines.deltaK[i], lines.deltaJ[i], lines.kLower[i]]).toEqual([lad.deltaK, lad.deltaJ, lad.kLower]);
        if (r > 0) expect(lines.jLower[i]).toBeGreaterThan(lines.jLower[lad.lineIndex[r - 1]]);
      }
    }
    expect(total).toBe(lines.count); // every line in exactly one ladder
  });

  it('gives the rQ0 ladder the J″ = 1 … jMax rungs (no Q line from J = 0)', () => {
    const ladders = bandLadders(bandLines(PERP), 'prolate');
    const rq0 = ladders.find((l) => l.label === 'rQ0')!;
    expect(rq0.lineIndex.length).toBe(15);
  });

  it("labels a linear band's ladders by branch only", () => {
    const lin: BandModel = {
      ...PERP,
      shape: 'linear',
      band: 'parallel',
      lower: stateConstantsFrom({ B: 0.39 }),
      upper: stateConstantsFrom({ origin: 2349, B: 0.387 }),
    };
    expect(bandLadders(bandLines(lin), 'linear').map((l) => l.label)).toEqual(['P', 'R']);
  });
});
