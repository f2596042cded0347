/**
 * Where the repository's copy of the open grid benchmark files lives (benchmarks/datasets/grid-benchmarks/,
 * unchanged from N. Sturtevant, IEEE TCIAIG 4(2), 2012 and R. Stern et al., SoCS 2019; see the README there).
 * Tests, benchmarks, CLI examples and the demo seed all read the files through this module, so a clone in any
 * folder finds them, and a missing file fails loudly instead of skipping a check.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';

export const OPEN_GRID_BENCHMARKS_DIR = join(__dirname, 'grid-benchmarks');

/** Absolute path of one benchmark file (`empty-8-8.map`, `room-32-32-4-even-1.scen`); throws when it is missing. */
export function openBenchmarkPath(fileName: string): string {
  const path = join(OPEN_GRID_BENCHMARKS_DIR, fileName);
  if (!existsSync(path)) {
    throw new Error(`open grid benchmark file missing: ${path} (the repository ships it; see benchmarks/datasets/grid-benchmarks/README.md)`);
  }
  return path;
}

/** One benchmark file's text. */
export function readOpenBenchmark(fileName: string): string {
  return readFileSync(openBenchmarkPath(fileName), 'utf8');
}
