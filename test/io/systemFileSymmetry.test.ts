import { describe, expect, it } from 'vitest';
import { systemFileFromJson } from '../../src/io/systemFile';

/** A one-band system of an invented C3v or D3h top; `species` and `upper` fields are merged in. */
function file(species: Record<string, unknown>, upper: Record<string, unknown> = {}, lower: Record<string, unknown> = {}) {
  return {
    temperature: 296,
    jMax: 10,
    kMax: 5,
    species: [
      {
        name: 'X',
        shape: 'prolate',
        ...species,
        states: {
          ground: { B: 0.44, A: 5.1, ...lower },
          v4: { origin: 1000, degenerate: true, B: 0.44, A: 5.1, zeta: 0.3, ...upper },
        },
        bands: [{ name: 'nu4', upper: 'v4', lower: 'ground' }],
      },
    ],
  };
}

const refusal = (json: unknown): string => {
  try {
    systemFileFromJson(json);
  } catch (err) {
    return (err as Error).message;
  }
  return 'accepted';
};

describe('system file: point group, spin weights by species and the Hamiltonian state keys', () => {
  it('reads pointGroup, spinWeightsBySymmetry and the E-state keys into the model and the fit parameters', () => {
    const f = systemFileFromJson(
      file(
        { pointGroup: 'C3v', spinWeightsBySymmetry: { A1: 4, A2: 4, E: 2 } },
        { q22: 3e-4, q12: { value: 1e-4, fixed: true }, etaJ: 1e-6 },
      ),
    );
    const sp = f.model.species[0];
    expect(sp.pointGroup).toBe('C3v');
    expect(sp.spinWeightsBySymmetry).toEqual({ A1: 4, A2: 4, E: 2 });
    const v4 = sp.states.find((s) => s.name === 'v4')!;
    expect(v4.symmetry).toEqual({ pointGroup: 'C3v', vibSpecies: 'E', isInversionDoubled: false });
    expect(v4.constants.q22).toBe(3e-4);
    const status = Object.fromEntries(f.parameters.map((p) => [p.key, p.status]));
    expect(status['v4.q22']).toBe('floated');
    expect(status['v4.q12']).toBe('fixed');
    expect(status['v4.etaK']).toBe('fixed');
    expect(status['ground.LJ']).toBe('fixed');
  });

  it('refuses q12 in D3h, naming the path and the reason', () => {
    expect(refusal(file({ pointGroup: 'D3h' }, { q12: 1e-4 }))).toMatch(
      /^system file: field 'species\[0\]\.states\.v4\.q12' is not allowed in point group D3h: .*horizontal mirror plane/,
    );
  });

  it('refuses Hamiltonian-only keys without a point group, and says what to add', () => {
    expect(refusal(file({}, { q22: 1e-4 }))).toMatch(/'species\[0\]\.states\.v4\.q22' .*add "pointGroup": "C3v" or "D3h" to species\[0\]/);
    expect(refusal(file({}, {}, { inv: 0.79 }))).toMatch(/'species\[0\]\.states\.ground\.inv' .*pointGroup/);
  });

  it('refuses inversion constants in C3v and in a degenerate state', () => {
    expect(refusal(file({ pointGroup: 'C3v' }, {}, { inv: 0.79 }))).toMatch(
      /'species\[0\]\.states\.ground\.inv' makes the state inversion-doubled, which needs "pointGroup": "D3h"/,
    );
    expect(refusal(file({ pointGroup: 'D3h' }, { inv: 1 }))).toMatch(/'species\[0\]\.states\.v4\.inv' is an inversion constant/);
  });

  it('refuses a vibrational species that does not fit the state, spin tables that are incomplete or misplaced', () => {
    expect(refusal(file({ pointGroup: 'D3h' }, { symmetry: 'E' }))).toMatch(/'species\[0\]\.states\.v4\.symmetry' .*one of "E'", "E''"/);
    expect(refusal(file({ pointGroup: 'C3v' }, {}, { symmetry: 'E' }))).toMatch(/needs "degenerate": true/);
    expect(refusal(file({ pointGroup: 'C3v', spinWeightsBySymmetry: { A1: 4, E: 2 } }))).toMatch(
      /'species\[0\]\.spinWeightsBySymmetry' is not usable: no weight for A2 of C3v/,
    );
    expect(refusal(file({ spinWeightsBySymmetry: { A1: 4, A2: 4, E: 2 } }))).toMatch(/needs the species' "pointGroup"/);
    expect(refusal(file({ pointGroup: 'C3v', spinWeights: [4, 2, 2], spinWeightsBySymmetry: { A1: 4, A2: 4, E: 2 } }))).toMatch(
      /give one of them/,
    );
    expect(refusal(file({ pointGroup: 'C4v' }))).toMatch(/'species\[0\]\.pointGroup' is the string "C4v"; expected one of "C3v", "D3h"/);
  });
});

describe('modelFileParse (closed-form single-band model) and the system-only keys', () => {
  it('refuses them in words, naming the commands that read such a file', async () => {
    const { modelFileFromJson } = await import('../../src/io/modelFile');
    const base = {
      shape: 'prolate',
      band: 'perpendicular',
      lower: { B: 0.34, A: 2.8 },
      upper: { origin: 1000, B: 0.34, A: 2.8, zeta: 0.2 },
      temperature: 296,
      jMax: 10,
      kMax: 5,
    };
    const msg = (json: unknown) => {
      try {
        modelFileFromJson(json);
      } catch (err) {
        return (err as Error).message;
      }
      return 'accepted';
    };
    expect(msg({ ...base, pointGroup: 'C3v' })).toMatch(/field 'pointGroup' declares symmetry; .*simulate, spectrum, fit and combdiff/);
    expect(msg({ ...base, upper: { ...base.upper, q22: 1e-4 } })).toMatch(/field 'upper\.q22' is a constant only the system engine holds/);
    expect(msg(base)).toBe('accepted');
  });
});
