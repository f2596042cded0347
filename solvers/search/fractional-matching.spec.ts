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

/**
 * The linear-programming minimum of Σ x subject to x_i + x_j ≥ w_ij, x ≥ 0, by enumeration:
 * the constraint matrix is a graph's edge–vertex incidence matrix, so with integer weights some
 * optimal vertex has only half-integer coordinates (Nemhauser and Trotter, "Vertex packings:
 * structural properties and algorithms", Mathematical Programming 1975, for the unit case; the
 * same half-integrality holds for any integer right-hand side, as we recall it) and enumerating
 * x over {0, ½, 1, …, max w} finds the optimum.
 */
function lpCover(n: number, pairs: readonly PairBound[]): number {
  const top = Math.max(0, ...pairs.map((p) => p[2]));
  const x = new Array<number>(n).fill(0);
  let best = Infinity;
  const rec = (i: number, sum: number): void => {
    if (sum >= best) return;
    if (i === n) {
      if (pairs.every(([a, b, w]) => x[a] + x[b] >= w)) best = sum;
      return;
    }
    for (let v = 0; v <= 2 * top; v++) {
      x[i] = v / 2;
      rec(i + 1, sum + v / 2);
    }
    x[i] = 0;
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
    for (let t = 0; t < 300; t++) {
      const k = 1 + rng.int(7);
      const weights = new Float64Array(k * k);
      for (let c = 0; c < k * k; c++) weights[c] = rng.next() < 0.3 ? 0 : rng.int(5000);
      expect({ t, value: maxWeightAssignment(k, weights) }).toEqual({ t, value: bestPermutation(k, weights) });
    }
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

  it('equals the rounded-down linear-programming cover (the best such bound) on 200 random pair sets', () => {
    // By LP duality the best fractional matching equals the LP minimum of the cover, so the bound
    // is not merely valid but as strong as any fractional bound from these pairs.
    const rng = createRng(23);
    let fractional = 0;
    for (let t = 0; t < 200; t++) {
      const n = 2 + rng.int(4);
      const pairs: PairBound[] = [];
      for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) if (rng.next() < 0.6) pairs.push([i, j, 1 + rng.int(3)]);
      const lp = lpCover(n, pairs);
      expect({ t, bound: fractionalMatchingBound(pairs) }).toEqual({ t, bound: Math.floor(lp) });
      if (lp !== Math.floor(lp)) fractional++;
    }
    // Some optima are genuinely fractional (odd cycles), so the rounding is exercised.
    expect(fractional).toBeGreaterThan(5);
  });

  it('refuses a pair bound that is not a finite number', () => {
    expect(() => fractionalMatchingBound([[0, 1, Infinity]])).toThrow(/agents 0 and 1/);
    expect(() => fractionalMatchingBound([[2, 3, Number.NaN]])).toThrow(/not a finite number/);
  });
});
