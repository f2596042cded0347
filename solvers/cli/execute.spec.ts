/// <reference types="node" />
/**
 * Runs the execute CLI as a user would (a child process) on the open grid benchmark files
 * (benchmarks/datasets/grid-benchmarks/, read in place; Sturtevant 2012 and Stern et al. 2019,
 * see the dataset README).
 */
import { spawnSync } from 'node:child_process';
import { join, resolve } from 'node:path';
import { OPEN_GRID_BENCHMARKS_DIR } from '../../benchmarks/datasets/open-grid-benchmarks';
import { SAFETY_NOTE } from '../../shared/executions-constants';
import { WEIGHTED_SPLIT_WAIT_NOTE } from './shared-options';

const ROOT = resolve(__dirname, '../..');
const DATASET = OPEN_GRID_BENCHMARKS_DIR;
const TSX = join(ROOT, 'node_modules/.bin/tsx');
const execute = (...args: string[]) => spawnSync(TSX, ['solvers/cli/execute.ts', ...args], { cwd: ROOT, encoding: 'utf8' });
const files = ['--map', join(DATASET, 'empty-8-8.map'), '--scen', join(DATASET, 'empty-8-8-even-2.scen'), '--agents', '6'];

describe('npm run execute', () => {
  // The keys of the contract before issue 12; item 5 adds only `ci95`, at the end.
  const KEYS_BEFORE_ISSUE_12 = ['runs', 'successRate', 'collisions', 'realisedMakespanMs', 'finishSpreadMs', 'waitingMs', 'firstCollision'];

  it('adds the bounded plan\'s figures last, only with --suboptimality above 1', () => {
    const run = execute(...files, '--model', 'classic', '--policy', 'dependency-gated', '--runs', '5', '--suboptimality', '1.5', '--json');
    expect(run.status).toBe(0);
    const out = JSON.parse(run.stdout);
    expect(Object.keys(out)).toEqual([...KEYS_BEFORE_ISSUE_12, 'ci95', 'plan']);
    expect(Object.keys(out.plan)).toEqual(['suboptimality', 'soc', 'lowerBound', 'gap']);
    expect(out.plan.suboptimality).toBe(1.5);
    expect(out.plan.soc).toBeLessThanOrEqual(1.5 * out.plan.lowerBound);
    expect(out.plan.gap).toBeCloseTo((out.plan.soc - out.plan.lowerBound) / out.plan.lowerBound, 12);
    expect(out.collisions.total).toBe(0);
  });

  it('prints the stable JSON contract, plus the 95 % intervals', () => {
    const run = execute(...files, '--model', 'classic', '--policy', 'dependency-gated', '--jitter', '0.2', '--runs', '20', '--seed', '3', '--json');
    expect(run.status).toBe(0);
    const out = JSON.parse(run.stdout);
    expect(Object.keys(out)).toEqual([...KEYS_BEFORE_ISSUE_12, 'ci95']);
    expect(Object.keys(out.ci95)).toEqual(['successRate', 'realisedMakespanMs', 'finishSpreadMs']);
    expect(Object.keys(out.finishSpreadMs)).toEqual(['mean', 'p95']);
    expect(Object.keys(out.waitingMs)).toEqual(['mean']);
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
    expect(model.stderr).toContain('execute: --model must be one of classic');
    const noK = execute(...files, '--model', 'k-robust', '--policy', 'lockstep');
    expect([noK.status, noK.stderr.split('\n')[0]]).toEqual([2, 'execute: --k is required with --model k-robust']);
    const runs = execute(...files, '--model', 'classic', '--policy', 'lockstep', '--runs', '0');
    expect([runs.status, runs.stderr.split('\n')[0]]).toEqual([2, "execute: --runs must be a whole number ≥ 1, got '0'"]);
    const policy = execute(...files, '--policy', 'eventually');
    expect([policy.status, policy.stderr.split('\n')[0]]).toEqual([2, "execute: --policy must be one of open-loop, lockstep, dependency-gated, got 'eventually'"]);
  });

  it('refuses the former option names and names the new ones', () => {
    const turn = execute(...files, '--policy', 'lockstep', '--quarter-turn-ms', '600');
    expect([turn.status, turn.stderr.split('\n')[0]]).toEqual([2, "execute: --quarter-turn-ms is no longer accepted: use --turn-ms MS (solve's name; same unit, ms)"]);
    const time = execute(...files, '--policy', 'lockstep', '--time-limit-ms', '30000');
    expect(time.status).toBe(2);
    expect(time.stderr.split('\n')[0]).toBe('execute: --time-limit-ms is no longer accepted: use --time-limit SECONDS (in seconds, as solve takes it; e.g. --time-limit 30 for 30000 ms)');
  });

  it('says once that --wait-ms does not apply to weighted-split', () => {
    const run = execute(...files, '--model', 'weighted-split', '--wait-ms', '500', '--policy', 'open-loop', '--runs', '2', '--json');
    expect(run.status).toBe(0);
    expect(run.stderr).toBe(`execute: ${WEIGHTED_SPLIT_WAIT_NOTE}\n`);
    expect(WEIGHTED_SPLIT_WAIT_NOTE).toMatch(/waits last any whole number of ms.*unit-step models only/);
  });

  it('prints every Monte Carlo figure with its 95 % interval, waiting per robot, the plan model and the robot profile', () => {
    const run = execute(...files, '--model', 'classic', '--policy', 'dependency-gated', '--jitter', '0.2', '--runs', '20', '--seed', '3', '--turn-ms', '600');
    expect(run.status).toBe(0);
    const lines = run.stdout.split('\n');
    expect(lines[0]).toMatch(/^plan model classic, policy dependency-gated, 20 runs \(seed 3\)/);
    expect(lines[1]).toBe('robot profile: forward 1000 ms, quarter turn 600 ms, wait 1000 ms, pitch 500 mm, diameter 400 mm');
    const line = (label: string) => lines.find((l) => l.startsWith(label)) ?? '';
    expect(line('execution success rate')).toMatch(/\d+\.\d % \(95 % CI \d+\.\d–\d+\.\d %\)$/);
    expect(line('realised makespan')).toMatch(/^realised makespan +mean \d+ ms \(95 % CI \d+–\d+ ms\), p95 \d+ ms \(95 % CI (\d+–\d+ ms|n\/a)\)$/);
    expect(line('finish spread')).toMatch(/mean \d+ ms \(95 % CI \d+–\d+ ms\)/);
    expect(line('waiting per robot')).toMatch(/^waiting per robot +mean \d+ ms \(95 % CI \d+–\d+ ms\), max \d+ ms \(95 % CI \d+–\d+ ms\)$/);
    expect(line('waiting, total over robots')).toMatch(/mean \d+ ms per run \(95 % CI \d+–\d+ ms\)$/);
    expect(line('collisions per run')).toMatch(/^collisions per run +mean \d+\.\d\d \(95 % CI (\d+\.\d\d–\d+\.\d\d|n\/a)\), total \d+ over all runs$/);
    expect(run.stdout).toContain(SAFETY_NOTE);
  });

  it('prints its help on stdout with exit code 0', () => {
    const run = execute('--help');
    expect(run.status).toBe(0);
    expect(run.stdout).toMatch(/^usage: npm run -s execute -- /);
    expect(run.stdout).toContain('--policy P');
    expect(run.stdout).toContain(SAFETY_NOTE);
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
