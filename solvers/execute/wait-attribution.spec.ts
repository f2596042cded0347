// Attribution (issue 12, item 6): who waited for whom, and the critical chain that set the
// realised makespan; when dependency gating lengthens the makespan, and why it often cannot.
import type { RobotProfile, Schedule } from '@shared/plan';
import { scheduleFromPaths } from '../models/turn-schedule';
import { cellsOf, tinyInstance } from '../testing/tiny-instance';
import type { ExecutionPolicy, RunTimeline } from './execution-types';
import { buildActionDependencies, preparePlan, realisedTimeline, simulateExecution } from './index';
import { weightedTestPlans } from './testing/weighted-plans';

const profile: RobotProfile = { forwardMs: 1000, quarterTurnMs: 1500, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 400, timingJitter: 0 };

/** The invariants of a run's attribution, checked from its realised actions alone. */
function expectConsistentAttribution(t: RunTimeline): void {
  // Per robot: the waits of its actions up to its last forward move (before it reaches its goal
  // for good; waits of padding and trailing actions at the goal do not count), and per releasing robot.
  t.robots.forEach((robot, r) => {
    const w = t.waitByRobot[r];
    expect(w.robot).toBe(r);
    const beforeArrival = robot.slice(0, robot.map((a) => a.action).lastIndexOf('forward') + 1);
    expect(w.waitedMs).toBeCloseTo(beforeArrival.reduce((s, a) => s + a.waitedMs, 0), 6);
    for (const { robot: other, ms } of w.waitedFor) {
      expect(other).not.toBe(r);
      expect(ms).toBeCloseTo(beforeArrival.filter((a) => a.waitedFor === other).reduce((s, a) => s + a.waitedMs, 0), 6);
    }
    for (const a of robot) {
      expect(a.waitReason === null).toBe(!(a.waitedMs > 0) || a.start === Infinity);
      if (a.waitedFor !== null) {
        // Released exactly when an action of that robot ended.
        expect(t.robots[a.waitedFor].some((b) => b.end === a.start)).toBe(true);
      }
    }
  });
  expect(t.metrics.waitingMs).toBeCloseTo(t.waitByRobot.reduce((s, w) => s + w.waitedMs, 0), 6);
  expect(t.metrics.waitingMaxPerRobotMs).toBe(Math.max(0, ...t.waitByRobot.map((w) => w.waitedMs)));
  // The chain: own and planned-start segments tile [0 or the first planned-start wait's start, makespan];
  // a dependency or barrier wait ends where its releaser's segment ends.
  const makespan = t.metrics.realisedMakespanMs;
  if (makespan === null || makespan === 0) {
    expect(t.criticalChain).toEqual([]);
    return;
  }
  const tiles = t.criticalChain.filter((s) => s.reason === 'own' || s.reason === 'planned-start');
  if (tiles[0].reason === 'planned-start') {
    // The chain begins with the plan's clock: the robot's previous action ended when the wait began.
    const robot = t.robots[tiles[0].robot];
    const released = robot.find((a) => a.start === tiles[0].toMs && a.waitReason === 'planned-start');
    expect(released?.waitedMs).toBeCloseTo(tiles[0].toMs - tiles[0].fromMs, 9);
  } else {
    expect(tiles[0].fromMs).toBe(0);
  }
  expect(t.criticalChain.slice(1).some((c) => c.reason === 'planned-start')).toBe(false);
  expect(tiles[tiles.length - 1].toMs).toBe(makespan);
  for (let i = 1; i < tiles.length; i++) expect(tiles[i].fromMs).toBe(tiles[i - 1].toMs);
  t.criticalChain.forEach((s, i) => {
    if (s.reason === 'dependency' || s.reason === 'barrier') {
      const releaser = t.criticalChain[i - 1];
      expect([releaser.robot, releaser.toMs]).toEqual([s.waitedFor, s.toMs]);
      expect(t.criticalChain[i + 1]).toMatchObject({ robot: s.robot, fromMs: s.toMs, reason: 'own' });
    }
  });
}

