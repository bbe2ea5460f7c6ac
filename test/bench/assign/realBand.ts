/**
 * Bands for the assignment assistant made from published, assigned line lists of real molecules
 * (test/fixtures/real/hitran2012, see its README): the lines' HITRAN positions and 296 K intensities
 * drawn as a measured-looking trace (benchTrace: pseudo-Voigt lines, baseline, fringes, noise, file
 * formats), a first guess of constants from memory with a user's errors drawn on top (issue 14's
 * ranges), and 0, 3 or 10 seeds from the published assignments. Scored like the generated bands
 * (assignBenchScore.ts): the published assignment is the truth. Test code, not part of the product.
 *
 * Source of the lines: L. S. Rothman et al., "The HITRAN2012 molecular spectroscopic database",
 * J. Quant. Spectrosc. Radiat. Transfer 130 (2013) 4–50.
 */
import { readFileSync } from 'node:fs';
import { Matrix, solve } from 'ml-matrix';
import { fileURLToPath } from 'node:url';
import {
  benchLineFacts,
  benchPseudoVoigt,
  benchRandom,
  benchSeedTable,
  benchTrace,
  BENCH_DOPPLER_HWHM_PER_NU,
  type BenchBand,
  type BenchLine,
} from './assignBenchBand';

/** One published line: quanta, vacuum wavenumber (cm^-1), 296 K intensity (cm/molecule) as its area. */
type RealLine = Pick<BenchLine, 'jUpper' | 'kUpper' | 'jLower' | 'kLower' | 'nuCm1' | 'area'> & {
  /** This line belongs to the band the first guess describes (not a neighbouring band's line). */
  isTarget: boolean;
};

/** A real band's recipe: its line files, the first guess (from memory) and the trace's conditions. */
interface RealRecipe {
  name: string;
  /** Fixture files (test/fixtures/real/hitran2012) and whether each is the target band. */
  files: { file: string; isTarget: boolean }[];
  shape: 'prolate' | 'oblate';
  /** First guess from memory: lower and upper constants (cm^-1); keys of `fixed` are held. */
  lower: Record<string, number>;
  upper: Record<string, number>;
  fixed: string[];
  spinWeights: number[];
  massAmu: number;
  /** Lorentz HWHM of the trace, cm^-1 (pressure broadening). */
  lorentzHwhmCm1: number;
  /** Trace range, cm^-1. */
  fromCm1: number;
  toCm1: number;
  jMax: number;
  kMax: number;
}

/**
 * CH3CN ν4 (parallel band of a prolate top; v4 = 1 perturbed at K' = 8 and beyond). First guess:
 * ground-state B, A, DJ, DJK and ν4 from memory (about 1 %; the same values as
 * test/analysis/perturbationScan.test.ts), B' a little below B''.
 */
const CH3CN_NU4: RealRecipe = {
  name: 'CH3CN nu4 (HITRAN 2012)',
  files: [{ file: 'ch3cn_nu4_hitran2012.tsv', isTarget: true }],
  shape: 'prolate',
  lower: { B: 0.3068, A: 5.27, DJ: 1.27e-7, DJK: 5.9e-6 },
  upper: { origin: 920.29, B: 0.3062, A: 5.27, DJ: 1.27e-7, DJK: 5.9e-6 },
  fixed: ['lower.A'],
  spinWeights: [2, 1, 1],
  massAmu: 41,
  lorentzHwhmCm1: 0.0008,
  fromCm1: 880,
  toCm1: 962,
  jMax: 70,
  kMax: 14,
};

/**
 * PH3 ν2 (parallel band of an oblate top) with the ν4 band of the Coriolis dyad on the same trace
 * as neighbouring lines the model does not describe. First guess: ground-state B, C, DJ, DJK and ν2
 * from memory; the upper state starts as the ground state shifted by the origin (a user's usual start).
 */
const PH3_NU2: RealRecipe = {
  name: 'PH3 nu2 beside nu4 (HITRAN 2012)',
  files: [
    { file: 'ph3_nu2_hitran2012.tsv', isTarget: true },
    { file: 'ph3_nu4_hitran2012.tsv', isTarget: false },
  ],
  shape: 'oblate',
  lower: { B: 4.4524, C: 3.919, DJ: 3.94e-4, DJK: -5.1e-4 },
  upper: { origin: 992.13, B: 4.4524, C: 3.919, DJ: 3.94e-4, DJK: -5.1e-4 },
  fixed: ['lower.C'],
  spinWeights: [2, 1, 1],
  massAmu: 34,
  lorentzHwhmCm1: 0.002,
  fromCm1: 880,
  toCm1: 1100,
  jMax: 20,
  kMax: 20,
};

