/**
 * `npm run bench:contour` (tsx test/bench/contourBench.ts [speed|targets] [N]): figures for the
 * unresolved-band tools, one JSON line each.
 *
 * speed: a perpendicular band of 20,000+ lines (invented heavy prolate top) seen through the
 * instrument line shape onto 1e5 points (linear and transmittance routes), and a contour fit of it.
 * targets N [FIRST] [--thick]: N seeded cases of traceSpecRandom (seeds FIRST…FIRST+N−1, FIRST 0 by default) (shape, band type, B 0.05–2 cm^-1, A/C, ζ, T, L 0.9–4 cm,
 * apodization, noise; weak-absorption generator of test/fit/contourTraces.ts), each classified and
 * contour-fitted from a perturbed start (the fit on the same trace with the instrument line shape's
 * wings kept, ilsWings 'full'); prints each case, the rates against the targets and the coverage of
 * the truth by the fit's ±1σ, ±2σ and ±4σ (origin; B′ − B″ and A′(1 − ζ) − B′ or C′(1 − ζ) − B′).
 */
import { bandShapeClassify } from '../../src/analysis/bandShapeClassify';
import { contourFit } from '../../src/fit/contourFit';
import { bandLines } from '../../src/physics/bandLines';
import { instrumentSpectrum } from '../../src/physics/instrumentSpectrum';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';
import {
  classifySpecRandom,
  seededRandom,
  traceGenerate,
  traceSpecRandom,
  traceVisibleProfile,
  type TraceSpec,
} from '../fit/contourTraces';

const median = (v: number[]) => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)];

function speed(): void {
  const model: BandModel = {
    shape: 'prolate',
    band: 'perpendicular',
    lower: stateConstantsFrom({ B: 0.25, A: 5.1, DJ: 2e-7, DJK: 3e-6, DK: 8e-5 }),
    upper: stateConstantsFrom({ origin: 1250, B: 0.2493, A: 5.08, DJ: 2e-7, DJK: 3e-6, DK: 8e-5, zeta: 0.25 }),
    temperatureK: 296,
    jMax: 120,
    kMax: 33,
    spinWeights: [4, 2, 2],
  };
  const lines = bandLines(model);
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < lines.count; i++) {
    lo = Math.min(lo, lines.wavenumberCm1[i]);
    hi = Math.max(hi, lines.wavenumberCm1[i]);
  }
  const n = 100_000;
  const x = Float64Array.from({ length: n }, (_, i) => lo - 5 + ((hi - lo + 10) * i) / (n - 1));
  for (const route of ['linear', 'transmittance'] as const) {
    for (const opdCm of [1, 4]) {
      const opts = {
        opdCm,
        apodization: 'norton-beer-medium' as const,
        temperatureK: 296,
        massAmu: 142,
        opticalDepthScale: route === 'linear' ? 1e-4 : 10,
        route,
      };
      for (let i = 0; i < 3; i++) instrumentSpectrum(lines, x, opts);
      const t: number[] = [];
      const cpu: number[] = [];
      let fine = 0;
      for (let i = 0; i < 7; i++) {
        const c0 = process.cpuUsage();
        const t0 = performance.now();
        fine = instrumentSpectrum(lines, x, opts).finePoints;
        t.push(performance.now() - t0);
        cpu.push(process.cpuUsage(c0).user / 1000);
      }
      console.log(
        JSON.stringify({
          measure: 'evaluate',
          lines: lines.count,
          points: n,
          route,
          opdCm,
          finePoints: fine,
          median_ms: Number(median(t).toFixed(1)),
          // CPU time of this thread: what the wall time would be on an otherwise idle core.
          median_cpu_ms: Number(median(cpu).toFixed(1)),
        }),
      );
    }
  }
  // Contour fit of the same band: trace at L = 1 cm with 1 % noise, from a perturbed start; once
  // optically thin at the Doppler width (linear route), once with the strongest lines saturating.
  for (const depthScale of [1e-6, 1e-4]) {
    const truth = instrumentSpectrum(lines, x, {
      opdCm: 1,
      apodization: 'triangular',
      temperatureK: 296,
      massAmu: 142,
      opticalDepthScale: depthScale,
    }).opticalDepth;
    let peak = 0;
    for (let i = 0; i < n; i++) peak = Math.max(peak, truth[i]);
    const rand = seededRandom(7);
    const noisy = truth.map(
      (v) =>
        v / Math.LN10 + 0.01 * (peak / Math.LN10) * Math.sqrt(-2 * Math.log(Math.max(rand(), 1e-300))) * Math.cos(2 * Math.PI * rand()),
    );
    const start = structuredClone(model);
    start.upper.origin += 0.05;
    start.upper.zeta += 0.002;
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    const r = contourFit({
      model: start,
      wavenumberCm1: x,
      absorbance: noisy,
      fromCm1: x[0],
      toCm1: x[n - 1],
      opdCm: 1,
      apodization: 'triangular',
      massAmu: 142,
      float: ['upper.origin', 'upper.B', 'lower.B', 'upper.A', 'upper.zeta', 'scale'],
    });
    console.log(
      JSON.stringify({
        measure: 'contour-fit',
        lines: lines.count,
        points: n,
        floated: 6,
        baseline: 2,
        ms: Math.round(performance.now() - t0),
        cpu_ms: Math.round(process.cpuUsage(c0).user / 1000),
        status: r.status,
        iterations: r.iterations,
        route: r.route,
        valleyRestarts: r.valleyRestarts,
        sigmaWidening: Number(r.sigmaWidening.toFixed(2)),
      }),
    );
  }
}

