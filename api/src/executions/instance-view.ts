/** The instance as the plan viewer draws it: rows of '.' (free) and '@' (blocked), tasks as [x, y]. */
import type { ExecutionInstanceView } from '@shared/executions';
import type { CellXY } from '@shared/plan';
import type { MapfInstance } from '@solvers/instance';

/** The instance as the viewer draws it. */
export function instanceView(instance: MapfInstance): ExecutionInstanceView {
  const { width, height, passable } = instance.grid;
  const rows: string[] = [];
  for (let y = 0; y < height; y++) {
    let row = '';
    for (let x = 0; x < width; x++) row += passable[y * width + x] === 1 ? '.' : '@';
    rows.push(row);
  }
  const xy = (c: number): CellXY => [c % width, Math.floor(c / width)];
  return {
    width, height, rows,
    agents: instance.agents.map((a) => (a.startHeading ? { start: xy(a.start), goal: xy(a.goal), startHeading: a.startHeading } : { start: xy(a.start), goal: xy(a.goal) })),
  };
}
