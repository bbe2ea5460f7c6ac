/**
 * The `interactions` list of a species in a system file (DEVELOPERS.md, "Interacting states"):
 *
 *   "interactions": [ { "name": "v2v4", "type": "coriolis", "states": ["v2", "v4"],
 *                       "constants": { "C1": 3.1, "C1J": {"value": 0, "fixed": true}, "C2": 0.01 } } ]
 *
 * `type` is "coriolis" or "fermi"; `states` names two states of the species; `constants` holds the
 * interaction's constants by name (physics/interaction/interactionTerms.ts), each a parameter like
 * any state constant (a number is floated; {"value", "fixed", "unit"}; {"same": …}). Constants left
 * out are 0 and fixed. `name` (default "<stateA>_<stateB>") makes the fit keys `<name>.<constant>`.
 * A state named in an interaction takes the constants of the diagonalising providers (origin, the
 * rotor polynomial to octic order, and ζ, ηJ, ηK, q22, q22J, q12 when degenerate, h3 and eps (ε, Δk = ±3)
 * when nondegenerate).
 */
import { MHZ_PER_CM1 } from '../physics/constants';
import type { RotorShape } from '../physics/hamiltonian/rotorPolynomial';
import {
  coupledStateParameterNames,
  INTERACTION_TYPES,
  interactionParameterNames,
  type InteractionType,
} from '../physics/interaction/interactionTerms';
import type { SystemInteraction } from '../physics/system/systemModel';

/** One interaction constant as read (before ties are resolved). */
export interface InteractionRawParameter {
  name: string;
  path: string;
  value: number;
  status: 'floated' | 'fixed' | 'tied';
  sameText?: string;
}

/** The names of the states any interaction of a species names (read leniently; errors come later). */
export function interactionStateNames(raw: unknown): Set<string> {
  const names = new Set<string>();
  if (!Array.isArray(raw)) return names;
  for (const it of raw) {
    const states = (it as { states?: unknown } | null)?.states;
    if (Array.isArray(states)) for (const s of states) if (typeof s === 'string') names.add(s);
  }
  return names;
}

/** The constants a state of a coupled group may carry (see coupledStateParameterNames). */
export function interactionStateAllowed(shape: RotorShape, isDegenerate: boolean): string[] {
  return coupledStateParameterNames(shape, isDegenerate);
}

function describe(v: unknown): string {
  if (v === null) return 'null';
  if (Array.isArray(v)) return 'a list';
  if (typeof v === 'string') return `the string ${JSON.stringify(v.length > 30 ? v.slice(0, 30) + '…' : v)}`;
  return typeof v === 'object' ? 'an object' : `${typeof v} ${String(v)}`;
}

/**
 * Read a species' `interactions` (already known to be present).
 * @param raw the JSON value of `species[i].interactions`
 * @param at the JSON path of the list, e.g. "species[0].interactions"
 * @param shape the species' shape
 * @param states the species' states (name and degeneracy)
 * @param fail throws a SystemFileError for a field path and message
 * @returns the interactions and, per interaction, its constants as parameters
 */
