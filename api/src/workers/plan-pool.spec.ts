import { join } from 'node:path';
import { toTaskInstance } from '@solvers/run/task-instance';
import { tinyInstance } from '@solvers/testing/tiny-instance';
import type { PlanTask } from '@solvers/run/plan-task';
import { PlanPool } from './plan-pool';

const PROFILE = { forwardMs: 1000, quarterTurnMs: 500, waitMs: 1000, cellPitchMm: 400, robotDiameterMm: 300, timingJitter: 0 };
const TASK: PlanTask = {
  model: { model: 'classic', startHeading: 'free', switches: {} },
  instance: toTaskInstance(tinyInstance('....\n.#..', [[[0, 0], [3, 0]], [[3, 0], [0, 0]]])),
  profile: PROFILE, timeLimitMs: 5000, memoryLimitMb: 128, seed: 1,
  execution: { policies: [], stallProbability: 0, stallMs: 0, runs: 1 },
};

describe('PlanPool', () => {
  let pool: PlanPool | undefined;
  afterEach(async () => {
    await pool?.close();
  });

  it('runs a task in a tsx-loaded thread', async () => {
    pool = new PlanPool({ threads: 1 });
    const out = await pool.run(TASK, { hardLimitMs: 20_000, memoryLimitMb: 128 });
    expect(out.kind).toBe('done');
    expect(out.kind === 'done' && out.result.status).toBe('solved');
  }, 30_000);

  it('terminates a thread that ignores its limit, within the hard limit, and keeps serving', async () => {
    // The fixture spins forever without looking at any signal.
    pool = new PlanPool({ threads: 1, filename: join(__dirname, 'testing/spin-thread.js') });
    await pool.run({ ...TASK, seed: -1 }, { hardLimitMs: 5000, memoryLimitMb: 128 }); // warm the thread
    const t0 = performance.now();
    const out = await pool.run(TASK, { hardLimitMs: 300, memoryLimitMb: 128 });
    const took = performance.now() - t0;
    expect(out.kind).toBe('hard-timeout');
    expect(took).toBeLessThan(300 + 1000);
    const after = await pool.run({ ...TASK, seed: -1 }, { hardLimitMs: 5000, memoryLimitMb: 128 });
    expect(after).toEqual({ kind: 'done', result: 'quick' });
  }, 30_000);

  it('reports a thread that outgrows its heap limit as memory, and the pool keeps serving', async () => {
    pool = new PlanPool({ threads: 1, filename: join(__dirname, 'testing/spin-thread.js') });
    const out = await pool.run({ ...TASK, seed: -2 }, { hardLimitMs: 20_000, memoryLimitMb: 64 });
    expect(out.kind).toBe('memory');
    const after = await pool.run({ ...TASK, seed: -1 }, { hardLimitMs: 5000, memoryLimitMb: 64 });
    expect(after).toEqual({ kind: 'done', result: 'quick' });
  }, 30_000);

  it('stops a task when its signal fires', async () => {
    pool = new PlanPool({ threads: 1, filename: join(__dirname, 'testing/spin-thread.js') });
    const ctl = new AbortController();
    setTimeout(() => ctl.abort(), 200);
    const out = await pool.run(TASK, { hardLimitMs: 10_000, memoryLimitMb: 128, signal: ctl.signal });
    expect(out.kind).toBe('aborted');
  }, 30_000);

  it('counts the hard limit from the moment the thread begins the job, not from a slow thread load', async () => {
    // The fixture's module takes 1.5 s to load; the job itself answers at once.
    pool = new PlanPool({ threads: 1, filename: join(__dirname, 'testing/slow-start-thread.js') });
    const out = await pool.run(TASK, { hardLimitMs: 500, memoryLimitMb: 128 });
    expect(out).toEqual({ kind: 'done', result: 'quick' });
  }, 30_000);

  it('reports a job no thread began within its start limit as not started', async () => {
    pool = new PlanPool({ threads: 1, filename: join(__dirname, 'testing/slow-start-thread.js') });
    const out = await pool.run(TASK, { hardLimitMs: 500, memoryLimitMb: 128, startLimitMs: 200 });
    expect(out.kind).toBe('not-started');
  }, 30_000);

  it('warms a heap limit: its threads answer a ping before any job', async () => {
    pool = new PlanPool({ threads: 1 });
    await pool.warm(128);
    expect(pool.completed).toBe(1);
    const out = await pool.run(TASK, { hardLimitMs: 20_000, memoryLimitMb: 128 });
    expect(out.kind === 'done' && out.result.status).toBe('solved');
    expect(pool.completed).toBe(2);
  }, 30_000);
});
