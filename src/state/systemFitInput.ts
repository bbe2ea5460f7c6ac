/**
 * The joint fit from the page: assignments → labelled lines of the system (fit/systemLineResolve),
 * the system's constants with their status, and the result read back (into the store's fit slot
 * and, on accept, into the system).
 */
import type { Assignment } from '../fit/assignment';
import type { FitResult } from '../fit/fitTypes';
import type { SystemFitInput } from '../fit/systemFit';
import type { SystemFitLine, SystemFitResult } from '../fit/systemFitTypes';
import { systemLineResolve } from '../fit/systemLineResolve';
import { lineLabelAscii } from '../physics/lineLabel';
import type { BandModel } from '../physics/model';
import type { SystemModel } from '../physics/system/systemModel';
import type { BenchState } from './store';
import { systemFloatedToView, systemParameters, systemTiesApply } from './systemBands';
import { systemActiveEntry, systemEntriesOf } from './systemSync';

/**
 * What systemLineResolve needs to find an assignment's line in its band: the band, J and K, and
 * (with `withLabels`) the labels the assignment kept (±l, A1/A2, s/a), which decide between the
 * lines J and K leave open.
 */
export function assignmentResolveQuery(
  a: Assignment,
  e: { band: string; species: string },
  withLabels = true,
): Parameters<typeof systemLineResolve>[1] {
  return {
    band: e.band,
    species: e.species,
    jUpper: a.jUpper,
    kUpper: a.kUpper,
    jLower: a.jLower,
    kLower: a.kLower,
    lUpper: withLabels ? (a.lUpper ?? null) : null,
    lLower: withLabels ? (a.lLower ?? null) : null,
    tagUpper: withLabels ? (a.tagUpper ?? null) : null,
    tagLower: withLabels ? (a.tagLower ?? null) : null,
  };
}

/** Most refused rows named in a message. */
const NAMED_MAX = 5;

/** A row's resolved line (without its observation), with the band key it was resolved for. */
interface ResolvedRow {
  key: string;
  line: Omit<SystemFitLine, 'unit' | 'observedCm1' | 'uncertaintyCm1' | 'isExcluded'>;
}

/**
 * Lines resolved for the last system, per assignment object (assignments are immutable, so the
 * same object has the same quanta): a refit after a few new assignments resolves only those.
 * Resolving costs ~30 µs a row (levels of both states at the row's J), i.e. ~0.3 s of main-thread
 * work for 10,000 rows (measured in the browser bench, measure 9).
 */
let resolvedFor: { system: SystemModel; rows: WeakMap<Assignment, ResolvedRow> } | null = null;

/** What the joint fit's input is built from. */
type SystemFitInputSource = Pick<BenchState, 'system' | 'systemFloated' | 'systemTies' | 'assignments' | 'activeBandKey'>;

/** The joint fit's input, or why it cannot run. */
type SystemFitInputBuilt = { ok: true; input: SystemFitInput } | { ok: false; message: string };

/**
 * The joint fit's input for the current session, or why it cannot run (rows naming no single line
 * of their band, by label).
 */
export function systemFitInputOf(s: SystemFitInputSource): SystemFitInputBuilt {
  const steps = systemFitInputSteps(s);
  for (let step = steps.next(); ; step = steps.next()) if (step.done) return step.value;
}

/**
 * Longest main-thread slice of row resolving before the page gets a turn, ms: under the 50 ms of a
 * long task, and long enough that the pauses add little (with 12 ms slices and setTimeout pauses
 * the first fit of 10,000 rows waited 1.4 s for its input on the bench machine at load 14).
 */
const RESOLVE_SLICE_MS = 35;

/**
 * A turn for the page: a message-channel task (setTimeout(0) is clamped to 4 ms once nested), or a
 * timeout where there is no MessageChannel.
 */
function pageTurn(): Promise<void> {
  if (typeof MessageChannel === 'undefined') return new Promise((resolve) => setTimeout(resolve, 0));
  return new Promise((resolve) => {
    const channel = new MessageChannel();
    channel.port1.onmessage = () => {
      channel.port1.close();
      resolve();
    };
    channel.port2.postMessage(null);
  });
}

/**
 * systemFitInputOf in slices of about RESOLVE_SLICE_MS: the first Fit after a change of the model
 * resolves every row again (~0.2–0.3 s for 10,000 rows at idle), which as one task would freeze the page.
 * The input is the one of `s` (assignments are immutable), whatever changes meanwhile.
 * @param isStale checked after each pause: true stops the work (resolves to null)
 * @param sliceMs work between pauses, ms @default RESOLVE_SLICE_MS
 */
