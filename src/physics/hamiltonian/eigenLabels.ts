/**
 * Label each eigenvector of a block by a basis function, uniquely within the block.
 *
 * Rule: the pair (eigenvector j, basis function i) with the largest weight |c_ij|² is fixed first,
 * then the largest among the remaining rows and columns, and so on (greedy maximum overlap). When
 * every eigenvector's own largest component is a different basis function — the usual case — this
 * is simply "labelled by its largest component"; when two eigenvectors are ~50/50 mixtures of the
 * same two basis functions, the greedy rule gives them the two different labels, so a label never
 * appears twice in a block. The weight of the chosen component is returned so callers can flag a
 * label as uncertain (weight near 0.5 means the two labels could as well be swapped).
 * Source: common practice in effective-Hamiltonian fitting (labelling by the dominant basis
 * component); the greedy assignment is the standard 1/2-approximation of the linear assignment
 * problem, exact here whenever the largest components are distinct.
 */

/** Result of eigenLabelsAssign. */
export interface EigenLabels {
  /** basisIndex[j] = basis function that labels eigenvector j. */
  basisIndex: Int32Array;
  /** weight[j] = |c|² of that component (between 1/n and 1). */
  weight: Float64Array;
}

/**
 * Assign distinct basis labels to the n eigenvectors of an n×n block by maximum overlap.
 * @param vectors column-major n×n, column j = eigenvector j (dimensionless coefficients)
 * @param n order of the block
 * @returns the basis index and its weight |c|² per eigenvector
 */
export function eigenLabelsAssign(vectors: ArrayLike<number>, n: number): EigenLabels {
  if (vectors.length < n * n) throw new Error(`eigenLabelsAssign: need ${n * n} coefficients for order ${n}, got ${vectors.length}`);
  const basisIndex = new Int32Array(n);
  const weight = new Float64Array(n);
  // Fast path: every eigenvector's largest component is distinct.
  const taken = new Uint8Array(n);
  let distinct = true;
  for (let j = 0; j < n && distinct; j++) {
    let best = 0;
    let bestW = -1;
    for (let i = 0; i < n; i++) {
      const w = vectors[j * n + i] * vectors[j * n + i];
      if (w > bestW) {
        bestW = w;
        best = i;
      }
    }
    if (taken[best]) distinct = false;
    taken[best] = 1;
    basisIndex[j] = best;
    weight[j] = bestW;
  }
  if (distinct) return { basisIndex, weight };

  // Greedy on all pairs by descending weight (ties: lower pair index j·n + i first). The next pair
  // fixed is the largest among the free rows and columns; each free eigenvector keeps its best free
  // basis function, recomputed only when that one is taken, so the visiting order is that of one
  // full sort of the n² pairs at O(n²) cost when few best components coincide.
  const vectorDone = new Uint8Array(n);
  const basisDone = new Uint8Array(n);
  const bestIndex = new Int32Array(n);
  const bestWeight = new Float64Array(n);
  const bestFree = (j: number): void => {
    let best = -1;
    let bestW = -1;
    for (let i = 0; i < n; i++) {
      if (basisDone[i]) continue;
      const w = vectors[j * n + i] * vectors[j * n + i];
      if (w > bestW) {
        bestW = w;
        best = i;
      }
    }
    bestIndex[j] = best;
    bestWeight[j] = bestW;
  };
  for (let j = 0; j < n; j++) bestFree(j);
  for (let left = n; left > 0; left--) {
    let next = -1;
    for (let j = 0; j < n; j++) if (!vectorDone[j] && (next < 0 || bestWeight[j] > bestWeight[next])) next = j;
    const i = bestIndex[next];
    vectorDone[next] = 1;
    basisDone[i] = 1;
    basisIndex[next] = i;
    weight[next] = bestWeight[next];
    for (let j = 0; j < n; j++) if (!vectorDone[j] && bestIndex[j] === i) bestFree(j);
  }
  return { basisIndex, weight };
}
