// Joint optimality of the weighted-split solver against an independent in-project oracle, the
// exhaustive joint-state search of solvers/testing/weighted-oracle.ts (written independently of
// solvers/search/, but in this project: no outside reference checks the weighted-split optimum
// yet), and every plan against the independent schedule validator (solvers/validate/schedule.ts).
import type { RobotProfile, StartHeading } from '@shared/plan';
import type { MapfInstance } from '../instance';
import { createRng, type Rng } from '../random';
import { OracleLimitError } from '../testing/best-first';
import { randomGridInstance } from '../testing/random-grid-instance';
import { weightedOracle } from '../testing/weighted-oracle';
import { validateSchedule } from '../validate/schedule';
import { solveWeightedSplit } from './weighted-split';

const profile = (forwardMs: number, quarterTurnMs: number): RobotProfile => ({
  forwardMs,
  quarterTurnMs,
  waitMs: 1,
  cellPitchMm: 300,
  robotDiameterMm: 200,
  timingJitter: 0,
});

function randomInstance(rng: Rng): MapfInstance {
  const width = 3 + rng.int(2);
  const height = 3 + rng.int(2);
  return randomGridInstance(rng, width, height, () => 2 + rng.int(2), 0.2);
}

describe('solveWeightedSplit against the exhaustive weighted oracle', () => {
  it('finds the optimal SOC on many tiny random instances, and every plan validates', () => {
    // Arrange
    const rng = createRng(4242);
    const durations: readonly (readonly [number, number])[] = [[2, 3], [1, 1], [3, 2], [2, 1]];
    let solved = 0;
    let interacting = 0;
    let unsolvable = 0;
    let cutCompared = 0;
    let cutRaised = 0;
    for (let trial = 0; trial < 60; trial++) {
      const inst = randomInstance(rng);
      const [F, T] = durations[trial % durations.length];
      const p = profile(F, T);
      const rule: StartHeading = trial % 3 === 0 ? 'free' : (['N', 'E', 'S', 'W'] as const)[rng.int(4)];
      // Act
      let oracle: ReturnType<typeof weightedOracle>;
      try {
        oracle = weightedOracle(inst, p, rule, { maxExpansions: 40_000 });
      } catch (e) {
        // Too big for the exhaustive oracle within a unit-test budget: not comparable.
        if (e instanceof OracleLimitError) continue;
        throw e;
      }
      const ours = solveWeightedSplit(inst, { profile: p, startHeading: rule, nodeLimit: 1_000, now: () => 0 });
      // Assert
      if (oracle.kind === 'unsolvable') {
        expect(ours.status).not.toBe('solved');
        unsolvable++;
        continue;
      }
      expect({ trial, status: ours.status, soc: ours.socMs }).toEqual({ trial, status: 'solved', soc: oracle.soc });
      const check = validateSchedule(inst, ours.schedule, p, { startHeading: rule });
      expect(check.violation).toBeUndefined();
      expect(check.ok).toBe(true);
      expect(check.soc).toBe(ours.socMs);
      expect(check.makespan).toBe(ours.makespanMs);
      solved++;
      if (ours.nodes.expanded > 0) interacting++;
      // The bound of a search cut short (the high-level heuristic with pathmax) never exceeds the
      // optimum; counted where it rises above the bound before any expansion (the root's cost).
      let rootBound: number | null = null;
      for (const nodeLimit of [0, 1, 2, 4]) {
        const cut = solveWeightedSplit(inst, { profile: p, startHeading: rule, nodeLimit, now: () => 0 });
        if (cut.lowerBoundMs === null) continue;
        expect({ trial, nodeLimit, isAdmissible: cut.lowerBoundMs <= oracle.soc }).toEqual({ trial, nodeLimit, isAdmissible: true });
        cutCompared++;
        if (nodeLimit === 0) rootBound = cut.lowerBoundMs;
        else if (cut.status !== 'solved' && rootBound !== null && cut.lowerBoundMs > rootBound) cutRaised++;
      }
    }
    expect(solved).toBeGreaterThan(40);
    expect(unsolvable).toBeGreaterThan(0);
    expect(interacting).toBeGreaterThan(10);
    expect(cutCompared).toBeGreaterThan(160);
    expect(cutRaised).toBeGreaterThan(5);
  });
});
