/**
 * The page's view of a system with a point group and an interaction: every constant the states and
 * the coupling use is a fit parameter with the file's status, fitted values go back into states
 * and interactions, and assignments keep the A1/A2 tags the joint fit needs.
 */
import { describe, expect, it } from 'vitest';
import { systemFileParse } from '../../src/io/systemFile';
import { systemLines } from '../../src/physics/system/systemLines';
import { systemInteractionConstantNames, systemParameters, systemStateConstantNames, systemValueOf } from '../../src/state/systemBands';
import { systemFitInputOf, systemWithFitted } from '../../src/state/systemFitInput';
import type { Assignment } from '../../src/fit/assignment';

// Invented C3v top: ground with h3 (K = 3 A1/A2 split), E state with q22, A1 state Coriolis-coupled to it.
const FILE = {
  temperature: 200,
  jMax: 20,
  kMax: 6,
  species: [
    {
      name: 'X',
      shape: 'prolate',
      pointGroup: 'C3v',
      spinWeightsBySymmetry: { A1: 4, A2: 4, E: 2 },
      states: {
        ground: { B: 0.2512, A: { value: 5.21, fixed: true }, DJ: 2.1e-7, h3: { value: 4e-8, fixed: true } },
        v3: { origin: 1021.35, B: 0.2497, A: { value: 5.19, fixed: true } },
        v4: { origin: 1052.72, degenerate: true, B: 0.2503, A: 5.18, zeta: 0.071, q22: 3.5e-4 },
      },
      bands: [
        { name: 'nu4', upper: 'v4', lower: 'ground' },
        { name: 'nu3', upper: 'v3', lower: 'ground' },
      ],
      interactions: [{ name: 'v3v4', type: 'coriolis', states: ['v3', 'v4'], constants: { C1: 0.12, C1J: { value: 0, fixed: true } } }],
    },
  ],
};

describe('systemParameters with symmetry keys and interactions', () => {
  const file = systemFileParse(JSON.stringify(FILE));
  const floated = file.parameters.filter((p) => p.status === 'floated').map((p) => p.key);

  it('lists the same keys with the same status as the system file', () => {
    const page = systemParameters(file.model, floated, {});
    const byKey = (list: { key: string; status: string }[]) => Object.fromEntries(list.map((p) => [p.key, p.status]));
    expect(byKey(page)).toEqual(byKey(file.parameters));
    expect(byKey(page)['v4.q22']).toBe('floated');
    expect(byKey(page)['v3v4.C1']).toBe('floated');
    expect(byKey(page)['ground.h3']).toBe('fixed');
  });

  it('names the constants each state and the coupling use', () => {
    const sp = file.model.species[0];
    expect(
      systemStateConstantNames(
        sp,
        sp.states.find((s) => s.name === 'v4')!,
      ),
    ).toContain('q22');
    expect(
      systemStateConstantNames(
        sp,
        sp.states.find((s) => s.name === 'ground')!,
      ),
    ).toContain('h3');
    expect(
      systemStateConstantNames(
        sp,
        sp.states.find((s) => s.name === 'ground')!,
      ),
    ).not.toContain('origin');
    expect(systemInteractionConstantNames(sp, sp.interactions![0])).toEqual([
      'C1',
      'C1J',
      'C1K',
      'C2',
      'C2J',
      'C1JJ',
      'C2K',
      'C2JJ',
      'C2JK',
      'C4',
      'C5',
    ]);
    expect(systemValueOf(file.model, 'v3v4.C1')).toBe(0.12);
  });

  it('writes fitted values into states and interactions, leaving fixed ones', () => {
    const next = systemWithFitted(
      file.model,
      floated,
      {},
      {
        'v3v4.C1': { value: 0.125, fixed: false },
        'v4.q22': { value: 3.6e-4, fixed: false },
        'ground.h3': { value: 9, fixed: true },
      },
    );
    expect(systemValueOf(next, 'v3v4.C1')).toBe(0.125);
    expect(systemValueOf(next, 'v4.q22')).toBe(3.6e-4);
    expect(systemValueOf(next, 'ground.h3')).toBe(4e-8);
    // The input is not changed in place.
    expect(systemValueOf(file.model, 'v3v4.C1')).toBe(0.12);
  });

  it('sends the tags an assignment keeps, so the two members of a split K = 3 pair are two lines', () => {
    const lines = systemLines(file.model, { minIntensity: 0 });
    const pair: Assignment[] = [];
    for (let i = 0; i < lines.count && pair.length < 2; i++)
      if (
        lines.bandRefs[lines.bandIndex[i]].band === 'nu4' &&
        lines.kLower[i] === 3 &&
        lines.jLower[i] === 8 &&
        lines.jUpper[i] === 8 &&
        lines.kUpper[i] === 2
      )
        pair.push({
          id: `a${i}`,
          jUpper: 8,
          kUpper: 2,
          jLower: 8,
          kLower: 3,
          observedCm1: lines.wavenumberCm1[i],
          uncertaintyCm1: 0.001,
          isBlended: false,
          isExcluded: false,
          note: '',
          band: 'nu4',
          species: 'X',
          tagUpper: lines.tagUpper[i],
          tagLower: lines.tagLower[i],
        });
    expect(pair.map((a) => a.tagLower).sort()).toEqual(['A1', 'A2']);
    const base = { system: file.model, systemFloated: floated, systemTies: {}, activeBandKey: 'X/nu4' };
    const r = systemFitInputOf({ ...base, assignments: pair });
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.input.lines.map((l) => l.tagLower)).toEqual(pair.map((a) => a.tagLower));
    // Without the tags J and K leave the choice open, and the page says so instead of guessing.
    const untagged = systemFitInputOf({ ...base, assignments: pair.map(({ tagUpper: _u, tagLower: _l, ...a }) => a) });
    expect(untagged.ok).toBe(false);
    if (!untagged.ok) expect(untagged.message).toContain('tag_lo');
  });
});
