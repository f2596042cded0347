/**
 * Replays a plan under each requested execution policy with Monte Carlo noise and keeps the
 * summaries without their per-run lists, with their 95 % intervals and the seed and collision
 * mode that reproduce them exactly (simulateExecution with these settings gives the same
 * figures). Simulation is no safety assessment: it checks a plan against an idealised fleet
 * model, never replaces the applicable safety standards and local rules.
 */
import { wilsonInterval } from '@shared/confidence-interval';
import type { RobotProfile } from '@shared/plan';
import { simulateExecution } from '../execute';
import type { ExecutablePlan } from '../execute/execution-types';
import type { MapfInstance } from '../instance';
import type { TaskExecution, TaskExecutionSummary } from './plan-task';

/** One summary per policy of `execution`, in its order; a policy the simulator refuses gets `error`. */
export function replayPlan(
  instance: MapfInstance,
  plan: ExecutablePlan,
  profile: RobotProfile,
  execution: TaskExecution,
  seed: number,
  signal?: AbortSignal,
): TaskExecutionSummary[] {
  const noise = {
    ...(execution.jitterCv !== undefined ? { jitterCv: execution.jitterCv } : {}),
    stallProbability: execution.stallProbability,
    stallMs: execution.stallMs,
  };
  return execution.policies.map((policy) => {
    try {
      const s = simulateExecution(instance, plan, profile, { policy, noise, runs: execution.runs, seed, signal });
      return {
        policy,
        noise: s.noise,
        runs: s.runs,
        seed: s.seed,
        onCollision: 'count' as const,
        successRate: s.successRate,
        successRateCi95: s.successRateCi95,
        ci95: s.ci95,
        collisions: s.collisions,
        realisedMakespanMs: s.realisedMakespanMs,
        realisedSocMs: s.realisedSocMs,
        finishSpreadMs: s.finishSpreadMs,
        waitingMs: s.waitingMs,
        waitingPerRobotMs: s.waitingPerRobotMs,
      };
    } catch (err) {
      const none = { mean: null, p95: null, count: 0, meanCi95: null, p95Ci95: null };
      const unknownRate = wilsonInterval(0, 0);
      return {
        policy,
        noise: { jitterCv: execution.jitterCv ?? profile.timingJitter, stallProbability: execution.stallProbability, stallMs: execution.stallMs },
        runs: 0, seed, onCollision: 'count' as const, successRate: 0, successRateCi95: unknownRate,
        ci95: { successRate: unknownRate, realisedMakespanMs: null, finishSpreadMs: null },
        collisions: { mean: 0, p95: 0, total: 0 },
        realisedMakespanMs: none, realisedSocMs: none, finishSpreadMs: none, waitingMs: none, waitingPerRobotMs: { mean: none, max: none },
        error: err instanceof Error ? err.message : String(err),
      };
    }
  });
}
