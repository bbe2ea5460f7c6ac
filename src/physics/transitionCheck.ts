import type { BandType, TopShape, TransitionQuanta } from './model';

/**
 * Why a set of quantum numbers is not an allowed line of the band, or null when it is.
 * Checks: integers, J >= 0, 0 <= K <= J in both states, |ΔJ| <= 1, ΔK = 0 (parallel) or ±1
 * (perpendicular), no Q line with K = 0 in a parallel band, no ΔK = −1 from K'' = 0, and for a
 * linear molecule K'' = 0 with K' = 0 (Σ–Σ) or 1 (Π–Σ).
 * @returns a plain-language reason naming the offending value, or null
 */
export function transitionCheck(q: TransitionQuanta, band: BandType, shape: TopShape): string | null {
  const { jUpper, kUpper, jLower, kLower } = q;
  for (const [name, v] of [
    ['J_up', jUpper],
    ['K_up', kUpper],
    ['J_lo', jLower],
    ['K_lo', kLower],
  ] as const) {
    if (!Number.isInteger(v)) return `${name} must be a whole number, got ${v}`;
    if (v < 0) return `${name} must be >= 0, got ${v}`;
  }
  if (kUpper > jUpper) return `K_up=${kUpper} exceeds J_up=${jUpper} (K <= J is required)`;
  if (kLower > jLower) return `K_lo=${kLower} exceeds J_lo=${jLower} (K <= J is required)`;
  const deltaJ = jUpper - jLower;
  if (Math.abs(deltaJ) > 1) return `ΔJ = ${deltaJ} is not allowed (only 0, ±1)`;
  const deltaK = kUpper - kLower;
  if (shape === 'linear') {
    if (kLower !== 0) return `K_lo must be 0 for a linear molecule, got ${kLower}`;
    const want = band === 'parallel' ? 0 : 1;
    if (kUpper !== want) {
      return `K_up must be ${want} for a ${band === 'parallel' ? 'Σ–Σ' : 'Π–Σ'} band of a linear molecule, got ${kUpper}`;
    }
    if (band === 'parallel' && deltaJ === 0) return 'a Σ–Σ band has no Q branch (ΔJ = 0)';
    return null;
  }
  if (band === 'parallel') {
    if (deltaK !== 0) return `ΔK = ${deltaK} is not allowed in a parallel band (only ΔK = 0)`;
    if (deltaJ === 0 && kLower === 0) return 'a parallel band has no Q line with K = 0';
  } else {
    if (deltaK !== 1 && deltaK !== -1) return `ΔK = ${deltaK} is not allowed in a perpendicular band (only ΔK = ±1)`;
  }
  if (deltaJ === 0 && jLower === 0) return 'no Q line with J = 0';
  return null;
}
