import { describe, expect, it } from 'vitest';
import { bandLineGradient, bandProblem, fitKeyParse, fitParameterKeys } from '../../src/fit/bandDesign';
import { modelAllowedParameters } from '../../src/io/modelFile';
import type { BandModel, TopShape } from '../../src/physics/model';
import { transitionWavenumber } from '../../src/physics/termValues';
import { inventedModel, simulatedLines } from './fitTestData';

const CASES: [TopShape, BandModel['band']][] = [
  ['prolate', 'perpendicular'],
  ['prolate', 'parallel'],
  ['oblate', 'perpendicular'],
  ['oblate', 'parallel'],
  ['linear', 'parallel'],
  ['linear', 'perpendicular'],
];

function withHigherOrder(model: BandModel): BandModel {
  // Give every allowed constant a non-zero value so each derivative is exercised.
  const m: BandModel = { ...model, lower: { ...model.lower }, upper: { ...model.upper } };
  for (const key of fitParameterKeys(m.shape)) {
    const { side, name } = fitKeyParse(key)!;
    if (m[side][name] === 0) m[side][name] = name.startsWith('H') ? 3e-12 : name === 'q' ? 1e-4 : 1e-6;
  }
  return m;
}

describe('fitParameterKeys', () => {
  it('lists exactly the constants the model file allows for each shape and state', () => {
    for (const shape of ['prolate', 'oblate', 'linear'] as const) {
      const expected = [
        ...modelAllowedParameters(shape, 'upper').map((n) => `upper.${n}`),
        ...modelAllowedParameters(shape, 'lower').map((n) => `lower.${n}`),
      ];
      expect(new Set(fitParameterKeys(shape))).toEqual(new Set(expected));
    }
  });
});

describe('bandLineGradient', () => {
  for (const [shape, band] of CASES) {
    it(`matches central differences of transitionWavenumber for a ${shape} ${band} band`, () => {
      // Reference: the physics module's own term values. ν is linear in each single constant
      // (A'ζ is bilinear), so a central difference has no truncation error; the step moves ν by
      // ~1e-3 cm^-1, so round-off ε·ν/h ≈ 2e-13/1e-3 gives ~1e-9 relative (tolerance 1e-8).
      const model = withHigherOrder(inventedModel(shape, band));
      const keys = fitParameterKeys(shape);
      const lines = simulatedLines(model, 60, 0, 1);
      for (const q of lines) {
        const g = bandLineGradient(model, keys, q);
        const scale = Math.max(...g.map(Math.abs));
        keys.forEach((key, j) => {
          const { side, name } = fitKeyParse(key)!;
          const h = g[j] !== 0 ? 1e-3 / Math.abs(g[j]) : 1;
          const plus = { ...model, [side]: { ...model[side], [name]: model[side][name] + h } };
          const minus = { ...model, [side]: { ...model[side], [name]: model[side][name] - h } };
          const fd =
            (transitionWavenumber(plus, q.jUpper, q.kUpper, q.jLower, q.kLower) -
              transitionWavenumber(minus, q.jUpper, q.kUpper, q.jLower, q.kLower)) /
            (2 * h);
          expect(Math.abs(g[j] - fd)).toBeLessThan(1e-8 * Math.abs(g[j]) + 1e-12 * scale);
        });
      }
    });
  }
});

describe('bandProblem', () => {
  for (const [shape, band] of CASES) {
    it(`gives residuals (obs − ν)/σ of transitionWavenumber for a ${shape} ${band} band`, () => {
      const model = withHigherOrder(inventedModel(shape, band));
      const keys = fitParameterKeys(shape);
      const lines = simulatedLines(model, 80, 0.002, 7);
      const posed = bandProblem(
        model,
        keys,
        {
          quanta: lines,
          observedCm1: Float64Array.from(lines, (l) => l.observedCm1),
          uncertaintyCm1: Float64Array.from(lines, (l) => l.uncertaintyCm1),
        },
        { isCompressed: false },
      );
      const r = new Float64Array(lines.length);
      posed.problem.residuals(posed.start, r);
      lines.forEach((l, i) => {
        const nu = transitionWavenumber(model, l.jUpper, l.kUpper, l.jLower, l.kLower);
        // Round-off: ν ~ 1e3 cm^-1 summed from terms up to ~1e3, ε·1e3/σ ≈ 1e-10.
        expect(r[i]).toBeCloseTo((l.observedCm1 - nu) / l.uncertaintyCm1, 8);
      });
    });

    it(`compresses a ${shape} ${band} problem without changing χ² or JᵀJ`, () => {
      // Orthogonal invariance: ‖t − A c‖² = ‖z − R c‖² + ρ² (Golub & Van Loan 2013 §5.3.3).
      // Tolerance 1e-9 relative: round-off of one QR of a matrix with entries up to ~1e7.
      const truth = withHigherOrder(inventedModel(shape, band));
      const keys = fitParameterKeys(shape);
      const lines = simulatedLines(truth, 200, 0.001, 3);
      const data = {
        quanta: lines,
        observedCm1: Float64Array.from(lines, (l) => l.observedCm1),
        uncertaintyCm1: Float64Array.from(lines, (l) => l.uncertaintyCm1),
      };
      const start = { ...truth, upper: { ...truth.upper, origin: truth.upper.origin + 0.01, B: truth.upper.B * 1.0001 } };
      const full = bandProblem(start, keys, data, { isCompressed: false });
      const small = bandProblem(start, keys, data);
      expect(small.isCompressed).toBe(true);
      expect(small.problem.nObservations).toBeLessThan(keys.length + 3);
      const chi2 = (pb: typeof full) => {
        const r = new Float64Array(pb.problem.nObservations);
        pb.problem.residuals(pb.start, r);
        return r.reduce((s, v) => s + v * v, 0);
      };
      expect(chi2(small) / chi2(full)).toBeCloseTo(1, 9);
      const gram = (pb: typeof full) => {
        const m = pb.problem.nObservations;
        const n = keys.length;
        const j = new Float64Array(m * n);
        pb.problem.jacobian(pb.start, j);
        return Array.from({ length: n * n }, (_, k) => {
          const a = Math.floor(k / n);
          const b = k % n;
          let s = 0;
          for (let i = 0; i < m; i++) s += j[a * m + i] * j[b * m + i];
          return s;
        });
      };
      const gf = gram(full);
      const gs = gram(small);
      const n = keys.length;
      gf.forEach((v, k) => {
        const a = Math.floor(k / n);
        const b = k % n;
        const scale = Math.sqrt(gf[a * n + a] * gf[b * n + b]) || 1;
        expect(Math.abs(gs[k] - v) / scale).toBeLessThan(1e-9);
      });
    });
  }
});
