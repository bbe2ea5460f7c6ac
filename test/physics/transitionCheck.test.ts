import { describe, expect, it } from 'vitest';
import { bandLines } from '../../src/physics/bandLines';
import { stateConstantsFrom } from '../../src/physics/model';
import { transitionCheck } from '../../src/physics/transitionCheck';

const q = (jUpper: number, kUpper: number, jLower: number, kLower: number) => ({ jUpper, kUpper, jLower, kLower });

// Selection rules: Herzberg II (1945) ch. IV (symmetric tops) and Herzberg, Spectra of Diatomic
// Molecules (1950) ch. V (Σ–Σ, Π–Σ), as the headless contract states them.
describe('transitionCheck', () => {
  it('accepts allowed lines of each band type', () => {
    expect(transitionCheck(q(4, 3, 3, 2), 'perpendicular', 'prolate')).toBeNull(); // rR2(3)
    expect(transitionCheck(q(3, 1, 3, 2), 'perpendicular', 'prolate')).toBeNull(); // pQ2(3)
    expect(transitionCheck(q(1, 1, 0, 0), 'perpendicular', 'oblate')).toBeNull(); // rR0(0)
    expect(transitionCheck(q(5, 2, 5, 2), 'parallel', 'prolate')).toBeNull(); // qQ2(5)
    expect(transitionCheck(q(4, 0, 5, 0), 'parallel', 'prolate')).toBeNull(); // qP0(5)
    expect(transitionCheck(q(6, 0, 5, 0), 'parallel', 'linear')).toBeNull(); // R(5) Σ–Σ
    expect(transitionCheck(q(5, 1, 5, 0), 'perpendicular', 'linear')).toBeNull(); // Q(5) Π–Σ
  });

  it.each([
    [q(2.5, 0, 1, 0), 'parallel', 'prolate', /J_up must be a whole number, got 2.5/],
    [q(1, 0, -1, 0), 'parallel', 'prolate', /J_lo must be >= 0, got -1/],
    [q(3, 4, 3, 3), 'perpendicular', 'prolate', /K_up=4 exceeds J_up=3/],
    [q(3, 2, 2, 3), 'perpendicular', 'prolate', /K_lo=3 exceeds J_lo=2/],
    [q(6, 2, 4, 2), 'parallel', 'prolate', /ΔJ = 2 is not allowed/],
    [q(5, 3, 5, 2), 'parallel', 'prolate', /ΔK = 1 is not allowed in a parallel band/],
    [q(5, 2, 5, 2), 'perpendicular', 'prolate', /ΔK = 0 is not allowed in a perpendicular band/],
    [q(5, 4, 5, 2), 'perpendicular', 'prolate', /ΔK = 2 is not allowed/],
    [q(5, 0, 5, 0), 'parallel', 'prolate', /no Q line with K = 0/],
    [q(5, 1, 5, 1), 'perpendicular', 'linear', /K_lo must be 0 for a linear molecule, got 1/],
    [q(5, 1, 4, 0), 'parallel', 'linear', /K_up must be 0 for a Σ–Σ band/],
    [q(5, 0, 5, 0), 'parallel', 'linear', /no Q branch/],
  ] as const)('refuses %o in a %s band of a %s top', (quanta, band, shape, message) => {
    expect(transitionCheck(quanta, band, shape)).toMatch(message);
  });

  it('refuses ΔK = −1 from K″ = 0 (no level K′ = −1)', () => {
    // K' = K'' − 1 = −1 is not a level; as unsigned quanta it shows up as K_up = -1.
    expect(transitionCheck(q(2, -1, 2, 0), 'perpendicular', 'prolate')).toMatch(/K_up must be >= 0/);
  });

  it('accepts every line bandLines produces', () => {
    const m = {
      shape: 'prolate' as const,
      band: 'perpendicular' as const,
      lower: stateConstantsFrom({ B: 0.3, A: 2.5 }),
      upper: stateConstantsFrom({ origin: 1100, B: 0.3, A: 2.5, zeta: 0.2 }),
      temperatureK: 296,
      jMax: 25,
      kMax: 10,
      spinWeights: [1],
    };
    for (const band of ['parallel', 'perpendicular'] as const) {
      const lines = bandLines({ ...m, band });
      for (let i = 0; i < lines.count; i++) {
        const r = transitionCheck(q(lines.jUpper[i], lines.kUpper[i], lines.jLower[i], lines.kLower[i]), band, 'prolate');
        expect(r).toBeNull();
      }
    }
  });
});
