/** What every map generator returns, and the parameter checks they share. */
import { gridMapFromRows, type GridMap } from '../io/grid-map';
import { writeMap } from '../io/write-map';

/** A generated map and its exact map file text (same options and seed → same bytes). */
export interface GeneratedMap {
  readonly map: GridMap;
  readonly text: string;
}

/** Largest side a generator builds (keeps a mistyped parameter from allocating gigabytes). */
export const MAX_GENERATED_SIDE = 4096;

/** Builds the result from rows of `.` (free) and `@` (blocked). */
export function finishMap(name: string, rows: readonly string[]): GeneratedMap {
  const map = gridMapFromRows(rows, { name, type: 'octile' });
  return { map, text: writeMap(map) };
}

/** Rows of text from a 0/1 passability array (1 free). */
export function rowsOf(width: number, height: number, free: Uint8Array): string[] {
  const rows: string[] = [];
  for (let y = 0; y < height; y++) {
    let row = '';
    for (let x = 0; x < width; x++) row += free[y * width + x] === 1 ? '.' : '@';
    rows.push(row);
  }
  return rows;
}

/** Throws a RangeError naming the parameter unless `value` is a whole number in [min, max]. */
export function checkWhole(name: string, value: number, min: number, max = MAX_GENERATED_SIDE): void {
  if (!Number.isInteger(value) || value < min || value > max) {
    throw new RangeError(`${name} must be a whole number from ${min} to ${max}, got ${value}`);
  }
}

/** Throws a RangeError naming the parameter unless `value` is a number in [min, max). */
export function checkFraction(name: string, value: number, min = 0, maxExclusive = 1): void {
  if (!(typeof value === 'number' && value >= min && value < maxExclusive)) {
    throw new RangeError(`${name} must be a number in [${min}, ${maxExclusive}), got ${value}`);
  }
}

/** Throws a RangeError unless the map has at most MAX_GENERATED_SIDE cells a side. */
export function checkSize(width: number, height: number): void {
  if (width > MAX_GENERATED_SIDE || height > MAX_GENERATED_SIDE) {
    throw new RangeError(`the map would be ${width} × ${height}; at most ${MAX_GENERATED_SIDE} a side`);
  }
}
