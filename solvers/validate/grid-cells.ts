/**
 * The little grid geometry the validators need, written here on purpose rather than imported
 * from the solver side, so that a bug in the search code cannot hide itself in its own check.
 */
import type { CellXY } from '@shared/plan';
import type { Grid } from '../grid/grid';

/** Whether `v` is the index of a cell of the grid (an integer in [0, width·height)). */
export function isCellIndex(grid: Grid, v: unknown): v is number {
  return typeof v === 'number' && Number.isInteger(v) && v >= 0 && v < grid.width * grid.height;
}

/** The [x, y] of an index; for a value that is no cell, the best-effort [x, y] (or [NaN, NaN]) for messages. */
export function xyOf(grid: Grid, v: number): CellXY {
  if (typeof v !== 'number' || !Number.isFinite(v) || grid.width === 0) return [NaN, NaN];
  return [((v % grid.width) + grid.width) % grid.width, Math.floor(v / grid.width)];
}

/** Whether an index is a cell of the grid and passable. */
export function isPassableIndex(grid: Grid, v: number): boolean {
  return isCellIndex(grid, v) && grid.passable[v] === 1;
}

/** Whether two cell indices are 4-neighbours (Manhattan distance exactly 1, no wrap-around between rows). */
export function areNeighbours(grid: Grid, a: number, b: number): boolean {
  const [ax, ay] = xyOf(grid, a);
  const [bx, by] = xyOf(grid, b);
  return Math.abs(ax - bx) + Math.abs(ay - by) === 1;
}

/**
 * The arrival time of a sequence of cells one per unit step: the first t from which the agent
 * stays at `goal` to the end (so trailing waits at the goal cost nothing, and an agent that
 * leaves its goal and comes back pays up to its last return). For a sequence that does not
 * end at `goal`, its last index.
 */
export function arrivalStep(cells: readonly number[], goal: number): number {
  if (cells.length === 0) return 0;
  if (cells[cells.length - 1] !== goal) return cells.length - 1;
  let t = cells.length - 1;
  while (t > 0 && cells[t - 1] === goal) t--;
  return t;
}
