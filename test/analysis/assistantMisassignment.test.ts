import { describe, expect, it } from 'vitest';
import { assistantMisassignments, assistantRobustScale } from '../../src/analysis/assistantMisassignment';
import { assistantPeakContext } from '../../src/analysis/assistantPeakContext';
import { assistantLinesFromAssignments } from '../../src/analysis/assistantReview';
import type { PeakList } from '../../src/analysis/peaksFind';
import type { Assignment } from '../../src/fit/assignment';
import { bandLines } from '../../src/physics/bandLines';
import { stateConstantsFrom, type BandModel } from '../../src/physics/model';
import { randomNormal, randomSeeded } from './syntheticTrace';

/** Invented prolate top, perpendicular band, small enough to list every line as a peak. */
const MODEL: BandModel = {
  shape: 'prolate',
  band: 'perpendicular',
  lower: stateConstantsFrom({ B: 0.61, A: 4.2, DJ: 1e-6 }),
  upper: stateConstantsFrom({ origin: 1234.5, B: 0.605, A: 4.15, DJ: 1e-6, zeta: 0.12 }),
  temperatureK: 296,
  jMax: 20,
  kMax: 3,
  spinWeights: [1],
};
const FLOATABLE = ['upper.origin', 'upper.B', 'lower.B', 'upper.A', 'upper.zeta', 'upper.DJ', 'lower.DJ'];

/**
 * Every line of MODEL stronger than 5 % as a peak (FWHM 0.01 cm^-1, centre σ 2e-4 cm^-1) with
 * seeded position noise of that σ, and the matching assignments; lines closer than 0.05 cm^-1
 * to another are left out so each peak is one line.
 */
function cleanSet(): { peaks: PeakList; assignments: Assignment[] } {
  const lines = bandLines(MODEL, { minIntensity: 0.05 });
  const order = Array.from({ length: lines.count }, (_, i) => i).sort((a, b) => lines.wavenumberCm1[a] - lines.wavenumberCm1[b]);
  const keep = order.filter((i, s) => {
    const x = lines.wavenumberCm1[i];
    const prev = s > 0 ? lines.wavenumberCm1[order[s - 1]] : -Infinity;
    const next = s + 1 < order.length ? lines.wavenumberCm1[order[s + 1]] : Infinity;
    return x - prev > 0.05 && next - x > 0.05;
  });
  const rand = randomSeeded(5);
  const sigma = 2e-4;
  const x = Float64Array.from(keep, (i) => lines.wavenumberCm1[i] + sigma * randomNormal(rand));
  const n = keep.length;
  const peaks: PeakList = {
    count: n,
    wavenumberCm1: x,
    height: Float64Array.from(keep, (i) => lines.intensity[i]),
    fwhmCm1: new Float64Array(n).fill(0.01),
    snr: Float64Array.from(keep, (i) => lines.intensity[i] * 500),
    prominence: Float64Array.from(keep, (i) => lines.intensity[i]),
    isBlend: new Uint8Array(n),
    centreSigmaCm1: new Float64Array(n).fill(sigma),
    noiseSigma: 0.002,
  };
  const assignments = keep.map((i, s) => ({
    id: `L${s}`,
    jUpper: lines.jUpper[i],
    kUpper: lines.kUpper[i],
    jLower: lines.jLower[i],
    kLower: lines.kLower[i],
    observedCm1: x[s],
    uncertaintyCm1: sigma,
    isBlended: false,
    isExcluded: false,
    note: '',
  }));
  return { peaks, assignments };
}

describe('assistantRobustScale', () => {
  it('is 1.4826 × the median |r| and ignores a few wild values', () => {
    // MAD consistency factor 1/Φ⁻¹(3/4) = 1.4826 (Hampel 1974); median of |r| = 2 here.
    expect(assistantRobustScale([1, -2, 2, 3, -1000])).toBeCloseTo(1.4826 * 2, 12);
    expect(assistantRobustScale([])).toBe(1);
    expect(assistantRobustScale([0, 0, 0])).toBe(0.5);
  });
});

