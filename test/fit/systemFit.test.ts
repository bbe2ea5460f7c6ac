import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fitBand } from '../../src/fit/fitBand';
import type { FitLineInput } from '../../src/fit/fitTypes';
import { systemFit } from '../../src/fit/systemFit';
import type { SystemFitLine, SystemParameter } from '../../src/fit/systemFitTypes';
import { systemLineResolve } from '../../src/fit/systemLineResolve';
import { lineTableParse } from '../../src/io/lineTable';
import { modelFileParse } from '../../src/io/modelFile';
import { systemFileFromJson, systemFileFromModelFile } from '../../src/io/systemFile';
import { MHZ_PER_CM1 } from '../../src/physics/constants';
import { systemLines } from '../../src/physics/system/systemLines';
import type { SystemModel } from '../../src/physics/system/systemModel';
import { inventedModel, perturbed, seededGaussian, simulatedLines } from './fitTestData';
import { modelFileSerialize } from '../../src/io/modelFile';

const read = (path: string) => readFileSync(new URL(path, import.meta.url), 'utf8');

function resolved(model: SystemModel, lines: readonly FitLineInput[], band: string | null = null): SystemFitLine[] {
  return lines.map((l) => {
    const r = systemLineResolve(model, { band, species: null, ...l, lUpper: null, lLower: null, tagUpper: null, tagLower: null });
    if (!r.ok) throw new Error(r.message);
    return { ...r.line, observedCm1: l.observedCm1, uncertaintyCm1: l.uncertaintyCm1, isExcluded: l.isExcluded };
  });
}

describe('systemFit reproduces fitBand on single-band models', () => {
  const cases: { name: string; modelText: string; lines: FitLineInput[] }[] = [
    {
      name: 'fictitious perpendicular prolate band (fixture)',
      modelText: read('../fixtures/lines/fictitious-perpendicular/model.json'),
      lines: lineTableParse(read('../fixtures/lines/fictitious-perpendicular/lines.csv')).assignments,
    },
    {
      name: 'HCl fundamental (fixture, linear parallel)',
      modelText: read('../fixtures/lines/hcl-fundamental/model.json'),
      lines: lineTableParse(read('../fixtures/lines/hcl-fundamental/lines.csv')).assignments,
    },
  ];
  for (const [shape, band] of [
    ['linear', 'perpendicular'],
    ['oblate', 'parallel'],
  ] as const) {
    const truth = inventedModel(shape, band);
    const floated =
      shape === 'linear'
        ? ['upper.origin', 'upper.B', 'upper.DJ', 'upper.q', 'lower.B', 'lower.DJ']
        : ['upper.origin', 'upper.B', 'upper.C', 'upper.DJ', 'upper.DJK', 'lower.B', 'lower.DJ', 'lower.DJK', 'upper.DK'];
    const start = perturbed(truth, Object.fromEntries(floated.map((k) => [k, 1.001])));
    const text = modelFileSerialize({ model: start, floated });
    cases.push({ name: `invented ${shape} ${band} band`, modelText: text, lines: simulatedLines(truth, 300, 0.0004, 7) });
  }
  for (const c of cases) {
    it(`gives the same constants as fitBand within 1e-9 relative: ${c.name}`, () => {
      const file = modelFileParse(c.modelText);
      const old = fitBand({ model: file.model, floated: file.floated, lines: c.lines });
      if (!old.ok) throw new Error(old.error.message);
      const system = systemFileFromModelFile(file);
      const neu = systemFit({ model: system.model, parameters: system.parameters, lines: resolved(system.model, c.lines) });
      if (!neu.ok) throw new Error(neu.error.message);
      const r = neu.result;
      expect(Object.keys(r.parameters).sort()).toEqual(Object.keys(old.result.parameters).sort());
      expect(r.nLines).toBe(old.result.nLines);
      // Both solvers stop at the least-squares minimum; Gauss–Newton on an almost linear model
      // reaches it to round-off, so 1e-9 of the value (or of its σ, for constants near 0) is ample.
      for (const [key, p] of Object.entries(old.result.parameters)) {
        const q = r.parameters[key];
        expect(q.fixed, key).toBe(p.fixed);
        const scale = Math.max(Math.abs(p.value), p.sigma ?? 0);
        expect(Math.abs(q.value - p.value), key).toBeLessThanOrEqual(1e-9 * scale);
        // σ: both fits scale the covariance by σ_w² only when σ_w > 1 (never shrink the stated errors).
        if (!p.fixed) expect(Math.abs(q.sigma! - p.sigma!)).toBeLessThanOrEqual(1e-9 * p.sigma!);
        expect(r.covarianceScale).toBeCloseTo(old.result.covarianceScale, 9);
      }
      expect(r.sigmaW!).toBeCloseTo(old.result.sigmaW!, 8);
      expect(r.rmsCm1).toBeCloseTo(old.result.rmsCm1, 12);
      r.lines.forEach((l, i) => expect(l.obsMinusCalc).toBeCloseTo(old.result.lines[i].obsMinusCalc, 10));
      expect(r.degreesOfFreedom).toBe(old.result.nLines - old.result.nParameters);
    });
  }
});

