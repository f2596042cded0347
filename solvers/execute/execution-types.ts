/**
 * Types of the fleet execution simulator: what goes in (a plan with its timeline, a policy, a
 * noise model) and what comes out (per-run metrics, a Monte Carlo summary, a one-run timeline).
 *
 * Geometry and sign conventions: robots are disks of `profile.robotDiameterMm` centred on cell
 * centres; the centre of cell [x, y] is at (x · pitch, y · pitch) mm, x to the right, y
 * downwards (N is towards smaller y). Times are ms from plan start.
 * Simulation is no safety assessment: it checks a plan against an idealised model of the fleet,
 * never replaces the applicable safety standards and local rules for robots near people.
 */
import type { ActionKind, CellXY, Heading, Schedule } from '@shared/plan';

/**
 * How robots are released onto their actions.
 * - `open-loop`: each robot runs its own action list back to back from t = 0.
 * - `lockstep`: an action of abstract step s starts only when every robot has finished all its
 *   actions of steps < s (a global barrier between `step` values).
 * - `dependency-gated`: the Action Dependency Graph of Hönig et al. (see dependency-graph.ts).
 */
export type ExecutionPolicy = 'open-loop' | 'lockstep' | 'dependency-gated';

/** The execution policies, in display order. */
export const EXECUTION_POLICIES: readonly ExecutionPolicy[] = ['open-loop', 'lockstep', 'dependency-gated'];

/** What a collision does to a run: only counted, or the two robots stop where they touched (the run fails). */
export type CollisionMode = 'count' | 'stop';

/**
 * Timing noise. Each action's duration is multiplied by a log-normal factor with mean 1 and
 * coefficient of variation `jitterCv` (σ² = ln(1 + cv²), μ = −σ²/2), then with probability
 * `stallProbability` a stall of `stallMs` is added. Zero noise reproduces nominal times exactly.
 */
export interface NoiseModel {
  readonly jitterCv: number;
  readonly stallProbability: number;
  readonly stallMs: number;
}

/**
 * A plan as handed to the fleet. `timeline` says what `step` counts: `steps` for classic,
 * uniform-duration, orientation-split and k-robust (abstract unit steps), `ms` for weighted-split.
 * For finish spread every robot's list is padded to the plan's makespan on that timeline:
 * `steps`: with wait steps of `paddingWaitMs` until it has steps 0 … M−1 (M = largest step + 1);
 * `ms`: with one wait until the largest nominal end time. Robots run the padded lists.
 */
export interface ExecutablePlan {
  readonly timeline: 'steps' | 'ms';
  readonly schedule: Schedule;
  /** Length of one padding wait step on the `steps` timeline: default profile.waitMs; uniform-duration plans pass their step length. */
  readonly paddingWaitMs?: number;
}

/** Options of one simulation batch. */
export interface ExecutionOptions {
  readonly policy: ExecutionPolicy;
  /** Defaults: jitterCv = profile.timingJitter, no stalls. */
  readonly noise?: Partial<NoiseModel>;
  /** Default `count`. */
  readonly onCollision?: CollisionMode;
  /** Number of Monte Carlo runs, default 1. */
  readonly runs?: number;
  /** Run r draws its noise from `createRng(runSeed(seed, r))`. */
  readonly seed: number;
  /** Checked between runs; an aborted batch returns the runs done so far. */
  readonly signal?: AbortSignal;
}

/** One collision: two disks overlapping during one uninterrupted interval. */
export interface Collision {
  /** The two robots (agent indices), smaller first. */
  readonly robots: readonly [number, number];
  /** When the disks start to overlap, ms. */
  readonly timeMs: number;
  /** When they stop overlapping (Infinity when they never separate). */
  readonly untilMs: number;
  /** Midpoint of the two centres at `timeMs`, [x, y] in mm from the centre of cell [0, 0]. */
  readonly at: readonly [xMm: number, yMm: number];
  /** The cell nearest to `at`. */
  readonly cell: CellXY;
}

/** Metrics of one simulated run. */
export interface RunMetrics {
  readonly run: number;
  /** Whether every robot reached its goal with no collision and no deadlock. */
  readonly isSuccess: boolean;
  /** Whether dependency-gated execution could never start some action (a cycle of dependencies). */
  readonly isDeadlocked: boolean;
  readonly collisions: readonly Collision[];
  /** When the last robot reaches its goal for good; null when some robot never does. */
  readonly realisedMakespanMs: number | null;
  /** Sum over robots of the time each reaches its goal for good; null when some robot never does. */
  readonly realisedSocMs: number | null;
  /** Time robots stood idle waiting on a barrier (lockstep) or a dependency (dependency-gated). */
  readonly waitingMs: number;
  /**
   * Last minus first robot finish of the padded lists; null when some list never finishes.
   * Under lockstep a robot's program ends at the barrier that closes the last step (as every
   * step does), so the fleet finishes together at nominal and noisy times alike.
   */
  readonly finishSpreadMs: number | null;
}

/** Mean and 95th percentile (nearest rank) of a metric over the runs where it is defined. */
export interface MetricStats {
  readonly mean: number | null;
  readonly p95: number | null;
}

/** The Monte Carlo summary of a batch. */
export interface ExecutionSummary {
  readonly policy: ExecutionPolicy;
  readonly noise: NoiseModel;
  readonly onCollision: CollisionMode;
  readonly seed: number;
  /** Runs completed. */
  readonly runs: number;
  readonly isAborted: boolean;
  /** Fraction of runs that succeeded. */
  readonly successRate: number;
  readonly collisions: { readonly mean: number; readonly p95: number; readonly total: number };
  readonly realisedMakespanMs: MetricStats;
  readonly realisedSocMs: MetricStats;
  readonly finishSpreadMs: MetricStats;
  readonly waitingMs: MetricStats;
  /** The earliest collision of the lowest-numbered run that had one. */
  readonly firstCollision: (Collision & { readonly run: number }) | null;
  readonly perRun: readonly RunMetrics[];
}

/** One realised action of one robot in one run (for the plan viewer and its Gantt chart). */
export interface RealisedAction {
  readonly action: ActionKind;
  readonly from: CellXY;
  readonly to: CellXY;
  readonly heading: Heading;
  readonly step: number;
  readonly plannedStart: number;
  readonly plannedEnd: number;
  /** Realised start; Infinity when the action never starts (deadlock or stopped robot). */
  readonly start: number;
  /** Realised end; Infinity when the action never finishes. */
  readonly end: number;
  /** Realised (drawn) duration; for an action cut by a stop, the robot moved at (to − from) / durationMs until `stoppedAt`. */
  readonly durationMs: number;
  /** Idle time before this action spent waiting on a barrier or dependency. */
  readonly waitedMs: number;
  /** When the robot was stopped by a collision during this action, else null. */
  readonly stoppedAt: number | null;
  /** Whether the action is padding added to reach the plan's makespan (not part of the plan). */
  readonly isPadding: boolean;
}

/** The realised timeline of ONE run: per robot its realised actions, plus the run's metrics. */
export interface RunTimeline {
  readonly robots: readonly (readonly RealisedAction[])[];
  readonly metrics: RunMetrics;
}
