import { readFileSync } from 'node:fs';
import { beforeEach, describe, expect, it } from 'vitest';
import { cliMain } from '../../src/cli/main';
import type { Assignment } from '../../src/fit/assignment';
import { fitBand } from '../../src/fit/fitBand';
import { lineTableSerialize } from '../../src/io/lineTable';
import { modelFileParse, modelFileSerialize } from '../../src/io/modelFile';
import { bandLines } from '../../src/physics/bandLines';
import { fitStart } from '../../src/state/actionsFit';
import { benchReset, benchStore } from '../../src/state/store';

// A fit run from the page equals the CLI's fit of the files the page exports, to the last digit the
// CLI prints (it prints full double precision): both call the same engine on the same numbers, and
// the exported files must carry every digit. Data: the invented demo band (public/demo), lines
// simulated from its true constants with a seeded perturbation — engine-made, for this round trip only.
describe('page fit versus CLI fit of the exported files', () => {
  beforeEach(() => benchReset());

  it('gives identical constants, sigmas, rms and sigmaW', async () => {
    const truth = modelFileParse(readFileSync('public/demo/truth.json', 'utf8')).model;
    const guess = modelFileParse(readFileSync('public/demo/model.json', 'utf8'));
    const lines = bandLines(truth, { minIntensity: 0.05 });
    let seed = 12345;
    const uniform = () => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;
    const assignments: Assignment[] = [];
    for (let i = 0; i < lines.count && assignments.length < 400; i += 3) {
      assignments.push({
        id: `a${i}`,
        jUpper: lines.jUpper[i],
        kUpper: lines.kUpper[i],
        jLower: lines.jLower[i],
        kLower: lines.kLower[i],
        observedCm1: lines.wavenumberCm1[i] + 0.0004 * (uniform() - 0.5),
        uncertaintyCm1: 0.0002,
        isBlended: false,
        isExcluded: false,
        note: '',
      });
    }
    benchStore.setState({ model: guess.model, floated: guess.floated, assignments });
    await fitStart(async (input) => fitBand(input));
    const page = benchStore.getState().fitOutcome;
    expect(page?.ok).toBe(true);
    if (!page?.ok) return;

    const s = benchStore.getState();
    const files: Record<string, string> = {
      'm.json': modelFileSerialize({ model: s.model, floated: s.floated, name: s.modelName, massAmu: s.massAmu }),
      'l.csv': lineTableSerialize(s.assignments, { shape: s.model.shape }),
    };
    let out = '';
    let err = '';
    const code = await cliMain(['fit', '--model', 'm.json', '--lines', 'l.csv'], {
      stdout: (t) => void (out += t),
      stderr: (t) => void (err += t),
      readFile: (p) => files[p],
    });
    expect(err).toBe('');
    expect(code).toBe(0);
    const cli = JSON.parse(out);
    for (const [key, p] of Object.entries(page.result.parameters)) {
      expect(cli.parameters[key].value, key).toBe(p.value);
      expect(cli.parameters[key].sigma, key).toBe(p.sigma);
      expect(cli.parameters[key].fixed, key).toBe(p.fixed);
    }
    expect(cli.rms).toBe(page.result.rmsCm1);
    expect(cli.sigmaW).toBe(page.result.sigmaW);
    expect(cli.nLines).toBe(page.result.nLines);
  });
});
