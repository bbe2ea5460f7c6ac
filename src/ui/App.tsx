/** The workbench page. */
import { useEffect, useRef, useState } from 'react';
import { redo, undo } from '../state/actionsCore';
import { sessionNew } from '../state/actionsSession';
import { fileOpen, traceImportCancel } from '../state/actionsImport';
import { viewSet, viewSetTab, viewSetTheme } from '../state/actionsView';
import { benchStore, useBench } from '../state/store';
import type { BenchTab } from '../state/viewSlice';
import { AssignmentsTable } from './AssignmentsTable';
import { AssistantPanel } from './AssistantPanel';
import { CalibrationPanel } from './CalibrationPanel';
import { CombinationPanel } from './CombinationPanel';
import { ConfirmPrompt } from './ConfirmPrompt';
import { ContourPanel } from './ContourPanel';
import { ExportPanel } from './ExportPanel';
import { HelpOverlay } from './HelpOverlay';
import { ImportPanel } from './ImportPanel';
import { keyboardHandle } from './keyboard';
import { LevelsPanel } from './LevelsPanel';
import { LoomisWoodPanel } from './LoomisWoodPanel';
import { MessageArea } from './MessageArea';
import { ModelPanel } from './ModelPanel';
import { SolvePanel } from './SolvePanel';
import { SpectrumPlot } from './SpectrumPlot';

const TABS: { id: BenchTab; label: string }[] = [
  { id: 'assignments', label: 'Assignments' },
  { id: 'assistant', label: 'Assistant' },
  { id: 'solve', label: 'Fit' },
  { id: 'combination', label: 'Combination differences' },
  { id: 'loomis', label: 'Loomis–Wood' },
  { id: 'levels', label: 'Levels' },
  { id: 'import', label: 'Trace file' },
  { id: 'calibration', label: 'Calibration' },
  { id: 'contour', label: 'Unresolved band' },
  { id: 'export', label: 'Export' },
];

function Header({ onOpen }: { onOpen: () => void }) {
  const report = useBench((s) => s.traceReport);
  const source = useBench((s) => s.traceSource);
  const importing = useBench((s) => s.traceImport);
  const theme = useBench((s) => s.theme);
  const canUndo = useBench((s) => s.past.length > 0);
  const canRedo = useBench((s) => s.future.length > 0);
  const undoLabel = useBench((s) => s.past[s.past.length - 1]?.label);
  const redoLabel = useBench((s) => s.future[s.future.length - 1]?.label);
  const name =
    report?.fileName ?? (source === 'simulated-demo' ? 'simulated demo trace' : source === 'project' ? 'trace from project' : 'no trace');
  return (
    <header className="top">
      <h1>
        Ladder Bench <span className="muted small">symmetric-top band assignment and fitting</span>
      </h1>
      <div className="file-info" data-testid="file-name" title={name}>
        {name}
      </div>
      {importing && (
        <div className="progress" role="status" aria-label={`Reading ${importing.fileName}`}>
          <span className="muted small">Reading {importing.fileName}</span>
          <progress max={1} value={importing.fraction} data-testid="import-progress" />
          <button type="button" onClick={traceImportCancel}>
            Cancel
          </button>
        </div>
      )}
      <div className="top-actions">
        <button type="button" className="primary" onClick={onOpen} data-testid="open-file">
          Open file…
        </button>
        <button
          type="button"
          onClick={() => void sessionNew()}
          title="Clear the trace, peaks, assignments and fit and start from the default model (Undo brings the session back)"
          data-testid="new-session"
        >
          New session
        </button>
        <button
          type="button"
          onClick={() => undo()}
          disabled={!canUndo}
          title={undoLabel ? `Undo ${undoLabel} (Ctrl+Z)` : 'Undo (Ctrl+Z)'}
          data-testid="undo"
        >
          Undo
        </button>
        <button
          type="button"
          onClick={() => redo()}
          disabled={!canRedo}
          title={redoLabel ? `Redo ${redoLabel} (Ctrl+Shift+Z)` : 'Redo (Ctrl+Shift+Z)'}
        >
          Redo
        </button>
        <button
          type="button"
          onClick={() => viewSetTheme(theme === 'dark' ? 'light' : 'dark')}
          aria-label={`Switch to ${theme === 'dark' ? 'light' : 'dark'} theme`}
        >
          {theme === 'dark' ? 'Light' : 'Dark'}
        </button>
        <button type="button" onClick={() => viewSet('isHelpOpen', true)} aria-label="Keyboard help" title="Keyboard help (?)">
          ?
        </button>
      </div>
    </header>
  );
}

