/**
 * The assistant's panel: start a run (from the table's lines, or from the model alone), cancel it,
 * review its proposals (accept, reject, accept all confident), check the table for misassignments
 * and extend the selected series. Reads a few selectors and calls actions; no decisions of its own.
 */
import { useDeferredValue, useMemo, useState } from 'react';
import { useShallow } from 'zustand/react/shallow';
import { formatFixed } from '../io/numberFormat';
import { seriesLabelAscii } from '../physics/lineLabel';
import {
  assistantAccept,
  assistantAcceptAll,
  assistantCancel,
  assistantExtendStart,
  assistantHuntStart,
  assistantReject,
  assistantReopen,
  assistantRunStart,
  assistantSelect,
  assistantSetView,
  assistantStatusContextOf,
  assistantSuspectRemove,
  assistantSuspectReview,
} from '../state/actionsAssistant';
import { assistantReviewRows, assistantSeriesChoices, type AssistantItemStatus, type AssistantReviewRow } from '../state/assistantLogic';
import type { AssistantBatch, AssistantReviewFilter, AssistantReviewSort } from '../state/assistantSlice';
import { selectPeaks } from '../state/selectors';
import { useBench } from '../state/store';
import './AssistantPanel.css';
import { LineLabel } from './LineLabel';

/** Most rows drawn at once (a longer list says how many more there are; narrow the filter). */
const ROWS_SHOWN = 400;

const FILTERS: { id: AssistantReviewFilter; label: string }[] = [
  { id: 'open', label: 'waiting for a decision' },
  { id: 'confident', label: 'confident, waiting' },
  { id: 'doubtful', label: 'doubtful or excluded, waiting' },
  { id: 'accepted', label: 'accepted' },
  { id: 'rejected', label: 'rejected' },
  { id: 'all', label: 'all' },
];

const SORTS: { id: AssistantReviewSort; label: string }[] = [
  { id: 'position', label: 'wavenumber' },
  { id: 'label', label: 'sub-branch and J″' },
  { id: 'sigma', label: 'σ distance, largest first' },
  { id: 'omc', label: '|o − c|, largest first' },
];

const STATUS_TEXT: Record<AssistantItemStatus, string> = {
  open: 'waiting',
  accepted: 'accepted',
  rejected: 'rejected',
  'rung-taken': 'conflict: already in the table',
  'peak-taken': 'conflict: peak taken',
  stale: 'stale',
};

function JobBar() {
  const job = useBench((s) => s.assistantJob);
  const assignments = useBench((s) => s.assignments);
  const shape = useBench((s) => s.model.shape);
  const hasTrace = useBench((s) => s.trace !== null);
  const peaks = useBench((s) => selectPeaks(s));
  const selectedSeries = useBench((s) => {
    const q = s.cursor ?? s.assignments.find((a) => a.id === s.selectedAssignmentId);
    return q ? seriesLabelAscii(q.kUpper - q.kLower, q.jUpper - q.jLower, q.kLower, s.model.shape) : null;
  });
  const choices = useMemo(() => assistantSeriesChoices(assignments, shape), [assignments, shape]);
  // '' = the series of the selected rung or table row.
  const [seriesKey, setSeriesKey] = useState('');
  const chosen = choices.find((c) => c.key === seriesKey) ?? null;
  const extendName = chosen ? chosen.label : selectedSeries;
  const nTable = assignments.length;
  const isBusy = job !== null;
  const peakText = !hasTrace
    ? 'No trace loaded.'
    : peaks.error
      ? `Peak finding failed: ${peaks.error}`
      : peaks.peaks
        ? `${peaks.peaks.count} peaks found.`
        : 'Peaks are being found…';
  return (
    <div className="helper-bar">
      <button type="button" className="primary" onClick={() => void assistantRunStart()} disabled={isBusy} data-testid="helper-run">
        Run the assistant
      </button>
      <button type="button" onClick={() => void assistantHuntStart()} disabled={isBusy || nTable === 0} data-testid="helper-hunt">
        Check the table for misassignments
      </button>
      <span className="helper-extend">
        <select
          value={chosen ? chosen.key : ''}
          onChange={(e) => setSeriesKey(e.target.value)}
          aria-label="Series to extend"
          data-testid="helper-series"
        >
          <option value="">series of the selected rung or row{selectedSeries ? ` (${selectedSeries})` : ''}</option>
          {choices.map((c) => (
            <option key={c.key} value={c.key}>
              {c.label} ({c.count} lines)
            </option>
          ))}
        </select>
        <button
          type="button"
          onClick={() => void assistantExtendStart(undefined, chosen ?? undefined)}
          disabled={isBusy || extendName === null}
          title={
            extendName
              ? `Predict further rungs of ${extendName} and match them to peaks (needs 3 lines of it in the table)`
              : 'Select a rung (on the plot) or a table row, or choose a series'
          }
          data-testid="helper-extend"
        >
          Extend {extendName ?? 'a series'}
        </button>
      </span>
      {job ? (
        <span className="helper-progress" role="status" data-testid="helper-progress">
          <button type="button" onClick={assistantCancel} data-testid="helper-cancel">
            Cancel
          </button>{' '}
          Working: {job.what}
          {job.round > 0 ? ` — ${job.stage}; ${job.rowsSoFar} line(s) proposed so far` : ` — ${job.stage}`}
        </span>
      ) : (
        <span className="muted small" data-testid="helper-start">
          {peakText} A run starts from{' '}
          {nTable > 0 ? `the ${nTable} line${nTable === 1 ? '' : 's'} of the table` : 'the model alone (the table is empty)'}; its proposals
          wait here and enter the table only when accepted.
        </span>
      )}
    </div>
  );
}

