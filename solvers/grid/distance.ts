/**
 * Exact 4-connected grid distances by breadth-first search, the heuristic of every unit-step
 * model. On an undirected grid the distance from a cell equals the distance to it, so one
 * BFS per goal (run backwards from the goal) serves as a perfect single-agent heuristic.
 */
import type { Grid } from './grid';

/** Distance value of a cell that cannot be reached (large, but safe to add small numbers to). */
export const UNREACHABLE = 0x3fffffff;

/**
 * BFS distances in unit steps from `source` to every cell over the 4-neighbourhood;
 * blocked cells and unreachable cells get {@link UNREACHABLE}.
 */
export function bfsDistances(grid: Grid, source: number): Int32Array {
  const { width, height, passable } = grid;
  const n = width * height;
  const dist = new Int32Array(n).fill(UNREACHABLE);
  if (source < 0 || source >= n || passable[source] !== 1) return dist;
  const queue = new Int32Array(n);
  let head = 0;
  let tail = 0;
  dist[source] = 0;
  queue[tail++] = source;
  while (head < tail) {
    const c = queue[head++];
    const d = dist[c] + 1;
    const x = c % width;
    // Neighbours in a fixed order (N, E, S, W): the order never changes distances, only work.
    if (c >= width && passable[c - width] === 1 && dist[c - width] === UNREACHABLE) { dist[c - width] = d; queue[tail++] = c - width; }
    if (x + 1 < width && passable[c + 1] === 1 && dist[c + 1] === UNREACHABLE) { dist[c + 1] = d; queue[tail++] = c + 1; }
    if (c + width < n && passable[c + width] === 1 && dist[c + width] === UNREACHABLE) { dist[c + width] = d; queue[tail++] = c + width; }
    if (x > 0 && passable[c - 1] === 1 && dist[c - 1] === UNREACHABLE) { dist[c - 1] = d; queue[tail++] = c - 1; }
  }
  return dist;
}

/** Memoises {@link bfsDistances} per source cell for one grid (a search asks for the same goals again and again). */
export class DistanceCache {
  private readonly tables = new Map<number, Int32Array>();

  /** Creates an empty cache over `grid`. */
  constructor(readonly grid: Grid) {}

  /** Distances from (equivalently: to) `cell`. */
  from(cell: number): Int32Array {
    let d = this.tables.get(cell);
    if (d === undefined) {
      d = bfsDistances(this.grid, cell);
      this.tables.set(cell, d);
    }
    return d;
  }
}

/** Number of passable 4-neighbours of each cell (0 for blocked cells); degree-2 cells form corridors. */
export function cellDegrees(grid: Grid): Uint8Array {
  const { width, height, passable } = grid;
  const n = width * height;
  const deg = new Uint8Array(n);
  for (let c = 0; c < n; c++) {
    if (passable[c] !== 1) continue;
    const x = c % width;
    let k = 0;
    if (c >= width && passable[c - width] === 1) k++;
    if (x + 1 < width && passable[c + 1] === 1) k++;
    if (c + width < n && passable[c + width] === 1) k++;
    if (x > 0 && passable[c - 1] === 1) k++;
    deg[c] = k;
  }
  return deg;
}
