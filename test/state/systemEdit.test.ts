/**
 * Adding an isotopologue and a hot band to a system (the model panel's tree), and writing an edited
 * single-band view back into the system. Numbers are checked against the formulas the notes state.
 */
import { describe, expect, it } from 'vitest';
import { demoSystemTruth } from '../../src/cli/makeDemoSystem';
import { systemApplyView, systemBandEntries, systemBandView } from '../../src/state/systemBands';
import { isotopologueFactorDefault, systemAddHotBand, systemAddIsotopologue } from '../../src/state/systemEdit';
import { systemLines } from '../../src/physics/system/systemLines';

describe('system edits', () => {
  it('adds an isotopologue with B scaled by m/m′, origins by √(m/m′), A kept, and floats what the parent floats', () => {
    const sys = demoSystemTruth();
    const f = isotopologueFactorDefault(64, 68);
    expect(f).toBeCloseTo(64 / 68, 15);
    const r = systemAddIsotopologue(sys, ['LB-7/v4.B'], {
      parentIndex: 0,
      name: 'LB-7-68',
      massAmu: 68,
      abundance: 0.05,
      rotationalFactor: f,
      isUniqueScaled: false,
    });
    const iso = r.system.species[2];
    const v4 = iso.states.find((s) => s.name === 'v4')!.constants;
    // Formulas of the note: B × f, origin × √f, A unchanged, D × f².
    expect(v4.B).toBeCloseTo(0.29068 * f, 12);
    expect(v4.origin).toBeCloseTo(1148.6431 * Math.sqrt(f), 9);
    expect(v4.A).toBe(3.3951);
    expect(v4.DJ).toBeCloseTo(2.58e-7 * f * f, 18);
    expect(r.floated).toContain('LB-7-68/v4.B');
    expect(r.note).toMatch(/estimates to refine/);
    // Its lines sit below the parent's (heavier: smaller B, lower origin) and carry its abundance.
    const lines = systemLines(r.system);
    expect(lines.bandRefs.filter((b) => b.species === 'LB-7-68').length).toBe(2);
    expect(() =>
      systemAddIsotopologue(sys, [], {
        parentIndex: 0,
        name: 'LB 7',
        massAmu: 68,
        abundance: 1,
        rotationalFactor: 1,
        isUniqueScaled: false,
      }),
    ).toThrow(/cannot be used/);
  });

  it('adds a hot band v+v′ ← v with the sum rule and additive α, and refuses one between two degenerate states', () => {
    const sys = demoSystemTruth();
    sys.species[1].states.push({ name: 'v3', isDegenerate: false, constants: { origin: 530, B: 0.2835, A: 3.41 } });
    const r = systemAddHotBand(sys, [], { speciesIndex: 1, lower: 'v3', fundamental: 'nu4', name: 'hot' });
    const st = r.system.species[1].states.find((s) => s.name === 'v3+v4')!;
    // Herzberg II (1945): G(v3+v4) = G(v3) + G(v4) (harmonic), B = B(v3) + B(v4) − B(0) (additive α).
    expect(st.constants.origin).toBeCloseTo(530 + 1139.2876, 9);
    expect(st.constants.B).toBeCloseTo(0.2835 + 0.28194 - 0.28302, 12);
    expect(st.isDegenerate).toBe(true);
    expect(r.floated).toEqual(['LB-7-66/v3+v4.origin', 'LB-7-66/v3+v4.B', 'LB-7-66/v3+v4.A', 'LB-7-66/v3+v4.zeta']);
    // The new band has a single-band view: origin G′ − G″ = G(v4).
    expect(systemBandView(r.system, 1, 'hot').view!.upper.origin).toBeCloseTo(1139.2876, 9);
    expect(() => systemAddHotBand(demoSystemTruth(), [], { speciesIndex: 0, lower: 'v4', fundamental: 'nu4', name: 'h2' })).toThrow(
      /degenerate/,
    );
    expect(() => systemAddHotBand(demoSystemTruth(), [], { speciesIndex: 0, lower: 'ground', fundamental: 'nu4', name: 'h3' })).toThrow(
      /lowest state/,
    );
  });

  it('writes an edited view back into the shared states: the band origin goes to G′ = ν₀ + G″', () => {
    const sys = demoSystemTruth();
    const hot = systemBandEntries(sys).find((e) => e.key === 'LB-7/hot')!;
    const view = { ...hot.view!, upper: { ...hot.view!.upper, origin: 1146 } };
    const r = systemApplyView(sys, [], {}, hot, view, ['upper.origin']);
    const up = r.system.species[0].states.find((s) => s.name === 'v3v4')!;
    expect(up.constants.origin).toBeCloseTo(1146 + 540.213, 9);
    expect(r.floated).toEqual(['LB-7/v3v4.origin']);
  });
});
