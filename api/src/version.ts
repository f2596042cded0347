/** The package version, read once from the root package.json, and the git commit. */
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';

/** The `version` field of the root package.json. */
export const APP_VERSION: string = (JSON.parse(readFileSync(join(__dirname, '..', '..', 'package.json'), 'utf8')) as { version: string }).version;

let commit: string | undefined;

/**
 * The git commit of the running hub (`git rev-parse HEAD` in the repository root, read once on
 * first use), or 'unknown' outside a git checkout. Exports name it in their provenance.
 */
export function appCommit(): string {
  if (commit === undefined) {
    try {
      commit = execFileSync('git', ['rev-parse', 'HEAD'], { cwd: join(__dirname, '..', '..'), stdio: ['ignore', 'pipe', 'ignore'], timeout: 5000 }).toString().trim() || 'unknown';
    } catch {
      commit = 'unknown';
    }
  }
  return commit;
}
