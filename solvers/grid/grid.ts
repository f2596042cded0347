/**
 * The grid graph every solver works on: a width × height array of cells, each passable or
 * blocked. Cells are addressed by a single integer index `y * width + x` in hot loops and by
 * [x, y] (x = column, y = row, (0, 0) top-left) at the edges of the library.
 */
import type { CellXY } from '@shared/plan';

/** A rectangular grid map; `passable[y * width + x]` is 1 for a free cell, 0 for a blocked one. */
export interface Grid {
  readonly width: number;
  readonly height: number;
  readonly passable: Uint8Array;
}

/** Builds a grid from rows of booleans or 0/1 (true/1 = passable); rows must share one length. */
export function gridFromRows(rows: readonly (readonly (boolean | number)[])[]): Grid {
  const height = rows.length;
  const width = height === 0 ? 0 : rows[0].length;
  const passable = new Uint8Array(width * height);
  rows.forEach((row, y) => {
    if (row.length !== width) throw new Error(`row ${y} has ${row.length} cells, expected ${width}`);
    row.forEach((v, x) => { passable[y * width + x] = v ? 1 : 0; });
  });
  return { width, height, passable };
}

/** Builds a grid from text rows where '.' is passable and any other character blocked (handy in tests). */
export function gridFromText(text: string): Grid {
  const rows = text.trim().split('\n').map((line) => [...line.trim()].map((ch) => ch === '.'));
  return gridFromRows(rows);
}

/** The index of cell (x, y). */
export function cellIndex(grid: Grid, x: number, y: number): number {
  return y * grid.width + x;
}

/** The [x, y] coordinates of a cell index. */
export function cellXY(grid: Grid, index: number): CellXY {
  return [index % grid.width, Math.floor(index / grid.width)];
}

/** Whether (x, y) lies on the grid and is passable. */
export function isFree(grid: Grid, x: number, y: number): boolean {
  return x >= 0 && y >= 0 && x < grid.width && y < grid.height && grid.passable[y * grid.width + x] === 1;
}
