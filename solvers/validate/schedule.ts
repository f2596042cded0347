/**
 * Independent validator of timed schedules: the weighted-split model's plans, and the
 * nominal-time check of any model's schedule.
 *
 * Schedule semantics (shared by every engineer; `ScheduledAction` in shared/plan.ts): per
 * agent a contiguous list of timed actions (first starts at 0 at the agent's start cell; each
 * next one starts when the previous ends, where it ended); `heading` = heading at the end of
 * the action; `step` = index of the abstract step on the model's own timeline (checked to be
 * a non-negative integer that never decreases). Durations: forward = profile.forwardMs,
 * turn-left/turn-right = profile.quarterTurnMs; wait = any positive integer ms (a
 * classic/orientation-split wait step lasts profile.waitMs — pass `waits: 'profile'` to
 * demand that; weighted-split waits may be any length, since a robot can stand still for as
 * long as it likes — this is what makes safe-interval search exact). An agent with
 * start = goal and nothing to do has an empty list.
 *
 * Occupancy rule: an agent occupies its cell while turning or waiting, and BOTH cells for the
 * whole of a forward move; before its first action it occupies its start, after its last
 * action its goal cell forever. Intervals are half-open `[start, end)`; a conflict is two
 * agents' occupancy of one cell with overlapping intervals (`a.start < b.end && b.start <
 * a.end`); touching intervals are fine. Cost of an agent = end time (ms) of its last action
 * that arrives at the goal (0 if it never leaves it); SOC = sum of arrival times in ms,
 * makespan = the largest.
 */
import { ACTION_KINDS, type CellXY, type Heading, type RobotProfile, type Schedule, type ScheduledAction, type StartHeading } from '@shared/plan';
import type { MapfInstance } from '../instance';
import { xyOf } from './grid-cells';
import { FORWARD_DELTA, isHeading, leftOf, requiredStartHeading, rightOf } from './headings';
import { agentCountViolation } from './path-rules';
import { firstOf, pair, showCell, verdict, type PlanCheck, type PlanViolationKind, type RankedViolation } from './plan-check';

/** How schedules are checked beyond the fixed rules. */
export interface ScheduleCheckOptions {
  /** Start heading of agents whose instance task fixes none ('free' = any). */
  readonly startHeading: StartHeading;
  /** 'any-length' (default; weighted-split): a wait lasts any positive integer ms. 'profile': exactly profile.waitMs. */
  readonly waits?: 'any-length' | 'profile';
}

/** Checks a schedule at nominal times; reports the first violation and recomputes SOC and makespan in ms. */
export function validateSchedule(
  instance: MapfInstance,
  schedule: Schedule,
  profile: RobotProfile,
  options: ScheduleCheckOptions,
): PlanCheck {
  for (const key of ['forwardMs', 'quarterTurnMs', 'waitMs'] as const) {
    if (!Number.isInteger(profile[key]) || profile[key] <= 0) throw new RangeError(`profile.${key} must be a positive integer, got ${profile[key]}`);
  }
  const costs = schedule.map((acts, i) => arrivalMs(instance, i, acts));
  const count = agentCountViolation(instance.agents.length, schedule.length);
  if (count) return verdict(count, costs);
  const candidates: (RankedViolation | undefined)[] = schedule.map((acts, i) => firstActionRuleViolation(instance, i, acts, profile, options));
  candidates.push(firstOverlap(instance, schedule));
  return verdict(firstOf(candidates), costs);
}

/** The agent's arrival time: end of its last forward into the goal (0 if none); for a schedule ending elsewhere, its last end. */
function arrivalMs(instance: MapfInstance, i: number, acts: readonly ScheduledAction[]): number {
  if (acts.length === 0) return 0;
  const goal = i < instance.agents.length ? xyOf(instance.grid, instance.agents[i].goal) : undefined;
  const last = acts[acts.length - 1];
  if (!goal || !sameCell(last.to, goal)) return finiteOr0(last.end);
  for (let j = acts.length - 1; j >= 0; j--) {
    if (acts[j].action === 'forward' && sameCell(acts[j].to, goal)) return finiteOr0(acts[j].end);
  }
  return 0;
}

const finiteOr0 = (v: number): number => (Number.isFinite(v) ? v : 0);
const sameCell = (a: CellXY, b: CellXY): boolean => a[0] === b[0] && a[1] === b[1];
const ms = (v: number): string => (v === Infinity ? '∞' : `${v} ms`);

