/**
 * The workbench's project file: the whole session (model, trace, assignments, last fit, view) as
 * versioned JSON. Format name "ladder-bench-project"; this module writes version 2 and reads 1 and 2
 * (older versions are migrated step by step; newer ones are refused with advice). Missing sections
 * are reported and left to the caller's defaults; unknown fields are reported and ignored.
 *
 * Traces are stored exactly: each column as the base64 of its little-endian IEEE-754 doubles, so
 * a round trip reproduces every bit. Non-finite numbers elsewhere (a condition number of ∞) are
 * written as {"$nonFinite": "Infinity" | "-Infinity" | "NaN"} since JSON has no literal for them.
 *
 * Version history:
 * - 1: { format, version: 1, model: <model-file object>, trace: {wavenumberCm1: number[], absorbance: number[]} | null,
 *        assignments: [{J_up, K_up, J_lo, K_lo, obs, sigma, blended?, excluded?, note?, id?}], view?: {xRange?} }
 * - 2: { format, version: 2, savedAt, appVersion, session: ProjectSession } (this file's types)
 */
import { z } from 'zod';
import type { Assignment } from '../fit/assignment';
import type { FitOutcome } from '../fit/fitTypes';
import { PARAMETER_NAMES, stateConstantsFrom, type BandModel } from '../physics/model';
import type { SystemModel } from '../physics/system/systemModel';
import { modelFileFromJson } from './modelFile';
import { INPUT_LIMITS, inputExcerpt, inputJsonParse } from './inputLimits';
import type { Trace, TraceImportReport } from './trace';

/** Format name written into every project file. */
export const PROJECT_FORMAT = 'ladder-bench-project';
/** Version this module writes. */
export const PROJECT_VERSION = 2;

/** The view part of a session (how things were shown). */
export interface ProjectView {
  xRange: [number, number] | null;
  ordinate: 'absorbance' | 'transmittance';
  hiddenRows: string[];
  showSimulated: boolean;
  showObsMinusSim: boolean;
  showPeaks: boolean;
  theme: 'light' | 'dark';
  tab: string;
  loomisSeriesKey: string | null;
  loomisHalfWidthCm1: number;
  combinationState: 'lower' | 'upper';
  tableQuery: Record<string, unknown>;
}

/** The last fit as kept in a session. */
export interface ProjectFit {
  outcome: FitOutcome | null;
  lineIds: string[];
  finishedAt: string | null;
  modelBeforeAccept: BandModel | null;
  isAccepted: boolean;
}

/** A whole session. Every field but `model` may be absent in a file read (see messages). */
export interface ProjectSession {
  model: BandModel;
  floated: string[];
  modelName: string;
  /** amu */
  massAmu: number;
  /** Where the mass came from: 'default' (never set: not written into an exported model file), 'file' or 'user'. Optional (added later). */
  massSource?: 'default' | 'file' | 'user';
  /** cm^-1 */
  lorentzHwhmCm1: number;
  minIntensity: number;
  symmetry: { pointGroup: string; species: string } | null;
  trace: Trace | null;
  traceReport: TraceImportReport | null;
  traceSource: string;
  importOverrides: Record<string, unknown>;
  peakMinSnr: number;
  peakBaseline: boolean;
  assignments: Assignment[];
  nextAssignmentNumber: number;
  /** cm^-1 */
  farToleranceCm1: number;
  fit: ProjectFit;
  view: ProjectView;
  /** A several-band session's system (absent or null: a single-band session; added later). */
  system?: ProjectSystem | null;
}

/** The several-band part of a session: the system, its floated keys and ties, the active band, the bands switched off. */
export interface ProjectSystem {
  model: SystemModel;
  floated: string[];
  ties: Record<string, string>;
  activeBandKey: string | null;
  hiddenBands: string[];
}

/** Result of reading a project file. */
export type ProjectFileOutcome =
  | { ok: true; session: Partial<ProjectSession> & { model: BandModel }; messages: string[]; version: number }
  | { ok: false; message: string };

// ---------------------------------------------------------------- base64 of doubles

const B64 = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';
const B64_INDEX = new Int16Array(128).fill(-1);
for (let i = 0; i < 64; i++) B64_INDEX[B64.charCodeAt(i)] = i;

