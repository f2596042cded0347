/**
 * Builds the Angular app when its output is missing or older than its sources, so `npm start`
 * and `npm test` always serve the current UI without rebuilding needlessly. Synchronous on
 * purpose: callers run it before anything else starts.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import { join, resolve } from 'node:path';

/** What ensureWebBuild did. */
export type WebBuildOutcome = 'built' | 'fresh' | 'skipped-no-angular-json';

/** Options of ensureWebBuild; paths are relative to `root`. */
export interface WebBuildOptions {
  /** Repository root (default: the parent of scripts/). */
  readonly root?: string;
  /** Folder whose index.html marks a finished build (default dist/web/browser). */
  readonly webDist?: string;
  readonly log?: (msg: string) => void;
  /** Runs the build; default `npx ng build` in root. Returns the exit status. */
  readonly build?: (root: string) => number | null;
}

/** Folders and files whose changes make the build stale. */
export const WEB_SOURCES = ['web', 'shared', 'angular.json'] as const;
const SKIPPED_DIRS = new Set(['node_modules', '.angular', 'dist', '.git']);

/** Newest modification time (ms) of any file under `path`, or 0 when it does not exist. */
export function newestMtime(path: string): number {
  if (!existsSync(path)) return 0;
  const st = statSync(path);
  if (!st.isDirectory()) return st.mtimeMs;
  let newest = 0;
  for (const entry of readdirSync(path, { withFileTypes: true })) {
    if (entry.isDirectory() && SKIPPED_DIRS.has(entry.name)) continue;
    newest = Math.max(newest, newestMtime(join(path, entry.name)));
  }
  return newest;
}

/** Whether the build in `webDist` is missing or older than any web source. */
export function isWebBuildStale(root: string, webDist: string): boolean {
  const index = join(resolve(root, webDist), 'index.html');
  if (!existsSync(index)) return true;
  const built = statSync(index).mtimeMs;
  return WEB_SOURCES.some((p) => newestMtime(join(root, p)) > built);
}

function ngBuild(root: string): number | null {
  return spawnSync('npx', ['ng', 'build'], { cwd: root, stdio: 'inherit', env: { ...process.env, NG_CLI_ANALYTICS: 'false' } }).status;
}

/** Runs `ng build` when the web build is stale; throws when the build fails. */
export function ensureWebBuild(options: WebBuildOptions = {}): WebBuildOutcome {
  const root = options.root ?? resolve(__dirname, '..');
  const webDist = options.webDist ?? 'dist/web/browser';
  const log = options.log ?? ((msg: string) => console.log(msg));
  if (!existsSync(join(root, 'angular.json'))) {
    log('web build: no angular.json yet, skipping the web app build');
    return 'skipped-no-angular-json';
  }
  if (!isWebBuildStale(root, webDist)) return 'fresh';
  log('web build: sources changed since the last build, running "ng build"…');
  const status = (options.build ?? ngBuild)(root);
  if (status !== 0) throw new Error(`web build: "ng build" failed (exit ${status}); fix the web app or see the output above`);
  if (!existsSync(join(resolve(root, webDist), 'index.html'))) {
    throw new Error(`web build: "ng build" succeeded but ${join(webDist, 'index.html')} is missing; check outputPath in angular.json`);
  }
  return 'built';
}
