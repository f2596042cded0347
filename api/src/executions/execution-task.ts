/**
 * What one execution request hands the compute side and what it answers: plain JSON-safe data,
 * the shape a worker-pool job needs (the interactive pool runs it; its body is execute-task.ts).
 * Cells inside a task are `y * width + x`.
 */
import type { CollisionModeName, ExecutionErrorCode, ExecutionPolicyName } from '@shared/executions-constants';
import type {
  ExecutionInstanceView, ExecutionPlanView, ExecutionSource, ExecutionSummaryView, PlanFigures,
} from '@shared/executions';
import type { CellXY, FollowingRule, Heading, PlanModel, RobotProfile, Schedule } from '@shared/plan';
import type { SolverBuild } from '@shared/runs';

/** A MAPF instance in transferable form: '1' free / '0' blocked per cell, row by row. */
export interface ExecutionTaskInstance {
  readonly width: number;
  readonly height: number;
  readonly cells: string;
  readonly agents: readonly { readonly start: number; readonly goal: number; readonly startHeading?: Heading }[];
}

/** A plan sent by the client, cells still as [x, y]. */
export type ExecutionTaskPlan =
  | { readonly kind: 'paths'; readonly paths: readonly (readonly CellXY[])[] }
  | { readonly kind: 'schedule'; readonly schedule: Schedule };

/** One simulation request: the instance, the model, the plan (or none: solve) and the batch settings. */
export interface ExecutionTask {
  readonly instance: ExecutionTaskInstance;
  readonly model: PlanModel;
  readonly modelOptions: { readonly startHeading: Heading | 'free'; readonly k?: number; readonly following?: FollowingRule };
  readonly profile: RobotProfile;
  readonly plan?: ExecutionTaskPlan;
  /** Where a given plan came from: the request body (default) or a stored sweep result. */
  readonly planOrigin?: 'given' | 'result';
  readonly simulation: {
    readonly policy: ExecutionPolicyName;
    readonly noise: { readonly jitterCv?: number; readonly stallProbability: number; readonly stallMs: number };
    readonly seed: number;
    readonly runs: number;
    readonly onCollision: CollisionModeName;
  };
  /** Time limit of a solve, ms. */
  readonly solveTimeLimitMs: number;
}

/** What a task answers: the plan that ran with its figures and the summary, or a refusal the API turns into an error. */
export type ExecutionTaskOutcome =
  | { readonly kind: 'done'; readonly plan: ExecutionPlanView; readonly figures: PlanFigures; readonly summary: ExecutionSummaryView }
  | { readonly kind: 'refused'; readonly status: number; readonly code: ExecutionErrorCode; readonly message: string };

/** The `plan` column of plan_executions: everything the viewer draws besides the summary. */
export interface StoredPlan {
  readonly source: ExecutionSource;
  readonly instance: ExecutionInstanceView;
  readonly model: PlanModel;
  readonly modelOptions: { readonly startHeading: Heading | 'free'; readonly k?: number; readonly following?: FollowingRule };
  readonly profile: RobotProfile;
  readonly plan: ExecutionPlanView;
  readonly figures: PlanFigures;
  /** The build that computed it (reproducibility). */
  readonly computedBy: SolverBuild;
}

/** Runs one task for `requester` (the interactive pool's `execute`, which takes turns between requesters; tests may pass their own); `signal` cancels it. */
export type ExecutionTaskRunner = (task: ExecutionTask, requester: string, signal?: AbortSignal) => Promise<ExecutionTaskOutcome>;
