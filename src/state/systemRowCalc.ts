/**
 * Calculated positions of a several-band session's assignments from the system's own lines (the
 * lines the ladders draw: physics/system/systemLines, diagonalised Hamiltonians and interactions
 * included), so the table's calc and o − c agree with what the plot shows. No store, no React.
 */
import type { Assignment } from '../fit/assignment';
import { systemFit } from '../fit/systemFit';
import type { SystemFitLine } from '../fit/systemFitTypes';
import { systemLineResolve } from '../fit/systemLineResolve';
import type { TopShape } from '../physics/model';
import type { SystemLineList } from '../physics/system/systemLines';
import type { SystemModel } from '../physics/system/systemModel';
import { bandKeyOfLine, systemParameters, type SystemBandEntry } from './systemBands';
import { assignmentResolveQuery } from './systemFitInput';
import { levelTagMatches } from './systemLevelLabels';

/** Calculated position and rotor shape of a several-band session's assignments. */
export interface SystemRowCalc {
  /**
   * Position of the line the row names, cm^-1: the system line with the row's band, J, K and (where
   * the row keeps them) l and tags; NaN when the row names no line of its band (or its band is gone).
   */
  calcCm1(a: Assignment): number;
  /** calcCm1 of several rows at once (the rows whose line is not among the lines are calculated in one pass). */
  calcMany(list: readonly Assignment[]): Float64Array;
  /** Rotor shape of the row's species (for its label). */
  shape(a: Assignment): TopShape;
}

/** Two lines closer than this are one position (an unsplit A1/A2 pair), cm^-1. */
const SAME_POSITION_CM1 = 1e-9;

/**
 * The calculator of one system, its lines and active band.
 *
 * A row is looked up among `all` by band key, J and K, then filtered by the l and tags it keeps
 * (as selectAssignmentLevels does). When several lines remain (a row without tags naming a split
 * A1/A2 or s/a pair), the member nearest the observation is the one it can mean. A row whose
 * line is not in `all` (below the intensity cut) is resolved like a fit row (fit/systemLineResolve)
 * and its position computed from the same Hamiltonians (fit/systemFit with nothing floated, one
 * pass for all such rows of a calcMany call: ~10 ms of set-up each, shared), once per assignment object.
 * @param system the session's system
 * @param all every line of the system at the page's intensity cut (null when none could be computed)
 * @param entries the system's bands (state/systemBands)
 * @param activeBandKey band of the rows that name none
 */
export function systemRowCalcCreate(
  system: SystemModel,
  all: SystemLineList | null,
  entries: readonly SystemBandEntry[],
  activeBandKey: string | null,
): SystemRowCalc {
  const entryOf = new Map(entries.map((e) => [e.key, e]));
  let byKey: Map<string, number[]> | null = null;
  const lookup = (key: string): number[] | undefined => {
    if (!all) return undefined;
    if (!byKey) {
      byKey = new Map();
      for (let i = 0; i < all.count; i++) {
        const ref = all.bandRefs[all.bandIndex[i]];
        const k = `${ref.species}/${ref.band}|${all.jUpper[i]},${all.kUpper[i]},${all.jLower[i]},${all.kLower[i]}`;
        const list = byKey.get(k);
        if (list) list.push(i);
        else byKey.set(k, [i]);
      }
    }
    return byKey.get(key);
  };
  const resolved = new WeakMap<Assignment, number>();
  const bandOf = (a: Assignment) => {
    const key = bandKeyOfLine(a) ?? activeBandKey;
    return key !== null ? entryOf.get(key) : undefined;
  };
  /** The row's line among `all` (NaN when it is not there). */
  const fromLines = (a: Assignment, e: SystemBandEntry): number => {
    const list = lookup(`${e.key}|${a.jUpper},${a.kUpper},${a.jLower},${a.kLower}`);
    let best = NaN;
    if (list && all) {
      for (const i of list) {
        if (a.tagUpper !== undefined && !levelTagMatches(all.tagUpper[i], a.tagUpper)) continue;
        if (a.tagLower !== undefined && !levelTagMatches(all.tagLower[i], a.tagLower)) continue;
        if (a.lUpper !== undefined && all.lUpper[i] !== a.lUpper) continue;
        if (a.lLower !== undefined && all.lLower[i] !== a.lLower) continue;
        const nu = all.wavenumberCm1[i];
        if (Number.isNaN(best) || Math.abs(nu - a.observedCm1) < Math.abs(best - a.observedCm1) - SAME_POSITION_CM1) best = nu;
      }
    }
    return best;
  };
  /** Rows not among the lines: resolved one by one, calculated in one fit pass (levels shared per J), cached. */
  const fromLevels = (rows: readonly { a: Assignment; e: SystemBandEntry }[]): void => {
    const lines: SystemFitLine[] = [];
    const owners: Assignment[] = [];
    for (const { a, e } of rows) {
      const r = systemLineResolve(system, assignmentResolveQuery(a, e));
      resolved.set(a, NaN);
      if (!r.ok) continue;
      lines.push({ ...r.line, observedCm1: a.observedCm1, uncertaintyCm1: 1, isExcluded: false });
      owners.push(a);
    }
    if (lines.length === 0) return;
    const out = systemFit({ model: system, parameters: systemParameters(system, []), lines });
    if (out.ok) out.result.lines.forEach((l, k) => resolved.set(owners[k], l.calc));
  };
  const calcMany = (list: readonly Assignment[]): Float64Array => {
    const out = new Float64Array(list.length);
    const missing: { a: Assignment; e: SystemBandEntry }[] = [];
    const missingAt: number[] = [];
    list.forEach((a, k) => {
      const e = bandOf(a);
      if (!e) return void (out[k] = NaN);
      const nu = fromLines(a, e);
      if (!Number.isNaN(nu)) return void (out[k] = nu);
      const hit = resolved.get(a);
      if (hit !== undefined) return void (out[k] = hit);
      missing.push({ a, e });
      missingAt.push(k);
    });
    if (missing.length > 0) {
      fromLevels(missing);
      missingAt.forEach((k, m) => (out[k] = resolved.get(missing[m].a) ?? NaN));
    }
    return out;
  };
  return {
    calcCm1: (a) => calcMany([a])[0],
    calcMany,
    shape(a) {
      const e = bandOf(a);
      return system.species[e?.speciesIndex ?? 0].shape;
    },
  };
}
