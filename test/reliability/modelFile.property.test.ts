/**
 * Property tests of modelFileParse: for any text it returns a usable model or throws ModelFileError
 * (never another error, never hangs) whose message is one line naming the field path or the JSON line;
 * and serialise → parse returns random valid models exactly.
 */
import { readFileSync, readdirSync } from 'node:fs';
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { INPUT_LIMITS } from '../../src/io/inputLimits';
import { modelAllowedParameters, modelFileParse, modelFileSerialize, ModelFileError, type ModelFile } from '../../src/io/modelFile';
import { PARAMETER_NAMES, stateConstantsZero, type BandModel, type TopShape } from '../../src/physics/model';
import {
  HANG_LIMIT_MS,
  bytesTextArb,
  countInput,
  countsPrint,
  expectGoodMessage,
  mutationArb,
  randomTextArb,
  timed,
} from './reliabilityHarness';

afterAll(() => countsPrint('modelFile.property.test.ts'));

const MODEL_DIRS = [
  new URL('../fixtures/models/', import.meta.url),
  new URL('../fixtures/lines/fictitious-perpendicular/', import.meta.url),
];
const FIXTURES = MODEL_DIRS.flatMap((dir) =>
  readdirSync(dir)
    .filter((f) => f.endsWith('.json') && f !== 'truth.json')
    .map((f) => readFileSync(new URL(f, dir), 'utf8')),
);

/** Parse with the hang guard; check the invariants of either outcome. */
function parseChecked(text: string): ModelFile | ModelFileError {
  countInput('modelFileParse');
  const run = timed(() => modelFileParse(text));
  expect(run.ms, 'one parse call').toBeLessThan(HANG_LIMIT_MS);
  if (!run.ok) {
    if (!(run.error instanceof ModelFileError)) throw new Error(`modelFileParse threw a ${String(run.error)}`);
    const m = run.error.message;
    expectGoodMessage(m, { prefix: 'model file' });
    // Names where: a field path in quotes, or the line of a JSON syntax error, or the top level.
    expect(m, m).toMatch(/field '[^']*'|line \d+|at top level|limit|not text/);
    return run.error;
  }
  const { model } = run.value;
  expect(['prolate', 'oblate', 'linear']).toContain(model.shape);
  expect(['parallel', 'perpendicular']).toContain(model.band);
  for (const side of ['lower', 'upper'] as const)
    for (const name of PARAMETER_NAMES) expect(Number.isFinite(model[side][name]), `${side}.${name}`).toBe(true);
  expect(model.temperatureK).toBeGreaterThan(0);
  expect(Number.isFinite(model.temperatureK)).toBe(true);
  expect(Number.isInteger(model.jMax) && model.jMax >= 0 && model.jMax <= INPUT_LIMITS.maxModelJ).toBe(true);
  expect(Number.isInteger(model.kMax) && model.kMax >= 0 && model.kMax <= INPUT_LIMITS.maxModelK).toBe(true);
  expect(model.spinWeights.length).toBeGreaterThanOrEqual(1);
  expect(model.spinWeights.length).toBeLessThanOrEqual(INPUT_LIMITS.maxSpinWeights);
  for (const w of model.spinWeights) expect(Number.isFinite(w) && w >= 0).toBe(true);
  return run.value;
}

/** Finite doubles over the whole exponent range, without −0 (JSON.stringify writes −0 as 0). */
const constantValue = fc
  .oneof(
    fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e4, max: 1e4 }),
    fc.double({ noNaN: true, noDefaultInfinity: true }),
    fc.constantFrom(5e-324, -5e-324, 1.7976931348623157e308, 1e-300, 0.1 + 0.2),
  )
  .map((v) => (Object.is(v, -0) ? 0 : v));