function LowerPanel() {
  const tab = useBench((s) => s.tab);
  const nAssigned = useBench((s) => s.assignments.length);
  return (
    <section className="lower" aria-label="Work panels">
      <div role="tablist" className="tabs" aria-label="Panels">
        {TABS.map((t) => (
          <button
            key={t.id}
            role="tab"
            type="button"
            id={`tab-${t.id}`}
            aria-selected={tab === t.id}
            aria-controls={`panel-${t.id}`}
            onClick={() => viewSetTab(t.id)}
            data-testid={`tab-${t.id}`}
          >
            {t.label}
            {t.id === 'assignments' && nAssigned > 0 ? ` (${nAssigned})` : ''}
          </button>
        ))}
      </div>
      <div role="tabpanel" id={`panel-${tab}`} aria-labelledby={`tab-${tab}`} className="tabpanel">
        {tab === 'assignments' && <AssignmentsTable />}
        {tab === 'assistant' && <AssistantPanel />}
        {tab === 'solve' && <SolvePanel />}
        {tab === 'combination' && <CombinationPanel />}
        {tab === 'loomis' && <LoomisWoodPanel />}
        {tab === 'levels' && <LevelsPanel />}
        {tab === 'import' && <ImportPanel />}
        {tab === 'calibration' && <CalibrationPanel />}
        {tab === 'export' && <ExportPanel />}
        {tab === 'contour' && <ContourPanel />}
      </div>
    </section>
  );
}

export function App() {
  const theme = useBench((s) => s.theme);
  const fileRef = useRef<HTMLInputElement>(null);
  const [isDragging, setDragging] = useState(false);

  useEffect(() => {
    document.documentElement.dataset.theme = theme;
  }, [theme]);

  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      // While the page asks a question, keys belong to it (no assignment behind its back).
      if (benchStore.getState().confirm) return;
      if (keyboardHandle(e)) e.preventDefault();
    };
    let depth = 0;
    const hasFiles = (e: DragEvent) => Array.from(e.dataTransfer?.types ?? []).includes('Files');
    const onEnter = (e: DragEvent) => {
      if (!hasFiles(e)) return;
      depth++;
      setDragging(true);
    };
    const onLeave = () => {
      depth = Math.max(0, depth - 1);
      if (depth === 0) setDragging(false);
    };
    const onOver = (e: DragEvent) => {
      if (hasFiles(e)) e.preventDefault();
    };
    const onDrop = (e: DragEvent) => {
      e.preventDefault();
      depth = 0;
      setDragging(false);
      const f = e.dataTransfer?.files?.[0];
      if (f) void fileOpen(f);
    };
    window.addEventListener('keydown', onKey);
    window.addEventListener('dragenter', onEnter);
    window.addEventListener('dragleave', onLeave);
    window.addEventListener('dragover', onOver);
    window.addEventListener('drop', onDrop);
    return () => {
      window.removeEventListener('keydown', onKey);
      window.removeEventListener('dragenter', onEnter);
      window.removeEventListener('dragleave', onLeave);
      window.removeEventListener('dragover', onOver);
      window.removeEventListener('drop', onDrop);
    };
  }, []);

  return (
    <div className="app">
      <Header onOpen={() => fileRef.current?.click()} />
      <input
        ref={fileRef}
        type="file"
        className="visually-hidden"
        aria-label="Open a trace, model, line table or project file"
        data-testid="file-input"
        onChange={(e) => {
          const f = e.target.files?.[0];
          e.target.value = '';
          if (f) void fileOpen(f);
        }}
      />
      <MessageArea />
      <main className="main">
        <aside className="sidebar">
          <ModelPanel />
        </aside>
        <div className="workspace">
          <SpectrumPlot />
          <LowerPanel />
        </div>
      </main>
      <HelpOverlay />
      <ConfirmPrompt />
      {isDragging && (
        <div className="drop-overlay" aria-hidden="true">
          <div>Drop a trace, model file, line table or project to open it</div>
        </div>
      )}
    </div>
  );
}
