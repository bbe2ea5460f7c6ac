/**
 * The table's calculated positions in a several-band session come from the system's own lines
 * (the ones the ladders draw), not from the closed-form single-band view: an invented C3v molecule
 * with an E state carrying q22, a ground state with h3 (K = 3 pairs split into A1/A2) and a
 * Coriolis coupling v3 ↔ v4 — the closed form is off by up to tenths of a cm⁻¹ for it.
 */
import { beforeEach, describe, expect, it } from 'vitest';
import type { Assignment } from '../../src/fit/assignment';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { systemFileFromJson, systemFileParse } from '../../src/io/systemFile';
import { systemLines, type SystemLineList } from '../../src/physics/system/systemLines';
import { transitionWavenumber } from '../../src/physics/termValues';
import { bandToggle, systemLoad } from '../../src/state/actionsSystem';
import { selectAssignmentRows } from '../../src/state/selectors';
import { selectAssignmentDrawnLines, selectAssignmentLevels, selectDrawnBands } from '../../src/state/selectorsSystem';
import { benchStore } from '../../src/state/store';
import { systemBandEntries } from '../../src/state/systemBands';
import { transitionSymmetryText } from '../../src/state/systemLevelLabels';
import { INVENTED_C3V_SPECIES } from './fixtures';

/** Invented C3v symmetric top (constants made up; h3 exaggerated so the K = 3 pairs split visibly). */
const SYSTEM = {
  temperature: 200,
  jMax: 30,
  kMax: 8,
  species: [INVENTED_C3V_SPECIES],
};

const MIN_INTENSITY = 0.002;

function load(): { lines: SystemLineList; all: SystemLineList } {
  const file = systemFileFromJson(SYSTEM);
  benchStore.setState({ ...benchStore.getInitialState(), minIntensity: MIN_INTENSITY });
  expect(systemLoad({ system: file.model, name: 'lb3v' }, 'load')).toBe(true);
  return { lines: systemLines(file.model, { minIntensity: MIN_INTENSITY }), all: systemLines(file.model, { minIntensity: 0 }) };
}

/** An assignment of line i at its own position plus `offsetCm1`, with the labels the page keeps. */
function assignmentOf(lines: SystemLineList, i: number, id: string, offsetCm1 = 0): Assignment {
  const ref = lines.bandRefs[lines.bandIndex[i]];
  return {
    id,
    jUpper: lines.jUpper[i],
    kUpper: lines.kUpper[i],
    jLower: lines.jLower[i],
    kLower: lines.kLower[i],
    observedCm1: lines.wavenumberCm1[i] + offsetCm1,
    uncertaintyCm1: 0.001,
    isBlended: false,
    isExcluded: false,
    note: '',
    band: ref.band,
    species: ref.species,
    ...(lines.lUpper[i] ? { lUpper: lines.lUpper[i] as -1 | 1 } : {}),
    ...(lines.lLower[i] ? { lLower: lines.lLower[i] as -1 | 1 } : {}),
    ...(lines.tagUpper[i] ? { tagUpper: lines.tagUpper[i] } : {}),
    ...(lines.tagLower[i] ? { tagLower: lines.tagLower[i] } : {}),
  };
}

/** Every 7th line of each band (P, Q, R; E levels, A1/A2 members, K = 0), so ~hundreds of rows. */
function sample(lines: SystemLineList, band: string): number[] {
  const out: number[] = [];
  for (let i = 0; i < lines.count; i++) if (lines.bandRefs[lines.bandIndex[i]].band === band && i % 7 === 0) out.push(i);
  return out;
}

beforeEach(() => benchStore.setState(benchStore.getInitialState()));

