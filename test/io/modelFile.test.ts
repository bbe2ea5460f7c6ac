import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { modelAllowedParameters, modelFileParse, modelFileSerialize, ModelFileError } from '../../src/io/modelFile';

const fixture = (name: string) => readFileSync(new URL(`../fixtures/models/${name}`, import.meta.url), 'utf8');

const GOOD = {
  shape: 'prolate',
  band: 'perpendicular',
  lower: { B: 0.31, A: 2.65 },
  upper: { origin: 1180, B: 0.3085, A: 2.63, zeta: 0.27 },
  temperature: 296,
  jMax: 12,
  kMax: 4,
};

/** Parse a variant of GOOD and return the error message (or fail the test when it parses). */
function refusal(change: Record<string, unknown>): string {
  const text = JSON.stringify({ ...GOOD, ...change });
  try {
    modelFileParse(text);
  } catch (err) {
    expect(err).toBeInstanceOf(ModelFileError);
    return (err as Error).message;
  }
  throw new Error(`expected a refusal for ${text}`);
}

describe('modelFileParse: refusals name the field', () => {
  it('refuses text that is not JSON, or JSON that is not an object', () => {
    expect(() => modelFileParse('{shape: prolate')).toThrow(/not valid JSON/);
    // JSON has no NaN literal, so a file written by a careless exporter fails here.
    expect(() => modelFileParse('{"shape":"prolate","lower":{"B":NaN}}')).toThrow(/not valid JSON/);
    expect(() => modelFileParse('[1, 2]')).toThrow(/expected a JSON object at top level, got an array/);
    expect(() => modelFileParse('null')).toThrow(/got null/);
  });

  it.each([
    [{ band: undefined }, /field 'band' is missing; expected one of "parallel", "perpendicular"/],
    [{ shape: 'spherical' }, /field 'shape' is the string "spherical"; expected one of "prolate", "oblate", "linear"/],
    [{ temperature: '296' }, /field 'temperature' is the string "296"; expected a number/],
    [{ temperature: 0 }, /field 'temperature' is number 0; expected a temperature in K/],
    [{ jMax: 2.5 }, /field 'jMax' is number 2.5; expected a whole number/],
    [{ jMax: -1 }, /field 'jMax' is number -1; expected a number >= 0/],
    [{ kMax: undefined }, /field 'kMax' is missing/],
    [{ lower: [0.3] }, /field 'lower' is an array; expected an object of constants/],
    [{ upper: undefined }, /field 'upper' is missing/],
    [{ spinWeights: [] }, /field 'spinWeights' is an array; expected a list with >= 1 entries/],
    [{ spinWeights: [1, -2] }, /field 'spinWeights\[1\]' is number -2; expected a finite weight >= 0/],
    [{ mass: 'heavy' }, /field 'mass' is the string "heavy"; expected a number/],
    [{ mass: -3 }, /field 'mass' is number -3; expected a molecular mass in amu/],
  ])('refuses %o', (change, message) => {
    expect(refusal(change)).toMatch(message);
  });

  it('refuses NaN-like strings and malformed parameters in a state', () => {
    expect(refusal({ lower: { B: 'NaN', A: 2.65 } })).toMatch(/field 'lower\.B' is the string "NaN"; expected a finite number/);
    expect(refusal({ lower: { B: 'Infinity' } })).toMatch(/field 'lower\.B' is the string "Infinity"/);
    expect(refusal({ upper: { origin: '1180' } })).toMatch(/field 'upper\.origin' is the string "1180"/);
    expect(refusal({ upper: { origin: { value: 'x' } } })).toMatch(/field 'upper\.origin' is an object/);
    expect(refusal({ upper: { origin: { value: 1180, fixd: true } } })).toMatch(/field 'upper\.origin'/);
    expect(refusal({ upper: { origin: null } })).toMatch(/field 'upper\.origin' is null/);
    expect(refusal({ upper: { zeta: { value: 0.3, unit: 'MHz' } } })).toMatch(/field 'upper\.zeta' is dimensionless/);
  });

  it('refuses A on an oblate top, C on a prolate top, and unknown or misplaced constants', () => {
    expect(() => modelFileParse(fixture('bad-oblate-with-A.json'))).toThrow(
      /field 'lower\.A' is not a lower-state constant of an oblate model \(an oblate top gives "C" in place of "A"\)/,
    );
    expect(refusal({ upper: { origin: 1, C: 2 } })).toMatch(/field 'upper\.C' .*a prolate top gives "A" in place of "C"/);
    expect(refusal({ lower: { B: 0.3, X: 1 } })).toMatch(/field 'lower\.X' is not a lower-state constant/);
    expect(refusal({ lower: { B: 0.3, zeta: 0.2 } })).toMatch(/field 'lower\.zeta'/);
    expect(refusal({ lower: { B: 0.3, origin: 1 } })).toMatch(/field 'lower\.origin'/);
    expect(refusal({ shape: 'linear', lower: { B: 0.3 }, upper: { origin: 1, B: 0.3, zeta: 0.1 } })).toMatch(
      /field 'upper\.zeta' .*linear/,
    );
  });
});

