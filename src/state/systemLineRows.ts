/**
 * Rows of a line table read into a several-band session: each row's band and species from its
 * `band`/`species` columns (the active band when it names none and the system leaves a choice),
 * checked against the system's selection rules (fit/systemLineResolve), refused by line number.
 */
import type { Assignment } from '../fit/assignment';
import { assignmentLevelLabels } from './systemLevelLabels';
import { systemLineResolve } from '../fit/systemLineResolve';
import type { SystemLineTable } from '../io/systemLineTable';
import type { SystemModel } from '../physics/system/systemModel';
import type { SystemBandEntry } from './systemBands';

/**
 * Assignments with their band from a system line table.
 * @param table parsed rows (cm^-1)
 * @param system the session's system
 * @param active the active band (rows naming no band or species go there when the system has several)
 */
export function systemTableAssignments(
  table: SystemLineTable,
  system: SystemModel,
  active: SystemBandEntry,
): { kept: Assignment[]; refused: { lineNumber: number; reason: string }[] } {
  const kept: Assignment[] = [];
  const refused: { lineNumber: number; reason: string }[] = [];
  table.rows.forEach((row, i) => {
    const species = row.species ?? (system.species.length === 1 ? system.species[0].name : active.species);
    const sp = system.species.find((x) => x.name === species);
    const band = row.band ?? (sp && sp.bands.length === 1 ? sp.bands[0].name : species === active.species ? active.band : null);
    const r = systemLineResolve(system, { ...row, species, band });
    if (!r.ok) {
      refused.push({ lineNumber: table.lineNumbers[i], reason: r.message });
      return;
    }
    const { band: _b, species: _s, lUpper: _lu, lLower: _ll, tagUpper: _tu, tagLower: _tl, unit: _u, ...a } = row;
    // The resolved levels' labels are kept, so a split A1/A2 pair or an s/a pair stays told apart in the joint fit.
    kept.push({ ...a, band: r.line.band, species: system.species[r.line.speciesIndex].name, ...assignmentLevelLabels(r.line) });
  });
  return { kept, refused };
}
