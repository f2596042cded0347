/** One entry point for every map generator, chosen by a `kind` field (what a form or API sends). */
import { generateEmptyMap, type EmptyMapOptions } from './empty-map';
import type { GeneratedMap } from './generated-map';
import { generateMazeMap, type MazeMapOptions } from './maze-map';
import { generateRandomMap, type RandomMapOptions } from './random-map';
import { generateRoomMap, type RoomMapOptions } from './room-map';
import { generateWarehouseMap, type WarehouseMapOptions } from './warehouse-map';

/** A map generator and its options. */
export type MapSpec =
  | ({ readonly kind: 'empty' } & EmptyMapOptions)
  | ({ readonly kind: 'random' } & RandomMapOptions)
  | ({ readonly kind: 'rooms' } & RoomMapOptions)
  | ({ readonly kind: 'maze' } & MazeMapOptions)
  | ({ readonly kind: 'warehouse' } & WarehouseMapOptions);

/** Runs the generator the spec names; throws RangeError on an invalid parameter. */
export function generateMap(spec: MapSpec): GeneratedMap {
  switch (spec.kind) {
    case 'empty':
      return generateEmptyMap(spec);
    case 'random':
      return generateRandomMap(spec);
    case 'rooms':
      return generateRoomMap(spec);
    case 'maze':
      return generateMazeMap(spec);
    case 'warehouse':
      return generateWarehouseMap(spec);
  }
}
