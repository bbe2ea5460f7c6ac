/**
 * The assignment assistant over every band of a system: band by band on one peak list, then one
 * joint fit of everything assigned.
 */
import type { Assignment } from '../fit/assignment';
import { systemFit } from '../fit/systemFit';
import type { SystemFitLine, SystemFitOutcome, SystemParameter } from '../fit/systemFitTypes';
import { systemLineResolve } from '../fit/systemLineResolve';
import type { BandModel } from '../physics/model';
import { transitionWavenumber } from '../physics/termValues';
import { systemLines, type SystemLineList } from '../physics/system/systemLines';
import type { SystemModel } from '../physics/system/systemModel';
import { assistantAutoExtend } from './assistantAutoExtend';
import { assistantNearestPeak, assistantPeakContext } from './assistantPeakContext';
import { assistantLinesFromAssignments } from './assistantReview';
import { assistantSeedFromModel } from './assistantSeedFromModel';
import type { AssistantLine, AssistantRunResult } from './assistantTypes';
import type { PeakList } from './peaksFind';
import { systemBandModel } from './systemBandModel';

/** A seed line of the user, resolved to its species and band. */
export interface SystemAssignSeed {
  speciesIndex: number;
  band: string;
  /** The line (cm^-1). */
  assignment: Assignment;
}

/** Inputs of systemAssign. */
export interface SystemAssignInput {
  model: SystemModel;
  /** The system's constants with their status (start values, cm^-1). */
  parameters: readonly SystemParameter[];
  /** Peaks of the trace (usable centre σ), ascending wavenumber. */
  peaks: PeakList;
  /** The user's seed lines, by band (may be empty). */
  seeds: readonly SystemAssignSeed[];
  /** k of the k·σ matching window (the assistant's toleranceSigma). */
  toleranceSigma: number;
}

/** One band's part of the run. */
export interface SystemAssignBand {
  speciesIndex: number;
  species: string;
  band: string;
  /** Sum of the band's simulated intensities at the start constants (strongest line of all bands = 1). */
  intensity: number;
  /** Why the assistant did not run on the band (or its run gave no fit), or null. */
  refusal: string | null;
  /** What the band's single-band model leaves out, and other remarks. */
  notes: string[];
  /** Where the band's seeds came from, in words. */
  seedText: string;
  /** The band's single-band model at the start of its run (after a model-only shift search). */
  model: BandModel | null;
  /** The assistant's run (peak indices in its lines refer to the band's own peak subset). */
  run: AssistantRunResult | null;
  /** Peaks the band's run was offered: index in the subset → index in the full peak list. */
  peakOfSubset: Int32Array;
  /** Lines the run holds for review (distrusted proposals, or all machine lines of a doubtful run); peakIndex in the full list. */
  review: AssistantLine[];
}

/** An assigned line of some band, peak index in the full list. */
export interface SystemAssignRow {
  speciesIndex: number;
  species: string;
  band: string;
  line: AssistantLine;
  /** Calculated position from the joint fit (or the band's own fit when the joint fit failed), cm^-1. */
  calcCm1: number;
  /** 'suspect' when the band's misassignment hunt distrusts this seed. */
  isSuspect: boolean;
}

/** A line whose peak another band's prediction also reaches within tolerance. */
export interface SystemAssignConflict {
  row: SystemAssignRow;
  /** Plain words: the other band's line and how close. */
  reason: string;
}

/** Outcome of systemAssign. */
export interface SystemAssignResult {
  /** Bands, strongest first. */
  bands: SystemAssignBand[];
  /** Confident lines (written): user seeds first (band order), then proposals by wavenumber. */
  rows: SystemAssignRow[];
  /** Machine-made lines on a peak that another band's line also reaches: for review, not written. */
  conflicts: SystemAssignConflict[];
  /** User seeds on such a peak: written (the user said so) but reported. */
  seedOverlaps: SystemAssignConflict[];
  /** The joint fit of the written rows. */
  fit: SystemFitOutcome | null;
  /** Plain remarks about the whole run. */
  notes: string[];
}

