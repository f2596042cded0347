/**
 * Runs the seeded generators of solvers/generate for POST /api/instance-sets/generate and
 * returns their output as upload entries, so generated files go through exactly the checks
 * and storage of uploaded ones. The same request always gives the same bytes.
 */
import { GenerateInstancesRequest, UPLOAD_LIMITS } from '@shared/instance-sets';
import type { z } from 'zod';
import { generateMap } from '@solvers/generate/generate-map';
import { generateScenario } from '@solvers/generate/random-scenario';
import { AppError } from '../errors/app-error';
import type { UploadEntry } from './upload-entry';

/** A parsed generate request. */
export type GenerateRequest = z.output<typeof GenerateInstancesRequest>;

/**
 * Cell visits allowed for one scenario's searches (one full octile search per tried start).
 * A request waits for its generation (in the server's interactive pool thread), so large maps
 * get fewer tried starts and hence fewer rows; 4·10⁶ keeps one scenario well under a second
 * here (measured: 32 × 32 at 2000 starts ≈ 0.1 s).
 */
const SEARCH_BUDGET_CELLS = 4_000_000;

/** The map's file name, then one scenario per requested count, seeded `seed + i + 1`. */
export function generateEntries(request: GenerateRequest): UploadEntry[] {
  let generated;
  try {
    generated = generateMap({ ...request.map, seed: request.seed });
  } catch (err) {
    if (err instanceof RangeError) throw new AppError('VALIDATION_FAILED', 400, `The generator refused its parameters: ${err.message}`);
    throw err;
  }
  const { map, text } = generated;
  if (map.width > UPLOAD_LIMITS.maxMapSide || map.height > UPLOAD_LIMITS.maxMapSide) {
    throw new AppError('VALIDATION_FAILED', 400,
      `The generated map would be ${map.width} × ${map.height}; at most ${UPLOAD_LIMITS.maxMapSide} cells a side are stored.`);
  }
  const mapName = request.name ? (request.name.endsWith('.map') ? request.name : `${request.name}.map`) : `${map.name ?? 'generated'}.map`;
  const stem = mapName.replace(/\.map$/, '');
  const entries: UploadEntry[] = [{ name: mapName, label: mapName, bytes: Buffer.from(text, 'utf8') }];
  const maxSearches = Math.max(1, Math.min(2000, Math.floor(SEARCH_BUDGET_CELLS / (map.width * map.height))));
  for (let i = 0; i < request.scenarioCount; i++) {
    const scenario = generateScenario(map, {
      seed: (request.seed + i + 1) >>> 0,
      mapFile: mapName,
      mode: request.scenarioMode,
      perBucket: request.rowsPerBucket,
      count: request.rowCount,
      maxSearches,
    });
    if (scenario.rows.length === 0) {
      throw new AppError('VALIDATION_FAILED', 400, `The map ${mapName} has too few connected free cells to draw scenario rows.`);
    }
    const name = `${stem}-${request.scenarioMode}-${i + 1}.scen`;
    entries.push({ name, label: name, bytes: Buffer.from(scenario.text, 'utf8') });
  }
  return entries;
}
