import { connectedComponents } from '../grid/components';
import { parseMap } from '../io/parse-map';
import { generateMap, type MapSpec } from './generate-map';
import { generateMazeMap } from './maze-map';
import { generateRandomMap } from './random-map';
import { generateRoomMap } from './room-map';
import { generateWarehouseMap } from './warehouse-map';

const blockedCount = (text: string) => [...text.split('\n').slice(4).join('')].filter((c) => c === '@').length;
const freeCount = (p: Uint8Array) => p.reduce((a, b) => a + b, 0);

const seeded: MapSpec[] = [
  { kind: 'random', width: 20, height: 12, density: 0.2, seed: 5 },
  { kind: 'rooms', roomsX: 3, roomsY: 3, roomWidth: 5, roomHeight: 4, seed: 5 },
  { kind: 'maze', cellsX: 7, cellsY: 5, corridorWidth: 2, seed: 5 },
  { kind: 'warehouse', shelfColumns: 3, shelfRows: 3, shelfLength: 5, gapRate: 0.2, seed: 5 },
];

describe('map generators', () => {
  it.each(seeded)('$kind: same seed gives the same bytes, another seed other bytes', (spec) => {
    const a = generateMap(spec).text;
    expect(generateMap({ ...spec }).text).toBe(a);
    expect(generateMap({ ...spec, seed: 6 }).text).not.toBe(a);
  });

  it.each([...seeded, { kind: 'empty', width: 7, height: 3 } as MapSpec])('$kind: writes text that parses back to the same map', (spec) => {
    const { map, text } = generateMap(spec);
    const parsed = parseMap(text, { name: map.name });
    expect(parsed.ok && parsed.value).toEqual(map);
  });

  it('random: blocks exactly round(density · cells) cells', () => {
    for (const density of [0, 0.1, 0.2, 0.5]) {
      const { text } = generateRandomMap({ width: 32, height: 32, density, seed: 1 });
      expect(blockedCount(text)).toBe(Math.round(density * 1024));
    }
  });

  it('rooms: one room per lattice cell, all connected, wall crossings blocked', () => {
    const { map } = generateRoomMap({ roomsX: 4, roomsY: 3, roomWidth: 5, roomHeight: 3, seed: 2 });
    expect([map.width, map.height]).toEqual([4 * 6 - 1, 3 * 4 - 1]);
    expect(connectedComponents(map.grid).count).toBe(1);
    for (let j = 1; j < 3; j++) for (let i = 1; i < 4; i++) expect(map.grid.passable[(j * 4 - 1) * map.width + (i * 6 - 1)]).toBe(0);
  });

  it('rooms: without extra doors the doors form a spanning tree (rooms − 1 doors)', () => {
    const { map } = generateRoomMap({ roomsX: 5, roomsY: 4, roomWidth: 3, roomHeight: 3, doorWidth: 2, extraDoorRate: 0, seed: 9 });
    const interior = 5 * 4 * 3 * 3;
    expect(freeCount(map.grid.passable) - interior).toBe((5 * 4 - 1) * 2);
    expect(connectedComponents(map.grid).count).toBe(1);
  });

  it('maze: with corridor width 1 the free cells form a tree (a perfect maze)', () => {
    const { map } = generateMazeMap({ cellsX: 9, cellsY: 7, seed: 4 });
    const { width, height, passable } = map.grid;
    let edges = 0;
    for (let c = 0; c < width * height; c++) {
      if (!passable[c]) continue;
      if (c % width < width - 1 && passable[c + 1]) edges++;
      if (c + width < width * height && passable[c + width]) edges++;
    }
    expect(connectedComponents(map.grid).count).toBe(1);
    expect(edges).toBe(freeCount(passable) - 1);
  });

  it('maze: wider corridors open exactly cells − 1 walls', () => {
    const { map } = generateMazeMap({ cellsX: 6, cellsY: 4, corridorWidth: 3, wallWidth: 2, seed: 8 });
    expect([map.width, map.height]).toEqual([6 * 5 - 2, 4 * 5 - 2]);
    expect(freeCount(map.grid.passable)).toBe(24 * 9 + 23 * 3 * 2);
    expect(connectedComponents(map.grid).count).toBe(1);
  });

  it('warehouse: shelf blocks with aisles inside a margin, free space connected', () => {
    const { map } = generateWarehouseMap({ shelfColumns: 4, shelfRows: 5, shelfLength: 6, aisleWidth: 2, margin: 3, seed: 1 });
    expect([map.width, map.height]).toEqual([2 * 3 + 4 * 6 + 3 * 2, 2 * 3 + 5 * 2 + 4 * 2]);
    expect(map.width * map.height - freeCount(map.grid.passable)).toBe(4 * 5 * 6 * 2);
    const gappy = generateWarehouseMap({ shelfColumns: 4, shelfRows: 5, shelfLength: 6, gapRate: 0.3, seed: 1 });
    expect(connectedComponents(gappy.map.grid).count).toBe(1);
  });

  it('rejects invalid parameters naming them', () => {
    expect(() => generateRandomMap({ width: 10, height: 10, density: 1, seed: 1 })).toThrow(/density/);
    expect(() => generateRoomMap({ roomsX: 2, roomsY: 2, roomWidth: 2, roomHeight: 2, doorWidth: 3, seed: 1 })).toThrow(/doorWidth/);
    expect(() => generateMazeMap({ cellsX: 0, cellsY: 3, seed: 1 })).toThrow(/cellsX/);
    expect(() => generateMap({ kind: 'empty', width: 5000, height: 2 })).toThrow(RangeError);
  });
});
