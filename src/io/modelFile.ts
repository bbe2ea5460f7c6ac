import { z } from 'zod';
import {
  PARAMETER_NAMES,
  stateConstantsZero,
  type BandModel,
  type ParameterName,
  type StateConstants,
  type TopShape,
} from '../physics/model';
import { MHZ_PER_CM1 } from '../physics/constants';
import { INPUT_LIMITS, inputExcerpt, inputJsonParse } from './inputLimits';

/** A model file's parameter: a number (floated in a fit) or {value, fixed}. */
const parameterSchema = z.union([
  z.number().refine(Number.isFinite, 'a finite number'),
  z.strictObject({
    value: z.number().refine(Number.isFinite, 'a finite number'),
    fixed: z.boolean().optional(),
    // Optional display unit for lower-state constants; the value is converted to cm^-1.
    unit: z.enum(['cm-1', 'MHz']).optional(),
  }),
]);

const stateSchema = z.record(z.string(), z.unknown());

const fileSchema = z.looseObject({
  shape: z.enum(['prolate', 'oblate', 'linear']),
  band: z.enum(['parallel', 'perpendicular']),
  lower: stateSchema,
  upper: stateSchema,
  temperature: z.number().refine((t) => Number.isFinite(t) && t > 0, 'a temperature in K, > 0'),
  jMax: z.number().int().min(0).max(INPUT_LIMITS.maxModelJ),
  kMax: z.number().int().min(0).max(INPUT_LIMITS.maxModelK).optional(),
  spinWeights: z
    .array(z.number().refine((w) => Number.isFinite(w) && w >= 0, 'a finite weight >= 0'))
    .min(1)
    .max(INPUT_LIMITS.maxSpinWeights)
    .optional(),
  // Checked here (not silently dropped) because the spectrum command takes the Doppler width from it.
  mass: z
    .number()
    .refine((m) => Number.isFinite(m) && m > 0, 'a molecular mass in amu, > 0')
    .optional(),
  name: z.string().max(200).optional(),
});

/** Plain-language "expected …" for a zod issue (zod's own wording reads oddly after a field path). */
function expectedText(issue: z.core.$ZodIssue): string {
  if (issue.code === 'invalid_value') return `one of ${issue.values.map((v) => JSON.stringify(v)).join(', ')}`;
  if (issue.code === 'invalid_type') {
    const names: Record<string, string> = {
      number: 'a number',
      int: 'a whole number',
      record: 'an object of constants, e.g. {"B": 0.3}',
      array: 'a list',
      string: 'a string',
      object: 'an object',
    };
    return names[issue.expected] ?? `a value of type ${issue.expected}`;
  }
  if (issue.code === 'too_small' || issue.code === 'too_big') {
    const op = issue.code === 'too_small' ? (issue.inclusive === false ? '>' : '>=') : issue.inclusive === false ? '<' : '<=';
    if (issue.origin === 'array') return `a list with ${op} ${String(issue.code === 'too_small' ? issue.minimum : issue.maximum)} entries`;
    return `a number ${op} ${String(issue.code === 'too_small' ? issue.minimum : issue.maximum)}`;
  }
  return issue.message;
}

/** Keys a model file may carry at top level besides the required ones (others give a warning). */
const KNOWN_TOP = new Set([
  'shape',
  'band',
  'lower',
  'upper',
  'temperature',
  'jMax',
  'kMax',
  'spinWeights',
  'name',
  'notes',
  'mass',
  'version',
]);

/**
 * Model-file keys that only the system engine holds (symmetry, the effective Hamiltonians' constants,
 * qJ): the closed-form BandModel cannot, so modelFileParse refuses them in words; the CLI's simulate,
 * spectrum and fit read such a file as a one-band system (io/systemFile.ts systemFileFromModelJson).
 */
const SYSTEM_ONLY_TOP = ['pointGroup', 'spinWeightsBySymmetry'];
function isSystemOnlyStateKey(name: string): boolean {
  return (
    ['etaJ', 'etaK', 'q22', 'q22J', 'q12', 'qJ', 'LJ', 'LJJK', 'LJK', 'LKKJ', 'LK', 'eps3', 'eps3J', 'symmetry'].includes(name) ||
    /^inv/.test(name)
  );
}
const SYSTEM_ONLY_WORDS =
  'the closed-form single-band model (this page, and the assign, contour and perturbations commands) cannot hold it; the simulate, spectrum, fit and combdiff commands read such a file through the system engine';