/** Another band's line at least this fraction of a line's intensity on its peak makes a conflict (the assistant's blend-partner fraction). */
const CONFLICT_INTENSITY_FRACTION = 0.1;
/** Width floor of the matching σ, fraction of the peak's FWHM (the assistant's default). */
const WIDTH_FLOOR_FRACTION = 0.1;

/**
 * Run the assignment assistant (assistantAutoExtend) band by band on one peak list, strongest band
 * first (sum of the system's simulated intensities), each band as the single-band model it
 * corresponds to (systemBandModel; a band that model cannot express is refused in words and the
 * others go on). A band starts from the user's seeds of that band, or from the model alone when it
 * has none (assistantSeedFromModel; refused when that search is ambiguous). Peaks taken confidently
 * by a band, and peaks the user's seeds of other bands sit on, are not offered to later bands.
 * Then one joint fit (systemFit) of every confident line, started from the bands' own fits; with
 * its constants every band's lines are predicted again, and a machine-made line whose peak another
 * band's line (≥ 10 % of its intensity) also reaches within k·σ of the pair (σ: the peak's centre σ,
 * a tenth of its FWHM and the line's σ, or the run's matching σ if larger) is moved to the conflict
 * list and the joint fit repeated without it. A user seed on such a peak stays (reported).
 * Never throws for bad data; an assistant error on one band refuses that band.
 * @param input system, peaks, seeds, tolerance
 */
