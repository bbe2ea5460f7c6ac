/**
 * Why the combination-difference panel finds too few pairs, in words: which lines pair up for the
 * chosen state, what is assigned now by sub-branch, and which sub-branch to assign next. Pure.
 */
import type { TransitionQuanta } from '../physics/model';

const DELTA_K_LETTER: Record<number, string> = { [-1]: 'p', 0: 'q', 1: 'r' };
const BRANCH_LETTER: Record<number, string> = { [-1]: 'P', 0: 'Q', 1: 'R' };

/**
 * Explain which assigned lines can form combination-difference pairs and which are missing.
 * Pairs are an R and a P line of the same ΔK that share a level: the upper level for the lower
 * state, Δ₂F″(J) = R(J−1) − P(J+1); the lower level for the upper state, Δ₂F′(J) = R(J) − P(J).
 * Q lines never pair.
 * Source: Herzberg, Molecular Spectra and Molecular Structure II (1945), ch. IV (combination
 * differences of symmetric tops), from memory.
 * @param lines assigned lines (excluded ones left out by the caller if wanted)
 * @param state 'lower' or 'upper'
 * @param isLinear a linear molecule (no ΔK letters)
 * @returns one or two sentences
 */
export function combinationHint(lines: readonly TransitionQuanta[], state: 'lower' | 'upper', isLinear = false): string {
  const counts = new Map<string, number>();
  const byDeltaK = new Map<number, { r: number; p: number }>();
  for (const l of lines) {
    const deltaK = l.kUpper - l.kLower;
    const deltaJ = l.jUpper - l.jLower;
    const name = `${isLinear ? '' : (DELTA_K_LETTER[deltaK] ?? '?')}${BRANCH_LETTER[deltaJ] ?? '?'}`;
    counts.set(name, (counts.get(name) ?? 0) + 1);
    const g = byDeltaK.get(deltaK) ?? { r: 0, p: 0 };
    if (deltaJ === 1) g.r++;
    if (deltaJ === -1) g.p++;
    byDeltaK.set(deltaK, g);
  }
  const rule =
    state === 'lower'
      ? 'A lower-state pair is an R line and a P line of the same ΔK and K″ that reach the same upper level, R(J−1) and P(J+1)'
      : 'An upper-state pair is an R line and a P line of the same ΔK and K″ from the same lower level, R(J) and P(J)';
  const families = isLinear ? 'R with P' : 'rR with rP, pR with pP (perpendicular) or qR with qP (parallel)';
  const assigned =
    counts.size === 0
      ? 'Nothing is assigned yet.'
      : `Assigned now: ${[...counts.entries()]
          .sort((a, b) => a[0].localeCompare(b[0]))
          .map(([n, c]) => `${c} ${n}`)
          .join(', ')}.`;
  const needs: string[] = [];
  for (const [deltaK, g] of [...byDeltaK.entries()].sort((a, b) => b[0] - a[0])) {
    const letter = isLinear ? '' : (DELTA_K_LETTER[deltaK] ?? '?');
    if (g.r > 0 && g.p === 0) needs.push(`${letter}P lines to pair with the ${g.r} ${letter}R`);
    if (g.p > 0 && g.r === 0) needs.push(`${letter}R lines to pair with the ${g.p} ${letter}P`);
  }
  const onlyQ = counts.size > 0 && [...byDeltaK.values()].every((g) => g.r === 0 && g.p === 0);
  const next = needs.length
    ? ` Assign ${needs.join('; ')}.`
    : onlyQ
      ? ` Q lines never pair: assign the R and P sub-branches (${isLinear ? 'R and P' : 'e.g. rR and rP'}).`
      : '';
  return `${rule}: ${families}; Q lines never pair. ${assigned}${next}`;
}
