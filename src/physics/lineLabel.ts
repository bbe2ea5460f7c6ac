import type { TopShape } from './model';

const DELTA_LETTER: Record<number, string> = { [-1]: 'p', 0: 'q', 1: 'r' };
const BRANCH_LETTER: Record<number, string> = { [-1]: 'P', 0: 'Q', 1: 'R' };

/** The parts of the ^ΔK ΔJ_K''(J'') label of a line. */
export interface LineLabelParts {
  /** 'p', 'q' or 'r' for ΔK = −1, 0, +1; empty for a linear molecule. */
  deltaKLetter: string;
  /** 'P', 'Q' or 'R' for ΔJ = −1, 0, +1. */
  branchLetter: string;
  /** K'' (omitted in the label of a linear molecule). */
  kLower: number | null;
  /** J''. */
  jLower: number;
}

/** Split a line's quantum numbers into label parts (trade notation ^ΔK ΔJ_K''(J'')). */
export function lineLabelParts(deltaK: number, deltaJ: number, kLower: number, jLower: number, shape: TopShape): LineLabelParts {
  const linear = shape === 'linear';
  return {
    deltaKLetter: linear ? '' : (DELTA_LETTER[deltaK] ?? '?'),
    branchLetter: BRANCH_LETTER[deltaJ] ?? '?',
    kLower: linear ? null : kLower,
    jLower,
  };
}

/**
 * ASCII label for files: e.g. "rQ3(12)" for ΔK = +1, ΔJ = 0, K'' = 3, J'' = 12; "R(12)" for a
 * linear molecule.
 */
export function lineLabelAscii(deltaK: number, deltaJ: number, kLower: number, jLower: number, shape: TopShape): string {
  const p = lineLabelParts(deltaK, deltaJ, kLower, jLower, shape);
  return `${p.deltaKLetter}${p.branchLetter}${p.kLower ?? ''}(${p.jLower})`;
}

/** Label of a whole sub-branch series (no J): e.g. "rQ3". */
export function seriesLabelAscii(deltaK: number, deltaJ: number, kLower: number, shape: TopShape): string {
  const p = lineLabelParts(deltaK, deltaJ, kLower, 0, shape);
  return `${p.deltaKLetter}${p.branchLetter}${p.kLower ?? ''}`;
}

/**
 * Label with super- and subscripts as HTML tags (plotly hover text and the page render these):
 * "<sup>r</sup>Q<sub>3</sub>(12)". Contains no text from outside, so it is safe markup.
 */
export function lineLabelHtml(deltaK: number, deltaJ: number, kLower: number, jLower: number, shape: TopShape): string {
  const p = lineLabelParts(deltaK, deltaJ, kLower, jLower, shape);
  const sup = p.deltaKLetter ? `<sup>${p.deltaKLetter}</sup>` : '';
  const sub = p.kLower === null ? '' : `<sub>${p.kLower}</sub>`;
  return `${sup}${p.branchLetter}${sub}(${p.jLower})`;
}

/**
 * Parse an ASCII label such as "rQ3(12)", "qR0(5)" or "P(7)" back into quantum labels.
 * @returns the parts, or null when the text is not a label
 */
export function lineLabelParse(text: string): { deltaK: number | null; deltaJ: number; kLower: number | null; jLower: number } | null {
  const m = /^\s*([pqr]?)([PQR])(\d*)\((\d+)\)\s*$/.exec(text);
  if (!m) return null;
  const dk = m[1] ? { p: -1, q: 0, r: 1 }[m[1] as 'p' | 'q' | 'r'] : null;
  const dj = { P: -1, Q: 0, R: 1 }[m[2] as 'P' | 'Q' | 'R'];
  return { deltaK: dk, deltaJ: dj, kLower: m[3] ? Number(m[3]) : null, jLower: Number(m[4]) };
}