/** Fraction of |z| within 1, 2 and 4 (coverage of the truth by ±1σ, ±2σ, ±4σ). */
function coverage(z: number[]): string {
  const f = (k: number) => `${z.filter((v) => Math.abs(v) <= k).length}/${z.length}`;
  return `1σ ${f(1)}, 2σ ${f(2)}, 4σ ${f(4)}`;
}

/**
 * A seeded spec's thick variant (--thick): lines optically thick at their own width, recorded through
 * the transmittance (traceGenerate's peakTau), the strongest line's centre at τ 0.3–30 (log-uniform)
 * and a mass of 20–150 amu, drawn from their own seeded stream.
 */
function thickSpec<T extends TraceSpec>(spec: T, seed: number): T {
  const r = seededRandom(seed * 31 + 5);
  return { ...spec, peakTau: Math.exp(Math.log(0.3) + r() * Math.log(100)), massAmu: 20 + 130 * r() };
}

function targets(count: number, first: number, thick: boolean): void {
  const rows: Record<string, unknown>[] = [];
  let profileOk = 0;
  // Against the profile the trace visibly shows (traceVisibleProfile, as classify is scored below),
  // and wrong readings rated medium or high.
  let visibleOk = 0;
  const wrongConfident: number[] = [];
  let bChecked = 0;
  let bOk = 0;
  let qChecked = 0;
  let qOk = 0;
  let fits = 0;
  let simOk = 0;
  let originOk = 0;
  let comboChecked = 0;
  let comboOk = 0;
  const originZ: number[] = [];
  const comboZ: number[] = [];
  for (let s = first; s < first + count; s++) {
    const spec = thick ? thickSpec(traceSpecRandom(s), s) : { ...traceSpecRandom(s), peakAbsorbance: 2e-6 };
    let c;
    try {
      c = traceGenerate(spec);
    } catch (err) {
      rows.push({ case: s, skipped: String(err) });
      continue;
    }
    const row: Record<string, unknown> = {
      case: s,
      shape: spec.shape,
      band: spec.band,
      B: Number(spec.B.toFixed(4)),
      L: Number(spec.opdCm.toFixed(2)),
      T: Math.round(spec.temperatureK),
      apodization: spec.apodization,
      expected: c.profile,
    };
    const u = c.model.shape === 'prolate' ? c.model.upper.A : c.model.upper.C;
    const qTrue = 2 * (u * (1 - c.model.upper.zeta) - c.model.upper.B);
    try {
      const r = bandShapeClassify(c.x, c.noisy, c.fromCm1, c.toCm1, { temperatureK: spec.temperatureK });
      row.profile = r.profile;
      row.confidence = r.confidence;
      row.bMethod = r.bMethod;
      if (r.profile === c.profile) profileOk++;
      const vis = traceVisibleProfile(c);
      row.visible = vis.profile;
      const okVisible = r.profile === vis.profile || (vis.ambiguous && r.confidence !== 'high' && r.profile !== 'PR');
      if (okVisible) visibleOk++;
      else if (r.confidence !== 'low') wrongConfident.push(s);
      if (r.B !== null && c.profile !== 'Q-series') {
        bChecked++;
        row.Berr = Number((r.B / spec.B - 1).toFixed(3));
        if (Math.abs(r.B / spec.B - 1) <= 0.1) bOk++;
      }
      if (c.profile === 'Q-series' && r.qSpacing !== undefined) {
        qChecked++;
        row.qErr = Number((Math.abs(r.qSpacing) / Math.abs(qTrue) - 1).toFixed(4));
        if (Math.abs(Math.abs(r.qSpacing) / Math.abs(qTrue) - 1) <= 0.03) qOk++;
      }
    } catch (err) {
      row.classifyError = String(err);
    }
    try {
      // The fit is scored against a trace whose instrument line shape keeps its wings beyond 40/L
      // (the truncated boxcar wings of the classify traces leave up to ~1 % of the peak; see
      // TraceSpec.ilsWings): the same band, noise and baseline otherwise.
      // (Thick traces keep the truncated wings: full wings are written for the weak-absorption route only.)
      const cw = thick ? c : traceGenerate({ ...spec, ilsWings: 'full' });
      const start = structuredClone(c.model);
      start.upper.origin += 0.2 / spec.opdCm;
      start.upper.B *= 1.003;
      start.lower.B *= 1.003;
      const float = ['upper.origin', 'upper.B', 'lower.B', 'scale'];
      if (c.model.shape !== 'linear' && c.model.band === 'perpendicular')
        float.push(c.model.shape === 'prolate' ? 'upper.A' : 'upper.C', 'upper.zeta');
      const t0 = performance.now();
      const r = contourFit({
        model: start,
        wavenumberCm1: c.x,
        absorbance: cw.noisy,
        fromCm1: c.fromCm1,
        toCm1: c.toCm1,
        opdCm: c.opdCm,
        apodization: c.apodization,
        massAmu: c.massAmu,
        float,
      });
      fits++;
      let s2 = 0;
      for (let i = 0; i < r.x.length; i++) s2 += (r.simulation[i] - cw.truth[i]) ** 2;
      const simRatio = Math.sqrt(s2 / r.x.length) / c.noiseSigma;
      row.simOverNoise = Number(simRatio.toFixed(3));
      if (simRatio <= 1.5) simOk++;
      const o = r.parameters['upper.origin'];
      row.originZ = Number(((o.value - c.model.upper.origin) / o.sigma).toFixed(2));
      originZ.push((o.value - c.model.upper.origin) / o.sigma);
      if (Math.abs(o.value - c.model.upper.origin) <= 4 * o.sigma) originOk++;
      const checks: [string, number][] = [["B'-B''", c.model.upper.B - c.model.lower.B]];
      if (float.includes('upper.zeta')) checks.push([`${c.model.shape === 'prolate' ? 'A' : 'C'}'(1-zeta)-B'`, qTrue / 2]);
      for (const [name, truth] of checks) {
        const v = r.combinations[name];
        if (!v) continue;
        comboChecked++;
        const z = (v.value - truth) / v.sigma;
        row[`z[${name}]`] = Number(z.toFixed(2));
        comboZ.push(z);
        if (Math.abs(z) <= 4) comboOk++;
      }
      row.fitMs = Math.round(performance.now() - t0);
      if (r.valleyRestarts) row.valleyRestarts = r.valleyRestarts;
      if (r.sigmaWidening > 1) row.sigmaWidening = Number(r.sigmaWidening.toFixed(2));
    } catch (err) {
      row.fitError = String(err);
    }
    rows.push(row);
    console.log(JSON.stringify(row));
  }
  console.log(
    JSON.stringify({
      summary: 'targets',
      cases: count,
      seeds: `${first}–${first + count - 1}`,
      profileRight: `${profileOk}/${count}`,
      profileRightVisible: `${visibleOk}/${count}`,
      wrongConfident: `${wrongConfident.length} [${wrongConfident.join(', ')}]`,
      bWithin10pc: `${bOk}/${bChecked}`,
      qSpacingWithin3pc: `${qOk}/${qChecked}`,
      simWithin1p5Noise: `${simOk}/${fits}`,
      originWithin4Sigma: `${originOk}/${fits}`,
      combinationsWithin4Sigma: `${comboOk}/${comboChecked}`,
      originCoverage: coverage(originZ),
      combinationsCoverage: coverage(comboZ),
    }),
  );
}