export function systemAssign(input: SystemAssignInput): SystemAssignResult {
  const { model, parameters, peaks, seeds, toleranceSigma } = input;
  const notes: string[] = [];
  const start = systemLines(model);
  const bandSum = new Float64Array(start.bandRefs.length);
  for (let i = 0; i < start.count; i++) bandSum[start.bandIndex[i]] += start.intensity[i];
  const refs = model.species.flatMap((s, speciesIndex) => s.bands.map((b) => ({ speciesIndex, species: s.name, band: b.name })));
  const intensityOf = (speciesIndex: number, band: string) => {
    const i = start.bandRefs.findIndex((r) => r.speciesIndex === speciesIndex && r.band === band);
    return i >= 0 ? bandSum[i] : 0;
  };
  const order = refs.map((r) => ({ ...r, intensity: intensityOf(r.speciesIndex, r.band) })).sort((a, b) => b.intensity - a.intensity);
  const sameBand = (a: { speciesIndex: number; band: string }, b: { speciesIndex: number; band: string }) =>
    a.speciesIndex === b.speciesIndex && a.band === b.band;

  // Peaks the user's seeds sit on are reserved for their band.
  const seedPeak = seeds.map((s) => {
    const k = assistantNearestPeak(peaks, s.assignment.observedCm1);
    return k >= 0 && Math.abs(peaks.wavenumberCm1[k] - s.assignment.observedCm1) <= 0.5 * peaks.fwhmCm1[k] ? k : -1;
  });
  const taken = new Uint8Array(peaks.count);
  const bands: SystemAssignBand[] = [];
  const rows: SystemAssignRow[] = [];
  for (const ref of order) {
    const band: SystemAssignBand = {
      ...ref,
      refusal: null,
      notes: [],
      seedText: '',
      model: null,
      run: null,
      peakOfSubset: new Int32Array(0),
      review: [],
    };
    bands.push(band);
    const own = seeds.filter((s) => sameBand(s, ref));
    const converted = systemBandModel(model, parameters, ref.speciesIndex, ref.band);
    if (!converted.ok) {
      band.refusal = converted.reason;
      // The user's lines of a band the assistant cannot run on still enter the joint fit as given.
      own.forEach((s, j) => rows.push(userRow(ref, s.assignment, seedPeak[seeds.indexOf(own[j])], peaks)));
      if (own.length) band.seedText = `${own.length} seed line(s) used as given (joint fit only)`;
      continue;
    }
    band.notes.push(...converted.notes);
    const reservedElsewhere = new Set<number>();
    seeds.forEach((s, j) => !sameBand(s, ref) && seedPeak[j] >= 0 && reservedElsewhere.add(seedPeak[j]));
    const subsetIndex: number[] = [];
    for (let k = 0; k < peaks.count; k++) if (!taken[k] && !reservedElsewhere.has(k)) subsetIndex.push(k);
    band.peakOfSubset = Int32Array.from(subsetIndex);
    if (subsetIndex.length === 0) {
      band.refusal = 'no peak is left for this band (every peak is taken by a stronger band or by another band’s seeds)';
      continue;
    }
    const sub = peaksSubset(peaks, subsetIndex);
    let bandModel = converted.model;
    let lines: AssistantLine[];
    const prefix = `${ref.species}/${ref.band}:`;
    try {
      if (own.length) {
        const context = assistantPeakContext(sub);
        lines = assistantLinesFromAssignments(
          own.map((s) => s.assignment),
          bandModel,
          sub,
          context,
        );
        band.seedText = `${own.length} seed line(s) from the line table`;
      } else {
        const seeded = assistantSeedFromModel(bandModel, sub, converted.floatable, { idPrefix: `${prefix}seed` });
        band.notes.push(...seeded.warnings);
        if (seeded.lines.length === 0) {
          band.refusal = 'no seed lines could be picked from the model alone; give seed lines of this band (band column)';
          continue;
        }
        if (seeded.isAmbiguous) {
          band.refusal =
            'the model alone cannot place this band’s ladder unambiguously (two shifts fit the peaks about equally well); give seed lines of this band';
          continue;
        }
        bandModel = seeded.model;
        lines = seeded.lines;
        band.seedText = `${lines.length} seed line(s) from the model alone`;
      }
      band.model = bandModel;
      band.run = assistantAutoExtend({
        model: bandModel,
        floatable: converted.floatable,
        peaks: sub,
        lines,
        options: { toleranceSigma },
        idPrefix: `${prefix}auto`,
      });
    } catch (err) {
      band.refusal = `the assistant stopped: ${err instanceof Error ? err.message : String(err)}`;
      continue;
    }
    const run = band.run;
    const toFull = (l: AssistantLine): AssistantLine => ({ ...l, peakIndex: l.peakIndex === null ? null : band.peakOfSubset[l.peakIndex] });
    if (!run.fit) {
      band.refusal = `no fit could be made from the band's lines: ${run.fitError?.message ?? 'unknown reason'}`;
      continue;
    }
    const suspect = new Set(run.suspects.map((s) => s.id));
    const kept = run.lines.filter((l) => l.status !== 'rejected' && !l.isExcluded);
    const isMachine = (l: AssistantLine) => l.status === 'proposed' || l.source === 'auto-seed';
    band.review = kept.filter((l) => isMachine(l) && (run.doubt !== null || suspect.has(l.id))).map(toFull);
    const held = new Set(band.review.map((l) => l.id));
    for (const l of kept) {
      if (held.has(l.id)) continue;
      const full = toFull(l);
      rows.push({ ...ref, line: full, calcCm1: NaN, isSuspect: suspect.has(l.id) });
      if (full.peakIndex !== null) taken[full.peakIndex] = 1;
    }
  }

  // Joint fit, started from the bands' own fits; then the conflict check with its constants.
  const startParameters = parametersFromBandFits(model, parameters, bands);
  // Notes of the joint fit are those of its last run (the one reported).
  let jointNotes: string[] = [];
  let fit = jointFit(model, startParameters, rows, jointNotes);
  const conflicts: SystemAssignConflict[] = [];
  const seedOverlaps: SystemAssignConflict[] = [];
  if (fit?.ok) {
    const fitted = modelWithParameters(model, parameters, fit.result.parameters);
    const found = overlapsFind(fitted, rows, peaks, toleranceSigma);
    for (const c of found) (c.row.line.source === 'user' ? seedOverlaps : conflicts).push(c);
    if (conflicts.length) {
      jointNotes = [];
      const out = new Set(conflicts.map((c) => c.row));
      const keep = rows.filter((r) => !out.has(r));
      rows.length = 0;
      rows.push(...keep);
      fit = jointFit(model, startParameters, rows, jointNotes);
    }
  }
  notes.push(...jointNotes);
  if (fit?.ok) fit.result.lines.forEach((l, i) => (rows[i].calcCm1 = l.calc));
  else for (const r of rows) r.calcCm1 = bandCalc(bands, r);
  const isSeed = (r: SystemAssignRow) => r.line.status !== 'proposed';
  const written = [...rows.filter(isSeed), ...rows.filter((r) => !isSeed(r)).sort((a, b) => a.line.observedCm1 - b.line.observedCm1)];
  return { bands, rows: written, conflicts, seedOverlaps, fit, notes };
}

