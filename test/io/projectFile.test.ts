import fc from 'fast-check';
import { describe, expect, it, vi } from 'vitest';
import {
  base64ToFloat64,
  float64ToBase64,
  PROJECT_FORMAT,
  PROJECT_PART_NAMES,
  PROJECT_VERSION,
  projectFileParse,
  projectFileSerialize,
  projectPartSerialize,
  type ProjectSession,
} from '../../src/io/projectFile';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';

const model: BandModel = {
  shape: 'prolate',
  band: 'perpendicular',
  lower: stateConstantsFrom({ B: 0.29135, A: 3.4127, DJ: 3e-7 }),
  upper: stateConstantsFrom({ origin: 1148.75, B: 0.29155, A: 3.413, zeta: 0.277 }),
  temperatureK: 296,
  jMax: 60,
  kMax: 18,
  spinWeights: [4, 2, 2],
};

function session(): ProjectSession {
  const n = 1000;
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    x[i] = 1033 + i * (15798 / 2 ** 23); // an FTIR-like grid step (not representable exactly)
    y[i] = Math.sin(i / 7) ** 2 / 3 + 1e-17 * i;
  }
  return {
    model,
    floated: ['upper.origin', 'lower.B'],
    modelName: 'LB-7 <b>test</b> "quoted"',
    massAmu: 64,
    lorentzHwhmCm1: 0.002,
    minIntensity: 0.002,
    symmetry: { pointGroup: 'C3v', species: 'E' },
    trace: { wavenumberCm1: x, absorbance: y },
    traceReport: {
      fileName: 'trace.csv',
      format: 'delimited',
      xUnit: 'cm-1',
      ordinate: 'transmittance',
      points: n,
      rangeCm1: [x[0], x[n - 1]],
      skipped: { count: 1, lines: [3] },
      wasDescending: false,
      messages: ['1 row skipped'],
      delimiter: ',',
    },
    traceSource: 'file',
    importOverrides: { ordinate: 'transmittance' },
    peakMinSnr: 5,
    peakBaseline: false,
    assignments: [
      {
        id: 'a1',
        jUpper: 5,
        kUpper: 2,
        jLower: 4,
        kLower: 1,
        observedCm1: 1150.123456789,
        uncertaintyCm1: 0.001,
        isBlended: false,
        isExcluded: false,
        note: 'note, with "quotes"\nand a newline',
        peakId: 'pk1150.12346',
      },
      {
        id: 'a2',
        jUpper: 6,
        kUpper: 2,
        jLower: 5,
        kLower: 1,
        observedCm1: 1150.7,
        uncertaintyCm1: 0.002,
        isBlended: true,
        isExcluded: true,
        note: '',
      },
    ],
    nextAssignmentNumber: 3,
    farToleranceCm1: 0.02,
    fit: {
      outcome: {
        ok: true,
        result: {
          parameters: { 'upper.origin': { value: 1148.7501, sigma: 1e-5, fixed: false } },
          floated: ['upper.origin'],
          covariance: [[1e-10]],
          correlation: [[1]],
          nLines: 2,
          nParameters: 1,
          degreesOfFreedom: 1,
          covarianceScale: 1.4884,
          chi2: 1.5,
          rmsCm1: 1e-3,
          sigmaW: 1.22,
          isExactlyDetermined: false,
          lines: [],
          outliers: [],
          iterations: 3,
          convergence: 'chi2-change',
          convergenceMessage: 'converged',
          conditionNumber: Infinity,
          model,
          warnings: [],
        },
      },
      lineIds: ['a1', 'a2'],
      finishedAt: '2024-01-01T00:00:00.000Z',
      modelBeforeAccept: null,
      isAccepted: false,
    },
    view: {
      xRange: [1100, 1101.5],
      ordinate: 'absorbance',
      hiddenRows: ['r:9'],
      showSimulated: true,
      showObsMinusSim: false,
      showPeaks: true,
      theme: 'dark',
      tab: 'solve',
      loomisSeriesKey: 'r:2:R',
      loomisHalfWidthCm1: 0.6,
      combinationState: 'upper',
      tableQuery: { sortKey: 'omc', sortDescending: true },
    },
  };
}

const header = { appVersion: '0.1.0', savedAt: '2024-01-02T03:04:05.000Z' };

describe('float64ToBase64 / base64ToFloat64', () => {
  it('encodes as RFC 4648 base64 of little-endian doubles', () => {
    // 1.0 is 0x3FF0000000000000 (IEEE 754 binary64); little-endian bytes 00 00 00 00 00 00 F0 3F.
    // RFC 4648 §4 alphabet: those 8 bytes encode as "AAAAAAAA8D8=".
    expect(float64ToBase64(Float64Array.of(1))).toBe('AAAAAAAA8D8=');
    expect(float64ToBase64(new Float64Array(0))).toBe('');
  });
  it('round-trips every bit pattern, including −0, ±∞ and NaN (property test, seeded)', () => {
    fc.assert(
      fc.property(fc.float64Array({ maxLength: 40 }), (arr) => {
        const back = base64ToFloat64(float64ToBase64(arr), 'x');
        expect(back.length).toBe(arr.length);
        arr.forEach((v, i) => expect(Object.is(back[i], v)).toBe(true));
      }),
      { seed: 42, numRuns: 200 },
    );
  });
  it('refuses text that is not base64 of whole doubles, naming the field', () => {
    expect(() => base64ToFloat64('AAA', 'session.trace.absorbance')).toThrow(/session.trace.absorbance/);
    expect(() => base64ToFloat64('AAAA', 'f')).toThrow(/8-byte/);
    expect(() => base64ToFloat64('AAAAAAAA8D*=', 'f')).toThrow(/not base64/);
  });
});

