import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { systemFileFromJson } from '../../../src/io/systemFile';
import { systemLines, type SystemLineList } from '../../../src/physics/system/systemLines';
import { speciesPartitionFunction } from '../../../src/physics/system/vibrationalPartition';

/** The fictitious C3v system file (invented constants: ground, v3, v6 (E), v3+v6 (E); rotational, ν3, ν6, hot bands). */
const C3V = JSON.parse(readFileSync(new URL('../../fixtures/systems/fictitious-c3v.json', import.meta.url), 'utf8')) as {
  species: Record<string, unknown>[];
};

/** The same file with the species' point group and its spin weights given by species instead of by K mod 3. */
function withSymmetry(extra: Record<string, unknown> = {}) {
  const json = structuredClone(C3V);
  const sp = json.species[0];
  delete sp.spinWeights;
  Object.assign(sp, { pointGroup: 'C3v', spinWeightsBySymmetry: { A1: 4, A2: 4, E: 2 } }, extra);
  return json;
}

/**
 * Sum the unnormalised strengths per (band, J', K', l', J'', K'', l''), the labels the closed-form engine
 * knows. (The normalised intensities differ by one factor: an unsplit A1/A2 pair is one line of the
 * closed-form engine but two lines of half its strength here, so "strongest line = 1" moves.)
 */
function byLevels(l: SystemLineList): Map<string, { nu: number; intensity: number; n: number }> {
  const out = new Map<string, { nu: number; intensity: number; n: number }>();
  for (let i = 0; i < l.count; i++) {
    const key = `${l.bandIndex[i]}|${l.jUpper[i]},${l.kUpper[i]},${l.lUpper[i]}|${l.jLower[i]},${l.kLower[i]},${l.lLower[i]}`;
    const e = out.get(key);
    if (e) {
      // Members of an unsplit A1/A2 pair: the same position.
      expect(Math.abs(e.nu - l.wavenumberCm1[i])).toBeLessThan(1e-9);
      e.intensity += l.strength[i];
      e.n++;
    } else out.set(key, { nu: l.wavenumberCm1[i], intensity: l.strength[i], n: 1 });
  }
  return out;
}

describe('systemLines with a declared point group (Hamiltonian providers)', () => {
  it('gives the closed-form lines, positions and intensities when only closed-form constants are used', () => {
    // Independent reference: the same file without pointGroup (closed-form term values, spinWeights [4, 2, 2]
    // by K mod 3, which is {"A1": 4, "A2": 4, "E": 2} per function; Herzberg II (1945) ch. I sec. 3).
    // Tolerance 1e-9 cm⁻¹ and 1e-9 relative: the diagonalised and closed-form energies differ by round-off only.
    const closed = systemLines(systemFileFromJson(C3V).model);
    const sym = systemFileFromJson(withSymmetry());
    const symLines = systemLines(sym.model);
    const a = byLevels(closed);
    const b = byLevels(symLines);
    expect(b.size).toBe(a.size);
    let pairs = 0;
    let worst = 0;
    for (const [key, ref] of a) {
      const got = b.get(key);
      expect(got, key).toBeDefined();
      expect(Math.abs(got!.nu - ref.nu)).toBeLessThan(1e-9);
      worst = Math.max(worst, Math.abs(got!.intensity - ref.intensity) / ref.intensity);
      if (got!.n === 2) pairs++;
    }
    expect(worst).toBeLessThan(1e-9);
    // The K = 3n A1/A2 pairs appear as two lines each (A1 ↔ A2 and A2 ↔ A1).
    expect(pairs).toBeGreaterThan(100);
    // Every line carries the species of its levels and obeys Γ' ⊗ Γ'' ⊇ A2.
    for (let i = 0; i < symLines.count; i++) {
      const pair = `${symLines.symUpper[i]}-${symLines.symLower[i]}`;
      expect(['A1-A2', 'A2-A1', 'E-E']).toContain(pair);
    }
    const q0 = speciesPartitionFunction(systemFileFromJson(C3V).model.species[0], 296);
    const q1 = speciesPartitionFunction(sym.model.species[0], 296);
    expect(Math.abs(q1 / q0 - 1)).toBeLessThan(1e-9);
  });

  it('splits the K′ = 1 (+l) pair by q22: P and R lines from K″ = 0 at +½q22·J′(J′+1), Q lines at −½q22·J′(J′+1)', () => {
    // Ref: first-order ℓ(2,2) splitting of the K = 1 (+l) levels of an E state, ±½ q22 J(J+1)
    // (DEVELOPERS.md, "Effective Hamiltonians"; the |1,+1⟩, |−1,−1⟩ pair couples to nothing else when
    // q12 = 0, so the shift is exact). Tolerance 1e-9 cm⁻¹ (round-off).
    const q22 = 4e-4;
    const json = withSymmetry();
    const states = json.species[0].states as Record<string, Record<string, unknown>>;
    states.v6.q22 = q22;
    const split = systemLines(systemFileFromJson(json).model);
    const plain = byLevels(systemLines(systemFileFromJson(C3V).model));
    const nu6 = split.bandRefs.findIndex((r) => r.band === 'nu6');
    let checked = 0;
    for (let i = 0; i < split.count; i++) {
      if (split.bandIndex[i] !== nu6 || split.kLower[i] !== 0 || split.kUpper[i] !== 1) continue;
      const key = `${nu6}|${split.jUpper[i]},1,1|${split.jLower[i]},0,0`;
      const x = split.jUpper[i] * (split.jUpper[i] + 1);
      const sign = split.deltaJ[i] === 0 ? -1 : 1;
      expect(Math.abs(split.wavenumberCm1[i] - (plain.get(key)!.nu + 0.5 * sign * q22 * x))).toBeLessThan(1e-9);
      checked++;
    }
    // J'' = 0 … 30: R(0…30), Q(1…30), P(2…30) (J' >= K' = 1).
    expect(checked).toBe(31 + 30 + 29);
  });

  it('keeps only even J in K = 0 and one member of each K = 3n pair for a D3h XY3 with spin-0 Y', () => {
    // Ref: Herzberg II (1945) ch. I sec. 3 (planar XY3 with spin-0 Y, e.g. ¹²C¹⁶O3-like SO3: in the ground
    // state only K = 3n levels exist, of K = 0 only even J), from memory; weights {"A1": 1, "A2": 0, "E": 0}.
    const json = {
      temperature: 200,
      jMax: 20,
      kMax: 12,
      species: [
        {
          name: 'Y',
          shape: 'oblate',
          pointGroup: 'D3h',
          spinWeightsBySymmetry: { A1: 1, A2: 0, E: 0 },
          states: { ground: { B: 0.35, C: 0.175 }, v2: { origin: 498, symmetry: "A2''", B: 0.349, C: 0.1748 } },
          bands: [{ name: 'nu2', upper: 'v2', lower: 'ground' }],
        },
      ],
    };
    const l = systemLines(systemFileFromJson(json).model);
    expect(l.count).toBeGreaterThan(100);
    const seen = new Map<string, number>();
    for (let i = 0; i < l.count; i++) {
      expect(l.kLower[i] % 3).toBe(0);
      if (l.kLower[i] === 0) expect(l.jLower[i] % 2).toBe(0);
      const key = `${l.jUpper[i]},${l.kUpper[i]},${l.jLower[i]},${l.kLower[i]}`;
      seen.set(key, (seen.get(key) ?? 0) + 1);
    }
    // One line per (J', K', J'', K''): only one member of each pair has weight.
    expect([...seen.values()].every((n) => n === 1)).toBe(true);
  });
});
