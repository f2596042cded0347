import { instanceFromScenario, largestAgentCount } from '../io/instance-from-scenario';
import { parseScenario } from '../io/parse-scenario';
import { createOctileSearch } from '../grid/octile-search';
import { generateMap } from './generate-map';
import { generateScenario } from './random-scenario';

// Outside check for 4-connected reachability: the `pathfinding` npm package's breadth-first finder
// (it ships no types, hence the local shape).
// eslint-disable-next-line @typescript-eslint/no-require-imports
const PF = require('pathfinding') as {
  Grid: new (w: number, h: number, matrix: number[][]) => unknown;
  BreadthFirstFinder: new (o: { diagonalMovement: number }) => { findPath(sx: number, sy: number, gx: number, gy: number, g: unknown): number[][] };
  DiagonalMovement: { Never: number };
};

const rooms = generateMap({ kind: 'rooms', roomsX: 4, roomsY: 4, roomWidth: 5, roomHeight: 5, seed: 3 }).map;
// Dense random obstacles leave many small pockets: starts and goals must never straddle them.
const pockets = generateMap({ kind: 'random', width: 24, height: 24, density: 0.38, seed: 11 }).map;

describe('generateScenario', () => {
  it('gives the same bytes for the same seed and other bytes for another seed', () => {
    const a = generateScenario(rooms, { seed: 1 }).text;
    expect(generateScenario(rooms, { seed: 1 }).text).toBe(a);
    expect(generateScenario(rooms, { seed: 2 }).text).not.toBe(a);
  });

  it('writes a scenario that parses against its map, perBucket rows in every bucket', () => {
    const { rows, text } = generateScenario(rooms, { seed: 1, perBucket: 5, mapFile: 'rooms.map' });
    const parsed = parseScenario(text, { map: rooms });
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    expect(parsed.value.rows).toHaveLength(rows.length);
    const counts = new Map<number, number>();
    for (const r of parsed.value.rows) counts.set(r.bucket, (counts.get(r.bucket) ?? 0) + 1);
    expect(counts.size).toBeGreaterThan(4);
    expect([...counts.values()].every((n) => n === 5)).toBe(true);
    expect(parsed.value.rows.every((r) => r.mapFile === 'rooms.map')).toBe(true);
  });

  it('writes the octile distance with 8 decimals and bucket floor(length / 4)', () => {
    const { text } = generateScenario(pockets, { seed: 4 });
    const search = createOctileSearch(pockets.grid);
    for (const line of text.trimEnd().split('\n').slice(1)) {
      const f = line.split('\t');
      const d = search.distance(Number(f[5]) * 24 + Number(f[4]), Number(f[7]) * 24 + Number(f[6]));
      expect(f[8]).toBe(d.toFixed(8));
      expect(Number(f[0])).toBe(Math.floor(d / 4));
    }
  });

  it('keeps every start and goal in one 4-connected component, and no start or goal twice', () => {
    for (const mode of ['even', 'random'] as const) {
      const { text } = generateScenario(pockets, { seed: 7, mode, count: 80 });
      const parsed = parseScenario(text, { map: pockets });
      if (!parsed.ok) throw new Error(JSON.stringify(parsed.errors));
      const rows = parsed.value.rows;
      if (mode === 'random') expect(rows).toHaveLength(80);
      expect(largestAgentCount(parsed.value)).toBe(rows.length);
      expect(instanceFromScenario(pockets, parsed.value, rows.length).ok).toBe(true);
      const matrix = Array.from({ length: 24 }, (_, y) => Array.from({ length: 24 }, (_, x) => 1 - pockets.grid.passable[y * 24 + x]));
      const finder = new PF.BreadthFirstFinder({ diagonalMovement: PF.DiagonalMovement.Never });
      for (const r of rows) {
        expect(r.start).not.toEqual(r.goal);
        const path = finder.findPath(r.start[0], r.start[1], r.goal[0], r.goal[1], new PF.Grid(24, 24, matrix));
        expect(path.length).toBeGreaterThan(1);
      }
    }
  });

  it('stops with an AbortError when its signal is aborted', () => {
    const controller = new AbortController();
    controller.abort();
    expect(() => generateScenario(rooms, { seed: 1, signal: controller.signal })).toThrow(expect.objectContaining({ name: 'AbortError' }));
  });

  it('returns what it could when the map has few cells', () => {
    const tiny = generateMap({ kind: 'empty', width: 3, height: 1 }).map;
    const { rows } = generateScenario(tiny, { seed: 1, mode: 'random', count: 10 });
    expect(rows).toHaveLength(3);
  });
});