/** A model file read into the physics model plus the fit's floated/fixed flags. */
export interface ModelFile {
  model: BandModel;
  /** Keys such as "upper.origin" of parameters given as plain numbers or with fixed: false. */
  floated: string[];
  /** Non-fatal remarks (unknown top-level keys), for stderr or the page. */
  warnings: string[];
  /** Optional molecule mass from the file, amu. */
  massAmu?: number;
  /** Optional name from the file (untrusted text). */
  name?: string;
}

/** Raised for a model file that cannot be used; the message names the field path. */
export class ModelFileError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ModelFileError';
  }
}

/** Which constants a state of a given shape may carry. */
export function modelAllowedParameters(shape: TopShape, side: 'lower' | 'upper'): ParameterName[] {
  const common: ParameterName[] =
    shape === 'linear' ? ['B', 'DJ', 'HJ'] : ['B', shape === 'prolate' ? 'A' : 'C', 'DJ', 'DJK', 'DK', 'HJ', 'HJK', 'HKJ', 'HK'];
  if (side === 'lower') return common;
  return ['origin', ...common, ...(shape === 'linear' ? (['q'] as ParameterName[]) : (['zeta'] as ParameterName[]))];
}

function describe(v: unknown): string {
  if (v === null) return 'null';
  if (Array.isArray(v)) return 'an array';
  if (typeof v === 'string') return `the string ${inputExcerpt(JSON.stringify(v.length > 30 ? v.slice(0, 30) + '…' : v))}`;
  return typeof v === 'object' ? 'an object' : `${typeof v} ${String(v)}`;
}