function isGridCell(instance: MapfInstance, c: unknown): c is CellXY {
  const { width, height } = instance.grid;
  return (
    Array.isArray(c) &&
    c.length === 2 &&
    Number.isInteger(c[0]) &&
    Number.isInteger(c[1]) &&
    c[0] >= 0 &&
    c[1] >= 0 &&
    c[0] < width &&
    c[1] < height
  );
}

function firstActionRuleViolation(
  instance: MapfInstance,
  i: number,
  acts: readonly ScheduledAction[],
  profile: RobotProfile,
  options: ScheduleCheckOptions,
): RankedViolation | undefined {
  const { grid } = instance;
  const task = instance.agents[i];
  const start = xyOf(grid, task.start);
  const goal = xyOf(grid, task.goal);
  const one = (kind: PlanViolationKind, time: number, cell: CellXY, message: string): RankedViolation => ({
    phase: 0,
    violation: { kind, agents: [i], time: Number.isFinite(time) ? time : 0, cell, message },
  });
  if (acts.length === 0) {
    if (sameCell(start, goal)) return undefined;
    return one('wrong-goal', 0, start, `agent ${i} has no actions, but its goal ${showCell(goal)} is not its start ${showCell(start)}`);
  }
  const required = requiredStartHeading(instance, i, options.startHeading);
  let cell: CellXY = start;
  // Unknown (undefined) only before the first action of a free-start agent.
  let heading: Heading | undefined = required === 'free' ? undefined : required;
  let time = 0;
  let step = 0;
  for (let j = 0; j < acts.length; j++) {
    const a = acts[j];
    const what = `action ${j} (${String(a.action)}) of agent ${i}`;
    if (!(ACTION_KINDS as readonly string[]).includes(a.action)) {
      return one('bad-move', time, cell, `${what} is no known action (forward, turn-left, turn-right, wait)`);
    }
    if (!Number.isInteger(a.start) || !Number.isInteger(a.end)) {
      return one('bad-duration', time, cell, `${what} has start ${a.start} and end ${a.end}; times are integer milliseconds`);
    }
    if (a.start !== time) {
      const why = j === 0 ? 'the first action must start at 0 ms' : `the previous action ended at ${ms(time)}`;
      return one('gap', Math.min(time, a.start), cell, `${what} starts at ${ms(a.start)}, but ${why}`);
    }
    for (const [name, c] of [['from', a.from], ['to', a.to]] as const) {
      if (!isGridCell(instance, c)) {
        return one('off-grid', a.start, cell, `${what} has ${name} = ${JSON.stringify(c)}, which is no cell of the ${grid.width}×${grid.height} grid`);
      }
    }
    if (!sameCell(a.from, cell)) {
      if (j === 0) return one('wrong-start', 0, a.from, `agent ${i} starts at ${showCell(a.from)}, but its start is ${showCell(start)}`);
      return one('bad-move', a.start, a.from, `${what} starts at ${showCell(a.from)}, but the previous action ended at ${showCell(cell)}`);
    }
    if (!isHeading(a.heading)) {
      return one('bad-heading', a.start, a.from, `${what} ends facing ${JSON.stringify(a.heading)} (expected N, E, S or W)`);
    }
    const want =
      a.action === 'forward' ? profile.forwardMs : a.action === 'wait' ? (options.waits === 'profile' ? profile.waitMs : undefined) : profile.quarterTurnMs;
    const took = a.end - a.start;
    if (want === undefined ? took <= 0 : took !== want) {
      const rule = want === undefined ? 'a wait must last a positive number of ms' : `a ${a.action} lasts ${want} ms`;
      return one('bad-duration', a.start, a.from, `${what} lasts ${took} ms, but ${rule}`);
    }
    const headingBefore: Heading =
      heading ?? (a.action === 'turn-left' ? rightOf(a.heading) : a.action === 'turn-right' ? leftOf(a.heading) : a.heading);
    const headingAfter: Heading = a.action === 'turn-left' ? leftOf(headingBefore) : a.action === 'turn-right' ? rightOf(headingBefore) : headingBefore;
    if (a.heading !== headingAfter) {
      const before = heading === undefined ? '' : ` (facing ${heading} before it)`;
      return one('bad-heading', a.start, a.from, `${what} ends facing ${a.heading}, but it must end facing ${headingAfter}${before}`);
    }
    if (a.action === 'forward') {
      const [dx, dy] = FORWARD_DELTA[headingBefore];
      if (a.to[0] !== a.from[0] + dx || a.to[1] !== a.from[1] + dy) {
        return one('bad-move', a.start, a.from, `${what} goes from ${showCell(a.from)} to ${showCell(a.to)}, but facing ${headingBefore} it leads to ${showCell([a.from[0] + dx, a.from[1] + dy])}`);
      }
    } else if (!sameCell(a.from, a.to)) {
      return one('bad-move', a.start, a.from, `${what} goes from ${showCell(a.from)} to ${showCell(a.to)}, but a ${a.action} stays in its cell`);
    }
    for (const c of [a.from, a.to]) {
      if (grid.passable[c[1] * grid.width + c[0]] !== 1) {
        return one('blocked-cell', a.start, c, `agent ${i} occupies ${showCell(c)} from ${ms(a.start)}, which is blocked`);
      }
    }
    if (!Number.isInteger(a.step) || a.step < step) {
      return one('bad-step', a.start, a.from, `${what} has step ${a.step}; steps are integers ≥ 0 that never decrease (previous ${step})`);
    }
    cell = a.to;
    heading = a.heading;
    time = a.end;
    step = a.step;
  }
  if (!sameCell(cell, goal)) {
    return one('wrong-goal', time, cell, `agent ${i} ends at ${showCell(cell)} at ${ms(time)}, but its goal is ${showCell(goal)}`);
  }
  return undefined;
}

