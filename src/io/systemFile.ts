/**
 * System files: species → vibrational states → bands in one JSON file (see DEVELOPERS.md, "The
 * system file"). Validated with zod; every message names the JSON path of the offending field.
 *
 *   { "temperature": 296, "jMax": 60, "kMax": 20,
 *     "species": [ { "name": "X", "shape": "prolate", "mass": 50, "abundance": 1, "spinWeights": [4, 2, 2],
 *                    "states": { "ground": { "B": 0.44, "A": 5.1 },
 *                                "v6": { "origin": 1010, "degenerate": true, "B": 0.44, "A": 5.1,
 *                                        "DK": {"same": "ground.DK"}, "zeta": 0.3 } },
 *                    "bands": [ { "name": "nu6", "upper": "v6", "lower": "ground", "strength": 1 } ] } ] }
 *
 * A parameter is a number (floated in a fit), {"value": x, "fixed": true|false, "unit": "cm-1"|"MHz"}
 * or {"same": "<state>.<constant>"} (tied: the same value, fitted as one parameter; with several
 * species "<species>/<state>.<constant>" reaches across species). Fit keys are
 * "<state>.<constant>" with one species and "<species>/<state>.<constant>" with several.
 * `origin` is a state's vibrational term value above the species' lowest state; at most one state
 * per species may leave it out (that state is at 0). A band whose upper and lower state are the same
 * is that state's pure rotational spectrum (ΔK = 0, e.g. microwave lines of the ground state).
 *
 * Symmetry (symmetric tops): a species may give "pointGroup": "C3v" | "D3h"; its states' levels then
 * come from the effective Hamiltonians of physics/hamiltonian and carry symmetry species, and it may
 * give "spinWeightsBySymmetry" (weights per species and component function, e.g. {"A1": 4, "A2": 4,
 * "E": 2}) in place of "spinWeights". A state may then give "symmetry" (its vibrational species) and
 * the keys only the Hamiltonians know: etaJ, etaK, q22, q22J, q12 (degenerate; q12 not in D3h), the
 * octic LJ, LJJK, LJK, LKKJ, LK, and for an inversion-doubled state (pointGroup D3h) inv,
 * inv<constant> (a − s differences of each constant), eps3, eps3J.
 */
import { z } from 'zod';
import { MHZ_PER_CM1 } from '../physics/constants';
import type { TopShape } from '../physics/model';
import { systemFromBandModel } from '../physics/system/systemFromBandModel';
import type { SystemModel, SystemSpecies, SystemStateSymmetry } from '../physics/system/systemModel';
import { hamiltonianStateParameterNames } from '../physics/system/systemStateLevels';
import { hamiltonianTermsCheck } from '../physics/hamiltonian/hamiltonianTermsCheck';
import { rovibSpeciesDimension, rovibSpeciesList, type RovibPointGroup } from '../physics/hamiltonian/rovibSymmetry';
import { spinStatisticsSpeciesTable } from '../physics/hamiltonian/spinStatistics';
import type { SystemParameter, SystemParameterStatus } from '../fit/systemFitTypes';
import { INPUT_LIMITS, inputExcerpt, inputJsonParse } from './inputLimits';
import { modelAllowedParameters, type ModelFile } from './modelFile';
import { interactionStateAllowed, interactionStateNames, systemInteractionsParse } from './systemInteractions';

export type { SystemParameter, SystemParameterStatus };

/** A system file read into the physics model plus every constant's fit status. */
export interface SystemFile {
  model: SystemModel;
  /** Every constant that may enter a fit, in file order (states in order, constants in the shape's order). */
  parameters: SystemParameter[];
  /** Non-fatal remarks. */
  warnings: string[];
  /** True when the file was a single-band model file (keys upper.* / lower.*). */
  isSingleBand: boolean;
}

/** Raised for a system file that cannot be used; the message names the field path. */
export class SystemFileError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'SystemFileError';
  }
}

/** Largest number of species, states per species and bands per species a system file may hold. */
export const SYSTEM_FILE_LIMITS = { maxSpecies: 50, maxStates: 200, maxBands: 500 } as const;

