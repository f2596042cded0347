/** Responses of POST /api/submissions and GET /api/submissions (zod-free, for the web bundle). */
import type { CellXY, PlanModel } from './plan';

/** Error code of a plan the model's validator rejected (422). */
export const PLAN_REJECTED = 'PLAN_REJECTED';

/** The first violation of a rejected plan, as the 422 answer's `details.violation`. */
export interface SubmissionViolation {
  readonly kind: string;
  /** Agents involved, ascending (0-based, in scenario row order). */
  readonly agents: readonly number[];
  /** Unit step, or ms for weighted-split schedules. */
  readonly time: number;
  readonly cell: CellXY;
  readonly message: string;
}

/** A problem reading the plan file, as the 400 answer's `details` entries. */
export interface PlanFileProblem {
  readonly file: string;
  /** 1-based; 0 when the problem is not at one place in the file. */
  readonly line: number;
  readonly column: number;
  /** Which field, e.g. `paths[2][5]` or `agent 3, cell 5`. */
  readonly field: string;
  readonly message: string;
}

/** An accepted submission and the figures Quarterturn computed for it. */
export interface SubmissionView {
  readonly id: number;
  readonly resultId: number;
  readonly scenarioId: number;
  readonly scenarioName: string;
  readonly mapName: string;
  readonly agents: number;
  readonly model: PlanModel;
  readonly variant: string;
  readonly solver: { readonly name: string; readonly version: string };
  readonly soc: number;
  readonly makespan: number;
  readonly turnInclusiveSocMs: number;
  readonly turnInclusiveMakespanMs: number;
  readonly executions: readonly { readonly policy: string; readonly successRate: number; readonly finishSpreadMeanMs: number | null }[];
  readonly createdAt: string;
}

/** GET /api/submissions: the signed-in researcher's accepted submissions, newest first. */
export interface SubmissionListResponse {
  readonly items: readonly SubmissionView[];
}
