/**
 * Grid geometry for the test oracles, kept apart from the solver and validator code:
 * 4-neighbours, heading steps and breadth-first distances.
 */
import type { Heading } from '@shared/plan';
import type { Grid } from '../grid/grid';

/** Cell offsets per heading: N = y − 1, E = x + 1, S = y + 1, W = x − 1. */
export const STEP: Readonly<Record<Heading, readonly [number, number]>> = { N: [0, -1], E: [1, 0], S: [0, 1], W: [-1, 0] };

/** Headings in clockwise order: a right turn is +1, a left turn −1 (mod 4). */
export const CLOCKWISE: readonly Heading[] = ['N', 'E', 'S', 'W'];

/** The cell one step from `cell` towards `heading`, or −1 if that is off the grid or blocked. */
export function ahead(grid: Grid, cell: number, heading: Heading): number {
  const x = (cell % grid.width) + STEP[heading][0];
  const y = Math.floor(cell / grid.width) + STEP[heading][1];
  if (x < 0 || y < 0 || x >= grid.width || y >= grid.height) return -1;
  const c = y * grid.width + x;
  return grid.passable[c] === 1 ? c : -1;
}

/** The passable 4-neighbours of a cell. */
export function neighbours(grid: Grid, cell: number): number[] {
  return CLOCKWISE.map((h) => ahead(grid, cell, h)).filter((c) => c >= 0);
}

/** Breadth-first distances (in moves) from every cell to `target`; Infinity where unreachable. */
export function distancesTo(grid: Grid, target: number): number[] {
  const dist = new Array<number>(grid.width * grid.height).fill(Infinity);
  dist[target] = 0;
  const queue = [target];
  for (let q = 0; q < queue.length; q++) {
    for (const n of neighbours(grid, queue[q])) {
      if (dist[n] === Infinity) {
        dist[n] = dist[queue[q]] + 1;
        queue.push(n);
      }
    }
  }
  return dist;
}
