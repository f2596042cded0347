/**
 * `npm run -s inspect -- FILE...`: reads map and scenario files (a scenario's map is looked up
 * beside it) and prints one JSON array with one report per file on stdout; exit code 0 when
 * every file is ok, 1 otherwise, 2 on a usage error. The report shape is documented in
 * solvers/io/inspect-report.ts and must stay stable.
 */
import { readFileSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import {
  inspectMap, inspectScenario, isScenarioFile, lookupMap, type InspectReport, type MapLookup,
} from '../io/inspect-report';

function readText(path: string): { text: string } | { problem: string } {
  try {
    return { text: readFileSync(path, 'utf8') };
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    return { problem: code === 'ENOENT' ? 'does not exist' : `cannot be read (${code ?? String(error)})` };
  }
}

function inspectFile(file: string, mapCache: Map<string, MapLookup>): InspectReport {
  const read = readText(file);
  const isScenario = isScenarioFile(file, 'text' in read ? read.text : '');
  if ('problem' in read) {
    const errors = [{ line: 0, column: 0, message: `the file ${read.problem}` }];
    return isScenario
      ? { file, kind: 'scenario', ok: false, width: null, height: null, rows: null, errors }
      : { file, kind: 'map', ok: false, width: null, height: null, passable: null, errors };
  }
  if (!isScenario) return inspectMap(file, read.text);
  return inspectScenario(file, read.text, (mapFile) => {
    // Beside the scenario under the name it gives, else under its last path segment.
    const candidates = [...new Set([join(dirname(file), mapFile), join(dirname(file), basename(mapFile))])];
    for (const path of candidates) {
      const cached = mapCache.get(path);
      if (cached) return cached;
      const mapRead = readText(path);
      if ('text' in mapRead) {
        const lookup = lookupMap(mapRead.text);
        mapCache.set(path, lookup);
        return lookup;
      }
    }
    return lookupMap(undefined, `was not found beside the scenario (looked for ${candidates.join(', ')})`);
  });
}

function main(files: readonly string[]): number {
  if (files.length === 0) {
    process.stderr.write('usage: npm run -s inspect -- FILE...  (map and scenario files)\n');
    return 2;
  }
  const mapCache = new Map<string, MapLookup>();
  const reports = files.map((file) => inspectFile(file, mapCache));
  process.stdout.write(`${JSON.stringify(reports, null, 2)}\n`);
  return reports.every((r) => r.ok) ? 0 : 1;
}

process.exitCode = main(process.argv.slice(2));