/** Quantiles of |v| (50 %, 90 %, max), rounded. */
function spread(v: number[]): string {
  if (!v.length) return 'none';
  const a = v.map(Math.abs).sort((p, q) => p - q);
  const q = (f: number) => a[Math.min(a.length - 1, Math.floor(f * a.length))];
  return `median ${(100 * q(0.5)).toFixed(1)} %, 90th pct ${(100 * q(0.9)).toFixed(1)} %, max ${(100 * a[a.length - 1]).toFixed(1)} %`;
}

/** B figures of one group of bands: within 10 % where given, truth inside the range, within 10 % where called determined. */
function scoreB(group: string, given: { err: number; inRange: boolean; determined: boolean }[], missing: number): Record<string, string> {
  return {
    [`bWithin10pc${group}`]: `${given.filter((g) => Math.abs(g.err) <= 0.1).length}/${given.length} given (${missing} withheld)`,
    [`bError${group}`]: spread(given.map((g) => g.err)),
    [`bInsideRange${group}`]: `${given.filter((g) => g.inRange).length}/${given.length}`,
    [`bDeterminedWithin10pc${group}`]: `${given.filter((g) => g.determined && Math.abs(g.err) <= 0.1).length}/${given.filter((g) => g.determined).length}`,
  };
}

/**
 * classify N [FIRST] [--q-envelope] [--opd] [--spin-c3v] [--thick]: the band-shape diagnosis alone (with --q-envelope, also the Q-series envelope fit;
 * with --opd, each case's L and apodization given, so Q-series also get the contour fit) on N cases of classifySpecRandom (every
 * apodization, curved baselines); per case and a summary by expected profile and by confidence.
 */
