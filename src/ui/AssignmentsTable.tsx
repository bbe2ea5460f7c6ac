/** The assignments table: windowed rows (fixed height, tableWindow.ts), sort and filter, inline edits; a row click zooms the plot to the line. */
import { memo, useCallback, useEffect, useLayoutEffect, useMemo, useRef, useState } from 'react';
import { formatFixed } from '../io/numberFormat';
import type { TransitionQuanta } from '../physics/model';
import { assignmentDelete, assignmentEdit, assignmentSelect } from '../state/actionsAssign';
import { benchUpdate } from '../state/actionsCore';
import { viewSetTableQuery } from '../state/actionsView';
import { quantaLabel, selectAssignmentRows, type AssignmentRow } from '../state/selectors';
import { useBench } from '../state/store';
import { selectAssignmentSymmetryOf, selectHasAssignmentSymmetry } from '../state/selectorsSystem';
import { tableRowsQueryMemo } from '../state/tableQuery';
import type { TableQuery } from '../state/viewSlice';
import { LineLabel } from './LineLabel';
import { NumberField } from './NumberField';
import { rowWindow, scrollTopShowing } from './tableWindow';

const ROW_HEIGHT = 30;

/** Rows rendered above and below the visible ones (a fast scroll shows them before the next render). */
const OVERSCAN_ROWS = 8;

const NOTHING_TICKED: string[] = [];

const COLUMNS: { key: TableQuery['sortKey'] | null; label: string; className?: string; title?: string }[] = [
  { key: null, label: '' },
  { key: 'label', label: 'Line' },
  { key: null, label: 'Γ′ ← Γ″', className: 'c-sym', title: 'symmetry of the upper ← lower level (species, or the A1/A2, s/a member)' },
  { key: 'jLower', label: 'J′ K′ ← J″ K″' },
  { key: 'obs', label: 'obs / cm⁻¹', className: 'num' },
  { key: 'calc', label: 'calc / cm⁻¹', className: 'num' },
  { key: 'omc', label: 'o − c / cm⁻¹', className: 'num' },
  { key: null, label: 'σ / cm⁻¹', className: 'c-sigma' },
  { key: null, label: 'Excl.' },
  { key: null, label: 'Blend' },
  { key: null, label: 'Note' },
  { key: null, label: '' },
];

function quanta(r: AssignmentRow): TransitionQuanta {
  return { jUpper: r.a.jUpper, kUpper: r.a.kUpper, jLower: r.a.jLower, kLower: r.a.kLower };
}

function NoteField({ id, note, name }: { id: string; note: string; name: string }) {
  const [draft, setDraft] = useState(note);
  const [isFocused, setFocused] = useState(false);
  return (
    <input
      type="text"
      className="note"
      aria-label={`Note for ${name}`}
      value={isFocused ? draft : note}
      maxLength={500}
      onFocus={() => (setDraft(note), setFocused(true))}
      onChange={(e) => {
        setDraft(e.target.value);
        assignmentEdit(id, { note: e.target.value });
      }}
      onBlur={() => setFocused(false)}
      onClick={(e) => e.stopPropagation()}
    />
  );
}

