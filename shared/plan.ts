/**
 * Plan vocabulary shared by solvers, api and web: plan models, headings, robot profiles and
 * the timed action schedule every model produces and the execution simulator consumes.
 * Units: integer milliseconds for time, millimetres for length, cells as [x, y] with
 * x = column, y = row and (0, 0) the top-left cell.
 */

/** A grid cell as [x, y]: x = column, y = row, 0-based from the top-left corner. */
export type CellXY = readonly [x: number, y: number];

/** The five plan models Quarterturn compares. */
export const PLAN_MODELS = ['classic', 'uniform-duration', 'orientation-split', 'weighted-split', 'k-robust'] as const;
export type PlanModel = (typeof PLAN_MODELS)[number];

/**
 * Whether an agent may enter, at step t + 1, a cell another agent occupies at step t (unit-step
 * models: classic, uniform-duration, orientation-split). `forbidden` rules out the "following
 * conflict" of Stern et al., "Multi-Agent Pathfinding: Definitions, Variants, and Benchmarks",
 * SoCS 2019; `allowed` is the classic rule. Default `allowed`.
 */
export const FOLLOWING_RULES = ['allowed', 'forbidden'] as const;
export type FollowingRule = (typeof FOLLOWING_RULES)[number];

/** The plan models that take a following rule (k-robust with k ≥ 1 implies it; weighted-split has continuous times). */
export const FOLLOWING_MODELS = ['classic', 'uniform-duration', 'orientation-split'] as const satisfies readonly PlanModel[];

/** Compass heading of a robot; N is towards row 0 (up), E towards larger x. */
export const HEADINGS = ['N', 'E', 'S', 'W'] as const;
export type Heading = (typeof HEADINGS)[number];

/** Start heading rule when the instance carries none: one fixed heading for all, or any heading for free. */
export type StartHeading = Heading | 'free';

/** Primitive robot actions of a schedule. */
export const ACTION_KINDS = ['forward', 'turn-left', 'turn-right', 'wait'] as const;
export type ActionKind = (typeof ACTION_KINDS)[number];

/**
 * Physical and timing description of one robot type.
 * Times are integer milliseconds > 0; lengths in millimetres.
 */
export interface RobotProfile {
  /** Time to drive one cell ahead. */
  readonly forwardMs: number;
  /** Time to rotate 90° on the spot (a turn back is two quarter turns). */
  readonly quarterTurnMs: number;
  /** Duration of one wait action. */
  readonly waitMs: number;
  /** Distance between neighbouring cell centres. */
  readonly cellPitchMm: number;
  /** Diameter of the robot's footprint disk. */
  readonly robotDiameterMm: number;
  /** Coefficient of variation of action durations used by execution noise (0 = none). */
  readonly timingJitter: number;
}

/**
 * One timed action of an agent's schedule, at nominal durations.
 * `heading` is the robot's heading when the action ends. `step` is the index of the abstract
 * step (on the model's own timeline) the action belongs to; turns a model inserts before a
 * move share the move's step. Lockstep execution puts its barriers between steps.
 */
export interface ScheduledAction {
  readonly action: ActionKind;
  readonly from: CellXY;
  readonly to: CellXY;
  readonly heading: Heading;
  /** Nominal start time, ms from plan start. */
  readonly start: number;
  /** Nominal end time, ms from plan start. */
  readonly end: number;
  /** Abstract step index on the model's own timeline. */
  readonly step: number;
}

/** A full plan: for each agent the list of its timed actions, in order. */
export type Schedule = readonly (readonly ScheduledAction[])[];
