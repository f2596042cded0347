import type { RobotProfile } from '@shared/plan';
import { tinyInstance } from '../testing/tiny-instance';
import { validateSchedule } from '../validate/schedule';
import { solveWeightedSplit, type WeightedSplitResult } from './weighted-split';

const profile = (forwardMs: number, quarterTurnMs: number): RobotProfile => ({
  forwardMs,
  quarterTurnMs,
  waitMs: 100,
  cellPitchMm: 300,
  robotDiameterMm: 200,
  timingJitter: 0,
});

/**
 * Worked by hand (F = forward 10 ms, T = quarter turn 7 ms). Corridor (0,0)…(4,0) with one
 * passing bay (2,1) below the middle. A starts at (0,0) facing E bound for (4,0); B starts at
 * (4,0) facing W bound for (0,0). On a line the agents can only pass if one of them stands in
 * the bay while the other crosses (2,0); the map is mirror-symmetric, so say B steps aside.
 * B: forward ×2 to (2,0), turn to S, forward into the bay: its move into the bay ends at
 * ≥ 3F + T = 37, and A's move into (2,0) cannot start earlier (it occupies (2,0) from its
 * start). A needs 3 moves from (1,0) on: A arrives at ≥ 37 + 3F = 67. B may leave the bay only
 * once A's move out of (2,0) has ended, ≥ 37 + 2F = 57 (its two turns, 2T = 14 ≤ 2F, fit in
 * the wait), then forward, turn to W, forward ×2: B arrives at ≥ 57 + 3F + T = 94. Both bounds
 * are met by the schedule above (A waits at its start), so the optimal SOC = 67 + 94 = 161 ms.
 */
const corridor = tinyInstance('.....\n##.##', [
  [[0, 0], [4, 0], 'E'],
  [[4, 0], [0, 0], 'W'],
]);

const zeroClock = (): number => 0;

