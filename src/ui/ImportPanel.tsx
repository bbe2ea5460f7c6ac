/** What the importer detected for the current trace, with its choices editable for a re-import. */
import { useEffect, useState } from 'react';
import type { TraceImportOptions } from '../io/traceImportOptions';
import { traceReimport } from '../state/actionsImport';
import { useBench } from '../state/store';

const ORDINATE_WORDS = {
  absorbance: 'absorbance',
  transmittance: 'transmittance (0–1)',
  'percent-transmittance': 'transmittance (%)',
} as const;
const UNIT_WORDS = { 'cm-1': 'wavenumber, cm⁻¹', um: 'wavelength, µm', nm: 'wavelength, nm' } as const;
const DELIM_WORDS: Record<string, string> = { ',': 'comma', '\t': 'tab', ';': 'semicolon', whitespace: 'spaces' };

export function ImportPanel() {
  const report = useBench((s) => s.traceReport);
  const source = useBench((s) => s.traceSource);
  const overrides = useBench((s) => s.importOverrides);
  const points = useBench((s) => s.trace?.wavenumberCm1.length ?? 0);
  const [draft, setDraft] = useState<Partial<TraceImportOptions>>(overrides);
  useEffect(() => setDraft(overrides), [overrides]);
  const set = (patch: Partial<TraceImportOptions>) => setDraft({ ...draft, ...patch });

  if (!report) {
    return (
      <div className="import-info">
        <p className="muted">
          {source === 'simulated-demo'
            ? `The trace is simulated in memory from the model (${points.toLocaleString('en')} points).`
            : source === 'project'
              ? `The trace came from a project file (${points.toLocaleString('en')} points).`
              : 'No trace loaded. Drop a file anywhere on the page or use “Open file…”.'}
        </p>
      </div>
    );
  }
  return (
    <div className="import-info">
      <dl className="facts" data-testid="import-facts">
        <dt>File</dt>
        <dd className="file-name">{report.fileName}</dd>
        {report.title && (
          <>
            <dt>Title</dt>
            <dd>{report.title}</dd>
          </>
        )}
        <dt>Format</dt>
        <dd>
          {report.format === 'jcamp-dx' ? 'JCAMP-DX' : 'delimited text'}
          {report.delimiter && `, ${DELIM_WORDS[report.delimiter] ?? report.delimiter}-separated`}
          {report.decimal && `, decimal “${report.decimal}”`}
        </dd>
        <dt>Abscissa</dt>
        <dd>
          {UNIT_WORDS[report.xUnit]}
          {report.wasDescending ? ' (descending in the file, stored ascending)' : ''}
        </dd>
        <dt>Ordinate</dt>
        <dd>
          {ORDINATE_WORDS[report.ordinate]}
          {report.columnNames && report.yColumn !== undefined && (
            <>
              {' '}
              — column {report.yColumn + 1} “{report.columnNames[report.yColumn] ?? ''}”
            </>
          )}
        </dd>
        <dt>Points</dt>
        <dd>{report.points.toLocaleString('en')}</dd>
        <dt>Range</dt>
        <dd>
          {report.rangeCm1[0].toFixed(4)} – {report.rangeCm1[1].toFixed(4)} cm⁻¹
        </dd>
        <dt>Skipped</dt>
        <dd>
          {report.skipped.count === 0
            ? 'none'
            : `${report.skipped.count} (lines ${report.skipped.lines.slice(0, 12).join(', ')}${report.skipped.lines.length > 12 ? ', …' : ''})`}
        </dd>
      </dl>
      {report.messages.length > 0 && (
        <ul className="warnings">
          {report.messages.map((m, i) => (
            <li key={i}>{m}</li>
          ))}
        </ul>
      )}
      <form
        className="reimport"
        onSubmit={(e) => {
          e.preventDefault();
          void traceReimport(draft);
        }}
      >
        <h3>Import choices</h3>
        <label>
          Format
          <select value={draft.format ?? 'auto'} onChange={(e) => set({ format: e.target.value as TraceImportOptions['format'] })}>
            <option value="auto">detect</option>
            <option value="delimited">delimited text</option>
            <option value="jcamp-dx">JCAMP-DX</option>
          </select>
        </label>
        <label>
          Abscissa
          <select value={draft.xUnit ?? 'auto'} onChange={(e) => set({ xUnit: e.target.value as TraceImportOptions['xUnit'] })}>
            <option value="auto">detect</option>
            <option value="cm-1">cm⁻¹</option>
            <option value="um">µm</option>
            <option value="nm">nm</option>
          </select>
        </label>
        <label>
          Ordinate
          <select value={draft.ordinate ?? 'auto'} onChange={(e) => set({ ordinate: e.target.value as TraceImportOptions['ordinate'] })}>
            <option value="auto">detect</option>
            <option value="absorbance">absorbance</option>
            <option value="transmittance">transmittance 0–1</option>
            <option value="percent-transmittance">transmittance %</option>
          </select>
        </label>
        <label>
          Ordinate column
          <input
            type="number"
            min={2}
            className="tiny"
            value={(draft.yColumn ?? report.yColumn ?? 1) + 1}
            onChange={(e) => set({ yColumn: Math.max(1, Math.round(Number(e.target.value)) - 1) })}
          />
        </label>
        <label>
          Delimiter
          <select value={draft.delimiter ?? 'auto'} onChange={(e) => set({ delimiter: e.target.value as TraceImportOptions['delimiter'] })}>
            <option value="auto">detect</option>
            <option value=",">comma</option>
            <option value={'\t'}>tab</option>
            <option value=";">semicolon</option>
            <option value="whitespace">spaces</option>
          </select>
        </label>
        <label>
          Decimal
          <select value={draft.decimal ?? 'auto'} onChange={(e) => set({ decimal: e.target.value as TraceImportOptions['decimal'] })}>
            <option value="auto">detect</option>
            <option value=".">point</option>
            <option value=",">comma</option>
          </select>
        </label>
        <button type="submit">Re-import with these choices</button>
      </form>
    </div>
  );
}