/** Character codes of the base64 alphabet. */
const B64_CODES = Uint8Array.from(B64, (c) => c.charCodeAt(0));
/** Characters turned into a string at a time (String.fromCharCode takes its codes as arguments). */
const CHARS_PER_CHUNK = 0x8000;

/**
 * Encode doubles as base64 of their little-endian bytes (exact).
 * The characters are built as codes in one typed array and turned into text in chunks: adding
 * characters to a string one by one took about 2.4 s for a 1e6-point trace.
 * Source: RFC 4648 §4 (base64 alphabet and padding).
 */
export function float64ToBase64(values: Float64Array): string {
  const bytes = new Uint8Array(values.length * 8);
  const view = new DataView(bytes.buffer);
  for (let i = 0; i < values.length; i++) view.setFloat64(i * 8, values[i], true);
  const n = bytes.length;
  const codes = new Uint8Array(Math.ceil(n / 3) * 4);
  let o = 0;
  let i = 0;
  for (; i + 2 < n; i += 3) {
    const v = (bytes[i] << 16) | (bytes[i + 1] << 8) | bytes[i + 2];
    codes[o++] = B64_CODES[v >> 18];
    codes[o++] = B64_CODES[(v >> 12) & 63];
    codes[o++] = B64_CODES[(v >> 6) & 63];
    codes[o++] = B64_CODES[v & 63];
  }
  if (i < n) {
    const b1 = i + 1 < n ? bytes[i + 1] : 0;
    const v = (bytes[i] << 16) | (b1 << 8);
    codes[o++] = B64_CODES[v >> 18];
    codes[o++] = B64_CODES[(v >> 12) & 63];
    codes[o++] = i + 1 < n ? B64_CODES[(v >> 6) & 63] : 61; // '='
    codes[o] = 61;
  }
  return asciiText(codes);
}

/** The Encoding standard's TextDecoder where the runtime has one (browsers, workers, Node); the pure lib does not declare it. */
type AsciiDecoder = { decode(bytes: Uint8Array): string };
const TextDecoderCtor = (globalThis as { TextDecoder?: new (label: string) => AsciiDecoder }).TextDecoder;

/** Text of ASCII character codes (TextDecoder is about 3x faster than String.fromCharCode on 1e7 codes). */
function asciiText(codes: Uint8Array): string {
  if (TextDecoderCtor) return new TextDecoderCtor('utf-8').decode(codes);
  const parts: string[] = [];
  for (let k = 0; k < codes.length; k += CHARS_PER_CHUNK) {
    parts.push(String.fromCharCode.apply(null, codes.subarray(k, k + CHARS_PER_CHUNK) as unknown as number[]));
  }
  return parts.join('');
}

/**
 * Decode float64ToBase64's output.
 * @throws naming the field when the text is not base64 of a whole number of doubles
 */
export function base64ToFloat64(text: string, field: string): Float64Array {
  const clean = text.replace(/\s+/g, '');
  if (clean.length % 4 !== 0) throw new Error(`${field}: base64 length ${clean.length} is not a multiple of 4`);
  const pad = clean.endsWith('==') ? 2 : clean.endsWith('=') ? 1 : 0;
  const nBytes = (clean.length / 4) * 3 - pad;
  if (nBytes % 8 !== 0) throw new Error(`${field}: ${nBytes} bytes is not a whole number of 8-byte doubles`);
  const bytes = new Uint8Array(nBytes);
  // One pass without per-group allocation (a closure per 4 characters cost ~0.5 s on a 1e6-point trace).
  const sextet = (i: number): number => {
    const ch = clean.charCodeAt(i);
    if (ch === 61 && i >= clean.length - pad) return 0; // '=' padding at the very end
    const v = ch < 128 ? B64_INDEX[ch] : -1;
    if (v < 0) throw new Error(`${field}: character ${JSON.stringify(clean[i])} at ${i} is not base64`);
    return v;
  };
  let o = 0;
  for (let i = 0; i < clean.length; i += 4) {
    const n = (sextet(i) << 18) | (sextet(i + 1) << 12) | (sextet(i + 2) << 6) | sextet(i + 3);
    if (o < nBytes) bytes[o++] = (n >> 16) & 255;
    if (o < nBytes) bytes[o++] = (n >> 8) & 255;
    if (o < nBytes) bytes[o++] = n & 255;
  }
  const view = new DataView(bytes.buffer);
  const out = new Float64Array(nBytes / 8);
  for (let i = 0; i < out.length; i++) out[i] = view.getFloat64(i * 8, true);
  return out;
}

