/**
 * Reads the map and scenario files `solve` and `execute` are given and builds the instance of
 * the first N scenario rows. Every problem is an InputError naming the file (and line and column
 * for a parse error), worded the same in both CLIs.
 */
import { readFileSync } from 'node:fs';
import type { MapfInstance } from '../instance';
import { instanceFromScenario } from '../io/instance-from-scenario';
import { parseMap } from '../io/parse-map';
import { formatParseError } from '../io/parse-result';
import { parseScenario } from '../io/parse-scenario';

/** A missing, unreadable or malformed input file (each CLI documents its exit code for it). */
export class InputError extends Error {}

function readText(path: string, what: string): string {
  try {
    return readFileSync(path, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new InputError(`${path}: the ${what} file ${code === 'ENOENT' ? 'does not exist' : `cannot be read (${code ?? String(error)})`}`);
  }
}

/** The instance of the first `agents` rows of the scenario on the map. */
export function loadInstance(mapFile: string, scenFile: string, agents: number): MapfInstance {
  const map = parseMap(readText(mapFile, 'map'));
  if (!map.ok) throw new InputError(map.errors.map((e) => formatParseError(e, mapFile)).join('\n'));
  const scen = parseScenario(readText(scenFile, 'scenario'));
  if (!scen.ok) throw new InputError(scen.errors.map((e) => formatParseError(e, scenFile)).join('\n'));
  const instance = instanceFromScenario(map.value, scen.value, agents);
  if (!instance.ok) throw new InputError(instance.errors.map((e) => formatParseError(e, scenFile)).join('\n'));
  return instance.value;
}
