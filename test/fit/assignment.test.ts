import { describe, expect, it } from 'vitest';
import { assignmentCheck } from '../../src/fit/assignment';

const prolatePerp = { band: 'perpendicular', shape: 'prolate' } as const;
const prolatePar = { band: 'parallel', shape: 'prolate' } as const;

describe('assignmentCheck', () => {
  // Selection rules of symmetric-top bands: Herzberg II (1945) ch. IV (ΔK = 0 parallel,
  // ΔK = ±1 perpendicular, ΔJ = 0, ±1, K ≤ J).
  it('accepts allowed lines', () => {
    expect(assignmentCheck({ jUpper: 5, kUpper: 3, jLower: 4, kLower: 2 }, prolatePerp)).toBeNull();
    expect(assignmentCheck({ jUpper: 5, kUpper: 2, jLower: 5, kLower: 2 }, prolatePar)).toBeNull();
  });

  it('refuses K > J with the values', () => {
    expect(assignmentCheck({ jUpper: 2, kUpper: 3, jLower: 3, kLower: 2 }, prolatePerp)).toMatch(/K_up=3 exceeds J_up=2/);
  });

  it('refuses a ΔK the band type forbids', () => {
    expect(assignmentCheck({ jUpper: 5, kUpper: 3, jLower: 4, kLower: 2 }, prolatePar)).toMatch(/ΔK = 1 is not allowed in a parallel band/);
    expect(assignmentCheck({ jUpper: 5, kUpper: 2, jLower: 4, kLower: 2 }, prolatePerp)).toMatch(
      /ΔK = 0 is not allowed in a perpendicular band/,
    );
  });

  it('refuses negative and non-integer quantum numbers', () => {
    expect(assignmentCheck({ jUpper: -1, kUpper: 0, jLower: 0, kLower: 0 }, prolatePar)).toMatch(/J_up must be >= 0, got -1/);
    expect(assignmentCheck({ jUpper: 1.5, kUpper: 0, jLower: 0, kLower: 0 }, prolatePar)).toMatch(/J_up must be a whole number, got 1.5/);
  });

  it('refuses ΔJ = 2 and the missing Q line of K = 0 in a parallel band', () => {
    expect(assignmentCheck({ jUpper: 6, kUpper: 0, jLower: 4, kLower: 0 }, prolatePar)).toMatch(/ΔJ = 2/);
    expect(assignmentCheck({ jUpper: 4, kUpper: 0, jLower: 4, kLower: 0 }, prolatePar)).toMatch(/no Q line with K = 0/);
  });
});
