/** WORKER_SOLVERS of `npm run worker` and of the embedded worker. */
import { EXAMPLE_SOLVER } from '@shared/external-solvers';
import { loadConfig } from '../config';
import { commandSha256 } from '../external-solvers/command-hash';
import { loadWorkerConfig, parseWorkerSolvers } from './worker-config';

const DB = 'postgres://u@127.0.0.1:5432/db';
const HASH = 'ab'.repeat(32);

describe('WORKER_SOLVERS', () => {
  it('reads a comma list of name@version=sha256:<hex>, spaces and empty entries ignored, a prefix of 16 or more hex digits allowed', () => {
    expect(parseWorkerSolvers(` prioritised-astar@1.0.0=sha256:${HASH}, lacam@3+fix=sha256:0123456789ABCDEF ,,`)).toEqual({
      ok: true, solvers: [{ name: 'prioritised-astar', version: '1.0.0', commandSha256: HASH }, { name: 'lacam', version: '3+fix', commandSha256: '0123456789abcdef' }],
    });
    expect(parseWorkerSolvers('')).toEqual({ ok: true, solvers: [] });
    expect(parseWorkerSolvers(undefined)).toEqual({ ok: true, solvers: [] });
  });

  it('refuses entries that are not name@version and repeats, naming them', () => {
    expect(parseWorkerSolvers('lacam')).toEqual({ ok: false, message: expect.stringContaining('"lacam" is not name@version') });
    expect(parseWorkerSolvers(`a@1=sha256:${HASH},a@1=sha256:${HASH}`)).toEqual({ ok: false, message: 'a@1 is listed twice' });
    expect(() => loadWorkerConfig({ DATABASE_URL: DB, WORKER_SOLVERS: `x@1=sha256:${HASH},bad name@2=sha256:${HASH}` })).toThrow(/WORKER_SOLVERS/);
  });

  it('refuses an entry that pins no command hash, a short prefix or one that is not hex', () => {
    for (const entry of ['lacam@3', 'lacam@3=', `lacam@3=${HASH}`, 'lacam@3=sha256:0123456789abcde', `lacam@3=sha256:${'g'.repeat(16)}`, `lacam@3=sha256:${HASH}0`]) {
      expect(parseWorkerSolvers(entry)).toEqual({ ok: false, message: expect.stringContaining('must pin the approved command as lacam@3=sha256:<hex>') });
    }
  });

  it('gives a stand-alone worker none by default and the embedded worker the shipped example (empty = none)', () => {
    expect(loadWorkerConfig({ DATABASE_URL: DB }).solvers).toEqual([]);
    expect(loadWorkerConfig({ DATABASE_URL: DB, WORKER_SOLVERS: `lacam@3=sha256:${HASH}` }).solvers).toEqual([{ name: 'lacam', version: '3', commandSha256: HASH }]);
    // The embedded default approves exactly the shipped example's command.
    expect(loadConfig({}).config.workerSolvers).toEqual([{ name: 'prioritised-astar', version: '1.0.0', commandSha256: commandSha256(EXAMPLE_SOLVER.command) }]);
    expect(commandSha256(EXAMPLE_SOLVER.command)).toMatch(/^[0-9a-f]{64}$/);
    expect(loadConfig({ WORKER_SOLVERS: '' }).config.workerSolvers).toEqual([]);
  });
});
