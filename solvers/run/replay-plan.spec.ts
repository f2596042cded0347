// Sweep-stored execution summaries are replayable: the stored settings reproduce every figure.
import type { RobotProfile } from '@shared/plan';
import { simulateExecution } from '../execute';
import { datasetInstance } from '../execute/testing/dataset-instances';
import { prioritisedPaths } from '../execute/testing/prioritised-paths';
import { scheduleFromPaths } from '../models/turn-schedule';
import { replayPlan } from './replay-plan';

const profile: RobotProfile = { forwardMs: 1000, quarterTurnMs: 1500, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 450, timingJitter: 0.2 };

describe('replayPlan', () => {
  it('stores the seed, the collision mode and the intervals, and those settings give the same figures again', () => {
    const instance = datasetInstance('empty-8-8', 'empty-8-8-even-2', 6);
    const ts = scheduleFromPaths(instance, prioritisedPaths(instance) as number[][], profile, { startHeading: 'free', stretch: 'none' });
    const plan = { timeline: 'steps' as const, schedule: ts.schedule };
    const stored = replayPlan(instance, plan, profile, { policies: ['open-loop', 'lockstep', 'dependency-gated'], stallProbability: 0.05, stallMs: 2000, runs: 30 }, 987);
    expect(stored).toHaveLength(3);
    for (const e of stored) {
      expect(e.error).toBeUndefined();
      expect([e.seed, e.onCollision, e.runs]).toEqual([987, 'count', 30]);
      // JSON round trip, as executions.metrics stores it, then a replay from the stored settings only.
      const row = JSON.parse(JSON.stringify(e)) as typeof e;
      const again = simulateExecution(instance, plan, profile, { policy: row.policy, noise: row.noise, runs: row.runs, seed: row.seed, onCollision: row.onCollision });
      const { perRun: _perRun, isAborted: _isAborted, firstCollision: _first, ...figures } = again;
      expect({ ...figures, policy: row.policy }).toMatchObject(JSON.parse(JSON.stringify({ ...row, error: undefined })));
      expect(row.successRateCi95).toEqual(again.successRateCi95);
      expect(row.ci95.realisedMakespanMs).toEqual(again.ci95.realisedMakespanMs);
      expect(row.waitingPerRobotMs).toEqual(JSON.parse(JSON.stringify(again.waitingPerRobotMs)));
    }
  });

  it('a plan the simulator refuses stores an error with empty figures and still the settings', () => {
    const instance = datasetInstance('empty-8-8', 'empty-8-8-even-2', 2);
    const [e] = replayPlan(instance, { timeline: 'steps', schedule: [[], []] }, profile, { policies: ['open-loop'], stallProbability: 0, stallMs: 0, runs: 5 }, 3);
    expect(e.error).toMatch(/plan: agent 0/);
    expect(e).toMatchObject({ runs: 0, seed: 3, onCollision: 'count', successRateCi95: [0, 1], ci95: { successRate: [0, 1], realisedMakespanMs: null } });
    expect(e.waitingPerRobotMs.max).toEqual({ mean: null, p95: null, count: 0, meanCi95: null, p95Ci95: null });
  });
});
