/**
 * CSV exports of simulated data: the predicted line list and a spectrum on a grid.
 * (The assigned line table is written by lineTable.ts.)
 */
import { lineLabelAscii } from '../physics/lineLabel';
import type { LineList, TopShape } from '../physics/model';

/** Header of simulatedLinesCsv. */
export const SIMULATED_LINES_COLUMNS = [
  'J_up',
  'K_up',
  'J_lo',
  'K_lo',
  'label',
  'wavenumber_cm-1',
  'intensity_rel',
  'E_lower_cm-1',
  'honl_london',
] as const;

/**
 * The predicted line list as CSV (one row per line, in ascending wavenumber), numbers written with
 * full double precision (shortest round-trip form).
 * @param lines predicted lines (cm^-1, relative intensities)
 * @param shape rotor shape (for labels)
 * @param bands several bands: each line's band (index into names) and the bands' names, written as
 *   `band` and `species` columns (names are system-file names: no commas or quotes)
 */
export function simulatedLinesCsv(
  lines: LineList,
  shape: TopShape,
  bands?: { bandOfLine: ArrayLike<number>; names: readonly { band: string; species: string }[] },
): string {
  const order = Array.from({ length: lines.count }, (_, i) => i).sort((a, b) => lines.wavenumberCm1[a] - lines.wavenumberCm1[b]);
  const rows: string[] = [[...SIMULATED_LINES_COLUMNS, ...(bands ? ['band', 'species'] : [])].join(',')];
  for (const i of order) {
    rows.push(
      [
        lines.jUpper[i],
        lines.kUpper[i],
        lines.jLower[i],
        lines.kLower[i],
        lineLabelAscii(lines.deltaK[i], lines.deltaJ[i], lines.kLower[i], lines.jLower[i], shape),
        lines.wavenumberCm1[i],
        lines.intensity[i],
        lines.eLowerCm1[i],
        lines.honlLondon[i],
        ...(bands ? [bands.names[bands.bandOfLine[i]].band, bands.names[bands.bandOfLine[i]].species] : []),
      ].join(','),
    );
  }
  return rows.join('\n') + '\n';
}

/**
 * A spectrum as CSV: first column wavenumber (cm^-1), then one column per named series.
 * @param xCm1 abscissae, cm^-1
 * @param columns header name → values (same length as xCm1); names must be plain words
 * @throws naming the column when a length differs or a name holds a comma, quote or newline
 */
export function spectrumCsv(xCm1: Float64Array, columns: Record<string, ArrayLike<number>>): string {
  const names = Object.keys(columns);
  for (const n of names) {
    if (/[",\r\n]/.test(n)) throw new Error(`spectrumCsv: column name ${JSON.stringify(n)} may not contain a comma, quote or newline`);
    if (columns[n].length !== xCm1.length)
      throw new Error(`spectrumCsv: column '${n}' has ${columns[n].length} values, expected ${xCm1.length}`);
  }
  const parts: string[] = [['wavenumber_cm-1', ...names].join(',')];
  const cols = names.map((n) => columns[n]);
  for (let i = 0; i < xCm1.length; i++) {
    let row = String(xCm1[i]);
    for (const c of cols) row += ',' + String(c[i]);
    parts.push(row);
  }
  return parts.join('\n') + '\n';
}