describe('assistantMisassignments', () => {
  const { peaks, assignments } = cleanSet();
  const context = assistantPeakContext(peaks);

  it('finds nothing (or almost nothing) in a correct set', () => {
    const lines = assistantLinesFromAssignments(assignments, MODEL, peaks, context, 'accepted');
    const hunt = assistantMisassignments({ model: MODEL, floatable: FLOATABLE, lines, peaks });
    expect(lines.length).toBeGreaterThan(60);
    // Gaussian position noise: |z| > 3 for 0.27 % of lines (normal tail); allow 2 of ~100.
    expect(hunt.suspects.length).toBeLessThanOrEqual(2);
    expect(hunt.fit).not.toBeNull();
  });

  it('finds a deliberately swapped pair and names each one as the other’s alternative', () => {
    const swapped = assignments.map((a) => ({ ...a }));
    // Swap the quantum numbers of two strong lines of different sub-bands.
    const a = swapped.findIndex((l) => l.kLower === 1 && l.kUpper === 2 && l.jUpper === l.jLower + 1 && l.jLower === 6);
    const b = swapped.findIndex((l) => l.kLower === 0 && l.kUpper === 1 && l.jUpper === l.jLower - 1 && l.jLower === 7);
    expect(a).toBeGreaterThanOrEqual(0);
    expect(b).toBeGreaterThanOrEqual(0);
    const qa = { jUpper: swapped[a].jUpper, kUpper: swapped[a].kUpper, jLower: swapped[a].jLower, kLower: swapped[a].kLower };
    const qb = { jUpper: swapped[b].jUpper, kUpper: swapped[b].kUpper, jLower: swapped[b].jLower, kLower: swapped[b].kLower };
    Object.assign(swapped[a], qb);
    Object.assign(swapped[b], qa);
    const lines = assistantLinesFromAssignments(swapped, MODEL, peaks, context, 'accepted');
    const hunt = assistantMisassignments({ model: MODEL, floatable: FLOATABLE, lines, peaks });
    const ids = hunt.suspects.map((s) => s.id);
    expect(ids.slice(0, 2).sort()).toEqual([swapped[a].id, swapped[b].id].sort());
    const sa = hunt.suspects.find((s) => s.id === swapped[a].id)!;
    const sb = hunt.suspects.find((s) => s.id === swapped[b].id)!;
    expect(sa.alternativeRungs[0]).toMatchObject({ ...qa, isAssignedElsewhere: true });
    expect(sb.alternativeRungs[0]).toMatchObject({ ...qb, isAssignedElsewhere: true });
    expect(sa.label).toBe('rP0(7)');
    expect(sb.label).toBe('rR1(6)');
    expect(Math.abs(sa.normalisedResidual)).toBeGreaterThan(100);
    expect(sa.reasons.join(' ')).toMatch(/obs − calc = .* from the fit without the outliers/);
    // The clean fit leaves them out, so the other lines fit as before: σ_w near 1 (stated σ = true σ).
    expect(hunt.scale).toBeLessThan(1.5);
    // Their own rungs are predicted at the other's peak: offered as alternative peaks.
    expect(sa.alternativePeaks.map((p) => p.peakIndex)).toContain(lines[b].peakIndex);
  });

  it('flags a line shifted by a few σ through its combination differences too', () => {
    const shifted = assignments.map((a) => ({ ...a }));
    const r = shifted.findIndex((l) => l.kLower === 0 && l.jUpper === l.jLower + 1 && l.jLower === 5);
    shifted[r].observedCm1 += 0.004; // 20σ: far outside the 3σ of both tests
    const lines = assistantLinesFromAssignments(shifted, MODEL, peaks, context, 'accepted');
    const hunt = assistantMisassignments({ model: MODEL, floatable: FLOATABLE, lines, peaks });
    const s = hunt.suspects.find((x) => x.id === shifted[r].id)!;
    expect(s).toBeDefined();
    expect(s.obsMinusCalcCm1).toBeCloseTo(0.004, 3);
    expect(s.reasons.some((t) => /combination difference/.test(t))).toBe(true);
    expect(s.isResidualOnly).toBe(false);
  });

  it('marks a Q line moved a sixth of a width (many σ) as failing the residual test alone, with the width it used', () => {
    // Q lines have no P/R partner in a combination difference, so only obs − calc can catch them.
    const moved = assignments.map((a) => ({ ...a }));
    const r = moved.findIndex((l) => l.kLower === 1 && l.jUpper === l.jLower && l.jLower === 6);
    expect(r).toBeGreaterThanOrEqual(0);
    moved[r].observedCm1 += 0.0016; // 8σ of the stated 2e-4, 0.16 of the 0.01 cm^-1 FWHM
    const lines = assistantLinesFromAssignments(moved, MODEL, peaks, context, 'proposed');
    const hunt = assistantMisassignments({ model: MODEL, floatable: FLOATABLE, lines, peaks });
    const s = hunt.suspects.find((x) => x.id === moved[r].id)!;
    expect(s).toBeDefined();
    expect(s.isResidualOnly).toBe(true);
    expect(s.lineWidthCm1).toBeCloseTo(0.01, 12);
    expect(Math.abs(s.obsMinusCalcCm1)).toBeGreaterThan(0.001);
    expect(Math.abs(s.obsMinusCalcCm1)).toBeLessThan(0.0025);
  });

  it('distrusts a proposal measured 0.8 line widths off a well-predicted position even when its stated σ covers it', () => {
    // A peak centre that far from the line is not the line's (half a width is the resolution
    // limit, common practice); its inflated uncertainty (a blend's) must not hide that.
    const moved = assignments.map((a) => ({ ...a }));
    const r = moved.findIndex((l) => l.kLower === 1 && l.jUpper === l.jLower + 1 && l.jLower === 8);
    moved[r].observedCm1 += 0.008; // 0.8 × the 0.01 cm^-1 FWHM
    moved[r].uncertaintyCm1 = 0.01;
    const lines = assistantLinesFromAssignments(moved, MODEL, peaks, context, 'proposed');
    lines[r].uncertaintyCm1 = 0.01;
    const hunt = assistantMisassignments({ model: MODEL, floatable: FLOATABLE, lines, peaks });
    const s = hunt.suspects.find((x) => x.id === moved[r].id)!;
    expect(s).toBeDefined();
    expect(s.reasons.join(' ')).toMatch(/0\.8\d line widths while the fit places the line/);
    expect(s.isResidualOnly).toBe(false);
    // The same line given by hand (accepted) is the user's call: not distrusted for this reason.
    const own = assistantLinesFromAssignments(moved, MODEL, peaks, context, 'accepted');
    own[r].uncertaintyCm1 = 0.01;
    const huntOwn = assistantMisassignments({ model: MODEL, floatable: FLOATABLE, lines: own, peaks });
    expect(huntOwn.suspects.find((x) => x.id === moved[r].id)?.reasons.join(' ') ?? '').not.toMatch(/line widths while/);
  });

  it('distrusts every proposal 4 line widths from where the reported fit puts it, whatever the hunt’s own fit says', () => {
    // The fit the user is shown (the loop's reported fit, which may float fewer constants) is the
    // one whose obs − calc the table prints: a proposal that far from it is checked by hand first
    // (common practice). Here the reported fit is the clean fit with its origin moved 0.04 cm^-1.
    const lines = assistantLinesFromAssignments(assignments, MODEL, peaks, context, 'proposed');
    const plain = assistantMisassignments({ model: MODEL, floatable: FLOATABLE, lines, peaks });
    expect(plain.fit).not.toBeNull();
    const fit = plain.fit!;
    const same = assistantMisassignments({ model: MODEL, floatable: FLOATABLE, lines, peaks, reportedFit: fit });
    expect(same.suspects.length).toBeLessThanOrEqual(2);
    const moved = { ...fit, model: { ...fit.model, upper: { ...fit.model.upper, origin: fit.model.upper.origin + 0.04 } } };
    const far = assistantMisassignments({ model: MODEL, floatable: FLOATABLE, lines, peaks, reportedFit: moved });
    expect(far.suspects.length).toBe(lines.length);
    for (const s of far.suspects) expect(s.reasons.join(' ')).toMatch(/is [34]\.\d line widths in the reported fit/);
    // Lines given by hand are the user's call: not distrusted for this.
    const own = assistantLinesFromAssignments(assignments, MODEL, peaks, context, 'accepted');
    const ownHunt = assistantMisassignments({ model: MODEL, floatable: FLOATABLE, lines: own, peaks, reportedFit: moved });
    expect(ownHunt.suspects.length).toBeLessThanOrEqual(2);
  });

  it('distrusts a proposal placed on a peak 2 widths away while another peak sits where the fit puts it', () => {
    // Its line's own peak stays in the list; the proposal names a spot 0.02 cm^-1 (2 FWHM) off it.
    const moved = assignments.map((a) => ({ ...a }));
    const r = moved.findIndex((l) => l.kLower === 2 && l.jUpper === l.jLower - 1 && l.jLower === 9);
    expect(r).toBeGreaterThanOrEqual(0);
    moved[r].observedCm1 += 0.02;
    const lines = assistantLinesFromAssignments(moved, MODEL, peaks, context, 'proposed');
    const hunt = assistantMisassignments({ model: MODEL, floatable: FLOATABLE, lines, peaks });
    const s = hunt.suspects.find((x) => x.id === moved[r].id)!;
    expect(s).toBeDefined();
    expect(s.reasons.join(' ')).toMatch(/another peak lies 0\.\d line widths from where the fit puts the line/);
  });

  it('distrusts a proposal the fit passes through by construction (the only Q line of a Π–Σ band fixes q alone)', () => {
    // Invented linear molecule, Π–Σ band: P and R lines fix B′ + q/2, only Q lines B′ − q/2, so a
    // single Q line sets q and its residual is zero whether it is right or not (leverage 1).
    const pi: BandModel = {
      shape: 'linear',
      band: 'perpendicular',
      lower: stateConstantsFrom({ B: 0.4, DJ: 1e-7 }),
      upper: stateConstantsFrom({ origin: 2100, B: 0.398, DJ: 1e-7, q: 0.002 }),
      temperatureK: 296,
      jMax: 25,
      kMax: 0,
      spinWeights: [1],
    };
    const l = bandLines(pi);
    const rand = randomSeeded(9);
    const set: Assignment[] = [];
    for (let i = 0; i < l.count; i++) {
      if (l.deltaJ[i] === 0 && l.jLower[i] !== 7) continue;
      set.push({
        id: `q${i}`,
        jUpper: l.jUpper[i],
        kUpper: l.kUpper[i],
        jLower: l.jLower[i],
        kLower: l.kLower[i],
        observedCm1: l.wavenumberCm1[i] + 2e-4 * randomNormal(rand),
        uncertaintyCm1: 2e-4,
        isBlended: false,
        isExcluded: false,
        note: '',
      });
    }
    const piPeaks: PeakList = {
      count: set.length,
      wavenumberCm1: Float64Array.from(set.map((a) => a.observedCm1)).sort(),
      height: new Float64Array(set.length).fill(1),
      fwhmCm1: new Float64Array(set.length).fill(0.01),
      snr: new Float64Array(set.length).fill(100),
      prominence: new Float64Array(set.length).fill(1),
      isBlend: new Uint8Array(set.length),
      centreSigmaCm1: new Float64Array(set.length).fill(2e-4),
      noiseSigma: 0.01,
    };
    const lines = assistantLinesFromAssignments(set, pi, piPeaks, assistantPeakContext(piPeaks), 'proposed');
    const floatable = ['upper.origin', 'upper.B', 'lower.B', 'upper.DJ', 'lower.DJ', 'upper.q'];
    const hunt = assistantMisassignments({ model: pi, floatable, lines, peaks: piPeaks });
    const q = lines.find((x) => x.jUpper === x.jLower)!;
    const s = hunt.suspects.find((x) => x.id === q.id);
    expect(s?.reasons.join(' ')).toMatch(/passes through it by construction \(leverage 1\.00/);
    // The P and R lines check one another: none is distrusted for this reason.
    expect(hunt.suspects.filter((x) => x.id !== q.id && /by construction/.test(x.reasons.join(' ')))).toEqual([]);
  });

  it('returns no suspects and the fit error when nothing can be fitted', () => {
    const hunt = assistantMisassignments({ model: MODEL, floatable: FLOATABLE, lines: [], peaks });
    expect(hunt.suspects).toEqual([]);
    expect(hunt.fit).toBeNull();
    expect(hunt.fitError?.kind).toBe('too-few-lines');
  });
});
