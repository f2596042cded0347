/**
 * Executed action lists from unit-step paths (classic and k-robust plans, and the
 * uniform-duration model built on them).
 *
 * Path semantics shared by every model: per agent an array of cell indices (`y * width + x`),
 * one per unit time step; `path[0]` is the start; the last entry is the goal and the agent stays
 * there forever afterwards; the agent's cost is `path.length − 1` (the time of its last arrival
 * at the goal); SOC = sum of costs, makespan = max.
 *
 * Fact of the trade (common practice, no source): a differential-drive robot must rotate on the
 * spot before moving in a new direction, and each 90° change of direction costs one quarter turn.
 * So before each move in a new direction we insert the quarter turns it needs (a reversal takes
 * two right turns, see `quarterTurnsBetween`).
 */
import type { CellXY, Heading, RobotProfile, Schedule, ScheduledAction, StartHeading } from '@shared/plan';
import type { MapfInstance } from '../instance';
import { headingBetween, quarterTurnsBetween, turnedHeading } from './turn-schedule-headings';

/** How abstract steps map to robot time. */
export type StepStretch = 'none' | 'uniform';

/** Options of `scheduleFromPaths`. */
export interface TurnScheduleOptions {
  /**
   * Start heading of agents whose task has none: one heading for all, or `free` (the robot
   * starts facing its first move at no cost; an agent that never moves is given N).
   */
  readonly startHeading: StartHeading;
  /**
   * `none` (classic): actions back to back in each robot's own time, a wait step lasts
   * profile.waitMs. `uniform`: every abstract step lasts exactly `uniformStepMs(profile)`.
   */
  readonly stretch: StepStretch;
}

/** A schedule derived from unit-step paths, with its turn-inclusive figures. */
export interface TurnSchedule {
  /** The action lists; `step` indexes the abstract unit steps of the paths. */
  readonly schedule: Schedule;
  /** The timeline the `step` fields refer to (always abstract steps here). */
  readonly timeline: 'steps';
  readonly stretch: StepStretch;
  /** Per agent: turn-inclusive cost in ms (see `scheduleFromPaths`). */
  readonly agentCostsMs: readonly number[];
  /** Sum of the agents' turn-inclusive costs, ms. */
  readonly turnInclusiveSocMs: number;
  /** Largest turn-inclusive cost, ms. */
  readonly turnInclusiveMakespanMs: number;
  /** Length of a wait step on this schedule's timeline (profile.waitMs, or the uniform step): pass it as `paddingWaitMs` to the simulator. */
  readonly waitStepMs: number;
  /** Total number of quarter turns over all agents. */
  readonly turns: number;
  /** Quarter turns per agent. */
  readonly turnsPerAgent: readonly number[];
}

/** Length of one uniform-duration step: the longest action, a turn back then a forward (forward + 2 × quarter turn). */
export function uniformStepMs(profile: RobotProfile): number {
  return profile.forwardMs + 2 * profile.quarterTurnMs;
}

/**
 * Derives each agent's executed action list from its unit-step path.
 *
 * Classic (`stretch: 'none'`): each abstract step t contributes its quarter turns then a forward,
 * or one wait of profile.waitMs, back to back; an agent's turn-inclusive cost is the end of its
 * last arrival at the goal (trailing waits after it do not count).
 * Uniform (`stretch: 'uniform'`): step t occupies [t·S, (t+1)·S) with S = forward + 2 × quarter
 * turn; the robot turns and drives at the start of the step and waits out the rest, so the fleet
 * stays in step; an agent's cost is the end of the step of its final arrival, hence
 * turn-inclusive makespan = makespan × S exactly.
 * Throws when a path does not fit the instance (wrong start or goal, a jump, a blocked cell).
 */