/** Fictitious C3v prolate top with two fundamentals, a hot band and an isotopologue-free ground state. */
const SYSTEM_JSON = {
  temperature: 296,
  jMax: 35,
  kMax: 10,
  species: [
    {
      name: 'X',
      shape: 'prolate',
      states: {
        ground: { B: 0.4432, A: 5.097, DJ: 6.1e-7, DJK: 4.2e-6, DK: { value: 8.3e-5, fixed: true } },
        v3: { origin: 731.2, B: 0.4401, A: 5.091, DJ: 6.0e-7, DJK: 4.1e-6, DK: { same: 'ground.DK' } },
        v6: { origin: 1014.6, degenerate: true, B: 0.4417, A: 5.083, DJ: 6.2e-7, DJK: 4.0e-6, DK: { same: 'ground.DK' }, zeta: 0.281 },
        v3v6: { origin: 1743.9, degenerate: true, B: 0.4386, A: 5.077, DJ: 6.1e-7, DJK: 3.9e-6, DK: { same: 'ground.DK' }, zeta: 0.279 },
      },
      bands: [
        { name: 'nu3', upper: 'v3', lower: 'ground' },
        { name: 'nu6', upper: 'v6', lower: 'ground' },
        { name: 'hot', upper: 'v3v6', lower: 'v6' },
      ],
    },
  ],
};

