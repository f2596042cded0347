/**
 * Checks a plan against its instance and flattens it, padded to the plan's makespan, into
 * typed arrays (one entry per action, robots one after another) so that the Monte Carlo loop
 * allocates nothing per action.
 */
import type { ActionKind, CellXY, Heading, RobotProfile, ScheduledAction } from '@shared/plan';
import type { MapfInstance } from '../instance';
import type { ExecutablePlan } from './execution-types';

/** Action kind codes of `PreparedPlan.kind`. */
export const KIND_CODE: Readonly<Record<ActionKind, number>> = { forward: 0, 'turn-left': 1, 'turn-right': 2, wait: 3 };

/** A checked, padded plan in structure-of-arrays form. Positions are mm (x right, y down). */
export interface PreparedPlan {
  readonly instance: MapfInstance;
  readonly profile: RobotProfile;
  readonly timeline: 'steps' | 'ms';
  readonly robotCount: number;
  readonly actionCount: number;
  /** Actions of robot r are first[r] … first[r + 1] − 1. */
  readonly first: Int32Array;
  readonly robotOf: Int32Array;
  readonly kind: Uint8Array;
  readonly fromCell: Int32Array;
  readonly toCell: Int32Array;
  readonly fromX: Float64Array;
  readonly fromY: Float64Array;
  readonly toX: Float64Array;
  readonly toY: Float64Array;
  readonly nominalMs: Float64Array;
  readonly plannedStart: Float64Array;
  readonly step: Int32Array;
  readonly isPadding: Uint8Array;
  /** Per robot: index of its last forward action, −1 when it never moves. */
  readonly lastForward: Int32Array;
  /** Per robot: goal cell and its centre in mm. */
  readonly goalCell: Int32Array;
  readonly goalX: Float64Array;
  readonly goalY: Float64Array;
  /** The actions themselves (padding included), for timelines. */
  readonly actions: readonly ScheduledAction[];
}

/** Checks `plan` against `instance` (throws naming agent, action and field) and prepares it. */
export function preparePlan(instance: MapfInstance, plan: ExecutablePlan, profile: RobotProfile): PreparedPlan {
  checkProfile(profile);
  const paddingWaitMs = plan.paddingWaitMs ?? profile.waitMs;
  if (!(Number.isFinite(paddingWaitMs) && paddingWaitMs > 0)) throw new Error(`plan: field "paddingWaitMs" must be a positive number, got ${paddingWaitMs}`);
  const { grid, agents } = instance;
  const { schedule, timeline } = plan;
  if (timeline !== 'steps' && timeline !== 'ms') throw new Error(`plan: field "timeline" must be "steps" or "ms", got ${String(timeline)}`);
  if (schedule.length !== agents.length) {
    throw new Error(`plan: schedule has ${schedule.length} action lists but the instance has ${agents.length} agents`);
  }
  const cellOf = (xy: CellXY, agent: number, k: number, field: string): number => {
    const ok = Array.isArray(xy) && xy.length === 2 && Number.isInteger(xy[0]) && Number.isInteger(xy[1])
      && xy[0] >= 0 && xy[1] >= 0 && xy[0] < grid.width && xy[1] < grid.height;
    if (!ok) fail(agent, k, field, `${JSON.stringify(xy)} is not a cell of the ${grid.width}×${grid.height} map`);
    const cell = xy[1] * grid.width + xy[0];
    if (grid.passable[cell] !== 1) fail(agent, k, field, `cell [${xy[0]}, ${xy[1]}] is blocked`);
    return cell;
  };

  let makespanSteps = 0;
  let makespanMs = 0;
  schedule.forEach((list, agent) => {
    let prevEnd = 0;
    let prevStep = 0;
    let at = agents[agent].start;
    list.forEach((a, k) => {
      if (!(a.action in KIND_CODE)) fail(agent, k, 'action', `unknown action ${JSON.stringify(a.action)}`);
      const from = cellOf(a.from, agent, k, 'from');
      const to = cellOf(a.to, agent, k, 'to');
      if (from !== at) fail(agent, k, 'from', `starts at [${a.from[0]}, ${a.from[1]}] but the robot is at ${showCell(grid.width, at)}`);
      if (a.start !== prevEnd) fail(agent, k, 'start', `is ${a.start}, expected ${prevEnd} (actions are back to back from 0)`);
      if (!(Number.isFinite(a.end) && a.end > a.start)) fail(agent, k, 'end', `is ${a.end}; an action lasts a positive time`);
      if (!Number.isInteger(a.step) || a.step < prevStep) fail(agent, k, 'step', `is ${a.step}; steps are integers that never decrease`);
      const dx = (to % grid.width) - (from % grid.width);
      const dy = Math.floor(to / grid.width) - Math.floor(from / grid.width);
      if (a.action === 'forward' ? Math.abs(dx) + Math.abs(dy) !== 1 : from !== to) {
        fail(agent, k, 'to', a.action === 'forward' ? 'a forward move goes to a 4-neighbour' : `a ${a.action} stays in its cell`);
      }
      prevEnd = a.end;
      prevStep = a.step;
      at = to;
    });
    if (at !== agents[agent].goal) {
      fail(agent, Math.max(0, list.length - 1), 'to', `the robot ends at ${showCell(grid.width, at)}, not at its goal ${showCell(grid.width, agents[agent].goal)}`);
    }
    if (list.length > 0) {
      makespanSteps = Math.max(makespanSteps, list[list.length - 1].step + 1);
      makespanMs = Math.max(makespanMs, prevEnd);
    }
  });

  const actions: ScheduledAction[] = [];
  const isPaddingList: number[] = [];
  const first = new Int32Array(agents.length + 1);
  schedule.forEach((list, agent) => {
    first[agent] = actions.length;
    for (const a of list) {
      actions.push(a);
      isPaddingList.push(0);
    }
    const goal: CellXY = [agents[agent].goal % grid.width, Math.floor(agents[agent].goal / grid.width)];
    const last = list.length > 0 ? list[list.length - 1] : undefined;
    const heading: Heading = last?.heading ?? agents[agent].startHeading ?? 'N';
    let end = last?.end ?? 0;
    let step = last ? last.step + 1 : 0;
    const pad = (ms: number): void => {
      actions.push({ action: 'wait', from: goal, to: goal, heading, start: end, end: end + ms, step });
      isPaddingList.push(1);
      end += ms;
      step++;
    };
    if (timeline === 'steps') {
      while (step < makespanSteps) pad(paddingWaitMs);
    } else if (end < makespanMs) {
      pad(makespanMs - end);
    }
  });
  first[agents.length] = actions.length;
  return flatten(instance, profile, timeline, actions, isPaddingList, first);
}

