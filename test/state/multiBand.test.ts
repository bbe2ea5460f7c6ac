/**
 * A several-band session in the store: the demo system of two isotopologues and a hot band
 * (src/cli/makeDemoSystem.ts, invented constants), candidates from every band, assignments that
 * carry their band, the joint fit from the page, exports and project files that keep the bands,
 * and a single-band session that still fits as before.
 */
import { beforeEach, describe, expect, it } from 'vitest';
import { fitBand } from '../../src/fit/fitBand';
import { systemFit } from '../../src/fit/systemFit';
import { lineTableSerialize } from '../../src/io/lineTable';
import { projectFileParse, projectFileSerialize } from '../../src/io/projectFile';
import { systemFileParse } from '../../src/io/systemFile';
import { systemFileSerialize } from '../../src/io/systemFileWrite';
import { systemLineTableParse } from '../../src/io/systemLineTable';
import { systemLines } from '../../src/physics/system/systemLines';
import { demoSystemTruth, DEMO_SYSTEM_FLOATED } from '../../src/cli/makeDemoSystem';
import { assignToPeak, selectCandidates } from '../../src/state/actionsAssign';
import { fitAccept, fitStart } from '../../src/state/actionsFit';
import { systemFitInputOf, systemFitInputSliced } from '../../src/state/systemFitInput';
import { modelSetConstant } from '../../src/state/actionsModel';
import { bandActivate, bandToggle, systemLoad } from '../../src/state/actionsSystem';
import { selectAssignmentRows, selectFitResult, selectSimulated } from '../../src/state/selectors';
import { selectAssignmentLevels, selectDrawnBands } from '../../src/state/selectorsSystem';
import { lineLevelLabel } from '../../src/state/systemLevelLabels';
import { sessionOf, stateFromSession } from '../../src/state/session';
import { benchStore } from '../../src/state/store';
import { smallModel, assignmentOfLine } from './fixtures';
import { assistantAcceptAll, assistantRunStart, type AssistantRunner } from '../../src/state/actionsAssistant';
import { assistantBandTrace } from './assistantBand';

const runOne = (input: Parameters<typeof fitBand>[0]) => Promise.resolve(fitBand(input));
const runSystem = (input: Parameters<typeof systemFit>[0]) => Promise.resolve(systemFit(input));

/** Mulberry32 (seeded uniform) and Box–Muller normal deviates. */
function normalSeeded(seed: number): () => number {
  let a = seed >>> 0;
  const u = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), a | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4_294_967_296;
  };
  return () => Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
}

beforeEach(() => {
  benchStore.setState(benchStore.getInitialState(), true);
});

