/**
 * The invented several-band demo: LB-7 (no real species) and a heavier isotopologue "LB-7-66"
 * in natural abundance 3:1, each with its perpendicular fundamental ν4 (ground → v4), and for the
 * parent the hot band ν4 + ν3 ← ν3 from the low-lying parallel-mode state v3 (origin 540 cm^-1,
 * about 7 % populated at 296 K). Every constant is invented (B, A, ζ of the parent are those of
 * the single-band demo); the isotopologue's were made from the parent's with the scaling the page
 * offers (B by m/m′, A unchanged for an on-axis substitution, origin by √(m/m′)) and then altered
 * a little, as real isotopologues differ from any simple scaling.
 */
import type { SystemModel } from '../physics/system/systemModel';

/** Names of the demo's species. */
export const DEMO_SYSTEM_PARENT = 'LB-7';
export const DEMO_SYSTEM_ISOTOPOLOGUE = 'LB-7-66';

/** The true system (cm^-1; ζ dimensionless; 296 K). */
export function demoSystemTruth(): SystemModel {
  const ground = { B: 0.29183, A: 3.4127, DJ: 2.61e-7, DJK: 2.07e-6, DK: 3.3e-5 };
  return {
    temperatureK: 296,
    jMax: 75,
    kMax: 22,
    species: [
      {
        name: DEMO_SYSTEM_PARENT,
        shape: 'prolate',
        massAmu: 64,
        abundance: 0.75,
        spinWeights: [4, 2, 2],
        states: [
          { name: 'ground', isDegenerate: false, constants: { ...ground } },
          { name: 'v3', isDegenerate: false, constants: { origin: 540.213, B: 0.29241, A: 3.4089, DJ: 2.63e-7, DJK: 2.1e-6, DK: 3.3e-5 } },
          {
            name: 'v4',
            isDegenerate: true,
            constants: { origin: 1148.6431, B: 0.29068, A: 3.3951, DJ: 2.58e-7, DJK: 2.21e-6, DK: 3.1e-5, zeta: 0.2873 },
          },
          {
            name: 'v3v4',
            isDegenerate: true,
            constants: { origin: 1685.9012, B: 0.29127, A: 3.3914, DJ: 2.6e-7, DJK: 2.24e-6, DK: 3.1e-5, zeta: 0.2861 },
          },
        ],
        bands: [
          { name: 'nu4', upper: 'v4', lower: 'ground', strength: 1 },
          { name: 'hot', upper: 'v3v4', lower: 'v3', strength: 1 },
        ],
      },
      {
        name: DEMO_SYSTEM_ISOTOPOLOGUE,
        shape: 'prolate',
        massAmu: 66,
        abundance: 0.25,
        spinWeights: [4, 2, 2],
        states: [
          { name: 'ground', isDegenerate: false, constants: { B: 0.28302, A: 3.4127, DJ: 2.46e-7, DJK: 1.95e-6, DK: 3.3e-5 } },
          {
            name: 'v4',
            isDegenerate: true,
            constants: { origin: 1139.2876, B: 0.28194, A: 3.3958, DJ: 2.43e-7, DJK: 2.08e-6, DK: 3.1e-5, zeta: 0.2851 },
          },
        ],
        bands: [{ name: 'nu4', upper: 'v4', lower: 'ground', strength: 1 }],
      },
    ],
  };
}

/** Constants the demo floats (fit keys of the system file). */
export const DEMO_SYSTEM_FLOATED = [
  'LB-7/ground.B',
  'LB-7/ground.DJ',
  'LB-7/ground.DJK',
  'LB-7/v4.origin',
  'LB-7/v4.B',
  'LB-7/v4.A',
  'LB-7/v4.zeta',
  'LB-7/v4.DJ',
  'LB-7/v4.DJK',
  'LB-7/v3v4.origin',
  'LB-7/v3v4.B',
  'LB-7/v3v4.A',
  'LB-7/v3v4.zeta',
  'LB-7/v3.B',
  'LB-7-66/ground.B',
  'LB-7-66/ground.DJ',
  'LB-7-66/v4.origin',
  'LB-7-66/v4.B',
  'LB-7-66/v4.A',
  'LB-7-66/v4.zeta',
  'LB-7-66/v4.DJ',
];

/**
 * A first guess a user would start from: every B, origin, A′ and ζ moved by a seeded amount (B by
 * 0.1–0.3 %, origins by 0.08–0.19 cm^-1, A′ by 0.3–0.7 %, ζ by 2–4 %), distortion constants rounded
 * to one digit, jMax/kMax smaller.
 * @param random seeded uniform [0, 1)
 */
export function demoSystemFirstGuess(truth: SystemModel, random: () => number): SystemModel {
  const sign = () => (random() < 0.5 ? -1 : 1);
  const rel = (lo: number, hi: number) => sign() * (lo + (hi - lo) * random());
  const round = (x: number, d: number) => Number(x.toFixed(d));
  return {
    ...truth,
    jMax: 60,
    kMax: 18,
    species: truth.species.map((sp) => ({
      ...sp,
      states: sp.states.map((st) => {
        const c: Record<string, number> = {};
        for (const [n, v] of Object.entries(st.constants)) {
          if (n === 'B') c[n] = round(v * (1 + rel(0.001, 0.003)), 5);
          else if (n === 'origin') c[n] = round(v + rel(0.08, 0.19), 2);
          else if (n === 'A') c[n] = st.name === 'ground' ? v : round(v * (1 + rel(0.003, 0.007)), 3);
          else if (n === 'zeta') c[n] = round(v * (1 + rel(0.02, 0.04)), 3);
          else c[n] = Number(v.toPrecision(1));
        }
        return { ...st, constants: c };
      }),
    })),
  };
}
