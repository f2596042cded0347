// Lockstep on the ms timeline (weighted-split plans): the rule of execution-types.ts
// (ExecutionPolicy) and its zero-noise property, over many optimal plans of random instances.
import type { RobotProfile, StartHeading } from '@shared/plan';
import type { Grid } from '../grid/grid';
import type { MapfInstance } from '../instance';
import { solveModel } from '../models/solve-model';
import { createRng, type Rng } from '../random';
import { realisedTimeline, simulateExecution } from './index';

// Several timing profiles: turns slower, faster and as fast as moves; waits shorter and longer.
// Diameter ≤ pitch: the geometry under which a plan that keeps the occupancy rule at nominal
// times cannot collide at those times (common practice; see dependency-graph.ts).
const profiles: RobotProfile[] = [
  { forwardMs: 1000, quarterTurnMs: 1500, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 400, timingJitter: 0 },
  { forwardMs: 800, quarterTurnMs: 300, waitMs: 500, cellPitchMm: 1000, robotDiameterMm: 700, timingJitter: 0 },
  { forwardMs: 1200, quarterTurnMs: 1200, waitMs: 1700, cellPitchMm: 500, robotDiameterMm: 500, timingJitter: 0 },
  { forwardMs: 700, quarterTurnMs: 2100, waitMs: 300, cellPitchMm: 600, robotDiameterMm: 450, timingJitter: 0 },
];

/** A random small instance: 3–5 × 3–5 cells, about 15 % blocked, 2–4 agents on distinct starts and goals. */
function randomInstance(rng: Rng): MapfInstance {
  const width = 3 + rng.int(3);
  const height = 3 + rng.int(3);
  const passable = new Uint8Array(width * height).map(() => (rng.next() < 0.15 ? 0 : 1));
  const grid: Grid = { width, height, passable };
  const free = [...passable.keys()].filter((c) => passable[c] === 1);
  const pick = (taken: Set<number>): number => {
    const left = free.filter((c) => !taken.has(c));
    const c = left[rng.int(left.length)];
    taken.add(c);
    return c;
  };
  const count = Math.min(2 + rng.int(3), Math.floor(free.length / 2));
  const starts = new Set<number>();
  const goals = new Set<number>();
  return { grid, agents: Array.from({ length: count }, () => ({ start: pick(starts), goal: pick(goals) })) };
}

/** Optimal weighted-split plans of random instances (solveModel validates each one), at least `wanted`. */
function solvedPlans(wanted: number) {
  const rng = createRng(1212);
  const plans = [];
  for (let trial = 0; trial < 400 && plans.length < wanted; trial++) {
    const instance = randomInstance(rng);
    const profile = profiles[trial % profiles.length];
    const startHeading: StartHeading = trial % 3 === 0 ? 'free' : (['N', 'E', 'S', 'W'] as const)[rng.int(4)];
    const solved = solveModel('weighted-split', instance, { profile, startHeading, nodeLimit: 3000 });
    if (solved.status !== 'solved') continue;
    expect(solved.isValidated).toBe(true);
    plans.push({ instance, profile, solved });
  }
  return plans;
}

describe('lockstep on the ms timeline (weighted-split plans)', () => {
  const plans = solvedPlans(64);

  it('at zero noise runs every valid plan exactly on its planned times, with no collision', () => {
    let compared = 0;
    let interacting = 0;
    for (const { instance, profile, solved } of plans) {
      const plan = { timeline: 'ms' as const, schedule: solved.schedule };
      const t = realisedTimeline(instance, plan, profile, { policy: 'lockstep', seed: 3, noise: { jitterCv: 0 } });
      expect(t.metrics.collisions).toEqual([]);
      expect(t.metrics.isSuccess).toBe(true);
      for (const robot of t.robots) for (const a of robot) expect([a.start, a.end]).toEqual([a.plannedStart, a.plannedEnd]);
      expect(t.metrics.realisedMakespanMs).toBe(solved.turnInclusiveMakespanMs);
      expect(t.metrics.realisedSocMs).toBe(solved.turnInclusiveSocMs);
      expect(t.metrics.waitingMs).toBe(0);
      // Plans where some robot waits in the plan itself: the planned timing matters there.
      if (solved.schedule.some((list) => list.some((a) => a.action === 'wait'))) interacting++;
      compared++;
    }
    expect(compared).toBeGreaterThanOrEqual(60);
    expect(interacting).toBeGreaterThan(5);
  });

  it('has teeth: the old barrier between the k-th actions of all robots leaves the planned times on many of the same plans', () => {
    // The rule before issue 12 put a barrier between equal `step` values, which on the ms timeline
    // count each robot's actions: run the same schedules that way (timeline 'steps') to see it differ.
    let compared = 0;
    let deviating = 0;
    for (const { instance, profile, solved } of plans) {
      const t = realisedTimeline(instance, { timeline: 'steps', schedule: solved.schedule }, profile, { policy: 'lockstep', seed: 3, noise: { jitterCv: 0 } });
      if (t.robots.some((robot) => robot.some((a) => !a.isPadding && a.start !== a.plannedStart))) deviating++;
      compared++;
    }
    expect(compared).toBeGreaterThanOrEqual(60);
    expect(deviating).toBeGreaterThan(10);
  });

  it('under noise keeps the rule: never before the planned start, never before any action planned to end by then has ended', () => {
    let checkedActions = 0;
    let sawWaitOnOthers = 0;
    let sawWaitOnClock = 0;
    for (const { instance, profile, solved } of plans.slice(0, 20)) {
      const plan = { timeline: 'ms' as const, schedule: solved.schedule };
      for (const seed of [1, 2]) {
        const t = realisedTimeline(instance, plan, profile, { policy: 'lockstep', seed, noise: { jitterCv: 0.3, stallProbability: 0.1, stallMs: 700 } });
        const all = t.robots.flat();
        for (const robot of t.robots) {
          robot.forEach((a, i) => {
            const own = i === 0 ? 0 : robot[i - 1].end;
            const gate = Math.max(0, ...all.filter((b) => b.plannedEnd <= a.plannedStart).map((b) => b.end));
            // The rule, from the realised timeline alone: start = max(own end, planned start, gate).
            expect(a.start).toBe(Math.max(own, a.plannedStart, gate));
            expect(a.waitedMs).toBeCloseTo(a.start - own, 9);
            if (a.waitReason === 'barrier') sawWaitOnOthers++;
            if (a.waitReason === 'planned-start') sawWaitOnClock++;
            checkedActions++;
          });
        }
      }
    }
    expect(checkedActions).toBeGreaterThan(500);
    expect(sawWaitOnOthers).toBeGreaterThan(0);
    expect(sawWaitOnClock).toBeGreaterThan(0);
  });

  it('collides no more than open-loop on the same noisy runs (summed over plans)', () => {
    // Not a theorem for each run, a sanity check of direction: synchronising cannot be worse in total here.
    let lockstep = 0;
    let open = 0;
    for (const { instance, profile, solved } of plans.slice(0, 30)) {
      const plan = { timeline: 'ms' as const, schedule: solved.schedule };
      const options = { seed: 5, runs: 10, noise: { jitterCv: 0.4, stallProbability: 0.1, stallMs: 1500 } };
      lockstep += simulateExecution(instance, plan, profile, { ...options, policy: 'lockstep' }).collisions.total;
      open += simulateExecution(instance, plan, profile, { ...options, policy: 'open-loop' }).collisions.total;
    }
    expect(open).toBeGreaterThan(0);
    expect(lockstep).toBeLessThan(open);
  });
});