function pathOf(path: PropertyKey[]): string {
  // Keys come from the file: quoted as one short line.
  const text = path
    .map((p) => (typeof p === 'number' ? `[${p}]` : String(p)))
    .join('.')
    .replace(/\.\[/g, '[');
  return inputExcerpt(text, 80) || '(top level)';
}

/**
 * Read a model file (JSON text) into a BandModel, with fit flags.
 * All constants in cm^-1 (a lower-state constant may be given as {"value": x, "unit": "MHz"}),
 * temperature in K. An oblate top uses "C" in place of "A"; absent parameters are 0 and fixed.
 * Text longer than INPUT_LIMITS.maxModelFileChars is refused before parsing.
 * @throws ModelFileError naming the field's path (or the line and column of a JSON syntax error) and what was expected
 */
export function modelFileParse(text: string): ModelFile {
  const parsed = inputJsonParse(text, INPUT_LIMITS.maxModelFileChars);
  if (!parsed.ok) {
    if (parsed.field === 'maxChars')
      throw new ModelFileError(`model file: ${parsed.message} (maxModelFileChars); is this really a model file?`);
    throw new ModelFileError(`model file is ${parsed.message}`);
  }
  return modelFileFromJson(parsed.value);
}

/** As modelFileParse, from an already parsed JSON value. */
export function modelFileFromJson(raw: unknown): ModelFile {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) {
    throw new ModelFileError(`model file: expected a JSON object at top level, got ${describe(raw)}`);
  }
  const parsed = fileSchema.safeParse(raw);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const path = pathOf(issue.path);
    let got: unknown = raw;
    for (const p of issue.path) got = (got as Record<PropertyKey, unknown> | undefined)?.[p as string];
    const expected = expectedText(issue);
    throw new ModelFileError(
      `model file: field '${path}' ${got === undefined ? 'is missing' : `is ${describe(got)}`}; expected ${expected}`,
    );
  }
  const f = parsed.data;
  const shape = f.shape as TopShape;
  for (const key of SYSTEM_ONLY_TOP) {
    if (key in (raw as Record<string, unknown>))
      throw new ModelFileError(`model file: field '${key}' declares symmetry; ${SYSTEM_ONLY_WORDS}`);
  }
  if (shape !== 'linear' && f.kMax === undefined) {
    throw new ModelFileError(`model file: field 'kMax' is missing; expected a whole number >= 0 for a ${shape} top`);
  }
  const floated: string[] = [];
  const states = { lower: stateConstantsZero(), upper: stateConstantsZero() } as Record<'lower' | 'upper', StateConstants>;
  for (const side of ['lower', 'upper'] as const) {
    const allowed = modelAllowedParameters(shape, side);
    for (const [name, value] of Object.entries(f[side])) {
      const path = `${side}.${name}`;
      if (isSystemOnlyStateKey(name) && !allowed.includes(name as ParameterName)) {
        throw new ModelFileError(
          `model file: field '${inputExcerpt(path, 80)}' is a constant only the system engine holds (effective Hamiltonians, or qJ of a linear Π state); ${SYSTEM_ONLY_WORDS}`,
        );
      }
      if (!(PARAMETER_NAMES as readonly string[]).includes(name) || !allowed.includes(name as ParameterName)) {
        const hint =
          name === 'A' && shape === 'oblate'
            ? ' (an oblate top gives "C" in place of "A")'
            : name === 'C' && shape === 'prolate'
              ? ' (a prolate top gives "A" in place of "C")'
              : '';
        throw new ModelFileError(
          `model file: field '${inputExcerpt(path, 80)}' is not a ${side}-state constant of ${shape === 'oblate' ? 'an' : 'a'} ${shape} model${hint}; expected one of ${allowed.join(', ')}`,
        );
      }
      const p = parameterSchema.safeParse(value);
      if (!p.success) {
        throw new ModelFileError(
          `model file: field '${path}' is ${describe(value)}; expected a finite number or {"value": number, "fixed": true|false}`,
        );
      }
      let v: number;
      let fixed: boolean;
      if (typeof p.data === 'number') {
        v = p.data;
        fixed = false;
      } else {
        v = p.data.value;
        fixed = p.data.fixed ?? false;
        if (p.data.unit === 'MHz') {
          // ζ is dimensionless: a unit on it is a mistake, not something to convert.
          if (name === 'zeta') throw new ModelFileError(`model file: field '${path}' is dimensionless and takes no unit; got unit "MHz"`);
          v /= MHZ_PER_CM1;
        }
      }
      states[side][name as ParameterName] = v;
      if (!fixed) floated.push(path);
    }
  }
  const warnings: string[] = [];
  for (const key of Object.keys(raw)) {
    if (!KNOWN_TOP.has(key)) warnings.push(`model file: unknown top-level field '${inputExcerpt(key, 80)}' ignored`);
  }
  const massAmu = f.mass;
  const name = f.name;
  return {
    model: {
      shape,
      band: f.band,
      lower: states.lower,
      upper: states.upper,
      temperatureK: f.temperature,
      jMax: f.jMax,
      kMax: shape === 'linear' ? 0 : (f.kMax ?? 0),
      spinWeights: f.spinWeights ?? [1],
    },
    floated,
    warnings,
    massAmu,
    name,
  };
}

/**
 * Write a model back to model-file JSON (inverse of modelFileParse): non-zero or floated
 * constants are written; floated ones as plain numbers, fixed ones as {"value", "fixed": true}.
 */
export function modelFileSerialize(file: Pick<ModelFile, 'model' | 'floated' | 'massAmu' | 'name'>): string {
  const { model } = file;
  const floated = new Set(file.floated);
  const side = (which: 'lower' | 'upper') => {
    const out: Record<string, number | { value: number; fixed: true }> = {};
    for (const name of modelAllowedParameters(model.shape, which)) {
      const v = model[which][name];
      const key = `${which}.${name}`;
      if (floated.has(key)) out[name] = v;
      else if (v !== 0) out[name] = { value: v, fixed: true };
    }
    return out;
  };
  const json: Record<string, unknown> = {
    ...(file.name ? { name: file.name } : {}),
    shape: model.shape,
    band: model.band,
    lower: side('lower'),
    upper: side('upper'),
    temperature: model.temperatureK,
    jMax: model.jMax,
    kMax: model.kMax,
    spinWeights: model.spinWeights,
    ...(file.massAmu ? { mass: file.massAmu } : {}),
  };
  return JSON.stringify(json, null, 2) + '\n';
}
