/**
 * The factored solver (connected components, band eigen-solver, half bandwidth 6 with every
 * higher-order term on) against the dense one (householderEigen on the whole class block), with the
 * PH3 ν2/ν4 constants of test/fixtures/systems/ph3-dyad.json (fitted to the HITRAN 2012 lines,
 * test/fit/ph3Dyad.test.ts: h3, ε, C1…C1JJ, C2…C2JK, C4, C5): energies and signed eigenvectors, and
 * the vectors' signs and labels from one J to the next.
 *
 * The dense solver is the independent check: it does not factor the block and shares no code with
 * the band solver beyond the idea of QL on a tridiagonal matrix. Eigenvectors are fixed only to
 * ~ε‖H‖/gap (Golub and Van Loan (2013) §8.1.3; ‖H‖ ~ 2·10⁴ cm⁻¹ at J = 60), so a level closer than
 * 0.01 cm⁻¹ to another of its block is compared through the cluster's projector Σ c cᵀ, which is as
 * well determined as a single vector.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { systemFileParse } from '../../../src/io/systemFile';
import { coupledLevels, type CoupledLevels } from '../../../src/physics/interaction/coupledLevels';
import { speciesLevelSources } from '../../../src/physics/interaction/speciesLevelSources';

const text = readFileSync(fileURLToPath(new URL('../../fixtures/systems/ph3-dyad.json', import.meta.url)), 'utf8');
const source = speciesLevelSources(systemFileParse(text).model.species[0]).get('v4')!;
const group = source.coupled!.group;
const values = source.values;

/** Levels of one block and σv half, by energy, split where the gap exceeds `gapCm1`. */
function clusters(levels: CoupledLevels, gapCm1: number): number[][] {
  const byBlock = new Map<string, number[]>();
  for (let i = 0; i < levels.count; i++) {
    const key = `${levels.block[i].isMirrored}:${levels.sigma[i]}`;
    byBlock.set(key, [...(byBlock.get(key) ?? []), i]);
  }
  const out: number[][] = [];
  for (const list of byBlock.values()) {
    list.sort((a, b) => levels.energyCm1[a] - levels.energyCm1[b]);
    for (let s = 0; s < list.length;) {
      let e = s + 1;
      while (e < list.length && levels.energyCm1[list[e]] - levels.energyCm1[list[e - 1]] < gapCm1) e++;
      out.push(list.slice(s, e));
      s = e;
    }
  }
  return out;
}

const label = (levels: CoupledLevels, i: number) =>
  `${group.states[levels.state[i]].name} K=${levels.K[i]} l=${levels.l[i]} ${levels.tag[i]}`;