interface Stay {
  readonly agent: number;
  readonly start: number;
  end: number;
}

/** Every agent's occupancy intervals per cell (touching intervals of one agent merged). */
function occupancy(instance: MapfInstance, schedule: Schedule): Map<number, Stay[]> {
  const { width } = instance.grid;
  const byCell = new Map<number, Stay[]>();
  const add = (agent: number, c: CellXY, start: number, end: number): void => {
    if (!(start < end)) return;
    const key = c[1] * width + c[0];
    let list = byCell.get(key);
    if (!list) byCell.set(key, (list = []));
    const last = list.findLast((s) => s.agent === agent);
    if (last && last.end === start) last.end = end;
    else list.push({ agent, start, end });
  };
  schedule.forEach((acts, i) => {
    const startCell = xyOf(instance.grid, instance.agents[i].start);
    if (acts.length === 0) {
      add(i, startCell, 0, Infinity);
      return;
    }
    add(i, startCell, 0, acts[0].start);
    for (const a of acts) {
      if (!Number.isFinite(a.start) || !Number.isFinite(a.end) || !Array.isArray(a.from) || !Array.isArray(a.to)) continue;
      add(i, a.from, a.start, a.end);
      if (!sameCell(a.from, a.to)) add(i, a.to, a.start, a.end);
    }
    const last = acts[acts.length - 1];
    if (Array.isArray(last.to) && Number.isFinite(last.end)) add(i, last.to, last.end, Infinity);
  });
  return byCell;
}

/** The overlap of two agents' occupancy of one cell that begins first, or undefined. */
function firstOverlap(instance: MapfInstance, schedule: Schedule): RankedViolation | undefined {
  let best: { time: number; agents: readonly [number, number]; cell: number; x: Stay; y: Stay } | undefined;
  for (const [cell, stays] of occupancy(instance, schedule)) {
    const sorted = [...stays].sort((p, q) => p.start - q.start);
    for (let a = 0; a < sorted.length; a++) {
      const x = sorted[a];
      let found: number | undefined;
      for (let b = a + 1; b < sorted.length && sorted[b].start < x.end; b++) {
        const y = sorted[b];
        if (found !== undefined && y.start > found) break;
        if (y.agent === x.agent) continue;
        // Sorted by start: the overlap of x and y begins at y.start.
        found = y.start;
        const agents = pair(x.agent, y.agent);
        if (!best || y.start < best.time || (y.start === best.time && (agents[0] < best.agents[0] || (agents[0] === best.agents[0] && agents[1] < best.agents[1])))) {
          best = { time: y.start, agents, cell, x, y };
        }
      }
    }
  }
  if (!best) return undefined;
  const xy = xyOf(instance.grid, best.cell);
  const [p, q] = best.x.agent === best.agents[0] ? [best.x, best.y] : [best.y, best.x];
  return {
    phase: 0,
    violation: {
      kind: 'overlap',
      agents: best.agents,
      time: best.time,
      cell: xy,
      message: `agents ${p.agent} and ${q.agent} both occupy ${showCell(xy)} from ${ms(best.time)} (agent ${p.agent} over [${p.start}, ${p.end === Infinity ? '∞' : p.end}) ms, agent ${q.agent} over [${q.start}, ${q.end === Infinity ? '∞' : q.end}) ms)`,
    },
  };
}
