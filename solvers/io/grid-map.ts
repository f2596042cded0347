/**
 * A parsed grid map: the solver grid plus what the text said, so that writing it back gives the
 * same file (terrain letters such as `T` and `@` both block, but they are kept apart).
 */
import type { Grid } from '../grid/grid';
import { terrainOf } from './map-terrain';

/** A map as read from (or written to) the grid map text format. */
export interface GridMap {
  /** A name for the map, usually its file name without `.map`; the format itself has none. */
  readonly name?: string;
  /** The `type` header word, usually `octile`; kept as given. */
  readonly type: string;
  readonly width: number;
  readonly height: number;
  readonly grid: Grid;
  /** The map rows exactly as given (trailing blanks removed), one string of `width` characters per row. */
  readonly cellsText: readonly string[];
}

/**
 * Builds a GridMap from rows of terrain characters that are already known to be valid
 * (generators, the JSON instance format after its checks). Throws on a malformed row.
 */
export function gridMapFromRows(rows: readonly string[], options: { name?: string; type?: string } = {}): GridMap {
  const height = rows.length;
  const width = height === 0 ? 0 : rows[0].length;
  const passable = new Uint8Array(width * height);
  rows.forEach((row, y) => {
    // Cells as [x, y] (0-based, the boundary convention); these inputs have no lines to point at.
    if (row.length !== width) throw new Error(`map row y = ${y} has ${row.length} cells, expected ${width}`);
    for (let x = 0; x < width; x++) {
      const terrain = terrainOf(row[x]);
      if (terrain < 0) throw new Error(`cell [${x}, ${y}]: '${row[x]}' is no terrain character`);
      passable[y * width + x] = terrain;
    }
  });
  const map: GridMap = { type: options.type ?? 'octile', width, height, grid: { width, height, passable }, cellsText: [...rows] };
  return options.name === undefined ? map : { name: options.name, ...map };
}

/** The number of passable cells of a map. */
export function countPassable(map: GridMap): number {
  let count = 0;
  for (const v of map.grid.passable) count += v;
  return count;
}