/** A user line of a band the assistant does not run on, as an assistant line. */
function userRow(
  ref: { speciesIndex: number; species: string; band: string },
  a: Assignment,
  peak: number,
  peaks: PeakList,
): SystemAssignRow {
  const line: AssistantLine = {
    ...a,
    status: 'seed',
    source: 'user',
    peakIndex: peak >= 0 && peak < peaks.count ? peak : null,
    predictedCm1: NaN,
    matchSigmaCm1: NaN,
    distanceSigma: NaN,
    reason: 'seed line of a band the assistant does not run on',
    iteration: 0,
  };
  return { ...ref, line, calcCm1: NaN, isSuspect: false };
}

/** The peaks at the given indices, as a peak list of their own. */
function peaksSubset(peaks: PeakList, index: readonly number[]): PeakList {
  const pick = <T extends Float64Array | Uint8Array>(a: T): T => {
    const out = new (a.constructor as { new (n: number): T })(index.length);
    index.forEach((k, i) => (out[i] = a[k]));
    return out;
  };
  return {
    count: index.length,
    wavenumberCm1: pick(peaks.wavenumberCm1),
    height: pick(peaks.height),
    fwhmCm1: pick(peaks.fwhmCm1),
    snr: pick(peaks.snr),
    prominence: pick(peaks.prominence),
    isBlend: pick(peaks.isBlend),
    centreSigmaCm1: pick(peaks.centreSigmaCm1),
    noiseSigma: peaks.noiseSigma,
  };
}

/**
 * Start values for the joint fit: each floated constant from the fit of the strongest band that
 * determined it (upper.origin of a band gives the upper state's origin above the lower one's).
 */
function parametersFromBandFits(
  model: SystemModel,
  parameters: readonly SystemParameter[],
  bands: readonly SystemAssignBand[],
): SystemParameter[] {
  const out = parameters.map((p) => ({ ...p }));
  const set = new Set<SystemParameter>();
  const find = (speciesIndex: number, state: string, name: string) =>
    out.find((p) => p.speciesIndex === speciesIndex && p.state === state && p.name === name && p.status === 'floated');
  const valueOf = (speciesIndex: number, state: string, name: string) =>
    out.find((p) => p.speciesIndex === speciesIndex && p.state === state && p.name === name)?.value ??
    model.species[speciesIndex].states.find((s) => s.name === state)?.constants[name] ??
    0;
  for (const band of bands) {
    const fit = band.run?.fit;
    if (!fit) continue;
    const b = model.species[band.speciesIndex].bands.find((x) => x.name === band.band)!;
    for (const key of fit.floated) {
      const [side, name] = key.split('.');
      const value = fit.parameters[key].value;
      const state = side === 'upper' ? b.upper : b.lower;
      if (name === 'origin') {
        const up = find(band.speciesIndex, b.upper, 'origin');
        const lo = find(band.speciesIndex, b.lower, 'origin');
        if (up && !set.has(up)) {
          up.value = value + valueOf(band.speciesIndex, b.lower, 'origin');
          set.add(up);
        } else if (lo && !set.has(lo)) {
          lo.value = valueOf(band.speciesIndex, b.upper, 'origin') - value;
          set.add(lo);
        }
        continue;
      }
      const p = find(band.speciesIndex, state, name);
      if (p && !set.has(p) && Number.isFinite(value)) {
        p.value = value;
        set.add(p);
      }
    }
  }
  // Tied constants carry the value of the one they follow.
  const byKey = new Map(out.map((p) => [p.key, p]));
  for (const p of out) if (p.status === 'tied' && p.same) p.value = byKey.get(p.same)?.value ?? p.value;
  return out;
}

