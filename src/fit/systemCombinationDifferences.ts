import type { SystemModel } from '../physics/system/systemModel';
import { systemStateProvider } from '../physics/system/systemStateLevels';
import { leastSquaresSolve } from './leastSquares';
import { lineariseCovariance } from './leastSquaresLinearise';
import type { SystemFitLine, SystemFitParameterResult, SystemParameter } from './systemFitTypes';

/** One difference of two levels of the measured state, from one line or a pair of lines. */
export interface SystemCombDiffPair {
  band: string;
  /** J of the higher and the lower level of the difference, K, l and tag of both. */
  jHigh: number;
  jLow: number;
  K: number;
  l: number;
  tag: string;
  /** Input indices of the lines: [R, P] for a pair, [line] for a pure rotational line. */
  lines: number[];
  /** Observed difference E(jHigh) − E(jLow), cm^-1. */
  differenceCm1: number;
  sigmaCm1: number;
  /** From the fitted constants, cm^-1. */
  calcCm1: number;
  normalisedResidual: number;
  /** |normalisedResidual| > 3: one of its lines is probably misassigned. */
  isSuspect: boolean;
}

/** Result of systemCombinationDifferences. */
export interface SystemCombDiffResult {
  species: string;
  state: string;
  /** The state's constants that enter a difference, by fit key (fixed ones at their file values). */
  parameters: Record<string, SystemFitParameterResult>;
  nPairs: number;
  pairs: SystemCombDiffPair[];
  sigmaW: number | null;
  rmsCm1: number;
  warnings: string[];
}

export type SystemCombDiffOutcome = { ok: true; result: SystemCombDiffResult } | { ok: false; message: string };

/**
 * Combination differences of one state from every band that shares it: for each band with the
 * state as lower state, R(J−1) − P(J+1) of lines that share their upper level gives
 * E(J+1) − E(J−1) of the state; with the state as upper state, R(J) − P(J) of lines that share
 * their lower level does; a pure rotational line (band from the state to itself) is such a
 * difference by itself. The two levels of a difference have the same K, l and tag, so the
 * origin, the K-only terms and the Coriolis term cancel; the constants that remain (B, DJ, DJK,
 * H terms, q, qJ) are fitted by weighted linear least squares, floating those the system file
 * floats and keeping the others at their values (a tie counts as floated for its leading key).
 * Source: Herzberg II (1945) ch. IV (combination differences of polyatomic bands, as in
 * fit/combinationDifferences.ts), with the differences taken of the state's own level energies.
 * @param model the system
 * @param parameters every constant's status
 * @param lines observed lines, fully labelled
 * @param speciesIndex the species
 * @param state the state's name
 */
