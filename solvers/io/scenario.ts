/**
 * A scenario of the `version 1` format (N. Sturtevant, "Benchmarks for Grid-Based Pathfinding",
 * IEEE TCIAIG 4(2), 2012; used for MAPF by R. Stern et al., SoCS 2019): one start/goal pair per
 * row. An instance with k agents uses the first k rows.
 */
import type { CellXY } from '@shared/plan';

/** The nine fields of a scenario row, in file order (their names appear in error messages). */
export const SCENARIO_FIELDS = [
  'bucket', 'map_file', 'map_width', 'map_height', 'start_x', 'start_y', 'goal_x', 'goal_y', 'optimal_length',
] as const;

/** One row of a scenario file, with the values as given. */
export interface ScenarioRow {
  /** 1-based line of the row in its file (for error messages). */
  readonly line: number;
  /** 1-based column of each of the nine fields, in SCENARIO_FIELDS order. */
  readonly fieldColumns: readonly number[];
  readonly bucket: number;
  readonly mapFile: string;
  readonly mapWidth: number;
  readonly mapHeight: number;
  readonly start: CellXY;
  readonly goal: CellXY;
  /** The 8-connected octile distance from start to goal as given (diagonal √2, no corner cutting). */
  readonly optimalLength: number;
}

/** A parsed scenario file. */
export interface Scenario {
  /** The version word as given: `1` or `1.0`. */
  readonly version: string;
  readonly rows: readonly ScenarioRow[];
}

/** Width of a bucket in octile length: the standard files put a row in bucket floor(length / 4). */
export const BUCKET_WIDTH = 4;

/** The bucket of a row with this optimal length, as in the standard files (checked against the open dataset). */
export function bucketOf(optimalLength: number): number {
  return Math.floor(optimalLength / BUCKET_WIDTH);
}

/** The optimal length as the standard files write it: fixed point with 8 decimals. */
export function formatOptimalLength(length: number): string {
  return length.toFixed(8);
}
