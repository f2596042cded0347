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
import type { Interval95 } from '@shared/confidence-interval';
import type { CollisionStats, HeadlineIntervals95 } from '@shared/executions';
import type { ActionKind, CellXY, Heading, Schedule } from '@shared/plan';

/**
 * How robots are released onto their actions. Every policy keeps each robot's own order: an
 * action never starts before the robot's previous action has ended (its first action: at 0).
 * On top of that, an action a starts at the earliest moment its policy allows:
 * - `open-loop`: no further condition. Each robot runs its (padded) list back to back from t = 0.
 * - `lockstep`: synchronise on the plan's own timeline. a waits until every action, of any robot,
 *   that the plan's timeline has ending at or before a's planned start has actually ended.
 *   - `steps` timeline (classic, uniform-duration, orientation-split, k-robust): an action of step
 *     s is planned to start at step s and every action of a step s' < s to end by then, so the
 *     first action of step s waits for every action of steps < s: one global barrier between
 *     `step` values. Actions of one robot within a step (turns, then the move) follow each other
 *     with no further barrier. There is no ms clock: a robot never waits for a planned ms start.
 *     A robot already at its goal runs padding waits (one per step, see ExecutablePlan), which
 *     take part in the barrier like planned waits: the robot holds its goal for the whole step.
 *   - `ms` timeline (weighted-split): a waits for every action b (any robot) with planned end
 *     ≤ a's planned start, AND does not start before its planned start (ms from plan start).
 *     At zero noise every action then runs exactly at its planned times (realise-times.ts proves
 *     it by induction; execution-lockstep.spec.ts tests it), so a valid plan never collides.
 *   Both are one rule: "nothing starts before the plan's clock says so and before everything
 *   planned to be over by then is over"; on `steps` the clock is the step counter.
 * - `dependency-gated`: a waits for the end of its cross-robot predecessors in the Action
 *   Dependency Graph of Hönig et al., RA-L 2019 (see dependency-graph.ts): a move into a cell
 *   waits until the latest earlier-planned action of every other robot on that cell has ended.
 *   No clock and no barrier: robots not sharing cells never wait for each other.
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
  /**
   * Time robots stood idle waiting on a barrier or planned start (lockstep) or a dependency
   * (dependency-gated) BEFORE reaching their goal for good, SUMMED over robots (so it may exceed
   * the makespan): label it "total over robots". Only waits before a robot's actions up to its
   * last forward move count (the move whose end is its arrival in realisedSocMs): once there, a
   * robot that holds its goal while barriers or planned starts hold back its padding (or a
   * trailing planned wait or turn) is done, not waiting. A robot that never moves waits 0.
   */
  readonly waitingMs: number;
  /** The same idle time per robot: mean over robots (waitingMs / robots; 0 with no robots). */
  readonly waitingMeanPerRobotMs: number;
  /** The same idle time per robot: the largest any one robot waited before reaching its goal for good. */
  readonly waitingMaxPerRobotMs: number;
  /**
   * Last minus first robot finish of the padded lists (a robot finishes when the last action of
   * its padded list ends); null when some list never finishes. Computed alike under every policy.
   * Lockstep closes no final barrier: its barriers only hold actions back from STARTING (on the
   * `steps` timeline the first action of each step, on the `ms` timeline each action until its
   * planned start and the ends planned before it), and nothing follows a robot's last action. So
   * the last step (or the last stretch up to the planned makespan) is run unsynchronised and,
   * under timing noise, the fleet finishes apart by what the noise of those final actions leaves;
   * at zero noise it is the spread of the nominal finishes (0 for uniform-duration and
   * weighted-split plans, whose padded lists all end at the planned makespan).
   */
  readonly finishSpreadMs: number | null;
}

/**
 * Mean and 95th percentile (nearest rank) of a metric over the runs where it is defined, with
 * their 95 % confidence intervals (shared/confidence-interval.ts: Student t for the mean, the
 * order-statistic interval for the p95).
 */
