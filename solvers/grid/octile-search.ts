/**
 * Single-agent shortest paths on the 8-connected grid with the conventions of the grid
 * benchmark scenario files (N. Sturtevant, "Benchmarks for Grid-Based Pathfinding", IEEE TCIAIG
 * 4(2), 2012): straight moves cost 1, diagonal moves √2, and a diagonal move needs both
 * orthogonal neighbours free (no corner cutting). Used to check and write the scenarios'
 * optimal_length column; MAPF agents themselves move 4-connected (see the BFS distances).
 *
 * A* (P. Hart, N. Nilsson, B. Raphael, "A Formal Basis for the Heuristic Determination of
 * Minimum Cost Paths", IEEE Trans. SSC 4(2), 1968) with the octile heuristic, which is
 * admissible and consistent for these costs. Path costs are kept exactly as integer pairs
 * (straight count, diagonal count): a + b√2 values that differ are far apart compared with
 * double rounding, so comparisons are exact and the result is the true optimum.
 */
import type { Grid } from './grid';
import { OctileQueue } from './octile-queue';

const SQRT2 = Math.SQRT2;

/** Reusable octile searches over one grid (buffers are allocated once, so many queries are cheap). */
export interface OctileSearch {
  /** The octile distance between two cells, Infinity when unreachable or either cell is blocked. */
  distance(start: number, goal: number): number;
  /** Octile distances from one cell to every cell (Dijkstra), Infinity where unreachable. */
  distancesFrom(source: number): Float64Array;
}

/** Creates an octile searcher for a grid; the grid must not change while it is used. */
export function createOctileSearch(grid: Grid): OctileSearch {
  const { width, height, passable } = grid;
  const n = width * height;
  const straight = new Int32Array(n);
  const diagonal = new Int32Array(n);
  const seen = new Uint32Array(n);
  const queue = new OctileQueue();
  let stamp = 0;

  // Search state shared by the helpers below (kept outside run() so no closures are made per query).
  let goal = -1;
  let gx = 0;
  let gy = 0;
  const push = (cell: number, s: number, d: number): void => {
    let hs = 0;
    let hd = 0;
    if (goal >= 0) {
      const x = cell % width;
      const dx = Math.abs(x - gx);
      const dy = Math.abs((cell - x) / width - gy);
      hd = dx < dy ? dx : dy;
      hs = (dx < dy ? dy : dx) - hd;
    }
    queue.push(s + hs + (d + hd) * SQRT2, s + d * SQRT2, cell);
  };
  const relax = (cell: number, s: number, d: number): void => {
    if (seen[cell] === stamp && s + d * SQRT2 >= straight[cell] + diagonal[cell] * SQRT2) return;
    seen[cell] = stamp;
    straight[cell] = s;
    diagonal[cell] = d;
    push(cell, s, d);
  };

  /** Runs A* towards `target` (or Dijkstra over the whole grid when it is -1); returns the target's cost. */
  const run = (source: number, target: number): number => {
    if (++stamp === 0xffffffff) {
      seen.fill(0);
      stamp = 1;
    }
    queue.clear();
    goal = target;
    gx = goal >= 0 ? goal % width : 0;
    gy = goal >= 0 ? (goal - gx) / width : 0;
    seen[source] = stamp;
    straight[source] = 0;
    diagonal[source] = 0;
    push(source, 0, 0);
    while (queue.size > 0) {
      const tie = queue.peekTie();
      const c = queue.pop();
      const s = straight[c];
      const d = diagonal[c];
      // Lazy deletion: an entry whose g is no longer the cell's best is stale.
      if (tie !== s + d * SQRT2) continue;
      if (c === goal) return s + d * SQRT2;
      const x = c % width;
      const y = (c - x) / width;
      const up = y > 0 && passable[c - width] === 1;
      const down = y < height - 1 && passable[c + width] === 1;
      const left = x > 0 && passable[c - 1] === 1;
      const right = x < width - 1 && passable[c + 1] === 1;
      if (up) relax(c - width, s + 1, d);
      if (down) relax(c + width, s + 1, d);
      if (left) relax(c - 1, s + 1, d);
      if (right) relax(c + 1, s + 1, d);
      if (up && left && passable[c - width - 1] === 1) relax(c - width - 1, s, d + 1);
      if (up && right && passable[c - width + 1] === 1) relax(c - width + 1, s, d + 1);
      if (down && left && passable[c + width - 1] === 1) relax(c + width - 1, s, d + 1);
      if (down && right && passable[c + width + 1] === 1) relax(c + width + 1, s, d + 1);
    }
    return Infinity;
  };

  const isOpen = (cell: number): boolean => Number.isInteger(cell) && cell >= 0 && cell < n && passable[cell] === 1;

  return {
    distance(start, goal) {
      if (!isOpen(start) || !isOpen(goal)) return Infinity;
      return run(start, goal);
    },
    distancesFrom(source) {
      const out = new Float64Array(n).fill(Infinity);
      if (!isOpen(source)) return out;
      run(source, -1);
      for (let i = 0; i < n; i++) if (seen[i] === stamp) out[i] = straight[i] + diagonal[i] * SQRT2;
      return out;
    },
  };
}

/** The octile distance between two cells of a grid (one-off; use createOctileSearch for many queries). */
export function octileDistance(grid: Grid, start: number, goal: number): number {
  return createOctileSearch(grid).distance(start, goal);
}