/** A random valid model with its fit flags, as modelFileParse would return it. */
const modelFileArb: fc.Arbitrary<Pick<ModelFile, 'model' | 'floated' | 'massAmu' | 'name'>> = fc
  .record({
    shape: fc.constantFrom<TopShape>('prolate', 'oblate', 'linear'),
    band: fc.constantFrom('parallel' as const, 'perpendicular' as const),
    values: fc.array(fc.tuple(constantValue, fc.constantFrom('floated', 'fixed', 'absent')), { minLength: 24, maxLength: 24 }),
    temperatureK: fc.double({ min: 1e-3, max: 1e5, noNaN: true }),
    jMax: fc.integer({ min: 0, max: INPUT_LIMITS.maxModelJ }),
    kMax: fc.integer({ min: 0, max: INPUT_LIMITS.maxModelK }),
    spinWeights: fc.array(
      fc.double({ min: 0, max: 1e6, noNaN: true }).map((w) => (Object.is(w, -0) ? 0 : w)),
      { minLength: 1, maxLength: 8 },
    ),
    massAmu: fc.option(fc.double({ min: 1e-3, max: 1e6, noNaN: true }), { nil: undefined }),
    name: fc.option(
      fc.string({ minLength: 1, maxLength: 200, unit: 'grapheme-composite' }).filter((s) => s.length <= 200),
      { nil: undefined },
    ),
  })
  .map((g) => {
    const model: BandModel = {
      shape: g.shape,
      band: g.band,
      lower: stateConstantsZero(),
      upper: stateConstantsZero(),
      temperatureK: g.temperatureK,
      jMax: g.jMax,
      kMax: g.shape === 'linear' ? 0 : g.kMax,
      spinWeights: g.spinWeights,
    };
    const floated: string[] = [];
    let k = 0;
    for (const side of ['lower', 'upper'] as const)
      for (const name of modelAllowedParameters(g.shape, side)) {
        const [v, how] = g.values[k++ % g.values.length];
        if (how === 'absent') continue;
        // A fixed 0 is not written (absent means fixed 0), so fixed values are made non-zero.
        model[side][name] = how === 'fixed' && v === 0 ? 1 : v;
        if (how === 'floated') floated.push(`${side}.${name}`);
      }
    return { model, floated, massAmu: g.massAmu, name: g.name };
  });

describe('modelFileParse on hostile text: ModelFileError only, one-line messages naming the field', () => {
  it('random strings and random bytes', () => {
    fc.assert(
      fc.property(fc.oneof(randomTextArb('{}[]":,0123456789.eE-+ntrufalsbd \n'), bytesTextArb()), (text) => void parseChecked(text)),
      { numRuns: 4000, seed: 201 },
    );
  });

  it('random JSON values', () => {
    fc.assert(
      fc.property(fc.jsonValue({ maxDepth: 5 }), (v) => void parseChecked(JSON.stringify(v))),
      { numRuns: 3000, seed: 202 },
    );
  });

  it('mutations of the model-file fixtures', () => {
    fc.assert(
      fc.property(mutationArb(FIXTURES), (text) => void parseChecked(text)),
      { numRuns: 6000, seed: 203 },
    );
  });

  it('valid models with one field replaced by a hostile value or removed', () => {
    const hostile = fc.oneof(
      fc.jsonValue({ maxDepth: 3 }),
      fc.constantFrom('NaN', 'Infinity', '1e999', -1, 0, 1.5, 1e12, -0, null, true, [], {}, '', '<b>x</b>', 'a\nb'),
      fc.integer({ min: 1, max: 3000 }).map((depth) => JSON.parse('['.repeat(depth) + ']'.repeat(depth)) as unknown),
      fc.integer({ min: 0, max: 5000 }).map((n) => Array<number>(n).fill(1)),
    );
    const paths = [
      'shape',
      'band',
      'lower',
      'upper',
      'temperature',
      'jMax',
      'kMax',
      'spinWeights',
      'mass',
      'name',
      'lower.B',
      'lower.A',
      'lower.C',
      'lower.DJ',
      'upper.origin',
      'upper.zeta',
      'upper.q',
      'upper.B',
      'lower.origin',
      'lower.__proto__',
    ];
    fc.assert(
      fc.property(modelFileArb, fc.constantFrom(...paths), fc.option(hostile, { nil: undefined }), (file, path, value) => {
        const json = JSON.parse(modelFileSerialize(file)) as Record<string, unknown>;
        const [head, tail] = path.split('.');
        const target = (tail ? json[head] : json) as Record<string, unknown>;
        const key = tail ?? head;
        if (value === undefined) delete target[key];
        else Object.defineProperty(target, key, { value, enumerable: true, writable: true, configurable: true });
        parseChecked(JSON.stringify(json));
      }),
      { numRuns: 3000, seed: 204 },
    );
  });
});

describe('model file round trip: serialise → parse returns the same model exactly', () => {
  it('random valid models of every shape and band (constants over the whole double range, mass, name, spin weights)', () => {
    fc.assert(
      fc.property(modelFileArb, (file) => {
        const back = parseChecked(modelFileSerialize(file));
        if (back instanceof ModelFileError) throw back;
        // Exact: JSON.stringify writes the shortest text that reads back as the same double (ECMA-262 Number::toString).
        expect(back.model).toEqual(file.model);
        expect([...back.floated].sort()).toEqual([...file.floated].sort());
        expect(back.massAmu).toBe(file.massAmu);
        expect(back.name).toBe(file.name);
        expect(back.warnings).toEqual([]);
      }),
      { numRuns: 2000, seed: 205 },
    );
  });
});