export async function systemFitInputSliced(
  s: SystemFitInputSource,
  isStale: () => boolean,
  sliceMs = RESOLVE_SLICE_MS,
): Promise<SystemFitInputBuilt | null> {
  const steps = systemFitInputSteps(s);
  let sliceStart = performance.now();
  for (let step = steps.next(); ; step = steps.next()) {
    if (step.done) return step.value;
    if (performance.now() - sliceStart < sliceMs) continue;
    await pageTurn();
    if (isStale()) return null;
    sliceStart = performance.now();
  }
}

/** The work of systemFitInputOf, yielding after each row it had to resolve (not after cached ones). */
function* systemFitInputSteps(s: SystemFitInputSource): Generator<void, SystemFitInputBuilt, void> {
  const system = s.system;
  if (!system) return { ok: false, message: 'the session has one band' };
  const entries = systemEntriesOf(system);
  const byKey = new Map(entries.map((e) => [e.key, e]));
  const lines: SystemFitLine[] = [];
  const bad: string[] = [];
  if (resolvedFor?.system !== system) resolvedFor = { system, rows: new WeakMap() };
  const cache = resolvedFor.rows;
  for (const a of s.assignments) {
    const key = a.band !== undefined && a.species !== undefined ? `${a.species}/${a.band}` : s.activeBandKey;
    const e = key ? byKey.get(key) : undefined;
    const label = lineLabelAscii(a.kUpper - a.kLower, a.jUpper - a.jLower, a.kLower, a.jLower, system.species[e?.speciesIndex ?? 0].shape);
    if (!e) {
      bad.push(`${label}: band '${key ?? '(none)'}' is not in the model`);
      continue;
    }
    const cached = cache.get(a);
    if (cached && cached.key === e.key) {
      lines.push({ ...cached.line, observedCm1: a.observedCm1, uncertaintyCm1: a.uncertaintyCm1, isExcluded: a.isExcluded });
      continue;
    }
    const r = systemLineResolve(system, assignmentResolveQuery(a, e));
    if (!r.ok) {
      bad.push(`${label} of ${e.band} (${e.species}): ${r.message}`);
      yield;
      continue;
    }
    cache.set(a, { key: e.key, line: r.line });
    lines.push({ ...r.line, observedCm1: a.observedCm1, uncertaintyCm1: a.uncertaintyCm1, isExcluded: a.isExcluded });
    yield;
  }
  if (bad.length > 0)
    return {
      ok: false,
      message: `${bad.length} assignment${bad.length === 1 ? '' : 's'} name no single line of their band: ${bad.slice(0, NAMED_MAX).join('; ')}${bad.length > NAMED_MAX ? '; …' : ''}.`,
    };
  return { ok: true, input: { model: system, parameters: systemParameters(system, s.systemFloated, s.systemTies), lines } };
}

/**
 * A joint-fit result in the store's fit slot: the same fields (parameters by system fit key, lines
 * in assignment order with their band), `model` the active band's view, and the per-band
 * statistics kept in `bands`.
 */
export function systemFitAsFitResult(r: SystemFitResult, model: BandModel): FitResult & { bands: SystemFitResult['bands'] } {
  return { ...r, model };
}

/**
 * The system with a fit's values in place of its constants (fixed ones unchanged; ties follow).
 * @param parameters fit result parameters by system fit key
 */
export function systemWithFitted(
  system: SystemModel,
  floated: readonly string[],
  ties: Readonly<Record<string, string>>,
  parameters: Record<string, { value: number; fixed: boolean }>,
): SystemModel {
  const where = new Map(systemParameters(system, floated, ties).map((p) => [p.key, p]));
  const species = system.species.map((sp) => ({
    ...sp,
    states: sp.states.map((st) => ({ ...st, constants: { ...st.constants } })),
    ...(sp.interactions ? { interactions: sp.interactions.map((it) => ({ ...it, constants: { ...it.constants } })) } : {}),
  }));
  for (const [key, p] of Object.entries(parameters)) {
    const w = where.get(key);
    if (!w || p.fixed || !Number.isFinite(p.value)) continue;
    // The owner is a state or an interaction (keys "<interaction>.<constant>").
    const owner =
      species[w.speciesIndex].states.find((x) => x.name === w.state) ??
      species[w.speciesIndex].interactions?.find((x) => x.name === w.state);
    if (owner) owner.constants[w.name] = p.value;
  }
  return systemTiesApply({ ...system, species }, ties);
}

/** The active band's view (`model`, `floated`) of a session's system. */
export function systemViewFields(
  s: Pick<BenchState, 'system' | 'activeBandKey' | 'systemFloated' | 'model' | 'floated'>,
): Pick<BenchState, 'model' | 'floated'> {
  const e = systemActiveEntry(s);
  if (!s.system || !e?.view) return { model: s.model, floated: s.floated };
  return { model: e.view, floated: systemFloatedToView(s.system, s.systemFloated, e) };
}