describe('calc and o − c of a several-band session come from the system lines', () => {
  it('gives every row its drawn line position (|o − c| < 1e-9 cm⁻¹, no far flag), where the closed form is far off', () => {
    const { lines } = load();
    const picks = [...sample(lines, 'nu4'), ...sample(lines, 'nu3')];
    expect(picks.length).toBeGreaterThan(100);
    // Some picks are members of split K = 3 pairs (both tags present) and some E lines with l.
    expect(picks.some((i) => lines.tagLower[i] === 'A1' || lines.tagLower[i] === 'A2')).toBe(true);
    const assignments = picks.map((i, n) => assignmentOf(lines, i, `a${n + 1}`));
    benchStore.setState({ assignments });
    const rows = selectAssignmentRows(benchStore.getState());
    expect(rows).toHaveLength(picks.length);
    picks.forEach((i, n) => {
      expect(Math.abs(rows[n].calcCm1 - lines.wavenumberCm1[i])).toBeLessThan(1e-9);
      expect(Math.abs(rows[n].omcCm1)).toBeLessThan(1e-9);
      expect(rows[n].isFar).toBe(false);
    });
    // The closed-form single-band view (what the table used before) misses these lines by far more
    // than the default flag tolerance: the check above could fail.
    const entries = systemBandEntries(benchStore.getState().system!);
    const worst = Math.max(
      ...picks.map((i, n) => {
        const a = assignments[n];
        const view = entries.find((e) => e.band === a.band)!.view!;
        return Math.abs(transitionWavenumber(view, a.jUpper, a.kUpper, a.jLower, a.kLower) - lines.wavenumberCm1[i]);
      }),
    );
    expect(worst).toBeGreaterThan(0.05);
  });

  it('names both members of a split pair apart by their tags', () => {
    const { lines } = load();
    let i1 = -1;
    let i2 = -1;
    for (let i = 0; i < lines.count && i2 < 0; i++) {
      if (lines.bandRefs[lines.bandIndex[i]].band !== 'nu4' || lines.tagLower[i] !== 'A1' || lines.jLower[i] < 10) continue;
      for (let j = 0; j < lines.count; j++)
        if (
          j !== i &&
          lines.bandIndex[j] === lines.bandIndex[i] &&
          lines.jUpper[j] === lines.jUpper[i] &&
          lines.kUpper[j] === lines.kUpper[i] &&
          lines.jLower[j] === lines.jLower[i] &&
          lines.kLower[j] === lines.kLower[i]
        ) {
          i1 = i;
          i2 = j;
        }
    }
    expect(i2).toBeGreaterThanOrEqual(0);
    expect(Math.abs(lines.wavenumberCm1[i1] - lines.wavenumberCm1[i2])).toBeGreaterThan(1e-3);
    benchStore.setState({ assignments: [assignmentOf(lines, i1, 'a1'), assignmentOf(lines, i2, 'a2')] });
    const s = benchStore.getState();
    const rows = selectAssignmentRows(s);
    expect(rows[0].calcCm1).toBeCloseTo(lines.wavenumberCm1[i1], 9);
    expect(rows[1].calcCm1).toBeCloseTo(lines.wavenumberCm1[i2], 9);
    // Their level labels are those of the same lines.
    const levels = selectAssignmentLevels(s);
    expect(transitionSymmetryText({ ...levels[0]! })).toBe(`${lines.tagUpper[i1]} ← ${lines.tagLower[i1]}`);
    // And the ladder markers go to each member's own drawn line (same J and K, other rung).
    const drawn = selectDrawnBands(s);
    const at = selectAssignmentDrawnLines(s)!;
    expect(at[0]).not.toBe(at[1]);
    expect(drawn.lines.wavenumberCm1[at[0]]).toBeCloseTo(lines.wavenumberCm1[i1], 9);
    expect(drawn.lines.wavenumberCm1[at[1]]).toBeCloseTo(lines.wavenumberCm1[i2], 9);
  });

  it('keeps calc for a band switched off, a line under the intensity cut and a band with no single-band view', () => {
    const { lines, all } = load();
    // A weak nu4 line (under the cut, not drawn), a line of the hot band (no single-band view).
    let weak = -1;
    let hot = -1;
    for (let i = 0; i < all.count; i++) {
      const band = all.bandRefs[all.bandIndex[i]].band;
      if (weak < 0 && band === 'nu4' && all.intensity[i] < MIN_INTENSITY / 10 && all.jLower[i] > 20) weak = i;
      if (hot < 0 && band === 'hot' && all.jLower[i] === 12 && all.kLower[i] === 2) hot = i;
    }
    expect(weak).toBeGreaterThanOrEqual(0);
    expect(hot).toBeGreaterThanOrEqual(0);
    const strong = sample(lines, 'nu3')[3];
    benchStore.setState({
      assignments: [assignmentOf(all, weak, 'a1', 0.002), assignmentOf(all, hot, 'a2'), assignmentOf(lines, strong, 'a3', -0.001)],
    });
    let rows = selectAssignmentRows(benchStore.getState());
    expect(rows[0].calcCm1).toBeCloseTo(all.wavenumberCm1[weak], 9);
    expect(rows[0].omcCm1).toBeCloseTo(0.002, 9);
    expect(rows[1].calcCm1).toBeCloseTo(all.wavenumberCm1[hot], 9);
    expect(rows[2].omcCm1).toBeCloseTo(-0.001, 9);
    bandToggle('LB-3v/nu3');
    rows = selectAssignmentRows(benchStore.getState());
    expect(rows[2].calcCm1).toBeCloseTo(lines.wavenumberCm1[strong], 9);
  });

  it('calculates inversion components of an NH3-like D3h system from rows naming only s or a', () => {
    // The NH3 ν2 start model of the fixtures (constants near 14NH3 from memory; see its "notes").
    const file = systemFileParse(readFileSync(join(__dirname, '../fixtures/systems/nh3-nu2-inversion.json'), 'utf8'));
    benchStore.setState({ ...benchStore.getInitialState(), minIntensity: MIN_INTENSITY });
    expect(systemLoad({ system: file.model, name: 'nh3' }, 'load')).toBe(true);
    const lines = systemLines(file.model, { minIntensity: MIN_INTENSITY });
    const picks: number[] = [];
    for (let i = 0; i < lines.count && picks.length < 60; i += 3) if (lines.tagUpper[i] && lines.tagLower[i]) picks.push(i);
    expect(picks.length).toBe(60);
    // A line-table row gives just the component ("a" for "a:A2''"), as fit/systemLineResolve reads it.
    const assignments = picks.map((i, n) => {
      const a = assignmentOf(lines, i, `a${n + 1}`);
      return { ...a, tagUpper: lines.tagUpper[i].split(':')[0], tagLower: lines.tagLower[i].split(':')[0] };
    });
    expect(assignments.some((a) => a.tagUpper === 's') && assignments.some((a) => a.tagUpper === 'a')).toBe(true);
    benchStore.setState({ assignments });
    const rows = selectAssignmentRows(benchStore.getState());
    picks.forEach((i, n) => expect(Math.abs(rows[n].calcCm1 - lines.wavenumberCm1[i])).toBeLessThan(1e-9));
  });

  it('gives NaN (not a wrong number) for a row naming no line of its band', () => {
    load();
    // K'' = 5 > J'' = 4: no such level, so no line (a ΔK = 0 line would not do: the Coriolis
    // coupling to v3 lends nu4 such lines).
    const a: Assignment = {
      id: 'a1',
      jUpper: 5,
      kUpper: 4,
      jLower: 4,
      kLower: 5,
      observedCm1: 1055,
      uncertaintyCm1: 0.001,
      isBlended: false,
      isExcluded: false,
      note: '',
      band: 'nu4',
      species: 'LB-3v',
    };
    benchStore.setState({ assignments: [a] });
    const rows = selectAssignmentRows(benchStore.getState());
    expect(rows[0].calcCm1).toBeNaN();
    expect(rows[0].isFar).toBe(false);
  });
});
