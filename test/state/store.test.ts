import { beforeEach, describe, expect, it } from 'vitest';
import { assistantPeakContext } from '../../src/analysis/assistantPeakContext';
import { assistantCatalogue } from '../../src/analysis/assistantPredict';
import { fitBand } from '../../src/fit/fitBand';
import { transitionWavenumber } from '../../src/physics/termValues';
import {
  assignNearPosition,
  assignmentDelete,
  assignmentEdit,
  candidateAssign,
  cursorAssignMatched,
  cursorStep,
  peakClick,
  plotClickBegin,
  plotClickTakeBack,
  rungClick,
  selectCandidates,
  walkToleranceSet,
} from '../../src/state/actionsAssign';
import { redo, undo } from '../../src/state/actionsCore';
import { fitAccept, fitRevert, fitStart } from '../../src/state/actionsFit';
import { traceReplace } from '../../src/state/actionsImport';
import { modelSetConstant, modelSetFloated, modelSetShape } from '../../src/state/actionsModel';
import { viewSetXRange } from '../../src/state/actionsView';
import { selectAssignmentRows, selectBand, selectPeaks, selectPredictionSigmas } from '../../src/state/selectors';
import { benchStore } from '../../src/state/store';
import { smallModel, smallTrace } from './fixtures';

const runFit = (input: Parameters<typeof fitBand>[0]) => Promise.resolve(fitBand(input));

function loadSmall() {
  const model = smallModel();
  benchStore.setState({ model, floated: ['upper.origin', 'upper.B', 'lower.B', 'upper.A', 'upper.zeta'], minIntensity: 0.02 });
  const { trace } = smallTrace(model);
  traceReplace(trace, null, 'file');
}

beforeEach(() => {
  benchStore.setState(benchStore.getInitialState(), true);
});

describe('store slices', () => {
  it('starts with no trace, no assignments, no fit and empty history', () => {
    const s = benchStore.getState();
    expect(s.trace).toBeNull();
    expect(s.assignments).toEqual([]);
    expect(s.fitOutcome).toBeNull();
    expect(s.past).toEqual([]);
    expect(s.model.shape).toBe('prolate');
  });
});

describe('model edits', () => {
  it('move the predicted lines at once (derived, not stored) and enter history', () => {
    const before = selectBand(benchStore.getState()).lines.wavenumberCm1[0];
    expect(modelSetConstant('upper', 'origin', benchStore.getState().model.upper.origin + 1)).toBeNull();
    const after = selectBand(benchStore.getState()).lines.wavenumberCm1[0];
    // ν = ν0 + F′ − F″: shifting the origin by 1 cm^-1 shifts every line by 1 (Herzberg II, eq. IV,45 form).
    expect(after - before).toBeCloseTo(1, 9);
    expect(benchStore.getState().past.length).toBe(1);
    undo();
    expect(selectBand(benchStore.getState()).lines.wavenumberCm1[0]).toBe(before);
  });

  it('refuse a non-finite constant with a sentence and change nothing', () => {
    const m = benchStore.getState().model;
    expect(modelSetConstant('lower', 'B', NaN)).toMatch(/lower.B must be a finite number/);
    expect(benchStore.getState().model).toBe(m);
  });

  it('merge a run of edits to one field into one undo step', () => {
    modelSetConstant('lower', 'B', 0.31);
    modelSetConstant('lower', 'B', 0.312);
    modelSetConstant('lower', 'B', 0.3123);
    expect(benchStore.getState().past.length).toBe(1);
    modelSetConstant('upper', 'B', 0.31);
    expect(benchStore.getState().past.length).toBe(2);
  });

  it('drop floated keys the new shape does not have', () => {
    modelSetFloated('upper.A', true);
    modelSetShape('oblate');
    expect(benchStore.getState().floated).not.toContain('upper.A');
  });
});

