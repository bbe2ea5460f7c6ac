/**
 * Model edits (all enter undo history; typing in one field is one step).
 */
import { inputJsonParse, INPUT_LIMITS } from '../io/inputLimits';
import { modelAllowedParameters, modelFileParse, type ModelFile } from '../io/modelFile';
import { bandTypeFromSymmetry } from '../physics/bandSymmetry';
import { wavenumberToMhz } from '../physics/constants';
import type { BandModel, BandType, ParameterName, TopShape } from '../physics/model';
import { modelFileNeedsSystem, systemFileDetect, systemFileFromModelJson, systemFileParse, type SystemFile } from '../io/systemFile';
import { systemLoad } from './actionsSystem';
import { systemSliceInitial } from './systemSlice';
import { benchUpdate, messagePost } from './actionsCore';
import { MASS_DEFAULT_AMU, type ModelSymmetry } from './modelSlice';

/** Which state a constant belongs to. */
export type ModelSide = 'lower' | 'upper';

/**
 * Set one constant.
 * @param value cm^-1 (ζ dimensionless); must be finite
 * @returns an error sentence, or null when applied
 */
export function modelSetConstant(side: ModelSide, name: ParameterName, value: number): string | null {
  if (!Number.isFinite(value)) return `${side}.${name} must be a finite number, got ${value}`;
  benchUpdate(
    `edit ${side}.${name}`,
    (s) => ({ model: { ...s.model, [side]: { ...s.model[side], [name]: value } }, isFitAccepted: false }),
    { history: true, coalesce: true },
  );
  return null;
}

/**
 * Set a constant given in MHz (lower state unless `side` says otherwise).
 * @param valueMhz MHz
 */
export function modelSetConstantMhz(name: ParameterName, valueMhz: number, side: ModelSide = 'lower'): string | null {
  return modelSetConstant(side, name, valueMhz / wavenumberToMhz(1));
}

/** Show the rotational constants (model panel, fit table) in cm⁻¹ or MHz; ν₀ stays in cm⁻¹ and ζ has no unit. */
export function modelSetConstantUnit(unit: 'cm-1' | 'MHz'): void {
  benchUpdate('constant unit', () => ({ constantUnit: unit }), { history: false });
}

/** Float or fix a constant in the fit. */
export function modelSetFloated(key: string, isFloated: boolean): void {
  benchUpdate(
    isFloated ? `float ${key}` : `fix ${key}`,
    (s) => {
      const has = s.floated.includes(key);
      if (has === isFloated) return {};
      return { floated: isFloated ? [...s.floated, key] : s.floated.filter((k) => k !== key) };
    },
    { history: true },
  );
}

/** Floated keys that remain meaningful for a shape (drops A for oblate, C for prolate …). */
export function floatedForShape(floated: readonly string[], shape: TopShape): string[] {
  return floated.filter((k) => {
    const [side, name] = k.split('.') as [ModelSide, ParameterName];
    return modelAllowedParameters(shape, side).includes(name);
  });
}

/** Change the rotor shape (kMax becomes 0 for a linear molecule). */
export function modelSetShape(shape: TopShape): void {
  benchUpdate(
    `shape ${shape}`,
    (s) => ({
      model: { ...s.model, shape, kMax: shape === 'linear' ? 0 : Math.max(s.model.kMax, 1) },
      floated: floatedForShape(s.floated, shape),
    }),
    { history: true },
  );
}

/** Change the band type directly (clears a symmetry derivation). */
export function modelSetBand(band: BandType): void {
  benchUpdate(`band ${band}`, (s) => ({ model: { ...s.model, band }, symmetry: null }), { history: true });
}

/**
 * Derive the band type from point group and vibrational species.
 * @returns the physics module's reason (shown beside the choice), or an error sentence
 */
