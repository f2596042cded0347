/**
 * "Executable at nominal times": a plan replayed open-loop with zero noise (no timing jitter, no
 * stalls) under its own robot profile, one run, counting every collision. A plan that collides
 * here collides even when every robot keeps its planned times exactly, so no execution policy
 * rescues it by luck; the leaderboard ranks such plans after the ones that pass.
 * Pure and deterministic (zero noise draws nothing). Simulation is no safety assessment.
 */
import type { PlanModel, RobotProfile, StartHeading } from '@shared/plan';
import { simulateExecution } from '../execute';
import type { ExecutablePlan } from '../execute/execution-types';
import type { MapfInstance } from '../instance';
import { scheduleFromPaths } from '../models/turn-schedule';
import type { TaskPlan } from './plan-task';

/** The outcome of the nominal replay. */
export interface NominalCheck {
  /** No collision in the zero-noise open-loop replay. */
  readonly isCollisionFree: boolean;
  /** Collisions in that replay (overlap intervals of two robots). */
  readonly collisions: number;
}

/** Zero noise: durations exactly as planned, no stalls. */
const NOMINAL_NOISE = { jitterCv: 0, stallProbability: 0, stallMs: 0 } as const;

/** Replays `plan` open-loop at nominal times under `profile` and counts its collisions. */
export function checkAtNominal(instance: MapfInstance, plan: ExecutablePlan, profile: RobotProfile): NominalCheck {
  const s = simulateExecution(instance, plan, profile, { policy: 'open-loop', noise: NOMINAL_NOISE, onCollision: 'count', runs: 1, seed: 0 });
  return { isCollisionFree: s.collisions.total === 0, collisions: s.collisions.total };
}

/**
 * The plan a runner replayed, rebuilt from what it stored: unit-step paths get the same
 * turn-inclusive schedule the runners derive (stretched steps for uniform-duration), stored
 * schedules are used as they are; weighted-split runs on the ms timeline, the others on steps.
 */
export function executablePlanOf(
  model: PlanModel, plan: TaskPlan, instance: MapfInstance, profile: RobotProfile, startHeading: StartHeading,
): ExecutablePlan {
  if (plan.kind === 'schedule') return { timeline: model === 'weighted-split' ? 'ms' : 'steps', schedule: plan.schedule };
  const turned = scheduleFromPaths(instance, plan.paths, profile, { startHeading, stretch: model === 'uniform-duration' ? 'uniform' : 'none' });
  return { timeline: 'steps', schedule: turned.schedule };
}