/** The recipes, by name for the command line. */
export const REAL_RECIPES = { ch3cn: CH3CN_NU4, ph3: PH3_NU2 } as const;

/** Powers of x = J(J+1) and K² in the ground-state term value fitted to the published E'' values. */
const E_TERMS: [number, number][] = [
  [1, 0],
  [0, 1],
  [2, 0],
  [1, 1],
  [0, 2],
  [3, 0],
  [2, 1],
  [1, 2],
  [0, 3],
];

/**
 * The published lower-state energies as a ground-state term value (linear least squares in the
 * quartic and sextic terms of the contract's F(J, K), levels whose E'' is off by more than 0.05 cm^-1
 * set aside and the fit repeated): the reference against which a row's labels are checked.
 */
function lowerTermFromPublished(levels: Map<string, number>): (J: number, K: number) => number {
  const keys = [...levels.keys()];
  const row = (key: string) => {
    const [J, K] = key.split(',').map(Number);
    return E_TERMS.map(([p, q]) => (J * (J + 1)) ** p * (K * K) ** q);
  };
  let used = keys;
  let coef: number[] = [];
  const term = (J: number, K: number) => E_TERMS.reduce((s, [p, q], i) => s + coef[i] * (J * (J + 1)) ** p * (K * K) ** q, 0);
  for (let pass = 0; pass < 3; pass++) {
    const a = new Matrix(used.map(row));
    const b = Matrix.columnVector(used.map((k) => levels.get(k)!));
    coef = solve(a, b).to1DArray();
    used = keys.filter((k) => {
      const [J, K] = k.split(',').map(Number);
      return Math.abs(term(J, K) - levels.get(k)!) <= 0.05;
    });
  }
  return term;
}

/** Rough position of a parallel line from the first guess (upper state as recipe.upper), cm^-1. */
function roughPosition(r: RealRecipe, jUpper: number, jLower: number, K: number): number {
  const u = r.upper;
  const x = jUpper * (jUpper + 1);
  const unique = r.shape === 'prolate' ? u.A : u.C;
  const xl = jLower * (jLower + 1);
  const lowerUnique = r.shape === 'prolate' ? r.lower.A : r.lower.C;
  const lower = r.lower.B * xl + (lowerUnique - r.lower.B) * K * K;
  return u.origin + u.B * x + (unique - u.B) * K * K - lower;
}

/**
 * A row's lower-state energy (cm^-1) agrees with its quantum numbers within this (many HITRAN E'' are
 * given to 0.1 cm^-1, a few are off by 0.1; a wrong J'' or K'' moves E'' by 2B''J'' or (A−B)(2K+1), far more).
 */
const E_LOWER_MATCH_CM1 = 0.2;
/** HITRAN's placeholder lower-state energy for lines whose lower level it does not know. */
const E_LOWER_UNKNOWN_CM1 = 410;

/**
 * The published lines of a recipe within its trace range. A few HITRAN 2012 rows carry quantum
 * numbers their own lower-state energy contradicts (CH3CN ν4: 918.438471 cm^-1 is labelled
 * Q(20) K = 15 with E'' = 3.6821 cm^-1, the energy of J'' = 3, K = 0; 925.530473 cm^-1 is labelled
 * R(8) K = 4 with the E'' of K = 5): such a row is relabelled to the level its E'' belongs to, with
 * the ΔJ whose rough position (first guess) lies within 0.5 cm^-1, or kept as a line of no known
 * label (a neighbour) when none does. Rows with HITRAN's placeholder E'' (410.0000) keep their labels.
 */
