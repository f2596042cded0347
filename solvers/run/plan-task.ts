/**
 * What a worker thread is handed and what it answers: plain JSON-safe data, so a task can
 * cross a thread boundary (structured clone) or be logged. The grid travels as a string of
 * '1' (free) / '0' (blocked) per cell, row by row, so no typed array needs transferring.
 */
import type { Interval95 } from '@shared/confidence-interval';
import type { RobotProfile, Schedule } from '@shared/plan';
import type { RunOutcome } from '@shared/runs';
import type { ModelSpec, SweepPolicy } from '@shared/sweeps';
import type { AgentTask } from '../instance';

/** A MAPF instance in transferable form; cells are `y * width + x`. */
export interface TaskInstance {
  readonly width: number;
  readonly height: number;
  /** width × height characters, '1' = free, '0' = blocked. */
  readonly cells: string;
  readonly agents: readonly AgentTask[];
}

/** Replay settings of one task: the policies to simulate and their noise. */
export interface TaskExecution {
  readonly policies: readonly SweepPolicy[];
  /** Absent: the profile's timing jitter. */
  readonly jitterCv?: number;
  readonly stallProbability: number;
  readonly stallMs: number;
  /** Monte Carlo runs per policy. */
  readonly runs: number;
}

/** One run: solve `instance` under `model`, validate, derive the schedule, replay it. */
export interface PlanTask {
  readonly model: ModelSpec;
  readonly instance: TaskInstance;
  readonly profile: RobotProfile;
  readonly timeLimitMs: number;
  readonly memoryLimitMb: number;
  readonly seed: number;
  readonly execution: TaskExecution;
}

/** The plan a solved task produced: unit-step paths (cell indices per step) or a timed schedule. */
export type TaskPlan =
  | { readonly kind: 'paths'; readonly paths: readonly (readonly number[])[] }
  | { readonly kind: 'schedule'; readonly schedule: Schedule };

/**
 * One metric over a batch's runs as stored: mean and nearest-rank p95 with their 95 % intervals
 * (solvers/execute MetricStats). Rows stored before the intervals existed have mean and p95 only.
 */
export interface TaskMetricStats {
  readonly mean: number | null;
  readonly p95: number | null;
  readonly count: number;
  readonly meanCi95: Interval95 | null;
  readonly p95Ci95: Interval95 | null;
}

/**
 * The Monte Carlo summary of one policy, without the per-run list (kept small for storage; the
 * worker stores it whole in executions.metrics). `seed`, `onCollision`, `runs`, `policy` and the
 * resolved `noise` are exactly the settings that reproduce every figure with simulateExecution.
 */
export interface TaskExecutionSummary {
  readonly policy: SweepPolicy;
  readonly noise: { readonly jitterCv: number; readonly stallProbability: number; readonly stallMs: number };
  readonly runs: number;
  /** The batch seed passed to simulateExecution (the run's seed). */
  readonly seed: number;
  /** Sweeps only count collisions. */
  readonly onCollision: 'count';
  readonly successRate: number;
  /** Wilson score 95 % interval of the success rate. */
  readonly successRateCi95: Interval95;
  /** 95 % intervals of the success rate and of the means of realised makespan and finish spread. */
  readonly ci95: { readonly successRate: Interval95; readonly realisedMakespanMs: Interval95 | null; readonly finishSpreadMs: Interval95 | null };
  readonly collisions: { readonly mean: number; readonly p95: number; readonly total: number };
  readonly realisedMakespanMs: TaskMetricStats;
  readonly realisedSocMs: TaskMetricStats;
  readonly finishSpreadMs: TaskMetricStats;
  /** Per run the waiting SUMMED over robots, then over runs ("total over robots"). */
  readonly waitingMs: TaskMetricStats;
  /** Per run the mean / max over robots of each robot's waiting, then over runs. */
  readonly waitingPerRobotMs: { readonly mean: TaskMetricStats; readonly max: TaskMetricStats };
  /** Set when the simulator refused the plan; the other figures are then zero/null. */
  readonly error?: string;
}

/** What a task answers. Figures are null unless the status gives them. */
export interface PlanTaskResult {
  readonly status: RunOutcome;
  /** Why, for every status but solved. */
  readonly reason?: string;
  /** In the model's own unit (steps; ms for weighted-split). */
  readonly soc: number | null;
  readonly makespan: number | null;
  readonly turnInclusiveSocMs: number | null;
  readonly turnInclusiveMakespanMs: number | null;
  /** Best proven lower bound on the optimal SOC, model's own unit. */
  readonly lowerBound: number | null;
  /** Solve time by the injected clock, ms. */
  readonly runtimeMs: number;
  readonly nodesGenerated: number;
  readonly nodesExpanded: number;
  readonly turns: number | null;
  readonly plan: TaskPlan | null;
  readonly executions: readonly TaskExecutionSummary[];
  /**
   * The plan replayed open-loop with zero noise under its own profile (solvers/run/nominal-check.ts):
   * whether it is collision-free and how many collisions it has. Absent unless solved.
   */
  readonly atNominal?: { readonly isCollisionFree: boolean; readonly collisions: number };
}
