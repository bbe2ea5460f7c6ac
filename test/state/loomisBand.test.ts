/**
 * The Loomis–Wood view's band in a several-band session (selectLoomisBand): it follows the panels'
 * band until another is chosen, shows that band's own ladders, and a click on it assigns the line to
 * that band. Demo system: src/cli/makeDemoSystem.ts (invented constants).
 */
import { beforeEach, describe, expect, it } from 'vitest';
import { demoSystemTruth, DEMO_SYSTEM_FLOATED } from '../../src/cli/makeDemoSystem';
import { systemLines } from '../../src/physics/system/systemLines';
import { assignNearPosition } from '../../src/state/actionsAssign';
import { bandActivate, systemLoad } from '../../src/state/actionsSystem';
import { viewSetLoomis } from '../../src/state/actionsView';
import { selectBand } from '../../src/state/selectors';
import { selectLoomisBand } from '../../src/state/selectorsSystem';
import { benchStore } from '../../src/state/store';
import { smallModel } from './fixtures';

beforeEach(() => {
  benchStore.setState(benchStore.getInitialState(), true);
});

describe('the Loomis–Wood band', () => {
  it('is the one band of a single-band session', () => {
    benchStore.setState({ model: smallModel() });
    const l = selectLoomisBand(benchStore.getState());
    expect(l.ref).toBeNull();
    expect(l.band).toBe(selectBand(benchStore.getState()));
    // The same object for the same state: useBench re-renders without end otherwise.
    expect(selectLoomisBand(benchStore.getState())).toBe(l);
  });

  it('follows the panels’ band until another is chosen, then shows that band’s lines and ladders', () => {
    systemLoad({ system: demoSystemTruth(), floated: DEMO_SYSTEM_FLOATED, name: 'demo' }, 'load');
    let l = selectLoomisBand(benchStore.getState());
    expect(l.isFollowing).toBe(true);
    expect(l.key).toBe('LB-7/nu4');
    bandActivate('LB-7/hot');
    expect(selectLoomisBand(benchStore.getState()).key).toBe('LB-7/hot');
    viewSetLoomis({ bandKey: 'LB-7-66/nu4' });
    l = selectLoomisBand(benchStore.getState());
    expect(l.isFollowing).toBe(false);
    expect(l.ref).toEqual({ band: 'nu4', species: 'LB-7-66' });
    // Its lines are the isotopologue's: the strongest is at the system's position of that band's
    // strongest line (same constants; the single-band view differs only by the lower origin, 0 here).
    const sys = systemLines(demoSystemTruth(), { minIntensity: 0.002 });
    let best = -1;
    for (let i = 0; i < sys.count; i++)
      if (sys.bandRefs[sys.bandIndex[i]].species === 'LB-7-66' && (best < 0 || sys.intensity[i] > sys.intensity[best])) best = i;
    const near = Array.from(l.band.lines.wavenumberCm1).some((x) => Math.abs(x - sys.wavenumberCm1[best]) < 1e-6);
    expect(near).toBe(true);
    expect(l.band.ladders.length).toBeGreaterThan(10);
    // The panels' band is unchanged.
    expect(benchStore.getState().activeBandKey).toBe('LB-7/hot');
  });

  it('assigns a click in the view to the band shown', () => {
    systemLoad({ system: demoSystemTruth(), floated: DEMO_SYSTEM_FLOATED, name: 'demo' }, 'load');
    viewSetLoomis({ bandKey: 'LB-7-66/nu4' });
    const l = selectLoomisBand(benchStore.getState());
    const i = l.band.ladders[0].lineIndex[0];
    const x = l.band.lines.wavenumberCm1[i];
    // One peak exactly at the line (as the peak finder in the worker would report it).
    const trace = { wavenumberCm1: Float64Array.of(x - 1, x + 1), absorbance: Float64Array.of(0, 0) } as never;
    const one = Float64Array.of(1);
    const peaks = {
      count: 1,
      wavenumberCm1: Float64Array.of(x),
      height: one,
      fwhmCm1: Float64Array.of(0.003),
      snr: Float64Array.of(100),
      prominence: one,
      isBlend: new Uint8Array(1),
      centreSigmaCm1: Float64Array.of(0.0002),
    } as never;
    const st = benchStore.getState();
    benchStore.setState({
      trace,
      isPeaksInWorker: true,
      peaksResult: { trace, minSnr: st.peakMinSnr, baseline: st.peakBaseline, peaks, error: null },
    });
    const q = {
      jUpper: l.band.lines.jUpper[i],
      kUpper: l.band.lines.kUpper[i],
      jLower: l.band.lines.jLower[i],
      kLower: l.band.lines.kLower[i],
      ...l.ref!,
    };
    expect(assignNearPosition(q, x, 0.01)).toBe(true);
    const a = benchStore.getState().assignments;
    expect(a).toHaveLength(1);
    expect(a[0].species).toBe('LB-7-66');
    expect(a[0].band).toBe('nu4');
  });
});