export function systemInteractionsParse(
  raw: unknown,
  at: string,
  shape: string,
  states: { name: string; isDegenerate: boolean }[],
  fail: (path: string, message: string) => never,
): { interaction: SystemInteraction; parameters: InteractionRawParameter[] }[] {
  if (!Array.isArray(raw)) return fail(at, `is ${describe(raw)}; expected a list of interactions`);
  if (raw.length > 0 && shape === 'linear') fail(at, 'is given for a linear species; interactions are handled for symmetric tops only');
  const seen = new Set<string>(states.map((s) => s.name));
  return raw.map((item, i) => {
    const iAt = `${at}[${i}]`;
    if (typeof item !== 'object' || item === null || Array.isArray(item)) return fail(iAt, `is ${describe(item)}; expected an object`);
    const obj = item as Record<string, unknown>;
    for (const key of Object.keys(obj))
      if (!['name', 'type', 'states', 'constants', 'notes'].includes(key))
        fail(`${iAt}.${key}`, 'is not an interaction field; expected name, type, states, constants or notes');
    const type = obj.type;
    if (typeof type !== 'string' || !INTERACTION_TYPES.includes(type as InteractionType))
      fail(`${iAt}.type`, `is ${describe(type)}; expected one of ${INTERACTION_TYPES.map((t) => JSON.stringify(t)).join(', ')}`);
    const pair = obj.states;
    if (!Array.isArray(pair) || pair.length !== 2 || pair.some((s) => typeof s !== 'string'))
      fail(`${iAt}.states`, `is ${describe(pair)}; expected two state names, e.g. ["v2", "v4"]`);
    const [a, b] = pair as [string, string];
    if (a === b) fail(`${iAt}.states`, `names the state '${a}' twice; an interaction joins two different states`);
    const sa = states.find((s) => s.name === a);
    const sb = states.find((s) => s.name === b);
    for (const [name, s] of [
      [a, sa],
      [b, sb],
    ] as const)
      if (!s)
        fail(
          `${iAt}.states`,
          `names the state '${name}', which the species does not have; expected one of ${states.map((st) => st.name).join(', ')}`,
        );
    const names = interactionParameterNames(type as InteractionType, sa!.isDegenerate, sb!.isDegenerate);
    if (typeof names === 'string') fail(`${iAt}.type`, `cannot join '${a}' and '${b}': ${names}`);
    const allowed = names as string[];
    const name = obj.name === undefined ? `${a}_${b}` : obj.name;
    if (typeof name !== 'string' || !/^[^./\s,"]{1,80}$/.test(name))
      fail(`${iAt}.name`, `is ${describe(name)}; expected a name without ".", "/", ",", quotes or spaces`);
    if (seen.has(name as string))
      fail(`${iAt}.name`, `'${name}' is already the name of a state or interaction of this species; give the interaction its own name`);
    seen.add(name as string);
    const constantsRaw = obj.constants ?? {};
    if (typeof constantsRaw !== 'object' || constantsRaw === null || Array.isArray(constantsRaw))
      fail(`${iAt}.constants`, `is ${describe(constantsRaw)}; expected an object of constants, e.g. {"C1": 3.1}`);
    const constants: Record<string, number> = {};
    const parameters: InteractionRawParameter[] = [];
    for (const [key, value] of Object.entries(constantsRaw as Record<string, unknown>)) {
      const pAt = `${iAt}.constants.${key}`;
      if (!allowed.includes(key))
        fail(pAt, `is not a constant of a ${type} interaction between '${a}' and '${b}'; expected one of ${allowed.join(', ')}`);
      const v = parameterRead(value, pAt, fail);
      constants[key] = v.value;
      parameters.push({ name: key, path: pAt, ...v });
    }
    for (const key of allowed) {
      if (key in constants) continue;
      constants[key] = 0;
      parameters.push({ name: key, path: `${iAt}.constants.${key}`, value: 0, status: 'fixed' });
    }
    return { interaction: { name: name as string, type: type as InteractionType, states: [a, b], constants }, parameters };
  });
}

function parameterRead(
  value: unknown,
  path: string,
  fail: (path: string, message: string) => never,
): Omit<InteractionRawParameter, 'name' | 'path'> {
  const expected = 'expected a finite number, {"value": number, "fixed": true|false} or {"same": "<owner>.<constant>"}';
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) fail(path, `is ${value}; ${expected}`);
    return { value, status: 'floated' };
  }
  if (typeof value !== 'object' || value === null || Array.isArray(value)) return fail(path, `is ${describe(value)}; ${expected}`);
  const o = value as Record<string, unknown>;
  if ('same' in o) {
    if (Object.keys(o).length !== 1 || typeof o.same !== 'string' || o.same.length === 0) fail(path, `is ${describe(value)}; ${expected}`);
    return { value: 0, status: 'tied', sameText: o.same as string };
  }
  for (const key of Object.keys(o))
    if (!['value', 'fixed', 'unit'].includes(key)) fail(`${path}.${key}`, `is not a parameter field; ${expected}`);
  if (typeof o.value !== 'number' || !Number.isFinite(o.value)) fail(`${path}.value`, `is ${describe(o.value)}; expected a finite number`);
  if (o.fixed !== undefined && typeof o.fixed !== 'boolean') fail(`${path}.fixed`, `is ${describe(o.fixed)}; expected true or false`);
  if (o.unit !== undefined && o.unit !== 'cm-1' && o.unit !== 'MHz')
    fail(`${path}.unit`, `is ${describe(o.unit)}; expected "cm-1" or "MHz"`);
  const v = (o.value as number) / (o.unit === 'MHz' ? MHZ_PER_CM1 : 1);
  return { value: v, status: o.fixed ? 'fixed' : 'floated' };
}