export function systemCombinationDifferences(
  model: SystemModel,
  parameters: readonly SystemParameter[],
  lines: readonly SystemFitLine[],
  speciesIndex: number,
  state: string,
): SystemCombDiffOutcome {
  const species = model.species[speciesIndex];
  const st = species?.states.find((s) => s.name === state);
  if (!species || !st) return { ok: false, message: `no state '${state}'${species ? ` in species '${species.name}'` : ''}` };
  const pairs: Omit<SystemCombDiffPair, 'calcCm1' | 'normalisedResidual' | 'isSuspect'>[] = [];
  const usable = lines.map((l, i) => ({ l, i })).filter(({ l }) => l.speciesIndex === speciesIndex && !l.isExcluded);
  const bandsUsed = new Set<string>();
  for (const band of species.bands) {
    const own = usable.filter(({ l }) => l.band === band.name);
    if (band.upper === state && band.lower === state) {
      for (const { l, i } of own) {
        if (l.jUpper === l.jLower) continue;
        const hi = l.jUpper > l.jLower;
        pairs.push({
          band: band.name,
          jHigh: hi ? l.jUpper : l.jLower,
          jLow: hi ? l.jLower : l.jUpper,
          K: l.kUpper,
          l: l.lUpper,
          tag: l.tagUpper,
          lines: [i],
          differenceCm1: hi ? l.observedCm1 : -l.observedCm1,
          sigmaCm1: l.uncertaintyCm1,
        });
        bandsUsed.add(band.name);
      }
      continue;
    }
    const side = band.lower === state ? 'lower' : band.upper === state ? 'upper' : null;
    if (!side) continue;
    // Group by the shared level of the other state, then pair R with P.
    const groups = new Map<string, { l: SystemFitLine; i: number }[]>();
    for (const e of own) {
      const l = e.l;
      const shared =
        side === 'lower' ? `${l.jUpper}|${l.kUpper}|${l.lUpper}|${l.tagUpper}` : `${l.jLower}|${l.kLower}|${l.lLower}|${l.tagLower}`;
      const measured = side === 'lower' ? `${l.kLower}|${l.lLower}|${l.tagLower}` : `${l.kUpper}|${l.lUpper}|${l.tagUpper}`;
      const key = `${shared}#${measured}`;
      const g = groups.get(key);
      if (g) g.push(e);
      else groups.set(key, [e]);
    }
    for (const g of groups.values()) {
      const r = g.find(({ l }) => l.jUpper - l.jLower === 1);
      const p = g.find(({ l }) => l.jUpper - l.jLower === -1);
      if (!r || !p) continue;
      const isLower = side === 'lower';
      pairs.push({
        band: band.name,
        jHigh: isLower ? p.l.jLower : r.l.jUpper,
        jLow: isLower ? r.l.jLower : p.l.jUpper,
        K: isLower ? r.l.kLower : r.l.kUpper,
        l: isLower ? r.l.lLower : r.l.lUpper,
        tag: isLower ? r.l.tagLower : r.l.tagUpper,
        lines: [r.i, p.i],
        differenceCm1: r.l.observedCm1 - p.l.observedCm1,
        sigmaCm1: Math.hypot(r.l.uncertaintyCm1, p.l.uncertaintyCm1),
      });
      bandsUsed.add(band.name);
    }
  }
  const provider = systemStateProvider(species.shape, st);
  const names = provider.parameterNames;
  const nC = names.length;
  const keyOf = (name: string) => parameters.find((p) => p.speciesIndex === speciesIndex && p.state === state && p.name === name);
  const values = Float64Array.from(names, (n) => st.constants[n] ?? 0);
  // Design: one row per pair, the difference of the two levels' gradients.
  const n = pairs.length;
  const design = new Float64Array(n * nC);
  const levelGrad = (J: number, K: number, l: number, tag: string): Float64Array | null => {
    const set = provider.levels(J, values, K);
    for (let i = 0; i < set.count; i++)
      if (set.K[i] === K && set.l[i] === l && set.tag[i] === tag) return set.gradient.slice(i * nC, i * nC + nC);
    return null;
  };
  for (let r = 0; r < n; r++) {
    const p = pairs[r];
    const hi = levelGrad(p.jHigh, p.K, p.l, p.tag);
    const lo = levelGrad(p.jLow, p.K, p.l, p.tag);
    if (!hi || !lo) return { ok: false, message: `state '${state}' has no level J=${p.jHigh} or J=${p.jLow} with K=${p.K}` };
    for (let c = 0; c < nC; c++) design[r * nC + c] = hi[c] - lo[c];
  }
  const floatedCols: number[] = [];
  for (let c = 0; c < nC; c++) {
    const spec = keyOf(names[c]);
    const isFloated = spec?.status === 'floated' || spec?.status === 'tied';
    let any = false;
    for (let r = 0; r < n && !any; r++) any = Math.abs(design[r * nC + c]) > 0;
    if (isFloated && any) floatedCols.push(c);
  }
  if (n === 0)
    return {
      ok: false,
      message: `no combination differences of state '${state}': no pair of lines shares a level (and no pure rotational line) among ${usable.length} lines`,
    };
  if (n < floatedCols.length) {
    return {
      ok: false,
      message: `${n} combination difference${n === 1 ? '' : 's'} cannot determine ${floatedCols.length} constants (${floatedCols.map((c) => names[c]).join(', ')}); fix some in the system file`,
    };
  }
  const nP = floatedCols.length;
  const fixedPart = new Float64Array(n);
  for (let r = 0; r < n; r++) {
    let s = 0;
    for (let c = 0; c < nC; c++) if (!floatedCols.includes(c)) s += design[r * nC + c] * values[c];
    fixedPart[r] = s;
  }
  const calcOf = (p: ArrayLike<number>, r: number) => {
    let s = fixedPart[r];
    floatedCols.forEach((c, j) => (s += design[r * nC + c] * p[j]));
    return s;
  };
  const solution = leastSquaresSolve(
    {
      nObservations: n,
      nParameters: nP,
      residuals: (p, out) => {
        for (let r = 0; r < n; r++) out[r] = (pairs[r].differenceCm1 - calcOf(p, r)) / pairs[r].sigmaCm1;
      },
      jacobian: (_p, out) => {
        floatedCols.forEach((c, j) => {
          for (let r = 0; r < n; r++) out[j * n + r] = design[r * nC + c] / pairs[r].sigmaCm1;
        });
      },
    },
    Float64Array.from(floatedCols, (c) => values[c]),
  );
  if (solution.status === 'rank-deficient' || solution.status === 'non-finite') {
    return {
      ok: false,
      message: `the combination differences of state '${state}' cannot determine ${floatedCols.map((c) => names[c]).join(', ')} together (${solution.status}); fix some of them in the system file`,
    };
  }
  const p = solution.parameters;
  const dof = n - nP;
  let chi2 = 0;
  let sq = 0;
  const full = pairs.map((pair, r) => {
    const calcCm1 = calcOf(p, r);
    const d = pair.differenceCm1 - calcCm1;
    chi2 += (d / pair.sigmaCm1) ** 2;
    sq += d * d;
    const normalisedResidual = d / pair.sigmaCm1;
    return { ...pair, calcCm1, normalisedResidual, isSuspect: Math.abs(normalisedResidual) > 3 };
  });
  const sigmaW = dof > 0 ? Math.sqrt(chi2 / dof) : null;
  const scale = sigmaW !== null && sigmaW > 1 ? sigmaW * sigmaW : 1;
  const cov = solution.linearisation && dof > 0 ? lineariseCovariance(solution.linearisation) : null;
  const out: Record<string, SystemFitParameterResult> = {};
  for (let c = 0; c < nC; c++) {
    let nonZero = false;
    for (let r = 0; r < n && !nonZero; r++) nonZero = design[r * nC + c] !== 0;
    if (!nonZero) continue;
    const key = keyOf(names[c])?.key ?? `${state}.${names[c]}`;
    const j = floatedCols.indexOf(c);
    out[key] =
      j >= 0
        ? { value: p[j], sigma: cov ? Math.sqrt(cov[j * nP + j] * scale) : null, fixed: false }
        : { value: values[c], sigma: 0, fixed: true };
  }
  const warnings: string[] = [];
  const suspects = full.filter((x) => x.isSuspect).length;
  if (suspects)
    warnings.push(
      `${suspects} combination difference${suspects === 1 ? '' : 's'} deviate by more than 3σ: one of the two lines is probably misassigned.`,
    );
  warnings.push(`Differences from ${[...bandsUsed].join(', ') || 'no band'}.`);
  return {
    ok: true,
    result: { species: species.name, state, parameters: out, nPairs: n, pairs: full, sigmaW, rmsCm1: Math.sqrt(sq / n), warnings },
  };
}
