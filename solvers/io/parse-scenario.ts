/**
 * Reader for `version 1` scenario files: a `version 1` (or `version 1.0`) line, then one row per
 * start/goal pair with nine tab- or space-separated fields
 * `bucket map_file map_width map_height start_x start_y goal_x goal_y optimal_length`
 * (N. Sturtevant, "Benchmarks for Grid-Based Pathfinding", IEEE TCIAIG 4(2), 2012).
 * Given the map, rows are also checked against it (size, cells inside and passable).
 */
import type { GridMap } from './grid-map';
import { ErrorList, type ParseResult } from './parse-result';
import { SCENARIO_FIELDS, type Scenario, type ScenarioRow } from './scenario';
import { splitFields, splitLines } from './text-lines';

/** Options of parseScenario. */
export interface ParseScenarioOptions {
  /** The scenario's map; when given, sizes and start/goal passability are checked against it. */
  readonly map?: GridMap;
}

const WHOLE = /^[0-9]+$/;
const DECIMAL = /^[0-9]+(\.[0-9]+)?([eE][+-]?[0-9]+)?$/;
/** Field indices in SCENARIO_FIELDS order. */
const F = { bucket: 0, mapFile: 1, mapWidth: 2, mapHeight: 3, startX: 4, startY: 5, goalX: 6, goalY: 7, length: 8 } as const;

/** Parses a scenario file's text; collects every error (up to MAX_PARSE_ERRORS) with line and column. */
export function parseScenario(text: string, options: ParseScenarioOptions = {}): ParseResult<Scenario> {
  const errors = new ErrorList();
  const lines = splitLines(text);
  const version = readVersion(lines[0], errors);
  const rows: ScenarioRow[] = [];
  for (let i = 1; i < lines.length && !errors.isFull; i++) {
    const row = readRow(lines[i], i + 1, errors);
    if (!row) continue;
    const first = rows[0];
    if (first) checkSameMap(row, first, errors);
    if (options.map) {
      if (!first) checkMapSize(row, options.map, errors);
      checkScenarioRow(row, options.map, errors);
    } else {
      checkInsideDeclaredSize(row, errors);
    }
    rows.push(row);
  }
  if (lines.length <= 1 && !errors.isFull) errors.add(2, 1, 'the scenario has no rows after the version line');
  if (errors.hasErrors) return { ok: false, errors: errors.toArray() };
  return { ok: true, value: { version, rows } };
}

/**
 * Checks a row's start and goal against a map: inside it and on passable cells. Used by
 * parseScenario and again by instanceFromScenario (a scenario may be parsed before its map is known).
 */
export function checkScenarioRow(row: ScenarioRow, map: GridMap, errors: ErrorList): void {
  for (const end of ['start', 'goal'] as const) {
    const [x, y] = row[end];
    const xField = end === 'start' ? F.startX : F.goalX;
    let isInside = true;
    if (x >= map.width) {
      errors.add(row.line, row.fieldColumns[xField], `${end}_x ${x} is outside the map (width ${map.width})`);
      isInside = false;
    }
    if (y >= map.height) {
      errors.add(row.line, row.fieldColumns[xField + 1], `${end}_y ${y} is outside the map (height ${map.height})`);
      isInside = false;
    }
    if (isInside && map.grid.passable[y * map.width + x] !== 1) {
      const terrain = map.cellsText[y]?.[x] ?? '?';
      errors.add(row.line, row.fieldColumns[xField], `${end} (${x}, ${y}) is a blocked cell ('${terrain}') of the map`);
    }
  }
}

function readVersion(line: string | undefined, errors: ErrorList): string {
  if (line === undefined) {
    errors.add(1, 1, "empty file: expected 'version 1' on the first line");
    return '';
  }
  const match = /^version[ \t]+([^ \t]+)$/.exec(line);
  if (!match) {
    errors.add(1, 1, `expected 'version 1' on the first line, found '${line.slice(0, 40)}'`);
    return '';
  }
  if (match[1] !== '1' && match[1] !== '1.0') {
    errors.add(1, line.length - match[1].length + 1, `unsupported version '${match[1]}' (expected 1 or 1.0)`);
  }
  return match[1];
}

