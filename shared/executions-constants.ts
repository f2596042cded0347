/**
 * Zod-free constants of the executions contract, so web code can import them without pulling
 * zod into the bundle (shared/executions.ts builds its schemas from these).
 */
import type { RobotProfile } from './plan';

/** Execution policies, in display order (same names as solvers/execute). */
export const EXECUTION_POLICY_NAMES = ['open-loop', 'lockstep', 'dependency-gated'] as const;
export type ExecutionPolicyName = (typeof EXECUTION_POLICY_NAMES)[number];

/** What a collision does to a simulated run: only counted, or both robots stop where they touched. */
export const COLLISION_MODES = ['count', 'stop'] as const;
export type CollisionModeName = (typeof COLLISION_MODES)[number];

/** Limits of POST /api/executions (the request waits for the server's interactive worker pool, so they are small). */
export const EXECUTION_LIMITS = {
  /** Monte Carlo runs one request may ask for. */
  maxRuns: 500,
  /** Robots one simulated instance may have. */
  maxAgents: 1000,
  /** robots × runs of one request: bounds the simulation work per request. */
  maxRobotRuns: 100_000,
  /** The server solves (no plan in the body) only up to this many agents ... */
  maxSolveAgents: 40,
  /** ... on maps of at most this many cells ... */
  maxSolveCells: 128 * 128,
  /** ... within this time limit, ms. */
  solveTimeLimitMs: 3000,
} as const;

/** The sentence every page showing execution results carries. */
export const SAFETY_NOTE =
  'Simulation is no safety assessment. Deploying robots follows the applicable safety standards for driverless industrial vehicles and the local rules of the site.';

/** A robot profile to start from in forms: a small differential-drive robot on a 1 m grid (invented figures). */
export const STARTER_PROFILE: RobotProfile = {
  forwardMs: 1000,
  quarterTurnMs: 600,
  waitMs: 1000,
  cellPitchMm: 1000,
  robotDiameterMm: 700,
  timingJitter: 0.1,
};

/** Error codes of the executions API (the shared list in shared/errors.ts accepts any code string). */
export const EXECUTION_ERROR_CODES = [
  /** GET /api/executions/:id of an unknown id, or one the viewer may not see. */
  'EXECUTION_NOT_FOUND',
  /** No longer answered (stored sweep results are executed now); kept because codes never change once released. */
  'RESULT_EXECUTION_UNAVAILABLE',
  /** `resultId` names no stored result, or one of an instance set the viewer may not see. */
  'RESULT_NOT_FOUND',
  /** The stored result has no plan to execute (it timed out, failed or was infeasible). */
  'RESULT_NOT_SOLVED',
  /** No plan was sent and the instance is too large for the server to solve inline. */
  'SOLVE_TOO_LARGE',
  /** No plan was sent and the model has no solver in this build. */
  'MODEL_UNAVAILABLE',
  /** The server tried to solve and got no plan (time limit, infeasible, error). */
  'PLAN_NOT_SOLVED',
  /** The plan does not fit the instance, or the simulator refused it. */
  'PLAN_REJECTED',
] as const;
export type ExecutionErrorCode = (typeof EXECUTION_ERROR_CODES)[number];