describe('modelFileParse: reading', () => {
  it('reads a prolate perpendicular model with fixed and floated constants', () => {
    const f = modelFileParse(fixture('perpendicular-prolate.json'));
    expect(f.model.shape).toBe('prolate');
    expect(f.model.band).toBe('perpendicular');
    expect(f.model.lower.B).toBe(0.31);
    expect(f.model.lower.DJK).toBe(2e-6);
    expect(f.model.upper.zeta).toBe(0.27);
    expect(f.model.upper.HK).toBe(0); // absent = 0
    expect(f.model.temperatureK).toBe(296);
    expect(f.model.spinWeights).toEqual([4, 2, 2]);
    expect(f.massAmu).toBe(80);
    expect(f.name).toMatch(/invented/);
    expect(f.warnings).toEqual([]);
    expect(new Set(f.floated)).toEqual(new Set(['lower.B', 'lower.A', 'upper.origin', 'upper.B', 'upper.A', 'upper.zeta']));
  });

  it('reads C for an oblate top and treats {fixed: false} as floated', () => {
    const f = modelFileParse(fixture('parallel-oblate.json'));
    expect(f.model.upper.C).toBe(0.1178);
    expect(f.model.upper.A).toBe(0);
    expect(f.floated).toContain('upper.C');
    expect(f.model.spinWeights).toEqual([1]); // default
  });

  it('converts MHz to cm^-1 with c = 29 979.2458 MHz per cm^-1 and sets kMax = 0 for a linear molecule', () => {
    // Ref: CODATA 2018 (Tiesinga et al. 2021): 1 cm^-1 ↔ 29 979.2458 MHz (c exact). Tol 1e-15 relative.
    const f = modelFileParse(fixture('perpendicular-linear.json'));
    expect(Math.abs(f.model.lower.B / (11_500 / 29_979.2458) - 1)).toBeLessThan(1e-15);
    expect(Math.abs(f.model.lower.DJ / (4e-3 / 29_979.2458) - 1)).toBeLessThan(1e-15);
    expect(f.model.upper.q).toBe(4e-4);
    expect(f.model.kMax).toBe(0);
    expect(f.floated).not.toContain('lower.DJ');
  });

  it('warns about unknown top-level fields but still reads the file', () => {
    const f = modelFileParse(JSON.stringify({ ...GOOD, colour: 'blue' }));
    expect(f.warnings).toEqual(["model file: unknown top-level field 'colour' ignored"]);
  });

  it('lists the constants each shape allows', () => {
    expect(modelAllowedParameters('oblate', 'lower')).toContain('C');
    expect(modelAllowedParameters('oblate', 'lower')).not.toContain('A');
    expect(modelAllowedParameters('linear', 'upper')).toEqual(['origin', 'B', 'DJ', 'HJ', 'q']);
  });
});

describe('modelFileSerialize', () => {
  it('round-trips the fixtures (serialise → parse gives the same model and flags)', () => {
    for (const name of ['perpendicular-prolate.json', 'parallel-oblate.json', 'perpendicular-linear.json']) {
      const a = modelFileParse(fixture(name));
      const b = modelFileParse(modelFileSerialize(a));
      expect(b.model).toEqual(a.model);
      expect(new Set(b.floated)).toEqual(new Set(a.floated));
      expect(b.massAmu).toBe(a.massAmu);
      expect(b.name).toBe(a.name);
    }
  });

  it('round-trips random models exactly (seeded property test)', () => {
    const value = fc.double({ min: -1e4, max: 1e4, noNaN: true, noDefaultInfinity: true });
    fc.assert(
      fc.property(
        fc.constantFrom('prolate', 'oblate', 'linear'),
        fc.constantFrom('parallel', 'perpendicular'),
        fc.dictionary(fc.constantFrom('B', 'A', 'C', 'DJ', 'DJK', 'DK', 'HJ', 'HJK', 'HKJ', 'HK'), fc.tuple(value, fc.boolean())),
        fc.dictionary(fc.constantFrom('origin', 'B', 'A', 'C', 'DJ', 'DK', 'zeta', 'q'), fc.tuple(value, fc.boolean())),
        fc.double({ min: 1, max: 3000, noNaN: true }),
        (shape, band, lower, upper, temperature) => {
          const keep = (side: 'lower' | 'upper', d: Record<string, [number, boolean]>) => {
            const allowed = modelAllowedParameters(shape, side) as string[];
            return Object.fromEntries(
              Object.entries(d)
                .filter(([k]) => allowed.includes(k))
                .map(([k, [v, fixed]]) => [k, fixed ? { value: v, fixed: true } : v]),
            );
          };
          const text = JSON.stringify({
            shape,
            band,
            lower: keep('lower', lower),
            upper: keep('upper', upper),
            temperature,
            jMax: 20,
            kMax: 5,
          });
          const a = modelFileParse(text);
          const b = modelFileParse(modelFileSerialize(a));
          expect(b.model).toEqual(a.model);
          expect(new Set(b.floated)).toEqual(new Set(a.floated));
        },
      ),
      { seed: 4242, numRuns: 300 },
    );
  });
});
