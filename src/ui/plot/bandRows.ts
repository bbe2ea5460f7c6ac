/**
 * Ladder rows of several bands in one panel: each band's own rows (as ladderRowsBuild makes them
 * for one band), named with the band, coloured in the band's colour family, stacked in band order
 * (the first band at the top).
 */
import type { Ladder } from '../../physics/bandLadders';
import type { TopShape } from '../../physics/model';
import { ladderRowsBuild, type LadderRow } from './ladderGeometry';
import { bandLadderColour } from './plotColours';

/** One band's part of the panel. */
export interface BandRowsInput {
  /** Band key "species/band" (the prefix of its ladders' keys). */
  key: string;
  /** Short name shown before each row name. */
  name: string;
  /** Band number in the system (decides its colour family). */
  index: number;
  shape: TopShape;
  /** The band's ladders, keys "<band key>|<ladder key>". */
  ladders: readonly Ladder[];
}

/**
 * Rows of every band given, stacked.
 * @param bands the bands switched on, in system order
 * @param hiddenRows row keys ("r:3") hidden in every band
 * @param isDark dark theme colours
 */
export function bandRowsBuild(bands: readonly BandRowsInput[], hiddenRows: readonly string[], isDark: boolean): LadderRow[] {
  const rows: LadderRow[] = [];
  for (const b of bands) {
    const hidden = new Set(hiddenRows.map((h) => `${b.key}|${h}`));
    for (const row of ladderRowsBuild(b.ladders, b.shape, hidden)) {
      rows.push({
        ...row,
        tickHtml: `${escapeText(b.name)} ${row.tickHtml}`,
        name: `${b.name}: ${row.name}`,
        colour: bandLadderColour(b.index, row.deltaK, row.kLower, isDark),
      });
    }
  }
  rows.forEach((row, i) => (row.y = rows.length - 1 - i));
  return rows;
}

/** Text safe inside row-name markup (which knows only sup/sub tags). */
function escapeText(text: string): string {
  return text.replace(/[<>&]/g, '');
}