export function modelSetSymmetry(symmetry: ModelSymmetry): { ok: boolean; text: string } {
  let r;
  try {
    r = bandTypeFromSymmetry(symmetry.pointGroup, symmetry.species);
  } catch (err) {
    return { ok: false, text: (err as Error).message };
  }
  if (r.activity === 'inactive') {
    benchUpdate(`symmetry ${symmetry.pointGroup} ${symmetry.species}`, () => ({ symmetry }), { history: true });
    return { ok: false, text: r.reason };
  }
  const band = r.activity;
  benchUpdate(`symmetry ${symmetry.pointGroup} ${symmetry.species}`, (s) => ({ model: { ...s.model, band }, symmetry }), { history: true });
  return { ok: true, text: r.reason };
}

/** Numeric model settings outside the two states. */
export type ModelScalarField = 'temperatureK' | 'jMax' | 'kMax';

/**
 * Set the temperature (K, > 0) or a J''/K'' limit (whole number 0…400).
 * @returns an error sentence, or null when applied
 */
export function modelSetScalar(field: ModelScalarField, value: number): string | null {
  if (field === 'temperatureK') {
    if (!(value > 0 && Number.isFinite(value))) return `temperature must be a number > 0 K, got ${value}`;
  } else if (!Number.isInteger(value) || value < 0 || value > 400) {
    return `${field === 'jMax' ? 'J″ max' : 'K″ max'} must be a whole number from 0 to 400, got ${value}`;
  }
  benchUpdate(`edit ${field}`, (s) => ({ model: { ...s.model, [field]: value } }), { history: true, coalesce: true });
  return null;
}

/**
 * Set nuclear-spin weights g(K'' mod n).
 * @param text comma- or space-separated weights, e.g. "2, 1, 1"
 * @returns an error sentence, or null when applied
 */
export function modelSetSpinWeights(text: string): string | null {
  const parts = text.split(/[\s,;]+/).filter((p) => p !== '');
  const weights = parts.map(Number);
  if (weights.length === 0 || weights.some((w) => !(w >= 0) || !Number.isFinite(w))) {
    return `spin weights must be a list of numbers >= 0 such as "2, 1, 1", got "${text}"`;
  }
  if (weights.every((w) => w === 0)) return 'spin weights: at least one weight must be > 0';
  benchUpdate('edit spin weights', (s) => ({ model: { ...s.model, spinWeights: weights } }), { history: true, coalesce: true });
  return null;
}

/**
 * Set simulation settings (not part of undo: they change no line position).
 * @returns an error sentence, or null
 */
export function modelSetSimulation(field: 'massAmu' | 'lorentzHwhmCm1', value: number): string | null {
  if (field === 'massAmu' && !(value > 0 && Number.isFinite(value))) return `mass must be a number > 0 amu, got ${value}`;
  if (field === 'lorentzHwhmCm1' && !(value >= 0 && Number.isFinite(value))) return `Lorentz HWHM must be a number >= 0 cm⁻¹, got ${value}`;
  benchUpdate(`edit ${field}`, () => (field === 'massAmu' ? { massAmu: value, massSource: 'user' } : { [field]: value }), {
    history: false,
  });
  return null;
}

/** Hide lines weaker than this fraction of the strongest (0 … 0.5). */
export function modelSetMinIntensity(value: number): string | null {
  if (!(value >= 0 && value <= 0.5)) return `intensity cut must be between 0 and 0.5, got ${value}`;
  benchUpdate('edit intensity cut', () => ({ minIntensity: value }), { history: true, coalesce: true });
  return null;
}

/**
 * Replace the whole model (e.g. from a model file); one undo step, which also puts back the previous
 * model's name and mass. A file without a mass keeps a mass the user typed, and otherwise returns to
 * the default (so a mass from the previous file is not carried over into the next export).
 */
