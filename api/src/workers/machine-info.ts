/** Provenance recorded with every result: solver version and commit, Node, CPU, threads. */
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { cpus } from 'node:os';
import { join } from 'node:path';
import type { SolverBuild } from '@shared/runs';

const ROOT = join(__dirname, '../../..');

/** Reads the build once (call at worker start): package version, `git rev-parse HEAD` or 'unknown'. */
export function readSolverBuild(threads: number): SolverBuild {
  let version = 'unknown';
  try {
    version = (JSON.parse(readFileSync(join(ROOT, 'package.json'), 'utf8')) as { version?: string }).version ?? 'unknown';
  } catch {
    // a worker deployed without package.json still runs
  }
  let commit = 'unknown';
  try {
    commit = execFileSync('git', ['rev-parse', 'HEAD'], { cwd: ROOT, stdio: ['ignore', 'pipe', 'ignore'], timeout: 5000 }).toString().trim() || 'unknown';
  } catch {
    // not a git checkout
  }
  return { version, commit, node: process.version, cpuModel: cpus()[0]?.model?.trim() || 'unknown', threads };
}

/** The default thread count: cores − 1, at least 1 (one core stays for the event loop and PostgreSQL). */
export function defaultThreadCount(): number {
  return Math.max(1, cpus().length - 1);
}
