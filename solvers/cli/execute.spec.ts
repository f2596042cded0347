/// <reference types="node" />
/**
 * Runs the execute CLI as a user would (a child process) on the open grid benchmark files
 * (benchmarks/datasets/grid-benchmarks/, read in place; Sturtevant 2012 and Stern et al. 2019,
 * see the dataset README).
 */
import { spawnSync } from 'node:child_process';
import { join, resolve } from 'node:path';
import { OPEN_GRID_BENCHMARKS_DIR } from '../../benchmarks/datasets/open-grid-benchmarks';

const ROOT = resolve(__dirname, '../..');
const DATASET = OPEN_GRID_BENCHMARKS_DIR;
const TSX = join(ROOT, 'node_modules/.bin/tsx');
const execute = (...args: string[]) => spawnSync(TSX, ['solvers/cli/execute.ts', ...args], { cwd: ROOT, encoding: 'utf8' });
const files = ['--map', join(DATASET, 'empty-8-8.map'), '--scen', join(DATASET, 'empty-8-8-even-2.scen'), '--agents', '6'];

describe('npm run execute', () => {
  it('prints the stable JSON contract', () => {
    const run = execute(...files, '--model', 'classic', '--policy', 'dependency-gated', '--jitter', '0.2', '--runs', '20', '--seed', '3', '--json');
    expect(run.status).toBe(0);
    const out = JSON.parse(run.stdout);
    expect(Object.keys(out)).toEqual(['runs', 'successRate', 'collisions', 'realisedMakespanMs', 'finishSpreadMs', 'waitingMs', 'firstCollision']);
    expect(out.runs).toBe(20);
    expect(Object.keys(out.collisions)).toEqual(['mean', 'total']);
    expect(Object.keys(out.realisedMakespanMs)).toEqual(['mean', 'p95']);
    // A CBS plan is valid, so dependency-gated execution with pitch ≥ diameter never collides.
    expect(out.collisions.total).toBe(0);
    expect(out.firstCollision).toBeNull();
  });

  it('rejects an unknown model and a bad number with exit code 2', () => {
    const model = execute(...files, '--model', 'diagonal', '--policy', 'lockstep');
    expect(model.status).toBe(2);
    expect(model.stderr).toContain('--model: expected one of classic');
    const noK = execute(...files, '--model', 'k-robust', '--policy', 'lockstep');
    expect([noK.status, noK.stderr.trim()]).toEqual([2, 'execute: --k is required with --model k-robust']);
    const runs = execute(...files, '--model', 'classic', '--policy', 'lockstep', '--runs', '0');
    expect([runs.status, runs.stderr.trim()]).toEqual([2, 'execute: --runs: a positive integer, got "0"']);
  });

  it.each([
    ['orientation-split', []],
    ['k-robust', ['--k', '1']],
  ])('solves under %s and replays the plan without collision under dependency gating', (model, extra) => {
    const run = execute(...files, '--model', model, ...extra, '--policy', 'dependency-gated', '--jitter', '0.2', '--runs', '10', '--json');
    expect(run.status).toBe(0);
    const out = JSON.parse(run.stdout);
    expect(out.runs).toBe(10);
    expect(out.collisions.total).toBe(0);
  });

  it('names the file, line and column of a broken input', () => {
    const run = execute('--map', join(DATASET, 'empty-8-8-even-2.scen'), '--scen', join(DATASET, 'empty-8-8-even-2.scen'), '--agents', '2', '--model', 'classic', '--policy', 'lockstep');
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(/empty-8-8-even-2\.scen:\d+:\d+: /);
  });
});