const finite = z.number().refine(Number.isFinite, 'a finite number');
const nameSchema = z
  .string()
  .min(1)
  .max(80)
  .refine((s) => !/[./\s,"]/.test(s), 'a name without ".", "/", ",", quotes or spaces');

const parameterSchema = z.union([
  finite,
  z.strictObject({ value: finite, fixed: z.boolean().optional(), unit: z.enum(['cm-1', 'MHz']).optional() }),
  z.strictObject({ same: z.string().min(1).max(200) }),
]);

const stateSchema = z.record(z.string(), z.unknown());

const speciesSchema = z.strictObject({
  name: nameSchema,
  shape: z.enum(['prolate', 'oblate', 'linear']),
  mass: z
    .number()
    .refine((m) => Number.isFinite(m) && m > 0, 'a molecular mass in amu, > 0')
    .optional(),
  abundance: z
    .number()
    .refine((a) => Number.isFinite(a) && a >= 0, 'a relative abundance >= 0')
    .optional(),
  spinWeights: z
    .array(z.number().refine((w) => Number.isFinite(w) && w >= 0, 'a finite weight >= 0'))
    .min(1)
    .max(INPUT_LIMITS.maxSpinWeights)
    .optional(),
  pointGroup: z.enum(['C3v', 'D3h']).optional(),
  spinWeightsBySymmetry: z.record(z.string(), z.number()).optional(),
  states: z.record(z.string(), stateSchema),
  bands: z
    .array(
      z.strictObject({
        name: nameSchema,
        upper: z.string(),
        lower: z.string(),
        strength: z
          .number()
          .refine((s) => Number.isFinite(s) && s >= 0, 'a band strength >= 0')
          .optional(),
        momentSign: z.union([z.literal(1), z.literal(-1)]).optional(),
      }),
    )
    .max(SYSTEM_FILE_LIMITS.maxBands),
  // Checked field by field in io/systemInteractions.ts.
  interactions: z.array(z.unknown()).max(SYSTEM_FILE_LIMITS.maxBands).optional(),
  notes: z.string().optional(),
});

const fileSchema = z.strictObject({
  temperature: z.number().refine((t) => Number.isFinite(t) && t > 0, 'a temperature in K, > 0'),
  jMax: z.number().int().min(0).max(INPUT_LIMITS.maxModelJ),
  kMax: z.number().int().min(0).max(INPUT_LIMITS.maxModelK).optional(),
  species: z.array(speciesSchema).min(1).max(SYSTEM_FILE_LIMITS.maxSpecies),
  name: z.string().max(200).optional(),
  notes: z.string().optional(),
  version: z.unknown().optional(),
});

/** Constants a state of a species may carry (origin, the shape's constants, and ζ or q, qJ when degenerate). */
export function systemAllowedParameters(shape: TopShape, isDegenerate: boolean): string[] {
  const common =
    shape === 'linear' ? ['B', 'DJ', 'HJ'] : ['B', shape === 'prolate' ? 'A' : 'C', 'DJ', 'DJK', 'DK', 'HJ', 'HJK', 'HKJ', 'HK'];
  const extra = isDegenerate ? (shape === 'linear' ? ['q', 'qJ'] : ['zeta']) : [];
  return ['origin', ...common, ...extra];
}

/** Keys only the effective Hamiltonians (a species with a pointGroup) understand. */
function isHamiltonianOnlyKey(name: string): boolean {
  return ['etaJ', 'etaK', 'q22', 'q22J', 'q12', 'LJ', 'LJJK', 'LJK', 'LKKJ', 'LK', 'eps3', 'eps3J'].includes(name) || /^inv/.test(name);
}

/** Keys that make a nondegenerate state inversion-doubled. */
function isInversionKey(name: string): boolean {
  return /^inv/.test(name) || name === 'eps3' || name === 'eps3J';
}

/**
 * Constants a state of a species with a point group may carry (the Hamiltonian provider's names;
 * q12 left out in D3h, where symmetry forbids it).
 */
export function systemSymmetryAllowedParameters(
  shape: 'prolate' | 'oblate',
  isDegenerate: boolean,
  symmetry: Pick<SystemStateSymmetry, 'pointGroup' | 'isInversionDoubled'>,
): string[] {
  const names = hamiltonianStateParameterNames(shape, isDegenerate, symmetry);
  return symmetry.pointGroup === 'D3h' ? names.filter((n) => n !== 'q12') : names;
}

/** Vibrational species a state may declare, and the default, by group and kind. */
function vibSpeciesChoices(group: RovibPointGroup, isDegenerate: boolean, isInversionDoubled: boolean): string[] {
  if (isInversionDoubled) return ['A1', 'A2'];
  return rovibSpeciesList(group).filter((sp) => (rovibSpeciesDimension(group, sp) === 2) === isDegenerate);
}

function describe(v: unknown): string {
  if (v === null) return 'null';
  if (Array.isArray(v)) return 'a list';
  if (typeof v === 'string') return `the string ${inputExcerpt(JSON.stringify(v.length > 30 ? v.slice(0, 30) + '…' : v))}`;
  return typeof v === 'object' ? 'an object' : `${typeof v} ${String(v)}`;
}

function pathText(path: PropertyKey[]): string {
  const text = path
    .map((p) => (typeof p === 'number' ? `[${p}]` : String(p)))
    .join('.')
    .replace(/\.\[/g, '[');
  return inputExcerpt(text, 100) || '(top level)';
}

function zodExpected(issue: z.core.$ZodIssue): string {
  if (issue.code === 'invalid_value') return `one of ${issue.values.map((v) => JSON.stringify(v)).join(', ')}`;
  if (issue.code === 'invalid_type') {
    const names: Record<string, string> = {
      number: 'a number',
      array: 'a list',
      string: 'a string',
      object: 'an object',
      boolean: 'true or false',
    };
    return names[issue.expected] ?? `a value of type ${issue.expected}`;
  }
  if (issue.code === 'unrecognized_keys')
    return `no field ${issue.keys.map((k) => `'${inputExcerpt(k, 40)}'`).join(', ')} (not a system-file field)`;
  if (issue.code === 'too_small' || issue.code === 'too_big') {
    const op = issue.code === 'too_small' ? '>=' : '<=';
    const bound = String(issue.code === 'too_small' ? issue.minimum : issue.maximum);
    if (issue.origin === 'array') return `a list with ${op} ${bound} entries`;
    if (issue.origin === 'string') return `a text of ${op} ${bound} characters`;
    return `a number ${op} ${bound}`;
  }
  if (issue.code === 'invalid_union') return 'a number, {"value": number, "fixed": true|false} or {"same": "state.constant"}';
  return issue.message;
}

/**
 * Read a system file (JSON text).
 * @throws SystemFileError naming the JSON path of the offending field and what was expected
 */
export function systemFileParse(text: string): SystemFile {
  const parsed = inputJsonParse(text, INPUT_LIMITS.maxModelFileChars);
  if (!parsed.ok) throw new SystemFileError(`system file is ${parsed.message}`);
  return systemFileFromJson(parsed.value);
}

/** True when a parsed JSON value looks like a system file (an object with a "species" field). */
export function systemFileDetect(raw: unknown): boolean {
  return typeof raw === 'object' && raw !== null && !Array.isArray(raw) && 'species' in raw;
}

/** As systemFileParse, from an already parsed JSON value. */
export function systemFileFromJson(raw: unknown): SystemFile {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) {
    throw new SystemFileError(`system file: expected a JSON object at top level, got ${describe(raw)}`);
  }
  const parsed = fileSchema.safeParse(raw);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    let got: unknown = raw;
    for (const p of issue.path) got = (got as Record<PropertyKey, unknown> | undefined)?.[p as string];
    const where = pathText(issue.path);
    if (issue.code === 'unrecognized_keys') throw new SystemFileError(`system file: field '${where}' has ${zodExpected(issue)}`);
    throw new SystemFileError(
      `system file: field '${where}' ${got === undefined ? 'is missing' : `is ${describe(got)}`}; expected ${zodExpected(issue)}`,
    );
  }
  const f = parsed.data;
  const fail = (path: string, message: string): never => {
    throw new SystemFileError(`system file: field '${inputExcerpt(path, 100)}' ${message}`);
  };
  const nSpecies = f.species.length;
  const seenSpecies = new Set<string>();
  const species: SystemSpecies[] = [];
  interface RawParam {
    key: string;
    speciesIndex: number;
    state: string;
    name: string;
    path: string;
    value: number;
    status: SystemParameterStatus;
    sameText?: string;
  }
  const raws: RawParam[] = [];
  const keyOf = (speciesName: string, state: string, name: string) => (nSpecies > 1 ? `${speciesName}/` : '') + `${state}.${name}`;
  f.species.forEach((sp, s) => {
    const at = `species[${s}]`;
    if (seenSpecies.has(sp.name)) fail(`${at}.name`, `repeats the species name '${sp.name}'; each species needs its own name`);
    seenSpecies.add(sp.name);
    const shape = sp.shape as TopShape;
    if (shape !== 'linear' && f.kMax === undefined)
      fail('kMax', `is missing; expected a whole number >= 0 (species '${sp.name}' is a ${shape} top)`);
    const pointGroup = sp.pointGroup as RovibPointGroup | undefined;
    if (pointGroup && shape === 'linear')
      fail(`${at}.pointGroup`, `is given for a linear species; a point group (C3v or D3h) applies to symmetric tops only`);
    let spinWeightsBySymmetry: Record<string, number> | undefined;
    if (sp.spinWeightsBySymmetry !== undefined) {
      if (!pointGroup) fail(`${at}.spinWeightsBySymmetry`, `needs the species' "pointGroup" ("C3v" or "D3h") to name its species`);
      if (sp.spinWeights !== undefined)
        fail(`${at}.spinWeightsBySymmetry`, `is given beside "spinWeights"; give one of them (weights by species or by K mod n)`);
      try {
        spinWeightsBySymmetry = spinStatisticsSpeciesTable(pointGroup!, sp.spinWeightsBySymmetry);
      } catch (err) {
        fail(`${at}.spinWeightsBySymmetry`, `is not usable: ${(err as Error).message.replace(/^spinStatistics: /, '')}`);
      }
    }
    const stateNames = Object.keys(sp.states);
    if (stateNames.length === 0) fail(`${at}.states`, 'is empty; expected at least one state');
    if (stateNames.length > SYSTEM_FILE_LIMITS.maxStates)
      fail(`${at}.states`, `holds ${stateNames.length} states, more than ${SYSTEM_FILE_LIMITS.maxStates}`);
    let originless: string | null = null;
    /** The state's symmetry (Hamiltonian provider) when the species has a point group, else undefined. */
    const stateSymmetry = (sAt: string, body: Record<string, unknown>, isDegenerate: boolean): SystemStateSymmetry | undefined => {
      if (!pointGroup) {
        if (body.symmetry !== undefined && shape !== 'linear')
          fail(`${sAt}.symmetry`, `needs the species' point group: add "pointGroup": "C3v" or "D3h" to ${at}`);
        if (body.symmetry !== undefined)
          fail(`${sAt}.symmetry`, 'is given for a linear species; symmetry species apply to symmetric tops here');
        return undefined;
      }
      const inversionKey = Object.keys(body).find(isInversionKey);
      const isInversionDoubled = inversionKey !== undefined && !isDegenerate;
      if (isInversionDoubled && pointGroup !== 'D3h')
        fail(
          `${sAt}.${inversionKey}`,
          `makes the state inversion-doubled, which needs "pointGroup": "D3h" (the molecular symmetry group of an inverting XY3 top is D3h(M)); ${at} gives ${pointGroup}`,
        );
      const choices = vibSpeciesChoices(pointGroup, isDegenerate, isInversionDoubled);
      const given = body.symmetry;
      if (given !== undefined && (typeof given !== 'string' || !choices.includes(given)))
        fail(
          `${sAt}.symmetry`,
          `is ${describe(given)}; expected the species of a ${isDegenerate ? 'degenerate' : isInversionDoubled ? 'inversion-doubled (its C3v species)' : 'nondegenerate'} state of ${pointGroup}: one of ${choices.map((c) => JSON.stringify(c)).join(', ')}${
            isDegenerate ? '' : ' (a degenerate species needs "degenerate": true)'
          }`,
        );
      return { pointGroup, vibSpecies: (given as string | undefined) ?? choices[0], isInversionDoubled };
    };
    const coupledNames = interactionStateNames(sp.interactions);
    const states = stateNames.map((stateName) => {
      const sAt = `${at}.states.${stateName}`;
      const okName = nameSchema.safeParse(stateName);
      if (!okName.success) fail(sAt, `has a state name that cannot be used in fit keys; expected ${okName.error.issues[0].message}`);
      const body = sp.states[stateName];
      const deg = body.degenerate ?? false;
      if (typeof deg !== 'boolean') fail(`${sAt}.degenerate`, `is ${describe(deg)}; expected true or false`);
      const isDegenerate = deg as boolean;
      const symmetry = stateSymmetry(sAt, body, isDegenerate);
      // A state named in an interaction, or a nondegenerate one that gives h3, is diagonalised (physics/interaction).
      const allowed =
        (coupledNames.has(stateName) || (!isDegenerate && 'h3' in body)) && shape !== 'linear'
          ? interactionStateAllowed(shape, isDegenerate)
          : symmetry
            ? systemSymmetryAllowedParameters(shape as 'prolate' | 'oblate', isDegenerate, symmetry)
            : systemAllowedParameters(shape, isDegenerate);
      const constants: Record<string, number> = {};
      if (!('origin' in body)) {
        if (originless)
          fail(
            `${sAt}`,
            `has no "origin", and neither has state '${originless}'; only the lowest state of a species may leave out its vibrational term value`,
          );
        originless = stateName;
      }
      for (const [name, value] of Object.entries(body)) {
        if (name === 'degenerate' || name === 'symmetry') continue;
        const pAt = `${sAt}.${name}`;
        if (!allowed.includes(name)) {
          if (!symmetry && shape !== 'linear' && isHamiltonianOnlyKey(name))
            fail(
              pAt,
              `is a constant of the effective Hamiltonians, which need the species' point group: add "pointGroup": "C3v" or "D3h" to ${at}`,
            );
          if (symmetry?.pointGroup === 'D3h' && name === 'q12')
            fail(pAt, `is not allowed in point group D3h: ${hamiltonianTermsCheck('D3h', { q12: 1 })[0]}`);
          if (symmetry && isInversionKey(name) && isDegenerate)
            fail(
              pAt,
              `is an inversion constant, which belongs to a nondegenerate state; give each inversion component of a degenerate state as its own E' or E'' state`,
            );
          const hint =
            (name === 'zeta' || name === 'q' || name === 'qJ') && !isDegenerate
              ? ` (${name} acts only in a degenerate state: add "degenerate": true)`
              : name === 'eps' && !isDegenerate && shape !== 'linear'
                ? ' (eps, the Δk = ±3 term, acts only in a state that is diagonalised: name the state in one of the species\' "interactions", or give it h3)'
                : name === 'A' && shape === 'oblate'
                  ? ' (an oblate top gives "C" in place of "A")'
                  : name === 'C' && shape === 'prolate'
                    ? ' (a prolate top gives "A" in place of "C")'
                    : '';
          fail(
            pAt,
            `is not a constant of ${isDegenerate ? 'a degenerate' : 'a nondegenerate'} state of a ${shape} species${hint}; expected one of ${allowed.join(', ')}`,
          );
        }
        const p = parameterSchema.safeParse(value);
        if (!p.success)
          fail(
            pAt,
            `is ${describe(value)}; expected a finite number, {"value": number, "fixed": true|false} or {"same": "state.constant"}`,
          );
        const data = p.data!;
        const key = keyOf(sp.name, stateName, name);
        if (typeof data === 'number') {
          constants[name] = data;
          raws.push({ key, speciesIndex: s, state: stateName, name, path: pAt, value: data, status: 'floated' });
        } else if ('same' in data) {
          constants[name] = 0;
          raws.push({ key, speciesIndex: s, state: stateName, name, path: pAt, value: 0, status: 'tied', sameText: data.same });
        } else {
          let v = data.value;
          if (data.unit === 'MHz') {
            if (name === 'zeta') fail(pAt, 'is dimensionless and takes no unit; got unit "MHz"');
            v /= MHZ_PER_CM1;
          }
          constants[name] = v;
          raws.push({ key, speciesIndex: s, state: stateName, name, path: pAt, value: v, status: data.fixed ? 'fixed' : 'floated' });
        }
      }
      // Constants left out are 0 and fixed, but still named so a tie may point at them and the fit lists them.
      for (const name of allowed) {
        if (name in constants || (name === 'origin' && originless === stateName)) continue;
        constants[name] = 0;
        raws.push({
          key: keyOf(sp.name, stateName, name),
          speciesIndex: s,
          state: stateName,
          name,
          path: `${sAt}.${name}`,
          value: 0,
          status: 'fixed',
        });
      }
      return { name: stateName, isDegenerate, constants, ...(symmetry ? { symmetry } : {}) };
    });
    const seenBands = new Set<string>();
    const bands = sp.bands.map((b, i) => {
      const bAt = `${at}.bands[${i}]`;
      if (seenBands.has(b.name)) fail(`${bAt}.name`, `repeats the band name '${b.name}'`);
      seenBands.add(b.name);
      for (const side of ['upper', 'lower'] as const) {
        if (!stateNames.includes(b[side]))
          fail(
            `${bAt}.${side}`,
            `names the state ${describe(b[side])}, which species '${sp.name}' does not have; expected one of ${stateNames.join(', ')}`,
          );
      }
      return {
        name: b.name,
        upper: b.upper,
        lower: b.lower,
        strength: b.strength ?? 1,
        ...(b.momentSign ? { momentSign: b.momentSign } : {}),
      };
    });
    const interactions =
      sp.interactions === undefined ? [] : systemInteractionsParse(sp.interactions, `${at}.interactions`, shape, states, fail);
    for (const { interaction, parameters } of interactions)
      for (const p of parameters)
        raws.push({
          key: keyOf(sp.name, interaction.name, p.name),
          speciesIndex: s,
          state: interaction.name,
          name: p.name,
          path: p.path,
          value: p.value,
          status: p.status,
          ...(p.sameText !== undefined ? { sameText: p.sameText } : {}),
        });
    species.push({
      name: sp.name,
      shape,
      ...(sp.mass !== undefined ? { massAmu: sp.mass } : {}),
      abundance: sp.abundance ?? 1,
      spinWeights: sp.spinWeights ?? [1],
      ...(pointGroup ? { pointGroup } : {}),
      ...(spinWeightsBySymmetry ? { spinWeightsBySymmetry } : {}),
      states,
      bands,
      ...(interactions.length ? { interactions: interactions.map((x) => x.interaction) } : {}),
    });
  });

  // Resolve ties (chains allowed, cycles refused).
  const byKey = new Map(raws.map((r) => [r.key, r]));
  const resolveKey = (r: RawParam): string => {
    const text = r.sameText!;
    // "state.constant" is within the species; "species/state.constant" names the species (needed only with several).
    const slash = text.indexOf('/');
    const target = nSpecies > 1 ? (slash >= 0 ? text : `${species[r.speciesIndex].name}/${text}`) : text.slice(slash + 1);
    if (!byKey.has(target)) {
      const ownStates = species[r.speciesIndex].states.map((s) => s.name).join(', ');
      fail(
        r.path,
        `ties to '${inputExcerpt(text, 80)}', which is no constant of this file; expected "<state>.<constant>" with a state among ${ownStates}`,
      );
    }
    return target;
  };
  const warnings: string[] = [];
  const parameters: SystemParameter[] = raws.map((r) => {
    if (r.status !== 'tied')
      return { key: r.key, speciesIndex: r.speciesIndex, state: r.state, name: r.name, value: r.value, status: r.status };
    const chain = [r.key];
    let cur = r;
    while (cur.status === 'tied') {
      const next = byKey.get(resolveKey(cur))!;
      if (chain.includes(next.key))
        fail(r.path, `ties in a circle (${[...chain, next.key].join(' → ')}); one constant of the circle must hold a value`);
      chain.push(next.key);
      cur = next;
    }
    if (cur.name === 'zeta' ? r.name !== 'zeta' : r.name === 'zeta') {
      warnings.push(`system file: ${r.key} is tied to ${cur.key}, a constant of another kind (ζ is dimensionless)`);
    }
    return { key: r.key, speciesIndex: r.speciesIndex, state: r.state, name: r.name, value: cur.value, status: 'tied', same: cur.key };
  });
  for (const p of parameters) {
    if (p.status !== 'tied') continue;
    const sp = species[p.speciesIndex];
    const owner = sp.states.find((s) => s.name === p.state) ?? sp.interactions!.find((it) => it.name === p.state)!;
    owner.constants[p.name] = p.value;
  }
  return {
    model: { temperatureK: f.temperature, jMax: f.jMax, kMax: f.kMax ?? 0, species },
    parameters,
    warnings,
    isSingleBand: false,
  };
}

/**
 * A single-band model file as a system (physics/system/systemFromBandModel): one species, states
 * `lower` and `upper`, keys `upper.B`, `lower.B`, `upper.origin` as before. Its parameters are
 * exactly the old fit's keys (fitParameterKeys order: upper first), floated as in the model file.
 */
export function systemFileFromModelFile(file: ModelFile): SystemFile {
  const model = systemFromBandModel(file.model, file.name && /^[^./\s,"]{1,80}$/.test(file.name) ? file.name : undefined);
  if (file.massAmu !== undefined) model.species[0].massAmu = file.massAmu;
  const floated = new Set(file.floated);
  const parameters: SystemParameter[] = [];
  for (const side of ['upper', 'lower'] as const) {
    for (const name of modelAllowedParameters(file.model.shape, side)) {
      const key = `${side}.${name}`;
      parameters.push({
        key,
        speciesIndex: 0,
        state: side,
        name,
        value: file.model[side][name],
        status: floated.has(key) ? 'floated' : 'fixed',
      });
    }
  }
  return { model, parameters, warnings: [...file.warnings], isSingleBand: true };
}

/** Top-level model-file keys that only the system engine can hold. */
const MODEL_SYMMETRY_KEYS = ['pointGroup', 'spinWeightsBySymmetry'];

/**
 * Whether a parsed single-band model file (shape, band, lower, upper) needs the system engine: it
 * declares a point group or spin weights by species, or a state carries a key the closed-form model
 * cannot hold (etaJ, q22, inv…, qJ, …: anything modelAllowedParameters does not list).
 */
export function modelFileNeedsSystem(raw: unknown): boolean {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw) || systemFileDetect(raw)) return false;
  const r = raw as Record<string, unknown>;
  if (MODEL_SYMMETRY_KEYS.some((k) => k in r)) return true;
  const shape = r.shape;
  if (shape !== 'prolate' && shape !== 'oblate' && shape !== 'linear') return false;
  return (['lower', 'upper'] as const).some((side) => {
    const st = r[side];
    if (typeof st !== 'object' || st === null || Array.isArray(st)) return false;
    const allowed: string[] = modelAllowedParameters(shape, side);
    return Object.keys(st).some((k) => !allowed.includes(k) && (isHamiltonianOnlyKey(k) || k === 'qJ' || k === 'symmetry'));
  });
}

/**
 * A single-band model file with keys only the system engine holds, read as a one-band system:
 * species 'molecule' (or the file's name), states `lower` (origin 0) and `upper` (degenerate for a
 * perpendicular band), band `band` — the same keys (`upper.q22`, `lower.B`) as the model file.
 * Messages name the model file's paths (`upper.q12`, `pointGroup`).
 * @throws SystemFileError
 */
export function systemFileFromModelJson(raw: unknown): SystemFile {
  const r = raw as Record<string, unknown>;
  const { shape, band, lower, upper, temperature, jMax, kMax, spinWeights, mass, name, pointGroup, spinWeightsBySymmetry } = r;
  const speciesName = typeof name === 'string' && /^[^./\s,"]{1,80}$/.test(name) ? name : 'molecule';
  const upperState = typeof upper === 'object' && upper !== null && !Array.isArray(upper) ? upper : {};
  const json = {
    temperature,
    jMax,
    ...(kMax !== undefined ? { kMax } : {}),
    species: [
      {
        name: speciesName,
        shape,
        ...(mass !== undefined ? { mass } : {}),
        ...(spinWeights !== undefined ? { spinWeights } : {}),
        ...(pointGroup !== undefined ? { pointGroup } : {}),
        ...(spinWeightsBySymmetry !== undefined ? { spinWeightsBySymmetry } : {}),
        states: { lower, upper: { ...upperState, ...(band === 'perpendicular' ? { degenerate: true } : {}) } },
        bands: [{ name: 'band', upper: 'upper', lower: 'lower' }],
      },
    ],
  };
  try {
    return { ...systemFileFromJson(json), isSingleBand: true };
  } catch (err) {
    if (!(err instanceof SystemFileError)) throw err;
    throw new SystemFileError(
      err.message
        .replace(/^system file:/, 'model file:')
        .replace(/species\[0\]\.states\./g, '')
        .replace(/species\[0\]\./g, '')
        .replace(/ to species\[0\]/g, ' to the model file'),
    );
  }
}
