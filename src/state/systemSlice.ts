import type { StateCreator } from 'zustand';
import type { SystemModel } from '../physics/system/systemModel';
import type { BenchState } from './store';

/**
 * The session's several-band model. With `system` null the session is a single-band one and
 * `model` is the whole truth (as before systems existed). With a system, `model` and `floated` are
 * the single-band view of the active band (what the one-band panels show and edit); every edit of
 * them is written back into the system (actionsCore.benchUpdate → systemSyncPatch).
 */
export interface SystemSlice {
  /** Species → states → bands, or null for a single-band session. */
  system: SystemModel | null;
  /** Fit keys of the system's floated constants ("ground.B", or "X/ground.B" with several species). */
  systemFloated: string[];
  /** Ties of a system file: fit key → the key it follows. */
  systemTies: Record<string, string>;
  /** Key "species/band" of the band the one-band panels show. */
  activeBandKey: string | null;
  /** Keys of bands whose ladders are switched off (their lines still add to the simulated sum). */
  hiddenBands: string[];
  /** The system before the last joint fit's constants were accepted (for "keep previous constants"). */
  systemBeforeAccept: SystemModel | null;
}

/** Initial state: a single-band session. */
export function systemSliceInitial(): SystemSlice {
  return { system: null, systemFloated: [], systemTies: {}, activeBandKey: null, hiddenBands: [], systemBeforeAccept: null };
}

/** Slice creator (state only). */
export const createSystemSlice: StateCreator<BenchState, [], [], SystemSlice> = () => systemSliceInitial();
