import PF from 'pathfinding';
import { createRng } from '../random';
import { bfsDistances, cellDegrees, DistanceCache, UNREACHABLE } from './distance';
import { gridFromRows, gridFromText } from './grid';

describe('bfsDistances', () => {
  it('equals the path lengths of the pathfinding package A* (no diagonals) on 40 seeded random grids', () => {
    // Reference: the `pathfinding` npm package 0.4.18, AStarFinder with DiagonalMovement.Never (a general-purpose library).
    const rng = createRng(2024);
    let pairs = 0;
    for (let g = 0; g < 40; g++) {
      const w = 5 + rng.int(20);
      const h = 5 + rng.int(20);
      const density = rng.next() * 0.35;
      const rows = Array.from({ length: h }, () => Array.from({ length: w }, () => rng.next() >= density));
      const grid = gridFromRows(rows);
      const pfGrid = new PF.Grid(w, h, rows.map((r) => r.map((free) => (free ? 0 : 1))));
      const finder = new PF.AStarFinder({ diagonalMovement: PF.DiagonalMovement.Never });
      for (let q = 0; q < 15; q++) {
        const s = rng.int(w * h);
        const t = rng.int(w * h);
        if (!grid.passable[s] || !grid.passable[t]) continue;
        const path: number[][] = finder.findPath(s % w, Math.floor(s / w), t % w, Math.floor(t / w), pfGrid.clone());
        const d = bfsDistances(grid, t)[s];
        if (path.length === 0) expect(d).toBe(UNREACHABLE);
        else expect(d).toBe(path.length - 1);
        pairs++;
      }
    }
    expect(pairs).toBeGreaterThan(300);
  });

  it('marks blocked and disconnected cells unreachable', () => {
    const grid = gridFromText('..#.\n..#.');
    const d = bfsDistances(grid, 0);
    expect(Array.from(d)).toEqual([0, 1, UNREACHABLE, UNREACHABLE, 1, 2, UNREACHABLE, UNREACHABLE]);
  });

  it('caches one table per source cell', () => {
    const cache = new DistanceCache(gridFromText('...\n...'));
    expect(cache.from(4)).toBe(cache.from(4));
    expect(cache.from(4)[0]).toBe(2);
  });

  it('counts passable 4-neighbours (corridor cells have degree 2)', () => {
    const grid = gridFromText('...\n.#.\n...');
    expect(Array.from(cellDegrees(grid))).toEqual([2, 2, 2, 2, 0, 2, 2, 2, 2]);
  });
});
