/**
 * A lower bound on Σ x_a from pairwise bounds x_i + x_j ≥ w_ij (x ≥ 0): the best fractional
 * matching of the weighted pairs. For any y ≥ 0 with Σ_j y_ij ≤ 1 at every agent,
 * Σ y_ij w_ij ≤ Σ y_ij (x_i + x_j) = Σ_i x_i Σ_j y_ij ≤ Σ_i x_i (weak LP duality of the
 * edge-weighted vertex cover behind the WDG heuristic of Li, Felner, Boyarski, Ma, Koenig,
 * IJCAI 2019). The best such y is half a maximum-weight assignment on the bipartite double
 * cover (every agent on both sides, each pair an edge both ways): an assignment M gives
 * y_ij = ([i→j ∈ M] + [j→i ∈ M]) / 2, and every matching of the pairs gives an assignment of
 * twice its weight, so the bound is never below a matching's (a greedy one's included).
 * The assignment is solved by the Hungarian method with potentials (Kuhn, "The Hungarian
 * method for the assignment problem", Naval Research Logistics Quarterly 1955), O(k³) over
 * the k agents that have a positive pair.
 */

/** One pairwise bound: agents i and j together need at least `weight` beyond their own optima. */
export type PairBound = readonly [i: number, j: number, weight: number];

/** ⌊(maximum-weight assignment on the double cover) / 2⌋: a lower bound on Σ x (file comment). */
export function fractionalMatchingBound(pairs: readonly PairBound[]): number {
  const index = new Map<number, number>();
  for (const [i, j, weight] of pairs) {
    if (!Number.isFinite(weight)) throw new Error(`pair bound of agents ${i} and ${j} is not a finite number: ${weight}`);
    if (weight <= 0 || i === j) continue;
    if (!index.has(i)) index.set(i, index.size);
    if (!index.has(j)) index.set(j, index.size);
  }
  const k = index.size;
  if (k === 0) return 0;
  const weights = new Float64Array(k * k);
  for (const [i, j, weight] of pairs) {
    if (weight <= 0 || i === j) continue;
    const a = index.get(i) as number;
    const b = index.get(j) as number;
    weights[a * k + b] = Math.max(weights[a * k + b], weight);
    weights[b * k + a] = Math.max(weights[b * k + a], weight);
  }
  return Math.floor(maxWeightAssignment(k, weights) / 2);
}

/**
 * The largest Σ weights[r * k + c] over permutations (rows to columns) of a k × k matrix of
 * non-negative weights: the Hungarian method minimising the negated weights, with row and
 * column potentials (1-based arrays, column 0 a sentinel).
 */
export function maxWeightAssignment(k: number, weights: Float64Array): number {
  const rowPotential = new Float64Array(k + 1);
  const colPotential = new Float64Array(k + 1);
  /** rowOf[c]: the row (1-based) assigned to column c, 0 when none. */
  const rowOf = new Int32Array(k + 1);
  const previousCol = new Int32Array(k + 1);
  const slack = new Float64Array(k + 1);
  const isUsed = new Uint8Array(k + 1);
  for (let row = 1; row <= k; row++) {
    rowOf[0] = row;
    let col = 0;
    slack.fill(Infinity);
    isUsed.fill(0);
    do {
      isUsed[col] = 1;
      const r = rowOf[col];
      let delta = Infinity;
      let nextCol = 0;
      for (let c = 1; c <= k; c++) {
        if (isUsed[c]) continue;
        const reduced = -weights[(r - 1) * k + (c - 1)] - rowPotential[r] - colPotential[c];
        if (reduced < slack[c]) {
          slack[c] = reduced;
          previousCol[c] = col;
        }
        if (slack[c] < delta) {
          delta = slack[c];
          nextCol = c;
        }
      }
      for (let c = 0; c <= k; c++) {
        if (isUsed[c]) {
          rowPotential[rowOf[c]] += delta;
          colPotential[c] -= delta;
        } else {
          slack[c] -= delta;
        }
      }
      col = nextCol;
    } while (rowOf[col] !== 0);
    do {
      const back = previousCol[col];
      rowOf[col] = rowOf[back];
      col = back;
    } while (col !== 0);
  }
  let total = 0;
  for (let c = 1; c <= k; c++) total += weights[(rowOf[c] - 1) * k + (c - 1)];
  return total;
}
