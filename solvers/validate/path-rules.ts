/**
 * Per-agent rules of a path of cells (classic and k-robust models): `path[0]` is the start;
 * every step is a wait or a move to a passable 4-neighbour; every entry is a passable cell of
 * the grid; the last entry is the goal.
 */
import type { MapfInstance } from '../instance';
import { areNeighbours, isCellIndex, xyOf } from './grid-cells';
import { showCell, type RankedViolation } from './plan-check';

/** The first violation of the per-agent path rules by agent `i`, or undefined. */
export function firstPathRuleViolation(instance: MapfInstance, i: number, path: readonly number[]): RankedViolation | undefined {
  const { grid } = instance;
  const task = instance.agents[i];
  const one = (kind: RankedViolation['violation']['kind'], time: number, cell: number, message: string, phase: 0 | 1 = 0): RankedViolation => ({
    phase,
    violation: { kind, agents: [i], time, cell: xyOf(grid, cell), message },
  });
  if (path.length === 0) {
    return one('empty-path', 0, task.start, `agent ${i} has an empty path (it needs at least its start cell)`);
  }
  for (let t = 0; t < path.length; t++) {
    const c = path[t];
    if (!isCellIndex(grid, c)) {
      return one('off-grid', t, c, `agent ${i} is at ${String(c)} at t = ${t}, which is no cell of the ${grid.width}×${grid.height} grid`);
    }
    const xy = xyOf(grid, c);
    if (t === 0 && c !== task.start) {
      return one('wrong-start', 0, c, `agent ${i} starts at ${showCell(xy)}, but its start is ${showCell(xyOf(grid, task.start))}`);
    }
    if (grid.passable[c] !== 1) {
      return one('blocked-cell', t, c, `agent ${i} is at ${showCell(xy)} at t = ${t}, which is blocked`);
    }
    const next = path[t + 1];
    if (t + 1 < path.length && isCellIndex(grid, next) && next !== c && !areNeighbours(grid, c, next)) {
      return one(
        'bad-move',
        t,
        c,
        `agent ${i} jumps from ${showCell(xy)} to ${showCell(xyOf(grid, next))} between t = ${t} and t = ${t + 1} (a step is a wait or a move to a 4-neighbour)`,
        1,
      );
    }
  }
  const last = path[path.length - 1];
  if (last !== task.goal) {
    return one(
      'wrong-goal',
      path.length - 1,
      last,
      `agent ${i} ends at ${showCell(xyOf(grid, last))} at t = ${path.length - 1}, but its goal is ${showCell(xyOf(grid, task.goal))}`,
    );
  }
  return undefined;
}

/** The 'agent-count' violation when the plan has a different number of agents than the instance. */
export function agentCountViolation(expected: number, got: number): RankedViolation | undefined {
  if (expected === got) return undefined;
  return {
    phase: 0,
    violation: {
      kind: 'agent-count',
      agents: [],
      time: 0,
      cell: [0, 0],
      message: `the plan has ${got} agents, but the instance has ${expected}`,
    },
  };
}
