/** Shelf blocks in rows and columns with aisles between them and a free margin around. */
import { createRng } from '../random';
import { checkFraction, checkSize, checkWhole, finishMap, rowsOf, type GeneratedMap } from './generated-map';

/** Options of generateWarehouseMap. */
export interface WarehouseMapOptions {
  /** Shelf blocks across and down. */
  readonly shelfColumns: number;
  readonly shelfRows: number;
  /** Size of one shelf block: length along x, depth along y (default 2). */
  readonly shelfLength: number;
  readonly shelfDepth?: number;
  /** Width of the aisles between shelf rows (default 1) and between shelf columns (default aisleWidth). */
  readonly aisleWidth?: number;
  readonly crossAisleWidth?: number;
  /** Free border around the shelf area, e.g. for docking (default 2). */
  readonly margin?: number;
  /** Chance that a shelf cell is left empty (default 0): seeded variation between warehouses. */
  readonly gapRate?: number;
  readonly seed: number;
}

/**
 * A warehouse floor: shelfRows × shelfColumns blocks of blocked shelf cells, separated by
 * aisles, inside a free margin. With margin ≥ 1 and shelfDepth ≤ 2 every free cell touches an
 * aisle and the aisles meet in the margin, so the free space is connected whatever gapRate is;
 * other settings may leave pockets, which the scenario generator keeps starts and goals out of.
 */
export function generateWarehouseMap(options: WarehouseMapOptions): GeneratedMap {
  const { shelfColumns, shelfRows, shelfLength, seed } = options;
  const depth = options.shelfDepth ?? 2;
  const aisle = options.aisleWidth ?? 1;
  const crossAisle = options.crossAisleWidth ?? aisle;
  const margin = options.margin ?? 2;
  const gapRate = options.gapRate ?? 0;
  checkWhole('shelfColumns', shelfColumns, 1);
  checkWhole('shelfRows', shelfRows, 1);
  checkWhole('shelfLength', shelfLength, 1);
  checkWhole('shelfDepth', depth, 1);
  checkWhole('aisleWidth', aisle, 1);
  checkWhole('crossAisleWidth', crossAisle, 1);
  checkWhole('margin', margin, 0);
  checkFraction('gapRate', gapRate);
  const width = 2 * margin + shelfColumns * shelfLength + (shelfColumns - 1) * crossAisle;
  const height = 2 * margin + shelfRows * depth + (shelfRows - 1) * aisle;
  checkSize(width, height);
  const free = new Uint8Array(width * height).fill(1);
  const rng = createRng(seed);
  for (let r = 0; r < shelfRows; r++) {
    for (let c = 0; c < shelfColumns; c++) {
      const x0 = margin + c * (shelfLength + crossAisle);
      const y0 = margin + r * (depth + aisle);
      for (let y = y0; y < y0 + depth; y++) {
        for (let x = x0; x < x0 + shelfLength; x++) {
          // Draw for every shelf cell, even at gapRate 0, so the stream does not depend on gapRate.
          if (rng.next() >= gapRate) free[y * width + x] = 0;
        }
      }
    }
  }
  const name = `warehouse-${shelfColumns}x${shelfRows}-s${shelfLength}x${depth}-a${aisle}-seed${seed >>> 0}`;
  return finishMap(name, rowsOf(width, height, free));
}
