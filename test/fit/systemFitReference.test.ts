import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { FIT_DEFAULTS } from '../../src/fit/fitTypes';
import { fitStatistics } from '../../src/fit/fitStatistics';
import { leastSquaresSolve } from '../../src/fit/leastSquares';
import { systemFit } from '../../src/fit/systemFit';
import type { SystemFitLine, SystemParameter } from '../../src/fit/systemFitTypes';
import type { SystemModel } from '../../src/physics/system/systemModel';
import { systemStateProvider } from '../../src/physics/system/systemStateLevels';
import { hc3nProblem } from './systemFitHc3nData';
import { systemFitBigProblem } from './systemFitTestData';

/**
 * The joint fit written the plain way, as a reference: every line asks the providers for its two
 * levels on its own (no sharing of levels or J groups), the weighted Jacobian is filled line by
 * line, and the same solver and statistics run on it.
 */
function plainJointFit(model: SystemModel, parameters: readonly SystemParameter[], lines: readonly SystemFitLine[]) {
  const floated = parameters.filter((p) => p.status === 'floated').map((p) => p.key);
  const byKey = new Map(parameters.map((p) => [p.key, p]));
  const stateOf = (s: number, name: string) => {
    const species = model.species[s];
    const state = species.states.find((x) => x.name === name)!;
    const provider = systemStateProvider(species.shape, state);
    const own = provider.parameterNames.map((n) => parameters.find((p) => p.speciesIndex === s && p.state === name && p.name === n));
    const column = own.map((p) => (p ? floated.indexOf(p.status === 'tied' ? p.same! : p.key) : -1));
    const fixed = provider.parameterNames.map((n, c) => {
      const p = own[c];
      return p ? (p.status === 'tied' ? byKey.get(p.same!)!.value : p.value) : (state.constants[n] ?? 0);
    });
    return { provider, column, fixed };
  };
  const level = (st: ReturnType<typeof stateOf>, p: Float64Array, J: number, K: number, l: number, tag: string) => {
    const values = Float64Array.from(st.fixed, (v, c) => (st.column[c] >= 0 ? p[st.column[c]] : v));
    const set = st.provider.levels(J, values, K);
    for (let i = 0; i < set.count; i++)
      if (set.K[i] === K && set.l[i] === l && set.tag[i] === tag) {
        const n = st.provider.parameterNames.length;
        return { energy: set.energyCm1[i], gradient: Array.from(set.gradient.subarray(i * n, i * n + n)) };
      }
    throw new Error(`no level J=${J} K=${K}`);
  };
  const ends = lines.map((line) => {
    const band = model.species[line.speciesIndex].bands.find((b) => b.name === line.band)!;
    return { upper: stateOf(line.speciesIndex, band.upper), lower: stateOf(line.speciesIndex, band.lower) };
  });
  const m = lines.length;
  const solution = leastSquaresSolve(
    {
      nObservations: m,
      nParameters: floated.length,
      residuals(p, out) {
        lines.forEach((line, i) => {
          const up = level(ends[i].upper, p, line.jUpper, line.kUpper, line.lUpper, line.tagUpper);
          const lo = level(ends[i].lower, p, line.jLower, line.kLower, line.lLower, line.tagLower);
          out[i] = (line.observedCm1 - (up.energy - lo.energy)) / line.uncertaintyCm1;
        });
      },
      jacobian(p, out) {
        out.fill(0);
        lines.forEach((line, i) => {
          const up = level(ends[i].upper, p, line.jUpper, line.kUpper, line.lUpper, line.tagUpper);
          const lo = level(ends[i].lower, p, line.jLower, line.kLower, line.lLower, line.tagLower);
          const w = 1 / line.uncertaintyCm1;
          ends[i].upper.column.forEach((j, c) => j >= 0 && (out[j * m + i] += w * up.gradient[c]));
          ends[i].lower.column.forEach((j, c) => j >= 0 && (out[j * m + i] -= w * lo.gradient[c]));
        });
      },
    },
    Float64Array.from(floated, (k) => byKey.get(k)!.value),
    FIT_DEFAULTS,
  );
  const stats = fitStatistics(solution.chi2, m, floated.length, solution.linearisation, false);
  return { floated, values: solution.parameters, sigmas: stats.sigmas, sigmaW: stats.sigmaW };
}

// The reworked fit reduces each band's rows to their R factor before the solver sees them
// (systemFitCompress): the same least-squares problem, rounded differently. 1e-9 of the value (or of
// σ, for a constant near 0) is the tolerance the speed rework was held to. It sits at the round-off
// floor of the HC3N problem for one constant: measured, ν1's HJ (value ≈ σ ≈ 2e-15 cm^-1) moves by
// 6.9e-10 of its σ with the compression, and by 9.9e-10 when the old code is merely given the lines
// in reverse order; every other constant agrees to < 1e-10.
const close = (a: number, b: number, scale: number) => Math.abs(a - b) <= 1e-9 * Math.abs(scale);

describe('systemFit gives the numbers of the plain joint fit', () => {
  it('on the HC3N joint fit (1,570 lines, 37 constants), as recorded before the speed rework', () => {
    const { file, lines } = hc3nProblem();
    const o = systemFit({ model: file.model, parameters: file.parameters, lines });
    if (!o.ok) throw new Error(o.error.message);
    const ref = JSON.parse(readFileSync(new URL('../fixtures/systemFit/hc3n_joint_fit_reference.json', import.meta.url), 'utf8'));
    expect(o.result.floated).toEqual(Object.keys(ref.parameters));
    for (const key of o.result.floated) {
      const p = o.result.parameters[key];
      const q = ref.parameters[key];
      expect(close(p.value, q.value, Math.max(Math.abs(q.value), q.sigma)), key).toBe(true);
      expect(close(p.sigma!, q.sigma, q.sigma), `σ ${key}`).toBe(true);
    }
    expect(close(o.result.sigmaW!, ref.sigmaW, ref.sigmaW)).toBe(true);
    expect(o.result.iterations).toBe(ref.iterations);
  });

  it('on a synthetic system of 10,000 lines (two isotopologues, six bands, 38 constants)', () => {
    const { truth, parameters, lines } = systemFitBigProblem();
    const o = systemFit({ model: truth.model, parameters, lines });
    if (!o.ok) throw new Error(o.error.message);
    const plain = plainJointFit(truth.model, parameters, lines);
    expect(o.result.floated).toEqual(plain.floated);
    expect(o.result.nParameters).toBe(38);
    plain.floated.forEach((key, j) => {
      const p = o.result.parameters[key];
      expect(close(p.value, plain.values[j], Math.max(Math.abs(plain.values[j]), plain.sigmas[j])), key).toBe(true);
      expect(close(p.sigma!, plain.sigmas[j], plain.sigmas[j]), `σ ${key}`).toBe(true);
    });
    expect(close(o.result.sigmaW!, plain.sigmaW!, plain.sigmaW!)).toBe(true);
  });
});
