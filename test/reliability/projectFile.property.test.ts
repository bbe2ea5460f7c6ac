/**
 * Property tests of projectFileParse: for any text it returns a session whose model and trace are usable
 * (finite, ascending) or a one-line refusal, never an exception or a hang; and export → import returns
 * random whole sessions exactly (the trace bit for bit, ±∞ and NaN in the fit outcome included).
 */
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import type { Assignment } from '../../src/fit/assignment';
import { INPUT_LIMITS } from '../../src/io/inputLimits';
import { projectFileParse, projectFileSerialize, type ProjectFileOutcome, type ProjectSession } from '../../src/io/projectFile';
import { PARAMETER_NAMES, stateConstantsZero, type BandModel } from '../../src/physics/model';
import {
  HANG_LIMIT_MS,
  bytesTextArb,
  countInput,
  countsPrint,
  expectGoodMessage,
  mutationArb,
  randomTextArb,
  timed,
} from './reliabilityHarness';

afterAll(() => countsPrint('projectFile.property.test.ts'));

const HEADER = { appVersion: '0.1.0', savedAt: '2026-01-01T00:00:00.000Z' };

/** Parse with the hang guard; check the invariants of either outcome. */
function parseChecked(text: string): ProjectFileOutcome {
  countInput('projectFileParse');
  const run = timed(() => projectFileParse(text));
  if (!run.ok) throw new Error(`projectFileParse threw: ${String(run.error)}`);
  expect(run.ms, 'one parse call').toBeLessThan(HANG_LIMIT_MS);
  const r = run.value;
  if (!r.ok) {
    expectGoodMessage(r.message, { prefix: 'project file' });
    return r;
  }
  const { model, trace, assignments } = r.session;
  for (const side of ['lower', 'upper'] as const)
    for (const name of PARAMETER_NAMES) expect(Number.isFinite(model[side][name]), `${side}.${name}`).toBe(true);
  expect(model.spinWeights.length).toBeLessThanOrEqual(INPUT_LIMITS.maxSpinWeights);
  if (trace) {
    const { wavenumberCm1: x, absorbance: y } = trace;
    expect(x.length).toBe(y.length);
    for (let i = 0; i < x.length; i++) {
      if (!Number.isFinite(x[i]) || !Number.isFinite(y[i])) throw new Error(`non-finite trace point ${i}`);
      if (i > 0 && !(x[i] > x[i - 1])) throw new Error(`trace not ascending at ${i}`);
    }
  }
  if (assignments) {
    expect(new Set(assignments.map((a) => a.id)).size).toBe(assignments.length);
    for (const a of assignments)
      for (const q of [a.jUpper, a.kUpper, a.jLower, a.kLower])
        expect(Number.isInteger(q) && q >= 0 && q <= INPUT_LIMITS.maxQuantumJ).toBe(true);
  }
  for (const m of r.messages) expectGoodMessage(m);
  // A session read from a file can be written again (autosave does this at once).
  expect(() => JSON.stringify(r.session)).not.toThrow();
  return r;
}

const finite = fc.double({ noNaN: true, noDefaultInfinity: true }).map((v) => (Object.is(v, -0) ? 0 : v));
const text = fc.oneof(
  fc.string({ maxLength: 20 }),
  fc.string({ unit: 'binary', maxLength: 8 }),
  fc.constantFrom('<b>x</b>', 'a\nb', '"q"', ''),
);

const modelArb: fc.Arbitrary<BandModel> = fc
  .record({
    shape: fc.constantFrom('prolate' as const, 'oblate' as const, 'linear' as const),
    band: fc.constantFrom('parallel' as const, 'perpendicular' as const),
    lower: fc.array(finite, { minLength: PARAMETER_NAMES.length, maxLength: PARAMETER_NAMES.length }),
    upper: fc.array(finite, { minLength: PARAMETER_NAMES.length, maxLength: PARAMETER_NAMES.length }),
    temperatureK: fc.double({ min: 1e-3, max: 1e5, noNaN: true }),
    jMax: fc.nat(INPUT_LIMITS.maxModelJ),
    kMax: fc.nat(INPUT_LIMITS.maxModelK),
    spinWeights: fc.array(
      fc.double({ min: 0, max: 100, noNaN: true }).map((w) => (Object.is(w, -0) ? 0 : w)),
      { minLength: 1, maxLength: 6 },
    ),
  })
  .map((g) => {
    const lower = stateConstantsZero();
    const upper = stateConstantsZero();
    PARAMETER_NAMES.forEach((name, i) => {
      lower[name] = g.lower[i];
      upper[name] = g.upper[i];
    });
    return { ...g, lower, upper };
  });