// ---------------------------------------------------------------- JSON with non-finite numbers

function replacer(_key: string, value: unknown): unknown {
  if (typeof value === 'number' && !Number.isFinite(value)) return { $nonFinite: String(value) };
  return value;
}

function reviver(_key: string, value: unknown): unknown {
  if (value && typeof value === 'object' && !Array.isArray(value)) {
    const keys = Object.keys(value);
    const v = (value as { $nonFinite?: unknown }).$nonFinite;
    if (keys.length === 1 && (v === 'Infinity' || v === '-Infinity' || v === 'NaN')) return Number(v);
  }
  return value;
}

// ---------------------------------------------------------------- schemas

const finite = z.number().refine(Number.isFinite, 'a finite number');
const stateSchema = z.record(z.string(), finite).superRefine((rec, ctx) => {
  for (const k of Object.keys(rec)) {
    if (!(PARAMETER_NAMES as readonly string[]).includes(k))
      ctx.addIssue({ code: 'custom', message: `unknown constant '${k}'`, path: [k] });
  }
});
const modelSchema = z.object({
  shape: z.enum(['prolate', 'oblate', 'linear']),
  band: z.enum(['parallel', 'perpendicular']),
  lower: stateSchema,
  upper: stateSchema,
  temperatureK: z.number().refine((t) => Number.isFinite(t) && t > 0, 'a temperature > 0 K'),
  jMax: z.number().int().min(0).max(INPUT_LIMITS.maxModelJ),
  kMax: z.number().int().min(0).max(INPUT_LIMITS.maxModelK),
  spinWeights: z.array(z.number().min(0)).min(1).max(INPUT_LIMITS.maxSpinWeights),
});
const assignmentSchema = z.object({
  id: z.string().min(1),
  jUpper: z.number().int().min(0).max(INPUT_LIMITS.maxQuantumJ),
  kUpper: z.number().int().min(0).max(INPUT_LIMITS.maxQuantumJ),
  jLower: z.number().int().min(0).max(INPUT_LIMITS.maxQuantumJ),
  kLower: z.number().int().min(0).max(INPUT_LIMITS.maxQuantumJ),
  observedCm1: finite,
  uncertaintyCm1: z.number().refine((v) => Number.isFinite(v) && v > 0, 'a number > 0'),
  isBlended: z.boolean(),
  isExcluded: z.boolean(),
  note: z.string(),
  peakId: z.string().optional(),
  band: z.string().max(200).optional(),
  species: z.string().max(200).optional(),
  // Level labels of a several-band line (A1/A2, s/a, e/f; ±l) where J and K leave a choice.
  tagUpper: z.string().max(40).optional(),
  tagLower: z.string().max(40).optional(),
  lUpper: z.union([z.literal(-1), z.literal(0), z.literal(1)]).optional(),
  lLower: z.union([z.literal(-1), z.literal(0), z.literal(1)]).optional(),
});
const systemStateSchema = z.object({
  name: z.string().min(1).max(200),
  isDegenerate: z.boolean(),
  constants: z.record(z.string().max(40), finite),
  symmetry: z.object({ pointGroup: z.enum(['C3v', 'D3h']), vibSpecies: z.string().max(10), isInversionDoubled: z.boolean() }).optional(),
});
const systemInteractionSchema = z.object({
  name: z.string().min(1).max(200),
  type: z.enum(['coriolis', 'fermi']),
  states: z.tuple([z.string().max(200), z.string().max(200)]),
  constants: z.record(z.string().max(40), finite),
});
const systemSchema = z.object({
  model: z.object({
    temperatureK: z.number().refine((t) => Number.isFinite(t) && t > 0, 'a temperature > 0 K'),
    jMax: z.number().int().min(0).max(INPUT_LIMITS.maxModelJ),
    kMax: z.number().int().min(0).max(INPUT_LIMITS.maxModelK),
    species: z
      .array(
        z.object({
          name: z.string().min(1).max(200),
          shape: z.enum(['prolate', 'oblate', 'linear']),
          massAmu: z.number().positive().optional(),
          abundance: z.number().min(0),
          spinWeights: z.array(z.number().min(0)).min(1).max(INPUT_LIMITS.maxSpinWeights),
          states: z.array(systemStateSchema).min(1).max(200),
          bands: z
            .array(
              z.object({
                name: z.string().min(1).max(200),
                upper: z.string(),
                lower: z.string(),
                strength: z.number().min(0),
                momentSign: z.union([z.literal(1), z.literal(-1)]).optional(),
              }),
            )
            .max(500),
          // Symmetry and interacting states (system files with a pointGroup or interactions).
          pointGroup: z.enum(['C3v', 'D3h']).optional(),
          spinWeightsBySymmetry: z.record(z.string().max(10), z.number().min(0)).optional(),
          interactions: z.array(systemInteractionSchema).max(500).optional(),
        }),
      )
      .min(1)
      .max(50),
  }),
  floated: z.array(z.string().max(500)),
  ties: z.record(z.string(), z.string()),
  activeBandKey: z.string().nullable(),
  hiddenBands: z.array(z.string()),
});
const encodedTraceSchema = z.object({
  encoding: z.literal('float64-le-base64'),
  points: z.number().int().min(0),
  wavenumberCm1: z.string(),
  absorbance: z.string(),
});
const reportSchema = z.looseObject({
  fileName: z.string(),
  format: z.enum(['delimited', 'jcamp-dx']),
  xUnit: z.enum(['cm-1', 'um', 'nm']),
  ordinate: z.enum(['absorbance', 'transmittance', 'percent-transmittance']),
  points: z.number(),
  rangeCm1: z.tuple([z.number(), z.number()]),
  skipped: z.object({ count: z.number(), lines: z.array(z.number()) }),
  wasDescending: z.boolean(),
  messages: z.array(z.string()),
});
const viewSchema = z.object({
  xRange: z.tuple([finite, finite]).nullable(),
  ordinate: z.enum(['absorbance', 'transmittance']),
  hiddenRows: z.array(z.string()),
  showSimulated: z.boolean(),
  showObsMinusSim: z.boolean(),
  showPeaks: z.boolean(),
  theme: z.enum(['light', 'dark']),
  tab: z.string(),
  loomisSeriesKey: z.string().nullable(),
  loomisHalfWidthCm1: z.number().positive(),
  combinationState: z.enum(['lower', 'upper']),
  tableQuery: z.record(z.string(), z.unknown()),
});
const fitSchema = z.object({
  // The fit outcome is produced by our own solver; only its outline is checked here.
  outcome: z.union([
    z.object({
      ok: z.literal(true),
      result: z.looseObject({ parameters: z.record(z.string(), z.unknown()), lines: z.array(z.unknown()) }),
    }),
    z.object({ ok: z.literal(false), error: z.looseObject({ kind: z.string(), message: z.string() }) }),
    z.null(),
  ]),
  lineIds: z.array(z.string()),
  finishedAt: z.string().nullable(),
  modelBeforeAccept: modelSchema.nullable(),
  isAccepted: z.boolean(),
});

