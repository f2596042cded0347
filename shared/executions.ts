/**
 * The executions contract: POST /api/executions (simulate a plan on the robot fleet, solving
 * it first when no plan is sent) and GET /api/executions/:id. Request bodies are zod schemas;
 * responses are plain interfaces the plan viewer draws from. Cells are [x, y] at this boundary.
 * Web code imports only types from here (the schemas would pull zod into the bundle); zod-free
 * constants live in shared/executions-constants.ts.
 */
import type { Interval95 } from './confidence-interval';
import type { SolverBuild } from './runs';
import { z } from 'zod';
import { COLLISION_MODES, EXECUTION_LIMITS, EXECUTION_POLICY_NAMES, type CollisionModeName, type ExecutionPolicyName } from './executions-constants';
import { ACTION_KINDS, FOLLOWING_RULES, HEADINGS, PLAN_MODELS, type CellXY, type FollowingRule, type Heading, type PlanModel, type RobotProfile, type Schedule } from './plan';
import { RobotProfileSchema } from './sweeps';

const whole = (min: number, max: number) => z.number().int().min(min).max(max);
// Read-only so clients can send the CellXY and Schedule values they hold without copying.
const Cell = z.tuple([whole(0, 100_000), whole(0, 100_000)]).readonly();

/** Timing noise of a batch; jitterCv absent = the profile's timing jitter. */
export const ExecutionNoiseSchema = z.object({
  jitterCv: z.number().min(0).max(2).optional(),
  stallProbability: z.number().min(0).max(1).default(0),
  stallMs: whole(0, 600_000).default(0),
}).strict();

/** What every request says about the simulation itself. */
const simulationFields = {
  policy: z.enum(EXECUTION_POLICY_NAMES),
  noise: ExecutionNoiseSchema.default({ stallProbability: 0, stallMs: 0 }),
  seed: whole(0, 0xffffffff).default(1),
  runs: whole(1, EXECUTION_LIMITS.maxRuns).default(20),
  onCollision: z.enum(COLLISION_MODES).default('count'),
};

/** Robot profile (ms, mm): the sweeps' schema, so an execution takes exactly the profiles a sweep takes. */
export const ExecutionProfileSchema = RobotProfileSchema;

/**
 * Model parameters: the start heading rule (default free), k for k-robust, and the following
 * rule of classic, uniform-duration and orientation-split (absent = allowed; shared/plan.ts
 * FOLLOWING_RULES; the solver refuses it for the other models).
 */
export const ModelOptionsSchema = z.object({
  startHeading: z.enum([...HEADINGS, 'free']).default('free'),
  k: whole(0, 20).optional(),
  following: z.enum(FOLLOWING_RULES).optional(),
}).strict();

/** Which instance: a stored scenario's first `agents` rows, or a stored map with tasks given here. */
export const ExecutionInstanceSchema = z.union([
  z.object({ scenarioId: z.number().int().positive(), agents: whole(1, EXECUTION_LIMITS.maxAgents) }).strict(),
  z.object({
    mapId: z.number().int().positive(),
    agents: z.array(z.object({ start: Cell, goal: Cell, startHeading: z.enum(HEADINGS).optional() }).strict())
      .min(1).max(EXECUTION_LIMITS.maxAgents).readonly(),
  }).strict(),
]);

/** One timed action as JSON. */
export const ScheduledActionSchema = z.object({
  action: z.enum(ACTION_KINDS),
  from: Cell,
  to: Cell,
  heading: z.enum(HEADINGS),
  start: z.number().min(0),
  end: z.number().min(0),
  step: whole(0, 100_000_000),
}).strict();

/** A plan sent in the body: unit-step paths of cells (classic, uniform-duration, k-robust) or a timed schedule (any model). */
export const PlanInputSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('paths'), paths: z.array(z.array(Cell).min(1).readonly()).min(1).max(EXECUTION_LIMITS.maxAgents).readonly() }).strict(),
  z.object({ kind: z.literal('schedule'), schedule: z.array(z.array(ScheduledActionSchema.readonly()).readonly()).min(1).max(EXECUTION_LIMITS.maxAgents).readonly() }).strict(),
]);

/** POST /api/executions for a stored sweep result. */
export const ResultExecutionRequestSchema = z.object({ resultId: z.number().int().positive(), ...simulationFields }).strict();

/** POST /api/executions for an instance, with a plan or to be solved by the server. */
export const InstanceExecutionRequestSchema = z.object({
  instance: ExecutionInstanceSchema,
  model: z.enum(PLAN_MODELS),
  modelOptions: ModelOptionsSchema.default({ startHeading: 'free' }),
  profile: ExecutionProfileSchema,
  plan: PlanInputSchema.optional(),
  ...simulationFields,
}).strict();

