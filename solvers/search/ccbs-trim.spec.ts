// The detour trim of the bounded weighted-split search (ccbs.ts, trimDetours) swaps a node's plans
// for cheaper ones mid-search; here, on dense seeded instances with a tight factor (w = 1.1, so
// slack is scarce and the trim runs often), every bounded result must still be conflict-free and
// within w of its lower bound, and that bound must not exceed the optimum of the exact search
// where that search finishes (itself checked against the exhaustive oracle in
// solvers/models/weighted-split-oracle.spec.ts).
import type { Grid } from '../grid/grid';
import { headingDistancesToGoal } from '../grid/heading-graph-distances';
import { createRng } from '../random';
import { randomGridInstance } from '../testing/random-grid-instance';
import { cellVisits, findConflicts } from './ccbs-conflict';
import { ccbsSearch, type CcbsAgent, type CcbsOutcome } from './ccbs';
import { boundOf } from './suboptimality';

const F = 5;
const T = 4;

function search(grid: Grid, agents: readonly CcbsAgent[], suboptimality: number, nodeLimit: number): CcbsOutcome {
  return ccbsSearch({ grid, agents, forwardMs: F, quarterTurnMs: T, nodeLimit, shouldStop: () => false, suboptimality });
}

describe('the detour trim of the bounded weighted-split search', () => {
  it('leaves bounded plans conflict-free, within w of a lower bound that never exceeds the optimum', () => {
    // Arrange: 7 × 7 grids, 15 % blocked, 8 agents with distinct starts and goals.
    const rng = createRng(7);
    const w = 1.1;
    let solved = 0;
    let nodeLimited = 0;
    let trimmed = 0;
    let comparedWithOptimum = 0;
    for (let trial = 0; trial < 30; trial++) {
      const inst = randomGridInstance(rng, 7, 7, 8, 0.15);
      const { grid } = inst;
      const agents: CcbsAgent[] = inst.agents.map(({ start, goal }) => ({
        start, goal, startHeadings: [0, 1, 2, 3], heuristic: headingDistancesToGoal(grid, goal, { forwardMs: F, quarterTurnMs: T }),
      }));
      // Act
      const bounded = search(grid, agents, w, 3000);
      // Assert: an unsolved run is an unreachable goal or the node limit (counted); else its plans.
      if (bounded.status !== 'solved') {
        expect(['infeasible', 'node-limit']).toContain(bounded.status);
        if (bounded.status === 'node-limit') nodeLimited++;
        continue;
      }
      const plans = bounded.plans ?? [];
      const visits = plans.map((p, a) => cellVisits(a, agents[a].start, p, F));
      expect(visits.map((list) => list[list.length - 1].cell)).toEqual(agents.map((a) => a.goal));
      expect({ trial, conflictingPairs: findConflicts(visits, 1).conflictingPairs }).toEqual({ trial, conflictingPairs: 0 });
      expect(plans.reduce((s, p) => s + p.cost, 0)).toBe(bounded.soc);
      expect(bounded.soc as number).toBeLessThanOrEqual(boundOf(bounded.lowerBound as number, w));
      solved++;
      if (bounded.detourTrims > 0) trimmed++;
      const exact = search(grid, agents, 1, 300);
      if (exact.status !== 'solved') continue; // the exact search hit its node limit
      expect(bounded.lowerBound as number).toBeLessThanOrEqual(exact.soc as number);
      expect(bounded.soc as number).toBeGreaterThanOrEqual(exact.soc as number);
      comparedWithOptimum++;
    }
    expect(solved).toBeGreaterThanOrEqual(20);
    expect(nodeLimited).toBeLessThanOrEqual(4);
    expect(comparedWithOptimum).toBeGreaterThanOrEqual(18);
    // The trim did run on several of them (else this checks little of it).
    expect(trimmed).toBeGreaterThanOrEqual(4);
  });
});
