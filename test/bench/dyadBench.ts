/**
 * `npx tsx test/bench/dyadBench.ts`: times the PH3 ν2/ν4 dyad (test/fixtures/systems/ph3-dyad.json,
 * Coriolis-coupled, diagonalised per J) in three cases and prints one JSON line each:
 * {"case", "median_ms", "median_cpu_ms", "runs", "count", "loadavg"}.
 * - "levels J<=60": every level of the dyad (and of the h3-split ground state) for J = 0…61, with every
 *   derivative (coupledLevels works a level's ∂E/∂p out on request; reading `gradient` asks for all);
 * - "levels J<=60 no derivatives": the same levels (energies, labels, eigenvectors), as a simulation
 *   uses them;
 * - "lines J''<=60": systemLines of both bands, J'' <= 60, K'' <= 20 (intensity borrowing included);
 * - "fit 3000 lines": systemFit of the first 3000 HITRAN 2012 lines (by wavenumber) from start values
 *   with C1 and ζ 1 % off (the function the solver worker runs).
 * Targets (issue 17): enumeration of a dyad with J <= 60 in < 0.2 s; a 3,000-line dyad fit in < 2 s.
 * The fit's time also depends on how many evaluations its last Levenberg–Marquardt step needs, which
 * round-off decides once χ² stops falling (10 or 13 evaluations of the same 7 iterations).
 * Not a unit test: timing is measured, never asserted. On a shared machine the wall time grows with
 * the load; the CPU time less so, so both are printed.
 */
import { readFileSync } from 'node:fs';
import { loadavg } from 'node:os';
import { fileURLToPath } from 'node:url';
import { systemFit } from '../../src/fit/systemFit';
import { systemFileParse } from '../../src/io/systemFile';
import { speciesLevelSources } from '../../src/physics/interaction/speciesLevelSources';
import { systemLines } from '../../src/physics/system/systemLines';
import { ph3FitLines, ph3RowConsistent, ph3Rows } from '../fit/ph3DyadData';

const text = readFileSync(fileURLToPath(new URL('../fixtures/systems/ph3-dyad.json', import.meta.url)), 'utf8');
const repeats = Math.max(3, Number(process.env.LB_BENCH_REPEATS ?? 5));
const only = process.argv.slice(2);

function measure(name: string, run: () => number): void {
  if (only.length && !only.some((o) => name.startsWith(o))) return;
  run();
  const times: number[] = [];
  const cpu: number[] = [];
  let count = 0;
  for (let r = 0; r < repeats; r++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    count = run();
    times.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1000);
  }
  const median = (a: number[]) => [...a].sort((x, y) => x - y)[a.length >> 1];
  console.log(
    JSON.stringify({
      case: name,
      median_ms: +median(times).toFixed(1),
      median_cpu_ms: +median(cpu).toFixed(1),
      runs: repeats,
      count,
      loadavg: loadavg()[0],
    }),
  );
}

function levelsEnumerate(withDerivatives: boolean): number {
  const sources = speciesLevelSources(systemFileParse(text).model.species[0]);
  let n = 0;
  for (const name of ['v4', 'ground']) {
    const source = sources.get(name)!;
    const coupled = source.coupled!;
    for (let J = 0; J <= 61; J++) {
      const levels = coupled.groupLevels(J, source.values);
      n += levels.count;
      if (withDerivatives && levels.gradient.length !== levels.count * coupled.group.parameters.length)
        throw new Error(`dyadBench: J = ${J} of '${name}' has a gradient of the wrong size`);
    }
  }
  return n;
}

measure('levels J<=60', () => levelsEnumerate(true));

measure('levels J<=60 no derivatives', () => levelsEnumerate(false));

measure("lines J''<=60", () => {
  const model = systemFileParse(text).model;
  return systemLines({ ...model, jMax: 60, kMax: 20 }).count;
});

measure('fit 3000 lines', () => {
  const file = systemFileParse(text);
  for (const p of file.parameters) if (p.key === 'v2v4.C1' || p.key === 'v4.zeta') p.value *= 1.01;
  const lines = ph3FitLines(ph3Rows().filter(ph3RowConsistent))
    .sort((a, b) => a.observedCm1 - b.observedCm1)
    .slice(0, 3000);
  const out = systemFit({ model: file.model, parameters: file.parameters, lines });
  if (!out.ok) throw new Error(out.error.message);
  return out.result.iterations;
});