function classifyCases(count: number, first: number, withQEnvelope: boolean, withOpd: boolean, spinC3v: boolean, thick: boolean): void {
  const byProfile: Record<string, { n: number; ok: number }> = {};
  const byConfidence: Record<string, { n: number; ok: number }> = {};
  const bErr: number[] = [];
  const qErr: number[] = [];
  let bMissing = 0;
  const bGiven: { err: number; inRange: boolean; determined: boolean }[] = [];
  let qMissing = 0;
  // B of Q-branch series (visible as such) and of Π–Σ bands, scored apart (given since the 2-D envelope fit).
  const bQSeries: { err: number; inRange: boolean; determined: boolean }[] = [];
  let bQSeriesMissing = 0;
  const bPiSigma: { err: number; inRange: boolean; determined: boolean }[] = [];
  let bPiSigmaMissing = 0;
  let ms = 0;
  // Misreads split by how they were rated: medium or high is a wrong answer given with confidence,
  // low is wrong but flagged uncertain.
  const wrongConfident: number[] = [];
  const wrongFlagged: number[] = [];
  for (let s = first; s < first + count; s++) {
    const base = thick ? thickSpec(classifySpecRandom(s), s) : classifySpecRandom(s);
    // --spin-c3v: every symmetric top gets the nuclear-spin weights 4, 2, 2 of a C3v top with three
    // equivalent protons (its Q branches then alternate strong, weak, weak), told to the contour fit.
    const spec = spinC3v && base.shape !== 'linear' ? { ...base, spinWeights: [4, 2, 2] } : base;
    const c = traceGenerate(spec);
    const vis = traceVisibleProfile(c);
    const row: Record<string, unknown> = {
      case: s,
      shape: spec.shape,
      band: spec.band,
      B: Number(spec.B.toPrecision(3)),
      L: Number(spec.opdCm.toFixed(2)),
      T: Math.round(spec.temperatureK),
      apodization: spec.apodization,
      expected: vis.profile + (vis.ambiguous ? ' (faint Q series: either)' : ''),
    };
    const key = `${vis.profile}${c.profile === 'Q-series' && !vis.qResolved ? ' (Q-series unresolved)' : ''}`;
    byProfile[key] ??= { n: 0, ok: 0 };
    byProfile[key].n++;
    try {
      const t0 = performance.now();
      const r = bandShapeClassify(c.x, c.noisy, c.fromCm1, c.toCm1, {
        temperatureK: spec.temperatureK,
        qSeriesEnvelope: withQEnvelope,
        ...(withOpd ? { opdCm: spec.opdCm, apodization: spec.apodization, spinWeights: spec.spinWeights } : {}),
      });
      ms += performance.now() - t0;
      // A faint Q-branch series may be read either way, not rated high (traceVisibleProfile).
      const ok = r.profile === vis.profile || (vis.ambiguous && r.confidence !== 'high' && r.profile !== 'PR');
      row.profile = r.profile;
      row.confidence = r.confidence;
      row.bMethod = r.bMethod;
      row.ok = ok;
      if (ok) byProfile[key].ok++;
      else (r.confidence === 'low' ? wrongFlagged : wrongConfident).push(s);
      byConfidence[r.confidence] ??= { n: 0, ok: 0 };
      byConfidence[r.confidence].n++;
      if (ok) byConfidence[r.confidence].ok++;
      const given =
        r.B !== null
          ? { err: r.B / spec.B - 1, inRange: spec.B >= r.bLow! && spec.B <= r.bHigh!, determined: r.bDetermined === true }
          : null;
      if (vis.profile === 'Q-series') {
        if (given) bQSeries.push(given);
        else bQSeriesMissing++;
        if (r.qSeriesEnvelope)
          row.qEnvelope = {
            shape: r.qSeriesEnvelope.shape,
            uMinusB: Number(r.qSeriesEnvelope.uniqueMinusB.toPrecision(3)),
            bRange: [Number(r.qSeriesEnvelope.bLow.toPrecision(3)), Number(r.qSeriesEnvelope.bHigh.toPrecision(3))],
            Berr: Number((r.qSeriesEnvelope.B / spec.B - 1).toFixed(3)),
            rmsOverNoise: Number(r.qSeriesEnvelope.rmsOverNoise.toFixed(2)),
          };
        if (r.qSeriesContour)
          row.qContour = {
            Berr: Number((r.qSeriesContour.B / spec.B - 1).toFixed(3)),
            relSigma: Number((r.qSeriesContour.bSigma / r.qSeriesContour.B).toFixed(4)),
            rmsOverNoise: Number(r.qSeriesContour.rmsOverNoise.toFixed(2)),
            lag1: Number(r.qSeriesContour.residualLag1.toFixed(3)),
            status: r.qSeriesContour.status,
            determined: r.qSeriesContour.determined,
          };
      }
      if (spec.shape === 'linear' && spec.band === 'perpendicular') {
        if (given) bPiSigma.push(given);
        else bPiSigmaMissing++;
      }
      if (r.B !== null && vis.profile === 'Q-series') {
        row.Berr = Number((r.B / spec.B - 1).toFixed(3));
        row.bRange = [Number(r.bLow!.toPrecision(3)), Number(r.bHigh!.toPrecision(3))];
        row.bInRange = spec.B >= r.bLow! && spec.B <= r.bHigh!;
        row.bDetermined = r.bDetermined;
      }
      if (vis.profile !== 'Q-series') {
        if (r.B !== null) {
          row.Berr = Number((r.B / spec.B - 1).toFixed(3));
          row.bRange = [Number(r.bLow!.toPrecision(3)), Number(r.bHigh!.toPrecision(3))];
          row.bInRange = spec.B >= r.bLow! && spec.B <= r.bHigh!;
          row.bDetermined = r.bDetermined;
          bErr.push(r.B / spec.B - 1);
          bGiven.push({ err: r.B / spec.B - 1, inRange: spec.B >= r.bLow! && spec.B <= r.bHigh!, determined: r.bDetermined === true });
        } else bMissing++;
      } else if (r.qSpacing !== undefined) {
        row.qErr = Number((Math.abs(r.qSpacing) / Math.abs(vis.qSpacing) - 1).toFixed(4));
        qErr.push(Math.abs(r.qSpacing) / Math.abs(vis.qSpacing) - 1);
      } else qMissing++;
    } catch (err) {
      row.classifyError = String(err);
    }
    console.log(JSON.stringify(row));
  }
  const rate = (m: Record<string, { n: number; ok: number }>) =>
    Object.fromEntries(Object.entries(m).map(([k, v]) => [k, `${v.ok}/${v.n}`]));
  const okAll = Object.values(byProfile).reduce((a, v) => a + v.ok, 0);
  console.log(
    JSON.stringify({
      summary: 'classify',
      cases: count,
      profileRight: `${okAll}/${count}`,
      wrongConfident: `${wrongConfident.length} [${wrongConfident.join(', ')}]`,
      wrongFlaggedLow: `${wrongFlagged.length} [${wrongFlagged.join(', ')}]`,
      byExpectedProfile: rate(byProfile),
      byConfidence: rate(byConfidence),
      bWithin10pc: `${bErr.filter((e) => Math.abs(e) <= 0.1).length}/${bErr.length} given (${bMissing} withheld)`,
      bError: spread(bErr),
      bInsideRange: `${bGiven.filter((g) => g.inRange).length}/${bGiven.length}`,
      bDeterminedWithin10pc: `${bGiven.filter((g) => g.determined && Math.abs(g.err) <= 0.1).length}/${bGiven.filter((g) => g.determined).length}`,
      qSpacingWithin3pc: `${qErr.filter((e) => Math.abs(e) <= 0.03).length}/${qErr.length} given (${qMissing} withheld)`,
      ...scoreB('QSeries', bQSeries, bQSeriesMissing),
      ...scoreB('PiSigma', bPiSigma, bPiSigmaMissing),
      qSpacingError: spread(qErr),
      classifyMsPerCase: Number((ms / count).toFixed(1)),
    }),
  );
}

const [what = 'speed', nArg, firstArg] = process.argv.slice(2);
if (what === 'speed') speed();
else if (what === 'classify')
  classifyCases(
    Number(nArg ?? 60),
    Number(firstArg ?? 0),
    process.argv.includes('--q-envelope'),
    process.argv.includes('--opd'),
    process.argv.includes('--spin-c3v'),
    process.argv.includes('--thick'),
  );
else targets(Number(nArg ?? 30), Number(firstArg ?? 0), process.argv.includes('--thick'));