/** A strictly ascending finite trace, any bit patterns of the ordinate (−0, subnormals) but finite. */
const traceArb = fc
  .tuple(
    finite,
    fc.array(fc.double({ min: 1e-9, max: 1e3, noNaN: true }), { minLength: 1, maxLength: 300 }),
    fc.array(fc.double({ noNaN: true, noDefaultInfinity: true }), { minLength: 300, maxLength: 300 }),
  )
  .map(([x0, steps, ys]) => {
    const x = new Float64Array(steps.length + 1);
    x[0] = Math.max(-1e6, Math.min(1e6, x0));
    for (let i = 1; i < x.length; i++) x[i] = x[i - 1] + steps[i - 1];
    return { wavenumberCm1: x, absorbance: Float64Array.from(x, (_, i) => ys[i]) };
  })
  .filter((t) => t.wavenumberCm1.every((v, i, a) => i === 0 || v > a[i - 1]));

const assignmentsArb: fc.Arbitrary<Assignment[]> = fc
  .array(
    fc.record({
      jUpper: fc.nat(INPUT_LIMITS.maxQuantumJ),
      kUpper: fc.nat(INPUT_LIMITS.maxQuantumJ),
      jLower: fc.nat(INPUT_LIMITS.maxQuantumJ),
      kLower: fc.nat(INPUT_LIMITS.maxQuantumJ),
      observedCm1: finite,
      uncertaintyCm1: fc.double({ min: 5e-324, max: 1e300, noNaN: true }),
      isBlended: fc.boolean(),
      isExcluded: fc.boolean(),
      note: text,
      peakId: fc.option(text, { nil: undefined }),
    }),
    { maxLength: 10 },
  )
  .map((rows) =>
    rows.map((r, i) => {
      const a: Assignment = { id: `a${i + 1}`, ...r };
      if (a.peakId === undefined) delete a.peakId;
      return a;
    }),
  );

const sessionArb: fc.Arbitrary<ProjectSession> = fc
  .record({
    model: modelArb,
    trace: fc.option(traceArb, { nil: null }),
    assignments: assignmentsArb,
    modelName: fc.string({ maxLength: 500 }),
    massAmu: fc.double({ min: 1e-3, max: 1e6, noNaN: true }),
    lorentzHwhmCm1: fc.double({ min: 0, max: 10, noNaN: true }).map((v) => (Object.is(v, -0) ? 0 : v)),
    minIntensity: fc.double({ min: 0, max: 1, noNaN: true }).map((v) => (Object.is(v, -0) ? 0 : v)),
    conditionNumber: fc.constantFrom(Infinity, -Infinity, NaN, 12.5),
    xRange: fc.option(fc.tuple(finite, finite), { nil: null }),
    theme: fc.constantFrom('light' as const, 'dark' as const),
    // Through JSON once: JSON has no −0 (ECMA-404; JSON.stringify writes 0), and a UI setting is no number to keep bit for bit.
    tableQuery: fc
      .dictionary(fc.string({ maxLength: 6 }), fc.jsonValue({ maxDepth: 3 }))
      .map((q) => JSON.parse(JSON.stringify(q)) as Record<string, unknown>),
  })
  .map((g) => ({
    model: g.model,
    floated: ['upper.origin', 'lower.B'],
    modelName: g.modelName,
    massAmu: g.massAmu,
    lorentzHwhmCm1: g.lorentzHwhmCm1,
    minIntensity: g.minIntensity,
    symmetry: { pointGroup: 'C3v', species: 'E' },
    trace: g.trace,
    traceReport: null,
    traceSource: 'file',
    importOverrides: { ordinate: 'transmittance' },
    peakMinSnr: 5,
    peakBaseline: false,
    assignments: g.assignments,
    nextAssignmentNumber: g.assignments.length + 1,
    farToleranceCm1: 0.02,
    fit: {
      outcome: {
        ok: false,
        error: { kind: 'bad-input', message: 'x', parameters: [], suggestion: 's', fixSuggested: [], conditionNumber: g.conditionNumber },
      } as unknown as ProjectSession['fit']['outcome'],
      lineIds: g.assignments.map((a) => a.id),
      finishedAt: null,
      modelBeforeAccept: null,
      isAccepted: false,
    },
    view: {
      xRange: g.xRange,
      ordinate: 'absorbance',
      hiddenRows: [],
      showSimulated: true,
      showObsMinusSim: false,
      showPeaks: true,
      theme: g.theme,
      tab: 'solve',
      loomisSeriesKey: null,
      loomisHalfWidthCm1: 0.6,
      combinationState: 'lower',
      tableQuery: g.tableQuery,
    },
  }));