describe('solveWeightedSplit', () => {
  it('finds the hand-derived optimum in a corridor with a passing bay', () => {
    // Arrange: see the comment on `corridor`.
    // Act
    const r = solveWeightedSplit(corridor, { profile: profile(10, 7), startHeading: 'free', now: zeroClock });
    // Assert
    expect(r.status).toBe('solved');
    expect(r.socMs).toBe(161);
    expect(r.makespanMs).toBe(94);
    expect(r.lowerBoundMs).toBe(161);
    expect(r.turns).toBe(4);
    expect(r.schedule[0][0].heading).toBe('E');
    expect(r.schedule[1][0].heading).toBe('W');
    expect(validateSchedule(corridor, r.schedule, profile(10, 7), { startHeading: 'free' })).toEqual({ ok: true, soc: 161, makespan: 94 });
  });

  it('echoes the model, the profile and the start heading rule', () => {
    // Arrange
    const p = profile(3, 2);
    const one = tinyInstance('...', [[[0, 0], [2, 0]]]);
    // Act
    const r = solveWeightedSplit(one, { profile: p, startHeading: 'S', now: zeroClock });
    // Assert: facing S, the agent turns left (S → E) and drives twice: 2 + 2 × 3 ms.
    expect(r).toMatchObject({ model: 'weighted-split', profile: p, startHeading: 'S', status: 'solved', socMs: 8, turns: 1 });
    expect(r.schedule[0].map((a) => [a.action, a.start, a.end, a.step])).toEqual([
      ['turn-left', 0, 2, 0],
      ['forward', 2, 5, 1],
      ['forward', 5, 8, 2],
    ]);
  });

  it('gives an agent already at its goal an empty action list', () => {
    // Arrange
    const alone = tinyInstance('...', [[[1, 0], [1, 0]]]);
    // Act
    const r = solveWeightedSplit(alone, { profile: profile(3, 2), startHeading: 'free', now: zeroClock });
    // Assert
    expect(r.schedule).toEqual([[]]);
    expect(r.socMs).toBe(0);
  });

  it('runs into its node limit, not a wrong answer, when no plan exists', () => {
    // Arrange: agent 1 cannot pass the parked agent 0 on a line; waiting longer never helps,
    // so the constraint tree is infinite and only a limit ends the search.
    const inst = tinyInstance('...', [[[1, 0], [1, 0]], [[0, 0], [2, 0]]]);
    // Act
    const r = solveWeightedSplit(inst, { profile: profile(3, 2), startHeading: 'free', now: zeroClock, nodeLimit: 200 });
    // Assert
    expect(r.status).toBe('timeout');
    expect(r.nodes.expanded).toBe(200);
  });

  it('reports a shared goal and an unreachable goal as infeasible without searching', () => {
    // Arrange
    const shared = tinyInstance('...', [[[0, 0], [1, 0]], [[2, 0], [1, 0]]]);
    const walled = tinyInstance('.#.', [[[0, 0], [2, 0]]]);
    // Act
    const a = solveWeightedSplit(shared, { profile: profile(3, 2), startHeading: 'free', now: zeroClock });
    const b = solveWeightedSplit(walled, { profile: profile(3, 2), startHeading: 'free', now: zeroClock });
    // Assert
    expect([a.status, a.infeasibleReason, a.nodes.generated]).toEqual(['infeasible', 'shared-goal', 0]);
    expect([b.status, b.infeasibleReason, b.nodes.generated]).toEqual(['infeasible', 'goal-unreachable', 0]);
  });

  it('rejects invalid input with a message naming the field', () => {
    // Arrange
    const inst = tinyInstance('.#.', [[[0, 0], [2, 0]]]);
    const blocked = { ...inst, agents: [{ start: 1, goal: 0 }] };
    // Act / Assert
    expect(() => solveWeightedSplit(inst, { profile: profile(0, 2), startHeading: 'free' })).toThrow(/forwardMs/);
    expect(() => solveWeightedSplit(inst, { profile: profile(3, 2.5), startHeading: 'free' })).toThrow(/quarterTurnMs/);
    expect(() => solveWeightedSplit(blocked, { profile: profile(3, 2), startHeading: 'free' })).toThrow(/agent 0 start \(1, 0\) is a blocked cell/);
  });

  it('stops at the node limit with a lower bound no higher than the optimum', () => {
    // Arrange
    const opts = { profile: profile(10, 7), startHeading: 'free' as const, now: zeroClock };
    // Act
    const r = solveWeightedSplit(corridor, { ...opts, nodeLimit: 5 });
    // Assert
    expect(r.status).toBe('timeout');
    expect(r.schedule).toEqual([]);
    expect(r.lowerBoundMs).not.toBeNull();
    expect(r.lowerBoundMs as number).toBeLessThanOrEqual(161);
    expect(r.lowerBoundMs as number).toBeGreaterThanOrEqual(40 + 40);
    expect(r.nodes.expanded).toBe(5);
  });

  it('stops at the time limit of the injected clock', () => {
    // Arrange: a clock that advances 1 ms per reading.
    let t = 0;
    const now = (): number => t++;
    // Act
    const r = solveWeightedSplit(corridor, { profile: profile(10, 7), startHeading: 'free', now, timeLimitMs: 20 });
    // Assert
    expect(r.status).toBe('timeout');
    expect(r.lowerBoundMs as number).toBeLessThanOrEqual(161);
    expect(r.runtimeMs).toBeGreaterThanOrEqual(20);
  });

  it('stops when its signal is aborted', () => {
    // Arrange
    const controller = new AbortController();
    controller.abort();
    // Act
    const r = solveWeightedSplit(corridor, { profile: profile(10, 7), startHeading: 'free', now: zeroClock, signal: controller.signal });
    // Assert
    expect(r.status).toBe('aborted');
    expect(r.schedule).toEqual([]);
  });

  it('is deterministic', () => {
    // Arrange
    const inst = tinyInstance('....\n.#..\n....', [[[0, 0], [3, 2]], [[3, 0], [0, 2]], [[0, 2], [3, 0]]]);
    const run = (): WeightedSplitResult => solveWeightedSplit(inst, { profile: profile(2, 3), startHeading: 'free', now: zeroClock });
    // Act
    const a = run();
    const b = run();
    // Assert
    expect(a.status).toBe('solved');
    expect(b).toEqual(a);
  });
});
