/**
 * Reader for the grid map text format of the MAPF and pathfinding literature (N. Sturtevant,
 * "Benchmarks for Grid-Based Pathfinding", IEEE TCIAIG 4(2), 2012):
 *
 *   type octile
 *   height H
 *   width W
 *   map
 *   H rows of W terrain characters
 *
 * See README.md in this folder for what is accepted beyond that and what is rejected.
 */
import type { GridMap } from './grid-map';
import { TERRAIN_CHARS, terrainOf } from './map-terrain';
import { describeChar, ErrorList, type ParseResult } from './parse-result';
import { splitLines } from './text-lines';

/** The largest width or height accepted; larger values are almost surely a typo and would exhaust memory. */
export const MAX_MAP_SIDE = 8192;

/** Options of parseMap. */
export interface ParseMapOptions {
  /** Name to give the map (the format carries none), e.g. the file name without `.map`. */
  readonly name?: string;
}

const EXPECTED_CHARS = `expected one of ${TERRAIN_CHARS.join(' ')}`;

/** Parses a map file's text; collects every error (up to MAX_PARSE_ERRORS) with its line and column. */
export function parseMap(text: string, options: ParseMapOptions = {}): ParseResult<GridMap> {
  const errors = new ErrorList();
  const lines = splitLines(text);
  const header = readHeader(lines, errors);
  if (header.mapLine < 0 || header.width === undefined || header.height === undefined || header.type === undefined) {
    return { ok: false, errors: errors.toArray() };
  }
  const { width, height, type } = header;
  const passable = new Uint8Array(width * height);
  const cellsText: string[] = [];
  for (let y = 0; y < height && !errors.isFull; y++) {
    const lineNo = header.mapLine + 2 + y;
    const line = lines[header.mapLine + 1 + y];
    if (line === undefined) {
      errors.add(lineNo, 1, `expected ${height} map rows after 'map', found ${y}`);
      break;
    }
    cellsText.push(line);
    readRow(line, lineNo, y, width, passable, errors);
  }
  const extra = header.mapLine + 1 + height;
  if (extra < lines.length && !errors.isFull) {
    errors.add(extra + 1, 1, `unexpected text after the ${height} map ${height === 1 ? 'row' : 'rows'} (height ${height})`);
  }
  if (errors.hasErrors) return { ok: false, errors: errors.toArray() };
  const map: GridMap = { type, width, height, grid: { width, height, passable }, cellsText };
  return { ok: true, value: options.name === undefined ? map : { name: options.name, ...map } };
}

interface Header {
  type?: string;
  width?: number;
  height?: number;
  /** 0-based index of the `map` line, -1 when missing. */
  mapLine: number;
}

function readHeader(lines: readonly string[], errors: ErrorList): Header {
  const header: Header = { mapLine: -1 };
  let stopAt = lines.length;
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i];
    if (line === 'map') {
      header.mapLine = i;
      break;
    }
    const match = /^([^ \t]+)[ \t]+([^ \t]+)$/.exec(line);
    const key = match?.[1];
    if (!match || (key !== 'type' && key !== 'height' && key !== 'width')) {
      // A line of terrain characters means the map rows began without a 'map' line: stop there.
      if (line !== '' && [...line].every((ch) => terrainOf(ch) >= 0)) {
        stopAt = i;
        break;
      }
      const shown = line === '' ? 'a blank line' : `'${line.length > 40 ? `${line.slice(0, 40)}…` : line}'`;
      errors.add(i + 1, 1, `expected a header line 'type <word>', 'height <H>', 'width <W>' or 'map', found ${shown}`);
      continue;
    }
    const value = match[2];
    const valueColumn = line.length - value.length + 1;
    if (header[key] !== undefined) {
      errors.add(i + 1, 1, `duplicate '${key}' header`);
      continue;
    }
    if (key === 'type') {
      header.type = value;
      continue;
    }
    const side = /^[0-9]+$/.test(value) ? Number(value) : NaN;
    if (!(side >= 1 && side <= MAX_MAP_SIDE)) {
      errors.add(i + 1, valueColumn, `${key} '${value}' is not a whole number from 1 to ${MAX_MAP_SIDE}`);
      continue;
    }
    header[key] = side;
  }
  const at = header.mapLine >= 0 ? header.mapLine + 1 : stopAt + 1;
  if (header.mapLine < 0) errors.add(at, 1, `missing 'map' line between the header and the map rows`);
  for (const key of ['type', 'height', 'width'] as const) {
    if (header[key] === undefined && !lines.some((l) => l.startsWith(`${key} `) || l.startsWith(`${key}\t`))) {
      errors.add(at, 1, `missing '${key}' header before 'map'`);
    }
  }
  return header;
}

function readRow(line: string, lineNo: number, y: number, width: number, passable: Uint8Array, errors: ErrorList): void {
  const chars = Array.from(line);
  const n = Math.min(chars.length, width);
  for (let x = 0; x < n; x++) {
    const terrain = terrainOf(chars[x]);
    if (terrain < 0) {
      if (!errors.add(lineNo, x + 1, `unexpected character ${describeChar(chars[x])} (${EXPECTED_CHARS})`)) return;
    } else {
      passable[y * width + x] = terrain;
    }
  }
  if (chars.length !== width) {
    // The location is the line (1-based); a row index here would be 0-based and read as another line.
    errors.add(lineNo, n + 1, `this map row has ${chars.length} ${chars.length === 1 ? 'cell' : 'cells'}, expected ${width} (the width)`);
  }
}
