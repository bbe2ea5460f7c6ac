/** The review list's pure helpers: status against the table, filter and order, what an accept may write. */
import { describe, expect, it } from 'vitest';
import type { Assignment } from '../../src/fit/assignment';
import type { Trace } from '../../src/io/trace';
import { peakIdAt } from '../../src/state/assignLogic';
import {
  assistantAcceptable,
  assistantAssignmentOf,
  assistantAssignmentsAdd,
  assistantBatchNumber,
  assistantItemsOf,
  assistantReviewRows,
  assistantSeriesChoices,
  assistantStatuses,
  type AssistantStatusContext,
} from '../../src/state/assistantLogic';
import type { AssistantBatch, AssistantReviewItem } from '../../src/state/assistantSlice';
import type { AssistantProposal } from '../../src/workers/assistantProtocol';

const trace: Trace = { wavenumberCm1: new Float64Array([1, 2]), absorbance: new Float64Array([0, 0]) };

function proposal(jLower: number, observedCm1: number, over: Partial<AssistantProposal> = {}): AssistantProposal {
  // rR0(J''): ΔK = +1, ΔJ = +1, K'' = 0.
  return {
    id: 'x',
    jUpper: jLower + 1,
    kUpper: 1,
    jLower,
    kLower: 0,
    observedCm1,
    uncertaintyCm1: 0.0004,
    predictedCm1: observedCm1 + 0.001,
    calcCm1: observedCm1 - 0.0002,
    distanceSigma: 0.5,
    isBlended: false,
    verdict: 'confident',
    reason: 'one peak within 3σ',
    doubt: '',
    ...over,
  };
}

const batch = (number: number, t: Trace | null = trace): AssistantBatch => ({
  number,
  kind: 'run',
  title: `run ${number}`,
  summary: '',
  doubt: null,
  warnings: [],
  ambiguous: [],
  fitSummary: null,
  trace: t,
});

function row(id: string, jLower: number, observedCm1: number, over: Partial<Assignment> = {}): Assignment {
  return {
    id,
    jUpper: jLower + 1,
    kUpper: 1,
    jLower,
    kLower: 0,
    observedCm1,
    uncertaintyCm1: 0.001,
    isBlended: false,
    isExcluded: false,
    note: '',
    peakId: peakIdAt(observedCm1),
    ...over,
  };
}

const items: AssistantReviewItem[] = assistantItemsOf(2, [
  proposal(1, 1000.5), // as2.1: open
  proposal(2, 1001.0), // as2.2: accepted (id in the table)
  proposal(3, 1001.5, { verdict: 'doubtful', doubt: 'obs − calc is 4σ' }), // as2.3: open, doubtful
  proposal(4, 1002.0), // as2.4: rejected
  proposal(5, 1002.5), // as2.5: rung in the table elsewhere
  proposal(6, 1003.0), // as2.6: peak taken by rR0(9)
  proposal(7, 1003.5, { verdict: 'excluded', doubt: 'excluded in iteration 3' }), // as2.7
]);

const ctx: AssistantStatusContext = {
  assignments: [row('as2.2', 2, 1001.0), row('h1', 5, 1002.7), row('h2', 9, 1003.0)],
  rejectedIds: ['as2.4'],
  batches: [batch(2)],
  trace,
  shape: 'prolate',
};

