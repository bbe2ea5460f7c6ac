/**
 * Inputs of the several-band page measure (browserBench measure 9): a system of five bands (the
 * demo's two isotopologues, the parent's hot band and one of the isotopologue, and ν4 of a third
 * invented isotopologue LB-7-65), drawn at an intensity cut of 0.0015 (20,518 lines; the four
 * bands alone give 14,719 at the page's default cut 0.002 and 15,729 at 0.0015), its
 * 1,000,000-point trace and a line table of 10,000 of its lines with band columns (seeded noise).
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { demoSystemTruth, DEMO_SYSTEM_FLOATED } from '../../src/cli/makeDemoSystem';
import { lineTableSerialize } from '../../src/io/lineTable';
import { systemFileSerialize } from '../../src/io/systemFileWrite';
import { spectrumSynthesize } from '../../src/physics/spectrum';
import { systemLines } from '../../src/physics/system/systemLines';
import { systemAddHotBand } from '../../src/state/systemEdit';

/** Files and sizes of the several-band measure. */
export interface BandsBenchInputs {
  systemJson: string;
  traceCsv: string;
  lineTableCsv: string;
  /** Lines the page draws (intensity ≥ BANDS_BENCH_MIN_INTENSITY). */
  nLines: number;
  nAssigned: number;
  tracePoints: number;
  traceRangeCm1: [number, number];
}

/** Intensity cut the measure sets on the page (its default, modelSlice.minIntensity, is 0.002). */
export const BANDS_BENCH_MIN_INTENSITY = 0.0015;

/**
 * Write the inputs into dir.
 * @param nAssigned lines in the table (the strongest, J″ ≤ 40)
 * @param tracePoints points of the trace
 */
export function bandsBenchInputsWrite(dir: string, nAssigned = 10_000, tracePoints = 1_000_000): BandsBenchInputs {
  let system = demoSystemTruth();
  system.species[1].states.push({
    name: 'v3',
    isDegenerate: false,
    constants: { origin: 531.8, B: 0.28357, A: 3.4089, DJ: 2.5e-7, DJK: 2e-6 },
  });
  system = systemAddHotBand(system, [], { speciesIndex: 1, lower: 'v3', fundamental: 'nu4', name: 'hot' }).system;
  // A third isotopologue (invented): LB-7-66's ground state and ν4 with B and A scaled by 65/66 and
  // the origin 4.6 cm^-1 up, abundance 0.25.
  const third = structuredClone(demoSystemTruth().species[1]);
  third.name = 'LB-7-65';
  third.massAmu = 65;
  third.abundance = 0.25;
  for (const st of third.states) {
    for (const k of ['B', 'A']) if (st.constants[k] !== undefined) st.constants[k] *= 65 / 66;
    if (st.constants.origin !== undefined) st.constants.origin += 4.6;
  }
  system = { ...system, species: [...system.species, third], jMax: 80, kMax: 24 };
  const lines = systemLines(system, { minIntensity: BANDS_BENCH_MIN_INTENSITY });
  const floated = [
    ...DEMO_SYSTEM_FLOATED.filter((k) => !k.endsWith('v3.B')),
    'LB-7-66/v3+v4.origin',
    'LB-7-66/v3+v4.B',
    ...DEMO_SYSTEM_FLOATED.filter((k) => k.startsWith('LB-7-66/')).map((k) => k.replace('LB-7-66/', 'LB-7-65/')),
  ];
  const systemJson = join(dir, 'bench-bands-system.json');
  writeFileSync(systemJson, systemFileSerialize(system, { floated, name: 'bench four bands' }));
  // Trace: the Voigt sum of every line on 1e6 points as absorbance.
  const lo = 1085;
  const hi = 1215;
  const step = (hi - lo) / (tracePoints - 1);
  const y = spectrumSynthesize(
    lines,
    { fromCm1: lo, stepCm1: step, npoints: tracePoints },
    { temperatureK: 296, massAmu: 65, lorentzHwhmCm1: 0.002 },
  );
  let max = 0;
  for (let k = 0; k < tracePoints; k++) max = Math.max(max, y[k]);
  let a = 9;
  const u = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), a | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const rows: string[] = ['wavenumber_cm-1,absorbance'];
  for (let k = 0; k < tracePoints; k++) rows.push(`${(lo + k * step).toFixed(6)},${((0.8 * y[k]) / max + 0.002 * (u() - 0.5)).toFixed(6)}`);
  const traceCsv = join(dir, 'bench-bands-trace.csv');
  writeFileSync(traceCsv, rows.join('\n') + '\n');
  // Line table: the strongest lines with J″ ≤ 40.
  const order = Array.from({ length: lines.count }, (_, i) => i)
    .filter((i) => lines.jLower[i] <= 40)
    .sort((p, q) => lines.intensity[q] - lines.intensity[p])
    .slice(0, nAssigned);
  const table = order.map((i, n) => {
    const ref = lines.bandRefs[lines.bandIndex[i]];
    return {
      id: `b${n + 1}`,
      jUpper: lines.jUpper[i],
      kUpper: lines.kUpper[i],
      jLower: lines.jLower[i],
      kLower: lines.kLower[i],
      observedCm1: lines.wavenumberCm1[i] + 0.0004 * (u() - 0.5),
      uncertaintyCm1: 0.0003,
      isBlended: false,
      isExcluded: false,
      note: '',
      band: ref.band,
      species: ref.species,
    };
  });
  const lineTableCsv = join(dir, 'bench-bands-lines.csv');
  writeFileSync(lineTableCsv, lineTableSerialize(table, { shape: 'prolate', hasBandColumns: true }));
  return { systemJson, traceCsv, lineTableCsv, nLines: lines.count, nAssigned: table.length, tracePoints, traceRangeCm1: [lo, hi] };
}