describe('systemFit: joint fit of several bands', () => {
  it('recovers the constants of three bands with shared states and ties from seeded noisy lines (round trip)', () => {
    const truth = systemFileFromJson(SYSTEM_JSON);
    const all = systemLines(truth.model);
    const order = Array.from({ length: all.count }, (_, i) => i).sort((a, b) => all.intensity[b] - all.intensity[a]);
    const perBand = new Map<number, number>();
    const g = seededGaussian(11);
    const sigma = 0.0005;
    const lines: SystemFitLine[] = [];
    for (const i of order) {
      const b = all.bandIndex[i];
      if ((perBand.get(b) ?? 0) >= 250) continue;
      perBand.set(b, (perBand.get(b) ?? 0) + 1);
      lines.push({
        speciesIndex: 0,
        band: all.bandRefs[b].band,
        jUpper: all.jUpper[i],
        kUpper: all.kUpper[i],
        lUpper: all.lUpper[i] as -1 | 0 | 1,
        tagUpper: all.tagUpper[i],
        jLower: all.jLower[i],
        kLower: all.kLower[i],
        lLower: all.lLower[i] as -1 | 0 | 1,
        tagLower: all.tagLower[i],
        observedCm1: all.wavenumberCm1[i] + sigma * g(),
        uncertaintyCm1: sigma,
      });
    }
    // Start 1e-3 relative away from the truth; ζ of v3v6 fixed (one band cannot separate it from A).
    const start: SystemParameter[] = truth.parameters.map((p) => {
      if (p.key === 'v3v6.zeta' || p.key === 'v6.zeta') return { ...p, status: 'fixed' };
      return p.status === 'floated' ? { ...p, value: p.value * (1 + 1e-3) } : p;
    });
    const outcome = systemFit({ model: truth.model, parameters: start, lines });
    if (!outcome.ok) throw new Error(outcome.error.message);
    const r = outcome.result;
    expect(r.nLines).toBe(750);
    // Ties: every DK follows ground.DK (fixed), so none of them is a parameter.
    expect(r.floated.some((k) => k.endsWith('.DK'))).toBe(false);
    expect(r.parameters['v6.DK']).toEqual({ value: 8.3e-5, sigma: 0, fixed: true, same: 'ground.DK' });
    // Round trip (STYLE §7): within 3.5 reported σ; σ_w within 4 sd of 1 (sd ≈ 1/sqrt(2 dof)).
    const truthValue = new Map(truth.parameters.map((p) => [p.key, p.value]));
    for (const key of r.floated) {
      const p = r.parameters[key];
      expect(Math.abs(p.value - truthValue.get(key)!) / p.sigma!, key).toBeLessThan(3.5);
    }
    expect(Math.abs(r.sigmaW! - 1)).toBeLessThan(4 / Math.sqrt(2 * r.degreesOfFreedom));
    expect(r.bands.map((b) => b.band)).toEqual(['nu3', 'nu6', 'hot']);
    // A″ is floated: the parallel ν3 alone sees only A′ − A″, the perpendicular ν6 (ζ fixed) fixes it
    // absolutely, so the joint fit determines every state's A (Herzberg II (1945) ch. IV).
    expect(r.floated).toEqual(expect.arrayContaining(['ground.A', 'v3.A', 'v6.A', 'v3v6.A']));
    expect(r.parameters['ground.A'].sigma!).toBeGreaterThan(0);
  });

  it('fits a tied constant as one parameter', () => {
    const json = structuredClone(SYSTEM_JSON);
    (json.species[0].states.v3 as Record<string, unknown>).DJ = { same: 'ground.DJ' };
    const file = systemFileFromJson(json);
    const lines = systemLines(file.model);
    const fitLines: SystemFitLine[] = [];
    for (let i = 0; i < lines.count; i++) {
      if (lines.intensity[i] < 0.05) continue;
      fitLines.push({
        speciesIndex: 0,
        band: lines.bandRefs[lines.bandIndex[i]].band,
        jUpper: lines.jUpper[i],
        kUpper: lines.kUpper[i],
        lUpper: lines.lUpper[i] as -1 | 0 | 1,
        tagUpper: lines.tagUpper[i],
        jLower: lines.jLower[i],
        kLower: lines.kLower[i],
        lLower: lines.lLower[i] as -1 | 0 | 1,
        tagLower: lines.tagLower[i],
        observedCm1: lines.wavenumberCm1[i],
        uncertaintyCm1: 0.001,
      });
    }
    const o = systemFit({
      model: file.model,
      parameters: file.parameters.map((p) => (p.key.endsWith('zeta') || p.state === 'v3v6' ? { ...p, status: 'fixed' } : p)),
      lines: fitLines,
    });
    if (!o.ok) throw new Error(o.error.message);
    expect(o.result.floated).toContain('ground.DJ');
    expect(o.result.floated).not.toContain('v3.DJ');
    expect(o.result.parameters['v3.DJ'].value).toBe(o.result.parameters['ground.DJ'].value);
    expect(o.result.parameters['v3.DJ'].same).toBe('ground.DJ');
  });

  it('refuses a parallel band alone with A′ and A″ floated and explains the null space', () => {
    const json = structuredClone(SYSTEM_JSON);
    json.species[0].bands = [{ name: 'nu3', upper: 'v3', lower: 'ground' }];
    const file = systemFileFromJson(json);
    const l = systemLines(file.model);
    const fitLines: SystemFitLine[] = [];
    for (let i = 0; i < l.count; i++)
      fitLines.push({
        speciesIndex: 0,
        band: 'nu3',
        jUpper: l.jUpper[i],
        kUpper: l.kUpper[i],
        lUpper: 0,
        tagUpper: '',
        jLower: l.jLower[i],
        kLower: l.kLower[i],
        lLower: 0,
        tagLower: '',
        observedCm1: l.wavenumberCm1[i],
        uncertaintyCm1: 0.001,
      });
    const params = file.parameters.filter((p) => p.state === 'ground' || p.state === 'v3');
    const o = systemFit({ model: file.model, parameters: params, lines: fitLines });
    expect(o.ok).toBe(false);
    if (o.ok) return;
    // Ref: in a ΔK = 0 band only A′ − A″ enters (Herzberg II (1945) ch. IV, parallel bands).
    expect(o.error.kind).toBe('underdetermined');
    expect(o.error.parameters).toEqual(expect.arrayContaining(['ground.A', 'v3.A']));
    expect(o.error.message).toMatch(/differences of A/);
    expect(o.error.fixSuggested).toEqual(['ground.A']);
  });

  it('names a state no fitted line reaches', () => {
    const file = systemFileFromJson(SYSTEM_JSON);
    const l = systemLines(file.model);
    const fitLines: SystemFitLine[] = [];
    for (let i = 0; i < l.count && fitLines.length < 200; i++) {
      if (l.bandRefs[l.bandIndex[i]].band !== 'nu3') continue;
      fitLines.push({
        speciesIndex: 0,
        band: 'nu3',
        jUpper: l.jUpper[i],
        kUpper: l.kUpper[i],
        lUpper: 0,
        tagUpper: '',
        jLower: l.jLower[i],
        kLower: l.kLower[i],
        lLower: 0,
        tagLower: '',
        observedCm1: l.wavenumberCm1[i],
        uncertaintyCm1: 0.001,
      });
    }
    const o = systemFit({ model: file.model, parameters: file.parameters, lines: fitLines });
    expect(!o.ok && o.error.kind).toBe('unused-parameter');
    expect(!o.ok && o.error.message).toMatch(/v6\.origin \(no fitted line reaches state 'v6'\)/);
  });

  it('fits microwave lines (MHz, own σ) with infrared lines in one fit', () => {
    // A linear molecule: ground-state J+1 ← J lines in MHz (σ 10 kHz) and a Σ–Σ band in cm^-1 (σ 5e-4).
    const json = {
      temperature: 300,
      jMax: 40,
      species: [
        {
          name: 'Y',
          shape: 'linear',
          states: { ground: { B: 0.1517, DJ: 1.8e-8 }, v1: { origin: 2000.0, B: 0.1509, DJ: 1.8e-8 } },
          bands: [
            { name: 'rot', upper: 'ground', lower: 'ground' },
            { name: 'nu1', upper: 'v1', lower: 'ground' },
          ],
        },
      ],
    };
    const file = systemFileFromJson(json);
    const l = systemLines(file.model);
    const g = seededGaussian(5);
    const lines: SystemFitLine[] = [];
    for (let i = 0; i < l.count; i++) {
      const isRot = l.bandRefs[l.bandIndex[i]].band === 'rot';
      if (isRot && l.jLower[i] % 4 !== 0) continue;
      const sigmaCm1 = isRot ? 0.01 / MHZ_PER_CM1 : 0.0005;
      lines.push({
        speciesIndex: 0,
        band: isRot ? 'rot' : 'nu1',
        jUpper: l.jUpper[i],
        kUpper: 0,
        lUpper: 0,
        tagUpper: 'e',
        jLower: l.jLower[i],
        kLower: 0,
        lLower: 0,
        tagLower: 'e',
        observedCm1: l.wavenumberCm1[i] + sigmaCm1 * g(),
        uncertaintyCm1: sigmaCm1,
        unit: isRot ? 'MHz' : 'cm-1',
      });
    }
    const o = systemFit({
      model: file.model,
      parameters: file.parameters.map((p) => (p.status === 'floated' ? { ...p, value: p.value * 1.0001 } : p)),
      lines,
    });
    if (!o.ok) throw new Error(o.error.message);
    const r = o.result;
    const mw = r.lines.find((x) => x.unit === 'MHz')!;
    expect(mw.obsMinusCalcMHz).toBeCloseTo(mw.obsMinusCalc * MHZ_PER_CM1, 12);
    // The MHz lines pin B″ far better than the band alone: σ(B″) well under the infrared-only value.
    expect(r.parameters['ground.B'].sigma!).toBeLessThan(1e-8);
    expect(Math.abs(r.parameters['ground.B'].value - 0.1517) / r.parameters['ground.B'].sigma!).toBeLessThan(3.5);
    expect(Math.abs(r.sigmaW! - 1)).toBeLessThan(4 / Math.sqrt(2 * r.degreesOfFreedom));
  });
});