function flatten(
  instance: MapfInstance, profile: RobotProfile, timeline: 'steps' | 'ms',
  actions: readonly ScheduledAction[], isPaddingList: readonly number[], first: Int32Array,
): PreparedPlan {
  const n = actions.length;
  const robots = instance.agents.length;
  const w = instance.grid.width;
  const pitch = profile.cellPitchMm;
  const p: PreparedPlan = {
    instance, profile, timeline, robotCount: robots, actionCount: n, first,
    robotOf: new Int32Array(n), kind: new Uint8Array(n), fromCell: new Int32Array(n), toCell: new Int32Array(n),
    fromX: new Float64Array(n), fromY: new Float64Array(n), toX: new Float64Array(n), toY: new Float64Array(n),
    nominalMs: new Float64Array(n), plannedStart: new Float64Array(n), step: new Int32Array(n),
    isPadding: Uint8Array.from(isPaddingList), lastForward: new Int32Array(robots).fill(-1),
    goalCell: new Int32Array(robots), goalX: new Float64Array(robots), goalY: new Float64Array(robots), actions,
  };
  for (let r = 0; r < robots; r++) {
    const goal = instance.agents[r].goal;
    p.goalCell[r] = goal;
    p.goalX[r] = (goal % w) * pitch;
    p.goalY[r] = Math.floor(goal / w) * pitch;
    for (let i = first[r]; i < first[r + 1]; i++) {
      const a = actions[i];
      p.robotOf[i] = r;
      p.kind[i] = KIND_CODE[a.action];
      p.fromCell[i] = a.from[1] * w + a.from[0];
      p.toCell[i] = a.to[1] * w + a.to[0];
      p.fromX[i] = a.from[0] * pitch;
      p.fromY[i] = a.from[1] * pitch;
      p.toX[i] = a.to[0] * pitch;
      p.toY[i] = a.to[1] * pitch;
      p.nominalMs[i] = a.end - a.start;
      p.plannedStart[i] = a.start;
      p.step[i] = a.step;
      if (a.action === 'forward') p.lastForward[r] = i;
    }
  }
  return p;
}

function checkProfile(profile: RobotProfile): void {
  const positive = ['forwardMs', 'quarterTurnMs', 'waitMs', 'cellPitchMm', 'robotDiameterMm'] as const;
  for (const field of positive) {
    const v = profile[field];
    if (!(Number.isFinite(v) && v > 0)) throw new Error(`robot profile: field "${field}" must be a positive number, got ${v}`);
  }
}

function showCell(width: number, cell: number): string {
  return `[${cell % width}, ${Math.floor(cell / width)}]`;
}

function fail(agent: number, k: number, field: string, message: string): never {
  throw new Error(`plan: agent ${agent}, action ${k}, field "${field}": ${message}`);
}