export interface MetricStats {
  readonly mean: number | null;
  readonly p95: number | null;
  /** Runs where the metric is defined (the n of both intervals). */
  readonly count: number;
  /** null with fewer than 2 such runs. */
  readonly meanCi95: Interval95 | null;
  /** null with fewer than 72 such runs (too few for a distribution-free p95 interval). */
  readonly p95Ci95: Interval95 | null;
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
  /** Fraction of runs that succeeded (execution success rate). */
  readonly successRate: number;
  /** Wilson score 95 % interval of the success rate ([0, 1] with no runs). */
  readonly successRateCi95: Interval95;
  /** The 95 % intervals of the headline figures (for the means), as `execute --json` prints them. */
  readonly ci95: HeadlineIntervals95;
  /**
   * Collisions per run: mean, nearest-rank p95, total over runs, and the 95 % intervals of the mean
   * (Student t cut at 0: a mean of counts cannot be negative; null below 2 runs) and of the p95
   * (order statistics; null below 72 runs). Computed once here; the CLI and the viewer read them.
   */
  readonly collisions: CollisionStats;
  readonly realisedMakespanMs: MetricStats;
  readonly realisedSocMs: MetricStats;
  readonly finishSpreadMs: MetricStats;
  /** Per run the SUM over robots of their waiting (RunMetrics.waitingMs), then over runs. */
  readonly waitingMs: MetricStats;
  /** Per run the mean / the max over robots of the time each robot waited, then over runs. */
  readonly waitingPerRobotMs: { readonly mean: MetricStats; readonly max: MetricStats };
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
  /**
   * Idle time before this action spent waiting on a barrier, planned start or dependency. Shown
   * per action, padding included; the run's waiting figures count only actions up to the robot's
   * last forward move (RunMetrics.waitingMs).
   */
  readonly waitedMs: number;
  /** The robot whose action's end released this one (it waited for it); null if it did not wait or waited on its planned start. */
  readonly waitedFor: number | null;
  /** What released this action after a wait; null when it did not wait (or never started). */
  readonly waitReason: WaitReason | null;
  /** When the robot was stopped by a collision during this action, else null. */
  readonly stoppedAt: number | null;
  /** Whether the action is padding added to reach the plan's makespan (not part of the plan). */
  readonly isPadding: boolean;
}

/**
 * Why an action started later than its robot's previous action ended: `dependency` (an ADG
 * predecessor of another robot ended), `barrier` (lockstep: the last action planned to end by then
 * ended), `planned-start` (lockstep on the ms timeline: the plan's clock).
 */
export type WaitReason = 'dependency' | 'barrier' | 'planned-start';

/**
 * How long one robot waited in one run before reaching its goal for good (as RunMetrics.waitingMs
 * counts it), and for whom (planned-start waits count in waitedMs only).
 */
export interface RobotWait {
  readonly robot: number;
  readonly waitedMs: number;
  /** Per releasing robot the ms waited for it, largest first; sums to waitedMs minus the planned-start waits. */
  readonly waitedFor: readonly { readonly robot: number; readonly ms: number }[];
}

/**
 * One segment of the critical chain (see wait-attribution.ts). `own`: the robot ran its own
 * actions back to back from fromMs to toMs. `dependency` / `barrier`: the robot stood idle from
 * fromMs until toMs, when the end of an action of `waitedFor` released it. `planned-start`: the
 * robot stood idle from fromMs until the plan's clock released it at toMs (lockstep, ms
 * timeline); the chain starts there, since nothing before it set the makespan.
 */
export interface ChainSegment {
  readonly robot: number;
  readonly fromMs: number;
  readonly toMs: number;
  readonly reason: 'own' | WaitReason;
  readonly waitedFor: number | null;
}

/** The realised timeline of ONE run: per robot its realised actions, plus the run's metrics and who waited for whom. */
export interface RunTimeline {
  readonly robots: readonly (readonly RealisedAction[])[];
  readonly metrics: RunMetrics;
  /** Per robot (in robot order) the time it waited and for whom. */
  readonly waitByRobot: readonly RobotWait[];
  /**
   * The chain that set the realised makespan, earliest first: walking back from the robot whose
   * arrival is the makespan through its own actions to its last wait, then to the robot that
   * released it, and so on. `own` and `planned-start` segments tile [start, makespan], start = 0
   * unless the chain begins with a planned-start wait (then its fromMs); each dependency or
   * barrier segment ends where the releasing robot's `own` segment before it ends. Empty when the
   * run has no finite makespan (deadlock, stop) or no robot moves.
   */
  readonly criticalChain: readonly ChainSegment[];
}