function BatchNotes({ batch }: { batch: AssistantBatch }) {
  return (
    <div className="helper-batch" data-testid="helper-batch">
      <p>
        <strong>{batch.title}.</strong> {batch.summary}
        {batch.fitSummary ? ` Final fit: ${batch.fitSummary}.` : ''}
      </p>
      {batch.doubt && (
        <p className="bad" role="alert">
          In doubt as a whole: {batch.doubt}. Every proposal of it is marked doubtful; accept none without checking.
        </p>
      )}
      {batch.warnings.length > 0 && (
        <details>
          <summary>{batch.warnings.length} note(s) from the assistant</summary>
          <ul className="helper-notes">
            {batch.warnings.map((w, i) => (
              <li key={i}>{w}</li>
            ))}
          </ul>
        </details>
      )}
      {batch.ambiguous.length > 0 && (
        <details>
          <summary>{batch.ambiguous.length} case(s) left undecided (not proposed)</summary>
          <ul className="helper-notes">
            {batch.ambiguous.map((w, i) => (
              <li key={i}>{w}</li>
            ))}
          </ul>
        </details>
      )}
    </div>
  );
}

function sigmaText(v: number): string {
  return Number.isFinite(v) ? `${Math.abs(v) < 10 ? v.toFixed(2) : v.toFixed(1)}σ` : '—';
}

function ReviewRow({ row, shape, isSelected }: { row: AssistantReviewRow; shape: 'prolate' | 'oblate' | 'linear'; isSelected: boolean }) {
  const { item, status } = row;
  const canAccept = status === 'open' || status === 'peak-taken';
  return (
    <tr
      className={`helper-row verdict-${item.verdict}${isSelected ? ' selected' : ''}`}
      onClick={() => assistantSelect(isSelected ? null : item.id)}
      data-testid="helper-row"
      data-label={row.labelAscii}
      data-status={status}
      data-verdict={item.verdict}
      data-observed={item.observedCm1}
    >
      <td title={item.reason}>
        <LineLabel q={item} shape={shape} />
      </td>
      <td className="num">{formatFixed(item.observedCm1, 5)}</td>
      <td className="num">{Number.isFinite(item.calcCm1) ? formatFixed(item.calcCm1, 5) : '—'}</td>
      <td className="num">{Number.isFinite(row.omcCm1) ? formatFixed(row.omcCm1, 5) : '—'}</td>
      <td className="num">{sigmaText(item.distanceSigma)}</td>
      <td>
        {item.verdict}
        {item.isBlended ? ', possible blend' : ''}
      </td>
      <td title={row.statusNote}>{STATUS_TEXT[status]}</td>
      <td className="helper-why">
        {row.statusNote && status !== 'open' ? `${row.statusNote}. ` : ''}
        {item.doubt}
      </td>
      <td className="helper-actions" onClick={(e) => e.stopPropagation()}>
        {canAccept && (
          <button type="button" onClick={() => assistantAccept([item.id])} data-testid="helper-accept">
            Accept
          </button>
        )}
        {canAccept && (
          <button type="button" onClick={() => assistantReject([item.id])} data-testid="helper-reject">
            Reject
          </button>
        )}
        {status === 'rejected' && (
          <button type="button" onClick={() => assistantReopen([item.id])}>
            Reopen
          </button>
        )}
      </td>
    </tr>
  );
}

