/**
 * The guard in a real child process: a rejected promise with no handler that looks like a lost
 * connection leaves the process running; any other one still ends it with an error, as Node's
 * default does.
 */
import { spawnSync } from 'node:child_process';
import { resolve } from 'node:path';

const ROOT = resolve(__dirname, '../../..');

/** Runs a tiny script that installs the guard, rejects `error` unhandled, then exits 0 after 300 ms. */
function runWithRejection(errorExpression: string) {
  const script = `
    const { surviveLostConnections } = require('./api/src/lifecycle/survive-lost-connections');
    surviveLostConnections({ warn: (o, m) => console.log('warned: ' + m + ' / ' + o.err) });
    Promise.reject(${errorExpression});
    setTimeout(() => { console.log('still alive'); process.exit(0); }, 300);
  `;
  return spawnSync(process.execPath, ['--require', 'tsx/cjs', '-e', script], { cwd: ROOT, encoding: 'utf8', timeout: 30_000 });
}

describe('surviveLostConnections', () => {
  it('logs a lost connection and keeps the process running', () => {
    // The message pg gives when PostgreSQL ends a session during a fast shutdown.
    const run = runWithRejection("Object.assign(new Error('terminating connection due to administrator command'), { code: '57P01' })");
    expect(run.stdout).toContain('warned: database connection lost in a background step (will recover) / terminating connection');
    expect(run.stdout).toContain('still alive');
    expect(run.status).toBe(0);
  });

  it('still ends the process on any other unhandled rejection', () => {
    const run = runWithRejection("new Error('column \"sooc\" does not exist')");
    expect(run.stdout).not.toContain('still alive');
    expect(run.stderr).toContain('column "sooc" does not exist');
    expect(run.status).not.toBe(0);
  });
});