describe('dependency gating lengthens the realised makespan', () => {
  it('a follower waits for its leader to leave; the chain shows the wait', () => {
    // Agent 0 faces E but leaves (1, 0) westwards (two quarter turns, then the move); agent 1
    // follows it into (1, 0) from (2, 0) in the same step (legal in the classic rule).
    const instance = tinyInstance('....', [[[1, 0], [0, 0], 'E'], [[2, 0], [1, 0], 'W']]);
    const paths = [cellsOf(instance.grid, [[1, 0], [0, 0]]), cellsOf(instance.grid, [[2, 0], [1, 0]])];
    const ts = scheduleFromPaths(instance, paths, profile, { startHeading: 'free', stretch: 'none' });
    const plan = { timeline: 'steps' as const, schedule: ts.schedule };
    const open = realisedTimeline(instance, plan, profile, { policy: 'open-loop', seed: 1 });
    const gated = realisedTimeline(instance, plan, profile, { policy: 'dependency-gated', seed: 1 });
    // Hand-worked: agent 0 turns 2 × 1500 and drives 1000, arriving at 4000; open-loop agent 1
    // arrives at 1000 (and collides); gated, agent 1 starts when agent 0 has left (4000), arrives 5000.
    expect(open.metrics.realisedMakespanMs).toBe(4000);
    expect(open.metrics.collisions).toHaveLength(1);
    expect(gated.metrics.realisedMakespanMs).toBe(5000);
    expect(gated.metrics.collisions).toEqual([]);
    expect(gated.robots[1][0]).toMatchObject({ start: 4000, waitedMs: 4000, waitedFor: 0, waitReason: 'dependency' });
    expect(gated.waitByRobot).toEqual([
      { robot: 0, waitedMs: 0, waitedFor: [] },
      { robot: 1, waitedMs: 4000, waitedFor: [{ robot: 0, ms: 4000 }] },
    ]);
    expect(gated.criticalChain).toEqual([
      { robot: 0, fromMs: 0, toMs: 4000, reason: 'own', waitedFor: null },
      { robot: 1, fromMs: 0, toMs: 4000, reason: 'dependency', waitedFor: 0 },
      { robot: 1, fromMs: 4000, toMs: 5000, reason: 'own', waitedFor: null },
    ]);
    expect(open.criticalChain).toEqual([{ robot: 0, fromMs: 0, toMs: 4000, reason: 'own', waitedFor: null }]);
    expectConsistentAttribution(gated);
    expectConsistentAttribution(open);
    // Per-robot waiting in the batch: mean over the 2 robots 2000, max 4000 (the sum stays 4000).
    const s = simulateExecution(instance, plan, profile, { policy: 'dependency-gated', seed: 1 });
    expect([s.waitingMs.mean, s.waitingPerRobotMs.mean.mean, s.waitingPerRobotMs.max.mean]).toEqual([4000, 2000, 4000]);
  });
});

