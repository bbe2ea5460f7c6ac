/**
 * `npx tsx test/bench/hamiltonianBench.ts`: times the enumeration of every level of a degenerate (E)
 * state of an invented C3v top for J = 0…80 by diagonalisation (degenerateStateLevels; every k, both ℓ,
 * ℓ(2,2) and ℓ(2,−1) on, so the chains do not fall apart), with and without the Hellmann–Feynman
 * derivatives, and prints one JSON line per case: {"case", "median_ms", "median_cpu_ms", "runs", "levels",
 * "loadavg"}. On a shared machine the wall time grows with the load; the process CPU time does not
 * (much), so both are printed.
 * A third case times a whole degenerate band through the wired system engine: systemLines on a system
 * file whose species declares pointGroup C3v (ground state → E state with the same constants), J'' <= 80,
 * K'' <= 20 — levels of both states by diagonalisation, symmetry selection rules, intensities, partition
 * function.
 * Target (issue 16): < 200 ms for J <= 80. Not a unit test: timing is measured, never asserted.
 */
import { loadavg } from 'node:os';
import { systemFileFromJson } from '../../src/io/systemFile';
import { degenerateStateLevels } from '../../src/physics/hamiltonian/degenerateStateLevels';
import { systemLines } from '../../src/physics/system/systemLines';

const constants = {
  origin: 1180.5,
  B: 0.342,
  A: 5.1,
  DJ: 4.0e-7,
  DJK: 2.6e-6,
  DK: 3.0e-5,
  zeta: 0.27,
  etaJ: 2.0e-6,
  etaK: 4.0e-5,
  q22: 3.0e-4,
  q12: 2.0e-4,
};
const jMax = Number(process.env.LB_BENCH_JMAX ?? 80);
const repeats = Math.max(5, Number(process.env.LB_BENCH_REPEATS ?? 15));

function enumerate(withDerivatives: boolean): number {
  let n = 0;
  for (let J = 0; J <= jMax; J++)
    n += degenerateStateLevels(constants, J, { shape: 'prolate', pointGroup: 'C3v', withDerivatives }).levels.length;
  return n;
}

const bandModel = systemFileFromJson({
  temperature: 296,
  jMax,
  kMax: 20,
  species: [
    {
      name: 'X',
      shape: 'prolate',
      pointGroup: 'C3v',
      spinWeightsBySymmetry: { A1: 4, A2: 4, E: 2 },
      states: { ground: { B: 0.3427, A: 5.1, DJ: 4.1e-7, DJK: 2.6e-6, DK: 3.0e-5 }, v: { degenerate: true, ...constants } },
      bands: [{ name: 'band', upper: 'v', lower: 'ground' }],
    },
  ],
}).model;

const cases: { name: string; run: () => number }[] = [
  { name: `E state J<=${jMax}`, run: () => enumerate(false) },
  { name: `E state J<=${jMax} with derivatives`, run: () => enumerate(true) },
  {
    name: `perpendicular band to an E state through systemLines, J''<=${jMax}, K''<=20 (count = lines)`,
    run: () => systemLines(bandModel).count,
  },
];

for (const c of cases) {
  const warmStart = performance.now();
  for (let i = 0; i < 3 || (i < 20 && performance.now() - warmStart < 1000); i++) c.run();
  const times: number[] = [];
  const cpuTimes: number[] = [];
  let levels = 0;
  for (let i = 0; i < repeats; i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    levels = c.run();
    times.push(performance.now() - t0);
    const c1 = process.cpuUsage(c0);
    cpuTimes.push((c1.user + c1.system) / 1000);
  }
  const median = (v: number[]) => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)];
  console.log(
    JSON.stringify({
      case: c.name,
      median_ms: Number(median(times).toFixed(2)),
      median_cpu_ms: Number(median(cpuTimes).toFixed(2)),
      runs: repeats,
      levels,
      loadavg: loadavg()[0],
    }),
  );
}