/** Each optional field: its schema. */
const FIELD_SCHEMAS = {
  floated: z.array(z.string().regex(/^(lower|upper)\.[A-Za-z]+$/, 'a key such as "upper.B"')),
  modelName: z.string().max(500),
  massAmu: z.number().refine((m) => Number.isFinite(m) && m > 0, 'a mass > 0 amu'),
  massSource: z.enum(['default', 'file', 'user']),
  lorentzHwhmCm1: z.number().refine((m) => Number.isFinite(m) && m >= 0, 'a width >= 0 cm^-1'),
  minIntensity: z.number().min(0).max(1),
  symmetry: z.object({ pointGroup: z.string(), species: z.string() }).nullable(),
  trace: encodedTraceSchema.nullable(),
  traceReport: reportSchema.nullable(),
  traceSource: z.string(),
  importOverrides: z.record(z.string(), z.unknown()),
  peakMinSnr: z.number().min(0),
  peakBaseline: z.boolean(),
  assignments: z.array(assignmentSchema),
  nextAssignmentNumber: z.number().int().min(1),
  farToleranceCm1: z.number().positive(),
  fit: fitSchema,
  view: viewSchema,
  system: systemSchema.nullable(),
} as const;

type FieldName = keyof typeof FIELD_SCHEMAS;

