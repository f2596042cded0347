// Disjoint splitting in the exact weighted-split search (ccbs-branch.ts, disjointLandmark): the
// optimum must not move. The exhaustive joint-state oracle check of the solver (which runs with
// disjoint splitting, its default) is solvers/models/weighted-split-oracle.spec.ts; here the
// search is compared with itself without disjoint splitting on larger instances than that oracle
// can take, where landmarks are used often.
import { headingDistancesToGoal } from '../grid/heading-graph-distances';
import type { MapfInstance } from '../instance';
import { createRng } from '../random';
import { randomGridInstance } from '../testing/random-grid-instance';
import { ccbsSearch, type CcbsOutcome } from './ccbs';

/** The exact search on an instance (free start heading), with or without disjoint splitting. */
function search(inst: MapfInstance, F: number, T: number, disjointSplitting: boolean): CcbsOutcome {
  return ccbsSearch({
    grid: inst.grid,
    agents: inst.agents.map((a) => ({
      start: a.start, goal: a.goal, startHeadings: [0, 1, 2, 3], heuristic: headingDistancesToGoal(inst.grid, a.goal, { forwardMs: F, quarterTurnMs: T }),
    })),
    forwardMs: F,
    quarterTurnMs: T,
    nodeLimit: 20_000,
    shouldStop: () => false,
    disjointSplitting,
  });
}


describe('disjoint splitting in the exact weighted-split search', () => {
  it('keeps the optimum of the search without it on larger random instances, with fewer expansions overall', () => {
    // Arrange: 6 × 6 and 7 × 7 grids, 4–6 agents, where conflicts are many.
    const rng = createRng(1618);
    let compared = 0;
    let withLandmarks = 0;
    let expandedWith = 0;
    let expandedWithout = 0;
    for (let trial = 0; trial < 24; trial++) {
      const size = 6 + rng.int(2);
      const inst = randomGridInstance(rng, size, size, 4 + rng.int(3), 0.2);
      const [F, T] = ([[5, 4], [3, 2], [4, 5]] as const)[trial % 3];
      // Act
      const plain = search(inst, F, T, false);
      const disjoint = search(inst, F, T, true);
      if (plain.status !== 'solved' && plain.status !== 'infeasible') continue; // node limit: not comparable
      // Assert
      expect({ trial, status: disjoint.status, soc: disjoint.soc }).toEqual({ trial, status: plain.status, soc: plain.soc });
      compared++;
      if (disjoint.disjointSplits > 0) withLandmarks++;
      expandedWith += disjoint.expanded;
      expandedWithout += plain.expanded;
    }
    expect(compared).toBeGreaterThan(18);
    expect(withLandmarks).toBeGreaterThan(6);
    expect(expandedWith).toBeLessThan(expandedWithout);
  });
});
