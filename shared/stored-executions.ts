/**
 * GET /api/executions/stored/:resultId: the Monte Carlo replays a sweep stored with one result
 * (one per execution policy), each with the exact settings it ran with, so the plan viewer can
 * replay the result with those settings and show the stored figures (issue 12, item 1).
 * Zod-free, types and pure helpers only: the web imports it.
 */
import type { Interval95 } from './confidence-interval';
import type { CollisionModeName, ExecutionPolicyName } from './executions-constants';
import type { PlanModel, RobotProfile } from './plan';

/** Everything that decides a replay's figures besides the plan, the model and the robot profile. */
export interface StoredExecutionSettings {
  readonly policy: ExecutionPolicyName;
  /** jitterCv is the value the sweep resolved (its own setting, or the profile's timing jitter). */
  readonly noise: { readonly jitterCv: number; readonly stallProbability: number; readonly stallMs: number };
  readonly runs: number;
  /** The batch seed: the sweep run's seed (results.seed). */
  readonly seed: number;
  readonly onCollision: CollisionModeName;
}

/** Mean and nearest-rank p95 of a metric, as stored; the interval fields exist on rows stored after issue 12. */
export interface StoredMetric {
  readonly mean: number | null;
  readonly p95: number | null;
  readonly count?: number;
  readonly meanCi95?: Interval95 | null;
  readonly p95Ci95?: Interval95 | null;
}

/** The figures a sweep stored for one policy (the leaderboard reads the same row). */
export interface StoredExecutionFigures {
  readonly successRate: number;
  /**
   * Collisions per run (mean, p95) and over all runs (total). p95 and total are null when not
   * stored: rows written before the sweep kept them hold only the mean (executions.collisions_mean).
   */
  readonly collisions: { readonly mean: number; readonly p95: number | null; readonly total: number | null };
  readonly realisedMakespanMs: StoredMetric;
  readonly realisedSocMs: StoredMetric;
  readonly finishSpreadMs: StoredMetric;
  /** Sum over robots of the time each waited, per run (mean / p95 over runs). */
  readonly waitingMs: StoredMetric;
  readonly successRateCi95?: Interval95;
  readonly waitingPerRobotMs?: { readonly mean: StoredMetric; readonly max: StoredMetric };
}

/** One stored policy replay of the result. */
export interface StoredPolicyExecution {
  readonly settings: StoredExecutionSettings;
  readonly figures: StoredExecutionFigures;
  /**
   * Which settings the row recorded itself; the others were taken from what the sweep used when
   * the row was written (seed = the run's seed, onCollision = 'count', the only mode sweeps ran).
   */
  readonly recorded: { readonly seed: boolean; readonly onCollision: boolean };
  /** Set when the simulator refused the plan under this policy; figures are then empty. */
  readonly error: string | null;
}

/** 200 of GET /api/executions/stored/:resultId. */
export interface StoredResultExecutionsView {
  readonly resultId: number;
  readonly sweepId: number | null;
  readonly model: PlanModel;
  readonly profile: RobotProfile;
  /** In the order of EXECUTION_POLICY_NAMES; empty for results stored without replays (submitted plans). */
  readonly executions: readonly StoredPolicyExecution[];
}
