import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { modelFileParse } from '../../src/io/modelFile';
import { systemFileFromModelFile, systemFileParse, SystemFileError } from '../../src/io/systemFile';
import { MHZ_PER_CM1 } from '../../src/physics/constants';
import { fitParameterKeys } from '../../src/fit/bandDesign';

const ISSUE_EXAMPLE = {
  temperature: 296,
  jMax: 60,
  kMax: 20,
  species: [
    {
      name: 'HCN',
      shape: 'linear',
      mass: 27.0,
      abundance: 1.0,
      spinWeights: [1],
      states: { ground: { B: 1.4782, DJ: 2.9e-6 }, v2: { origin: 712.0, degenerate: true, B: 1.4817, DJ: 2.9e-6, q: -0.0075 } },
      bands: [{ name: 'nu2', upper: 'v2', lower: 'ground', strength: 1.0 }],
    },
  ],
};

const parse = (json: unknown) => systemFileParse(JSON.stringify(json));
const message = (json: unknown): string => {
  try {
    parse(json);
  } catch (err) {
    expect(err).toBeInstanceOf(SystemFileError);
    return (err as Error).message;
  }
  throw new Error('expected a SystemFileError');
};
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- test edits of free-form JSON
type Json = any;
const withSpecies = (patch: (s: Json) => void) => {
  const json = structuredClone(ISSUE_EXAMPLE) as Json;
  patch(json.species[0]);
  return json;
};

describe('systemFileParse', () => {
  it('reads the form given in the issue: keys <state>.<constant> with one species', () => {
    const f = parse(ISSUE_EXAMPLE);
    expect(f.model.species[0].states.map((s) => s.name)).toEqual(['ground', 'v2']);
    expect(f.model.species[0].states[1].isDegenerate).toBe(true);
    const floated = f.parameters.filter((p) => p.status === 'floated').map((p) => p.key);
    expect(floated).toEqual(['ground.B', 'ground.DJ', 'v2.origin', 'v2.B', 'v2.DJ', 'v2.q']);
    // Absent constants are 0 and fixed, but listed; the lowest state has no origin.
    expect(f.parameters.find((p) => p.key === 'v2.qJ')).toMatchObject({ value: 0, status: 'fixed' });
    expect(f.parameters.some((p) => p.key === 'ground.origin')).toBe(false);
  });

  it('keys constants <species>/<state>.<constant> with several species, and ties across species', () => {
    const json = structuredClone(ISSUE_EXAMPLE) as Json;
    json.species.push({ ...structuredClone(json.species[0]), name: 'H13CN', abundance: 0.011 });
    json.species[1].states.ground.DJ = { same: 'HCN/ground.DJ' };
    json.species[1].states.v2.DJ = { same: 'ground.DJ' };
    const f = parse(json);
    expect(f.parameters.map((p) => p.key)).toContain('H13CN/v2.B');
    expect(f.parameters.find((p) => p.key === 'H13CN/ground.DJ')).toMatchObject({ status: 'tied', same: 'HCN/ground.DJ', value: 2.9e-6 });
    // Without a species prefix a tie stays within its species; the chain then leads to HCN's constant.
    expect(f.parameters.find((p) => p.key === 'H13CN/v2.DJ')).toMatchObject({ status: 'tied', same: 'HCN/ground.DJ' });
  });

  it('resolves chains of ties and refuses a circle, naming the field', () => {
    const chain = parse(
      withSpecies((s) => {
        s.states.v2.DJ = { same: 'ground.DJ' };
        s.states.v2.B = { same: 'v2.DJ' };
      }),
    );
    expect(chain.parameters.find((p) => p.key === 'v2.B')).toMatchObject({ status: 'tied', same: 'ground.DJ', value: 2.9e-6 });
    const m = message(
      withSpecies((s) => {
        s.states.ground.DJ = { same: 'v2.DJ' };
        s.states.v2.DJ = { same: 'ground.DJ' };
      }),
    );
    expect(m).toMatch(/field 'species\[0\]\.states\.ground\.DJ' ties in a circle/);
  });

  it('converts constants given in MHz with c (CODATA, exact)', () => {
    const f = parse(withSpecies((s) => (s.states.ground.B = { value: 44316.0, unit: 'MHz' })));
    // Ref: c = 299 792 458 m/s exactly (CODATA 2018), so 1 cm^-1 = 29 979.2458 MHz.
    expect(f.model.species[0].states[0].constants.B).toBe(44316.0 / 29979.2458);
    expect(MHZ_PER_CM1).toBe(29979.2458);
  });

  it('names the JSON path of each kind of mistake', () => {
    expect(message({ ...ISSUE_EXAMPLE, temperature: -3 })).toMatch(/field 'temperature' is number -3; expected a temperature in K/);
    expect(message(withSpecies((s) => (s.shape = 'spherical')))).toMatch(
      /field 'species\[0\]\.shape' is the string "spherical"; expected one of/,
    );
    expect(message(withSpecies((s) => (s.states.ground.zeta = 0.2)))).toMatch(
      /field 'species\[0\]\.states\.ground\.zeta' is not a constant of a nondegenerate state.*add "degenerate": true/,
    );
    expect(message(withSpecies((s) => (s.states.v2.B = 'big')))).toMatch(/field 'species\[0\]\.states\.v2\.B' is the string "big"/);
    expect(message(withSpecies((s) => (s.bands[0].upper = 'v9')))).toMatch(
      /field 'species\[0\]\.bands\[0\]\.upper' names the state the string "v9"/,
    );
    expect(message(withSpecies((s) => (s.states.v2.DJ = { same: 'v7.DJ' })))).toMatch(
      /field 'species\[0\]\.states\.v2\.DJ' ties to 'v7\.DJ', which is no constant/,
    );
    expect(message(withSpecies((s) => delete s.states.v2.origin))).toMatch(/only the lowest state of a species may leave out/);
    expect(message({ ...ISSUE_EXAMPLE, extra: 1 })).toMatch(/field '\(top level\)' has no field 'extra'/);
    expect(message(withSpecies((s) => (s.states['v.2'] = { origin: 1 })))).toMatch(/state name that cannot be used in fit keys/);
    const prolate = withSpecies((s) => (s.shape = 'prolate'));
    delete prolate.kMax;
    expect(message(prolate)).toMatch(/field 'kMax' is missing/);
    expect(() => systemFileParse('{"species": [')).toThrow(/not valid JSON/);
  });
});

describe('systemFileFromModelFile', () => {
  it('reads a single-band model file as one species with states lower and upper and the old fit keys', () => {
    const text = readFileSync(new URL('../fixtures/models/perpendicular-prolate.json', import.meta.url), 'utf8');
    const model = modelFileParse(text);
    const system = systemFileFromModelFile(model);
    expect(system.parameters.map((p) => p.key)).toEqual(fitParameterKeys('prolate'));
    expect(
      system.parameters
        .filter((p) => p.status === 'floated')
        .map((p) => p.key)
        .sort(),
    ).toEqual([...model.floated].sort());
    expect(system.model.species[0].states.map((s) => [s.name, s.isDegenerate])).toEqual([
      ['lower', false],
      ['upper', true],
    ]);
  });
});