/** The joint fit of the rows (null when there are none); a resolution failure is a note. */
function jointFit(
  model: SystemModel,
  start: SystemParameter[],
  rows: readonly SystemAssignRow[],
  notes: string[],
): SystemFitOutcome | null {
  if (rows.length === 0) return null;
  const held = jointFitHold(model, start, rows);
  notes.push(...held.notes);
  const parameters = held.parameters;
  const lines: SystemFitLine[] = [];
  for (const r of rows) {
    const l = r.line;
    const q = systemLineResolve(model, {
      band: r.band,
      species: r.species,
      jUpper: l.jUpper,
      kUpper: l.kUpper,
      jLower: l.jLower,
      kLower: l.kLower,
      lUpper: null,
      lLower: null,
      tagUpper: null,
      tagLower: null,
    });
    if (!q.ok) {
      notes.push(`joint fit not made: ${r.species}/${r.band} line at ${l.observedCm1.toFixed(4)}: ${q.message}`);
      return null;
    }
    lines.push({ ...q.line, observedCm1: l.observedCm1, uncertaintyCm1: l.uncertaintyCm1, isExcluded: false });
  }
  return systemFit({ model, parameters, lines });
}

/**
 * What the joint fit may float: constants of states no assigned line reaches are held at their
 * values, and where the assigned bands join states that are not linked to the species' lowest state
 * (a hot band without its fundamental), only origin differences are determined, so the origin of the
 * lowest state of each such group is held too. Each hold is said in words.
 */
function jointFitHold(
  model: SystemModel,
  start: readonly SystemParameter[],
  rows: readonly SystemAssignRow[],
): { parameters: SystemParameter[]; notes: string[] } {
  const notes: string[] = [];
  const parameters = start.map((p) => ({ ...p }));
  model.species.forEach((species, s) => {
    const bands = new Set(rows.filter((r) => r.speciesIndex === s).map((r) => r.band));
    const reached = new Set<string>();
    // Union–find over states joined by a band with assigned lines.
    const parent = new Map<string, string>();
    const root = (x: string): string => {
      while (parent.get(x) !== x) x = parent.get(x)!;
      return x;
    };
    for (const st of species.states) parent.set(st.name, st.name);
    for (const b of species.bands) {
      if (!bands.has(b.name)) continue;
      reached.add(b.upper);
      reached.add(b.lower);
      parent.set(root(b.upper), root(b.lower));
    }
    const own = parameters.filter((p) => p.speciesIndex === s);
    const unreached = species.states.filter(
      (st) => !reached.has(st.name) && own.some((p) => p.state === st.name && p.status === 'floated'),
    );
    for (const p of own) if (p.status === 'floated' && !reached.has(p.state)) p.status = 'fixed';
    if (unreached.length)
      notes.push(
        `joint fit: no assigned line of species '${species.name}' reaches state(s) ${unreached.map((x) => `'${x.name}'`).join(', ')}; their constants are held at their values`,
      );
    // A group is anchored when one of its states has no floated origin (the lowest state has none).
    const originOf = (state: string) => own.find((p) => p.state === state && p.name === 'origin');
    const groups = new Map<string, string[]>();
    for (const name of reached) {
      const r = root(name);
      groups.set(r, [...(groups.get(r) ?? []), name]);
    }
    for (const members of groups.values()) {
      if (members.some((m) => originOf(m)?.status !== 'floated')) continue;
      const lowest = members.reduce((a, b) => (originOf(a)!.value <= originOf(b)!.value ? a : b));
      originOf(lowest)!.status = 'fixed';
      notes.push(
        `joint fit: the assigned bands of '${species.name}' join ${members.map((m) => `'${m}'`).join(', ')} but not the lowest state, so only ` +
          `their origin differences are determined; ${lowest}.origin is held at its start value ${Number(originOf(lowest)!.value.toPrecision(12))} cm^-1`,
      );
    }
  });
  return { parameters, notes };
}