function ReviewList() {
  const items = useBench((s) => s.assistantProposals);
  const ctx = useBench(useShallow(assistantStatusContextOf));
  const filter = useBench((s) => s.assistantFilter);
  const sort = useBench((s) => s.assistantSort);
  const selectedId = useBench((s) => s.assistantSelectedId);
  const batches = useBench((s) => s.assistantBatches);
  // Hundreds of rows render as a transition (sliced, interruptible), so a run's result or an accept
  // never holds the page in one long task; the list catches up a frame or two later.
  const deferred = useDeferredValue(useMemo(() => ({ items, ctx, filter, sort }), [items, ctx, filter, sort]));
  const rows = useMemo(() => assistantReviewRows(deferred.items, deferred.ctx, deferred.filter, deferred.sort), [deferred]);
  const confidentOpen = useMemo(() => assistantReviewRows(items, ctx, 'confident', 'position').length, [items, ctx]);
  const selected = items.find((p) => p.id === selectedId);
  if (items.length === 0) return null;
  return (
    <div className="helper-review">
      {batches.map((b) => (
        <BatchNotes key={b.number} batch={b} />
      ))}
      <div className="helper-review-bar">
        <label>
          Show{' '}
          <select
            value={filter}
            onChange={(e) => assistantSetView({ filter: e.target.value as AssistantReviewFilter })}
            data-testid="helper-filter"
          >
            {FILTERS.map((f) => (
              <option key={f.id} value={f.id}>
                {f.label}
              </option>
            ))}
          </select>
        </label>
        <label>
          Order by{' '}
          <select value={sort} onChange={(e) => assistantSetView({ sort: e.target.value as AssistantReviewSort })}>
            {SORTS.map((f) => (
              <option key={f.id} value={f.id}>
                {f.label}
              </option>
            ))}
          </select>
        </label>
        <button type="button" onClick={assistantAcceptAll} disabled={confidentOpen === 0} data-testid="helper-accept-all">
          Accept all confident ({confidentOpen})
        </button>
        <span className="muted small">
          Accept all takes only the confident proposals; doubtful, excluded and conflicting ones are accepted one by one. Undo takes back
          the accepts of one run in one step.
        </span>
      </div>
      <table className="helper-table" data-testid="helper-table">
        <thead>
          <tr>
            <th>Line</th>
            <th>obs / cm⁻¹</th>
            <th>calc / cm⁻¹</th>
            <th>o − c / cm⁻¹</th>
            <th title="Distance from the prediction when proposed, in σ of the pair">σ distance</th>
            <th>Assistant</th>
            <th>Status</th>
            <th>Reason for doubt</th>
            <th />
          </tr>
        </thead>
        <tbody>
          {rows.slice(0, ROWS_SHOWN).map((r) => (
            <ReviewRow key={r.item.id} row={r} shape={ctx.shape} isSelected={r.item.id === selectedId} />
          ))}
        </tbody>
      </table>
      {rows.length === 0 && <p className="muted">No proposal matches this filter.</p>}
      {rows.length > ROWS_SHOWN && (
        <p className="muted">{rows.length - ROWS_SHOWN} more not shown; narrow the filter or change the order.</p>
      )}
      {selected && (
        <p className="helper-detail" data-testid="helper-detail">
          Why proposed: {selected.reason}
        </p>
      )}
    </div>
  );
}

function HuntList() {
  const hunt = useBench((s) => s.assistantHunt);
  const assignments = useBench((s) => s.assignments);
  const trace = useBench((s) => s.trace);
  const inTable = useMemo(() => new Set(assignments.map((a) => a.id)), [assignments]);
  if (!hunt) return null;
  const isStale = hunt.trace !== trace;
  return (
    <div className="helper-hunt" data-testid="helper-hunt-list">
      <h3>Misassignment check of {hunt.nChecked} table lines</h3>
      {isStale && <p className="bad small">Made on another trace: run the check again before acting on it.</p>}
      <p className="muted small">
        {hunt.fitSummary}. {hunt.suspects.length === 0 ? 'No line is suspect.' : `${hunt.suspects.length} suspect(s), worst first:`}
      </p>
      {hunt.notes.length > 0 && (
        <details>
          <summary>{hunt.notes.length} note(s)</summary>
          <ul className="helper-notes">
            {hunt.notes.map((n, i) => (
              <li key={i}>{n}</li>
            ))}
          </ul>
        </details>
      )}
      {hunt.suspects.length > 0 && (
        <table className="helper-table">
          <thead>
            <tr>
              <th>Line</th>
              <th>obs / cm⁻¹</th>
              <th>o − c / cm⁻¹</th>
              <th>in σ</th>
              <th>Why suspect</th>
              <th>Would also fit</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {hunt.suspects.map((x) => (
              <tr key={x.id} data-testid="helper-suspect">
                <td>{x.label}</td>
                <td className="num">{formatFixed(x.observedCm1, 4)}</td>
                <td className="num">{formatFixed(x.obsMinusCalcCm1, 5)}</td>
                <td className="num">{sigmaText(x.normalisedResidual)}</td>
                <td className="helper-why">{x.reasons.join('; ')}</td>
                <td className="helper-why">
                  {x.alternativeRungs
                    .slice(0, 3)
                    .map((a) => `${a.label}${a.isAssignedElsewhere ? ' (assigned elsewhere)' : ''}`)
                    .join(', ') || '—'}
                </td>
                <td className="helper-actions">
                  {isStale ? null : inTable.has(x.id) ? (
                    <>
                      <button type="button" onClick={() => assistantSuspectReview(x.id)}>
                        Review
                      </button>
                      <button
                        type="button"
                        onClick={() => assistantSuspectRemove(x.id)}
                        title={`Delete it from the table (Undo brings it back)`}
                      >
                        Remove
                      </button>
                    </>
                  ) : (
                    <span className="muted">removed from the table</span>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}

export function AssistantPanel() {
  return (
    <div className="helper" data-testid="helper-panel">
      <JobBar />
      <ReviewList />
      <HuntList />
    </div>
  );
}
