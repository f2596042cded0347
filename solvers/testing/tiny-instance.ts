/**
 * Test helpers for writing small instances and plans by hand in [x, y] coordinates
 * (x = column, y = row, (0, 0) top-left): `tinyInstance('...\n.#.', [[[0, 0], [2, 1]]])`.
 */
import type { CellXY, Heading } from '@shared/plan';
import { gridFromText, type Grid } from '../grid/grid';
import type { AgentTask, MapfInstance } from '../instance';

/** One agent written by hand: start, goal and optionally a fixed start heading. */
export type TinyTask = readonly [start: CellXY, goal: CellXY, startHeading?: Heading];

/** An instance from a text map ('.' free, anything else blocked) and tasks in [x, y]. */
export function tinyInstance(mapText: string, tasks: readonly TinyTask[]): MapfInstance {
  const grid = gridFromText(mapText);
  const agents: AgentTask[] = tasks.map(([s, g, h]) => ({
    start: s[1] * grid.width + s[0],
    goal: g[1] * grid.width + g[0],
    ...(h ? { startHeading: h } : {}),
  }));
  return { grid, agents };
}

/** A path of cell indices from [x, y] pairs. */
export function cellsOf(grid: Grid, xys: readonly CellXY[]): number[] {
  return xys.map(([x, y]) => y * grid.width + x);
}