describe('assigning', () => {
  it('clicking a peak opens candidates; the top one lands in the table; undo and redo restore it', () => {
    loadSmall();
    const s = benchStore.getState();
    const { peaks } = selectPeaks(s);
    expect(peaks && peaks.count).toBeGreaterThan(20);
    // The noise-free trace has its peaks at the predicted positions, so the best candidate of a
    // strong isolated peak is the line that made it.
    const band = selectBand(s);
    let strongest = 0;
    for (let i = 0; i < peaks!.count; i++) if (peaks!.height[i] > peaks!.height[strongest]) strongest = i;
    peakClick(strongest);
    const cands = selectCandidates(benchStore.getState());
    expect(cands.length).toBeGreaterThan(0);
    expect(Math.abs(cands[0].distanceCm1)).toBeLessThan(0.002);
    expect(candidateAssign(0)).toBe(true);
    const after = benchStore.getState();
    expect(after.assignments.length).toBe(1);
    expect(after.candidateTarget).toBeNull();
    expect(after.selectedAssignmentId).toBe(after.assignments[0].id);
    expect(after.assignments[0].observedCm1).toBe(peaks!.wavenumberCm1[strongest]);
    const a = after.assignments[0];
    const i = band.indexOf.get(`${a.jUpper},${a.kUpper},${a.jLower},${a.kLower}`)!;
    expect(Math.abs(band.lines.wavenumberCm1[i] - a.observedCm1)).toBeLessThan(0.002);
    undo();
    expect(benchStore.getState().assignments.length).toBe(0);
    redo();
    expect(benchStore.getState().assignments).toEqual(after.assignments);
  });

  it('clicking a rung and then a peak assigns that rung and moves the cursor to the next J″', () => {
    loadSmall();
    cursorStep(1); // starts at the strongest line
    cursorStep(-1); // one J″ down, so a next J″ exists
    const c = benchStore.getState().cursor!;
    rungClick(c); // clicking the selected rung deselects …
    expect(benchStore.getState().cursor).toBeNull();
    rungClick(c); // … and again selects
    const { peaks } = selectPeaks(benchStore.getState());
    peakClick(0);
    const s = benchStore.getState();
    expect(s.assignments.length).toBe(1);
    expect(s.assignments[0]).toMatchObject({ jLower: c.jLower, kLower: c.kLower, observedCm1: peaks!.wavenumberCm1[0] });
    expect(s.cursor!.jLower).toBe(c.jLower + 1);
    expect(s.cursor!.kLower).toBe(c.kLower);
  });

  it('walks by key only where one peak matches (declining with a reason otherwise), and a Loomis–Wood click assigns the peak near it', () => {
    loadSmall();
    cursorStep(1);
    cursorStep(-1);
    const c = benchStore.getState().cursor!;
    // No fit: first-guess σ = 0.2 B″ = 0.06 cm^-1 (the assistant's fallback), so ±3σ = ±0.18 cm^-1
    // holds several peaks of this Q-branch pile: the walk declines, says why and stays put.
    expect(cursorAssignMatched()).toBe(false);
    expect(benchStore.getState().assignments).toEqual([]);
    expect(benchStore.getState().cursor).toEqual(c);
    expect(benchStore.getState().messages.at(-1)!.text).toMatch(/not assigned: .*peaks lie within 3σ/);
    // The user narrows the tolerance to 0.5σ (±0.03 cm^-1): one peak is left, the rung's own.
    expect(walkToleranceSet(0)).toMatch(/from 0.5 to 20/);
    expect(walkToleranceSet(0.5)).toBeNull();
    expect(cursorAssignMatched()).toBe(true);
    expect(benchStore.getState().messages.at(-1)!.text).toMatch(/within 0.5σ = ±0.03\d* cm⁻¹, first-guess σ/);
    const a = benchStore.getState().assignments[0];
    const nu = transitionWavenumber(benchStore.getState().model, c.jUpper, c.kUpper, c.jLower, c.kLower);
    // Noise-free trace: the nearest peak is the rung's own line (peak centre within 0.002 cm^-1).
    expect(a).toMatchObject({ jLower: c.jLower, kLower: c.kLower });
    expect(Math.abs(a.observedCm1 - nu)).toBeLessThan(0.002);
    expect(benchStore.getState().cursor!.jLower).toBe(c.jLower + 1);
    // A click 0.001 cm^-1 beside the next rung's line in its strip.
    const q = benchStore.getState().cursor!;
    const nu2 = transitionWavenumber(benchStore.getState().model, q.jUpper, q.kUpper, q.jLower, q.kLower);
    expect(assignNearPosition(q, nu2 + 0.001, 0.01)).toBe(true);
    expect(benchStore.getState().assignments.length).toBe(2);
    expect(assignNearPosition(q, nu2 + 0.35, 1e-4)).toBe(false);
    expect(benchStore.getState().messages.at(-1)!.text).toMatch(/No peak within/);
  });

  it('a double-click is one gesture: its first click’s assignment, cursor step or candidate list is taken back', () => {
    loadSmall();
    cursorStep(1);
    const c = benchStore.getState().cursor!;
    const before = benchStore.getState();
    // First click of a double-click on a peak with a rung selected: it assigns at once …
    plotClickBegin();
    peakClick(3);
    expect(benchStore.getState().assignments.length).toBe(1);
    // … and the second click takes it back, leaving nothing in the undo history.
    plotClickTakeBack();
    const after = benchStore.getState();
    expect(after.assignments).toBe(before.assignments);
    expect(after.past).toBe(before.past);
    expect(after.cursor).toEqual(c);
    // With no rung selected, the first click opens a candidate list; the second closes it, so a
    // later rung click selects the rung instead of assigning it to the old peak.
    benchStore.setState({ cursor: null });
    plotClickBegin();
    peakClick(3);
    expect(benchStore.getState().candidateTarget).not.toBeNull();
    plotClickTakeBack();
    expect(benchStore.getState().candidateTarget).toBeNull();
    rungClick(c);
    expect(benchStore.getState().assignments).toEqual([]);
    expect(benchStore.getState().cursor).toEqual(c);
  });

  it('flags a line assigned far from its prediction', () => {
    loadSmall();
    cursorStep(1);
    const c = benchStore.getState().cursor!;
    const { peaks } = selectPeaks(benchStore.getState());
    // Assign to a peak ~ far away on purpose.
    const nu = transitionWavenumber(benchStore.getState().model, c.jUpper, c.kUpper, c.jLower, c.kLower);
    let far = 0;
    for (let i = 0; i < peaks!.count; i++)
      if (Math.abs(peaks!.wavenumberCm1[i] - nu - 0.5) < Math.abs(peaks!.wavenumberCm1[far] - nu - 0.5)) far = i;
    peakClick(far);
    const row = selectAssignmentRows(benchStore.getState())[0];
    expect(Math.abs(row.omcCm1)).toBeGreaterThan(0.02);
    expect(row.isFar).toBe(true);
  });

  it('edits and deletes rows as undoable steps; zooming is not undoable', () => {
    loadSmall();
    peakClick(3);
    candidateAssign(0);
    const id = benchStore.getState().assignments[0].id;
    const n = benchStore.getState().past.length;
    viewSetXRange([1000, 1001]);
    expect(benchStore.getState().past.length).toBe(n);
    expect(assignmentEdit(id, { uncertaintyCm1: -1 })).toMatch(/uncertainty/);
    expect(assignmentEdit(id, { isExcluded: true })).toBeNull();
    assignmentDelete([id]);
    expect(benchStore.getState().assignments).toEqual([]);
    undo();
    expect(benchStore.getState().assignments[0].isExcluded).toBe(true);
    undo();
    expect(benchStore.getState().assignments[0].isExcluded).toBe(false);
    expect(benchStore.getState().xRange).toEqual([1000, 1001]);
  });
});