describe('a session of several bands', () => {
  it('draws every band switched on, and the switch hides a band from the ladders but not from the simulated sum', () => {
    const truth = demoSystemTruth();
    expect(systemLoad({ system: truth, floated: DEMO_SYSTEM_FLOATED, name: 'demo' }, 'load')).toBe(true);
    const s = benchStore.getState();
    expect(s.activeBandKey).toBe('LB-7/nu4');
    expect(s.model.upper.origin).toBeCloseTo(1148.6431, 9);
    const drawn = selectDrawnBands(s);
    expect(drawn.entries!.map((e) => e.key)).toEqual(['LB-7/nu4', 'LB-7/hot', 'LB-7-66/nu4']);
    for (let b = 0; b < 3; b++) expect(drawn.bandCount![b]).toBeGreaterThan(100);
    // The hot band's origin is G(v3v4) − G(v3) (its view) — checked against the states' own numbers.
    expect(drawn.entries![1].view!.upper.origin).toBeCloseTo(1685.9012 - 540.213, 9);
    const simBefore = selectSimulated(s).sim!;
    bandToggle('LB-7/hot');
    const s2 = benchStore.getState();
    expect(selectDrawnBands(s2).bandCount![1]).toBe(0);
    expect(selectSimulated(s2).sim).toBe(simBefore);
  });

  it('offers candidates from both isotopologues and assigns each to its own band', () => {
    const truth = demoSystemTruth();
    systemLoad({ system: truth, floated: DEMO_SYSTEM_FLOATED, name: 'demo' }, 'load');
    const lines = systemLines(truth, { minIntensity: 0.002 });
    // A strong line of the isotopologue; the parent's lines lie within a few B of it too.
    let best = -1;
    for (let i = 0; i < lines.count; i++)
      if (lines.bandIndex[i] === 2 && (best < 0 || lines.intensity[i] > lines.intensity[best])) best = i;
    const peakCm1 = lines.wavenumberCm1[best];
    benchStore.setState({ candidateTarget: { peakCm1, peakId: 'p1', peakSigmaCm1: 0.0005 } });
    const cands = selectCandidates(benchStore.getState());
    const species = new Set(cands.map((c) => c.species));
    expect(species.has('LB-7')).toBe(true);
    expect(species.has('LB-7-66')).toBe(true);
    // Before a fit each line's σ is the first guess (2 B″), so stronger parent lines nearby may rank
    // above it; the line itself is offered, at distance 0.
    const top = cands.find((c) => c.species === 'LB-7-66' && Math.abs(c.distanceCm1) < 1e-9)!;
    expect(top.jLower).toBe(lines.jLower[best]);
    expect(top.kLower).toBe(lines.kLower[best]);
    assignToPeak(top, benchStore.getState().candidateTarget!);
    const parent = cands.find((c) => c.species === 'LB-7')!;
    assignToPeak(parent, { peakCm1: parent.predictedCm1, peakId: 'p2', peakSigmaCm1: 0.0005 });
    const a = benchStore.getState().assignments;
    expect(a.map((x) => `${x.species}/${x.band}`)).toEqual(['LB-7-66/nu4', `LB-7/${parent.band}`]);
    // Calculated with each band's own constants.
    const rows = selectAssignmentRows(benchStore.getState());
    expect(rows[0].calcCm1).toBeCloseTo(peakCm1, 8);
  });

  it('marks a candidate assigned once its row exists, and keeps each row’s level labels as rows are added or the active band changes', () => {
    const truth = demoSystemTruth();
    systemLoad({ system: truth, floated: DEMO_SYSTEM_FLOATED, name: 'demo' }, 'load');
    const drawn = selectDrawnBands(benchStore.getState());
    // The strongest drawn line of the isotopologue's ν4 (a degenerate upper state: l' = ±1).
    let best = -1;
    for (let i = 0; i < drawn.lines.count; i++)
      if (
        drawn.entries![drawn.bandOfLine![i]].key === 'LB-7-66/nu4' &&
        (best < 0 || drawn.lines.intensity[i] > drawn.lines.intensity[best])
      )
        best = i;
    const target = { peakCm1: drawn.lines.wavenumberCm1[best], peakId: 'p1', peakSigmaCm1: 0.0005 };
    benchStore.setState({ candidateTarget: target });
    const top = selectCandidates(benchStore.getState()).find((c) => c.species === 'LB-7-66' && Math.abs(c.distanceCm1) < 1e-9)!;
    expect(top.isAssigned).toBe(false);
    assignToPeak(top, target);
    benchStore.setState({ candidateTarget: target });
    const again = selectCandidates(benchStore.getState()).find((c) => c.lineIndex === top.lineIndex && c.species === 'LB-7-66')!;
    expect(again.isAssigned).toBe(true);
    // The row names the line's l' (the drawn line's own label, from the level sets).
    const first = selectAssignmentLevels(benchStore.getState());
    expect(first[0]?.lUpper).toBe(top.lUpper);
    expect(first[0]?.lUpper).not.toBe(0);
    // A row with no band column belongs to the active band: its labels follow the active band. Its
    // quanta: a drawn line of LB-7/nu4 (the stronger parent) that LB-7-66/nu4 does not draw.
    const keyOf = (i: number) => `${drawn.lines.jUpper[i]},${drawn.lines.kUpper[i]},${drawn.lines.jLower[i]},${drawn.lines.kLower[i]}`;
    const bandOf = (i: number) => drawn.entries![drawn.bandOfLine![i]].key;
    const isotopologue = new Set<string>();
    for (let i = 0; i < drawn.lines.count; i++) if (bandOf(i) === 'LB-7-66/nu4') isotopologue.add(keyOf(i));
    let only = -1;
    for (let i = 0; i < drawn.lines.count && only < 0; i++) if (bandOf(i) === 'LB-7/nu4' && !isotopologue.has(keyOf(i))) only = i;
    expect(only).toBeGreaterThanOrEqual(0);
    benchStore.setState((st) => ({
      assignments: [
        ...st.assignments,
        {
          ...st.assignments[0],
          id: 'x1',
          jUpper: drawn.lines.jUpper[only],
          kUpper: drawn.lines.kUpper[only],
          jLower: drawn.lines.jLower[only],
          kLower: drawn.lines.kLower[only],
          band: undefined,
          species: undefined,
          lUpper: undefined,
          lLower: undefined,
          tagUpper: undefined,
          tagLower: undefined,
        },
      ],
    }));
    const withOrphan = selectAssignmentLevels(benchStore.getState());
    expect(withOrphan[0]).toBe(first[0]);
    expect(benchStore.getState().activeBandKey).toBe('LB-7/nu4');
    expect(withOrphan[1]).toEqual(lineLevelLabel(drawn.levels!, only));
    bandActivate('LB-7-66/nu4');
    expect(selectAssignmentLevels(benchStore.getState())[1]).toBeNull();
    bandActivate('LB-7/nu4');
    expect(selectAssignmentLevels(benchStore.getState())[1]).toEqual(lineLevelLabel(drawn.levels!, only));
  });

  it('fits every band at once from the page and gets the true constants back within the reported σ', async () => {
    const truth = demoSystemTruth();
    systemLoad({ system: truth, floated: DEMO_SYSTEM_FLOATED, name: 'demo' }, 'load');
    const lines = systemLines(truth, { minIntensity: 0.02 });
    const noise = normalSeeded(15);
    const sigma = 0.0005;
    const assignments = Array.from({ length: lines.count }, (_, i) => {
      const ref = lines.bandRefs[lines.bandIndex[i]];
      return {
        id: `a${i + 1}`,
        jUpper: lines.jUpper[i],
        kUpper: lines.kUpper[i],
        jLower: lines.jLower[i],
        kLower: lines.kLower[i],
        observedCm1: lines.wavenumberCm1[i] + sigma * noise(),
        uncertaintyCm1: sigma,
        isBlended: false,
        isExcluded: false,
        note: '',
        band: ref.band,
        species: ref.species,
      };
    });
    // Round trip: start the fit from constants moved off the truth through the model panel (active band's view).
    modelSetConstant('upper', 'B', truth.species[0].states[2].constants.B * 1.001);
    benchStore.setState({ assignments });
    await fitStart(runOne, runSystem);
    const r = selectFitResult(benchStore.getState());
    expect(r, JSON.stringify(benchStore.getState().fitOutcome)).not.toBeNull();
    // Source: the invented truth the lines were made from; tolerance 4σ (seeded noise, σ as reported).
    for (const key of ['LB-7/v4.B', 'LB-7/v3v4.origin', 'LB-7-66/v4.origin', 'LB-7-66/ground.B', 'LB-7/v3.B']) {
      const [sp, rest] = key.split('/');
      const [st, name] = rest.split('.');
      const t = truth.species.find((x) => x.name === sp)!.states.find((x) => x.name === st)!.constants[name];
      const p = r!.parameters[key];
      expect(Math.abs(p.value - t), key).toBeLessThan(4 * p.sigma!);
    }
    fitAccept();
    const s = benchStore.getState();
    expect(s.system!.species[0].states[2].constants.B).toBeCloseTo(r!.parameters['LB-7/v4.B'].value, 12);
    expect(s.model.upper.B).toBeCloseTo(r!.parameters['LB-7/v4.B'].value, 12);
  });

  it('resolves the rows for the joint fit in slices to the same input, refuses a bad row with the same words, and stops when told', async () => {
    const truth = demoSystemTruth();
    systemLoad({ system: truth, floated: DEMO_SYSTEM_FLOATED, name: 'demo' }, 'load');
    const lines = systemLines(truth, { minIntensity: 0.002 });
    const assignments = Array.from({ length: 40 }, (_, n) => {
      const i = n * 7;
      const ref = lines.bandRefs[lines.bandIndex[i]];
      return { ...assignmentOfLine(lines, i, `r${n}`), band: ref.band, species: ref.species };
    });
    const s = benchStore.getState();
    // A copy of the system for each run: the resolved rows are kept per system object.
    const source = (list: typeof assignments) => ({ ...s, system: structuredClone(s.system), assignments: list });
    let checks = 0;
    const sliced = await systemFitInputSliced(source(assignments), () => (checks++, false), 0);
    // With no time between pauses, one pause per row resolved.
    expect(checks).toBe(assignments.length);
    const whole = systemFitInputOf(source(assignments));
    expect(sliced).toEqual(whole);
    expect(whole.ok).toBe(true);
    // A row naming a line its band does not have: the same refusal either way.
    const bad = [...assignments, { ...assignments[0], id: 'bad', kUpper: assignments[0].kLower + 5 }];
    const refusedSliced = await systemFitInputSliced(source(bad), () => false, 0);
    expect(refusedSliced).toEqual(systemFitInputOf(source(bad)));
    expect(refusedSliced!.ok).toBe(false);
    // Stale after the third pause: the work stops there.
    let pauses = 0;
    expect(await systemFitInputSliced(source(assignments), () => ++pauses >= 3, 0)).toBeNull();
    expect(pauses).toBe(3);
  });

  it('keeps the bands in the line table, the system file and the project file', () => {
    const truth = demoSystemTruth();
    systemLoad({ system: truth, floated: DEMO_SYSTEM_FLOATED, name: 'demo' }, 'load');
    bandActivate('LB-7-66/nu4');
    assignToPeak({ jUpper: 10, kUpper: 3, jLower: 9, kLower: 2 }, { peakCm1: 1150, peakId: 'p', peakSigmaCm1: 0.001 });
    const s = benchStore.getState();
    expect(s.assignments[0].species).toBe('LB-7-66');
    const csv = lineTableSerialize(s.assignments, { shape: 'prolate', hasBandColumns: true });
    const back = systemLineTableParse(csv);
    expect(back.rows[0].band).toBe('nu4');
    expect(back.rows[0].species).toBe('LB-7-66');
    const file = systemFileParse(systemFileSerialize(s.system!, { floated: s.systemFloated, name: 'x' }));
    const nonzero = (m: typeof s.system) =>
      m!.species.map((sp) => sp.states.map((st) => Object.entries(st.constants).filter(([, v]) => v !== 0)));
    expect(nonzero(file.model)).toEqual(nonzero(s.system));
    expect(file.model.species.map((sp) => sp.bands)).toEqual(s.system!.species.map((sp) => sp.bands));
    expect(
      file.parameters
        .filter((p) => p.status === 'floated')
        .map((p) => p.key)
        .sort(),
    ).toEqual([...s.systemFloated].sort());
    const text = projectFileSerialize(sessionOf(s), { appVersion: 'test', savedAt: '2026-12-03T00:00:00Z' });
    const parsed = projectFileParse(text);
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    const fields = stateFromSession(parsed.session);
    expect(fields.system).toEqual(s.system);
    expect(fields.activeBandKey).toBe('LB-7-66/nu4');
    expect(fields.assignments![0].band).toBe('nu4');
  });

  it('reads an old single-band session as one band and fits it exactly as before', async () => {
    const model = smallModel();
    const fields = stateFromSession({ model, floated: ['upper.origin', 'upper.B', 'lower.B'] });
    expect(fields.system).toBeNull();
    benchStore.setState(fields);
    const q = [
      [5, 2, 4, 1],
      [6, 2, 5, 1],
      [7, 2, 6, 1],
      [4, 2, 5, 1],
      [5, 3, 4, 2],
      [7, 0, 6, 1],
    ];
    const assignments = q.map(([jUpper, kUpper, jLower, kLower], i) => ({
      id: `a${i}`,
      jUpper,
      kUpper,
      jLower,
      kLower,
      observedCm1: 1000 + i,
      uncertaintyCm1: 0.001,
      isBlended: false,
      isExcluded: false,
      note: '',
    }));
    benchStore.setState({ assignments });
    await fitStart(runOne, () => Promise.reject(new Error('the joint fit must not run for one band')));
    const direct = fitBand({ model, floated: ['upper.origin', 'upper.B', 'lower.B'], lines: assignments });
    expect(benchStore.getState().fitOutcome).toEqual(direct);
  });
});