function readRow(line: string, lineNo: number, errors: ErrorList): ScenarioRow | undefined {
  if (line === '') {
    errors.add(lineNo, 1, 'blank line between scenario rows');
    return undefined;
  }
  const fields = splitFields(line);
  if (fields.length < SCENARIO_FIELDS.length) {
    const missing = SCENARIO_FIELDS.slice(fields.length).join(', ');
    errors.add(lineNo, Array.from(line).length + 1, `a row has 9 fields, found ${fields.length}: missing ${missing}`);
    return undefined;
  }
  if (fields.length > SCENARIO_FIELDS.length) {
    errors.add(lineNo, fields[9].column, `unexpected field '${fields[9].text}' after optimal_length (a row has 9 fields)`);
    return undefined;
  }
  let isValid = true;
  const whole = (index: number, min: number): number => {
    const { text, column } = fields[index];
    const value = WHOLE.test(text) ? Number(text) : NaN;
    if (value >= min && value <= 0x7fffffff) return value;
    const what = min === 0 ? 'a whole number' : `a whole number of at least ${min}`;
    errors.add(lineNo, column, `${SCENARIO_FIELDS[index]} '${text}' is not ${what}`);
    isValid = false;
    return 0;
  };
  const bucket = whole(F.bucket, 0);
  const mapWidth = whole(F.mapWidth, 1);
  const mapHeight = whole(F.mapHeight, 1);
  const start = [whole(F.startX, 0), whole(F.startY, 0)] as const;
  const goal = [whole(F.goalX, 0), whole(F.goalY, 0)] as const;
  const lengthField = fields[F.length];
  const optimalLength = DECIMAL.test(lengthField.text) ? Number(lengthField.text) : NaN;
  if (!Number.isFinite(optimalLength)) {
    errors.add(lineNo, lengthField.column, `optimal_length '${lengthField.text}' is not a non-negative number`);
    isValid = false;
  }
  if (!isValid) return undefined;
  return {
    line: lineNo,
    fieldColumns: fields.map((f) => f.column),
    bucket,
    mapFile: fields[F.mapFile].text,
    mapWidth,
    mapHeight,
    start,
    goal,
    optimalLength,
  };
}

/** Every row of a scenario names the same map with the same size as its first row. */
function checkSameMap(row: ScenarioRow, first: ScenarioRow, errors: ErrorList): void {
  if (row.mapFile !== first.mapFile) {
    errors.add(row.line, row.fieldColumns[F.mapFile],
      `map_file '${row.mapFile}' differs from '${first.mapFile}' on line ${first.line} (a scenario belongs to one map)`);
  }
  if (row.mapWidth !== first.mapWidth) {
    errors.add(row.line, row.fieldColumns[F.mapWidth], `map_width ${row.mapWidth} differs from ${first.mapWidth} on line ${first.line}`);
  }
  if (row.mapHeight !== first.mapHeight) {
    errors.add(row.line, row.fieldColumns[F.mapHeight], `map_height ${row.mapHeight} differs from ${first.mapHeight} on line ${first.line}`);
  }
}

/** Reported once, on the first row: later rows are held to the first row's size by checkSameMap. */
function checkMapSize(row: ScenarioRow, map: GridMap, errors: ErrorList): void {
  if (row.mapWidth !== map.width) {
    errors.add(row.line, row.fieldColumns[F.mapWidth], `map_width ${row.mapWidth} does not match the map (width ${map.width})`);
  }
  if (row.mapHeight !== map.height) {
    errors.add(row.line, row.fieldColumns[F.mapHeight], `map_height ${row.mapHeight} does not match the map (height ${map.height})`);
  }
}

function checkInsideDeclaredSize(row: ScenarioRow, errors: ErrorList): void {
  const sides = [
    [row.start[0], row.mapWidth, F.startX, 'start_x', 'map_width'],
    [row.start[1], row.mapHeight, F.startY, 'start_y', 'map_height'],
    [row.goal[0], row.mapWidth, F.goalX, 'goal_x', 'map_width'],
    [row.goal[1], row.mapHeight, F.goalY, 'goal_y', 'map_height'],
  ] as const;
  for (const [value, limit, field, name, sideName] of sides) {
    if (value >= limit) errors.add(row.line, row.fieldColumns[field], `${name} ${value} is outside the map (${sideName} ${limit})`);
  }
}