/** Fields added after version 2 was first written: a file without them is complete, and says nothing. */
const FIELDS_ADDED_LATER: ReadonlySet<FieldName> = new Set(['massSource', 'system']);

function issueText(issue: z.core.$ZodIssue): string {
  const path = issue.path.map((p) => (typeof p === 'number' ? `[${p}]` : `.${String(p)}`)).join('');
  // zod says "received undefined" for an absent field; say "missing". Paths may hold keys from the file: one short line.
  const message = issue.message.replace(/^Invalid input: expected (\w+), received undefined$/, 'missing (expected $1)');
  return inputExcerpt(`${path ? path + ': ' : ''}${message}`, 200);
}

// ---------------------------------------------------------------- write

/** Details written into the header. */
export interface ProjectFileHeader {
  /** App version (package.json). */
  appVersion: string;
  /** ISO 8601 time of saving. */
  savedAt: string;
}

/**
 * Session fields that an autosave keeps as texts of their own (projectPartSerialize), so that a change
 * elsewhere (a zoom, a tab) does not write the 5,000 assignments or the last fit again.
 */
export type ProjectPartName = 'assignments' | 'fit';
/** Every ProjectPartName. */
export const PROJECT_PART_NAMES: readonly ProjectPartName[] = ['assignments', 'fit'];

/**
 * Write one session field as the JSON text it has inside a project file (non-finite numbers encoded
 * the same way), for projectFileParse's `parts`.
 * @param name the field
 * @param value its value
 */
export function projectPartSerialize<K extends ProjectPartName>(name: K, value: ProjectSession[K]): string {
  return JSON.stringify(value, replacer);
}

/**
 * Write a session as project-file JSON (version 2).
 * @param session the whole session
 * @param header app version and time of saving
 * @param omit session fields left out (an autosave stores them as parts); a file for the user omits none
 */
export function projectFileSerialize(session: ProjectSession, header: ProjectFileHeader, omit: readonly ProjectPartName[] = []): string {
  const { trace, model, ...all } = session;
  const rest: Partial<typeof all> = { ...all };
  for (const name of omit) delete rest[name];
  const encoded = trace
    ? {
        encoding: 'float64-le-base64',
        points: trace.wavenumberCm1.length,
        wavenumberCm1: float64ToBase64(trace.wavenumberCm1),
        absorbance: float64ToBase64(trace.absorbance),
      }
    : null;
  const doc = {
    format: PROJECT_FORMAT,
    version: PROJECT_VERSION,
    savedAt: header.savedAt,
    appVersion: header.appVersion,
    session: { model, ...rest, trace: encoded },
  };
  return JSON.stringify(doc, replacer);
}

// ---------------------------------------------------------------- read

function describeValue(v: unknown): string {
  if (v === null) return 'null';
  if (Array.isArray(v)) return 'a list';
  if (typeof v === 'string') return `the text ${inputExcerpt(JSON.stringify(v.length > 30 ? v.slice(0, 30) + '…' : v))}`;
  return typeof v === 'object' ? 'an object' : `${typeof v} ${String(v)}`;
}

/** Migrate a version-1 document to the version-2 session layout. */
function migrateV1(doc: Record<string, unknown>, messages: string[]): Record<string, unknown> {
  const session: Record<string, unknown> = {};
  const mf = modelFileFromJson(doc.model);
  session.model = mf.model;
  session.floated = mf.floated;
  if (mf.name !== undefined) session.modelName = mf.name;
  if (mf.massAmu !== undefined) session.massAmu = mf.massAmu;
  const t = doc.trace as { wavenumberCm1?: unknown; absorbance?: unknown } | null | undefined;
  if (t && Array.isArray(t.wavenumberCm1) && Array.isArray(t.absorbance)) {
    session.trace = {
      encoding: 'float64-le-base64',
      points: t.wavenumberCm1.length,
      wavenumberCm1: float64ToBase64(Float64Array.from(t.wavenumberCm1 as number[])),
      absorbance: float64ToBase64(Float64Array.from(t.absorbance as number[])),
    };
  } else if (t === null) session.trace = null;
  if (Array.isArray(doc.assignments)) {
    (doc.assignments as unknown[]).forEach((a, i) => {
      if (!a || typeof a !== 'object' || Array.isArray(a)) throw new Error(`assignments[${i}] is ${describeValue(a)}; expected an object`);
    });
    session.assignments = (doc.assignments as Record<string, unknown>[]).map((a, i) => ({
      id: typeof a.id === 'string' && a.id ? a.id : `a${i + 1}`,
      jUpper: a.J_up,
      kUpper: a.K_up,
      jLower: a.J_lo,
      kLower: a.K_lo,
      observedCm1: a.obs,
      uncertaintyCm1: a.sigma ?? 0.001,
      isBlended: a.blended === true,
      isExcluded: a.excluded === true,
      note: typeof a.note === 'string' ? a.note : '',
    }));
    session.nextAssignmentNumber = (doc.assignments as unknown[]).length + 1;
  }
  const v = doc.view as { xRange?: unknown } | undefined;
  if (v && Array.isArray(v.xRange))
    messages.push('version 1 kept only the zoom range of the view; other view settings take their defaults');
  messages.push('migrated from project version 1 (model-file constants, plain-number trace) to version 2');
  return session;
}

