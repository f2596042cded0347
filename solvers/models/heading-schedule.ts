/**
 * Executed action lists from orientation-split plans (per agent one (cell, heading) state per
 * unit step). Each step becomes its one action at the robot profile's nominal duration —
 * forward (forwardMs), a quarter turn (quarterTurnMs) or a wait (waitMs) — back to back in each
 * robot's own time, with `step` = the unit step and `heading` = the heading after the action.
 * An agent's turn-inclusive cost is the end of the action of its final arrival at the goal
 * cell (turns or waits there afterwards cost nothing, as in the step cost).
 */
import type { CellXY, Heading, RobotProfile, Schedule, ScheduledAction } from '@shared/plan';
import { HEADINGS } from '@shared/plan';
import type { MapfInstance } from '../instance';
import type { OrientedState } from '../validate/orientation-split';

/** Robot timing used when a caller gives none (the CLIs' defaults): 1 s per cell, 0.8 s per quarter turn, 1 s waits. */
export const DEFAULT_ROBOT_PROFILE: RobotProfile = Object.freeze({
  forwardMs: 1000, quarterTurnMs: 800, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 400, timingJitter: 0,
});

/** A schedule derived from orientation-split states, with its turn-inclusive figures. */
export interface HeadingSchedule {
  /** The action lists; `step` indexes the unit steps of the states. */
  readonly schedule: Schedule;
  /** The timeline the `step` fields refer to. */
  readonly timeline: 'steps';
  /** Per agent: turn-inclusive cost in ms. */
  readonly agentCostsMs: readonly number[];
  /** Sum of the agents' turn-inclusive costs, ms. */
  readonly turnInclusiveSocMs: number;
  /** Largest turn-inclusive cost, ms. */
  readonly turnInclusiveMakespanMs: number;
  /** Length of a padding wait step for the simulator (profile.waitMs). */
  readonly waitStepMs: number;
  /** Total number of quarter turns over all agents. */
  readonly turns: number;
  /** Quarter turns per agent. */
  readonly turnsPerAgent: readonly number[];
}

/**
 * Derives each agent's action list from its states. Throws when two consecutive states are
 * not one legal step (validate plans with validateOrientationPlan first for a full report).
 */
export function scheduleFromHeadingStates(
  instance: MapfInstance,
  states: readonly (readonly OrientedState[])[],
  profile: RobotProfile,
): HeadingSchedule {
  const { grid, agents } = instance;
  if (states.length !== agents.length) throw new Error(`plan has ${states.length} state lists but the instance has ${agents.length} agents`);
  const xy = (cell: number): CellXY => [cell % grid.width, Math.floor(cell / grid.width)];
  const schedule: ScheduledAction[][] = [];
  const agentCostsMs: number[] = [];
  const turnsPerAgent: number[] = [];
  states.forEach((seq, agent) => {
    const actions: ScheduledAction[] = [];
    let now = 0;
    let cost = 0;
    let turns = 0;
    for (let t = 0; t + 1 < seq.length; t++) {
      const a = seq[t];
      const b = seq[t + 1];
      const action = actionBetween(a.heading, b.heading, a.cell !== b.cell);
      if (action === null) {
        throw new Error(`agent ${agent}, step ${t}: facing ${a.heading} → ${b.heading} while ${a.cell === b.cell ? 'staying' : 'moving'} is no single action`);
      }
      const ms = action === 'forward' ? profile.forwardMs : action === 'wait' ? profile.waitMs : profile.quarterTurnMs;
      actions.push({ action, from: xy(a.cell), to: xy(b.cell), heading: b.heading, start: now, end: now + ms, step: t });
      now += ms;
      if (action === 'turn-left' || action === 'turn-right') turns++;
      // The last entry into the goal cell fixes the cost (an agent may leave and come back).
      if (action === 'forward' && b.cell === agents[agent].goal) cost = now;
    }
    schedule.push(actions);
    agentCostsMs.push(cost);
    turnsPerAgent.push(turns);
  });
  return {
    schedule,
    timeline: 'steps',
    agentCostsMs,
    turnInclusiveSocMs: agentCostsMs.reduce((s, c) => s + c, 0),
    turnInclusiveMakespanMs: agentCostsMs.reduce((m, c) => Math.max(m, c), 0),
    waitStepMs: profile.waitMs,
    turns: turnsPerAgent.reduce((s, c) => s + c, 0),
    turnsPerAgent,
  };
}

/** The action from heading `from` to `to` (moving or not), or null when no single action does it. */
function actionBetween(from: Heading, to: Heading, isMove: boolean): ScheduledAction['action'] | null {
  const diff = (HEADINGS.indexOf(to) - HEADINGS.indexOf(from) + 4) % 4;
  if (isMove) return diff === 0 ? 'forward' : null;
  if (diff === 0) return 'wait';
  if (diff === 1) return 'turn-right';
  if (diff === 3) return 'turn-left';
  return null;
}
