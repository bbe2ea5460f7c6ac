/**
 * Write a system (species → states → bands) as a system file that io/systemFile.ts reads back to
 * the same model and fit statuses: a floated constant as a number, a fixed one as
 * {"value": x, "fixed": true} (left out when 0), a tied one as {"same": key}.
 */
import type { SystemModel } from '../physics/system/systemModel';

/** What systemFileSerialize needs besides the model. */
export interface SystemFileWriteOptions {
  /** Fit keys floated ("state.B", or "species/state.B" with several species). */
  floated: readonly string[];
  /** Fit key → the key it follows. */
  ties?: Readonly<Record<string, string>>;
  /** Name written at the top (free text). */
  name?: string;
}

/** Fit key of a constant ("species/state.name" with several species, as systemFile names them). */
function keyOf(system: SystemModel, speciesName: string, state: string, name: string): string {
  return (system.species.length > 1 ? `${speciesName}/` : '') + `${state}.${name}`;
}

/**
 * The system file text (JSON, two-space indent, trailing newline).
 * @param system the model (cm^-1, K)
 */
export function systemFileSerialize(system: SystemModel, options: SystemFileWriteOptions): string {
  const floated = new Set(options.floated);
  const ties = options.ties ?? {};
  const out: Record<string, unknown> = {};
  if (options.name) out.name = options.name;
  out.temperature = system.temperatureK;
  out.jMax = system.jMax;
  out.kMax = system.kMax;
  out.species = system.species.map((sp) => {
    const lowest = sp.states.reduce((a, b) => ((b.constants.origin ?? 0) < (a.constants.origin ?? 0) ? b : a), sp.states[0]);
    const states: Record<string, Record<string, unknown>> = {};
    for (const st of sp.states) {
      const body: Record<string, unknown> = {};
      if (st.isDegenerate) body.degenerate = true;
      for (const [name, value] of Object.entries(st.constants)) {
        if (name === 'origin' && st === lowest) continue;
        const key = keyOf(system, sp.name, st.name, name);
        const same = ties[key];
        if (same) {
          // Within one species the tie is written without the species prefix.
          const prefix = `${sp.name}/`;
          body[name] = { same: same.startsWith(prefix) ? same.slice(prefix.length) : same };
        } else if (floated.has(key)) body[name] = value;
        else if (value !== 0 || name === 'origin') body[name] = { value, fixed: true };
      }
      // Every state but the lowest names its origin (the file reads the one without as the lowest).
      if (st !== lowest && !('origin' in body)) body.origin = { value: 0, fixed: true };
      states[st.name] = body;
    }
    const s: Record<string, unknown> = { name: sp.name, shape: sp.shape };
    if (sp.massAmu !== undefined) s.mass = sp.massAmu;
    s.abundance = sp.abundance;
    s.spinWeights = [...sp.spinWeights];
    s.states = states;
    s.bands = sp.bands.map((b) => ({ name: b.name, upper: b.upper, lower: b.lower, strength: b.strength }));
    return s;
  });
  return JSON.stringify(out, null, 2) + '\n';
}