describe('coupledLevels with the full PH3 ν2/ν4 term set: band solver against the dense one', () => {
  it('gives the same energies (1e-9 relative) and the same signed eigenvectors (1e-9) at J = 1, 6, 17, 30, 45, 60', () => {
    let worstEnergy = 0;
    let worstVector = 0;
    let singles = 0;
    let total = 0;
    for (const J of [1, 6, 17, 30, 45, 60]) {
      const f = coupledLevels(group, J, values, { solver: 'factored' });
      const d = coupledLevels(group, J, values, { solver: 'dense' });
      expect(f.count).toBe(d.count);
      total += d.count;
      for (let i = 0; i < f.count; i++) {
        const where = `J=${J} level ${i} (${label(d, i)})`;
        expect(label(f, i), where).toBe(label(d, i));
        worstEnergy = Math.max(worstEnergy, Math.abs(f.energyCm1[i] - d.energyCm1[i]) / Math.abs(d.energyCm1[i]));
      }
      for (const members of clusters(d, 0.01)) {
        const n = d.vector[members[0]].length;
        if (members.length === 1) {
          // A single level: its vector, sign included (labelling component positive in both).
          const i = members[0];
          for (let c = 0; c < n; c++) worstVector = Math.max(worstVector, Math.abs(f.vector[i][c] - d.vector[i][c]));
          singles++;
          continue;
        }
        // A cluster: its projector, entry by entry.
        for (let a = 0; a < n; a++)
          for (let b = 0; b <= a; b++) {
            let pf = 0;
            let pd = 0;
            for (const i of members) {
              pf += f.vector[i][a] * f.vector[i][b];
              pd += d.vector[i][a] * d.vector[i][b];
            }
            worstVector = Math.max(worstVector, Math.abs(pf - pd));
          }
      }
    }
    // Nearly every level is a single one (the check is not carried by the clusters).
    expect(singles).toBeGreaterThan(0.9 * total);
    expect(worstEnergy).toBeLessThan(1e-9);
    expect(worstVector).toBeLessThan(1e-9);
  });

  it('keeps each level’s sign and label from one J to the next (J = 1 … 60) wherever the label is clear', () => {
    // A level's coefficients over the folded basis of its block, by basis function |state; k, ℓ⟩:
    // class 1 as it is; class 0 by its σv pairs (|k, ℓ⟩ ± (−1)^{J+k}|−k, −ℓ⟩)/√2, read on the first
    // member (k < 0, or k = 0 with ℓ = +1) times √2 (the second carries the phase, which alternates
    // with J), and |v2; k = 0⟩ alone.
    const folded = (levels: CoupledLevels, i: number): Map<string, number> => {
      const b = levels.block[i];
      const m = new Map<string, number>();
      for (let t = 0; t < b.basisK.length; t++) {
        const k = b.basisK[t];
        const ell = b.basisEll[t];
        const key = `${b.basisState[t]}:${k}:${ell}`;
        if (b.isMirrored) m.set(key, levels.vector[i][t]);
        else if (k === 0 && ell === 0) m.set(key, levels.vector[i][t]);
        else if (k < 0 || (k === 0 && ell > 0)) m.set(key, Math.SQRT2 * levels.vector[i][t]);
      }
      return m;
    };
    let previous = coupledLevels(group, 0, values, { solver: 'factored' });
    let compared = 0;
    let worstOverlap = 1;
    const swaps: string[] = [];
    for (let J = 1; J <= 60; J++) {
      const current = coupledLevels(group, J, values, { solver: 'factored' });
      const before = Array.from({ length: previous.count }, (_, j) => folded(previous, j));
      const byLabel = new Map<string, number>();
      for (let j = 0; j < previous.count; j++) byLabel.set(label(previous, j), j);
      for (let i = 0; i < current.count; i++) {
        const j0 = byLabel.get(label(current, i));
        // A new K, or a label that is not clear at either J (an avoided crossing: ν4 K = 2 and 3 (+l)
        // are 50/50 near J = 4, for one): nothing to follow.
        if (j0 === undefined || current.labelWeight[i] <= 0.75 || previous.labelWeight[j0] <= 0.75) continue;
        const now = folded(current, i);
        const overlap = (j: number) => {
          let s = 0;
          for (const [key, c] of now) s += c * (before[j].get(key) ?? 0);
          return s;
        };
        const same = overlap(j0);
        worstOverlap = Math.min(worstOverlap, same);
        compared++;
        // Label continuity: no other clearly labelled level of J − 1 in the same block (and σv half,
        // for an A1/A2 member) is closer to this one. (An unclear one is itself in an avoided crossing,
        // whose composition changes fast with J: v4 K = 47 (−l), 0.748 at J = 48, crossing v2 K = 48
        // between J = 48 and 49, for one.)
        const isRival = (j: number) =>
          j !== j0 &&
          previous.labelWeight[j] > 0.75 &&
          previous.block[j].isMirrored === current.block[i].isMirrored &&
          (current.tag[i] === '' || previous.sigma[j] === current.sigma[i]);
        for (let j = 0; j < previous.count; j++)
          if (isRival(j) && Math.abs(overlap(j)) > same)
            swaps.push(`J=${J} ${label(current, i)} is closer to ${label(previous, j)} than to its own label at J − 1`);
      }
      previous = current;
    }
    expect(compared).toBeGreaterThan(1500);
    expect(swaps).toEqual([]);
    // Positive and large: no sign flip (a flipped vector of the same level would give about −1;
    // measured worst 0.67, in the crossing of v2 K = 48 and v4 K = 47 (−l)).
    expect(worstOverlap).toBeGreaterThan(0.5);
  });
});
