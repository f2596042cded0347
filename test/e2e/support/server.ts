/**
 * Boots the real Quarterturn server for an end-to-end test: the current web build, a fresh
 * migrated test database, the API on a free loopback port and the local fake OAuth provider.
 */
import { spawnSync } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { resolve } from 'node:path';
import { startServer } from '../../../api/src/app';
import { loadConfig } from '../../../api/src/config';
import { ensureWebBuild } from '../../../scripts/web-build';
import { createTestDatabase } from '../../support/test-database';

/** Options of bootServer. */
export interface BootOptions {
  /** Logins that become admin on first sign-in (ADMIN_LOGINS). */
  readonly adminLogins?: readonly string[];
}

/** A running server; close() stops it and drops its database. */
export interface E2eServer {
  /** Base URL of the app, e.g. http://127.0.0.1:41234 (no trailing slash). */
  readonly url: string;
  /** Base URL of the fake OAuth provider. */
  readonly fakeOAuthUrl: string;
  close(): Promise<void>;
}

const REPO_ROOT = resolve(__dirname, '../../..');

/** `ng build` with its progress output kept out of the test report unless it fails. */
function quietNgBuild(root: string): number | null {
  const run = spawnSync('npx', ['ng', 'build'], { cwd: root, encoding: 'utf8', env: { ...process.env, NG_CLI_ANALYTICS: 'false' } });
  if (run.status !== 0) process.stderr.write(`${run.stdout}\n${run.stderr}`);
  return run.status;
}

/** Builds the web app if stale, then starts server + fake provider against a new database. */
export async function bootServer(options: BootOptions = {}): Promise<E2eServer> {
  const webDist = resolve(REPO_ROOT, 'dist/web/browser');
  ensureWebBuild({ root: REPO_ROOT, webDist, log: () => undefined, build: quietNgBuild });
  const db = await createTestDatabase();
  try {
    const { config } = loadConfig({
      LOG_LEVEL: 'silent',
      WEB_DIST: webDist,
      ADMIN_LOGINS: (options.adminLogins ?? []).join(','),
      SESSION_SECRET: randomBytes(24).toString('hex'),
    });
    const server = await startServer({ config, databaseUrl: db.url, port: 0, fakeOAuthPort: 0 });
    if (!server.fakeOAuthUrl) throw new Error('bootServer: expected the fake OAuth provider to run (no GitHub client configured)');
    return {
      url: server.url,
      fakeOAuthUrl: server.fakeOAuthUrl,
      async close() {
        await server.close();
        await db.drop();
      },
    };
  } catch (err) {
    await db.drop();
    throw err;
  }
}
