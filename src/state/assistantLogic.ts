/**
 * Pure helpers behind the assistant's review list: where each proposal stands against the table,
 * the rows the list shows, which proposals an accept may write, and the assignments they become.
 * Status is derived from the table every time (never stored), so undo and redo of an accept show
 * at once in the list.
 */
import type { Assignment } from '../fit/assignment';
import type { Trace } from '../io/trace';
import { seriesLabelAscii } from '../physics/lineLabel';
import type { TopShape } from '../physics/model';
import type { AssistantProposal } from '../workers/assistantProtocol';
import { assignmentsMarkBlends, peakIdAt } from './assignLogic';
import type { AssistantBatch, AssistantReviewFilter, AssistantReviewItem, AssistantReviewSort } from './assistantSlice';
import { quantaKey } from './candidateRank';
import { quantaLabel } from './selectors';

/**
 * Where a proposal stands.
 * - 'open': waiting for a decision;
 * - 'accepted': in the table (under its own id);
 * - 'rejected': rejected in this review;
 * - 'rung-taken': the table already has this transition (at another position): cannot be accepted;
 * - 'peak-taken': another table line sits on this peak: accepting makes a blend (one at a time only);
 * - 'stale': made on another trace: cannot be accepted.
 */
export type AssistantItemStatus = 'open' | 'accepted' | 'rejected' | 'rung-taken' | 'peak-taken' | 'stale';

/** A row of the review list. */
export interface AssistantReviewRow {
  item: AssistantReviewItem;
  labelAscii: string;
  status: AssistantItemStatus;
  /** Why the status (for 'rung-taken', 'peak-taken', 'stale'), else ''. */
  statusNote: string;
  /** observed − calculated, cm^-1 (NaN without a calculation). */
  omcCm1: number;
}

/** What the status of proposals is judged against. */
export interface AssistantStatusContext {
  assignments: readonly Assignment[];
  rejectedIds: readonly string[];
  batches: readonly AssistantBatch[];
  /** The page's trace now. */
  trace: Trace | null;
  shape: TopShape;
}

/** Two positions name the same peak when this close, cm^-1 (peak ids carry 1e-5 cm^-1). */
const SAME_PEAK_CM1 = 2e-5;

/**
 * Status of every proposal against the table (one pass over the table).
 * @returns a status and note per item, in the items' order
 */
export function assistantStatuses(
  items: readonly AssistantReviewItem[],
  ctx: AssistantStatusContext,
): { status: AssistantItemStatus; note: string }[] {
  const ids = new Set(ctx.assignments.map((a) => a.id));
  const byQuanta = new Map(ctx.assignments.map((a) => [quantaKey(a), a]));
  const byPeak = new Map<string, Assignment>();
  for (const a of ctx.assignments) byPeak.set(a.peakId ?? peakIdAt(a.observedCm1), a);
  const rejected = new Set(ctx.rejectedIds);
  const traceOf = new Map(ctx.batches.map((b) => [b.number, b.trace]));
  return items.map((it) => {
    if (ids.has(it.id)) return { status: 'accepted', note: '' };
    if (rejected.has(it.id)) return { status: 'rejected', note: '' };
    if (traceOf.get(it.batch) !== ctx.trace) return { status: 'stale', note: 'proposed on another trace: run the assistant again' };
    const same = byQuanta.get(quantaKey(it));
    if (same) {
      return {
        status: 'rung-taken',
        note: `the table already has ${quantaLabel(it, ctx.shape)} at ${same.observedCm1.toFixed(4)} cm⁻¹`,
      };
    }
    const onPeak = byPeak.get(peakIdAt(it.observedCm1));
    if (onPeak && Math.abs(onPeak.observedCm1 - it.observedCm1) <= SAME_PEAK_CM1) {
      return {
        status: 'peak-taken',
        note: `the peak already carries ${quantaLabel(onPeak, ctx.shape)}: accepting makes both a blend`,
      };
    }
    return { status: 'open', note: '' };
  });
}

/**
 * The rows of the review list, filtered and sorted.
 * @param filter 'open' (open and peak-taken), 'confident'/'doubtful' (open ones of that verdict;
 *   'doubtful' includes 'excluded'), 'accepted', 'rejected', 'all'
 * @param sort by position, label (ΔK, K″, ΔJ, J″), σ distance (largest first) or |o − c| (largest first)
 */
export function assistantReviewRows(
  items: readonly AssistantReviewItem[],
  ctx: AssistantStatusContext,
  filter: AssistantReviewFilter,
  sort: AssistantReviewSort,
): AssistantReviewRow[] {
  const statuses = assistantStatuses(items, ctx);
  const rows: AssistantReviewRow[] = items.map((item, i) => ({
    item,
    labelAscii: quantaLabel(item, ctx.shape),
    status: statuses[i].status,
    statusNote: statuses[i].note,
    omcCm1: item.observedCm1 - item.calcCm1,
  }));
  const isOpen = (r: AssistantReviewRow) => r.status === 'open' || r.status === 'peak-taken';
  const keep = (r: AssistantReviewRow): boolean => {
    switch (filter) {
      case 'open':
        return isOpen(r);
      case 'confident':
        return isOpen(r) && r.item.verdict === 'confident';
      case 'doubtful':
        return isOpen(r) && r.item.verdict !== 'confident';
      case 'accepted':
        return r.status === 'accepted';
      case 'rejected':
        return r.status === 'rejected';
      default:
        return true;
    }
  };
  const out = rows.filter(keep);
  const nanLast = (v: number) => (Number.isFinite(v) ? v : -Infinity);
  const by: Record<AssistantReviewSort, (a: AssistantReviewRow, b: AssistantReviewRow) => number> = {
    position: (a, b) => a.item.observedCm1 - b.item.observedCm1,
    label: (a, b) =>
      a.item.kUpper - a.item.kLower - (b.item.kUpper - b.item.kLower) ||
      a.item.kLower - b.item.kLower ||
      a.item.jUpper - a.item.jLower - (b.item.jUpper - b.item.jLower) ||
      a.item.jLower - b.item.jLower,
    sigma: (a, b) => nanLast(b.item.distanceSigma) - nanLast(a.item.distanceSigma),
    omc: (a, b) => nanLast(Math.abs(b.omcCm1)) - nanLast(Math.abs(a.omcCm1)),
  };
  return out.sort(by[sort]);
}

