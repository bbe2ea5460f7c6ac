/**
 * Shared pieces of the reliability tests: a hang guard, per-parser input counters, generators of hostile
 * text (random strings, random bytes decoded as latin1/UTF-8, mutations of valid files) and the checks
 * every refusal message must pass.
 */
import fc from 'fast-check';
import { expect } from 'vitest';
import { inputIsOneLine } from '../../src/io/inputLimits';

/**
 * Longest a single parser call may take before it counts as a hang, ms. Not a performance target: the
 * inputs are ≤ a few kB and take ≪ 10 ms; 2 s only catches loops that never end or go quadratic.
 */
export const HANG_LIMIT_MS = 2000;

/** Inputs tried per parser in this test file (printed by `countsPrint`). */
const counts = new Map<string, number>();

/** Count one input given to `parser`. */
export function countInput(parser: string, n = 1): void {
  counts.set(parser, (counts.get(parser) ?? 0) + n);
}

/** Print the counts (one line per parser) so the run log carries them; call in afterAll. */
export function countsPrint(file: string): void {
  const rows = [...counts.entries()].map(([p, n]) => `  ${p}: ${n} inputs`);
  console.log(`[reliability] ${file}\n${rows.join('\n')}`);
}

/**
 * Run `fn`, never letting an exception escape, and time it.
 * @returns the value or the thrown error, and the wall-clock time in ms
 */
export function timed<T>(fn: () => T): { ok: true; value: T; ms: number } | { ok: false; error: unknown; ms: number } {
  const t0 = performance.now();
  try {
    const value = fn();
    return { ok: true, value, ms: performance.now() - t0 };
  } catch (error) {
    return { ok: false, error, ms: performance.now() - t0 };
  }
}

/**
 * Check a refusal message: non-empty, one line, bounded in length, and naming what it should.
 * @param message the message
 * @param expectations prefix (the file name and ': '), line (when the parser reported one)
 */
