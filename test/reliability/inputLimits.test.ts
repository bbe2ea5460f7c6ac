/**
 * Tests of src/io/inputLimits.ts: the limits against the runtime they guard, the limit check, the
 * one-line excerpt of untrusted text, and the JSON guard (validity and error place checked against V8's
 * own JSON.parse, an implementation of ECMA-404 outside this project).
 */
import { constants } from 'node:buffer';
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { INPUT_LIMITS, inputExcerpt, inputIsOneLine, inputJsonParse, inputLimitCheck } from '../../src/io/inputLimits';
import { ASSIGNMENT_MAX_J } from '../../src/fit/assignment';
import { TRACE_IMPORT_DEFAULTS } from '../../src/io/traceImportOptions';
import { applyEdits, countInput, countsPrint } from './reliabilityHarness';

afterAll(() => countsPrint('inputLimits.test.ts'));

describe('INPUT_LIMITS', () => {
  it('keeps the text limit below the longest string the runtime can make', () => {
    // Node 20 (V8 11): buffer.constants.MAX_STRING_LENGTH = 2^29 − 24 UTF-16 units.
    expect(constants.MAX_STRING_LENGTH).toBe(2 ** 29 - 24);
    expect(INPUT_LIMITS.maxTextChars).toBeLessThan(constants.MAX_STRING_LENGTH);
  });
  it('ties the shared limits to the places that use them', () => {
    expect(INPUT_LIMITS.maxQuantumJ).toBe(ASSIGNMENT_MAX_J);
    expect(INPUT_LIMITS.maxQuantumJ).toBe(INPUT_LIMITS.maxModelJ);
    expect(TRACE_IMPORT_DEFAULTS.maxPoints).toBe(INPUT_LIMITS.maxTracePoints);
    // g(K″) = spinWeights[K″ mod n] with K″ ≤ kMax: n = kMax + 1 entries are the most that can be read.
    expect(INPUT_LIMITS.maxSpinWeights).toBe(INPUT_LIMITS.maxModelK + 1);
    expect(Object.isFrozen(INPUT_LIMITS)).toBe(true);
  });
});

describe('inputLimitCheck', () => {
  it('passes a value at the limit and names value, limit and limit name above it', () => {
    expect(inputLimitCheck('maxLineTableRows', 2_000_000)).toBeNull();
    expect(inputLimitCheck('maxLineTableRows', 2_000_001)).toBe(
      'row count 2000001 is above the limit of 2000000 data rows (maxLineTableRows)',
    );
    expect(inputLimitCheck('maxQuantumJ', 1e12)).toBe('J 1000000000000 is above the limit of 2000 (maxQuantumJ)');
    expect(inputLimitCheck('maxTracePoints', 11, 10)).toBe('point count 11 is above the limit of 10 points (maxTracePoints)');
  });
});

describe('inputExcerpt', () => {
  it('keeps printable text verbatim, HTML included', () => {
    expect(inputExcerpt('<script>alert("x")</script>')).toBe('<script>alert("x")</script>');
    expect(inputExcerpt('µm, cm⁻¹, Δ, 😀')).toBe('µm, cm⁻¹, Δ, 😀');
  });
  it('writes line breaks, controls and lone surrogates as \\uXXXX', () => {
    expect(inputExcerpt('a\nb\rc\u2028d\u2029e\u0085f\u0000g\u007f')).toBe('a\\u000ab\\u000dc\\u2028d\\u2029e\\u0085f\\u0000g\\u007f');
    expect(inputExcerpt('x\ud800y\udc00')).toBe('x\\ud800y\\udc00');
  });
  it('cuts long text with an ellipsis, never inside a surrogate pair', () => {
    expect(inputExcerpt('abcdef', 3)).toBe('abc…');
    expect(inputExcerpt('ab😀cd', 3)).toBe('ab…');
  });
  it('always gives one line (property test, any code units)', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary', minLength: 1, maxLength: 100 }), fc.integer({ min: 1, max: 120 }), (s, max) => {
        countInput('inputExcerpt');
        const e = inputExcerpt(s, max);
        expect(/[\n\r\u0085\u2028\u2029]/.test(e)).toBe(false);
        // No lone surrogate left (well-formed UTF-16, so the text survives any encoding).
        expect(/[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/.test(e)).toBe(false);
      }),
      { numRuns: 3000, seed: 601 },
    );
  });
});