/** Either request form. */
export type CreateExecutionRequest = z.output<typeof ResultExecutionRequestSchema> | z.output<typeof InstanceExecutionRequestSchema>;
/** The stored-result form as a client may send it (defaults optional). */
export type ResultExecutionInput = z.input<typeof ResultExecutionRequestSchema>;
/** The instance form as a client may send it (defaults optional). */
export type InstanceExecutionInput = z.input<typeof InstanceExecutionRequestSchema>;
/** The instance form after validation. */
export type InstanceExecutionRequest = z.output<typeof InstanceExecutionRequestSchema>;

/**
 * Parses a POST /api/executions body. The form is picked by the presence of `resultId`, so a
 * bad field is reported by its own path (a zod union would report only "no form matched").
 * Throws the ZodError of the chosen form.
 */
export function parseCreateExecution(body: unknown): CreateExecutionRequest {
  const isResult = typeof body === 'object' && body !== null && 'resultId' in body;
  return isResult ? ResultExecutionRequestSchema.parse(body) : InstanceExecutionRequestSchema.parse(body);
}

/** The instance as the viewer draws it: rows of '.' (free) and '@' (blocked), tasks as [x, y]. */
export interface ExecutionInstanceView {
  readonly width: number;
  readonly height: number;
  readonly rows: readonly string[];
  readonly agents: readonly { readonly start: CellXY; readonly goal: CellXY; readonly startHeading?: Heading }[];
}

/** Where the instance came from. */
export interface ExecutionSource {
  readonly instanceSetId: number;
  readonly mapId: number;
  readonly mapName: string;
  /** Absent when the tasks were sent with a map. */
  readonly scenarioId?: number;
  readonly scenarioName?: string;
  /** The stored sweep result whose plan ran (POST with `resultId`). */
  readonly resultId?: number;
  /** The sweep that produced that result. */
  readonly sweepId?: number;
}

/** The plan the fleet ran. `timeline`: what `step` counts (abstract steps, or ms for weighted-split). */
export interface ExecutionPlanView {
  /** `solved`: by the server for this request; `given`: sent in the body; `result`: a stored sweep result's plan. */
  readonly origin: 'solved' | 'given' | 'result';
  readonly timeline: 'steps' | 'ms';
  readonly schedule: Schedule;
}

/** Figures of the plan itself, always with the model and profile that produced them. */
export interface PlanFigures {
  /** Sum-of-costs and makespan in the model's own unit (`unit`). */
  readonly soc: number | null;
  readonly makespan: number | null;
  readonly unit: 'steps' | 'ms';
  readonly turnInclusiveSocMs: number;
  readonly turnInclusiveMakespanMs: number;
  /** Proven lower bound on the optimal sum-of-costs (solved plans), model's unit. */
  readonly lowerBound: number | null;
  /** Solve time, ms (solved plans). */
  readonly solveTimeMs: number | null;
  /** Whether the plan passed its model's independent validator; null when no validator applies. */
  readonly isValid: boolean | null;
  /** The validator's first violation, or why none applies. */
  readonly validation: string;
}

/** One collision as JSON (`untilMs` null when the robots never separate). */
export interface CollisionView {
  readonly robots: readonly [number, number];
  readonly timeMs: number;
  readonly untilMs: number | null;
  readonly at: readonly [number, number];
  readonly cell: CellXY;
}

/** Metrics of one simulated run. */
export interface RunMetricsView {
  readonly run: number;
  readonly isSuccess: boolean;
  readonly isDeadlocked: boolean;
  readonly collisions: readonly CollisionView[];
  readonly realisedMakespanMs: number | null;
  readonly realisedSocMs: number | null;
  /** Idle time waiting on barriers, planned starts or dependencies, SUMMED over robots ("total over robots"). */
  readonly waitingMs: number;
  /** Mean over robots of the time each robot waited (null: run stored before per-robot waiting was recorded). */
  readonly waitingMeanPerRobotMs: number | null;
  /** The longest any one robot waited (null: run stored before per-robot waiting was recorded). */
  readonly waitingMaxPerRobotMs: number | null;
  readonly finishSpreadMs: number | null;
}

/**
 * Mean and nearest-rank p95 of a metric over the runs where it is defined (`count` of them), with
 * 95 % intervals: Student t for the mean (null below 2 runs), order statistics for the p95 (null
 * below 72 runs); methods in shared/confidence-interval.ts CI95_METHOD.
 */
export interface MetricStatsView {
  readonly mean: number | null;
  readonly p95: number | null;
  readonly count: number;
  readonly meanCi95: Interval95 | null;
  readonly p95Ci95: Interval95 | null;
}

