/**
 * Parses and cross-checks the entries of one upload before anything is stored: every map and
 * scenario is read with solvers/io (every error with its line and column), names must be new
 * to the set and unique in the upload, maps may be at most UPLOAD_LIMITS.maxMapSide a side,
 * and each scenario must name a map of the set or of the same upload and fit that map.
 */
import { createHash } from 'node:crypto';
import { UPLOAD_LIMITS, type UploadProblem } from '@shared/instance-sets';
import { countPassable, type GridMap } from '@solvers/io/grid-map';
import { largestAgentCount } from '@solvers/io/instance-from-scenario';
import { parseMap } from '@solvers/io/parse-map';
import { parseScenario } from '@solvers/io/parse-scenario';
import type { ParseError } from '@solvers/io/parse-result';
import type { Scenario } from '@solvers/io/scenario';
import { splitLines } from '@solvers/io/text-lines';
import { baseName, decodeText, entryKind, type UploadEntry } from './upload-entry';

/** A map ready to store. */
export interface CheckedMap {
  readonly name: string;
  readonly map: GridMap;
  readonly bytes: Buffer;
  readonly checksum: string;
  readonly passableCount: number;
}

/** A scenario ready to store, with the name of its map (in the set or in this upload). */
export interface CheckedScenario {
  readonly name: string;
  readonly mapName: string;
  readonly scenario: Scenario;
  readonly bytes: Buffer;
  readonly checksum: string;
  readonly maxAgents: number;
}

/** What the set already holds, as far as the checks need it. */
export interface ExistingFiles {
  readonly mapNames: ReadonlySet<string>;
  readonly scenarioNames: ReadonlySet<string>;
  /** Parsed maps of the set that scenarios of this upload refer to (see scenarioMapNames). */
  readonly maps: ReadonlyMap<string, GridMap>;
}

/** The outcome: everything to store, or the problems (when any, nothing may be stored). */
export interface CheckedUpload {
  readonly maps: readonly CheckedMap[];
  readonly scenarios: readonly CheckedScenario[];
  readonly problems: readonly UploadProblem[];
}

/** sha256 of bytes, lower-case hex. */
export function sha256(bytes: Buffer): string {
  return createHash('sha256').update(bytes).digest('hex');
}

/** The map a scenario row names, by base name (`maps/x.map` and `x.map` name the same map). */
export function mapNameOf(mapFile: string): string {
  return baseName(mapFile.replace(/\\/g, '/'));
}

/**
 * The map names the scenarios of an upload refer to, read from their first row only (cheap,
 * so the caller can load just those maps of the set before checkUpload).
 */
export function scenarioMapNames(entries: readonly UploadEntry[]): string[] {
  const names = new Set<string>();
  for (const e of entries) {
    if (entryKind(e.name) !== 'scenario') continue;
    const head = e.bytes.subarray(0, 4096).toString('latin1').split('\n');
    const field = head[1]?.trim().split(/[ \t]+/)[1];
    if (field) names.add(mapNameOf(field));
  }
  return [...names];
}

