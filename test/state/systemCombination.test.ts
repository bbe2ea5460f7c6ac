/**
 * Combination differences in a several-band session: the state is differenced from every band of
 * its species that reaches it, each pair names its band, and other species' lines never enter.
 * The system is the invented demo truth (src/cli/makeDemoSystem.ts) with an extra invented
 * parallel band ν3 ← ground, so that two bands share the ground state.
 */
import { beforeEach, describe, expect, it } from 'vitest';
import type { Assignment } from '../../src/fit/assignment';
import { demoSystemTruth, DEMO_SYSTEM_FLOATED } from '../../src/cli/makeDemoSystem';
import { systemLines } from '../../src/physics/system/systemLines';
import type { SystemModel } from '../../src/physics/system/systemModel';
import { bandActivate, systemLoad } from '../../src/state/actionsSystem';
import { benchStore } from '../../src/state/store';
import { systemCombinationOf } from '../../src/state/systemCombination';

beforeEach(() => {
  benchStore.setState(benchStore.getInitialState(), true);
});

/** The demo truth plus ν3 (v3 ← ground) of LB-7. */
function truthWithNu3(): SystemModel {
  const t = demoSystemTruth();
  return {
    ...t,
    species: t.species.map((sp, i) =>
      i === 0 ? { ...sp, bands: [...sp.bands, { name: 'nu3', upper: 'v3', lower: 'ground', strength: 0.5 }] } : sp,
    ),
  };
}

/** Exact positions of every line with J″ ≤ 12, K″ ≤ 3 of the system (all bands, both species). */
function exactRows(system: SystemModel): Assignment[] {
  const lines = systemLines(system, { minIntensity: 0 });
  const rows: Assignment[] = [];
  for (let i = 0; i < lines.count; i++) {
    if (lines.jLower[i] > 12 || lines.kLower[i] > 3) continue;
    const ref = lines.bandRefs[lines.bandIndex[i]];
    rows.push({
      id: `r${i}`,
      jUpper: lines.jUpper[i],
      kUpper: lines.kUpper[i],
      jLower: lines.jLower[i],
      kLower: lines.kLower[i],
      observedCm1: lines.wavenumberCm1[i],
      uncertaintyCm1: 0.0005,
      isBlended: false,
      isExcluded: false,
      note: '',
      band: ref.band,
      species: ref.species,
    });
  }
  return rows;
}

describe('combination differences of a several-band session', () => {
  it('is null in a single-band session', () => {
    expect(systemCombinationOf(benchStore.getState(), 'lower')).toBeNull();
  });

  it('differences the ground state from both bands that leave it, names the band of each pair, and leaves the isotopologue out', () => {
    const system = truthWithNu3();
    expect(systemLoad({ system, floated: DEMO_SYSTEM_FLOATED, name: 'test' }, 'load')).toBe(true);
    benchStore.setState({ assignments: exactRows(system) });
    const cd = systemCombinationOf(benchStore.getState(), 'lower')!;
    expect(cd.species).toBe('LB-7');
    expect(cd.state).toBe('ground');
    expect(cd.bands).toEqual(['nu4', 'nu3']);
    expect(cd.outcome.ok).toBe(true);
    if (!cd.outcome.ok) return;
    const byBand = new Set(cd.outcome.result.pairs.map((p) => p.band));
    expect(byBand).toEqual(new Set(['nu4', 'nu3']));
    // Only LB-7's nu4 and nu3 rows entered (the isotopologue's nu4 has the same band name).
    const ids = new Set(cd.assignmentIds);
    for (const a of benchStore.getState().assignments) if (ids.has(a.id)) expect(a.species === 'LB-7' && a.band !== 'hot').toBe(true);
    // Exact positions: the differences are the model's own, so B″ comes back to round-off
    // (1e-9 cm^-1: differences of ~10 cm^-1 computed in double precision).
    const b = cd.outcome.result.parameters['LB-7/ground.B'];
    expect(Math.abs(b.value - system.species[0].states.find((s) => s.name === 'ground')!.constants.B!)).toBeLessThan(1e-9);
  });

  it('follows the active band: the hot band differences v3 from its own lines only', () => {
    const system = truthWithNu3();
    systemLoad({ system, floated: DEMO_SYSTEM_FLOATED, name: 'test' }, 'load');
    benchStore.setState({ assignments: exactRows(system) });
    bandActivate('LB-7/hot');
    const cd = systemCombinationOf(benchStore.getState(), 'lower')!;
    expect(cd.state).toBe('v3');
    // v3 is the upper state of nu3 and the lower state of the hot band: both difference it.
    expect(cd.bands).toEqual(['hot', 'nu3']);
    expect(cd.outcome.ok).toBe(true);
    if (cd.outcome.ok) expect(new Set(cd.outcome.result.pairs.map((p) => p.band))).toEqual(new Set(['hot', 'nu3']));
  });
});