export function modelReplace(file: Pick<ModelFile, 'model' | 'floated' | 'name' | 'massAmu'>, label: string): void {
  benchUpdate(
    label,
    (s) => {
      const mass =
        file.massAmu !== undefined
          ? { massAmu: file.massAmu, massSource: 'file' as const }
          : s.massSource === 'user'
            ? {}
            : { massAmu: MASS_DEFAULT_AMU, massSource: 'default' as const };
      return {
        model: file.model,
        floated: file.floated,
        modelName: file.name ?? s.modelName,
        ...mass,
        symmetry: null,
        isFitAccepted: false,
        modelBeforeAccept: null,
        // A single-band model ends a several-band session (its lines' band names are kept).
        ...systemSliceInitial(),
      };
    },
    { history: true, extraKeys: ['modelName', 'massAmu', 'massSource', 'isFitAccepted', 'modelBeforeAccept', 'systemTies', 'hiddenBands'] },
  );
}

/**
 * Read a model file (JSON) chosen by the user and make it the current model.
 * @returns true when loaded; on failure a message is posted and nothing changes
 */
export function modelLoadText(text: string, fileName: string): boolean {
  if (isSystemFileText(text)) return systemLoadText(text, fileName);
  // A model file with keys only the system engine holds (pointGroup, q22, inv…, qJ) opens as a
  // one-band system, as the command line reads it, rather than being refused.
  if (isModelNeedingSystem(text)) return systemLoadText(text, fileName, true);
  let file: ModelFile;
  try {
    file = modelFileParse(text);
  } catch (err) {
    messagePost('error', `Could not read the model file ${fileName}: ${(err as Error).message}. The current model is unchanged.`);
    return false;
  }
  modelReplace({ ...file, name: file.name ?? fileName }, `load model ${fileName}`);
  for (const w of file.warnings) messagePost('warning', `${fileName}: ${w}`);
  messagePost('info', `Model loaded from ${fileName}.`);
  return true;
}

/** True when a model file's text is a system file (a JSON object with a `species` field). */
function isSystemFileText(text: string): boolean {
  try {
    return systemFileDetect(JSON.parse(text));
  } catch {
    return false;
  }
}

/** True when a model file's text is a single-band model file that needs the system engine (io/systemFile modelFileNeedsSystem). */
function isModelNeedingSystem(text: string): boolean {
  const parsed = inputJsonParse(text, INPUT_LIMITS.maxModelFileChars);
  return parsed.ok && modelFileNeedsSystem(parsed.value);
}

/**
 * Read a system file (several bands, species) and make it the session's model.
 * @param isModelFile a single-band model file read as a one-band system (keys upper.*, lower.*)
 * @returns true when loaded; on failure a message names the field and nothing changes
 */
function systemLoadText(text: string, fileName: string, isModelFile = false): boolean {
  let file: SystemFile;
  try {
    if (isModelFile) {
      const parsed = inputJsonParse(text, INPUT_LIMITS.maxModelFileChars);
      file = systemFileFromModelJson(parsed.ok ? parsed.value : null);
    } else file = systemFileParse(text);
  } catch (err) {
    messagePost(
      'error',
      `Could not read the ${isModelFile ? 'model' : 'system'} file ${fileName}: ${(err as Error).message}. The current model is unchanged.`,
    );
    return false;
  }
  const floated = file.parameters.filter((p) => p.status === 'floated').map((p) => p.key);
  const ties: Record<string, string> = {};
  for (const p of file.parameters) if (p.status === 'tied' && p.same) ties[p.key] = p.same;
  if (!systemLoad({ system: file.model, floated, ties, name: fileName }, `load system ${fileName}`)) return false;
  for (const w of file.warnings) messagePost('warning', `${fileName}: ${w}`);
  const nBands = file.model.species.reduce((n, sp) => n + sp.bands.length, 0);
  messagePost(
    'info',
    isModelFile
      ? `Model loaded from ${fileName} as a one-band system (its symmetry or Hamiltonian constants need the system engine).`
      : `System loaded from ${fileName}: ${file.model.species.length} species, ${nBands} bands.`,
  );
  return true;
}

/** The allowed constants of a side for the current shape (for the panel rows). */
export function modelParameterNames(model: BandModel, side: ModelSide): ParameterName[] {
  return modelAllowedParameters(model.shape, side);
}
