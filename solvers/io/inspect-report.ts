/**
 * What `npm run inspect` prints for one file, computed from texts only (the CLI does the
 * reading). The shape is a stable contract:
 * `{ file, kind: "map"|"scenario", ok, width, height, passable (maps) | rows (scenarios), errors }`.
 */
import { countPassable, type GridMap } from './grid-map';
import { parseMap } from './parse-map';
import { formatParseError, type ParseError } from './parse-result';
import { parseScenario } from './parse-scenario';
import { splitFields, splitLines } from './text-lines';

/** The report of one map file. */
export interface MapReport {
  readonly file: string;
  readonly kind: 'map';
  readonly ok: boolean;
  readonly width: number | null;
  readonly height: number | null;
  readonly passable: number | null;
  readonly errors: readonly ParseError[];
}

/** The report of one scenario file; width and height are its map's. */
export interface ScenarioReport {
  readonly file: string;
  readonly kind: 'scenario';
  readonly ok: boolean;
  readonly width: number | null;
  readonly height: number | null;
  readonly rows: number | null;
  readonly errors: readonly ParseError[];
}

/** One entry of the inspect output. */
export type InspectReport = MapReport | ScenarioReport;

/** A scenario's map as the caller found it: parsed, or why not. */
export type MapLookup = { readonly map: GridMap } | { readonly problem: string };

/** Inspects a map file's text. */
export function inspectMap(file: string, text: string): MapReport {
  const result = parseMap(text);
  if (!result.ok) return { file, kind: 'map', ok: false, width: null, height: null, passable: null, errors: result.errors };
  const { width, height } = result.value;
  return { file, kind: 'map', ok: true, width, height, passable: countPassable(result.value), errors: [] };
}

/**
 * Inspects a scenario file's text. `findMap` is asked for the map named in the first row's
 * map_file column; a map that is missing or does not parse is an error of the scenario,
 * reported at that column.
 */
export function inspectScenario(file: string, text: string, findMap: (mapFile: string) => MapLookup): ScenarioReport {
  const lines = splitLines(text);
  const rows = Math.max(0, lines.length - 1);
  const firstRow = lines.length > 1 ? splitFields(lines[1]) : [];
  const mapField = firstRow[1];
  if (!mapField) {
    const parsed = parseScenario(text);
    const errors = parsed.ok ? [{ line: 2, column: 1, message: 'no map_file in the first row' }] : parsed.errors;
    return { file, kind: 'scenario', ok: false, width: null, height: null, rows, errors };
  }
  const found = findMap(mapField.text);
  if ('problem' in found) {
    const problem = { line: 2, column: mapField.column, message: `map_file '${mapField.text}' ${found.problem}` };
    const parsed = parseScenario(text);
    const errors = parsed.ok ? [problem] : [problem, ...parsed.errors];
    return { file, kind: 'scenario', ok: false, width: null, height: null, rows, errors };
  }
  const { map } = found;
  const parsed = parseScenario(text, { map });
  const errors = parsed.ok ? [] : parsed.errors;
  return { file, kind: 'scenario', ok: parsed.ok, width: map.width, height: map.height, rows, errors };
}

/** The MapLookup of a map file's text (or of a read failure). */
export function lookupMap(text: string | undefined, readProblem?: string): MapLookup {
  if (text === undefined) return { problem: readProblem ?? 'was not found beside the scenario' };
  const result = parseMap(text);
  if (result.ok) return { map: result.value };
  const n = result.errors.length;
  return { problem: `does not parse (${n} error${n === 1 ? '' : 's'}; first: ${formatParseError(result.errors[0])})` };
}

/** Whether a file should be read as a scenario: by extension, else by a first line starting with `version`. */
export function isScenarioFile(file: string, text: string): boolean {
  if (/\.scen$/i.test(file)) return true;
  if (/\.map$/i.test(file)) return false;
  return /^(\uFEFF)?version[ \t]/.test(text);
}