/** Bit patterns of a Float64Array (so −0 and every NaN payload count). */
const bits = (a: Float64Array) => Array.from(new Uint8Array(a.buffer, a.byteOffset, a.byteLength));

describe('projectFileParse on hostile text: a usable session or one line, never an exception', () => {
  const seeds = fc.sample(sessionArb, { numRuns: 8, seed: 11 }).map((s) => projectFileSerialize(s, HEADER));
  it('random strings and random bytes', () => {
    fc.assert(
      fc.property(fc.oneof(randomTextArb('{}[]":,0123456789.eE-+ntrufalsbd \n$'), bytesTextArb()), (t) => void parseChecked(t)),
      { numRuns: 3000, seed: 501 },
    );
  });
  it('mutations of exported projects (truncation included)', () => {
    fc.assert(
      fc.property(mutationArb(seeds), (t) => void parseChecked(t)),
      { numRuns: 2000, seed: 502 },
    );
  });
  it('any JSON value in any field of a v2 session, and in a v1 document', () => {
    const fields = [
      'model',
      'floated',
      'trace',
      'assignments',
      'view',
      'fit',
      'traceReport',
      'massAmu',
      'importOverrides',
      'modelName',
      'symmetry',
    ];
    const hostile = fc.oneof(
      fc.jsonValue({ maxDepth: 4 }),
      fc.constantFrom(
        { $nonFinite: 'NaN' },
        { $nonFinite: 'Infinity' },
        { encoding: 'float64-le-base64', points: 1, wavenumberCm1: 'AAAAAAAA+H8=', absorbance: 'AAAAAAAA8D8=' },
      ),
    );
    fc.assert(
      fc.property(fc.nat(seeds.length - 1), fc.constantFrom(...fields), hostile, fc.boolean(), (i, field, value, isV1) => {
        const doc = JSON.parse(seeds[i]) as { session: Record<string, unknown> } & Record<string, unknown>;
        if (isV1) {
          parseChecked(JSON.stringify({ format: 'ladder-bench-project', version: 1, model: doc.session.model, [field]: value }));
          return;
        }
        doc.session[field] = value;
        parseChecked(JSON.stringify(doc));
      }),
      { numRuns: 3000, seed: 503 },
    );
  });
});

describe('project round trip: export → import returns the session exactly', () => {
  it('random sessions (model, trace bit for bit, hostile notes, ±∞/NaN in the fit outcome, view)', () => {
    fc.assert(
      fc.property(sessionArb, (s) => {
        const r = parseChecked(projectFileSerialize(s, HEADER));
        if (!r.ok) throw new Error(r.message);
        expect(r.messages).toEqual([]);
        const { trace, ...rest } = r.session;
        const { trace: t0, ...rest0 } = s;
        // toEqual tells NaN, ±∞ and ±0 apart as values (Object.is per leaf).
        expect(rest).toEqual(rest0);
        if (t0 === null) expect(trace).toBeNull();
        else {
          expect(bits(trace!.wavenumberCm1)).toEqual(bits(t0.wavenumberCm1));
          expect(bits(trace!.absorbance)).toEqual(bits(t0.absorbance));
        }
      }),
      { numRuns: 400, seed: 504 },
    );
  });
});
