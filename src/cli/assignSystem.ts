import { assistantPeaksUsable } from '../analysis/assistantPeakContext';
import { peaksFind } from '../analysis/peaksFind';
import { systemAssign, type SystemAssignResult, type SystemAssignRow, type SystemAssignSeed } from '../analysis/systemAssign';
import type { SystemFile } from '../io/systemFile';
import { lineLabelAscii } from '../physics/lineLabel';
import type { TopShape } from '../physics/model';
import { CliError, type CliIo } from './cliIo';
import { cliLoadSystemLines, cliResolveSystemLines } from './cliModel';

/** Columns of the system assign CSV: the single-band assign columns, then band and species (as io/systemLineTable.ts names them). */
export const ASSIGN_SYSTEM_EXTRA_COLUMNS = ['band', 'species'] as const;

/** A CSV cell: quoted when it holds a comma, quote or line break. */
function csvCell(text: string): string {
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** Everything the system path of `assign` needs from the command (already checked there). */
export interface AssignSystemArgs {
  system: SystemFile;
  modelPath: string;
  tracePath: string;
  trace: Parameters<typeof peaksFind>[0];
  linesPath: string | undefined;
  tolerance: number;
  minSnr: number;
  columns: readonly string[];
}

/**
 * `assign` with a system file: the assistant band by band on one peak list, strongest band first,
 * then one joint fit (analysis/systemAssign.ts). Seeds from --lines go to their band by the band
 * (and species) column. stdout: the single-band assign CSV plus `band` and `species` columns; rows
 * of every band, user seeds first, then proposals by wavenumber; calc and obs_minus_calc from the
 * joint fit. stderr: per band its seeds, counts, refusal and review list; lines held because two
 * bands' predictions reach their peak ("conflict"); the joint fit as `fit` reports a system.
 * @returns exit code 0
 */
export function assignSystem(a: AssignSystemArgs, io: CliIo): number {
  const { system, tracePath } = a;
  const seeds: SystemAssignSeed[] = [];
  if (a.linesPath !== undefined) {
    const table = cliLoadSystemLines(a.linesPath, io);
    if (table.rows.length === 0) throw new CliError(`${a.linesPath}: no lines (only a header); give at least one seed line`);
    const nBands = system.model.species.reduce((n, s) => n + s.bands.length, 0);
    const hasColumn = (name: string) => table.extraColumns.some((c) => c.toLowerCase() === name);
    if (nBands > 1 && !hasColumn('band'))
      throw new CliError(
        `${a.linesPath}: the system file ${a.modelPath} has ${nBands} bands; the seed table needs a band column saying which band each line belongs to` +
          (system.model.species.length > 1 ? ' (and a species column: the system has several species)' : ''),
      );
    const resolved = cliResolveSystemLines(system, table, a.linesPath);
    resolved.forEach((line, i) => {
      const { id, jUpper, kUpper, jLower, kLower, observedCm1, uncertaintyCm1, isBlended, isExcluded, note } = table.rows[i];
      seeds.push({
        speciesIndex: line.speciesIndex,
        band: line.band,
        assignment: { id, jUpper, kUpper, jLower, kLower, observedCm1, uncertaintyCm1, isBlended, isExcluded, note },
      });
    });
  }
  const found = peaksFind(a.trace, { minSnr: a.minSnr });
  const usable = assistantPeaksUsable(found);
  const peaks = usable.peaks;
  if (peaks.count === 0) throw new CliError(`${tracePath}: no peaks found at SNR >= ${a.minSnr}`);
  let result: SystemAssignResult;
  try {
    result = systemAssign({ model: system.model, parameters: system.parameters, peaks, seeds, toleranceSigma: a.tolerance });
  } catch (err) {
    throw new CliError(err instanceof Error ? err.message : String(err));
  }
  const shapeOf = (r: { speciesIndex: number }): TopShape => system.model.species[r.speciesIndex].shape;
  const label = (r: Pick<SystemAssignRow, 'speciesIndex' | 'line'>) => {
    const l = r.line;
    return lineLabelAscii(l.kUpper - l.kLower, l.jUpper - l.jLower, l.kLower, l.jLower, shapeOf(r));
  };
  const overlapped = new Set(result.seedOverlaps.map((c) => c.row));
  const out: string[] = [[...a.columns, ...ASSIGN_SYSTEM_EXTRA_COLUMNS].join(',')];
  for (const r of result.rows) {
    const l = r.line;
    const flags = [l.isBlended && 'blended', r.isSuspect && 'suspect', overlapped.has(r) && 'overlap'].filter(Boolean).join(';');
    out.push(
      [
        l.jUpper,
        l.kUpper,
        l.jLower,
        l.kLower,
        l.observedCm1.toFixed(6),
        l.uncertaintyCm1.toPrecision(3),
        l.status === 'accepted' ? 'seed' : l.status,
        label(r),
        Number.isFinite(r.calcCm1) ? r.calcCm1.toFixed(6) : '',
        Number.isFinite(r.calcCm1) ? (l.observedCm1 - r.calcCm1).toExponential(3) : '',
        Number.isFinite(l.distanceSigma) ? l.distanceSigma.toFixed(2) : '',
        flags,
        csvCell(l.reason),
        csvCell(r.band),
        csvCell(r.species),
      ].join(','),
    );
  }
  io.stdout(out.join('\n') + '\n');
  io.stderr(systemSummary(result, a, peaks.count, usable.repaired.length, label));
  return 0;
}

/** The stderr report: per band, the conflicts, the joint fit. */
function systemSummary(
  result: SystemAssignResult,
  a: AssignSystemArgs,
  nPeaks: number,
  repaired: number,
  label: (r: Pick<SystemAssignRow, 'speciesIndex' | 'line'>) => string,
): string {
  const lines: string[] = [];
  const name = (b: { species: string; band: string }) => `${b.species}/${b.band}`;
  lines.push(
    `assign: ${a.tracePath}: ${nPeaks} peaks at SNR >= ${a.minSnr}${repaired ? ` (${repaired} without a usable centre σ)` : ''}; ` +
      `system ${a.modelPath}: ${result.bands.length} band(s), run strongest first: ${result.bands.map(name).join(', ')}`,
  );
  for (const b of result.bands) {
    const written = result.rows.filter((r) => r.speciesIndex === b.speciesIndex && r.band === b.band);
    const nSeeds = written.filter((r) => r.line.status !== 'proposed').length;
    if (b.refusal) {
      lines.push(`assign: [${name(b)}] not run: ${b.refusal}${b.seedText ? `; ${b.seedText}` : ''}`);
    } else if (b.run?.fit) {
      const run = b.run;
      const fit = run.fit!;
      const excluded = run.lines.filter((l) => l.isExcluded && l.status !== 'rejected').length;
      lines.push(
        `assign: [${name(b)}] ${b.seedText}; ${run.iterations.length} iterations; ${nSeeds} seed(s) and ${written.length - nSeeds} proposed line(s) written; ` +
          `${excluded} excluded as outliers, ${run.ambiguous.length} ambiguous case(s) left undecided, ${run.suspects.length} suspect(s); ` +
          `band fit rms ${fit.rmsCm1.toExponential(3)} cm^-1, sigmaW ${fit.sigmaW === null ? 'n/a' : fit.sigmaW.toFixed(3)}`,
      );
      for (const w of run.warnings) lines.push(`  warning: [${name(b)}] ${w}`);
      if (b.review.length)
        lines.push(
          `assign: [${name(b)}] ${b.review.length} line(s) held for review, not written: ` +
            (run.doubt ? 'the run as a whole is doubtful (see the warning above)' : 'the misassignment hunt distrusts them'),
        );
      for (const r of b.review.slice(0, 10))
        lines.push(`  review: [${name(b)}] ${label({ ...b, line: r })} at ${r.observedCm1.toFixed(4)} (${r.status}): ${r.reason}`);
      if (b.review.length > 10) lines.push(`  review: [${name(b)}] … and ${b.review.length - 10} more`);
      for (const x of run.ambiguous.slice(0, 10)) lines.push(`  ambiguous: [${name(b)}] ${x.reason}`);
      if (run.ambiguous.length > 10) lines.push(`  ambiguous: [${name(b)}] … and ${run.ambiguous.length - 10} more`);
    }
    for (const n of b.notes) lines.push(`  note: [${name(b)}] ${n}`);
  }
  if (result.conflicts.length) {
    lines.push(`assign: ${result.conflicts.length} line(s) held for review, not written: another band's line reaches the same peak`);
    for (const c of result.conflicts.slice(0, 20))
      lines.push(
        `  review: [${name(c.row)}] ${label(c.row)} at ${c.row.line.observedCm1.toFixed(4)} (${c.row.line.status}): conflict: ${c.reason}`,
      );
    if (result.conflicts.length > 20) lines.push(`  review: … and ${result.conflicts.length - 20} more conflicts`);
  }
  for (const c of result.seedOverlaps.slice(0, 20))
    lines.push(
      `  warning: [${name(c.row)}] seed ${label(c.row)} at ${c.row.line.observedCm1.toFixed(4)} written as given, but ${c.reason}`,
    );
  for (const n of result.notes) lines.push(`  note: ${n}`);
  const fit = result.fit;
  if (result.rows.length === 0)
    lines.push('assign: no line assigned in any band; give seed lines of the bands above in --lines (with a band column)');
  if (!fit) lines.push('assign: joint fit: not made (no lines)');
  else if (!fit.ok) lines.push(`assign: joint fit refused: ${fit.error.message} ${fit.error.suggestion}`.trim());
  else {
    const r = fit.result;
    lines.push(
      `assign: joint fit: ${r.nLines} lines, ${r.nParameters} constants, ${r.degreesOfFreedom} degrees of freedom, rms ${r.rmsCm1.toExponential(3)} cm^-1, ` +
        `sigmaW ${r.sigmaW === null ? 'n/a (exactly determined)' : r.sigmaW.toFixed(3)}; ${r.convergenceMessage}`,
    );
    for (const key of r.floated) {
      const p = r.parameters[key];
      const unit = key.endsWith('.zeta') ? '' : ' cm^-1';
      lines.push(`  ${key} = ${p.value.toPrecision(12)} ± ${p.sigma === null ? 'n/a' : p.sigma.toExponential(2)}${unit}`);
    }
    for (const b of r.bands)
      lines.push(
        `  band ${b.species}/${b.band}: ${b.nLines} lines, rms ${b.rmsCm1.toExponential(3)} cm^-1, rms/σ ${b.rmsNormalised.toFixed(2)}`,
      );
    for (const w of r.warnings) lines.push(`  warning: ${w}`);
  }
  return lines.map((l) => l.replace(/\s*\n\s*/g, ' ')).join('\n') + '\n';
}
