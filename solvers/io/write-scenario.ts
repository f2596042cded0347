/** Writer for `version 1` scenario files in the layout of the standard files (tabs, 8 decimals, LF). */
import { formatOptimalLength, type ScenarioRow } from './scenario';

/** A scenario row's fields without its file position (what a generator produces). */
export type ScenarioRowData = Omit<ScenarioRow, 'line' | 'fieldColumns'>;

/** The scenario file text of these rows: `version 1`, then one tab-separated row per line. */
export function writeScenario(rows: readonly ScenarioRowData[]): string {
  const body = rows.map((r) =>
    [r.bucket, r.mapFile, r.mapWidth, r.mapHeight, r.start[0], r.start[1], r.goal[0], r.goal[1],
      formatOptimalLength(r.optimalLength)].join('\t'));
  return ['version 1', ...body, ''].join('\n');
}
