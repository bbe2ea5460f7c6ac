/**
 * Actions of a several-band session: open a system, choose the band the one-band panels show,
 * switch a band's ladders on or off.
 */
import type { SystemModel } from '../physics/system/systemModel';
import { benchUpdate, messagePost } from './actionsCore';
import { benchStore, type BenchState } from './store';
import { systemFromBandModel } from '../physics/system/systemFromBandModel';
import { systemBandEntries, systemFloatedDefault, systemFloatedToView, systemTiesApply } from './systemBands';
import { systemEntriesOf } from './systemSync';

/** What opening a system needs. */
export interface SystemLoadInput {
  system: SystemModel;
  /** Fit keys floated (default: systemFloatedDefault). */
  floated?: string[];
  ties?: Record<string, string>;
  name: string;
  /** Mass for the simulation's Doppler width, amu (default: the first species' mass, if any). */
  massAmu?: number;
}

/**
 * The store fields of a session on a system: the system, its floated set, the first band that has
 * a single-band view as the active band (its view in `model`/`floated`), every band switched on.
 * Assignments that name no band are given the active band (an old single-band session's lines).
 * @throws Error when no band of the system has a single-band view
 */
export function systemSessionFields(s: Pick<BenchState, 'assignments'>, input: SystemLoadInput): Partial<BenchState> {
  const entries = systemBandEntries(input.system);
  const active = entries.find((e) => e.view);
  if (!active?.view)
    throw new Error(
      entries.length === 0 ? 'the system has no bands' : `no band of the system can be shown on its own (${entries[0].viewWhyNot})`,
    );
  const floated = input.floated ?? systemFloatedDefault(input.system);
  const assignments = s.assignments.some((a) => a.band === undefined)
    ? s.assignments.map((a) => (a.band === undefined ? { ...a, band: active.band, species: active.species } : a))
    : s.assignments;
  const mass = input.massAmu ?? input.system.species[0].massAmu;
  return {
    system: input.system,
    systemFloated: floated,
    systemTies: input.ties ?? {},
    activeBandKey: active.key,
    hiddenBands: [],
    model: active.view,
    floated: systemFloatedToView(input.system, floated, active),
    modelName: input.name,
    assignments,
    symmetry: null,
    isFitAccepted: false,
    modelBeforeAccept: null,
    ...(mass !== undefined ? { massAmu: mass, massSource: 'file' as const } : {}),
  };
}

/** Make a system the session's model (one undo step; assignments without a band go to its first band). */
export function systemLoad(input: SystemLoadInput, label: string): boolean {
  let fields: Partial<BenchState>;
  try {
    fields = systemSessionFields(benchStore.getState(), input);
  } catch (err) {
    messagePost('error', `Could not use ${input.name}: ${(err as Error).message}. The current model is unchanged.`);
    return false;
  }
  benchUpdate(label, () => ({ ...fields, fitOutcome: null, fitLineIds: [] }), {
    history: true,
    extraKeys: [
      'modelName',
      'massAmu',
      'massSource',
      'isFitAccepted',
      'modelBeforeAccept',
      'systemTies',
      'hiddenBands',
      'fitOutcome',
      'fitLineIds',
    ],
  });
  return true;
}

/**
 * Show band `key` in the one-band panels (model constants, Loomis–Wood, keyboard walk). A band
 * without a single-band view is refused with the reason.
 * @returns an error sentence, or null
 */
export function bandActivate(key: string): string | null {
  const s = benchStore.getState();
  if (!s.system) return 'this session has one band';
  if (s.activeBandKey === key) return null;
  const e = systemEntriesOf(s.system).find((x) => x.key === key);
  if (!e) return `no band '${key}'`;
  if (!e.view) return `band ${e.band} of ${e.species} cannot be shown in the one-band panels: ${e.viewWhyNot}`;
  const view = e.view;
  benchUpdate(
    `show band ${e.band} (${e.species})`,
    (st) => ({
      activeBandKey: key,
      model: view,
      floated: systemFloatedToView(st.system!, st.systemFloated, e),
      cursor: null,
      loomisSeriesKey: null,
    }),
    { history: false },
  );
  return null;
}

/** Switch a band's ladders on or off (its lines still add to the simulated sum). View only. */
export function bandToggle(key: string): void {
  benchUpdate(
    'band switch',
    (s) => ({ hiddenBands: s.hiddenBands.includes(key) ? s.hiddenBands.filter((k) => k !== key) : [...s.hiddenBands, key] }),
    { history: false },
  );
}

/**
 * Apply an edit of the system (model panel tree), as one undo step; the active band's view follows.
 * @param label the undo step's name
 * @param edit returns the new system (and optionally floated keys and ties), or throws with a sentence
 * @returns an error sentence, or null
 */
export function systemEdit(
  label: string,
  edit: (s: BenchState) => { system: SystemModel; floated?: string[]; ties?: Record<string, string> },
  options: { coalesce?: boolean } = {},
): string | null {
  const s = benchStore.getState();
  if (!s.system) return 'this session has one band';
  let r: { system: SystemModel; floated?: string[]; ties?: Record<string, string> };
  try {
    r = edit(s);
  } catch (err) {
    return (err as Error).message;
  }
  const system = systemTiesApply(r.system, r.ties ?? s.systemTies);
  const floated = r.floated ?? s.systemFloated;
  const e = systemEntriesOf(system).find((x) => x.key === s.activeBandKey);
  benchUpdate(
    label,
    () => ({
      system,
      systemFloated: floated,
      ...(r.ties ? { systemTies: r.ties } : {}),
      ...(e?.view ? { model: e.view, floated: systemFloatedToView(system, floated, e) } : {}),
      isFitAccepted: false,
    }),
    { history: true, coalesce: options.coalesce, extraKeys: r.ties ? ['systemTies'] : [] },
  );
  return null;
}

/**
 * Turn a single-band session into a several-band one (its band becomes band "band" of one species,
 * states "lower" and "upper", keys unchanged), so isotopologues and hot bands can be added.
 */
export function systemFromSession(): void {
  const s = benchStore.getState();
  if (s.system) return;
  const system = systemFromBandModel(s.model);
  if (s.massSource !== 'default') system.species[0].massAmu = s.massAmu;
  systemLoad({ system, floated: [...s.floated], name: s.modelName, massAmu: s.massAmu }, 'several bands');
}