// Memoised: rows keep their objects while unchanged (selectAssignmentRows), so a new assignment
// re-renders only the rows whose data or position changed.
const Row = memo(function Row({
  r,
  isSelected,
  isChecked,
  onCheck,
  shape,
  top,
  symmetry,
  hasSymmetry,
}: {
  r: AssignmentRow;
  /** The levels' symmetry ("A2 ← A1"), '' when unknown. */
  symmetry: string;
  /** The table has the symmetry column (some row has a symmetry). */
  hasSymmetry: boolean;
  isSelected: boolean;
  /** Ticked for "delete selected". */
  isChecked: boolean;
  /** Tick or untick; shift extends from the last tick (a range). */
  onCheck: (id: string, isChecked: boolean, isRange: boolean) => void;
  shape: 'prolate' | 'oblate' | 'linear';
  top: number;
}) {
  const a = r.a;
  // Rows are named by their line in labels (screen readers), never by the internal id.
  const name = quantaLabel(quanta(r), shape);
  const flags = [r.isFar && 'far from prediction', r.isOutlier && 'fit outlier'].filter(Boolean).join(', ');
  return (
    <div
      role="row"
      aria-selected={isSelected}
      className={`trow ${isSelected ? 'selected' : ''} ${r.isFar || r.isOutlier ? 'flagged' : ''} ${a.isExcluded ? 'excluded' : ''}`}
      style={{ transform: `translateY(${top}px)`, height: ROW_HEIGHT }}
      onClick={() => assignmentSelect(a.id)}
      data-testid="assignment-row"
      data-checked={isChecked || undefined}
    >
      <span role="cell" onClick={(e) => e.stopPropagation()}>
        <input
          type="checkbox"
          aria-label={`Select ${name}`}
          checked={isChecked}
          onChange={() => undefined}
          onClick={(e) => onCheck(a.id, (e.target as HTMLInputElement).checked, e.shiftKey)}
          data-testid="row-check"
        />
      </span>
      <span role="cell" className="c-label">
        <LineLabel q={quanta(r)} shape={shape} />
        {a.band !== undefined && (
          <span className="band-tag" title={`band ${a.band} of ${a.species ?? ''}`} data-testid="row-band">
            {a.band}
            {a.species ? `·${a.species}` : ''}
          </span>
        )}
        {flags && (
          <span className="flag" title={flags} aria-label={flags}>
            ⚑
          </span>
        )}
      </span>
      {hasSymmetry && (
        <span role="cell" className="c-sym" title="level symmetry, upper ← lower" data-testid="row-sym">
          {symmetry}
        </span>
      )}
      <span role="cell" className="c-q">
        {a.jUpper} {a.kUpper} ← {a.jLower} {a.kLower}
      </span>
      <span role="cell" className="num">
        {formatFixed(a.observedCm1, 5)}
      </span>
      <span role="cell" className="num">
        {formatFixed(r.calcCm1, 5)}
      </span>
      <span
        role="cell"
        className={`num ${r.isFar ? 'bad' : ''}`}
        title={r.omcSigma !== null ? `${r.omcSigma.toFixed(1)} σ` : undefined}
        data-testid="row-omc"
      >
        {formatFixed(r.omcCm1, 5)}
      </span>
      <span role="cell" onClick={(e) => e.stopPropagation()}>
        <NumberField
          label={`Uncertainty of ${name} in cm⁻¹`}
          isLabelHidden
          className="narrow"
          value={a.uncertaintyCm1}
          onCommit={(v) => assignmentEdit(a.id, { uncertaintyCm1: v })}
        />
      </span>
      <span role="cell" onClick={(e) => e.stopPropagation()}>
        <input
          type="checkbox"
          aria-label={`Exclude ${name} from the fit`}
          checked={a.isExcluded}
          onChange={(e) => assignmentEdit(a.id, { isExcluded: e.target.checked })}
        />
      </span>
      <span role="cell" onClick={(e) => e.stopPropagation()}>
        <input
          type="checkbox"
          aria-label={`${name} is a blend`}
          checked={a.isBlended}
          onChange={(e) => assignmentEdit(a.id, { isBlended: e.target.checked })}
        />
      </span>
      <span role="cell">
        <NoteField id={a.id} note={a.note} name={name} />
      </span>
      <span role="cell">
        <button
          type="button"
          className="icon"
          aria-label={`Delete assignment ${name}`}
          onClick={(e) => {
            e.stopPropagation();
            assignmentDelete([a.id]);
          }}
        >
          ✕
        </button>
      </span>
    </div>
  );
});

function Filters() {
  const q = useBench((s) => s.tableQuery);
  const tolerance = useBench((s) => s.farToleranceCm1);
  const optNum = (v: string) => (v.trim() === '' ? null : Number(v));
  return (
    <div className="table-filters" role="group" aria-label="Filter the assignments">
      <label>
        Branch
        <select value={q.branch} onChange={(e) => viewSetTableQuery({ branch: e.target.value as TableQuery['branch'] })}>
          <option value="">all</option>
          <option value="P">P</option>
          <option value="Q">Q</option>
          <option value="R">R</option>
        </select>
      </label>
      <label>
        K″
        <input
          type="number"
          min={0}
          className="tiny"
          value={q.kLower ?? ''}
          onChange={(e) => viewSetTableQuery({ kLower: optNum(e.target.value) })}
        />
      </label>
      <label>
        J″ from
        <input
          type="number"
          min={0}
          className="tiny"
          value={q.jMin ?? ''}
          onChange={(e) => viewSetTableQuery({ jMin: optNum(e.target.value) })}
        />
      </label>
      <label>
        to
        <input
          type="number"
          min={0}
          className="tiny"
          value={q.jMax ?? ''}
          onChange={(e) => viewSetTableQuery({ jMax: optNum(e.target.value) })}
        />
      </label>
      <label>
        |o − c| ≥
        <input
          type="number"
          min={0}
          step={0.001}
          className="small-num"
          value={q.minAbsOmcCm1 || ''}
          onChange={(e) => viewSetTableQuery({ minAbsOmcCm1: Math.max(0, Number(e.target.value) || 0) })}
        />
        cm⁻¹
      </label>
      <NumberField
        label="Flag beyond (no fit) / cm⁻¹"
        className="narrow"
        value={tolerance}
        onCommit={(v) => {
          if (!(v > 0)) return 'tolerance must be > 0 cm⁻¹';
          benchUpdate('tolerance', () => ({ farToleranceCm1: v }), { history: false });
          return null;
        }}
      />
    </div>
  );
}