/** Checks every entry; see the file comment for the rules. */
export function checkUpload(entries: readonly UploadEntry[], existing: ExistingFiles): CheckedUpload {
  const problems: UploadProblem[] = [];
  const maps: CheckedMap[] = [];
  const pending: { entry: UploadEntry; text: string }[] = [];
  const seen = new Map<string, string>();
  /** Maps of this upload by name; null when the map had errors. */
  const uploadedMaps = new Map<string, GridMap | null>();

  for (const entry of entries) {
    const kind = entryKind(entry.name);
    const other = seen.get(entry.name);
    if (other !== undefined) {
      problems.push({ file: entry.label, line: 0, column: 0, message: `the upload holds two files named '${entry.name}' (also ${other})` });
      continue;
    }
    seen.set(entry.name, entry.label);
    const inSet = kind === 'map' ? existing.mapNames : existing.scenarioNames;
    if (inSet.has(entry.name)) {
      problems.push({ file: entry.label, line: 0, column: 0, message: `the set already holds a ${kind} named '${entry.name}'; rename the file or delete the stored one` });
      continue;
    }
    if (entry.bytes.length > UPLOAD_LIMITS.maxFileBytes) {
      problems.push({ file: entry.label, line: 0, column: 0, message: `the file is ${entry.bytes.length} bytes; at most ${UPLOAD_LIMITS.maxFileBytes} are accepted` });
      continue;
    }
    const decoded = decodeText(entry);
    if ('problem' in decoded) {
      problems.push(decoded.problem);
      if (kind === 'map') uploadedMaps.set(entry.name, null);
      continue;
    }
    if (kind === 'scenario') {
      pending.push({ entry, text: decoded.text });
      continue;
    }
    const map = readMap(entry, decoded.text, problems);
    uploadedMaps.set(entry.name, map ?? null);
    if (map) maps.push({ name: entry.name, map, bytes: entry.bytes, checksum: sha256(entry.bytes), passableCount: countPassable(map) });
  }

  const scenarios: CheckedScenario[] = [];
  for (const { entry, text } of pending) {
    const checked = readScenario(entry, text, uploadedMaps, existing, problems);
    if (checked) scenarios.push(checked);
  }
  return { maps, scenarios, problems };
}

function report(entry: UploadEntry, errors: readonly ParseError[], problems: UploadProblem[]): void {
  for (const e of errors) problems.push({ file: entry.label, line: e.line, column: e.column, message: e.message });
}

/** Refuses an oversized header before parsing, so a declared 8192 × 8192 map never gets allocated. */
function readMap(entry: UploadEntry, text: string, problems: UploadProblem[]): GridMap | undefined {
  const lines = splitLines(text);
  let isTooBig = false;
  for (let i = 0; i < Math.min(lines.length, 8) && lines[i] !== 'map'; i++) {
    const m = /^(width|height)[ \t]+([0-9]+)$/.exec(lines[i]);
    if (m && Number(m[2]) > UPLOAD_LIMITS.maxMapSide) {
      problems.push({
        file: entry.label, line: i + 1, column: lines[i].length - m[2].length + 1,
        message: `${m[1]} ${m[2]} is over the limit of ${UPLOAD_LIMITS.maxMapSide} cells a side`,
      });
      isTooBig = true;
    }
  }
  if (isTooBig) return undefined;
  const parsed = parseMap(text, { name: entry.name });
  if (!parsed.ok) {
    report(entry, parsed.errors, problems);
    return undefined;
  }
  return parsed.value;
}

function readScenario(
  entry: UploadEntry, text: string, uploadedMaps: ReadonlyMap<string, GridMap | null>,
  existing: ExistingFiles, problems: UploadProblem[],
): CheckedScenario | undefined {
  const loose = parseScenario(text);
  if (!loose.ok) {
    report(entry, loose.errors, problems);
    return undefined;
  }
  const first = loose.value.rows[0];
  const mapName = mapNameOf(first.mapFile);
  const at = { file: entry.label, line: first.line, column: first.fieldColumns[1] };
  const uploaded = uploadedMaps.get(mapName);
  if (uploaded === null) {
    problems.push({ ...at, message: `its map '${mapName}' has errors (listed under that file), so the rows were not checked against it` });
    return undefined;
  }
  const map = uploaded ?? existing.maps.get(mapName);
  if (!map) {
    problems.push({ ...at, message: `map_file '${first.mapFile}' names no map of this set or of this upload; upload '${mapName}' with it` });
    return undefined;
  }
  const strict = parseScenario(text, { map });
  if (!strict.ok) {
    report(entry, strict.errors, problems);
    return undefined;
  }
  return {
    name: entry.name, mapName, scenario: strict.value, bytes: entry.bytes, checksum: sha256(entry.bytes),
    maxAgents: largestAgentCount(strict.value),
  };
}