describe('projectFileSerialize / projectFileParse', () => {
  it('round-trips a whole session to the same values, the trace bit for bit', () => {
    const s = session();
    const text = projectFileSerialize(s, header);
    const r = projectFileParse(text);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.messages).toEqual([]);
    expect(r.version).toBe(PROJECT_VERSION);
    const { trace, ...rest } = r.session;
    const { trace: t0, ...rest0 } = s;
    expect(rest).toEqual(rest0);
    expect(Array.from(trace!.wavenumberCm1)).toEqual(Array.from(t0!.wavenumberCm1));
    expect(Array.from(trace!.absorbance)).toEqual(Array.from(t0!.absorbance));
    // ∞ survives (JSON has no literal for it).
    expect((r.session.fit!.outcome as { result: { conditionNumber: number } }).result.conditionNumber).toBe(Infinity);
  });

  it('writes the format name and version at the top', () => {
    const doc = JSON.parse(projectFileSerialize(session(), header));
    expect(doc.format).toBe(PROJECT_FORMAT);
    expect(doc.version).toBe(2);
    expect(doc.appVersion).toBe('0.1.0');
  });

  it('refuses a newer version with advice, and non-project JSON naming the field', () => {
    const doc = JSON.parse(projectFileSerialize(session(), header));
    doc.version = 3;
    const r = projectFileParse(JSON.stringify(doc));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/version 3 was written by a newer Ladder Bench.*reads versions up to 2/);
    const m = projectFileParse('{"shape":"prolate"}');
    expect(m.ok).toBe(false);
    if (!m.ok) expect(m.message).toMatch(/'format' is missing/);
    const bad = projectFileParse('{not json');
    expect(bad.ok).toBe(false);
  });

  it('refuses a session without a usable model, naming the field', () => {
    const doc = JSON.parse(projectFileSerialize(session(), header));
    doc.session.model.jMax = -1;
    const r = projectFileParse(JSON.stringify(doc));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/session\.model.*jMax/);
  });

  it('reports missing and unknown fields and keeps the rest', () => {
    const doc = JSON.parse(projectFileSerialize(session(), header));
    delete doc.session.view;
    doc.session.colour = 'blue';
    doc.extra = 1;
    doc.session.assignments[0].uncertaintyCm1 = -2;
    const r = projectFileParse(JSON.stringify(doc));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.session.view).toBeUndefined();
    // One bad row costs that row only; the valid rows stay (no lost work).
    expect(r.session.assignments?.map((a) => a.id)).toEqual(doc.session.assignments.slice(1).map((a: { id: string }) => a.id));
    expect(r.session.floated).toEqual(['upper.origin', 'lower.B']);
    expect(r.messages.join('\n')).toMatch(/'session.view' is missing/);
    expect(r.messages.join('\n')).toMatch(/unknown field 'session.colour'/);
    expect(r.messages.join('\n')).toMatch(/unknown top-level field 'extra'/);
    expect(r.messages.join('\n')).toMatch(/assignments were not loaded: session.assignments\[0\] \(uncertaintyCm1/);
  });

  it('drops a trace whose axis does not increase, saying why', () => {
    const s = session();
    s.trace!.wavenumberCm1[5] = s.trace!.wavenumberCm1[4];
    const r = projectFileParse(projectFileSerialize(s, header));
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.session.trace).toBeUndefined();
      expect(r.messages.join(' ')).toMatch(/wavenumbers must increase; point 5/);
    }
  });

  it('migrates a version-1 file (model-file constants, plain-number trace, J_up/obs rows)', () => {
    const v1 = {
      format: PROJECT_FORMAT,
      version: 1,
      model: {
        name: 'old',
        shape: 'prolate',
        band: 'parallel',
        lower: { B: 0.3, A: { value: 5, fixed: true } },
        upper: { origin: 900, B: 0.299, A: 4.9 },
        temperature: 250,
        jMax: 30,
        kMax: 5,
        mass: 40,
      },
      trace: { wavenumberCm1: [899, 900, 901], absorbance: [0.1, 0.5, 0.1] },
      assignments: [{ J_up: 3, K_up: 1, J_lo: 2, K_lo: 1, obs: 901.2, sigma: 0.002, note: 'x' }],
      view: { xRange: [899, 901] },
    };
    const r = projectFileParse(JSON.stringify(v1));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.version).toBe(1);
    expect(r.session.model.upper.origin).toBe(900);
    expect(r.session.model.temperatureK).toBe(250);
    expect(r.session.floated).toEqual(['lower.B', 'upper.origin', 'upper.B', 'upper.A']);
    expect(r.session.massAmu).toBe(40);
    expect(Array.from(r.session.trace!.absorbance)).toEqual([0.1, 0.5, 0.1]);
    expect(r.session.assignments).toEqual([
      {
        id: 'a1',
        jUpper: 3,
        kUpper: 1,
        jLower: 2,
        kLower: 1,
        observedCm1: 901.2,
        uncertaintyCm1: 0.002,
        isBlended: false,
        isExcluded: false,
        note: 'x',
      },
    ]);
    expect(r.messages.join(' ')).toMatch(/migrated from project version 1/);
  });
});