describe('inputIsOneLine', () => {
  it('rejects empty messages and every Unicode line break', () => {
    expect(inputIsOneLine('file: line 3: bad')).toBe(true);
    for (const bad of ['', '  ', 'a\nb', 'a\rb', 'a\u2028b', 'a\u2029b', 'a\u0085b'])
      expect(inputIsOneLine(bad), JSON.stringify(bad)).toBe(false);
  });
});

describe('inputJsonParse', () => {
  it('names line and column of a syntax error, in one line', () => {
    const r = inputJsonParse('{\n  "a": 1,\n  "b": tru\n}');
    expect(r.ok).toBe(false);
    if (r.ok) return;
    // The newline after "tru" is the first character that cannot continue the text (line 3, column 11).
    expect([r.line, r.column]).toEqual([3, 11]);
    expect(r.message.startsWith('not valid JSON at line 3, column 11: ')).toBe(true);
    expect(inputIsOneLine(r.message)).toBe(true);
  });
  it('says when the text ends early', () => {
    const r = inputJsonParse('{"a": [1, 2');
    expect(r.ok ? '' : r.message).toMatch(/^not valid JSON \(the text ends early, at line 1\): /);
  });
  it('refuses text above the length limit and nesting deeper than maxJsonDepth before parsing', () => {
    const r = inputJsonParse('[1]', 2);
    expect(r.ok ? '' : r.message).toBe('the text is 3 characters long, above the limit of 2 characters');
    const depth = INPUT_LIMITS.maxJsonDepth;
    expect(inputJsonParse('['.repeat(depth) + ']'.repeat(depth)).ok).toBe(true);
    const deep = inputJsonParse('{"a": "[[[["}\n' + '['.repeat(depth + 1) + ']'.repeat(depth + 1));
    expect(deep.ok ? '' : deep.message).toBe(`nested more than ${depth} levels deep at line 2 (limit maxJsonDepth)`);
  });
  it('agrees with JSON.parse on what is valid, and places errors where V8 does (property test)', () => {
    // Reference: V8's JSON.parse. Where its message gives "position P" (0-based), our column on
    // single-line text is P + 1: both name the first character that cannot continue valid JSON.
    const jsonText = fc.jsonValue({ maxDepth: 4 }).map((v) => JSON.stringify(v));
    const edits = fc.array(
      fc.record({
        kind: fc.constant('replace' as const),
        at: fc.nat(),
        text: fc.constantFrom('"', ',', ':', '[', ']', '{', '}', 'x', '-', '.', '0', 'e', '\\', '\u0001', ' '),
      }),
      { maxLength: 3 },
    );
    let compared = 0;
    fc.assert(
      fc.property(jsonText, edits, (text, e) => {
        countInput('inputJsonParse');
        const mutated = applyEdits(text, e);
        let reference: { ok: boolean; position?: number };
        try {
          JSON.parse(mutated);
          reference = { ok: true };
        } catch (err) {
          const m = /position (\d+)/.exec((err as Error).message);
          reference = { ok: false, position: m ? Number(m[1]) : undefined };
        }
        const r = inputJsonParse(mutated);
        expect(r.ok).toBe(reference.ok);
        if (!r.ok && reference.position !== undefined && r.line === 1 && r.column !== undefined && reference.position < mutated.length) {
          compared++;
          expect(r.column - 1).toBe(reference.position);
        }
      }),
      { numRuns: 4000, seed: 602 },
    );
    expect(compared).toBeGreaterThan(200);
  });
});
