import { createRng } from '../random';
import { minWeightedVertexCover, type WeightedEdge } from './weighted-vertex-cover';

/** Exhaustive reference: every assignment x ∈ [0, max weight]^n. */
function bruteForce(n: number, edges: WeightedEdge[]): number {
  const top = Math.max(0, ...edges.map((e) => e.w));
  let best = Infinity;
  const x = new Array<number>(n).fill(0);
  const rec = (i: number, sum: number): void => {
    if (sum >= best) return;
    if (i === n) {
      if (edges.every((e) => x[e.u] + x[e.v] >= e.w)) best = sum;
      return;
    }
    for (let v = 0; v <= top; v++) { x[i] = v; rec(i + 1, sum + v); }
    x[i] = 0;
  };
  rec(0, 0);
  return best;
}

describe('minWeightedVertexCover', () => {
  it('equals exhaustive enumeration on 200 random graphs of up to 7 vertices', () => {
    const rng = createRng(11);
    for (let g = 0; g < 200; g++) {
      const n = 2 + rng.int(6);
      const edges: WeightedEdge[] = [];
      for (let u = 0; u < n; u++) for (let v = u + 1; v < n; v++) if (rng.next() < 0.45) edges.push({ u, v, w: 1 + rng.int(3) });
      expect(minWeightedVertexCover(n, edges)).toBe(bruteForce(n, edges));
    }
  });

  it('solves a worked case: a triangle of weight-1 edges needs 2, a star needs its centre only', () => {
    // Common practice (vertex cover of K3 = 2; of a star = 1).
    expect(minWeightedVertexCover(3, [{ u: 0, v: 1, w: 1 }, { u: 1, v: 2, w: 1 }, { u: 0, v: 2, w: 1 }])).toBe(2);
    expect(minWeightedVertexCover(5, [1, 2, 3, 4].map((v) => ({ u: 0, v, w: 2 })))).toBe(2);
  });

  it('falls back to a matching lower bound when the step budget runs out', () => {
    const edges: WeightedEdge[] = [{ u: 0, v: 1, w: 1 }, { u: 1, v: 2, w: 1 }, { u: 0, v: 2, w: 1 }, { u: 2, v: 3, w: 2 }];
    const exact = minWeightedVertexCover(4, edges);
    const bound = minWeightedVertexCover(4, edges, 1);
    expect(bound).toBeLessThanOrEqual(exact);
    expect(bound).toBeGreaterThan(0);
  });
});
