/**
 * `npm run bench:independent -- DIR [--contour]`: `classify` (and with --contour `contour`) on the
 * traces of a folder written by test/fixtures/independent_traces/make_traces.py (its cases.json
 * holds the truth; `--random N FIRST DIR` writes seeded random bands there). The traces are read as
 * the command line reads them (cliLoadTrace) and classified with the case's temperature; prints one
 * JSON line per case and a summary against the targets: profile right, B (lower state) within 10 %,
 * Q-branch spacing within 3 %; wrong readings split by confidence (rated low = flagged).
 * With --contour, each case is also contour-fitted from a start off the truth (origin +0.3 cm^-1 for
 * the coarse cases, B values ×1.01, A′(C′) ×0.99, ζ +0.02; the lower state's unique constant and the
 * distortion constants held at the truth): the fit's simulation against the noise-free truth is not
 * known here, so its rms over the noise the case was made with, and the origin and combinations
 * against the truth in units of their σ, are reported.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { bandShapeClassify } from '../../src/analysis/bandShapeClassify';
import { cliLoadTrace } from '../../src/cli/cliTrace';
import { contourDefaultFloat, contourFit } from '../../src/fit/contourFit';
import { noiseSigmaEstimate } from '../../src/analysis/noiseSigmaEstimate';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';
import { independentJMax, type IndependentCase } from '../cli/independentCase';

const quietIo = {
  stdout: () => undefined,
  stderr: () => undefined,
  readFile: (p: string) => readFileSync(p, 'utf8'),
  readBytes: (p: string) => new Uint8Array(readFileSync(p)),
};

/** The model of a case (its truth), with J and K ranges to where its lines fade. */
export function independentModel(c: IndependentCase): BandModel {
  const jMax = independentJMax(c);
  return {
    shape: c.shape,
    band: c.band,
    lower: stateConstantsFrom({ ...c.lower }),
    upper: stateConstantsFrom({ ...c.upper }),
    temperatureK: c.temperature,
    jMax,
    kMax: c.shape === 'linear' ? 0 : jMax,
    spinWeights: c.spinWeights ?? [1],
  };
}

function main(): void {
  const dir = process.argv[2];
  if (!dir) throw new Error('usage: independentBench DIR [--contour]');
  const withContour = process.argv.includes('--contour');
  const cases = JSON.parse(readFileSync(join(dir, 'cases.json'), 'utf8')) as IndependentCase[];
  let profileOk = 0;
  let bWithin = 0;
  let bCounted = 0;
  let qWithin = 0;
  let qCounted = 0;
  const wrongConfident: string[] = [];
  const wrongFlagged: string[] = [];
  for (const c of cases) {
    const trace = cliLoadTrace(join(dir, `${c.name}.csv`), quietIo);
    const row: Record<string, unknown> = {
      name: c.name,
      shape: c.shape,
      band: c.band,
      B: Number(c.lower.B.toPrecision(3)),
      dBrel: Number(((c.upper.B / c.lower.B - 1) * 100).toFixed(2)),
      L: Number(c.opd.toFixed(2)),
      thick: c.peakTau >= 0.5,
      expected: c.expect.profile,
    };
    try {
      const r = bandShapeClassify(trace.wavenumberCm1, trace.absorbance, c.from, c.to, { temperatureK: c.temperature });
      const ok = r.profile === c.expect.profile || (c.expect.profile === 'either' && r.profile !== 'PR' && r.confidence !== 'high');
      if (ok) profileOk++;
      else (r.confidence === 'low' ? wrongFlagged : wrongConfident).push(c.name);
      Object.assign(row, { profile: r.profile, type: r.type, confidence: r.confidence, bMethod: r.bMethod, ok });
      if (c.expect.profile !== 'Q-series') {
        bCounted++;
        if (r.B !== null) {
          const err = r.B / c.lower.B - 1;
          row.Berr = Number(err.toFixed(3));
          row.bInRange = c.lower.B >= (r.bLow ?? NaN) && c.lower.B <= (r.bHigh ?? NaN);
          row.bDetermined = r.bDetermined;
          if (Math.abs(err) <= 0.1) bWithin++;
        }
      }
      if (c.expect.profile === 'Q-series' && r.profile === 'Q-series') {
        qCounted++;
        // 2[A′(1 − ζ) − B′] (C′ for an oblate top).
        const u = c.upper.A ?? c.upper.C;
        const err = Math.abs(r.qSpacing ?? NaN) / Math.abs(2 * (u * (1 - c.upper.zeta) - c.upper.B)) - 1;
        row.qErr = Number(err.toFixed(4));
        if (Math.abs(err) <= 0.03) qWithin++;
      }
    } catch (e) {
      row.error = e instanceof Error ? e.message : String(e);
      wrongFlagged.push(c.name);
    }
    if (withContour) Object.assign(row, contourRow(c, trace.wavenumberCm1, trace.absorbance));
    console.log(JSON.stringify(row));
  }
  console.log(
    JSON.stringify({
      summary: dir,
      cases: cases.length,
      profileRight: profileOk,
      wrongConfident,
      wrongFlagged,
      bWithin10pct: `${bWithin} of ${bCounted}`,
      qWithin3pct: `${qWithin} of ${qCounted}`,
    }),
  );
}

