import { describe, expect, it } from 'vitest';
import { systemFileFromJson, SystemFileError } from '../../src/io/systemFile';
import { systemFit } from '../../src/fit/systemFit';
import { systemLines } from '../../src/physics/system/systemLines';
import type { SystemFitLine } from '../../src/fit/systemFitTypes';

// Invented constants (cm⁻¹) of the size of PH3's; not a published set.
function file(interactions: unknown, extra: Record<string, unknown> = {}, extra4: Record<string, unknown> = {}) {
  return {
    temperature: 296,
    jMax: 10,
    kMax: 10,
    species: [
      {
        name: 'X',
        shape: 'oblate',
        states: {
          ground: { B: 4.45, C: { value: 3.92, fixed: true } },
          v2: { origin: 992, B: 4.44, C: 3.91, ...extra },
          v4: { origin: 1118, degenerate: true, B: 4.46, C: 3.9, zeta: -0.45, ...extra4 },
        },
        bands: [
          { name: 'nu2', upper: 'v2', lower: 'ground' },
          { name: 'nu4', upper: 'v4', lower: 'ground', strength: 2, momentSign: -1 },
        ],
        interactions,
      },
    ],
  };
}

describe('system file interactions', () => {
  it('reads an interaction: its constants become parameters <name>.<constant>, absent ones 0 and fixed', () => {
    const f = systemFileFromJson(
      file(
        [{ name: 'cor', type: 'coriolis', states: ['v2', 'v4'], constants: { C1: 3.4, C2: { value: 0.02, fixed: true } } }],
        {},
        {
          q22: { value: 0.01, fixed: true },
        },
      ),
    );
    const sp = f.model.species[0];
    expect(sp.interactions).toEqual([
      {
        name: 'cor',
        type: 'coriolis',
        states: ['v2', 'v4'],
        constants: { C1: 3.4, C2: 0.02, C1J: 0, C1K: 0, C2J: 0, C1JJ: 0, C2K: 0, C2JJ: 0, C2JK: 0, C4: 0, C5: 0 },
      },
    ]);
    const byKey = new Map(f.parameters.map((p) => [p.key, p]));
    expect(byKey.get('cor.C1')).toMatchObject({ value: 3.4, status: 'floated', state: 'cor', name: 'C1' });
    expect(byKey.get('cor.C2')?.status).toBe('fixed');
    expect(byKey.get('cor.C1J')?.status).toBe('fixed');
    // A coupled state takes the diagonalising providers' constants (q22 here).
    expect(byKey.get('v4.q22')?.value).toBe(0.01);
    expect(sp.bands[1].momentSign).toBe(-1);
  });

  it('defaults the name to <stateA>_<stateB> and accepts ties between interaction constants', () => {
    const f = systemFileFromJson(
      file([{ type: 'coriolis', states: ['v2', 'v4'], constants: { C1: 3.4, C1J: { same: 'v2_v4.C1K' }, C1K: 1e-4 } }]),
    );
    const p = f.parameters.find((q) => q.key === 'v2_v4.C1J')!;
    expect(p).toMatchObject({ status: 'tied', same: 'v2_v4.C1K', value: 1e-4 });
  });

  it.each([
    [[{ type: 'spin', states: ['v2', 'v4'] }], /interactions\[0\]\.type' .*expected one of "coriolis", "fermi"/],
    [[{ type: 'coriolis', states: ['v2', 'v9'] }], /interactions\[0\]\.states' names the state 'v9'/],
    [[{ type: 'coriolis', states: ['v2', 'v2'] }], /names the state 'v2' twice/],
    [[{ type: 'fermi', states: ['v2', 'v4'] }], /cannot join 'v2' and 'v4': a Fermi resonance joins two states of the same symmetry/],
    [
      [{ type: 'coriolis', states: ['v2', 'v4'], constants: { W: 1 } }],
      /constants\.W' is not a constant of a coriolis interaction .*expected one of C1, C1J, C1K, C2, C2J/,
    ],
    [[{ type: 'coriolis', states: ['v2', 'v4'], constants: { C1: 'big' } }], /constants\.C1' is the string/],
    [[{ name: 'v2', type: 'coriolis', states: ['v2', 'v4'] }], /'v2' is already the name of a state or interaction/],
    [{ type: 'coriolis' }, /interactions' is an object; expected a list/],
  ])('refuses a bad interaction with the field path and what was expected (%#)', (interactions, message) => {
    expect(() => systemFileFromJson(file(interactions))).toThrow(SystemFileError);
    expect(() => systemFileFromJson(file(interactions))).toThrow(message);
  });

  it('allows h3 on a nondegenerate state, which is then diagonalised (A1/A2 tags on its K = 3 pairs)', () => {
    const f = systemFileFromJson(file(undefined, { h3: 1e-6 }));
    const lines = systemLines({ ...f.model, jMax: 6, kMax: 6 });
    const tags = new Set<string>();
    for (let i = 0; i < lines.count; i++) if (lines.bandIndex[i] === 0 && lines.kUpper[i] === 3) tags.add(lines.tagUpper[i]);
    expect(tags).toEqual(new Set(['A1', 'A2']));
  });
});

describe('joint fit with interaction constants', () => {
  const make = () =>
    systemFileFromJson(
      file(
        [{ name: 'cor', type: 'coriolis', states: ['v2', 'v4'], constants: { C1: 3.4, C1J: 0, C2: { value: 0.02, fixed: true } } }],
        {},
        {
          q22: { value: 0.01, fixed: true },
        },
      ),
    );

  function linesFrom(f: ReturnType<typeof make>, keep: (j: number) => boolean): SystemFitLine[] {
    const sim = systemLines(f.model, { minIntensity: 1e-4 });
    const out: SystemFitLine[] = [];
    for (let i = 0; i < sim.count; i++) {
      if (!keep(sim.jUpper[i])) continue;
      out.push({
        speciesIndex: 0,
        band: sim.bandRefs[sim.bandIndex[i]].band,
        jUpper: sim.jUpper[i],
        kUpper: sim.kUpper[i],
        lUpper: sim.lUpper[i] as -1 | 0 | 1,
        tagUpper: sim.tagUpper[i],
        jLower: sim.jLower[i],
        kLower: sim.kLower[i],
        lLower: sim.lLower[i] as -1 | 0 | 1,
        tagLower: sim.tagLower[i],
        observedCm1: sim.wavenumberCm1[i],
        uncertaintyCm1: 1e-3,
      });
    }
    return out;
  }

  it('recovers the interaction constants from noise-free lines of the same model after a start 3 % off', () => {
    const truth = make();
    const lines = linesFrom(truth, () => true);
    const start = make();
    for (const p of start.parameters) if (p.key === 'cor.C1' || p.key === 'v4.zeta') p.value *= 1.03;
    const out = systemFit({ model: start.model, parameters: start.parameters, lines });
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    // Noise-free lines: the constants come back to round-off (1e-7 relative).
    expect(out.result.parameters['cor.C1'].value).toBeCloseTo(3.4, 6);
    expect(out.result.parameters['v4.zeta'].value).toBeCloseTo(-0.45, 7);
    expect(out.result.rmsCm1).toBeLessThan(1e-6);
  });

  it('names the interaction constants the rank test cannot separate (C1 and C1J from lines of one J)', () => {
    const f = make();
    const lines = linesFrom(f, (j) => j === 5);
    const out = systemFit({ model: f.model, parameters: f.parameters, lines });
    expect(out.ok).toBe(false);
    if (out.ok) return;
    expect(out.error.parameters).toEqual(expect.arrayContaining(['cor.C1', 'cor.C1J']));
  });
});