describe('dependency gating cannot lengthen the realised makespan', () => {
  it('at zero noise on valid weighted-split plans: every dependency is met at nominal times, so gated = open-loop exactly', () => {
    let compared = 0;
    let dependencies = 0;
    for (const { instance, profile: p, solved } of weightedTestPlans(40, 77)) {
      const plan = { timeline: 'ms' as const, schedule: solved.schedule };
      // The reason, checked on the graph itself: each cross-robot predecessor is planned to end
      // no later than its dependant is planned to start (the plan keeps the occupancy rule).
      const prepared = preparePlan(instance, plan, p);
      const adg = buildActionDependencies(prepared);
      for (let b = 0; b < prepared.actionCount; b++) {
        for (let k = adg.depStart[b]; k < adg.depStart[b + 1]; k++) {
          const a = adg.deps[k];
          expect(prepared.plannedStart[a] + prepared.nominalMs[a]).toBeLessThanOrEqual(prepared.plannedStart[b]);
          dependencies++;
        }
      }
      const options = { seed: 4, noise: { jitterCv: 0 } };
      const open = realisedTimeline(instance, plan, p, { ...options, policy: 'open-loop' });
      const gated = realisedTimeline(instance, plan, p, { ...options, policy: 'dependency-gated' });
      expect(gated.robots.map((r) => r.map((a) => [a.start, a.end]))).toEqual(open.robots.map((r) => r.map((a) => [a.start, a.end])));
      expect(gated.metrics.realisedMakespanMs).toBe(open.metrics.realisedMakespanMs);
      expect(gated.waitByRobot.every((w) => w.waitedMs === 0)).toBe(true);
      // So the chain is one robot's own actions from 0 to the makespan, under either policy.
      expect(gated.criticalChain).toEqual(open.criticalChain);
      expect(gated.criticalChain).toHaveLength(1);
      compared++;
    }
    expect(compared).toBeGreaterThanOrEqual(30);
    expect(dependencies).toBeGreaterThan(30);
  });

  it('when the robot that waits is not on the critical chain, the makespan does not move', () => {
    // Agent 0 crosses (1, 1) eastwards; agent 1 waits, then crosses it southwards; agent 2 drives
    // 6 cells along the bottom row, far from both. Every action stalls 2500 ms (stall probability 1):
    // agent 0's move out of (1, 1) ends at 7000, so gated agent 1 enters it at 7000 instead of 4500.
    const instance = tinyInstance('..........\n..........\n..........\n..........', [[[0, 1], [2, 1], 'E'], [[1, 0], [1, 2], 'S'], [[3, 3], [9, 3], 'E']]);
    const f = (from: [number, number], to: [number, number], heading: 'E' | 'S', start: number, step: number) =>
      ({ action: 'forward' as const, from, to, heading, start, end: start + 1000, step });
    const schedule: Schedule = [
      [f([0, 1], [1, 1], 'E', 0, 0), f([1, 1], [2, 1], 'E', 1000, 1)],
      [{ action: 'wait', from: [1, 0], to: [1, 0], heading: 'S', start: 0, end: 2000, step: 0 }, f([1, 0], [1, 1], 'S', 2000, 1), f([1, 1], [1, 2], 'S', 3000, 2)],
      Array.from({ length: 6 }, (_, i) => f([3 + i, 3], [4 + i, 3], 'E', 1000 * i, i)),
    ];
    const plan = { timeline: 'ms' as const, schedule };
    const options = { seed: 1, noise: { jitterCv: 0, stallProbability: 1, stallMs: 2500 } };
    const open = realisedTimeline(instance, plan, profile, { ...options, policy: 'open-loop' });
    const gated = realisedTimeline(instance, plan, profile, { ...options, policy: 'dependency-gated' });
    // Hand-worked: agent 1 arrives at 10500 + 3500 = 14000 gated (11500 open-loop); agent 2 at 6 × 3500 = 21000 under both.
    expect(gated.robots[1].filter((a) => !a.isPadding).map((a) => a.end)).toEqual([4500, 10500, 14000]);
    expect(gated.waitByRobot[1]).toEqual({ robot: 1, waitedMs: 2500, waitedFor: [{ robot: 0, ms: 2500 }] });
    expect([open.metrics.realisedMakespanMs, gated.metrics.realisedMakespanMs]).toEqual([21000, 21000]);
    // Why: the chain is agent 2's own driving, which waits for nobody.
    expect(gated.criticalChain).toEqual([{ robot: 2, fromMs: 0, toMs: 21000, reason: 'own', waitedFor: null }]);
    expect(gated.criticalChain.some((s) => s.robot === 1)).toBe(false);
    expectConsistentAttribution(gated);
  });
});