export function scheduleFromPaths(
  instance: MapfInstance,
  paths: readonly (readonly number[])[],
  profile: RobotProfile,
  options: TurnScheduleOptions,
): TurnSchedule {
  const { grid, agents } = instance;
  if (paths.length !== agents.length) {
    throw new Error(`plan has ${paths.length} paths but the instance has ${agents.length} agents`);
  }
  const xy = (cell: number): CellXY => [cell % grid.width, Math.floor(cell / grid.width)];
  const stepMs = uniformStepMs(profile);
  const schedule: ScheduledAction[][] = [];
  const agentCostsMs: number[] = [];
  const turnsPerAgent: number[] = [];

  paths.forEach((path, agent) => {
    checkPath(instance, path, agent);
    const actions: ScheduledAction[] = [];
    let heading: Heading = agents[agent].startHeading ?? initialHeading(instance, path, options.startHeading);
    let now = 0;
    let turns = 0;
    let costMs = 0;
    const push = (action: ScheduledAction['action'], from: number, to: number, ms: number, step: number): void => {
      actions.push({ action, from: xy(from), to: xy(to), heading, start: now, end: now + ms, step });
      now += ms;
    };
    for (let t = 0; t + 1 < path.length; t++) {
      const from = path[t];
      const to = path[t + 1];
      if (options.stretch === 'uniform') now = t * stepMs;
      if (from === to) {
        push('wait', from, from, options.stretch === 'uniform' ? stepMs : profile.waitMs, t);
        continue;
      }
      const moveHeading = headingBetween(grid, from, to) as Heading;
      for (const turn of quarterTurnsBetween(heading, moveHeading)) {
        heading = turnedHeading(heading, turn);
        push(turn, from, from, profile.quarterTurnMs, t);
        turns++;
      }
      push('forward', from, to, profile.forwardMs, t);
      costMs = options.stretch === 'uniform' ? (t + 1) * stepMs : now;
      const rest = (t + 1) * stepMs - now;
      if (options.stretch === 'uniform' && rest > 0) push('wait', to, to, rest, t);
    }
    schedule.push(actions);
    agentCostsMs.push(costMs);
    turnsPerAgent.push(turns);
  });

  return {
    schedule,
    timeline: 'steps',
    stretch: options.stretch,
    waitStepMs: options.stretch === 'uniform' ? stepMs : profile.waitMs,
    agentCostsMs,
    turnInclusiveSocMs: agentCostsMs.reduce((s, c) => s + c, 0),
    turnInclusiveMakespanMs: agentCostsMs.reduce((m, c) => Math.max(m, c), 0),
    turns: turnsPerAgent.reduce((s, c) => s + c, 0),
    turnsPerAgent,
  };
}

/** The start heading when the instance fixes none: the given one, or for `free` the first move's. */
function initialHeading(instance: MapfInstance, path: readonly number[], rule: StartHeading): Heading {
  if (rule !== 'free') return rule;
  for (let t = 0; t + 1 < path.length; t++) {
    if (path[t] !== path[t + 1]) return headingBetween(instance.grid, path[t], path[t + 1]) as Heading;
  }
  return 'N';
}

/** Rejects a path that does not start at the start, end at the goal, stay on free cells and move by 4-neighbours. */
function checkPath(instance: MapfInstance, path: readonly number[], agent: number): void {
  const { grid } = instance;
  const task = instance.agents[agent];
  if (path.length === 0) throw new Error(`agent ${agent}: empty path`);
  if (path[0] !== task.start) throw new Error(`agent ${agent}: path starts at cell ${path[0]}, not at its start ${task.start}`);
  if (path[path.length - 1] !== task.goal) {
    throw new Error(`agent ${agent}: path ends at cell ${path[path.length - 1]}, not at its goal ${task.goal}`);
  }
  path.forEach((cell, t) => {
    if (!Number.isInteger(cell) || cell < 0 || cell >= grid.passable.length || grid.passable[cell] !== 1) {
      throw new Error(`agent ${agent}, step ${t}: cell ${cell} is not a free cell of the map`);
    }
    if (t > 0 && cell !== path[t - 1] && headingBetween(grid, path[t - 1], cell) === null) {
      throw new Error(`agent ${agent}, step ${t}: move from cell ${path[t - 1]} to ${cell} is not between 4-neighbours`);
    }
  });
}
