import { systemLineResolve } from '../fit/systemLineResolve';
import type { SystemFitLine } from '../fit/systemFitTypes';
import { inputJsonParse, INPUT_LIMITS } from '../io/inputLimits';
import { LineTableError } from '../io/lineTable';
import { modelFileParse, ModelFileError, type ModelFile } from '../io/modelFile';
import {
  modelFileNeedsSystem,
  systemFileDetect,
  systemFileFromJson,
  systemFileFromModelFile,
  systemFileFromModelJson,
  SystemFileError,
  type SystemFile,
} from '../io/systemFile';
import { systemLineTableParse, type SystemLineTable } from '../io/systemLineTable';
import { CliError, type CliIo } from './cliIo';

/** True when the text parses as JSON with a top-level "species" field (a system file). */
function isSystemText(text: string): boolean {
  const parsed = inputJsonParse(text, INPUT_LIMITS.maxModelFileChars);
  return parsed.ok && systemFileDetect(parsed.value);
}

/** Read and validate a model file for a CLI command; warnings go to stderr. A system file is refused with a clear message. */
export function cliLoadModel(path: string, io: CliIo): ModelFile {
  const text = io.readFile(path);
  if (isSystemText(text)) {
    throw new CliError(
      `${path}: is a system file (species → states → bands); this command takes a single-band model file (shape, band, lower, upper). Write one band of the system as a model file for it.`,
    );
  }
  return modelFromText(path, text, io);
}

function modelFromText(path: string, text: string, io: CliIo): ModelFile {
  try {
    const file = modelFileParse(text);
    for (const w of file.warnings) io.stderr(`${path}: ${w}\n`);
    return file;
  } catch (err) {
    if (err instanceof ModelFileError) throw new CliError(`${path}: ${err.message}`);
    throw err;
  }
}

/** A single-band model file or a system file, as `--model` may name either. */
export type CliModelOrSystem = { kind: 'model'; file: ModelFile } | { kind: 'system'; file: SystemFile };

/**
 * Read `--model`: a system file when its JSON has a top-level "species" field, else a single-band
 * model file read exactly as cliLoadModel reads it (same messages, same warnings).
 */
export function cliLoadModelOrSystem(path: string, io: CliIo): CliModelOrSystem {
  const text = io.readFile(path);
  const parsed = inputJsonParse(text, INPUT_LIMITS.maxModelFileChars);
  const needsSystem = parsed.ok && modelFileNeedsSystem(parsed.value);
  if (!isSystemText(text) && !needsSystem) return { kind: 'model', file: modelFromText(path, text, io) };
  try {
    // A model file with keys the closed form cannot hold (pointGroup, q22, inv…, qJ, …) runs as a one-band system.
    const file = needsSystem
      ? systemFileFromModelJson(parsed.ok ? parsed.value : null)
      : systemFileFromJson(parsed.ok ? parsed.value : null);
    for (const w of file.warnings) io.stderr(`${path}: ${w}\n`);
    return { kind: 'system', file };
  } catch (err) {
    if (err instanceof SystemFileError) throw new CliError(`${path}: ${err.message}`);
    throw err;
  }
}

/** As cliLoadModelOrSystem, with a single-band model read as a one-band system (keys upper.*, lower.*). */
export function cliLoadSystem(path: string, io: CliIo): SystemFile {
  const loaded = cliLoadModelOrSystem(path, io);
  return loaded.kind === 'system' ? loaded.file : systemFileFromModelFile(loaded.file);
}

/** Read a line table with the system columns (band, species, l_up, l_lo, tag_up, tag_lo, unit). */
export function cliLoadSystemLines(path: string, io: CliIo): SystemLineTable {
  const text = io.readFile(path);
  try {
    const table = systemLineTableParse(text, { fileName: path });
    for (const w of table.warnings) io.stderr(`${w}\n`);
    return table;
  } catch (err) {
    if (err instanceof LineTableError) throw new CliError(err.message);
    throw err;
  }
}

/**
 * Resolve every row of a system line table to its labelled levels; a row that names no single
 * allowed line stops the command with its file line number and the reason.
 */
export function cliResolveSystemLines(system: SystemFile, table: SystemLineTable, path: string): SystemFitLine[] {
  return table.rows.map((row, i) => {
    const r = systemLineResolve(system.model, row);
    if (!r.ok) throw new CliError(`${path}: line ${table.lineNumbers[i]}: ${r.message}`);
    return { ...r.line, observedCm1: row.observedCm1, uncertaintyCm1: row.uncertaintyCm1, isExcluded: row.isExcluded, unit: row.unit };
  });
}