export function AssignmentsTable() {
  const rows = useBench(selectAssignmentRows);
  // The symmetry text of a row by its assignment (computed for the rows shown only), and whether any
  // row has one: neither is a pass over every row when one is added.
  const symmetryOf = useBench(selectAssignmentSymmetryOf);
  const hasSymmetry = useBench(selectHasAssignmentSymmetry);
  const q = useBench((s) => s.tableQuery);
  const selectedId = useBench((s) => s.selectedAssignmentId);
  const shape = useBench((s) => s.model.shape);
  const query = useMemo(() => tableRowsQueryMemo(), []);
  const shown = useMemo(() => query(rows, q), [query, rows, q]);
  const scrollRef = useRef<HTMLDivElement>(null);
  // Every row is ROW_HEIGHT high, so the rows in view follow from the scroll offset and the body's
  // height alone (rowWindow): no per-row measurement when rows are added, and no read of the layout.
  const [band, setBand] = useState({ topPx: 0, heightPx: 0 });
  const bandRef = useRef(band);
  bandRef.current = band;
  useLayoutEffect(() => {
    const el = scrollRef.current;
    if (!el) return;
    const set = (topPx: number, heightPx: number) =>
      setBand((b) => (b.topPx === topPx && b.heightPx === heightPx ? b : { topPx, heightPx }));
    set(el.scrollTop, el.clientHeight);
    const onScroll = () => set(el.scrollTop, bandRef.current.heightPx);
    el.addEventListener('scroll', onScroll, { passive: true });
    const ro = typeof ResizeObserver === 'undefined' ? null : new ResizeObserver((e) => set(el.scrollTop, e[0].contentRect.height));
    ro?.observe(el);
    return () => {
      el.removeEventListener('scroll', onScroll);
      ro?.disconnect();
    };
  }, []);
  const win = rowWindow(band.topPx, band.heightPx, shown.length, ROW_HEIGHT, OVERSCAN_ROWS);
  const nFar = useMemo(() => rows.reduce((n, r) => n + (r.isFar ? 1 : 0), 0), [rows]);
  const [checked, setChecked] = useState<ReadonlySet<string>>(() => new Set());
  const anchor = useRef<string | null>(null);
  // Ticks of rows that no longer exist (deleted, undone, a new session) are forgotten (no pass over
  // the rows while nothing is ticked).
  const live = useMemo(() => {
    if (checked.size === 0) return NOTHING_TICKED;
    const present = new Set(rows.map((r) => r.a.id));
    return [...checked].filter((id) => present.has(id));
  }, [checked, rows]);
  const shownChecked = useMemo(
    () => (checked.size === 0 ? 0 : shown.reduce((n, r) => n + (checked.has(r.a.id) ? 1 : 0), 0)),
    [shown, checked],
  );
  // The rows in their shown order, read when a box is ticked: onCheck stays the same function, so a
  // new assignment does not re-render every memoised row for a new callback.
  const shownRef = useRef(shown);
  shownRef.current = shown;
  // A newly selected row (a click-to-assign, a ladder marker, the keyboard walk) is scrolled into view
  // when it is outside the shown window; only a change of selection scrolls, never a new sort or filter.
  useEffect(() => {
    // After the next paint (two animation frames): the click's own feedback (marker, row count) is
    // painted first and the table's new window in the frame after, so the scroll never delays it.
    if (!selectedId) return;
    let frame = requestAnimationFrame(() => {
      frame = requestAnimationFrame(() => {
        const el = scrollRef.current;
        const i = shownRef.current.findIndex((r) => r.a.id === selectedId);
        if (!el || i < 0) return;
        const { topPx, heightPx } = bandRef.current;
        const to = scrollTopShowing(i, topPx, heightPx, ROW_HEIGHT);
        if (to !== topPx) el.scrollTop = to;
      });
    });
    return () => cancelAnimationFrame(frame);
  }, [selectedId]);
  const onCheck = useCallback((id: string, isOn: boolean, isRange: boolean) => {
    const shown = shownRef.current;
    setChecked((prev) => {
      const next = new Set(prev);
      const to = shown.findIndex((r) => r.a.id === id);
      const from = isRange && anchor.current !== null ? shown.findIndex((r) => r.a.id === anchor.current) : -1;
      if (from >= 0 && to >= 0) {
        for (let i = Math.min(from, to); i <= Math.max(from, to); i++) {
          if (isOn) next.add(shown[i].a.id);
          else next.delete(shown[i].a.id);
        }
      } else if (isOn) next.add(id);
      else next.delete(id);
      return next;
    });
    anchor.current = id;
  }, []);

  return (
    <div className="assignments">
      <div className="table-top">
        <span className="count" data-testid="assignment-count">
          {rows.length} assigned{shown.length !== rows.length ? `, ${shown.length} shown` : ''}
          {nFar > 0 && <span className="bad"> · {nFar} far from prediction</span>}
        </span>
        <button
          type="button"
          disabled={live.length === 0}
          onClick={() => {
            assignmentDelete(live);
            setChecked(new Set());
            anchor.current = null;
          }}
          title="Delete the ticked rows (one undo step); shift-click a box to tick a range"
          data-testid="delete-selected"
        >
          Delete selected{live.length > 0 ? ` (${live.length})` : ''}
        </button>
        <Filters />
      </div>
      <div className={`vtable ${hasSymmetry ? 'with-sym' : ''}`} role="table" aria-label="Assigned lines" aria-rowcount={shown.length + 1}>
        <div role="row" className="thead">
          {COLUMNS.filter((c) => hasSymmetry || c.className !== 'c-sym').map((c, i) =>
            i === 0 ? (
              <span role="columnheader" key={i}>
                <input
                  type="checkbox"
                  aria-label="Select every row shown"
                  checked={shown.length > 0 && shownChecked === shown.length}
                  ref={(el) => {
                    if (el) el.indeterminate = shownChecked > 0 && shownChecked < shown.length;
                  }}
                  onChange={(e) => {
                    const isOn = e.target.checked;
                    setChecked((prev) => {
                      const next = new Set(prev);
                      for (const r of shown) {
                        if (isOn) next.add(r.a.id);
                        else next.delete(r.a.id);
                      }
                      return next;
                    });
                    anchor.current = null;
                  }}
                  data-testid="check-all"
                />
              </span>
            ) : (
              <span
                role="columnheader"
                key={i}
                className={c.className}
                title={c.title}
                aria-sort={c.key && q.sortKey === c.key ? (q.sortDescending ? 'descending' : 'ascending') : undefined}
              >
                {c.key ? (
                  <button
                    type="button"
                    className="sort"
                    onClick={() => viewSetTableQuery({ sortKey: c.key!, sortDescending: q.sortKey === c.key ? !q.sortDescending : false })}
                  >
                    {c.label}
                    {q.sortKey === c.key ? (q.sortDescending ? ' ▼' : ' ▲') : ''}
                  </button>
                ) : (
                  c.label
                )}
              </span>
            ),
          )}
        </div>
        <div ref={scrollRef} className="tbody" role="rowgroup">
          {shown.length === 0 ? (
            <p className="empty muted">
              {rows.length === 0
                ? 'No lines assigned yet: click a peak in the plot to see candidates, or click a rung and then a peak.'
                : 'No row matches the filter.'}
            </p>
          ) : (
            <div style={{ height: shown.length * ROW_HEIGHT, position: 'relative' }}>
              {shown.slice(win.start, win.end).map((r, k) => (
                <Row
                  key={r.a.id}
                  r={r}
                  isSelected={r.a.id === selectedId}
                  isChecked={checked.has(r.a.id)}
                  onCheck={onCheck}
                  shape={shape}
                  top={(win.start + k) * ROW_HEIGHT}
                  symmetry={hasSymmetry ? symmetryOf(r.a) : ''}
                  hasSymmetry={hasSymmetry}
                />
              ))}
            </div>
          )}
        </div>
      </div>
    </div>
  );
}