describe('the assistant in a several-band session', () => {
  it('starts from the active band’s lines only and files what is accepted under the band it ran for', async () => {
    const truth = demoSystemTruth();
    systemLoad({ system: truth, floated: DEMO_SYSTEM_FLOATED, name: 'demo' }, 'load');
    const base = {
      kUpper: 1,
      kLower: 0,
      uncertaintyCm1: 0.0005,
      isBlended: false,
      isExcluded: false,
      note: '',
    };
    benchStore.setState({
      trace: assistantBandTrace().trace,
      assignments: [
        { ...base, id: 'p1', jUpper: 5, jLower: 4, observedCm1: 1150, band: 'nu4', species: 'LB-7' },
        { ...base, id: 'i1', jUpper: 5, jLower: 4, observedCm1: 1149.5, band: 'nu4', species: 'LB-7-66' },
      ],
    });
    let seen: readonly { id: string }[] = [];
    const runner: AssistantRunner = (job) => {
      seen = job.kind === 'hunt' ? [] : job.assignments;
      return Promise.resolve({
        kind: 'run',
        proposals: [
          {
            id: 'x',
            jUpper: 6,
            kUpper: 1,
            jLower: 5,
            kLower: 0,
            observedCm1: 1151.25,
            uncertaintyCm1: 0.0005,
            predictedCm1: 1151.2501,
            calcCm1: 1151.2501,
            distanceSigma: 0.2,
            isBlended: false,
            verdict: 'confident',
            reason: 'test',
            doubt: '',
          },
        ],
        summary: '',
        doubt: null,
        warnings: [],
        ambiguous: [],
        fitSummary: null,
      });
    };
    await assistantRunStart(runner);
    // The active band is the parent's ν4: the isotopologue's row is not a seed of its model.
    expect(seen.map((a) => a.id)).toEqual(['p1']);
    // Switching the panels to another band before accepting does not move the proposal to it.
    expect(bandActivate('LB-7-66/nu4')).toBeNull();
    expect(assistantAcceptAll().accepted).toBe(1);
    const added = benchStore.getState().assignments.find((a) => a.jUpper === 6);
    expect(added).toMatchObject({ band: 'nu4', species: 'LB-7' });
  });
});
