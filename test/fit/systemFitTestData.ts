/**
 * A synthetic joint-fit problem of realistic size for the systemFit equivalence test and benchmark:
 * two isotopologues of an invented C3v prolate top, each with a parallel and a perpendicular
 * fundamental and a ΔK = 0 hot band within the degenerate state (six bands), lines taken strongest
 * first from systemLines with seeded Gaussian noise, start values 1e-4 relative from the truth.
 */
import type { SystemFitLine, SystemParameter } from '../../src/fit/systemFitTypes';
import { systemFileFromJson, type SystemFile } from '../../src/io/systemFile';
import { systemLines } from '../../src/physics/system/systemLines';
import { seededGaussian } from './fitTestData';

function species(name: string, scale: number, abundance: number) {
  const s = (v: number) => v * scale;
  return {
    name,
    shape: 'prolate',
    abundance,
    spinWeights: [4, 2, 2],
    states: {
      ground: { B: s(0.4432), A: 5.097, DJ: 6.1e-7, DJK: 4.2e-6, DK: { value: 8.3e-5, fixed: true } },
      v3: { origin: 731.2 - 8 * (1 - scale), B: s(0.4401), A: 5.091, DJ: 6.0e-7, DJK: 4.1e-6, DK: { same: `ground.DK` } },
      v6: {
        origin: 1014.6 - 5 * (1 - scale),
        degenerate: true,
        B: s(0.4417),
        A: 5.083,
        DJ: 6.2e-7,
        DJK: 4.0e-6,
        DK: { same: 'ground.DK' },
        zeta: { value: 0.281, fixed: true },
      },
      v6v6: {
        origin: 2022.1 - 10 * (1 - scale),
        degenerate: true,
        B: s(0.4402),
        A: 5.071,
        DJ: 6.3e-7,
        DJK: 3.9e-6,
        DK: { same: 'ground.DK' },
        zeta: { value: 0.276, fixed: true },
      },
    },
    bands: [
      { name: 'nu3', upper: 'v3', lower: 'ground', strength: 1 },
      { name: 'nu6', upper: 'v6', lower: 'ground', strength: 1.5 },
      { name: 'hot', upper: 'v6v6', lower: 'v6', strength: 1.5 },
    ],
  };
}

/** The true system (two species, six bands). */
export function systemFitBigTruth(): SystemFile {
  return systemFileFromJson({
    temperature: 296,
    jMax: 70,
    kMax: 18,
    species: [species('X', 1, 0.6), species('X13', 0.985, 0.4)],
  });
}

/**
 * The strongest `count` lines of the true system with Gaussian noise of σ = sigmaCm1, and start
 * parameters 1e-4 relative away from the truth (floated ones only).
 */
export function systemFitBigProblem(
  count = 10_000,
  sigmaCm1 = 0.0005,
  seed = 5,
): { truth: SystemFile; parameters: SystemParameter[]; lines: SystemFitLine[] } {
  const truth = systemFitBigTruth();
  const all = systemLines(truth.model);
  const order = Array.from({ length: all.count }, (_, i) => i).sort((a, b) => all.intensity[b] - all.intensity[a]);
  const g = seededGaussian(seed);
  const lines: SystemFitLine[] = [];
  for (const i of order.slice(0, count)) {
    const ref = all.bandRefs[all.bandIndex[i]];
    lines.push({
      speciesIndex: ref.speciesIndex,
      band: ref.band,
      jUpper: all.jUpper[i],
      kUpper: all.kUpper[i],
      lUpper: all.lUpper[i] as -1 | 0 | 1,
      tagUpper: all.tagUpper[i],
      jLower: all.jLower[i],
      kLower: all.kLower[i],
      lLower: all.lLower[i] as -1 | 0 | 1,
      tagLower: all.tagLower[i],
      observedCm1: all.wavenumberCm1[i] + sigmaCm1 * g(),
      uncertaintyCm1: sigmaCm1,
    });
  }
  const parameters = truth.parameters.map((p) => (p.status === 'floated' ? { ...p, value: p.value * (1 + 1e-4) } : p));
  return { truth, parameters, lines };
}