/** Contour fit of a case from a start off the truth; the figures the targets name. */
function contourRow(c: IndependentCase, x: Float64Array, y: Float64Array): Record<string, unknown> {
  const truth = independentModel(c);
  const start: BandModel = structuredClone(truth);
  // LB_START_OFF scales the offsets (1 by default; 0 starts at the truth).
  const k = Number(process.env.LB_START_OFF ?? 1);
  start.upper.origin += (0.3 / c.opd) * k;
  start.upper.B *= 1 + 0.01 * k;
  start.lower.B *= 1 + 0.01 * k;
  if (c.shape === 'prolate') start.upper.A *= 1 - 0.01 * k;
  if (c.shape === 'oblate') start.upper.C *= 1 - 0.01 * k;
  if (c.band === 'perpendicular' && c.shape !== 'linear') start.upper.zeta += 0.02 * k;
  try {
    // As the contour command runs it: the default floated constants, the scale, a linear baseline and
    // the noise from the whole trace.
    const f = contourFit({
      model: start,
      wavenumberCm1: x,
      absorbance: y,
      fromCm1: c.from,
      toCm1: c.to,
      opdCm: c.opd,
      apodization: c.apodization,
      massAmu: c.mass,
      float: [...contourDefaultFloat(start), 'scale'],
      baselineDegree: 1,
      noiseSigma: noiseSigmaEstimate(x, y),
    });
    const p = f.parameters;
    const dev = (key: string, truthValue: number) => {
      const q = p[key];
      return q && q.sigma > 0 ? Number(((q.value - truthValue) / q.sigma).toFixed(2)) : null;
    };
    return {
      contourStatus: f.status,
      rmsOverNoise: Number((f.rms / c.noiseSigmaAbsorbance).toFixed(2)),
      originSigmas: dev('upper.origin', c.upper.origin),
      bUpperSigmas: dev('upper.B', c.upper.B),
      bLowerSigmas: dev('lower.B', c.lower.B),
      warnings: f.warnings.length,
      ...(process.argv.includes('--verbose')
        ? {
            fitted: Object.fromEntries(
              Object.entries(p)
                .filter(([, q]) => !q.fixed)
                .map(([k, q]) => [k, `${q.value.toPrecision(8)} ± ${q.sigma.toPrecision(2)}`]),
            ),
            combinations: Object.fromEntries(
              Object.entries(f.combinations).map(([k, q]) => [k, `${q.value.toPrecision(7)} ± ${q.sigma.toPrecision(2)}`]),
            ),
            warningText: f.warnings,
            route: f.route,
          }
        : {}),
    };
  } catch (e) {
    return { contourError: e instanceof Error ? e.message : String(e) };
  }
}

if (process.argv[1]?.endsWith('independentBench.ts')) main();
