/** WORKER_SOLVERS of `npm run worker` and of the embedded worker. */
import { loadConfig } from '../config';
import { loadWorkerConfig, parseWorkerSolvers } from './worker-config';

const DB = 'postgres://u@127.0.0.1:5432/db';

describe('WORKER_SOLVERS', () => {
  it('reads a comma list of name@version, spaces and empty entries ignored', () => {
    expect(parseWorkerSolvers(' prioritised-astar@1.0.0, lacam@3+fix ,,')).toEqual({
      ok: true, solvers: [{ name: 'prioritised-astar', version: '1.0.0' }, { name: 'lacam', version: '3+fix' }],
    });
    expect(parseWorkerSolvers('')).toEqual({ ok: true, solvers: [] });
    expect(parseWorkerSolvers(undefined)).toEqual({ ok: true, solvers: [] });
  });

  it('refuses entries that are not name@version and repeats, naming them', () => {
    expect(parseWorkerSolvers('lacam')).toEqual({ ok: false, message: expect.stringContaining('"lacam" is not name@version') });
    expect(parseWorkerSolvers('a@1,a@1')).toEqual({ ok: false, message: 'a@1 is listed twice' });
    expect(() => loadWorkerConfig({ DATABASE_URL: DB, WORKER_SOLVERS: 'x@1,bad name@2' })).toThrow(/WORKER_SOLVERS/);
  });

  it('gives a stand-alone worker none by default and the embedded worker the shipped example (empty = none)', () => {
    expect(loadWorkerConfig({ DATABASE_URL: DB }).solvers).toEqual([]);
    expect(loadWorkerConfig({ DATABASE_URL: DB, WORKER_SOLVERS: 'lacam@3' }).solvers).toEqual([{ name: 'lacam', version: '3' }]);
    expect(loadConfig({}).config.workerSolvers).toEqual([{ name: 'prioritised-astar', version: '1.0.0' }]);
    expect(loadConfig({ WORKER_SOLVERS: '' }).config.workerSolvers).toEqual([]);
  });
});