describe('float64ToBase64 against an independent encoder', () => {
  it('matches Node Buffer base64 for every padding case (1, 2 and 3 doubles) and for a large array', () => {
    // Ref: Node.js Buffer 'base64' encoding (RFC 4648 §4 alphabet with '=' padding), an encoder independent of ours.
    const cases = [Float64Array.of(1.5), Float64Array.of(-0, Math.PI), Float64Array.of(NaN, Infinity, 1e-310)];
    const big = new Float64Array(100_003);
    for (let i = 0; i < big.length; i++) big[i] = 1000 + i * 0.0019 + Math.sin(i) * 1e-3;
    for (const values of [...cases, big]) {
      const bytes = new Uint8Array(values.length * 8);
      const view = new DataView(bytes.buffer);
      values.forEach((v, i) => view.setFloat64(i * 8, v, true));
      expect(float64ToBase64(values)).toBe(Buffer.from(bytes).toString('base64'));
    }
  });

  it('gives the same text without a TextDecoder (the String.fromCharCode path)', async () => {
    const values = new Float64Array(70_001).map((_, i) => i / 7 - 3);
    const withDecoder = float64ToBase64(values);
    vi.stubGlobal('TextDecoder', undefined);
    vi.resetModules();
    try {
      const bare = await import('../../src/io/projectFile');
      expect(bare.float64ToBase64(values)).toBe(withDecoder);
      expect(bare.float64ToBase64(Float64Array.of(1))).toBe('AAAAAAAA8D8=');
    } finally {
      vi.unstubAllGlobals();
      vi.resetModules();
    }
  });
});

describe('project file with fields saved apart (the autosave layout)', () => {
  it('reads a file without assignments and fit, plus those fields as parts, to the same session as the whole file', () => {
    const s = session();
    const whole = projectFileParse(projectFileSerialize(s, header));
    const head = projectFileSerialize(s, header, PROJECT_PART_NAMES);
    expect(JSON.parse(head).session).not.toHaveProperty('assignments');
    expect(JSON.parse(head).session).not.toHaveProperty('fit');
    const split = projectFileParse(head, {
      assignments: projectPartSerialize('assignments', s.assignments),
      fit: projectPartSerialize('fit', s.fit),
    });
    expect(split).toEqual(whole);
    // The fit's condition number of ∞ survives in its part as in the file.
    if (split.ok && split.session.fit?.outcome?.ok) expect(split.session.fit.outcome.result.conditionNumber).toBe(Infinity);
  });

  it('writes exactly the same text as before when nothing is omitted', () => {
    const s = session();
    const text = projectFileSerialize(s, header);
    const doc = JSON.parse(text);
    expect(Object.keys(doc.session)).toEqual(['model', ...Object.keys(s).filter((k) => k !== 'model' && k !== 'trace'), 'trace']);
    expect(projectFileSerialize(s, header, [])).toBe(text);
  });

  it("keeps the file's own field over a part (a session written before the split)", () => {
    const s = session();
    const stale = [{ ...s.assignments[0], id: 'old', note: 'stale' }];
    const r = projectFileParse(projectFileSerialize(s, header), { assignments: projectPartSerialize('assignments', stale) });
    expect(r.ok && r.session.assignments?.map((a) => a.id)).toEqual(['a1', 'a2']);
  });

  it('checks a part row by row like the file: a bad row is dropped and named, the others kept', () => {
    const s = session();
    const rows = [{ ...s.assignments[0], uncertaintyCm1: -1 }, s.assignments[1]];
    const r = projectFileParse(projectFileSerialize(s, header, ['assignments']), { assignments: JSON.stringify(rows) });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.session.assignments?.map((a) => a.id)).toEqual(['a2']);
    expect(r.messages.join('\n')).toMatch(/1 of 2 assignments were not loaded: session.assignments\[0\] \(uncertaintyCm1/);
  });

  it('says which part could not be read and loads the rest with that field at its default', () => {
    const s = session();
    const r = projectFileParse(projectFileSerialize(s, header, PROJECT_PART_NAMES), {
      assignments: '[{"id": ',
      fit: projectPartSerialize('fit', s.fit),
    });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.session.assignments).toBeUndefined();
    expect(r.session.fit?.lineIds).toEqual(['a1', 'a2']);
    expect(r.messages.join('\n')).toMatch(/separately saved field 'session.assignments' could not be read \(not valid JSON/);
  });
});
