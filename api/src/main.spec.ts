import { spawnSync } from 'node:child_process';
import { join } from 'node:path';

const ROOT = join(__dirname, '..', '..');

/** Runs an entry point the way `npm start` / production would (tsx as an import hook), with only `env` set. */
function runEntry(entry: string, env: Record<string, string>) {
  return spawnSync(process.execPath, ['--import', 'tsx', join(ROOT, entry)], {
    cwd: ROOT,
    // PATH and HOME only: nothing from the developer's shell (DATABASE_URL, GITHUB_*) may leak in.
    env: { PATH: process.env.PATH ?? '', HOME: process.env.HOME ?? '', ...env },
    encoding: 'utf8',
    timeout: 30_000,
  });
}

describe('api/src/main.ts', () => {
  it('refuses to start on a wildcard HOST with the fake sign-in and the development secret: one line per problem, exit 1', () => {
    // A database URL that is never reached: the configuration check must stop the process first.
    const out = runEntry('api/src/main.ts', { HOST: '0.0.0.0', DATABASE_URL: 'postgres://nobody@127.0.0.1:1/none', LOG_LEVEL: 'silent' });
    expect(out.status).toBe(1);
    const lines = out.stderr.trim().split('\n').map((l) => l.trim());
    expect(lines).toEqual([
      'Invalid configuration:',
      expect.stringMatching(/^HOST: 0\.0\.0\.0 is not a loopback address.*GITHUB_CLIENT_ID/),
      expect.stringMatching(/^SESSION_SECRET: required when HOST \(0\.0\.0\.0\) is not a loopback address/),
    ]);
  });
});
