import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { systemBandModel } from '../../src/analysis/systemBandModel';
import { systemFileFromJson, systemFileParse } from '../../src/io/systemFile';
import { bandLines } from '../../src/physics/bandLines';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';
import { systemFromBandModel } from '../../src/physics/system/systemFromBandModel';
import { systemLines } from '../../src/physics/system/systemLines';

const C3V = systemFileParse(readFileSync(new URL('../fixtures/systems/fictitious-c3v.json', import.meta.url), 'utf8'));

describe('systemBandModel', () => {
  it('gives back the single-band model a one-band system was made from (invented perpendicular band)', () => {
    const model: BandModel = {
      shape: 'prolate',
      band: 'perpendicular',
      lower: stateConstantsFrom({ B: 0.9123, A: 5.512, DJ: 2.2e-6, DJK: 1.1e-5 }),
      upper: stateConstantsFrom({ origin: 1511.37, B: 0.9061, A: 5.463, DJ: 2.2e-6, DJK: 1.0e-5, zeta: 0.284 }),
      temperatureK: 200,
      jMax: 22,
      kMax: 4,
      spinWeights: [1],
    };
    const r = systemBandModel(systemFromBandModel(model), [], 0, 'band');
    if (!r.ok) throw new Error(r.reason);
    expect(r.model).toEqual(model);
    expect(r.floatable).toEqual([]);
  });

  it('puts the same lines where the system does, for a fundamental and a perpendicular band of the fixture', () => {
    const all = systemLines(C3V.model);
    for (const band of ['nu3', 'nu6']) {
      const r = systemBandModel(C3V.model, C3V.parameters, 0, band);
      if (!r.ok) throw new Error(r.reason);
      const single = bandLines(r.model);
      const b = all.bandRefs.findIndex((x) => x.band === band);
      const key = (j: number, k: number, jl: number, kl: number) => `${j},${k},${jl},${kl}`;
      const where = new Map<string, number>();
      for (let i = 0; i < single.count; i++)
        where.set(key(single.jUpper[i], single.kUpper[i], single.jLower[i], single.kLower[i]), single.wavenumberCm1[i]);
      let compared = 0;
      for (let i = 0; i < all.count; i++) {
        if (all.bandIndex[i] !== b) continue;
        const x = where.get(key(all.jUpper[i], all.kUpper[i], all.jLower[i], all.kLower[i]));
        if (x === undefined) continue;
        // Same term values, same arithmetic: agreement to round-off of ~1000 cm^-1 (1e-9 cm^-1).
        expect(Math.abs(x - all.wavenumberCm1[i])).toBeLessThan(1e-9);
        compared++;
      }
      expect(compared, band).toBeGreaterThan(100);
      expect(r.floatable).toContain('upper.origin');
      expect(r.floatable).toContain('lower.B');
    }
  });

  it('takes a hot band between nondegenerate states with the origin difference as band origin', () => {
    const s = systemFileFromJson({
      temperature: 296,
      jMax: 20,
      kMax: 0,
      species: [
        {
          name: 'L',
          shape: 'linear',
          states: { ground: { B: 0.2 }, v3: { origin: 500, B: 0.201 }, v1v3: { origin: 2600, B: 0.199 } },
          bands: [{ name: 'hot', upper: 'v1v3', lower: 'v3' }],
        },
      ],
    });
    const r = systemBandModel(s.model, s.parameters, 0, 'hot');
    if (!r.ok) throw new Error(r.reason);
    expect([r.model.band, r.model.upper.origin, r.model.lower.B, r.model.upper.B]).toEqual(['parallel', 2100, 0.201, 0.199]);
  });

  it('refuses, in words, a hot band from a degenerate state and a pure rotational band', () => {
    const hot = systemBandModel(C3V.model, C3V.parameters, 0, 'hot');
    expect(hot.ok).toBe(false);
    if (!hot.ok) expect(hot.reason).toMatch(/starts from the degenerate state 'v6'/);
    const rot = systemBandModel(C3V.model, C3V.parameters, 0, 'rot');
    if (!rot.ok) expect(rot.reason).toMatch(/pure rotational spectrum of state 'ground'/);
    expect(rot.ok).toBe(false);
  });

  it('refuses a constant the single-band model lacks when it is not 0', () => {
    const s = systemFileFromJson({
      temperature: 296,
      jMax: 20,
      kMax: 0,
      species: [
        {
          name: 'L',
          shape: 'linear',
          states: { ground: { B: 0.2 }, v5: { origin: 660, degenerate: true, B: 0.201, q: 1e-4, qJ: 2e-9 } },
          bands: [{ name: 'nu5', upper: 'v5', lower: 'ground' }],
        },
      ],
    });
    const r = systemBandModel(s.model, s.parameters, 0, 'nu5');
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/qJ = 2e-9, which the single-band model cannot hold/);
  });
});
