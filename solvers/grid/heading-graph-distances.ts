/**
 * Exact cost-to-go in the (cell, heading) graph with real durations: a backward Dijkstra
 * (Dijkstra, "A note on two problems in connexion with graphs", Numerische Mathematik 1959)
 * from every heading of the goal cell, forward moves costing `forwardMs` and quarter turns
 * `quarterTurnMs`. As an A* heuristic for the timed search it is admissible and consistent
 * (waits only add time), and it ignores other agents, so it is cached per (goal, durations).
 */
import { SippHeap } from '../search/sipp-heap';
import type { Grid } from './grid';
import { HEADING_COUNT, HEADING_DX, HEADING_DY, turnedLeft, turnedRight } from './heading-graph';

/** Action durations that price the (cell, heading) graph, integer ms > 0. */
export interface HeadingDurations {
  /** Time of one forward move. */
  readonly forwardMs: number;
  /** Time of one 90° turn on the spot. */
  readonly quarterTurnMs: number;
}

/**
 * For each packed state `cell * 4 + heading`, the least time to reach the goal cell in any
 * heading; Infinity when it cannot be reached (blocked cells included).
 */
export function headingDistancesToGoal(grid: Grid, goal: number, durations: HeadingDurations): Float64Array {
  const n = grid.width * grid.height * HEADING_COUNT;
  const dist = new Float64Array(n).fill(Infinity);
  const heap = new SippHeap((a, b) => dist[a] < dist[b] || (dist[a] === dist[b] && a < b));
  const done = new Uint8Array(n);
  for (let h = 0; h < HEADING_COUNT; h++) {
    dist[goal * HEADING_COUNT + h] = 0;
    heap.push(goal * HEADING_COUNT + h);
  }
  const relax = (state: number, d: number): void => {
    if (d < dist[state]) {
      dist[state] = d;
      heap.push(state);
    }
  };
  for (let s = heap.pop(); s !== undefined; s = heap.pop()) {
    if (done[s]) continue;
    done[s] = 1;
    const cell = Math.floor(s / HEADING_COUNT);
    const h = s % HEADING_COUNT;
    const d = dist[s];
    // Predecessors by a turn: the same cell with the neighbouring headings (turns are reversible).
    relax(cell * HEADING_COUNT + turnedLeft(h), d + durations.quarterTurnMs);
    relax(cell * HEADING_COUNT + turnedRight(h), d + durations.quarterTurnMs);
    // Predecessor by a forward move: the cell behind, facing the same way.
    const x = (cell % grid.width) - HEADING_DX[h];
    const y = Math.floor(cell / grid.width) - HEADING_DY[h];
    if (x >= 0 && y >= 0 && x < grid.width && y < grid.height && grid.passable[y * grid.width + x] === 1) {
      relax((y * grid.width + x) * HEADING_COUNT + h, d + durations.forwardMs);
    }
  }
  return dist;
}
