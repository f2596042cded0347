import { createRng } from '../random';
import { fractionalMatchingBound, maxWeightAssignment, type PairBound } from './fractional-matching';
import { minWeightedVertexCover } from './weighted-vertex-cover';

/** Exhaustive reference: the best of all k! permutations. */
function bestPermutation(k: number, weights: Float64Array): number {
  let best = -Infinity;
  const perm = [...Array(k).keys()];
  const rec = (i: number, sum: number): void => {
    if (i === k) {
      best = Math.max(best, sum);
      return;
    }
    for (let j = i; j < k; j++) {
      [perm[i], perm[j]] = [perm[j], perm[i]];
      rec(i + 1, sum + weights[i * k + perm[i]]);
      [perm[i], perm[j]] = [perm[j], perm[i]];
    }
  };
  rec(0, 0);
  return best;
}

/** A greedy matching, heaviest pair first (the bound this one must never fall below). */
function greedy(pairs: readonly PairBound[]): number {
  const used = new Set<number>();
  let total = 0;
  for (const [i, j, w] of [...pairs].sort((a, b) => b[2] - a[2])) {
    if (w <= 0 || used.has(i) || used.has(j)) continue;
    used.add(i);
    used.add(j);
    total += w;
  }
  return total;
}

describe('maxWeightAssignment', () => {
  it('equals the best permutation on 300 random matrices of up to 7 rows', () => {
    const rng = createRng(5);
    let compared = 0;
    for (let t = 0; t < 300; t++) {
      const k = 1 + rng.int(7);
      const weights = new Float64Array(k * k);
      for (let c = 0; c < k * k; c++) weights[c] = rng.next() < 0.3 ? 0 : rng.int(5000);
      expect({ t, value: maxWeightAssignment(k, weights) }).toEqual({ t, value: bestPermutation(k, weights) });
      compared++;
    }
    expect(compared).toBe(300);
  });
});

describe('fractionalMatchingBound', () => {
  it('gives a triangle of weight-2 pairs 3, where any matching gives 2 (x = 1, 1, 1 is the cover)', () => {
    const triangle: PairBound[] = [[0, 1, 2], [1, 2, 2], [0, 2, 2]];
    expect(greedy(triangle)).toBe(2);
    expect(fractionalMatchingBound(triangle)).toBe(3);
  });

  it('is 0 without a positive pair and ignores zero and negative weights', () => {
    expect(fractionalMatchingBound([])).toBe(0);
    expect(fractionalMatchingBound([[3, 7, 0], [1, 2, -40]])).toBe(0);
    expect(fractionalMatchingBound([[3, 7, 0], [1, 2, -40], [9, 4, 1200]])).toBe(1200);
  });

  it('lies between a greedy matching and the minimum integer cover on 300 random pair sets', () => {
    // The minimum cover min Σ x with x_i + x_j ≥ w_ij is what the bound stands for (any plan's
    // x satisfies the pairs), so the bound must never exceed it, nor fall below any matching.
    const rng = createRng(17);
    let strictlyAboveGreedy = 0;
    for (let t = 0; t < 300; t++) {
      const n = 2 + rng.int(6);
      const pairs: PairBound[] = [];
      for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) if (rng.next() < 0.5) pairs.push([i, j, 1 + rng.int(4)]);
      const bound = fractionalMatchingBound(pairs);
      const cover = minWeightedVertexCover(n, pairs.map(([u, v, w]) => ({ u, v, w })));
      expect({ t, ok: bound >= greedy(pairs) && bound <= cover }).toEqual({ t, ok: true });
      if (bound > greedy(pairs)) strictlyAboveGreedy++;
    }
    // The sample must exercise the gain over a matching, not just equal it.
    expect(strictlyAboveGreedy).toBeGreaterThan(10);
  });
});