/**
 * Read a project file.
 * @param text JSON text
 * @param parts version 2 only: texts of session fields kept apart from the file (projectPartSerialize,
 *   the autosave's layout); each is used when the file itself lacks that field, and then checked
 *   exactly as if it stood in the file
 * @returns the session (model always; other fields when present and valid) with plain-language
 *   messages for migrated, missing, invalid or unknown fields; or a refusal saying why
 */
export function projectFileParse(text: string, parts: Partial<Record<ProjectPartName, string>> = {}): ProjectFileOutcome {
  const parsed = inputJsonParse(text, INPUT_LIMITS.maxTextChars, reviver);
  if (!parsed.ok)
    return {
      ok: false,
      message: parsed.field === 'maxChars' ? `project file: ${parsed.message} (maxTextChars)` : `project file is ${parsed.message}`,
    };
  const doc = parsed.value;
  if (!doc || typeof doc !== 'object' || Array.isArray(doc))
    return { ok: false, message: `project file: expected a JSON object, got ${describeValue(doc)}` };
  const d = doc as Record<string, unknown>;
  if (d.format !== PROJECT_FORMAT) {
    return {
      ok: false,
      message: `project file: field 'format' is ${d.format === undefined ? 'missing' : describeValue(d.format)}; expected "${PROJECT_FORMAT}" (is this a model file or a line table? Those are opened the same way and recognised by their content)`,
    };
  }
  const version = d.version;
  if (typeof version !== 'number' || !Number.isInteger(version) || version < 1) {
    return {
      ok: false,
      message: `project file: field 'version' is ${version === undefined ? 'missing' : describeValue(version)}; expected a whole number >= 1`,
    };
  }
  if (version > PROJECT_VERSION) {
    return {
      ok: false,
      message: `project file: version ${version} was written by a newer Ladder Bench${typeof d.appVersion === 'string' ? ` (${inputExcerpt(d.appVersion, 40)})` : ''}; this one reads versions up to ${PROJECT_VERSION}. Open it with the newer version, or export the model file and line table from there and open those here.`,
    };
  }
  const messages: string[] = [];
  let raw: Record<string, unknown>;
  if (version === 1) {
    try {
      raw = migrateV1(d, messages);
    } catch (err) {
      return { ok: false, message: `project file (version 1): ${(err as Error).message}` };
    }
  } else {
    if (!d.session || typeof d.session !== 'object' || Array.isArray(d.session)) {
      return {
        ok: false,
        message: `project file: field 'session' is ${d.session === undefined ? 'missing' : describeValue(d.session)}; expected an object`,
      };
    }
    raw = d.session as Record<string, unknown>;
    for (const k of Object.keys(d))
      if (!['format', 'version', 'savedAt', 'appVersion', 'session'].includes(k))
        messages.push(`unknown top-level field '${inputExcerpt(k)}' ignored`);
    for (const name of PROJECT_PART_NAMES) {
      const part = parts[name];
      // The file's own field wins: parts are only what was written beside it.
      if (part === undefined || name in raw) continue;
      const p = inputJsonParse(part, INPUT_LIMITS.maxTextChars, reviver);
      if (p.ok) {
        if (raw === d.session) raw = { ...raw };
        raw[name] = p.value;
      } else messages.push(`the separately saved field 'session.${name}' could not be read (${p.message})`);
    }
  }
  const m = modelSchema.safeParse(raw.model);
  if (!m.success) {
    return {
      ok: false,
      message: `project file: field 'session.model' ${raw.model === undefined ? 'is missing' : `is not a band model (${issueText(m.error.issues[0])})`}`,
    };
  }
  const model: BandModel = {
    ...m.data,
    lower: stateConstantsFrom(m.data.lower),
    upper: stateConstantsFrom(m.data.upper),
  };
  const session: Partial<ProjectSession> & { model: BandModel } = { model };
  for (const key of Object.keys(raw)) {
    if (key !== 'model' && !(key in FIELD_SCHEMAS)) messages.push(`unknown field 'session.${inputExcerpt(key)}' ignored`);
  }
  for (const name of Object.keys(FIELD_SCHEMAS) as FieldName[]) {
    if (!(name in raw)) {
      if (version === PROJECT_VERSION && !FIELDS_ADDED_LATER.has(name))
        messages.push(`field 'session.${name}' is missing; the default is used`);
      continue;
    }
    if (name === 'assignments' && Array.isArray(raw[name])) {
      // Row by row, so that one bad row costs that row only, not the user's whole line list.
      const kept: Assignment[] = [];
      const dropped: string[] = [];
      const seen = new Set<string>();
      (raw[name] as unknown[]).forEach((row, i) => {
        const a = assignmentSchema.safeParse(row);
        if (!a.success) dropped.push(`[${i}] (${issueText(a.error.issues[0]).replace(/^\./, '')})`);
        else if (seen.has(a.data.id)) dropped.push(`[${i}] (id '${inputExcerpt(a.data.id)}' appears earlier)`);
        else {
          seen.add(a.data.id);
          kept.push(a.data as Assignment);
        }
      });
      if (dropped.length) {
        const listed = dropped.slice(0, 5).join(', ') + (dropped.length > 5 ? ` and ${dropped.length - 5} more` : '');
        messages.push(`${dropped.length} of ${(raw[name] as unknown[]).length} assignments were not loaded: session.assignments${listed}`);
      }
      session.assignments = kept;
      continue;
    }
    const r = FIELD_SCHEMAS[name].safeParse(raw[name]);
    if (!r.success) {
      messages.push(`field 'session.${name}' is invalid (${issueText(r.error.issues[0])}); the default is used`);
      continue;
    }
    if (name === 'trace') {
      const t = r.data as z.infer<typeof encodedTraceSchema> | null;
      if (t === null) session.trace = null;
      else {
        try {
          const x = base64ToFloat64(t.wavenumberCm1, 'session.trace.wavenumberCm1');
          const y = base64ToFloat64(t.absorbance, 'session.trace.absorbance');
          if (x.length !== t.points || y.length !== t.points)
            throw new Error(`session.trace: expected ${t.points} points, found ${x.length} and ${y.length}`);
          for (let i = 1; i < x.length; i++) {
            if (!(x[i] > x[i - 1])) throw new Error(`session.trace: wavenumbers must increase; point ${i} (${x[i]}) follows ${x[i - 1]}`);
          }
          // The rest of the workbench relies on a finite trace (a NaN would poison every sum over it).
          for (let i = 0; i < x.length; i++) {
            if (!Number.isFinite(x[i]) || !Number.isFinite(y[i]))
              throw new Error(`session.trace: point ${i} is not finite (${x[i]} cm^-1, absorbance ${y[i]})`);
          }
          session.trace = { wavenumberCm1: x, absorbance: y };
        } catch (err) {
          messages.push(`${(err as Error).message}; the trace was not loaded`);
        }
      }
      continue;
    }
    if (name === 'fit') {
      const f = r.data as z.infer<typeof fitSchema>;
      session.fit = {
        ...f,
        outcome: f.outcome as FitOutcome | null,
        modelBeforeAccept: f.modelBeforeAccept
          ? {
              ...f.modelBeforeAccept,
              lower: stateConstantsFrom(f.modelBeforeAccept.lower),
              upper: stateConstantsFrom(f.modelBeforeAccept.upper),
            }
          : null,
      };
      continue;
    }
    (session as Record<string, unknown>)[name] = r.data;
  }
  return { ok: true, session, messages, version };
}
