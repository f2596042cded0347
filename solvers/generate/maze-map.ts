/** A perfect maze (exactly one route between any two lattice cells) with corridors of a chosen width. */
import { createRng } from '../random';
import { checkSize, checkWhole, finishMap, rowsOf, type GeneratedMap } from './generated-map';

/** Options of generateMazeMap. */
export interface MazeMapOptions {
  /** Maze cells across and down (each becomes a corridorWidth × corridorWidth free block). */
  readonly cellsX: number;
  readonly cellsY: number;
  /** Corridor width in grid cells (default 1). */
  readonly corridorWidth?: number;
  /** Wall thickness in grid cells (default 1). */
  readonly wallWidth?: number;
  readonly seed: number;
}

/**
 * Carves a spanning tree of the cellsX × cellsY lattice by randomised depth-first search (the
 * "recursive backtracker", run with an explicit stack). The map is
 * cellsX · (corridorWidth + wallWidth) − wallWidth cells wide; the map edge is the outer wall.
 */
export function generateMazeMap(options: MazeMapOptions): GeneratedMap {
  const { cellsX, cellsY, seed } = options;
  const corridor = options.corridorWidth ?? 1;
  const wall = options.wallWidth ?? 1;
  checkWhole('cellsX', cellsX, 1);
  checkWhole('cellsY', cellsY, 1);
  checkWhole('corridorWidth', corridor, 1);
  checkWhole('wallWidth', wall, 1);
  const pitch = corridor + wall;
  const width = cellsX * pitch - wall;
  const height = cellsY * pitch - wall;
  checkSize(width, height);
  const free = new Uint8Array(width * height);
  const openRect = (x0: number, y0: number, w: number, h: number): void => {
    for (let y = y0; y < y0 + h; y++) free.fill(1, y * width + x0, y * width + x0 + w);
  };
  for (let j = 0; j < cellsY; j++) for (let i = 0; i < cellsX; i++) openRect(i * pitch, j * pitch, corridor, corridor);
  const rng = createRng(seed);
  const visited = new Uint8Array(cellsX * cellsY);
  const stack = [rng.int(cellsX * cellsY)];
  visited[stack[0]] = 1;
  const options4: number[] = [];
  while (stack.length > 0) {
    const cell = stack[stack.length - 1];
    const i = cell % cellsX;
    const j = (cell - i) / cellsX;
    options4.length = 0;
    if (j > 0 && !visited[cell - cellsX]) options4.push(cell - cellsX);
    if (j + 1 < cellsY && !visited[cell + cellsX]) options4.push(cell + cellsX);
    if (i > 0 && !visited[cell - 1]) options4.push(cell - 1);
    if (i + 1 < cellsX && !visited[cell + 1]) options4.push(cell + 1);
    if (options4.length === 0) {
      stack.pop();
      continue;
    }
    const next = options4[rng.int(options4.length)];
    const ni = next % cellsX;
    const nj = (next - ni) / cellsX;
    // Open the wall between the two blocks.
    if (ni !== i) openRect(Math.min(i, ni) * pitch + corridor, j * pitch, wall, corridor);
    else openRect(i * pitch, Math.min(j, nj) * pitch + corridor, corridor, wall);
    visited[next] = 1;
    stack.push(next);
  }
  const name = `maze-${cellsX}x${cellsY}-c${corridor}-w${wall}-seed${seed >>> 0}`;
  return finishMap(name, rowsOf(width, height, free));
}