export function expectGoodMessage(message: string, expectations: { prefix?: string; line?: number; maxLength?: number } = {}): void {
  expect(typeof message).toBe('string');
  expect(inputIsOneLine(message), JSON.stringify(message)).toBe(true);
  // Long enough for a file name plus a clause quoting short excerpts; a message that echoes a whole
  // label or row would be longer.
  expect(message.length, message.slice(0, 200)).toBeLessThanOrEqual(expectations.maxLength ?? 700);
  if (expectations.prefix !== undefined) expect(message.startsWith(expectations.prefix), message).toBe(true);
  if (expectations.line !== undefined) expect(message, 'message names its line').toMatch(new RegExp(`\\bline ${expectations.line}\\b`));
  // Leaks of a bug rather than words about the file (file text never spells these in the inputs used).
  expect(message).not.toMatch(/internal error|\[object Object\]|(?<!['"])\bundefined\b(?!['"])/);
}

/** Values that break naive number readers. */
export const HOSTILE_TOKENS = [
  'NaN',
  'nan',
  'Infinity',
  '-Infinity',
  'inf',
  '1e999',
  '-1e999',
  '1e-400',
  '-0',
  '+0',
  '1e308',
  '9'.repeat(400),
  '0x1F',
  '0b11',
  '1_000',
  '1.2.3',
  '1e',
  '--1',
  '.',
  '?',
  '"',
  '""',
  ',',
  ';',
  '\t',
  '\0',
  '\uFEFF',
  '\r',
  '\n',
  '\r\n',
  '\u2028',
  '\u0085',
  '##',
  '##END=',
  '$$',
  '#',
  '<script>alert(1)</script>',
  '{',
  '[',
  'null',
  '-1',
  '1e12',
  '2.5',
  '1,5',
];

/** One edit of a text. */
type Edit =
  | { kind: 'delete'; at: number; length: number }
  | { kind: 'insert'; at: number; text: string }
  | { kind: 'duplicate'; at: number; length: number }
  | { kind: 'replace'; at: number; text: string }
  | { kind: 'truncate'; at: number }
  | { kind: 'swapLines'; a: number; b: number }
  | { kind: 'inject'; at: number; token: number }
  | { kind: 'decimalComma' }
  | { kind: 'bom' }
  | { kind: 'crOnly' }
  | { kind: 'crlf' }
  | { kind: 'nul'; at: number }
  | { kind: 'dropLine'; a: number }
  | { kind: 'repeatLine'; a: number; times: number };

const editArb: fc.Arbitrary<Edit> = fc.oneof(
  fc.record({ kind: fc.constant('delete' as const), at: fc.nat(), length: fc.integer({ min: 1, max: 8 }) }),
  fc.record({ kind: fc.constant('insert' as const), at: fc.nat(), text: fc.string({ maxLength: 6, unit: 'binary' }) }),
  fc.record({ kind: fc.constant('duplicate' as const), at: fc.nat(), length: fc.integer({ min: 1, max: 40 }) }),
  fc.record({ kind: fc.constant('replace' as const), at: fc.nat(), text: fc.string({ minLength: 1, maxLength: 3, unit: 'binary' }) }),
  fc.record({ kind: fc.constant('truncate' as const), at: fc.nat() }),
  fc.record({ kind: fc.constant('swapLines' as const), a: fc.nat(), b: fc.nat() }),
  fc.record({ kind: fc.constant('inject' as const), at: fc.nat(), token: fc.nat(HOSTILE_TOKENS.length - 1) }),
  fc.constant({ kind: 'decimalComma' as const }),
  fc.constant({ kind: 'bom' as const }),
  fc.constant({ kind: 'crOnly' as const }),
  fc.constant({ kind: 'crlf' as const }),
  fc.record({ kind: fc.constant('nul' as const), at: fc.nat() }),
  fc.record({ kind: fc.constant('dropLine' as const), a: fc.nat() }),
  fc.record({ kind: fc.constant('repeatLine' as const), a: fc.nat(), times: fc.integer({ min: 2, max: 50 }) }),
);

/** Apply edits in order (positions taken modulo the current length). */
export function applyEdits(text: string, edits: readonly Edit[]): string {
  let t = text;
  for (const e of edits) {
    const pos = (at: number) => (t.length === 0 ? 0 : at % (t.length + 1));
    switch (e.kind) {
      case 'delete':
        t = t.slice(0, pos(e.at)) + t.slice(pos(e.at) + e.length);
        break;
      case 'insert':
        t = t.slice(0, pos(e.at)) + e.text + t.slice(pos(e.at));
        break;
      case 'duplicate': {
        const p = pos(e.at);
        t = t.slice(0, p) + t.slice(p, p + e.length) + t.slice(p);
        break;
      }
      case 'replace':
        t = t.slice(0, pos(e.at)) + e.text + t.slice(pos(e.at) + e.text.length);
        break;
      case 'truncate':
        t = t.slice(0, pos(e.at));
        break;
      case 'inject':
        t = t.slice(0, pos(e.at)) + HOSTILE_TOKENS[e.token] + t.slice(pos(e.at));
        break;
      case 'decimalComma':
        t = t.replace(/(\d)\.(\d)/g, '$1,$2');
        break;
      case 'bom':
        t = '\uFEFF' + t;
        break;
      case 'crOnly':
        t = t.replace(/\r?\n/g, '\r');
        break;
      case 'crlf':
        t = t.replace(/\r?\n/g, '\r\n');
        break;
      case 'nul':
        t = t.slice(0, pos(e.at)) + '\0' + t.slice(pos(e.at));
        break;
      default: {
        const lines = t.split('\n');
        const a = e.a % lines.length;
        if (e.kind === 'swapLines') {
          const b = e.b % lines.length;
          [lines[a], lines[b]] = [lines[b], lines[a]];
        } else if (e.kind === 'dropLine') lines.splice(a, 1);
        else lines.splice(a, 0, ...Array<string>(e.times - 1).fill(lines[a]));
        t = lines.join('\n');
      }
    }
  }
  return t;
}

/** Mutations (1–8 edits) of one of the given valid texts. */
export function mutationArb(seeds: readonly string[]): fc.Arbitrary<string> {
  return fc
    .tuple(fc.nat(seeds.length - 1), fc.array(editArb, { minLength: 1, maxLength: 8 }))
    .map(([i, edits]) => applyEdits(seeds[i], edits));
}

/** Random bytes decoded as latin1 (every byte a character) or as UTF-8 (with U+FFFD for bad sequences). */
export function bytesTextArb(maxLength = 400): fc.Arbitrary<string> {
  return fc
    .tuple(fc.uint8Array({ maxLength }), fc.boolean())
    .map(([bytes, isUtf8]) => (isUtf8 ? new TextDecoder('utf-8').decode(bytes) : String.fromCharCode(...bytes)));
}

/** Random strings: any code points (incl. lone surrogates), and strings drawn from a parser's own alphabet. */
export function randomTextArb(alphabet: string, maxLength = 300): fc.Arbitrary<string> {
  return fc.oneof(
    fc.string({ unit: 'binary', maxLength }),
    fc.string({ unit: 'grapheme', maxLength }),
    fc.string({ unit: fc.constantFrom(...alphabet.split('')), maxLength }),
    fc.array(fc.constantFrom(...HOSTILE_TOKENS, '\n', ' ', '1', '2.5', ','), { maxLength: 60 }).map((a) => a.join('')),
  );
}
