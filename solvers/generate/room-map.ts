/** A lattice of rectangular rooms separated by one-cell walls with door gaps, all rooms connected. */
import { createRng, type Rng } from '../random';
import { checkSize, checkWhole, finishMap, rowsOf, type GeneratedMap } from './generated-map';

/** Options of generateRoomMap. */
export interface RoomMapOptions {
  /** Rooms across and down. */
  readonly roomsX: number;
  readonly roomsY: number;
  /** Free interior of one room, in cells. */
  readonly roomWidth: number;
  readonly roomHeight: number;
  /** Cells per door gap (default 1); at most the shorter room side. */
  readonly doorWidth?: number;
  /** Chance that a wall not needed for connectivity still gets a door (default 0.3): adds cycles. */
  readonly extraDoorRate?: number;
  readonly seed: number;
}

/**
 * Rooms on a roomsX × roomsY lattice; walls are one cell thick and the map edge closes the outer
 * rooms. Doors follow a random spanning tree of the room lattice (randomised Kruskal), so every
 * room reaches every other; further doors are added with probability extraDoorRate.
 */
export function generateRoomMap(options: RoomMapOptions): GeneratedMap {
  const { roomsX, roomsY, roomWidth, roomHeight, seed } = options;
  const doorWidth = options.doorWidth ?? 1;
  const extraDoorRate = options.extraDoorRate ?? 0.3;
  checkWhole('roomsX', roomsX, 1);
  checkWhole('roomsY', roomsY, 1);
  checkWhole('roomWidth', roomWidth, 1);
  checkWhole('roomHeight', roomHeight, 1);
  checkWhole('doorWidth', doorWidth, 1, Math.min(roomWidth, roomHeight));
  if (!(extraDoorRate >= 0 && extraDoorRate <= 1)) throw new RangeError(`extraDoorRate must be a number in [0, 1], got ${extraDoorRate}`);
  const width = roomsX * (roomWidth + 1) - 1;
  const height = roomsY * (roomHeight + 1) - 1;
  checkSize(width, height);
  const free = new Uint8Array(width * height);
  const open = (x: number, y: number): void => {
    free[y * width + x] = 1;
  };
  for (let j = 0; j < roomsY; j++) {
    for (let i = 0; i < roomsX; i++) {
      for (let y = 0; y < roomHeight; y++) for (let x = 0; x < roomWidth; x++) open(i * (roomWidth + 1) + x, j * (roomHeight + 1) + y);
    }
  }
  const rng = createRng(seed);
  // Walls between neighbouring rooms: [room a, room b, isVertical] with rooms numbered j * roomsX + i.
  const walls: [number, number, boolean][] = [];
  for (let j = 0; j < roomsY; j++) {
    for (let i = 0; i < roomsX; i++) {
      if (i + 1 < roomsX) walls.push([j * roomsX + i, j * roomsX + i + 1, true]);
      if (j + 1 < roomsY) walls.push([j * roomsX + i, (j + 1) * roomsX + i, false]);
    }
  }
  shuffle(walls, rng);
  const parent = Array.from({ length: roomsX * roomsY }, (_, k) => k);
  const root = (k: number): number => {
    while (parent[k] !== k) k = parent[k] = parent[parent[k]];
    return k;
  };
  for (const [a, b, isVertical] of walls) {
    const isTreeEdge = root(a) !== root(b);
    const wantsExtra = rng.next() < extraDoorRate;
    if (!isTreeEdge && !wantsExtra) continue;
    if (isTreeEdge) parent[root(a)] = root(b);
    const i = a % roomsX;
    const j = (a - i) / roomsX;
    if (isVertical) {
      const x = i * (roomWidth + 1) + roomWidth;
      const y0 = j * (roomHeight + 1) + rng.int(roomHeight - doorWidth + 1);
      for (let d = 0; d < doorWidth; d++) open(x, y0 + d);
    } else {
      const y = j * (roomHeight + 1) + roomHeight;
      const x0 = i * (roomWidth + 1) + rng.int(roomWidth - doorWidth + 1);
      for (let d = 0; d < doorWidth; d++) open(x0 + d, y);
    }
  }
  const name = `rooms-${roomsX}x${roomsY}-r${roomWidth}x${roomHeight}-seed${seed >>> 0}`;
  return finishMap(name, rowsOf(width, height, free));
}

function shuffle<T>(items: T[], rng: Rng): void {
  for (let i = items.length - 1; i > 0; i--) {
    const j = rng.int(i + 1);
    [items[i], items[j]] = [items[j], items[i]];
  }
}
