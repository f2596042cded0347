/**
 * Monte Carlo execution of one plan: N seeded runs under one policy and noise model, summarised
 * as success rate and mean / p95 of each metric, each with its 95 % confidence interval
 * (shared/confidence-interval.ts; computed once per batch, never per run). Deterministic for a seed.
 * Simulation is no safety assessment; see execution-types.ts.
 */
import { nonNegativeMeanInterval, wilsonInterval } from '@shared/confidence-interval';
import type { RobotProfile } from '@shared/plan';
import type { MapfInstance } from '../instance';
import { ExecutionRunner } from './execution-runner';
import type { ExecutablePlan, ExecutionOptions, ExecutionSummary, RunMetrics } from './execution-types';
import { metricStats } from './metric-stats';

/** Simulates `options.runs` (default 1) runs of `plan` and summarises them; throws on an invalid plan, profile or option. */
export function simulateExecution(
  instance: MapfInstance,
  plan: ExecutablePlan,
  profile: RobotProfile,
  options: ExecutionOptions,
): ExecutionSummary {
  const runs = options.runs ?? 1;
  if (!Number.isInteger(runs) || runs < 1) throw new Error(`execution: field "runs" must be a positive integer, got ${runs}`);
  const runner = new ExecutionRunner(instance, plan, profile, options);
  const perRun: RunMetrics[] = [];
  let isAborted = false;
  for (let r = 0; r < runs; r++) {
    if (options.signal?.aborted) {
      isAborted = true;
      break;
    }
    perRun.push(runner.run(r));
  }
  return summariseRuns(runner, options, perRun, isAborted);
}

/** The Monte Carlo summary of runs `perRun` of `runner` (the web viewer's chunked re-runs summarise with it too). */
export function summariseRuns(
  runner: ExecutionRunner, options: Pick<ExecutionOptions, 'policy' | 'seed'>, perRun: readonly RunMetrics[], isAborted: boolean,
): ExecutionSummary {
  const n = perRun.length;
  const counts = perRun.map((m) => m.collisions.length);
  const hit = perRun.find((m) => m.collisions.length > 0);
  const collisionStats = metricStats(counts);
  const successes = perRun.filter((m) => m.isSuccess).length;
  const successRateCi95 = wilsonInterval(successes, n);
  const realisedMakespanMs = metricStats(perRun.map((m) => m.realisedMakespanMs));
  const finishSpreadMs = metricStats(perRun.map((m) => m.finishSpreadMs));
  return {
    policy: options.policy,
    noise: runner.noise,
    onCollision: runner.onCollision,
    seed: options.seed,
    runs: n,
    isAborted,
    successRate: n === 0 ? 0 : successes / n,
    successRateCi95,
    ci95: { successRate: successRateCi95, realisedMakespanMs: realisedMakespanMs.meanCi95, finishSpreadMs: finishSpreadMs.meanCi95 },
    collisions: {
      mean: collisionStats.mean ?? 0,
      p95: collisionStats.p95 ?? 0,
      total: counts.reduce((s, c) => s + c, 0),
      // A mean of counts cannot be negative: the t interval is cut at 0 (a few rare collisions
      // would otherwise print a negative lower bound).
      meanCi95: nonNegativeMeanInterval(counts),
      p95Ci95: collisionStats.p95Ci95,
    },
    realisedMakespanMs,
    realisedSocMs: metricStats(perRun.map((m) => m.realisedSocMs)),
    finishSpreadMs,
    waitingMs: metricStats(perRun.map((m) => m.waitingMs)),
    waitingPerRobotMs: {
      mean: metricStats(perRun.map((m) => m.waitingMeanPerRobotMs)),
      max: metricStats(perRun.map((m) => m.waitingMaxPerRobotMs)),
    },
    firstCollision: hit ? { ...hit.collisions[0], run: hit.run } : null,
    perRun,
  };
}
