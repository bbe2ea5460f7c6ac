/** Downloads: assigned line table, fit report, simulated lines and spectrum, model file, whole project. */
import { selectAssignmentLevels } from '../state/selectorsSystem';
import { lineTableSerialize } from '../io/lineTable';
import { simulatedLinesCsv, spectrumCsv } from '../io/exportCsv';
import { exportStem } from '../io/exportName';
import { fitReportMarkdown } from '../io/fitReport';
import { systemFileSerialize } from '../io/systemFileWrite';
import { systemFitReportBands, type SystemFitReportInput } from '../io/systemFitReport';
import { selectSystemPrediction } from '../state/systemPredict';
import { modelFileSerialize } from '../io/modelFile';
import { messagePost } from '../state/actionsCore';
import { projectExportTextAsync } from '../state/actionsProject';
import { selectAssignmentRows, selectBand, selectFitResult, selectSimulated } from '../state/selectors';
import { benchStore, useBench } from '../state/store';
import { APP_VERSION } from './appVersion';
import { downloadText } from './download';

/** Stem of every export's file name: the trace's file name, else the model's name. */
function stem(): string {
  const s = benchStore.getState();
  return exportStem(s.traceReport?.fileName ?? null, s.modelName);
}

function guard(what: string, f: () => void): void {
  try {
    f();
  } catch (err) {
    messagePost('error', `Could not export the ${what}: ${(err as Error).message}`);
  }
}

export function exportLineTable(): void {
  guard('line table', () => {
    const s = benchStore.getState();
    const rows = selectAssignmentRows(s);
    const levels = selectAssignmentLevels(s);
    const hasSymmetry = s.system?.species.some((sp) => sp.pointGroup) ?? false;
    const text = lineTableSerialize(s.assignments, {
      shape: s.model.shape,
      calcCm1: rows.map((r) => r.calcCm1),
      isOutlier: rows.map((r) => r.isOutlier),
      // Several bands: every row names its band and species (io/systemLineTable.ts reads them back).
      hasBandColumns: s.system !== null,
      // Level labels (A1/A2, s/a, ±l) so a split pair reads back as the same lines; species where a point group is declared.
      // (only where some row or species has them, so a plain several-band table keeps its columns).
      hasLevelColumns: hasSymmetry || s.assignments.some((a) => a.tagUpper || a.tagLower || a.lUpper || a.lLower),
      ...(hasSymmetry ? { symmetryOf: (i: number) => levels[i] } : {}),
    });
    downloadText(`${stem()}-assignments.csv`, text, 'text/csv');
  });
}

export function exportFitReport(): void {
  guard('fit report', () => {
    const s = benchStore.getState();
    const result = selectFitResult(s);
    if (!result) {
      messagePost('info', 'Run a fit first; the report describes its result.');
      return;
    }
    let text = fitReportMarkdown(result, s.model.shape, {
      modelName: s.modelName,
      appVersion: APP_VERSION,
      dateIso: new Date().toISOString(),
      fitFinishedAt: s.fitFinishedAt,
    });
    const bands = (result as { bands?: SystemFitReportInput['bands'] }).bands;
    if (s.system && bands)
      text += '\n' + systemFitReportBands({ bands, lines: result.lines, outliers: result.outliers }, s.model.shape) + '\n';
    downloadText(`${stem()}-fit-report.md`, text, 'text/markdown');
  });
}

export function exportSimulatedLines(): void {
  guard('simulated line list', () => {
    const s = benchStore.getState();
    const pred = selectSystemPrediction(s);
    const text = pred?.all
      ? simulatedLinesCsv(pred.all, s.model.shape, { bandOfLine: pred.all.bandIndex, names: pred.entries })
      : simulatedLinesCsv(selectBand(s).lines, s.model.shape);
    downloadText(`${stem()}-lines.csv`, text, 'text/csv');
  });
}

export function exportSimulatedSpectrum(): void {
  guard('simulated spectrum', () => {
    const { sim, error } = selectSimulated(benchStore.getState());
    if (!sim) throw new Error(error ?? 'the model gives no lines');
    downloadText(`${stem()}-spectrum.csv`, spectrumCsv(sim.xCm1, { absorbance_sim: sim.absorbance }), 'text/csv');
  });
}

export function exportModel(): void {
  guard('model file', () => {
    const s = benchStore.getState();
    // Several bands: the whole system as a system file (the CLI and this page read it back).
    if (s.system) {
      const text = systemFileSerialize(s.system, { floated: s.systemFloated, ties: s.systemTies, name: s.modelName });
      downloadText(`${stem()}-system.json`, text, 'application/json');
      return;
    }
    downloadText(
      `${stem()}-model.json`,
      // A mass nobody set (the simulation's default) is not the molecule's: it stays out of the file.
      modelFileSerialize({
        model: s.model,
        floated: s.floated,
        name: s.modelName,
        massAmu: s.massSource === 'default' ? undefined : s.massAmu,
      }),
      'application/json',
    );
  });
}

/** The whole session, written in the parse worker (encoding a 1e6-point trace took ~0.3 s of main thread). */
export async function exportProject(): Promise<void> {
  const name = `${stem()}.ladderbench.json`;
  let text: string;
  try {
    text = await projectExportTextAsync(APP_VERSION);
  } catch (err) {
    messagePost('error', `Could not export the project: ${(err as Error).message}`);
    return;
  }
  guard('project', () => downloadText(name, text, 'application/json'));
}

export function ExportPanel() {
  const nAssigned = useBench((s) => s.assignments.length);
  const hasFit = useBench((s) => selectFitResult(s) !== null);
  const nLines = useBench((s) => selectBand(s).lines.count);
  return (
    <div className="export">
      <ul className="export-list">
        <li>
          <button type="button" onClick={exportLineTable} disabled={nAssigned === 0} data-testid="export-lines">
            Assigned line table (CSV)
          </button>
          <span className="muted">Quantum numbers, label, obs, calc, obs − calc, σ, flags, notes; {nAssigned} rows. Opens again here.</span>
        </li>
        <li>
          <button type="button" onClick={exportFitReport} disabled={!hasFit} data-testid="export-report">
            Fit report (Markdown)
          </button>
          <span className="muted">Every constant ± σ, σ_w, N, correlation matrix, residuals, date and app version.</span>
        </li>
        <li>
          <button type="button" onClick={exportSimulatedLines} disabled={nLines === 0} data-testid="export-sim-lines">
            Simulated line list (CSV)
          </button>
          <span className="muted">{nLines.toLocaleString('en')} predicted lines from the current model.</span>
        </li>
        <li>
          <button type="button" onClick={exportSimulatedSpectrum} disabled={nLines === 0} data-testid="export-sim-spectrum">
            Simulated spectrum (CSV)
          </button>
          <span className="muted">Absorbance on a uniform grid, scaled to the trace.</span>
        </li>
        <li>
          <button type="button" onClick={exportModel} data-testid="export-model">
            Model file (JSON)
          </button>
          <span className="muted">The current constants with their float/fix flags.</span>
        </li>
        <li>
          <button type="button" onClick={() => void exportProject()} data-testid="export-project">
            Whole session (project JSON)
          </button>
          <span className="muted">Trace, model, assignments, last fit and view; open it here to continue exactly where you left off.</span>
        </li>
      </ul>
    </div>
  );
}
