/**
 * Pure helpers behind the assignment actions: add, update, remove assignments and judge how far
 * an observation sits from its prediction. Lists are immutable (every change returns a new array).
 */
import { ASSIGNMENT_DEFAULT_UNCERTAINTY_CM1, assignmentCheck, type Assignment } from '../fit/assignment';
import type { BandModel, TransitionQuanta } from '../physics/model';

/** What a new assignment needs. */
export interface AssignmentDraft extends TransitionQuanta {
  observedCm1: number;
  /** Peak identifier (several assignments sharing one peak form a blend). */
  peakId?: string;
  /** 1σ of the position, cm^-1. @default ASSIGNMENT_DEFAULT_UNCERTAINTY_CM1 */
  uncertaintyCm1?: number;
  /** Band and species in a several-band session (the same quanta in two bands are two lines). */
  band?: string;
  species?: string;
  /** Level labels of a several-band line (A1/A2, s/a tags; ±l) where J and K leave a choice. */
  lUpper?: -1 | 0 | 1;
  lLower?: -1 | 0 | 1;
  tagUpper?: string;
  tagLower?: string;
}

/** Identifier of a peak at a position: its centre to 1e-5 cm^-1. */
export function peakIdAt(positionCm1: number): string {
  return `pk${positionCm1.toFixed(5)}`;
}

/** The position a peak id encodes (cm^-1, rounded to 1e-5), NaN for a string that is not a peak id. */
export function peakIdPosition(id: string): number {
  return id.startsWith('pk') ? Number(id.slice(2)) : NaN;
}

/**
 * Add an assignment. Quanta already in the list are re-assigned (their position and peak replaced,
 * keeping id, σ and note) rather than duplicated. A peak that then carries two or more transitions
 * has all of them flagged as blended.
 * @param list current assignments
 * @param draft quanta, observed position (cm^-1), peak
 * @param id identifier for a new entry
 * @returns the new list and the id of the added or updated entry
 */
export function assignmentsAdd(list: readonly Assignment[], draft: AssignmentDraft, id: string): { list: Assignment[]; id: string } {
  if (!Number.isFinite(draft.observedCm1)) throw new Error(`assignmentsAdd: observedCm1 must be finite, got ${draft.observedCm1}`);
  // Numbers compared directly: no key string per row on every click.
  const existing = list.find(
    (a) =>
      a.jUpper === draft.jUpper &&
      a.kUpper === draft.kUpper &&
      a.jLower === draft.jLower &&
      a.kLower === draft.kLower &&
      a.band === draft.band &&
      a.species === draft.species &&
      a.tagUpper === draft.tagUpper &&
      a.tagLower === draft.tagLower &&
      a.lUpper === draft.lUpper &&
      a.lLower === draft.lLower,
  );
  let out: Assignment[];
  let resultId: string;
  if (!existing) {
    const appended = blendsAppend(list, assignmentNew(draft, id));
    if (appended) return { list: appended, id };
  }
  if (existing) {
    resultId = existing.id;
    out = list.map((a) =>
      a === existing
        ? {
            ...a,
            observedCm1: draft.observedCm1,
            peakId: draft.peakId,
            isBlended: false,
            uncertaintyCm1: draft.uncertaintyCm1 ?? a.uncertaintyCm1,
          }
        : a,
    );
  } else {
    resultId = id;
    out = [...list, assignmentNew(draft, id)];
  }
  const marked = blendsMark(out, existing?.peakId);
  blendCounts.set(marked.list, marked.count);
  return { list: marked.list, id: resultId };
}

/** A new assignment from a draft. */
function assignmentNew(draft: AssignmentDraft, id: string): Assignment {
  return {
    id,
    jUpper: draft.jUpper,
    kUpper: draft.kUpper,
    jLower: draft.jLower,
    kLower: draft.kLower,
    observedCm1: draft.observedCm1,
    uncertaintyCm1: draft.uncertaintyCm1 ?? ASSIGNMENT_DEFAULT_UNCERTAINTY_CM1,
    isBlended: false,
    isExcluded: false,
    note: '',
    ...(draft.peakId !== undefined ? { peakId: draft.peakId } : {}),
    ...(draft.band !== undefined && draft.species !== undefined ? { band: draft.band, species: draft.species } : {}),
    ...(draft.lUpper !== undefined ? { lUpper: draft.lUpper } : {}),
    ...(draft.lLower !== undefined ? { lLower: draft.lLower } : {}),
    ...(draft.tagUpper !== undefined ? { tagUpper: draft.tagUpper } : {}),
    ...(draft.tagLower !== undefined ? { tagLower: draft.tagLower } : {}),
  };
}

/**
 * Rows per peak id of lists that assignmentsAdd returned (each such list has every row on a shared
 * peak flagged blended): the next assignmentsAdd on that list need not count every row again. The
 * counts move to the new list (they are updated in place), so an old list is counted afresh.
 */
const blendCounts = new WeakMap<readonly Assignment[], Map<string, number>>();

/**
 * assignmentsMarkBlends([...list, added]) for a list assignmentsAdd returned, without a pass that
 * hashes every row: only the rows on the added row's peak can change (every other shared peak is
 * already flagged). Null when the list's counts are not known (assignmentsAdd then counts them).
 */
function blendsAppend(list: readonly Assignment[], added: Assignment): Assignment[] | null {
  const count = blendCounts.get(list);
  if (!count) return null;
  blendCounts.delete(list);
  const out = [...list, added];
  const p = added.peakId;
  if (p !== undefined) {
    const n = (count.get(p) ?? 0) + 1;
    count.set(p, n);
    if (n > 1) for (let i = 0; i < out.length; i++) if (out[i].peakId === p && !out[i].isBlended) out[i] = { ...out[i], isBlended: true };
  }
  blendCounts.set(out, count);
  return out;
}