describe('assistant review logic', () => {
  it('gives page-unique ids per batch and skips batch numbers the table already uses', () => {
    expect(items.map((p) => p.id)).toEqual(['as2.1', 'as2.2', 'as2.3', 'as2.4', 'as2.5', 'as2.6', 'as2.7']);
    expect(assistantBatchNumber(2, ctx.assignments)).toBe(3);
    expect(assistantBatchNumber(4, ctx.assignments)).toBe(4);
  });

  it('judges each proposal against the table, saying why where it cannot simply be accepted', () => {
    const st = assistantStatuses(items, ctx);
    expect(st.map((s) => s.status)).toEqual(['open', 'accepted', 'open', 'rejected', 'rung-taken', 'peak-taken', 'open']);
    expect(st[4].note).toBe('the table already has rR0(5) at 1002.7000 cm⁻¹');
    expect(st[5].note).toBe('the peak already carries rR0(9): accepting makes both a blend');
    const stale = assistantStatuses(items, { ...ctx, trace: { ...trace } });
    expect(stale[0]).toEqual({ status: 'stale', note: 'proposed on another trace: run the assistant again' });
    // Accepted and rejected are decided before staleness.
    expect(stale[1].status).toBe('accepted');
  });

  it('filters and orders the rows', () => {
    const ids = (f: Parameters<typeof assistantReviewRows>[2], s: Parameters<typeof assistantReviewRows>[3] = 'position') =>
      assistantReviewRows(items, ctx, f, s).map((r) => r.item.id);
    expect(ids('open')).toEqual(['as2.1', 'as2.3', 'as2.6', 'as2.7']);
    expect(ids('confident')).toEqual(['as2.1', 'as2.6']);
    expect(ids('doubtful')).toEqual(['as2.3', 'as2.7']);
    expect(ids('accepted')).toEqual(['as2.2']);
    expect(ids('rejected')).toEqual(['as2.4']);
    expect(ids('all')).toHaveLength(7);
    expect(ids('all', 'label')).toEqual(['as2.1', 'as2.2', 'as2.3', 'as2.4', 'as2.5', 'as2.6', 'as2.7']);
    const far = assistantItemsOf(3, [
      proposal(1, 1010, { distanceSigma: 2.5, calcCm1: 1010.01 }),
      proposal(2, 1011, { distanceSigma: NaN }),
    ]);
    const rows = assistantReviewRows([...items, ...far], { ...ctx, batches: [batch(2), batch(3)] }, 'all', 'sigma');
    expect(rows[0].item.id).toBe('as3.1');
    expect(rows[rows.length - 1].item.id).toBe('as3.2');
    const omc = assistantReviewRows(far, { ...ctx, batches: [batch(3)] }, 'all', 'omc');
    expect(omc[0].omcCm1).toBeCloseTo(-0.01, 9);
  });

  it('accept all takes only open confident proposals; accepting one takes doubtful and peak-sharing ones too', () => {
    const all = assistantAcceptable(
      items,
      items.map((p) => p.id),
      ctx,
      'all',
    );
    expect(all.take.map((p) => p.id)).toEqual(['as2.1']);
    expect(all.skipped.map((s) => s.item.id)).toEqual(['as2.3', 'as2.4', 'as2.5', 'as2.6', 'as2.7']);
    expect(all.skipped.find((s) => s.item.id === 'as2.3')!.why).toBe('obs − calc is 4σ');
    const one = assistantAcceptable(items, ['as2.3', 'as2.6', 'as2.7', 'as2.5', 'as2.4'], ctx, 'one');
    expect(one.take.map((p) => p.id)).toEqual(['as2.3', 'as2.6', 'as2.7']);
    expect(one.skipped.map((s) => s.why)).toEqual(['rejected', 'the table already has rR0(5) at 1002.7000 cm⁻¹']);
  });

  it('never writes the same transition twice in one accept', () => {
    const twice = assistantItemsOf(5, [proposal(8, 1004), proposal(8, 1004.4)]);
    const r = assistantAcceptable(twice, ['as5.1', 'as5.2'], { ...ctx, batches: [batch(5)] }, 'one');
    expect(r.take.map((p) => p.id)).toEqual(['as5.1']);
    expect(r.skipped[0].why).toMatch(/proposed twice/);
  });

  it('an accepted proposal becomes a table row with its own id, position, σ and a short note; a shared peak marks both blended', () => {
    const a = assistantAssignmentOf(items[0], 'run 2');
    expect(a).toEqual({
      id: 'as2.1',
      jUpper: 2,
      kUpper: 1,
      jLower: 1,
      kLower: 0,
      observedCm1: 1000.5,
      uncertaintyCm1: 0.0004,
      isBlended: false,
      isExcluded: false,
      note: 'assistant run 2, 0.5σ from its prediction',
      peakId: peakIdAt(1000.5),
    });
    const out = assistantAssignmentsAdd(ctx.assignments, [items[5]], (n) => `run ${n}`);
    expect(out).toHaveLength(4);
    expect(out.filter((x) => x.isBlended).map((x) => x.id)).toEqual(['h2', 'as2.6']);
  });

  it('lists the table’s series with at least three lines (excluded rows not counted), in ΔK, K″, ΔJ order', () => {
    const rows = [
      row('a', 1, 1000),
      row('b', 2, 1000.5),
      row('c', 3, 1001),
      row('d', 4, 1001.5, { isExcluded: true }),
      // pP2(J''): ΔK = −1, ΔJ = −1, K'' = 2.
      ...[5, 6, 7].map((j, n) => row(`p${n}`, j, 990 + n, { jUpper: j - 1, kUpper: 1, kLower: 2 })),
      row('q', 5, 980, { jUpper: 5, kUpper: 1 }),
    ];
    expect(assistantSeriesChoices(rows, 'prolate')).toEqual([
      { key: '-1:2:-1', deltaK: -1, kLower: 2, deltaJ: -1, label: 'pP2', count: 3 },
      { key: '1:0:1', deltaK: 1, kLower: 0, deltaJ: 1, label: 'rR0', count: 3 },
    ]);
    expect(assistantSeriesChoices(rows, 'prolate', 4)).toEqual([]);
  });
});