describe('fitting', () => {
  it('fits lines assigned from a trace of known constants and recovers them; accept and keep-previous switch the model', async () => {
    // Round trip: assign positions computed from known constants, start from perturbed ones.
    const truth = smallModel();
    benchStore.setState({
      model: { ...truth, upper: { ...truth.upper, origin: truth.upper.origin + 0.05, B: truth.upper.B * 1.001 } },
      floated: ['upper.origin', 'upper.B', 'lower.B', 'upper.zeta', 'upper.A'],
      minIntensity: 0.02,
    });
    const band = selectBand(benchStore.getState());
    const assignments = [];
    for (let i = 0; i < band.lines.count; i++) {
      const q = { jUpper: band.lines.jUpper[i], kUpper: band.lines.kUpper[i], jLower: band.lines.jLower[i], kLower: band.lines.kLower[i] };
      assignments.push({
        id: `a${i + 1}`,
        ...q,
        observedCm1: transitionWavenumber(truth, q.jUpper, q.kUpper, q.jLower, q.kLower),
        uncertaintyCm1: 0.001,
        isBlended: false,
        isExcluded: false,
        note: '',
      });
    }
    benchStore.setState({ assignments });
    await fitStart(runFit);
    const s = benchStore.getState();
    expect(s.isFitRunning).toBe(false);
    expect(s.fitOutcome?.ok).toBe(true);
    if (!s.fitOutcome?.ok) return;
    const p = s.fitOutcome.result.parameters;
    // Exact data: the fit returns the generating constants to solver precision (1e-8 cm^-1 on
    // ν0 is far below any line σ; relative 1e-8 on B).
    expect(p['upper.origin'].value).toBeCloseTo(truth.upper.origin, 7);
    expect(p['upper.B'].value / truth.upper.B).toBeCloseTo(1, 8);
    expect(s.fitLineIds).toEqual(assignments.map((a) => a.id));
    const before = s.model;
    fitAccept();
    expect(benchStore.getState().model.upper.origin).toBeCloseTo(truth.upper.origin, 7);
    expect(benchStore.getState().isFitAccepted).toBe(true);
    fitRevert();
    expect(benchStore.getState().model).toBe(before);
  });

  it("ranks candidates after a fit by distance in σ, each line's σ the assistant's matching σ from the fit", async () => {
    loadSmall();
    // Twelve lines with noise of a few 1e-4 cm^-1, so the fit has a covariance and every σ_pred > 0.
    const band = selectBand(benchStore.getState());
    const assignments = Array.from({ length: 12 }, (_, n) => {
      const i = (n * 5) % band.lines.count;
      const q = { jUpper: band.lines.jUpper[i], kUpper: band.lines.kUpper[i], jLower: band.lines.jLower[i], kLower: band.lines.kLower[i] };
      return {
        id: `a${n + 1}`,
        ...q,
        observedCm1: band.lines.wavenumberCm1[i] + ((n % 3) - 1) * 3e-4,
        uncertaintyCm1: 0.001,
        isBlended: false,
        isExcluded: false,
        note: '',
      };
    });
    benchStore.setState({ assignments, floated: ['upper.origin', 'upper.B', 'lower.B'] });
    await fitStart(runFit);
    expect(benchStore.getState().fitOutcome?.ok).toBe(true);
    peakClick(3);
    const s = benchStore.getState();
    const cands = selectCandidates(s);
    const sigmas = selectPredictionSigmas(s)!;
    const band2 = selectBand(s);
    // The σ of each candidate is the assistant's matching σ (assistantCatalogue: fit σ widened by
    // the Student factor, ⊕ residual scatter ⊕ width floor), built here independently.
    const { peaks } = selectPeaks(s);
    const fit = s.fitOutcome!.ok ? s.fitOutcome!.result : null;
    const cat = assistantCatalogue({
      model: fit!.model,
      fit,
      peaks: peaks!,
      context: assistantPeakContext(peaks!),
      minIntensity: s.minIntensity / 4,
      widthFloorFraction: 0.1,
      fallbackSigmaCm1: 0.2 * s.model.lower.B,
    });
    expect(cands.length).toBeGreaterThan(0);
    for (const c of cands) {
      const key = `${c.jUpper},${c.kUpper},${c.jLower},${c.kLower}`;
      const sigma = Math.hypot(cat.toleranceSigmaCm1[cat.indexOf.get(key)!], s.candidateTarget!.peakSigmaCm1);
      // Same formula on the same numbers: equal to round-off.
      expect(c.distanceSigma).toBeCloseTo(Math.abs(c.distanceCm1) / sigma, 12);
      // Never narrower than the fit's own propagated σ of that line.
      expect(sigma).toBeGreaterThanOrEqual(sigmas[band2.indexOf.get(key)!]);
    }
  });

  it('reports a refused fit in the message area', async () => {
    benchStore.setState({
      floated: ['upper.origin', 'upper.B'],
      assignments: [
        {
          id: 'a1',
          jUpper: 2,
          kUpper: 1,
          jLower: 1,
          kLower: 0,
          observedCm1: 1000,
          uncertaintyCm1: 0.001,
          isBlended: false,
          isExcluded: false,
          note: '',
        },
      ],
    });
    await fitStart(runFit);
    const s = benchStore.getState();
    expect(s.fitOutcome?.ok).toBe(false);
    expect(s.messages.at(-1)?.level).toBe('error');
    expect(s.messages.at(-1)?.text).toMatch(/refused/);
  });
});