/** The 95 % intervals of a batch's headline figures (the means), as `execute --json` prints them; one shape for simulator and views. */
export interface HeadlineIntervals95 {
  readonly successRate: Interval95;
  readonly realisedMakespanMs: Interval95 | null;
  readonly finishSpreadMs: Interval95 | null;
}

/** Collisions per run over a batch: mean, nearest-rank p95, total, and the 95 % intervals of the mean and the p95. */
export interface CollisionStats {
  readonly mean: number;
  readonly p95: number;
  readonly total: number;
  readonly meanCi95: Interval95 | null;
  readonly p95Ci95: Interval95 | null;
}

/** The Monte Carlo summary of one request. */
export interface ExecutionSummaryView {
  readonly policy: ExecutionPolicyName;
  readonly noise: { readonly jitterCv: number; readonly stallProbability: number; readonly stallMs: number };
  readonly onCollision: CollisionModeName;
  readonly seed: number;
  readonly runs: number;
  readonly isAborted: boolean;
  /** Execution success rate: fraction of runs with no collision and no deadlock, every robot at its goal. */
  readonly successRate: number;
  /** Wilson score 95 % interval of the success rate. */
  readonly successRateCi95: Interval95;
  /** 95 % intervals of the success rate and of the MEANS of realised makespan and finish spread. */
  readonly ci95: HeadlineIntervals95;
  /**
   * Collisions per run: mean, p95, total over runs; the 95 % intervals of the mean (Student t cut
   * at 0, shared/confidence-interval.ts nonNegativeMeanInterval) and of the p95, as the simulator
   * computes them (the server computes them from the per-run counts for summaries stored before
   * they were recorded, api/src/executions/stored-summary.ts).
   */
  readonly collisions: CollisionStats;
  readonly realisedMakespanMs: MetricStatsView;
  readonly realisedSocMs: MetricStatsView;
  readonly finishSpreadMs: MetricStatsView;
  /** Per run the waiting SUMMED over robots, then over runs: label it "total over robots". */
  readonly waitingMs: MetricStatsView;
  /**
   * Per run the mean / max over robots of each robot's waiting, then over runs. null on summaries
   * stored before per-robot waiting was recorded (their runs did not keep it, so it cannot be recomputed).
   */
  readonly waitingPerRobotMs: { readonly mean: MetricStatsView; readonly max: MetricStatsView } | null;
  readonly firstCollision: (CollisionView & { readonly run: number }) | null;
  readonly perRun: readonly RunMetricsView[];
}

/** 201 of POST /api/executions and 200 of GET /api/executions/:id. */
export interface ExecutionView {
  readonly id: number;
  readonly createdAt: string;
  readonly owner: { readonly id: number; readonly login: string };
  readonly source: ExecutionSource;
  readonly instance: ExecutionInstanceView;
  readonly model: PlanModel;
  readonly modelOptions: { readonly startHeading: Heading | 'free'; readonly k?: number; readonly following?: FollowingRule };
  readonly profile: RobotProfile;
  readonly plan: ExecutionPlanView;
  readonly figures: PlanFigures;
  readonly summary: ExecutionSummaryView;
  /** Solver version, commit, Node and CPU of the server that solved and simulated it (absent on executions stored before it was recorded). */
  readonly computedBy?: SolverBuild;
  /** The safety sentence (shared/executions-constants.ts SAFETY_NOTE). */
  readonly safetyNote: string;
}

/** A collision as the simulator gives it: `untilMs` is Infinity when the robots never separate. */
type SimulatedCollision<C> = Omit<C, 'untilMs'> & { readonly untilMs: number };

/** A Monte Carlo summary as the simulator (solvers/execute) gives it. */
export type SimulatedSummary = Omit<ExecutionSummaryView, 'firstCollision' | 'perRun'> & {
  readonly firstCollision: SimulatedCollision<CollisionView & { readonly run: number }> | null;
  readonly perRun: readonly (Omit<RunMetricsView, 'collisions'> & { readonly collisions: readonly SimulatedCollision<CollisionView>[] })[];
};

/** The summary as JSON: a collision that never ends carries `untilMs: null` instead of Infinity (which JSON cannot hold). */
export function summaryView(s: SimulatedSummary): ExecutionSummaryView {
  const collision = <C extends { readonly untilMs: number }>(c: C) => ({ ...c, untilMs: Number.isFinite(c.untilMs) ? c.untilMs : null });
  return {
    ...s,
    firstCollision: s.firstCollision ? collision(s.firstCollision) : null,
    perRun: s.perRun.map((m) => ({ ...m, collisions: m.collisions.map(collision) })),
  };
}
