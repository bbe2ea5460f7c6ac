/**
 * Constant names as the trade writes them (ν₀, B′, A″, D_J″, D_JK′, H_K″, ζ, q) from the keys the
 * files and the command line use ("upper.DJ"). Keys stay in files; only what is shown changes.
 * Pure: text in, text out.
 */
import { MHZ_PER_CM1 } from '../physics/constants';
import { PARAMETER_NAMES } from '../physics/model';

/** The pieces of a constant's name: symbol, subscript and state prime. */
export interface ConstantNameParts {
  /** Main symbol: "ν", "B", "D", "ζ" …; the key itself when it is not a known constant. */
  symbol: string;
  /** Subscript: "0", "J", "JK" …, or "". */
  subscript: string;
  /** "′" for the upper state, "″" for the lower, "" for a constant of one state only (ν₀, ζ, q) or a bare name. */
  prime: '′' | '″' | '';
  /**
   * The state or interaction a system fit key names ("v4", "v2v4", "X/v4"), shown beside the
   * symbol; "" for the single-band keys (upper., lower.) and bare names.
   */
  owner: string;
}

const SYMBOLS: Record<string, [string, string]> = {
  origin: ['ν', '0'],
  B: ['B', ''],
  A: ['A', ''],
  C: ['C', ''],
  DJ: ['D', 'J'],
  DJK: ['D', 'JK'],
  DK: ['D', 'K'],
  HJ: ['H', 'J'],
  HJK: ['H', 'JK'],
  HKJ: ['H', 'KJ'],
  HK: ['H', 'K'],
  zeta: ['ζ', ''],
  q: ['q', ''],
  // Constants of the effective Hamiltonians (system files with a pointGroup) and of a linear Π state.
  qJ: ['q', 'J'],
  etaJ: ['η', 'J'],
  etaK: ['η', 'K'],
  q22: ['q', '22'],
  q22J: ['q', '22J'],
  q12: ['q', '12'],
  LJ: ['L', 'J'],
  LJJK: ['L', 'JJK'],
  LJK: ['L', 'JK'],
  LKKJ: ['L', 'KKJ'],
  LK: ['L', 'K'],
  inv: ['Δ', 'inv'],
  eps3: ['ε', '3'],
  eps3J: ['ε', '3J'],
  h3: ['h', '3'],
  eps: ['ε', ''],
  // Interaction constants (keys "<interaction>.<constant>"; physics/interaction/interactionTerms.ts).
  C1: ['C', '1'],
  C1J: ['C', '1J'],
  C1K: ['C', '1K'],
  C1JJ: ['C', '1JJ'],
  C2: ['C', '2'],
  C2J: ['C', '2J'],
  C2K: ['C', '2K'],
  C2JJ: ['C', '2JJ'],
  C2JK: ['C', '2JK'],
  C4: ['C', '4'],
  C5: ['C', '5'],
  Cz: ['C', 'z'],
  CzJ: ['C', 'zJ'],
  W: ['W', ''],
  WJ: ['W', 'J'],
  WK: ['W', 'K'],
};

/**
 * The J, K dependence of the inversion splitting ("invB", "invDJ": the a − s difference of B, D_J)
 * is named by the constant it modifies with "inv" in its subscript: Δ B_inv, Δ D_J,inv.
 */
function inversionParts(name: string): [string, string] | null {
  if (!name.startsWith('inv') || name === 'inv') return null;
  const base = SYMBOLS[name.slice(3)];
  if (!base) return null;
  return [`Δ${base[0]}`, base[1] ? `${base[1]},inv` : 'inv'];
}

/** Constants that belong to the upper state only (written without a prime, as is usual). */
const UPPER_ONLY = new Set(['origin', 'zeta', 'q']);

/**
 * Split a key ("upper.DJ", "lower.B", or a bare "DJ") into symbol, subscript and prime.
 * Source: notation of Herzberg, Molecular Spectra and Molecular Structure II (1945), ch. I–IV
 * (′ upper, ″ lower state; D_J, D_JK, D_K; ζ for the Coriolis constant), from memory.
 * @param key "side.name" or "name"
 */
export function constantNameParts(key: string): ConstantNameParts {
  const dot = key.indexOf('.');
  const side = dot >= 0 ? key.slice(0, dot) : '';
  const name = dot >= 0 ? key.slice(dot + 1) : key;
  const sym = SYMBOLS[name] ?? inversionParts(name);
  if (!sym) return { symbol: key, subscript: '', prime: '', owner: '' };
  const prime = UPPER_ONLY.has(name) ? '' : side === 'upper' ? '′' : side === 'lower' ? '″' : '';
  const owner = side === 'upper' || side === 'lower' ? '' : side;
  return { symbol: sym[0], subscript: sym[1], prime, owner };
}

/**
 * A constant's name as plain text: "ν₀", "B′", "D_JK″" (the subscript after "_" where Unicode has
 * no subscript letter); a system key names its state or interaction: "q_22 (v4)", "C_1 (v2v4)".
 * @param key "side.name" or "name"
 */
export function constantNameText(key: string): string {
  const p = constantNameParts(key);
  const sub = p.subscript === '' ? '' : p.subscript === '0' ? '₀' : `_${p.subscript}`;
  return `${p.symbol}${sub}${p.prime}${p.owner ? ` (${p.owner})` : ''}`;
}

/**
 * A constant's name as HTML (plotly labels): "D<sub>JK</sub>″". The parts come from a fixed table
 * (an unknown key is escaped), so the result is safe markup.
 * @param key "side.name" or "name"
 */
export function constantNameHtml(key: string): string {
  const p = constantNameParts(key);
  const symbol = p.symbol.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
  const owner = p.owner.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
  return `${symbol}${p.subscript ? `<sub>${p.subscript}</sub>` : ''}${p.prime}${owner ? ` (${owner})` : ''}`;
}

const KEY_PATTERN = new RegExp(`\\b(upper|lower)\\.(${[...PARAMETER_NAMES].sort((a, b) => b.length - a.length).join('|')})\\b`, 'g');

/**
 * Replace every constant key in a sentence by its name ("fix upper.DJK" → "fix D_JK′"), for
 * messages written with keys (fit warnings, refusals) when they are shown on the page.
 * @param text a sentence
 */
export function constantKeysToNames(text: string): string {
  return text.replace(KEY_PATTERN, (key) => constantNameText(key));
}

/** Unit the rotational constants are shown in. */
export type ConstantUnit = 'cm-1' | 'MHz';

/**
 * The unit a constant is shown in: ν₀ always cm⁻¹ (a band origin in MHz helps no one), ζ none, every
 * other constant the chosen unit.
 * @param key "side.name" or "name"
 * @returns "cm⁻¹", "MHz" or "" (dimensionless)
 */
export function constantDisplayUnit(key: string, unit: ConstantUnit): string {
  const name = key.slice(key.indexOf('.') + 1);
  if (name === 'zeta') return '';
  if (name === 'origin' || unit === 'cm-1') return 'cm⁻¹';
  return 'MHz';
}

/**
 * A constant (or its σ) in its display unit (constantDisplayUnit).
 * Source: 1 cm⁻¹ = c · 1 cm⁻¹ = 29 979.2458 MHz (c exact, CODATA 2018).
 * @param key "side.name" or "name"
 * @param valueCm1 the value in cm⁻¹ (ζ dimensionless)
 */
export function constantToDisplayUnit(key: string, valueCm1: number, unit: ConstantUnit): number {
  return constantDisplayUnit(key, unit) === 'MHz' ? valueCm1 * MHZ_PER_CM1 : valueCm1;
}
