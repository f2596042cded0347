// The weighted-split CBS heuristic (ccbs-heuristic.ts) against a brute-force enumeration written
// here: the least Σ x over every assignment of x_a ∈ {0} ∪ {the Δ's of agent a} that meets every
// disjunction (enough, since lowering any x_a to the largest Δ it must reach keeps all met).
import { createRng } from '../random';
import { disjunctiveCover, type SplitDisjunction } from './ccbs-heuristic';

function bruteForce(agentCount: number, splits: readonly SplitDisjunction[]): number {
  const candidates: number[][] = Array.from({ length: agentCount }, () => [0]);
  for (const s of splits) {
    if (s.di !== Infinity) candidates[s.i].push(s.di);
    if (s.dj !== Infinity) candidates[s.j].push(s.dj);
  }
  let best = Infinity;
  const x = new Array<number>(agentCount).fill(0);
  const visit = (a: number): void => {
    if (a === agentCount) {
      if (splits.every((s) => x[s.i] >= s.di || x[s.j] >= s.dj)) best = Math.min(best, x.reduce((p, v) => p + v, 0));
      return;
    }
    for (const v of candidates[a]) {
      x[a] = v;
      visit(a + 1);
    }
  };
  visit(0);
  return best;
}

function randomSplits(seed: number): { agentCount: number; splits: SplitDisjunction[] } {
  const rng = createRng(seed);
  const agentCount = 2 + rng.int(4);
  const splits: SplitDisjunction[] = [];
  const count = 1 + rng.int(7);
  for (let k = 0; k < count; k++) {
    const i = rng.int(agentCount);
    let j = rng.int(agentCount - 1);
    if (j >= i) j++;
    const side = (): number => (rng.next() < 0.1 ? Infinity : rng.next() < 0.15 ? 0 : 200 * (1 + rng.int(8)));
    splits.push({ i, di: side(), j, dj: side() });
  }
  return { agentCount, splits };
}

describe('disjunctiveCover', () => {
  it('equals the brute-force least Σ x on random disjunction sets', () => {
    // Arrange / Act / Assert
    let compared = 0;
    let positive = 0;
    let infinite = 0;
    for (let seed = 1; seed <= 400; seed++) {
      const { agentCount, splits } = randomSplits(seed);
      const expected = bruteForce(agentCount, splits);
      expect({ seed, h: disjunctiveCover(agentCount, splits) }).toEqual({ seed, h: expected });
      compared++;
      if (expected === Infinity) infinite++;
      else if (expected > 0) positive++;
    }
    expect(compared).toBe(400);
    expect(positive).toBeGreaterThan(200);
    expect(infinite).toBeGreaterThan(5);
  });

  it('stays a lower bound when its search budget runs out (the matching fallback)', () => {
    // Arrange
    let weaker = 0;
    for (let seed = 1; seed <= 400; seed++) {
      const { agentCount, splits } = randomSplits(seed);
      const exact = bruteForce(agentCount, splits);
      // Act
      const cut = disjunctiveCover(agentCount, splits, 1);
      // Assert
      expect(cut).toBeLessThanOrEqual(exact);
      if (cut < exact) weaker++;
    }
    expect(weaker).toBeGreaterThan(10);
  });

  it('reads a disjunction with one impossible side as a requirement on the other agent', () => {
    // Arrange: agent 0 must rise by 600 (agent 1 cannot take the split), which also meets the second split.
    const splits: SplitDisjunction[] = [
      { i: 0, di: 600, j: 1, dj: Infinity },
      { i: 0, di: 400, j: 2, dj: 1000 },
      { i: 1, di: 200, j: 2, dj: 200 },
    ];
    // Act / Assert
    expect(disjunctiveCover(3, splits)).toBe(800);
  });
});
