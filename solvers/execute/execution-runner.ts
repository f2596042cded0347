/**
 * One plan prepared for execution, able to simulate any run of a seeded batch: draws the
 * run's durations, realises times under the policy, detects collisions exactly and computes
 * the run's metrics. With `stop` on collision, the earliest collision stops both robots where
 * they touched (robots waiting on them, through a barrier or a dependency, then wait forever)
 * and the run is re-realised until no further robot is hit.
 */
import type { RobotProfile } from '@shared/plan';
import type { MapfInstance } from '../instance';
import { CollisionSweep, type BroadphaseStrategy } from './collision-sweep';
import { buildActionDependencies, type ActionDependencies } from './dependency-graph';
import type { Collision, CollisionMode, ExecutablePlan, ExecutionOptions, NoiseModel, RunMetrics } from './execution-types';
import { drawDurations, resolveNoise, runSeed } from './noise';
import { preparePlan, type PreparedPlan } from './prepared-plan';
import { createRunTimes, realiseTimes, releasePlan, type ReleasePlan, type RunTimes } from './realise-times';
import { timingFigures } from './run-figures';

/** Times closer than this are the same instant when matching collisions across re-realisations. */
const SAME_TIME_MS = 1e-6;

/** Reusable simulator of one plan under one policy and noise model. */
export class ExecutionRunner {
  /** The checked, padded plan. */
  readonly prepared: PreparedPlan;
  readonly noise: NoiseModel;
  readonly onCollision: CollisionMode;
  readonly dependencies: ActionDependencies | undefined;
  private readonly release: ReleasePlan;
  private readonly sweep: CollisionSweep;
  private readonly seed: number;
  /** Buffers of the last simulated run. */
  readonly duration: Float64Array;
  readonly times: RunTimes;
  readonly stoppedAt: Float64Array;

  /** `broadphase` forces how collision candidates are found (tests); every choice gives the same runs. */
  constructor(
    instance: MapfInstance, plan: ExecutablePlan, profile: RobotProfile, options: Omit<ExecutionOptions, 'runs' | 'signal'>,
    broadphase: BroadphaseStrategy = 'auto',
  ) {
    if (!['open-loop', 'lockstep', 'dependency-gated'].includes(options.policy)) {
      throw new Error(`execution: unknown policy ${JSON.stringify(options.policy)}`);
    }
    this.prepared = preparePlan(instance, plan, profile);
    this.noise = resolveNoise(profile, options.noise);
    this.onCollision = options.onCollision ?? 'count';
    this.seed = options.seed;
    this.dependencies = options.policy === 'dependency-gated' ? buildActionDependencies(this.prepared) : undefined;
    this.release = releasePlan(this.prepared, options.policy, this.dependencies);
    this.sweep = new CollisionSweep(this.prepared, broadphase);
    this.duration = new Float64Array(this.prepared.actionCount);
    this.times = createRunTimes(this.prepared.actionCount);
    this.stoppedAt = new Float64Array(this.prepared.robotCount);
  }

  /** Simulates run `run` of the batch (deterministic for the batch seed and run index). */
  run(run: number): RunMetrics {
    const p = this.prepared;
    drawDurations(p, this.noise, runSeed(this.seed, run), this.duration);
    this.stoppedAt.fill(Infinity);
    realiseTimes(p, this.release, this.duration, this.stoppedAt, this.times);
    let collisions = this.sweep.detect(this.times, this.duration);
    if (this.onCollision === 'stop' && collisions.length > 0) collisions = this.stopAtCollisions(collisions);
    collisions.sort((a, b) => a.timeMs - b.timeMs || a.robots[0] - b.robots[0] || a.robots[1] - b.robots[1]);
    return this.metrics(run, collisions);
  }

  private stopAtCollisions(initial: Collision[]): Collision[] {
    const recorded: Collision[] = [];
    let found = initial;
    for (;;) {
      let best: Collision | undefined;
      for (const c of found) {
        const [i, j] = c.robots;
        const isSettled = this.stoppedAt[i] <= c.timeMs + SAME_TIME_MS && this.stoppedAt[j] <= c.timeMs + SAME_TIME_MS;
        if (isSettled) continue;
        if (!best || c.timeMs < best.timeMs) best = c;
      }
      if (!best) return recorded;
      recorded.push(best);
      const [i, j] = best.robots;
      this.stoppedAt[i] = Math.min(this.stoppedAt[i], best.timeMs);
      this.stoppedAt[j] = Math.min(this.stoppedAt[j], best.timeMs);
      realiseTimes(this.prepared, this.release, this.duration, this.stoppedAt, this.times);
      found = this.sweep.detect(this.times, this.duration);
    }
  }

  private metrics(run: number, collisions: readonly Collision[]): RunMetrics {
    const figures = timingFigures(this.prepared, this.times.end, this.times.waited);
    const isDeadlocked = this.dependencies?.hasDeadlock ?? false;
    return {
      run,
      isSuccess: figures.realisedMakespanMs !== null && !isDeadlocked && collisions.length === 0,
      isDeadlocked,
      collisions,
      ...figures,
    };
  }
}
