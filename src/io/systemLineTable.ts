/**
 * Line tables for system files: the assigned-line CSV of io/lineTable.ts with optional columns that
 * say which band (and species) a line belongs to, which ±l levels it joins, and in which unit its
 * position is given. Every column of the single-band table keeps its meaning.
 *
 * Optional columns (by name, any order, case-insensitive):
 * - `band`: the band's name in the system file (may be left out when the species has one band);
 *   a band whose upper and lower state are the same is that state's pure rotational spectrum.
 * - `species`: the species' name (may be left out when the system has one species).
 * - `l_up`, `l_lo`: l = sign(kℓ) of the upper and lower level: +1 ('+'), −1 ('-') or 0 (a
 *   nondegenerate state, and K = 0 of a degenerate one); needed only where the quantum numbers leave
 *   a choice (a ΔK = 0 band between two degenerate states has a (+l) and a (−l) line for each K > 0).
 * - `tag_up`, `tag_lo`: level tag, e.g. e or f for a linear molecule's Π levels; needed only where
 *   the branch does not decide it (Π–Π bands). With a species that declares a point group: the
 *   species of a member of an A1/A2 pair (A1, A2'', …; the two lines of an unsplit pair need it) and
 *   s or a for an inversion component.
 * - `unit`: cm-1 (default) or MHz. In an MHz row, `wavenumber` holds the frequency in MHz and
 *   `uncertainty` its 1σ in MHz (required); both are converted with c (CODATA, exact).
 */
import { MHZ_PER_CM1 } from '../physics/constants';
import type { Assignment } from '../fit/assignment';
import { ASSIGNMENT_DEFAULT_UNCERTAINTY_CM1 } from '../fit/assignment';
import { inputExcerpt } from './inputLimits';
import { lineTableParse, LineTableError, type LineTable, type LineTableParseOptions } from './lineTable';

/** One row of a system line table: an Assignment (cm^-1) plus its band and level labels. */
export interface SystemLineRow extends Omit<Assignment, 'band' | 'species' | 'lUpper' | 'lLower' | 'tagUpper' | 'tagLower'> {
  /** Band name, or null when the column is absent or the cell blank. */
  band: string | null;
  /** Species name, or null. */
  species: string | null;
  /** l = sign(kℓ) of the upper / lower level, or null when not given. */
  lUpper: -1 | 0 | 1 | null;
  lLower: -1 | 0 | 1 | null;
  /** Level tags, or null when not given. */
  tagUpper: string | null;
  tagLower: string | null;
  /** Unit the row was written in. */
  unit: 'cm-1' | 'MHz';
}

/** A parsed system line table. */
export interface SystemLineTable extends Omit<LineTable, 'assignments'> {
  rows: SystemLineRow[];
}

/** Column names this module reads from the extra columns of a line table. */
export const SYSTEM_LINE_COLUMNS = ['band', 'species', 'l_up', 'l_lo', 'tag_up', 'tag_lo', 'unit'] as const;

// Blank uncertainties come back from lineTableParse with this value (a row's own value is always > 0).
const BLANK_UNCERTAINTY = -1;

function lValue(text: string): -1 | 0 | 1 | undefined {
  const t = text.trim();
  if (t === '+' || t === '+1' || t === '1') return 1;
  if (t === '-' || t === '-1' || t === '−1' || t === '−') return -1;
  if (t === '0') return 0;
  return undefined;
}

/**
 * Parse an assigned-line CSV with the optional system columns.
 * @param text CSV text
 * @param options as lineTableParse (defaultUncertaintyCm1 applies to cm^-1 rows only)
 * @returns rows with positions and uncertainties in cm^-1
 * @throws LineTableError naming the file, line and column
 */
export function systemLineTableParse(text: string, options: LineTableParseOptions = {}): SystemLineTable {
  const table = lineTableParse(text, { ...options, defaultUncertaintyCm1: BLANK_UNCERTAINTY });
  const prefix = options.fileName ? `${inputExcerpt(options.fileName, 1000)}: ` : '';
  const defaultSigma = options.defaultUncertaintyCm1 ?? ASSIGNMENT_DEFAULT_UNCERTAINTY_CM1;
  const columnOf = new Map<string, string>();
  for (const name of table.extraColumns) {
    const lower = name.toLowerCase();
    if ((SYSTEM_LINE_COLUMNS as readonly string[]).includes(lower)) columnOf.set(lower, name);
  }
  const cellOf = (i: number, col: string): string => {
    const name = columnOf.get(col);
    return name === undefined ? '' : (table.extras[i][name] ?? '').trim();
  };
  const rows = table.assignments.map((a, i): SystemLineRow => {
    const line = table.lineNumbers[i];
    const fail = (msg: string): never => {
      throw new LineTableError(`${prefix}line ${line}: ${msg}`);
    };
    const unitText = cellOf(i, 'unit');
    const unitLower = unitText.toLowerCase();
    const unit = unitLower === '' || unitLower === 'cm-1' || unitLower === 'cm^-1' ? 'cm-1' : unitLower === 'mhz' ? 'MHz' : null;
    if (unit === null) fail(`unit '${inputExcerpt(unitText, 20)}' must be cm-1 or MHz`);
    const row: SystemLineRow = {
      ...a,
      band: cellOf(i, 'band') || null,
      species: cellOf(i, 'species') || null,
      lUpper: null,
      lLower: null,
      tagUpper: cellOf(i, 'tag_up') || null,
      tagLower: cellOf(i, 'tag_lo') || null,
      unit: unit!,
    };
    for (const [col, field] of [
      ['l_up', 'lUpper'],
      ['l_lo', 'lLower'],
    ] as const) {
      const t = cellOf(i, col);
      if (t === '') continue;
      const v = lValue(t);
      if (v === undefined) fail(`${col} '${inputExcerpt(t, 20)}' must be +1, -1 or 0 (l = sign(kℓ))`);
      row[field] = v!;
    }
    if (row.unit === 'MHz') {
      if (a.uncertaintyCm1 === BLANK_UNCERTAINTY) fail('an MHz line needs its own uncertainty (MHz) in the uncertainty column');
      row.observedCm1 = a.observedCm1 / MHZ_PER_CM1;
      row.uncertaintyCm1 = a.uncertaintyCm1 / MHZ_PER_CM1;
    } else if (a.uncertaintyCm1 === BLANK_UNCERTAINTY) {
      row.uncertaintyCm1 = defaultSigma;
    }
    return row;
  });
  const { assignments: _drop, ...rest } = table;
  void _drop;
  return { ...rest, rows };
}
