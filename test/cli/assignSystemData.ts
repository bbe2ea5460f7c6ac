/**
 * An invented linear molecule and its isotopologue for the system assign test: each with a Σ–Σ
 * fundamental (ν1), a Σ–Σ hot band from a low-lying Σ state (ν1 + ν3 ← ν3) and a Π–Π hot band
 * (ν1 + ν2 ← ν2, which the single-band model cannot express). The trace is made by the project's
 * own line list (physics/system/systemLines.ts) and Voigt synthesis (physics/spectrum.ts), plus
 * seeded Gaussian noise. Constants invented.
 */
import { systemFileFromJson } from '../../src/io/systemFile';
import { spectrumSynthesize } from '../../src/physics/spectrum';
import { systemLines, type SystemLineList } from '../../src/physics/system/systemLines';
import { seededGaussian } from '../fit/fitTestData';

function species(name: string, scale: number, shift: number, abundance: number, mass: number) {
  const B = (v: number) => Number((v * scale).toFixed(6));
  return {
    name,
    shape: 'linear',
    mass,
    abundance,
    states: {
      ground: { B: B(0.2012), DJ: 4.1e-8 },
      v3: { origin: 521.3 - 0.3 * shift, B: B(0.2019), DJ: 4.2e-8 },
      v2: { origin: 331.7 - 0.2 * shift, degenerate: true, B: B(0.2016), DJ: 4.1e-8, q: 1.2e-4 },
      v1: { origin: 2101.37 - shift, B: B(0.1994), DJ: 4.0e-8 },
      v1v3: { origin: 2617.9 - 1.3 * shift, B: B(0.2001), DJ: 4.1e-8 },
      v1v2: { origin: 2430.2 - 1.2 * shift, degenerate: true, B: B(0.1998), DJ: 4.0e-8, q: 1.1e-4 },
    },
    bands: [
      { name: 'nu1', upper: 'v1', lower: 'ground', strength: 1 },
      { name: 'hot3', upper: 'v1v3', lower: 'v3', strength: 1 },
      { name: 'hot2', upper: 'v1v2', lower: 'v2', strength: 0.15 },
    ],
  };
}

/** The true system as JSON (what a system file holds). */
export const ASSIGN_SYSTEM_TRUTH = {
  temperature: 296,
  jMax: 60,
  kMax: 0,
  species: [species('M', 1, 0, 0.7, 40), species('M13', 0.9713, 29.6, 0.3, 41)],
};

/** The first guess: every origin 0.02 cm^-1 and every B 2e-5 relative off the truth; DJ kept. */
export function assignSystemGuess(): object {
  const guess = JSON.parse(JSON.stringify(ASSIGN_SYSTEM_TRUTH));
  for (const s of guess.species)
    for (const st of Object.values(s.states) as Record<string, number>[]) {
      if (st.origin) st.origin += 0.02;
      st.B *= 1 + 2e-5;
    }
  return guess;
}

/** Trace grid: 2020–2130 cm^-1 in steps of 0.002 cm^-1. */
const FROM_CM1 = 2020;
const STEP_CM1 = 0.002;
const NPOINTS = 55_001;
/** Lorentz HWHM of every line, cm^-1 (pressure broadening, invented). */
export const ASSIGN_SYSTEM_LORENTZ_CM1 = 0.004;
/** Noise σ, absorbance units (strongest peak ≈ 1). */
export const ASSIGN_SYSTEM_NOISE = 2e-4;

/** The true lines and the noisy trace (absorbance, strongest peak scaled to 1) as CSV text. */
export function assignSystemTrace(seed = 3): { truth: SystemLineList; csv: string } {
  const truth = systemLines(systemFileFromJson(ASSIGN_SYSTEM_TRUTH).model);
  const grid = { fromCm1: FROM_CM1, stepCm1: STEP_CM1, npoints: NPOINTS };
  const y = new Float64Array(NPOINTS);
  ASSIGN_SYSTEM_TRUTH.species.forEach((sp, s) => {
    const pick: number[] = [];
    for (let i = 0; i < truth.count; i++) if (truth.bandRefs[truth.bandIndex[i]].speciesIndex === s) pick.push(i);
    const part = spectrumSynthesize(
      {
        count: pick.length,
        wavenumberCm1: Float64Array.from(pick, (i) => truth.wavenumberCm1[i]),
        intensity: Float64Array.from(pick, (i) => truth.intensity[i]),
      },
      grid,
      { temperatureK: 296, massAmu: sp.mass, lorentzHwhmCm1: ASSIGN_SYSTEM_LORENTZ_CM1 },
    );
    for (let k = 0; k < NPOINTS; k++) y[k] += part[k];
  });
  let max = 0;
  for (const v of y) max = Math.max(max, v);
  const g = seededGaussian(seed);
  const rows = ['wavenumber,absorbance'];
  for (let k = 0; k < NPOINTS; k++)
    rows.push(`${(FROM_CM1 + k * STEP_CM1).toFixed(4)},${(y[k] / max + ASSIGN_SYSTEM_NOISE * g()).toFixed(6)}`);
  return { truth, csv: rows.join('\n') + '\n' };
}
