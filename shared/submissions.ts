/** Responses of POST /api/submissions and GET /api/submissions (zod-free, for the web bundle). */
import type { CellXY, PlanModel, RobotProfile } from './plan';

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
  /** The robot profile the plan was scored under (turn-inclusive figures and replays). */
  readonly robotProfile: RobotProfile;
  /** profileLabel(robotProfile) from shared/leaderboards.ts, as the board shows it. */
  readonly profileLabel: string;
  readonly createdAt: string;
}

/** A robot profile a plan may be scored under, with how many stored results of the instance use it. */
export interface SubmissionProfileOption {
  readonly profile: RobotProfile;
  readonly label: string;
  /** Results of this instance (scenario and agent count) stored under this profile; 0 for the starter profile. */
  readonly results: number;
}

/**
 * GET /api/submissions/profiles?scenarioId=&agents=: the profiles the instance's stored results use,
 * most used first, then the starter profile when none of them is it. The first item is the default,
 * so a submitted plan lands on the board beside the results it is compared with.
 */
export interface SubmissionProfilesResponse {
  readonly items: readonly SubmissionProfileOption[];
}

/** GET /api/submissions: the signed-in researcher's accepted submissions, newest first. */
export interface SubmissionListResponse {
  readonly items: readonly SubmissionView[];
}
