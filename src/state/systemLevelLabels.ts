/**
 * Level labels of a several-band session's lines beyond J and K: l = sign(kℓ), the tag (A1/A2 of a
 * split K = 3n pair, s/a of an inversion pair, e/f) and the symmetry species where the species
 * declares a point group — carried by the drawn lines, shown in the tooltip, candidate list and
 * table, and kept by assignments so the joint fit can tell the two members of a pair apart.
 */
import type { Assignment } from '../fit/assignment';

/** Per-line level labels, parallel to a line list. */
export interface LineLevelLabels {
  lUpper: Int8Array;
  lLower: Int8Array;
  /** Tags ('' where J and K name the level). */
  tagUpper: string[];
  tagLower: string[];
  /** Symmetry species ('' where no point group is declared). */
  symUpper: string[];
  symLower: string[];
}

/** The labels of one line. */
export interface LineLevelLabel {
  lUpper: -1 | 0 | 1;
  lLower: -1 | 0 | 1;
  tagUpper: string;
  tagLower: string;
  symUpper: string;
  symLower: string;
}

function lOf(v: number): -1 | 0 | 1 {
  return v > 0 ? 1 : v < 0 ? -1 : 0;
}

/** The labels of line i. */
export function lineLevelLabel(labels: LineLevelLabels, i: number): LineLevelLabel {
  return {
    lUpper: lOf(labels.lUpper[i]),
    lLower: lOf(labels.lLower[i]),
    tagUpper: labels.tagUpper[i] ?? '',
    tagLower: labels.tagLower[i] ?? '',
    symUpper: labels.symUpper[i] ?? '',
    symLower: labels.symLower[i] ?? '',
  };
}

/** The labels a subset of lines keeps (idx: indices into `all`). */
export function lineLevelLabelsSubset(all: LineLevelLabels, idx: Int32Array): LineLevelLabels {
  const pick = <T>(a: ArrayLike<T>): T[] => Array.from(idx, (i) => a[i]);
  return {
    lUpper: Int8Array.from(idx, (i) => all.lUpper[i]),
    lLower: Int8Array.from(idx, (i) => all.lLower[i]),
    tagUpper: pick(all.tagUpper),
    tagLower: pick(all.tagLower),
    symUpper: pick(all.symUpper),
    symLower: pick(all.symLower),
  };
}

/**
 * The level labels an assignment keeps from a resolved line: tags when not empty, l when not 0
 * (J and K name every other level, and rows without these fields read as before).
 */
export function assignmentLevelLabels(line: {
  lUpper: -1 | 0 | 1;
  lLower: -1 | 0 | 1;
  tagUpper: string;
  tagLower: string;
}): Pick<Assignment, 'lUpper' | 'lLower' | 'tagUpper' | 'tagLower'> {
  return {
    ...(line.lUpper !== 0 ? { lUpper: line.lUpper } : {}),
    ...(line.lLower !== 0 ? { lLower: line.lLower } : {}),
    ...(line.tagUpper ? { tagUpper: line.tagUpper } : {}),
    ...(line.tagLower ? { tagLower: line.tagLower } : {}),
  };
}

/**
 * Whether a level's tag answers the tag a row keeps: equal, or the row names the inversion component
 * of a level tagged with it and its species ("s" for "s:A2''"), as fit/systemLineResolve reads rows.
 * @param levelTag the line's level tag
 * @param wanted the row's tag
 */
export function levelTagMatches(levelTag: string, wanted: string): boolean {
  return levelTag === wanted || levelTag.startsWith(`${wanted}:`);
}

/** A species or tag written with typographic primes: "A2''" → "A2″", "a:A1'" → "a A1′". */
function primesPretty(text: string): string {
  return text.replace(/''/g, '″').replace(/'/g, '′').replace(':', ' ');
}

/**
 * One level's symmetry as shown: its tag (A1/A2 member, s/a component with its species, e/f) when
 * it has one, else its symmetry species, else ''.
 * @param tag level tag ("A1", "a:A2''", "e", "")
 * @param sym symmetry species ("E", "A1'", "")
 */
export function levelSymmetryText(tag: string | undefined, sym: string | undefined): string {
  if (tag) return primesPretty(tag);
  return sym ? primesPretty(sym) : '';
}

/**
 * A transition's level symmetry as shown, upper ← lower ("A2 ← A1", "a A2″ ← s A1′"), or '' when
 * neither level has a tag or species. A side with nothing known is written "?".
 */
export function transitionSymmetryText(l: { tagUpper?: string; tagLower?: string; symUpper?: string; symLower?: string }): string {
  const up = levelSymmetryText(l.tagUpper, l.symUpper);
  const lo = levelSymmetryText(l.tagLower, l.symLower);
  if (!up && !lo) return '';
  return `${up || '?'} ← ${lo || '?'}`;
}
