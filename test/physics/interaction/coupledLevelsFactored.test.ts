import { describe, expect, it } from 'vitest';
import { coupledGroupCreate, coupledLevels, type CoupledGroup } from '../../../src/physics/interaction/coupledLevels';

function valuesOf(g: CoupledGroup, constants: Record<string, number>): Float64Array {
  return Float64Array.from(g.parameters, (p) => constants[`${p.owner}.${p.name}`] ?? 0);
}

/**
 * The factored solver (connected components, band eigen-solver) against the dense one on the whole
 * class block (householderEigen, the solver the levels were computed with before): same levels to
 * 1e-9 cm⁻¹, same labels, same composition |c|² of every eigenvector over the unfolded basis, same
 * ∂E/∂p. The dense solver is an independent check here: it does not factor the block and shares no
 * code with the band solver beyond the idea of QL on a tridiagonal matrix.
 *
 * Levels of one block closer than 1e-4 cm⁻¹ (high-J near-degenerate pairs, e.g. two K of v2 within
 * 1e-8 cm⁻¹ at J = 60) have eigenvectors fixed only to ~ε‖H‖/gap (a rotation inside the pair that
 * either solver may make); for them the pair's sums are compared (its projector Σ|c|² and its summed
 * ∂E/∂p are as well determined as a single level's; standard perturbation theory, Golub and Van
 * Loan (2013) §8.1.3).
 */
function expectSameLevels(group: CoupledGroup, values: Float64Array, J: number): { worstEnergy: number; worstWeight: number } {
  const f = coupledLevels(group, J, values, { solver: 'factored' });
  const d = coupledLevels(group, J, values, { solver: 'dense' });
  expect(f.count).toBe(d.count);
  let worstEnergy = 0;
  let worstWeight = 0;
  const nP = group.parameters.length;
  for (let i = 0; i < f.count; i++) {
    const where = `J=${J} level ${i}`;
    expect([f.state[i], f.K[i], f.l[i], f.tag[i], f.sigma[i], f.componentCount[i]], where).toEqual([
      d.state[i],
      d.K[i],
      d.l[i],
      d.tag[i],
      d.sigma[i],
      d.componentCount[i],
    ]);
    worstEnergy = Math.max(worstEnergy, Math.abs(f.energyCm1[i] - d.energyCm1[i]));
    expect(f.block[i].basisK).toEqual(d.block[i].basisK);
  }
  // Clusters: levels of one block and σv half, sorted by energy, split where the gap exceeds 1e-4 cm⁻¹.
  const byBlock = new Map<string, number[]>();
  for (let i = 0; i < f.count; i++) {
    const key = `${f.block[i].basisK.length}:${f.block[i].isMirrored}:${f.sigma[i]}`;
    byBlock.set(key, [...(byBlock.get(key) ?? []), i]);
  }
  for (const list of byBlock.values()) {
    list.sort((a, b) => f.energyCm1[a] - f.energyCm1[b]);
    for (let s = 0; s < list.length;) {
      let e = s + 1;
      while (e < list.length && f.energyCm1[list[e]] - f.energyCm1[list[e - 1]] < 1e-4) e++;
      const members = list.slice(s, e);
      const where = `J=${J} levels ${members.join(',')}`;
      const n = f.vector[members[0]].length;
      for (let c = 0; c < n; c++) {
        let sf = 0;
        let sd = 0;
        for (const i of members) {
          sf += f.vector[i][c] ** 2;
          sd += d.vector[i][c] ** 2;
        }
        worstWeight = Math.max(worstWeight, Math.abs(sf - sd));
      }
      if (members.length === 1) expect(Math.abs(f.labelWeight[members[0]] - d.labelWeight[members[0]]), where).toBeLessThan(1e-9);
      // ∂E/∂p summed over the cluster, to 1e-9 relative to the size of the row (rotor derivatives
      // reach J⁸ ~ 1e14 at J = 60).
      const fg = new Float64Array(nP);
      const dg = new Float64Array(nP);
      for (const i of members)
        for (let p = 0; p < nP; p++) {
          fg[p] += f.levelGradient(i)[p];
          dg[p] += d.levelGradient(i)[p];
        }
      let scale = 0;
      for (let p = 0; p < nP; p++) scale = Math.max(scale, Math.abs(dg[p]));
      for (let p = 0; p < nP; p++)
        expect(Math.abs(fg[p] - dg[p]), `${where} ∂/∂${group.parameters[p].name}`).toBeLessThan(1e-9 * scale + 1e-12);
      s = e;
    }
  }
  return { worstEnergy, worstWeight };
}

