/**
 * 4-connected components of the passable cells. MAPF agents move 4-connected, and a diagonal
 * move without corner cutting can always be replaced by its two orthogonal moves, so two cells
 * are 4-connected exactly when their octile distance is finite.
 */
import type { Grid } from './grid';

/** Component labels of a grid. */
export interface GridComponents {
  /** Number of components. */
  readonly count: number;
  /** Component of each cell, numbered 0… in row-major order of their first cell; -1 for blocked cells. */
  readonly label: Int32Array;
  /** Number of cells in each component. */
  readonly sizes: readonly number[];
}

/** Labels the 4-connected components of a grid's passable cells (breadth-first flood fill). */
export function connectedComponents(grid: Grid): GridComponents {
  const { width, height, passable } = grid;
  const n = width * height;
  const label = new Int32Array(n).fill(-1);
  const queue = new Int32Array(n);
  const sizes: number[] = [];
  for (let seed = 0; seed < n; seed++) {
    if (passable[seed] !== 1 || label[seed] !== -1) continue;
    const id = sizes.length;
    let head = 0;
    let tail = 0;
    queue[tail++] = seed;
    label[seed] = id;
    while (head < tail) {
      const c = queue[head++];
      const x = c % width;
      const visit = (m: number): void => {
        if (passable[m] === 1 && label[m] === -1) {
          label[m] = id;
          queue[tail++] = m;
        }
      };
      if (c >= width) visit(c - width);
      if (c + width < n) visit(c + width);
      if (x > 0) visit(c - 1);
      if (x < width - 1) visit(c + 1);
    }
    sizes.push(tail);
  }
  return { count: sizes.length, label, sizes };
}