describe('waiting counts idle time before a robot reaches its goal for good', () => {
  it('lockstep holds a robot at its goal through the barriers of its padding: that is not waiting', () => {
    // Steps timeline, zero noise, three robots on parallel rows (500 mm apart, 400 mm disks: they
    // never touch). Step 1 of agent 1 is one slow 2500 ms move, so the step-2 barrier is at 3500.
    // Agent 0 waits in the plan at step 1 (1000–2000) and then stands idle until 3500 before its
    // last move: 1500 ms waited before arriving. Agent 2 arrives at 1000 and is padded with one
    // wait per step: its step-2 padding wait also starts only at 3500, 1500 ms after its step-1
    // padding ended, idle at its goal, which is not counted.
    const instance = tinyInstance('....\n....\n....', [[[0, 0], [2, 0], 'E'], [[0, 1], [3, 1], 'E'], [[0, 2], [1, 2], 'E']]);
    const f = (y: number, x: number, start: number, end: number, step: number) =>
      ({ action: 'forward' as const, from: [x, y] as [number, number], to: [x + 1, y] as [number, number], heading: 'E' as const, start, end, step });
    const schedule: Schedule = [
      [f(0, 0, 0, 1000, 0), { action: 'wait', from: [1, 0], to: [1, 0], heading: 'E', start: 1000, end: 2000, step: 1 }, f(0, 1, 2000, 3000, 2)],
      [f(1, 0, 0, 1000, 0), f(1, 1, 1000, 3500, 1), f(1, 2, 3500, 4500, 2)],
      [f(2, 0, 0, 1000, 0)],
    ];
    const t = realisedTimeline(instance, { timeline: 'steps', schedule }, profile, { policy: 'lockstep', seed: 1, noise: { jitterCv: 0 } });
    expect(t.metrics.collisions).toEqual([]);
    expect(t.robots[0].map((a) => [a.start, a.end, a.waitedMs])).toEqual([[0, 1000, 0], [1000, 2000, 0], [3500, 4500, 1500]]);
    // Agent 2's padding: the step-2 wait is held back 1500 ms by the barrier (shown per action) …
    expect(t.robots[2].map((a) => [a.isPadding, a.start, a.end, a.waitedMs])).toEqual([[false, 0, 1000, 0], [true, 1000, 2000, 0], [true, 3500, 4500, 1500]]);
    // … but only agent 0's 1500 ms count: sum 1500, mean over 3 robots 500, max 1500 (3000 / 1000 / 1500 before issue 12).
    expect([t.metrics.waitingMs, t.metrics.waitingMeanPerRobotMs, t.metrics.waitingMaxPerRobotMs]).toEqual([1500, 500, 1500]);
    expect(t.waitByRobot).toEqual([
      { robot: 0, waitedMs: 1500, waitedFor: [{ robot: 1, ms: 1500 }] },
      { robot: 1, waitedMs: 0, waitedFor: [] },
      { robot: 2, waitedMs: 0, waitedFor: [] },
    ]);
    expectConsistentAttribution(t);
    const s = simulateExecution(instance, { timeline: 'steps', schedule }, profile, { policy: 'lockstep', seed: 1, noise: { jitterCv: 0 } });
    expect([s.waitingMs.mean, s.waitingPerRobotMs.mean.mean, s.waitingPerRobotMs.max.mean]).toEqual([1500, 500, 1500]);
  });
});

describe('attribution is consistent under every policy and noise', () => {
  it('waits per robot add up, each release is an end of the named robot, the chain tiles up to the makespan', () => {
    let runs = 0;
    let chainWaits = 0;
    const reasons = new Set<string>();
    for (const { instance, profile: p, solved } of weightedTestPlans(16, 5)) {
      for (const policy of ['open-loop', 'lockstep', 'dependency-gated'] as ExecutionPolicy[]) {
        for (const timeline of ['ms', 'steps'] as const) {
          const plan = { timeline, schedule: solved.schedule };
          for (const seed of [1, 2]) {
            const t = realisedTimeline(instance, plan, p, { policy, seed, noise: { jitterCv: 0.3, stallProbability: 0.1, stallMs: 900 } });
            expectConsistentAttribution(t);
            for (const s of t.criticalChain) reasons.add(s.reason);
            chainWaits += t.criticalChain.filter((s) => s.reason !== 'own').length;
            runs++;
          }
        }
      }
    }
    expect(runs).toBe(16 * 3 * 2 * 2);
    expect(chainWaits).toBeGreaterThan(10);
    expect([...reasons].sort()).toEqual(['barrier', 'dependency', 'own', 'planned-start']);
  });
});