/** The system with the fitted constants (a tied constant takes its target's value). */
function modelWithParameters(
  model: SystemModel,
  parameters: readonly SystemParameter[],
  fitted: Record<string, { value: number }>,
): SystemModel {
  return {
    ...model,
    species: model.species.map((s, speciesIndex) => ({
      ...s,
      states: s.states.map((st) => {
        const constants = { ...st.constants };
        for (const p of parameters)
          if (p.speciesIndex === speciesIndex && p.state === st.name && fitted[p.key]) constants[p.name] = fitted[p.key].value;
        return { ...st, constants };
      }),
    })),
  };
}

/**
 * Rows whose peak another band's predicted line also reaches: |ν_other − peak| ≤ k·σ, σ the larger
 * of the row's matching σ and hypot(peak centre σ, 0.1 FWHM, line σ), the other line at least
 * CONFLICT_INTENSITY_FRACTION of the row's own predicted intensity.
 */
function overlapsFind(model: SystemModel, rows: readonly SystemAssignRow[], peaks: PeakList, k: number): SystemAssignConflict[] {
  const all: SystemLineList = systemLines(model);
  const order = Int32Array.from({ length: all.count }, (_, i) => i).sort((a, b) => all.wavenumberCm1[a] - all.wavenumberCm1[b]);
  const sorted = Float64Array.from(order, (i) => all.wavenumberCm1[i]);
  const bandIndexOf = new Map(all.bandRefs.map((r, i) => [`${r.speciesIndex}/${r.band}`, i]));
  const own = new Map<string, number>();
  for (let i = 0; i < all.count; i++)
    own.set(`${all.bandIndex[i]}:${all.jUpper[i]}:${all.kUpper[i]}:${all.jLower[i]}:${all.kLower[i]}`, all.intensity[i]);
  const out: SystemAssignConflict[] = [];
  for (const row of rows) {
    const l = row.line;
    if (l.peakIndex === null) continue;
    const p = l.peakIndex;
    const b = bandIndexOf.get(`${row.speciesIndex}/${row.band}`) ?? -1;
    const mine = own.get(`${b}:${l.jUpper}:${l.kUpper}:${l.jLower}:${l.kLower}`) ?? 0;
    const sigma = Math.max(
      Number.isFinite(l.matchSigmaCm1) ? l.matchSigmaCm1 : 0,
      Math.hypot(peaks.centreSigmaCm1[p], WIDTH_FLOOR_FRACTION * peaks.fwhmCm1[p], l.uncertaintyCm1),
    );
    const centre = peaks.wavenumberCm1[p];
    let lo = lowerBound(sorted, centre - k * sigma);
    let best: { i: number; d: number } | null = null;
    for (; lo < sorted.length && sorted[lo] <= centre + k * sigma; lo++) {
      const i = order[lo];
      if (all.bandIndex[i] === b) continue;
      if (all.intensity[i] < CONFLICT_INTENSITY_FRACTION * mine) continue;
      const d = Math.abs(all.wavenumberCm1[i] - centre);
      if (!best || d < best.d) best = { i, d };
    }
    if (!best) continue;
    const i = best.i;
    const ref = all.bandRefs[all.bandIndex[i]];
    out.push({
      row,
      reason:
        `the peak at ${centre.toFixed(4)} cm^-1 is also reached by ${ref.species}/${ref.band} J'=${all.jUpper[i]} K'=${all.kUpper[i]} ← ` +
        `J"=${all.jLower[i]} K"=${all.kLower[i]} predicted at ${all.wavenumberCm1[i].toFixed(4)} (${(best.d / sigma).toFixed(1)}σ, ` +
        `intensity ${(all.intensity[i] / Math.max(mine, 1e-300)).toPrecision(2)} × this line's): a possible blend of two bands`,
    });
  }
  return out;
}

function lowerBound(a: Float64Array, x: number): number {
  let lo = 0;
  let hi = a.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (a[mid] < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** A row's position calculated from its band's own final fit (when the joint fit failed), cm^-1. */
function bandCalc(bands: readonly SystemAssignBand[], row: SystemAssignRow): number {
  const band = bands.find((b) => b.speciesIndex === row.speciesIndex && b.band === row.band);
  const fit = band?.run?.fit;
  if (!fit) return NaN;
  const l = row.line;
  return transitionWavenumber(fit.model, l.jUpper, l.kUpper, l.jLower, l.kLower);
}