function realLines(r: RealRecipe): RealLine[] {
  const rows: { f: string[]; isTarget: boolean }[] = [];
  for (const { file, isTarget } of r.files) {
    const url = new URL(`../../fixtures/real/hitran2012/${file}`, import.meta.url);
    for (const row of readFileSync(fileURLToPath(url), 'utf8').trim().split('\n').slice(1)) rows.push({ f: row.split('\t'), isTarget });
  }
  const levels = new Map<string, number>();
  for (const { f } of rows) if (+f[3] !== E_LOWER_UNKNOWN_CM1) levels.set(`${+f[8]},${+f[9]}`, +f[3]);
  const lowerTerm = lowerTermFromPublished(levels);
  const out: RealLine[] = [];
  for (const { f, isTarget } of rows) {
    const nu = +f[0];
    if (nu < r.fromCm1 || nu > r.toCm1) continue;
    let q = { jUpper: +f[4], kUpper: +f[5], jLower: +f[8], kLower: +f[9] };
    // The target band's own lines the model can name (ΔK = 0); its perturbation-allowed lines are neighbours.
    let isOwn = isTarget && q.kUpper === q.kLower;
    const eLower = +f[3];
    const match = (J: number, K: number) => Math.abs(lowerTerm(J, K) - eLower) <= E_LOWER_MATCH_CM1;
    if (isOwn && eLower !== E_LOWER_UNKNOWN_CM1 && !match(q.jLower, q.kLower)) {
      isOwn = false;
      for (let K = 0; K <= r.kMax && !isOwn; K++)
        for (let J = K; J <= r.jMax + 1 && !isOwn; J++) {
          if (!match(J, K)) continue;
          for (const dJ of K === 0 ? [-1, 1] : [-1, 0, 1]) {
            if (J + dJ < K || Math.abs(roughPosition(r, J + dJ, J, K) - nu) > 0.5) continue;
            q = { jUpper: J + dJ, kUpper: K, jLower: J, kLower: K };
            isOwn = true;
            break;
          }
        }
    }
    out.push({ ...q, nuCm1: nu, area: +f[1], isTarget: isOwn });
  }
  return out;
}

const uniform = (rand: () => number, lo: number, hi: number) => lo + (hi - lo) * rand();

/**
 * Band `id` of a recipe (same id, same trace, guess and seeds): 4 points per FWHM, the first guess's
 * origin off by up to 0.4 cm^-1, B'' and B' by up to 0.5 %, the unique constant by up to 1 % (issue
 * 14's ranges) on top of the from-memory values.
 */
export function realBand(recipe: RealRecipe, id: number, seeds: 0 | 3 | 10): Omit<BenchBand, 'truth'> {
  const rand = benchRandom(5000 + id);
  const all = realLines(recipe);
  const nuMid = all.reduce((s, l) => s + l.nuCm1 * l.area, 0) / all.reduce((s, l) => s + l.area, 0);
  const gaussFwhm = 2 * BENCH_DOPPLER_HWHM_PER_NU * nuMid * Math.sqrt(296 / recipe.massAmu);
  const shape = benchPseudoVoigt(gaussFwhm, 2 * recipe.lorentzHwhmCm1);
  const step = shape.fwhm / 4;
  const trace = benchTrace(all, shape, recipe.fromCm1, recipe.toCm1, step, rand);
  const facts = benchLineFacts(all, shape, trace, recipe.fromCm1, step);
  const lines: BenchLine[] = facts.filter((l) => l.isTarget).map(({ isTarget, ...l }) => (void isTarget, l));
  const unique = recipe.shape === 'prolate' ? 'A' : 'C';
  const eB = uniform(rand, -0.005, 0.005);
  const eA = uniform(rand, -0.01, 0.01);
  const state = (s: Record<string, number>, which: 'lower' | 'upper') =>
    Object.fromEntries(
      Object.entries(s).map(([k, v]) => {
        let x = v;
        if (k === 'origin') x = v + uniform(rand, -0.4, 0.4);
        else if (k === 'B') x = v * (1 + eB);
        else if (k === unique) x = v * (1 + eA);
        return [k, recipe.fixed.includes(`${which}.${k}`) ? { value: x, fixed: true } : x];
      }),
    );
  const model = {
    name: `${recipe.name}, first guess from memory with a user's errors`,
    shape: recipe.shape,
    band: 'parallel',
    lower: state(recipe.lower, 'lower'),
    upper: state(recipe.upper, 'upper'),
    temperature: 296,
    jMax: recipe.jMax,
    kMax: recipe.kMax,
    spinWeights: recipe.spinWeights,
    mass: recipe.massAmu,
  };
  const pool = lines.filter((l) => l.isResolvable && l.snr > 30);
  const table = seeds > 0 && pool.length >= seeds ? benchSeedTable(pool, seeds, shape.fwhm, rand) : null;
  return {
    id,
    lines,
    fwhmCm1: shape.fwhm,
    traceName: trace.file.name,
    traceText: trace.file.text,
    nPoints: trace.n,
    modelText: JSON.stringify(model, null, 1),
    seedsText: table?.text ?? null,
    nSeeds: table?.count ?? 0,
    summary: `${recipe.name}: ${lines.length} lines of the band, ${all.length - lines.length} others, FWHM ${shape.fwhm.toExponential(2)} cm^-1, ${trace.n} points, SNR ${trace.snrTop.toFixed(0)}, ${trace.isTransmittance ? 'T' : 'A'} ${trace.file.name}, ${table?.count ?? 0} seeds`,
  };
}