/**
 * Flag as blended every assignment whose peak carries more than one transition; an entry left
 * alone on `releasedPeakId` (the peak an entry just moved away from) is un-flagged.
 */
export function assignmentsMarkBlends(list: Assignment[], releasedPeakId?: string): Assignment[] {
  return blendsMark(list, releasedPeakId).list;
}

/** assignmentsMarkBlends, with the rows per peak id it counted. */
function blendsMark(list: Assignment[], releasedPeakId?: string): { list: Assignment[]; count: Map<string, number> } {
  const count = new Map<string, number>();
  for (const a of list) if (a.peakId !== undefined) count.set(a.peakId, (count.get(a.peakId) ?? 0) + 1);
  const out = list.map((a) => {
    if (a.peakId === undefined) return a;
    const n = count.get(a.peakId) ?? 0;
    if (n > 1 && !a.isBlended) return { ...a, isBlended: true };
    if (n === 1 && a.peakId === releasedPeakId && a.isBlended) return { ...a, isBlended: false };
    return a;
  });
  return { list: out, count };
}

/** Editable fields of an assignment. */
export type AssignmentPatch = Partial<Pick<Assignment, 'uncertaintyCm1' | 'isExcluded' | 'isBlended' | 'note' | 'observedCm1'>>;

/**
 * Change fields of one assignment.
 * @throws naming the field when the uncertainty is not > 0 or the position not finite
 */
export function assignmentsUpdate(list: readonly Assignment[], id: string, patch: AssignmentPatch): Assignment[] {
  if (patch.uncertaintyCm1 !== undefined && !(patch.uncertaintyCm1 > 0 && Number.isFinite(patch.uncertaintyCm1))) {
    throw new Error(`uncertainty must be a number > 0 cm⁻¹, got ${patch.uncertaintyCm1}`);
  }
  if (patch.observedCm1 !== undefined && !Number.isFinite(patch.observedCm1)) {
    throw new Error(`observed position must be a finite number, got ${patch.observedCm1}`);
  }
  if (!list.some((a) => a.id === id)) throw new Error(`no assignment with id ${id}`);
  return list.map((a) => (a.id === id ? { ...a, ...patch } : a));
}

/** Remove assignments by id (blend flags of the peaks they leave are recomputed). */
export function assignmentsRemove(list: readonly Assignment[], ids: readonly string[]): Assignment[] {
  const drop = new Set(ids);
  const released = list.filter((a) => drop.has(a.id)).map((a) => a.peakId);
  let out = list.filter((a) => !drop.has(a.id));
  for (const p of released) if (p !== undefined) out = assignmentsMarkBlends(out, p);
  return out;
}

/** How far an observation is from its prediction. */
export interface AssignmentDeviation {
  /** obs − calc, cm^-1. */
  omcCm1: number;
  /** |obs − calc| / √(σ_obs² + σ_pred²), null without a fit. */
  omcSigma: number | null;
  /** Beyond 3σ (with a fit) or beyond the tolerance (without one). */
  isFar: boolean;
}

/**
 * Judge an assignment against its prediction: with a fit (σ_pred known), far means
 * |o − c| > 3√(σ_obs² + σ_pred²); without one, far means |o − c| > toleranceCm1.
 * Source: common practice (3σ rejection, e.g. Bevington & Robinson 2003, sec. 6.4, from memory).
 * @param observedCm1 observed, cm^-1
 * @param calcCm1 predicted, cm^-1
 * @param sigmaObsCm1 observation 1σ, cm^-1
 * @param sigmaPredCm1 prediction 1σ from the fit, cm^-1, or null without a fit
 * @param toleranceCm1 fallback tolerance, cm^-1
 */
export function assignmentDeviation(
  observedCm1: number,
  calcCm1: number,
  sigmaObsCm1: number,
  sigmaPredCm1: number | null,
  toleranceCm1: number,
): AssignmentDeviation {
  const omcCm1 = observedCm1 - calcCm1;
  if (sigmaPredCm1 !== null && Number.isFinite(sigmaPredCm1)) {
    const s = Math.hypot(sigmaObsCm1, sigmaPredCm1);
    const omcSigma = s > 0 ? Math.abs(omcCm1) / s : Infinity;
    return { omcCm1, omcSigma, isFar: omcSigma > 3 };
  }
  return { omcCm1, omcSigma: null, isFar: Math.abs(omcCm1) > toleranceCm1 };
}

/** A row of an imported line table that was refused, with where and why. */
export interface RefusedRow {
  /** 1-based line number in the file. */
  lineNumber: number;
  /** Plain words (the selection rule it breaks, naming the value). */
  reason: string;
}

/**
 * Split imported rows into those the band allows and those it cannot have (ΔK = ±2 in a
 * perpendicular band, K > J, …), by the rules of assignmentCheck (physics/transitionCheck), the
 * same the CLI applies to a line table.
 * @param rows parsed rows
 * @param lineNumbers file line number of each row (1-based)
 * @param model band type and rotor shape
 * @returns the rows kept (in order) and the refused ones with their line numbers and reasons
 */
export function assignmentsSplitAllowed<T extends TransitionQuanta>(
  rows: readonly T[],
  lineNumbers: readonly number[],
  model: Pick<BandModel, 'band' | 'shape'>,
): { kept: T[]; refused: RefusedRow[] } {
  const kept: T[] = [];
  const refused: RefusedRow[] = [];
  rows.forEach((r, i) => {
    const why = assignmentCheck(r, model);
    if (why) refused.push({ lineNumber: lineNumbers[i] ?? i + 1, reason: why });
    else kept.push(r);
  });
  return { kept, refused };
}
