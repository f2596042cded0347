/**
 * Replays a plan under each requested execution policy with Monte Carlo noise and keeps the
 * summaries without their per-run lists. Simulation is no safety assessment: it checks a plan
 * against an idealised fleet model, never replaces the applicable safety standards and local rules.
 */
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
        successRate: s.successRate,
        collisions: s.collisions,
        realisedMakespanMs: s.realisedMakespanMs,
        realisedSocMs: s.realisedSocMs,
        finishSpreadMs: s.finishSpreadMs,
        waitingMs: s.waitingMs,
      };
    } catch (err) {
      const none = { mean: null, p95: null };
      return {
        policy,
        noise: { jitterCv: execution.jitterCv ?? profile.timingJitter, stallProbability: execution.stallProbability, stallMs: execution.stallMs },
        runs: 0, successRate: 0, collisions: { mean: 0, p95: 0, total: 0 },
        realisedMakespanMs: none, realisedSocMs: none, finishSpreadMs: none, waitingMs: none,
        error: err instanceof Error ? err.message : String(err),
      };
    }
  });
}
