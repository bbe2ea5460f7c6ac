/**
 * The system file's keys for the higher-order terms of a coupled group (eps in a nondegenerate state;
 * C2JJ, C2JK, C4, C5 of an A1 ↔ E Coriolis coupling): read as parameters where they act, refused with
 * the field's path and the reason where they do not.
 */
import { describe, expect, it } from 'vitest';
import { systemFileFromJson, SystemFileError } from '../../src/io/systemFile';

// Invented constants (cm⁻¹) of the size of PH3's; not a published set.
function file(v2: Record<string, unknown>, interactions: unknown, ground: Record<string, unknown> = {}) {
  return {
    temperature: 296,
    jMax: 10,
    kMax: 10,
    species: [
      {
        name: 'X',
        shape: 'oblate',
        states: {
          ground: { B: 4.45, C: { value: 3.92, fixed: true }, ...ground },
          v2: { origin: 992, B: 4.44, C: 3.91, ...v2 },
          v4: { origin: 1118, degenerate: true, B: 4.46, C: 3.9, zeta: -0.45 },
        },
        bands: [
          { name: 'nu2', upper: 'v2', lower: 'ground' },
          { name: 'nu4', upper: 'v4', lower: 'ground' },
        ],
        ...(interactions === undefined ? {} : { interactions }),
      },
    ],
  };
}

const coriolis = [
  { name: 'c', type: 'coriolis', states: ['v2', 'v4'], constants: { C1: 3.4, C4: -2e-5, C5: { value: 3e-7, fixed: true } } },
];

describe('system file: higher-order terms of a coupled group', () => {
  it('reads eps of a coupled state and C2JJ, C2JK, C4, C5 of the coupling as parameters (absent ones 0 and fixed)', () => {
    const f = systemFileFromJson(file({ eps: 1.3e-5, h3: 4e-9 }, coriolis, { h3: 1.4e-9, eps: { value: 0, fixed: true } }));
    const byKey = new Map(f.parameters.map((p) => [p.key, p]));
    expect(byKey.get('v2.eps')).toMatchObject({ value: 1.3e-5, status: 'floated' });
    expect(byKey.get('ground.eps')?.status).toBe('fixed');
    expect(byKey.get('c.C4')).toMatchObject({ value: -2e-5, status: 'floated' });
    expect(byKey.get('c.C5')).toMatchObject({ value: 3e-7, status: 'fixed' });
    expect(byKey.get('c.C2JJ')).toMatchObject({ value: 0, status: 'fixed' });
    expect(byKey.get('c.C2JK')).toMatchObject({ value: 0, status: 'fixed' });
  });

  it.each([
    // eps on a state no interaction names and without h3: the state is not diagonalised.
    [
      file({}, coriolis, { eps: 1e-6 }),
      /states\.ground\.eps' is not a constant of a nondegenerate state .*name the state in one of the species' "interactions", or give it h3/,
    ],
    // eps belongs to nondegenerate states.
    [
      {
        ...file({}, coriolis),
        species: [
          {
            ...file({}, coriolis).species[0],
            states: { ...file({}, coriolis).species[0].states, v4: { origin: 1118, degenerate: true, B: 4.46, C: 3.9, eps: 1e-6 } },
          },
        ],
      },
      /states\.v4\.eps' is not a constant of a degenerate state/,
    ],
    // C4 belongs to the A1 ↔ E Coriolis coupling, not to a Fermi resonance.
    [
      {
        ...file({}, undefined),
        species: [
          {
            ...file({}, undefined).species[0],
            states: { ground: { B: 4.45, C: 3.92 }, v2: { origin: 992, B: 4.44, C: 3.91 }, v3: { origin: 980, B: 4.44, C: 3.91 } },
            bands: [{ name: 'nu2', upper: 'v2', lower: 'ground' }],
            interactions: [{ type: 'fermi', states: ['v2', 'v3'], constants: { C4: 1e-5 } }],
          },
        ],
      },
      /interactions\[0\]\.constants\.C4' is not a constant of a fermi interaction .*expected one of W, WJ, WK/,
    ],
  ])('refuses a higher-order key where it does not act, with the field path and the reason (%#)', (json, message) => {
    expect(() => systemFileFromJson(json)).toThrow(SystemFileError);
    expect(() => systemFileFromJson(json)).toThrow(message);
  });
});
