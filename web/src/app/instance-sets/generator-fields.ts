/** The parameters each map generator takes in the generator form, with their bounds (see MapGeneratorSpec). */
import type { MAP_GENERATOR_KINDS } from '@shared/instance-sets';

/** A generator kind. */
export type GeneratorKind = (typeof MAP_GENERATOR_KINDS)[number];

/** One numeric parameter of a generator. */
export interface GeneratorField {
  readonly key: string;
  readonly label: string;
  readonly min: number;
  readonly max: number;
  readonly step: number;
  /** The value the form starts with. */
  readonly value: number;
}

const f = (key: string, label: string, min: number, max: number, value: number, step = 1): GeneratorField => ({ key, label, min, max, step, value });

/** Parameters by kind, in form order; bounds match shared/instance-sets.ts. */
export const GENERATOR_FIELDS: Readonly<Record<GeneratorKind, readonly GeneratorField[]>> = {
  empty: [f('width', 'Width', 1, 1024, 16), f('height', 'Height', 1, 1024, 16)],
  random: [f('width', 'Width', 1, 1024, 32), f('height', 'Height', 1, 1024, 32), f('density', 'Obstacle density', 0, 0.6, 0.2, 0.05)],
  rooms: [
    f('roomsX', 'Rooms across', 1, 64, 4), f('roomsY', 'Rooms down', 1, 64, 4),
    f('roomWidth', 'Room width', 1, 64, 6), f('roomHeight', 'Room height', 1, 64, 6),
    f('doorWidth', 'Door width', 1, 64, 1), f('extraDoorRate', 'Extra door chance', 0, 1, 0.3, 0.05),
  ],
  maze: [f('cellsX', 'Maze cells across', 1, 256, 12), f('cellsY', 'Maze cells down', 1, 256, 12), f('corridorWidth', 'Corridor width', 1, 16, 1), f('wallWidth', 'Wall width', 1, 16, 1)],
  warehouse: [
    f('shelfColumns', 'Shelf blocks across', 1, 128, 4), f('shelfRows', 'Shelf rows', 1, 128, 6),
    f('shelfLength', 'Shelf length', 1, 64, 8), f('shelfDepth', 'Shelf depth', 1, 8, 2),
    f('aisleWidth', 'Aisle width', 1, 8, 1), f('margin', 'Margin', 0, 32, 2), f('gapRate', 'Empty shelf chance', 0, 0.95, 0, 0.05),
  ],
};

/** Human names of the kinds for the form. */
export const GENERATOR_NAMES: Readonly<Record<GeneratorKind, string>> = {
  empty: 'Empty floor', random: 'Scattered obstacles', rooms: 'Rooms and doors', maze: 'Maze', warehouse: 'Shelf aisles',
};
