import fc from 'fast-check';
import Graph from 'graphology';
import { dijkstra } from 'graphology-shortest-path';
import { gridFromText, type Grid } from './grid';
import { createOctileSearch, octileDistance } from './octile-search';
import { generateRandomMap } from '../generate/random-map';

/**
 * Outside check: graphology-shortest-path's Dijkstra (a general-purpose graph library) on the
 * same 8-connected graph, built independently here from the rule "straight 1, diagonal √2,
 * a diagonal needs both orthogonal neighbours free" (Sturtevant 2012, IEEE TCIAIG 4(2)).
 */
function referenceDistances(grid: Grid, source: number): Map<number, number> {
  const g = new Graph({ type: 'undirected' });
  const free = (x: number, y: number) => x >= 0 && y >= 0 && x < grid.width && y < grid.height && grid.passable[y * grid.width + x] === 1;
  for (let y = 0; y < grid.height; y++) for (let x = 0; x < grid.width; x++) if (free(x, y)) g.addNode(String(y * grid.width + x));
  for (let y = 0; y < grid.height; y++) {
    for (let x = 0; x < grid.width; x++) {
      if (!free(x, y)) continue;
      const id = String(y * grid.width + x);
      if (free(x + 1, y)) g.addEdge(id, String(y * grid.width + x + 1), { weight: 1 });
      if (free(x, y + 1)) g.addEdge(id, String((y + 1) * grid.width + x), { weight: 1 });
      if (free(x + 1, y + 1) && free(x + 1, y) && free(x, y + 1)) g.addEdge(id, String((y + 1) * grid.width + x + 1), { weight: Math.SQRT2 });
      if (free(x - 1, y + 1) && free(x - 1, y) && free(x, y + 1)) g.addEdge(id, String((y + 1) * grid.width + x - 1), { weight: Math.SQRT2 });
    }
  }
  const paths = dijkstra.singleSource(g, String(source), 'weight');
  const out = new Map<number, number>();
  for (const [target, path] of Object.entries(paths)) {
    let length = 0;
    for (let i = 1; i < path.length; i++) length += g.getEdgeAttribute(g.edge(path[i - 1], path[i]), 'weight') as number;
    out.set(Number(target), length);
  }
  return out;
}

describe('octile search', () => {
  it('costs √2 per diagonal and 1 per straight step on an open grid', () => {
    const grid = gridFromText('.....\n.....\n.....');
    // From (0,0) to (4,2): two diagonals and two straight moves.
    expect(octileDistance(grid, 0, 2 * 5 + 4)).toBeCloseTo(2 * Math.SQRT2 + 2, 12);
    expect(octileDistance(grid, 7, 7)).toBe(0);
  });

  it('does not cut corners: a diagonal needs both orthogonal neighbours free', () => {
    // (0,0) to (1,1) with (1,0) blocked: the diagonal is forbidden, so it takes two straight moves.
    expect(octileDistance(gridFromText('.@\n..'), 0, 3)).toBe(2);
    // Two blocks touching at a corner close the diagonal gap completely.
    expect(octileDistance(gridFromText('.@\n@.'), 0, 3)).toBe(Infinity);
  });

  it('returns Infinity for blocked or out-of-range cells and unreachable goals', () => {
    const grid = gridFromText('..@..\n..@..');
    const search = createOctileSearch(grid);
    expect(search.distance(0, 4)).toBe(Infinity);
    expect(search.distance(0, 2)).toBe(Infinity);
    expect(search.distance(-1, 0)).toBe(Infinity);
    expect(search.distance(0, 10)).toBe(Infinity);
    expect(search.distancesFrom(2).every((d) => d === Infinity)).toBe(true);
  });

  it('agrees with graphology Dijkstra on every target of seeded random maps', () => {
    for (const [density, seed] of [[0.1, 1], [0.25, 2], [0.35, 3]] as const) {
      const { map } = generateRandomMap({ width: 24, height: 17, density, seed });
      const search = createOctileSearch(map.grid);
      for (const source of [0, 100, 250, 407]) {
        if (map.grid.passable[source] !== 1) continue;
        const reference = referenceDistances(map.grid, source);
        const field = search.distancesFrom(source);
        for (let cell = 0; cell < field.length; cell++) {
          const expected = reference.get(cell) ?? Infinity;
          expect(Math.abs(field[cell] - expected) < 1e-9 || field[cell] === expected).toBe(true);
          const d = search.distance(source, cell);
          expect(Math.abs(d - expected) < 1e-9 || d === expected).toBe(true);
        }
      }
    }
  });

  it('gives A* the same answers as the Dijkstra field on arbitrary small grids (property)', () => {
    const gridArb = fc.record({ w: fc.integer({ min: 1, max: 9 }), h: fc.integer({ min: 1, max: 9 }) }).chain(({ w, h }) =>
      fc.record({ w: fc.constant(w), h: fc.constant(h), cells: fc.array(fc.boolean(), { minLength: w * h, maxLength: w * h }) }));
    fc.assert(fc.property(gridArb, fc.nat(), fc.nat(), ({ w, h, cells }, a, b) => {
      const grid: Grid = { width: w, height: h, passable: Uint8Array.from(cells, (c) => (c ? 1 : 0)) };
      const search = createOctileSearch(grid);
      const s = a % (w * h);
      const t = b % (w * h);
      const field = search.distancesFrom(s);
      const d = search.distance(s, t);
      return d === field[t] || Math.abs(d - field[t]) < 1e-9;
    }), { seed: 12345, numRuns: 300 });
  });
});
