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
};

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
  const sym = SYMBOLS[name];
  if (!sym) return { symbol: key, subscript: '', prime: '' };
  const prime = UPPER_ONLY.has(name) ? '' : side === 'upper' ? '′' : side === 'lower' ? '″' : '';
  return { symbol: sym[0], subscript: sym[1], prime };
}

/**
 * A constant's name as plain text: "ν₀", "B′", "D_JK″" (the subscript after "_" where Unicode has
 * no subscript letter).
 * @param key "side.name" or "name"
 */
export function constantNameText(key: string): string {
  const p = constantNameParts(key);
  const sub = p.subscript === '' ? '' : p.subscript === '0' ? '₀' : `_${p.subscript}`;
  return `${p.symbol}${sub}${p.prime}`;
}

/**
 * A constant's name as HTML (plotly labels): "D<sub>JK</sub>″". The parts come from a fixed table
 * (an unknown key is escaped), so the result is safe markup.
 * @param key "side.name" or "name"
 */
export function constantNameHtml(key: string): string {
  const p = constantNameParts(key);
  const symbol = p.symbol.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
  return `${symbol}${p.subscript ? `<sub>${p.subscript}</sub>` : ''}${p.prime}`;
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