/**
 * Which of the given proposals an accept writes.
 * @param mode 'one': open or peak-taken proposals of any verdict (the user looked at each);
 *   'all': only open, confident proposals (doubtful, excluded and peak-sharing ones wait for a
 *   one-by-one decision)
 * @returns the items to write and, for the others, why not
 */
export function assistantAcceptable(
  items: readonly AssistantReviewItem[],
  ids: readonly string[],
  ctx: AssistantStatusContext,
  mode: 'one' | 'all',
): { take: AssistantReviewItem[]; skipped: { item: AssistantReviewItem; why: string }[] } {
  const want = new Set(ids);
  const chosen = items.filter((it) => want.has(it.id));
  const statuses = assistantStatuses(chosen, ctx);
  const take: AssistantReviewItem[] = [];
  const skipped: { item: AssistantReviewItem; why: string }[] = [];
  const seen = new Set<string>();
  chosen.forEach((it, i) => {
    const { status, note } = statuses[i];
    const key = quantaKey(it);
    if (status === 'accepted') return;
    if (status === 'rejected') skipped.push({ item: it, why: 'rejected' });
    else if (status === 'stale' || status === 'rung-taken') skipped.push({ item: it, why: note });
    else if (mode === 'all' && status === 'peak-taken') skipped.push({ item: it, why: note });
    else if (mode === 'all' && it.verdict !== 'confident') skipped.push({ item: it, why: it.doubt || it.verdict });
    else if (seen.has(key)) skipped.push({ item: it, why: 'the same transition is proposed twice; accept one of them' });
    else {
      seen.add(key);
      take.push(it);
    }
  });
  return { take, skipped };
}

/** An accepted proposal as a table row: its id, quanta, position, σ; a short note saying where it came from. */
export function assistantAssignmentOf(item: AssistantProposal & { band?: string; species?: string }, batchTitle: string): Assignment {
  const dist = Number.isFinite(item.distanceSigma) ? `, ${item.distanceSigma.toFixed(1)}σ from its prediction` : '';
  return {
    id: item.id,
    jUpper: item.jUpper,
    kUpper: item.kUpper,
    jLower: item.jLower,
    kLower: item.kLower,
    observedCm1: item.observedCm1,
    uncertaintyCm1: item.uncertaintyCm1,
    isBlended: item.isBlended,
    isExcluded: false,
    note: `assistant ${batchTitle}${dist}${item.isBlended ? ', possible blend' : ''}`,
    peakId: peakIdAt(item.observedCm1),
    ...(item.band !== undefined && item.species !== undefined ? { band: item.band, species: item.species } : {}),
  };
}

/** The table with the items appended (blend flags of shared peaks recomputed). */
export function assistantAssignmentsAdd(
  assignments: readonly Assignment[],
  items: readonly AssistantReviewItem[],
  titleOf: (batch: number) => string,
): Assignment[] {
  return assignmentsMarkBlends([...assignments, ...items.map((it) => assistantAssignmentOf(it, titleOf(it.batch)))]);
}

/**
 * Give a job's proposals page-unique ids ("as3.12": batch 3, proposal 12) and their batch number.
 * @param batch a number from assistantBatchNumber (no table id starts with "as{batch}.")
 */
export function assistantItemsOf(batch: number, proposals: readonly AssistantProposal[]): AssistantReviewItem[] {
  return proposals.map((p, i) => ({ ...p, id: `as${batch}.${i + 1}`, batch }));
}

/** The first batch number ≥ from whose ids ("as{n}.") no table row uses. */
export function assistantBatchNumber(from: number, assignments: readonly Assignment[]): number {
  let n = from;
  while (assignments.some((a) => a.id.startsWith(`as${n}.`))) n++;
  return n;
}

/** A sub-branch series of the table that can be extended. */
export interface AssistantSeriesChoice {
  /** "ΔK:K″:ΔJ", e.g. "1:3:0". */
  key: string;
  deltaK: number;
  kLower: number;
  deltaJ: number;
  /** ASCII series label, e.g. "rQ3". */
  label: string;
  /** Lines of the table in it. */
  count: number;
}

/**
 * The table's series with at least minLines lines (a series extension needs 3), in label order.
 * @param minLines @default 3
 */
export function assistantSeriesChoices(assignments: readonly Assignment[], shape: TopShape, minLines = 3): AssistantSeriesChoice[] {
  const m = new Map<string, AssistantSeriesChoice>();
  for (const a of assignments) {
    if (a.isExcluded) continue;
    const deltaK = a.kUpper - a.kLower;
    const deltaJ = a.jUpper - a.jLower;
    const key = `${deltaK}:${a.kLower}:${deltaJ}`;
    const c = m.get(key);
    if (c) c.count++;
    else m.set(key, { key, deltaK, kLower: a.kLower, deltaJ, label: seriesLabelAscii(deltaK, deltaJ, a.kLower, shape), count: 1 });
  }
  return [...m.values()]
    .filter((c) => c.count >= minLines)
    .sort((x, y) => x.deltaK - y.deltaK || x.kLower - y.kLower || x.deltaJ - y.deltaJ);
}