describe('coupledLevels: factored solver against the dense one', () => {
  it('gives the same levels, labels, compositions and derivatives on a PH3-like dyad (J up to 60)', () => {
    // Invented constants of the size of PH3's ν2/ν4 (cm⁻¹), not a published set; C1 strong enough to
    // mix the states heavily at high J, and every ΔK = ±2 term on so each class is one component.
    const dyad = coupledGroupCreate(
      'oblate',
      [
        { name: 'v2', isDegenerate: false },
        { name: 'v4', isDegenerate: true },
      ],
      [{ name: 'c', type: 'coriolis', stateA: 0, stateB: 1 }],
    );
    const values = valuesOf(dyad, {
      'v2.origin': 992.1,
      'v2.B': 4.512,
      'v2.C': 3.949,
      'v2.DJ': 1.1e-4,
      'v2.DJK': -1.06e-4,
      'v2.DK': 1.03e-4,
      'v2.h3': 2e-9,
      'v4.origin': 1118.3,
      'v4.B': 4.433,
      'v4.C': 3.898,
      'v4.DJ': 1.5e-4,
      'v4.DJK': -2.27e-4,
      'v4.DK': 1.77e-4,
      'v4.zeta': -0.445,
      'v4.etaJ': 2.1e-3,
      'v4.etaK': -2.3e-3,
      'v4.q22': -0.0626,
      'v4.q22J': -2.4e-5,
      'v4.q12': 0.001,
      'c.C1': 3.92,
      'c.C1J': -4.9e-4,
      'c.C1K': -6.3e-4,
      'c.C2': 0.0515,
      'c.C2J': -1.8e-5,
    });
    let worstEnergy = 0;
    let worstWeight = 0;
    for (const J of [0, 1, 2, 3, 7, 20, 41, 60]) {
      const w = expectSameLevels(dyad, values, J);
      worstEnergy = Math.max(worstEnergy, w.worstEnergy);
      worstWeight = Math.max(worstWeight, w.worstWeight);
    }
    // Energies ~1.8e4 cm⁻¹ at J = 60: 1e-9 cm⁻¹ is ~3e5 ε of them; compositions to 1e-9.
    expect(worstEnergy).toBeLessThan(1e-9);
    expect(worstWeight).toBeLessThan(1e-9);
  });

  it('gives the same levels on a Fermi + Coriolis triad (two nondegenerate states in Fermi resonance, one Coriolis-coupled to an E state)', () => {
    const triad = coupledGroupCreate(
      'prolate',
      [
        { name: 'a', isDegenerate: false },
        { name: 'b', isDegenerate: false },
        { name: 'e', isDegenerate: true },
      ],
      [
        { name: 'f', type: 'fermi', stateA: 0, stateB: 1 },
        { name: 'c', type: 'coriolis', stateA: 1, stateB: 2 },
      ],
    );
    // Invented constants: a and b 3 cm⁻¹ apart with W = 1.5 cm⁻¹, e Coriolis-coupled to b.
    const values = valuesOf(triad, {
      'a.origin': 1500,
      'a.B': 0.35,
      'a.A': 5.2,
      'a.DJ': 3e-7,
      'b.origin': 1503,
      'b.B': 0.352,
      'b.A': 5.1,
      'b.DJ': 3.1e-7,
      'b.h3': 1e-10,
      'e.origin': 1520,
      'e.B': 0.349,
      'e.A': 5.15,
      'e.zeta': 0.3,
      'e.q22': 3e-4,
      'f.W': 1.5,
      'f.WJ': 1e-5,
      'c.C1': 0.12,
      'c.C2': 2e-3,
    });
    for (const J of [0, 1, 4, 15, 40]) {
      const w = expectSameLevels(triad, values, J);
      expect(w.worstEnergy).toBeLessThan(1e-9);
      expect(w.worstWeight).toBeLessThan(1e-9);
    }
  });

  it('splits a block whose terms conserve more than the class (Δk = ±1 Coriolis alone): exact zeros outside each sub-block, hand-worked J = 1 levels', () => {
    // Only C1 on: k − ℓ is conserved exactly (not only mod 3), so each class falls apart into
    // sub-blocks of at most three functions, found from the non-zero pattern alone.
    const dyad = coupledGroupCreate(
      'oblate',
      [
        { name: 'v2', isDegenerate: false },
        { name: 'v4', isDegenerate: true },
      ],
      [{ name: 'c', type: 'coriolis', stateA: 0, stateB: 1 }],
    );
    const C1 = 3;
    const E2 = 990;
    const E4 = 1120;
    const r = coupledLevels(dyad, 1, valuesOf(dyad, { 'v2.origin': E2, 'v4.origin': E4, 'c.C1': C1 }));
    // J = 1 by hand (as in coupledLevels.test.ts): ⟨v4; ±1, ±1|H|v2; 0⟩ = ±C1√2, so v2 K = 0 and the
    // σv = −1 member of v4 K = 1 (+l) sit at mean ∓ √(Δ²/4 + 4C1²); 3 class-0 and 3 class-1 levels.
    expect(r.count).toBe(6);
    const half = Math.sqrt(((E4 - E2) / 2) ** 2 + 4 * C1 * C1);
    const at = (state: number, K: number, l: number, tag: string) =>
      r.energyCm1[[...Array(r.count).keys()].find((j) => r.state[j] === state && r.K[j] === K && r.l[j] === l && r.tag[j] === tag)!];
    expect(at(0, 0, 0, '')).toBeCloseTo((E2 + E4) / 2 - half, 10);
    expect(at(1, 1, 1, 'A2')).toBeCloseTo((E2 + E4) / 2 + half, 10);
    const values = valuesOf(dyad, {
      'v2.origin': E2,
      'v4.origin': E4,
      'v2.B': 4.4,
      'v2.C': 3.9,
      'v4.B': 4.45,
      'v4.C': 3.88,
      'v4.zeta': -0.44,
      'c.C1': C1,
    });
    for (const J of [1, 5, 30]) {
      expectSameLevels(dyad, values, J);
      const f = coupledLevels(dyad, J, values);
      for (let i = 0; i < f.count; i++) {
        // k − ℓ of the largest component; every component of another k − ℓ must be exactly 0 (the
        // dense solver leaves round-off there), σv partners (−(k − ℓ)) included in a folded level.
        const b = f.block[i];
        const u = f.vector[i];
        let big = 0;
        for (let c = 1; c < u.length; c++) if (Math.abs(u[c]) > Math.abs(u[big])) big = c;
        const g = b.basisK[big] - b.basisEll[big];
        for (let c = 0; c < u.length; c++) {
          const gc = b.basisK[c] - b.basisEll[c];
          if (gc !== g && gc !== -g) expect(u[c], `J=${J} level ${i} component ${c}`).toBe(0);
        }
      }
    }
  });
});
