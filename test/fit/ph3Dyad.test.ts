/**
 * PH3 ν2/ν4 fitted together as a dyad from the HITRAN 2012 lines (issue 17), and the simulated
 * intensities of the perturbation-allowed lines against the database's.
 * Source of the lines: L. S. Rothman et al., J. Quant. Spectrosc. Radiat. Transfer 130, 4 (2013)
 * (test/fixtures/real/hitran2012/README.md). The system file's start values are this fit's result
 * (rounded), so the fit converges in a few iterations; the terms it holds are listed in the output.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { systemFit } from '../../src/fit/systemFit';
import type { SystemFitResult } from '../../src/fit/systemFitTypes';
import { systemFileParse } from '../../src/io/systemFile';
import { systemLines } from '../../src/physics/system/systemLines';
import { ph3FitLines, ph3RowConsistent, ph3Rows, ph3Sigma } from './ph3DyadData';

const systemText = readFileSync(fileURLToPath(new URL('../fixtures/systems/ph3-dyad.json', import.meta.url)), 'utf8');

describe('PH3 ν2/ν4 dyad from HITRAN 2012', () => {
  const rows = ph3Rows();
  const kept = rows.filter(ph3RowConsistent);
  const lines = ph3FitLines(kept);
  let result: SystemFitResult;

  beforeAll(() => {
    const file = systemFileParse(systemText);
    const out = systemFit({ model: file.model, parameters: file.parameters, lines });
    if (!out.ok) throw new Error(out.error.message);
    result = out.result;
    const terms = result.floated.join(', ');
    console.log(
      `PH3 dyad: ${rows.length} rows, ${rows.length - kept.length} with labels outside the dyad's pattern left out, ${lines.length} lines after merging ` +
        `unresolved A+/A− duplicates; rms ${result.rmsCm1.toFixed(4)} cm⁻¹, σ_w ${result.sigmaW?.toFixed(2)}, ${result.nParameters} constants, ` +
        `${result.iterations} iterations. Bands: ${result.bands.map((b) => `${b.band} ${b.nLines} lines rms ${b.rmsCm1.toFixed(4)}`).join('; ')}. Terms: ${terms}`,
    );
  }, 300_000);

  it('every pair line of the list obeys σ′σ″ = −1 under the A± reading of ph3Sigma (the tag inference holds)', () => {
    let pairs = 0;
    for (const r of kept) {
      if (r.symUp === 'E' || r.symLo === 'E') continue;
      pairs++;
      const sigmaLo = r.kLo === 0 ? (r.jLo % 2 === 0 ? 1 : -1) : ph3Sigma(r.symLo, r.jLo);
      expect(ph3Sigma(r.symUp, r.jUp) * sigmaLo).toBe(-1);
    }
    expect(pairs).toBeGreaterThan(1000);
  });

  it('fits ν2 and ν4 together with the Coriolis coupling to rms <= 0.005 cm⁻¹ on the whole list (issue 17 target; single-band fits: 0.28 cm⁻¹)', () => {
    // Measured 0.0041 cm⁻¹ on all 4105 lines, nothing excluded (0.024 before the higher-order terms).
    expect(result.rmsCm1).toBeLessThanOrEqual(0.005);
    expect(result.nLines).toBe(lines.length);
    expect(result.lines.filter((l) => l.isExcluded)).toHaveLength(0);
    expect(result.nLines).toBeGreaterThan(4000);
    // The interaction constants are fitted and determined (σ small against the value).
    const c1 = result.parameters['v2v4.C1'];
    expect(c1.fixed).toBe(false);
    expect(Math.abs(c1.value)).toBeGreaterThan(3);
    expect(c1.sigma!).toBeLessThan(0.01 * Math.abs(c1.value));
    expect(result.parameters['v2v4.C2'].sigma!).toBeLessThan(0.1 * Math.abs(result.parameters['v2v4.C2'].value));
    // Band origins as published for this dyad (ν2 ≈ 992.13, ν4 ≈ 1118.31 cm⁻¹; from memory), to 0.05 cm⁻¹.
    expect(result.parameters['v2.origin'].value).toBeCloseTo(992.13, 1);
    expect(result.parameters['v4.origin'].value).toBeCloseTo(1118.31, 1);
  });

  it('determines each higher-order term it needed (value beyond 3σ) and each lowers the rms by more than 5 %', () => {
    // The terms added for the high-J, high-K tail (physics/interaction/coupledHigherTerms.ts, and h3 of ν2).
    const added = ['v2.h3', 'v2.eps', 'v2v4.C2JJ', 'v2v4.C2JK', 'v2v4.C4', 'v2v4.C5'];
    for (const key of added) {
      const p = result.parameters[key];
      expect(p.fixed, key).toBe(false);
      // 3σ: common practice for calling a constant determined. Measured |value|/σ 4.7 (C2JK) … 58 (C5).
      expect(p.sigma!, key).toBeLessThan(Math.abs(p.value) / 3);
    }
    // Each one held at 0 (the others floated) leaves a larger rms: measured 0.0045 (C2JK) … 0.0081 (C5).
    const without: string[] = [];
    for (const key of added) {
      const file = systemFileParse(systemText);
      const parameters = file.parameters.map((p) => (p.key === key ? { ...p, value: 0, status: 'fixed' as const } : p));
      const out = systemFit({ model: file.model, parameters, lines });
      if (!out.ok) throw new Error(out.error.message);
      without.push(`${key} ${out.result.rmsCm1.toFixed(4)}`);
      expect(out.result.rmsCm1, key).toBeGreaterThan(1.05 * result.rmsCm1);
    }
    console.log(`PH3 dyad, rms with each added term held at 0: ${without.join(', ')} cm⁻¹ (all floated: ${result.rmsCm1.toFixed(4)})`);
  }, 300_000);

  it('reports the lines beyond 3σ (σ scaled by σ_w) after convergence, and the rms without them, beside the whole-list rms', () => {
    // Common practice: a published fit sets aside lines with |o − c| > 3σ after convergence. Here they
    // are listed and the rms is given both ways; the target above is on the whole list.
    const scale = Math.max(1, result.sigmaW ?? 1);
    const beyond = result.lines.filter((l) => Math.abs(l.obsMinusCalc) > 3 * l.uncertaintyCm1 * scale);
    const file = systemFileParse(systemText);
    const marked = lines.map((l, i) => (beyond.some((b) => result.lines.indexOf(b) === i) ? { ...l, isExcluded: true } : l));
    const out = systemFit({ model: file.model, parameters: file.parameters, lines: marked });
    if (!out.ok) throw new Error(out.error.message);
    const describe = (l: (typeof result.lines)[number]) =>
      `${l.band} ${l.jUpper} ${l.kUpper}${l.tagUpper ? ' ' + l.tagUpper : ''} ← ${l.jLower} ${l.kLower} at ${l.obs.toFixed(4)} (o − c ${l.obsMinusCalc.toFixed(4)})`;
    console.log(
      `PH3 dyad: ${beyond.length} of ${lines.length} lines beyond 3σ·σ_w: ${beyond.slice(0, 5).map(describe).join('; ')}. ` +
        `rms on the whole list ${result.rmsCm1.toFixed(4)} cm⁻¹; refitted without them ${out.result.rmsCm1.toFixed(4)} cm⁻¹ on ${out.result.nLines} lines`,
    );
    // Measured 3 lines (two HITRAN rows share 1092.1807 cm⁻¹, one allowed and one ΔK = +3 line), 0.0036 cm⁻¹ without them.
    expect(beyond.length).toBeLessThan(0.01 * lines.length);
    expect(out.result.nLines).toBe(lines.length - beyond.length);
    expect(out.result.rmsCm1).toBeLessThanOrEqual(result.rmsCm1);
  }, 300_000);

  it("reaches rms <= 0.005 cm⁻¹ on the lines with J' <= 17 alone (the same terms)", () => {
    const file = systemFileParse(systemText);
    const out = systemFit({ model: file.model, parameters: file.parameters, lines: lines.filter((l) => l.jUpper <= 17) });
    if (!out.ok) throw new Error(out.error.message);
    console.log(
      `PH3 dyad, J' <= 17: ${out.result.nLines} lines, rms ${out.result.rmsCm1.toFixed(4)} cm⁻¹, σ_w ${out.result.sigmaW?.toFixed(2)}`,
    );
    // Measured 0.0022 cm⁻¹ (3280 lines; 0.0035 before the higher-order terms).
    expect(out.result.rmsCm1).toBeLessThanOrEqual(0.005);
    expect(out.result.nLines).toBeGreaterThan(3000);
  }, 300_000);

  it('simulates the perturbation-allowed lines with intensities near the database’s, relative to an allowed line from the same lower level', () => {
    const file = systemFileParse(systemText);
    const model = { ...file.model, jMax: 23, kMax: 23 };
    // Band strengths: ν2 = 1, ν4 from the allowed lines (the median sim/db ratio of each band with
    // equal strengths); both signs of the ν4 moment are tried and reported.
    const run = (sign: 1 | -1, strength4: number) => {
      model.species[0].bands = [
        { name: 'nu2', upper: 'v2', lower: 'ground', strength: 1 },
        { name: 'nu4', upper: 'v4', lower: 'ground', strength: strength4, momentSign: sign },
      ];
      const sim = systemLines(model);
      const simBy = new Map<string, number>();
      for (let i = 0; i < sim.count; i++) {
        const key = `${sim.bandRefs[sim.bandIndex[i]].band} ${sim.jUpper[i]} ${sim.kUpper[i]} ${sim.lUpper[i]} ${sim.tagUpper[i]} ${sim.jLower[i]} ${sim.kLower[i]} ${sim.tagLower[i]}`;
        simBy.set(key, (simBy.get(key) ?? 0) + sim.intensity[i]);
      }
      // Database intensities by the same labels (A+/A− duplicates summed), then per lower level the
      // strongest allowed line (ν2 ΔK = 0, ν4 ΔK = ±1) as the reference of every forbidden one.
      const db = new Map<string, { s: number; lower: string; isForbidden: boolean }>();
      kept.forEach((r) => {
        const line = ph3FitLines([r])[0];
        const key = `${r.band} ${line.jUpper} ${line.kUpper} ${line.lUpper} ${line.tagUpper} ${line.jLower} ${line.kLower} ${line.tagLower}`;
        const dk = r.kUp - r.kLo;
        const isForbidden = r.band === 'nu2' ? dk !== 0 : Math.abs(dk) !== 1;
        const prev = db.get(key);
        db.set(key, { s: (prev?.s ?? 0) + r.intensity, lower: `${r.jLo} ${r.kLo} ${line.tagLower}`, isForbidden });
      });
      const allowedRatio = (band: string) => {
        const q = [...db]
          .filter(([key, d]) => !d.isForbidden && key.startsWith(band + ' ') && simBy.get(key))
          .map(([key, d]) => simBy.get(key)! / d.s)
          .sort((a, b) => a - b);
        return q[q.length >> 1];
      };
      const bandScale = allowedRatio('nu2') / allowedRatio('nu4');
      const refOf = new Map<string, { key: string; s: number }>();
      for (const [key, d] of db) if (!d.isForbidden && d.s > (refOf.get(d.lower)?.s ?? 0)) refOf.set(d.lower, { key, s: d.s });
      const strongest = Math.max(...[...db.values()].filter((d) => d.isForbidden).map((d) => d.s));
      const ratios: number[] = [];
      let missing = 0;
      for (const [key, d] of db) {
        // "The stronger ones": forbidden lines within a factor 100 of the strongest forbidden line.
        if (!d.isForbidden || d.s < strongest / 100) continue;
        const ref = refOf.get(d.lower);
        if (!ref || !simBy.get(ref.key)) continue;
        const s = simBy.get(key);
        if (!s) {
          missing++;
          continue;
        }
        ratios.push(s / simBy.get(ref.key)! / (d.s / ref.s));
      }
      ratios.sort((a, b) => a - b);
      const within = ratios.filter((q) => q >= 1 / 1.5 && q <= 1.5).length;
      return {
        bandScale,
        n: ratios.length,
        missing,
        within,
        median: ratios[ratios.length >> 1],
        p10: ratios[Math.floor(ratios.length * 0.1)],
        p90: ratios[Math.floor(ratios.length * 0.9)],
      };
    };
    const strength4 = run(1, 1).bandScale;
    const plus = run(1, strength4);
    const minus = run(-1, strength4);
    console.log(
      `PH3 dyad intensities, stronger perturbation-allowed lines (sim/db relative to the strongest allowed line of the same lower level): ` +
        `ν4/ν2 band strength ${strength4.toFixed(3)} (from the allowed lines); momentSign +1: ${plus.n} lines (${plus.missing} not simulated), ${plus.within} within a factor 1.5, median ${plus.median.toFixed(3)}, 10–90 % ${plus.p10.toFixed(3)}–${plus.p90.toFixed(3)}; ` +
        `momentSign −1: ${minus.within}/${minus.n} within 1.5, median ${minus.median.toFixed(3)}`,
    );
    expect(minus.n).toBeGreaterThan(100);
    // Every stronger forbidden line of the list is produced by the simulation.
    expect(minus.missing).toBe(0);
    // With the ν4 moment of opposite sign to ν2's (in this basis's phases) the borrowed intensities
    // follow the database's: measured 102 of 110 within a factor 1.5, median ratio 0.989. The bounds
    // (80 %, median 0.8–1.25) leave room for the fit's residual mixing errors; the other sign fails
    // them (15 of 110), so the comparison is a test of the interference, not of the scale alone.
    expect(minus.within / minus.n).toBeGreaterThan(0.8);
    expect(minus.median).toBeGreaterThan(0.8);
    expect(minus.median).toBeLessThan(1.25);
    expect(plus.within / plus.n).toBeLessThan(0.5);
  }, 300_000);
});
