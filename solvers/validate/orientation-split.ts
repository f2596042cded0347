/**
 * Independent validator of orientation-split plans.
 *
 * Plan semantics (shared by every engineer): per agent an array of states `(cell, heading)`
 * per unit time step; each step is exactly one of forward (to the neighbour in the heading
 * direction, same heading), turn-left / turn-right (same cell, heading rotates 90°), wait
 * (same state). Headings N (y−1), E (x+1), S (y+1), W (x−1). Start heading given per agent
 * (`instance.agents[i].startHeading`, which wins when set) or by the plan-wide rule, where
 * `free` means any heading at t = 0 at no cost; goal heading: any. Conflicts on cells
 * whatever the heading: vertex, swap on forward moves, goal; with `following: forbidden` also
 * following on cells (following-rule.ts: waiting or turning in a cell occupies it). Cost = arrival step of the final
 * arrival at the goal cell (turns or waits at the goal afterwards cost nothing).
 */
import type { FollowingRule, Heading, StartHeading } from '@shared/plan';
import type { MapfInstance } from '../instance';
import { firstCellConflict } from './cell-conflicts';
import { firstFollowingViolation } from './following-rule';
import { arrivalStep, isCellIndex, xyOf } from './grid-cells';
import { FORWARD_DELTA, isHeading, leftOf, requiredStartHeading, rightOf } from './headings';
import { agentCountViolation } from './path-rules';
import { firstOf, showCell, verdict, type PlanCheck, type PlanViolationKind, type RankedViolation } from './plan-check';

/** One step of an orientation-split plan: where the agent is and which way it faces. */
export interface OrientedState {
  /** Cell index `y * width + x`. */
  readonly cell: number;
  /** Heading at this step. */
  readonly heading: Heading;
}

/** Checks an orientation-split plan; reports the first violation and recomputes SOC and makespan (steps). */
export function validateOrientationPlan(
  instance: MapfInstance,
  states: readonly (readonly OrientedState[])[],
  startHeading: StartHeading,
  options: { readonly following?: FollowingRule } = {},
): PlanCheck {
  const goals = instance.agents.map((a) => a.goal);
  const cells = states.map((s) => s.map((st) => st.cell));
  const costs = cells.map((c, i) => (i < goals.length ? arrivalStep(c, goals[i]) : Math.max(0, c.length - 1)));
  const count = agentCountViolation(instance.agents.length, states.length);
  if (count) return verdict(count, costs);
  const candidates: (RankedViolation | undefined)[] = states.map((s, i) => firstStateRuleViolation(instance, i, s, startHeading));
  candidates.push(firstCellConflict(instance.grid, cells, goals));
  if (options.following === 'forbidden') candidates.push(firstFollowingViolation(instance.grid, cells));
  return verdict(firstOf(candidates), costs);
}

function firstStateRuleViolation(
  instance: MapfInstance,
  i: number,
  seq: readonly OrientedState[],
  rule: StartHeading,
): RankedViolation | undefined {
  const { grid } = instance;
  const task = instance.agents[i];
  const one = (kind: PlanViolationKind, time: number, cell: number, message: string, phase: 0 | 1 = 0): RankedViolation => ({
    phase,
    violation: { kind, agents: [i], time, cell: xyOf(grid, cell), message },
  });
  if (seq.length === 0) return one('empty-path', 0, task.start, `agent ${i} has no states (it needs at least its start state)`);
  const required = requiredStartHeading(instance, i, rule);
  for (let t = 0; t < seq.length; t++) {
    const { cell, heading } = seq[t];
    if (!isCellIndex(grid, cell)) {
      return one('off-grid', t, cell, `agent ${i} is at ${String(cell)} at t = ${t}, which is no cell of the ${grid.width}×${grid.height} grid`);
    }
    const xy = showCell(xyOf(grid, cell));
    if (t === 0 && cell !== task.start) {
      return one('wrong-start', 0, cell, `agent ${i} starts at ${xy}, but its start is ${showCell(xyOf(grid, task.start))}`);
    }
    if (!isHeading(heading)) {
      return one('bad-heading', t, cell, `agent ${i} has heading ${JSON.stringify(heading)} at t = ${t} (expected N, E, S or W)`);
    }
    if (t === 0 && required !== 'free' && heading !== required) {
      return one('bad-heading', 0, cell, `agent ${i} starts facing ${heading}, but it must start facing ${required}`);
    }
    if (grid.passable[cell] !== 1) return one('blocked-cell', t, cell, `agent ${i} is at ${xy} at t = ${t}, which is blocked`);
    if (t + 1 < seq.length) {
      const next = seq[t + 1];
      if (isCellIndex(grid, next.cell) && isHeading(next.heading) && !isLegalStep(instance, seq[t], next)) {
        return one(
          'bad-move',
          t,
          cell,
          `agent ${i} goes from ${xy} facing ${heading} to ${showCell(xyOf(grid, next.cell))} facing ${next.heading} between t = ${t} and t = ${t + 1} (a step is one forward move, one quarter turn or a wait)`,
          1,
        );
      }
    }
  }
  const last = seq[seq.length - 1].cell;
  if (last !== task.goal) {
    return one(
      'wrong-goal',
      seq.length - 1,
      last,
      `agent ${i} ends at ${showCell(xyOf(grid, last))} at t = ${seq.length - 1}, but its goal is ${showCell(xyOf(grid, task.goal))}`,
    );
  }
  return undefined;
}

/** Whether a → b is a wait, a quarter turn, or one forward move in the heading's direction. */
function isLegalStep(instance: MapfInstance, a: OrientedState, b: OrientedState): boolean {
  if (a.cell === b.cell) return b.heading === a.heading || b.heading === leftOf(a.heading) || b.heading === rightOf(a.heading);
  if (b.heading !== a.heading) return false;
  const [x, y] = xyOf(instance.grid, a.cell);
  const [bx, by] = xyOf(instance.grid, b.cell);
  const [dx, dy] = FORWARD_DELTA[a.heading];
  return bx === x + dx && by === y + dy;
}
